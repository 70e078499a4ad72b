/** The demo chains as the files in public/examples/ (written by scripts/example-chains.ts). */
import { ballastPressure, hullVibration, turbidityPhotodiode } from "./chains";

export const EXAMPLE_CHAIN_FILES: Record<string, unknown> = {
  "keelwater-hull-vibration.chain.json": hullVibration,
  "keelwater-ballast-pressure.chain.json": ballastPressure,
  "keelwater-turbidity-photodiode.chain.json": turbidityPhotodiode,
};

/** A file's text: the document as indented JSON with a final newline. */
export const exampleChainText = (doc: unknown): string => `${JSON.stringify(doc, null, 2)}\n`;
