/** How the library writes each op-amp figure: its column title and unit. */
import type { QuantityUnit } from "@/lib/units";
import { FIGURE_COLUMNS } from "@/lib/parts-csv";

export const FIGURE_TITLES: Record<string, string> = {
  gbw: "Gain-bandwidth",
  aol: "Open-loop gain",
  slewRate: "Slew rate",
  vos: "Offset",
  ib: "Bias current",
  en: "en",
  in: "in",
  enCorner: "en 1/f corner",
  inCorner: "in 1/f corner",
  swingLow: "Swing to low",
  swingHigh: "Swing to high",
  inputLow: "Input to low",
  inputHigh: "Input to high",
};

export const FIGURES: ReadonlyArray<{ key: string; unit: QuantityUnit; title: string }> = FIGURE_COLUMNS.map(([key, unit]) => ({ key, unit, title: FIGURE_TITLES[key] ?? key }));
