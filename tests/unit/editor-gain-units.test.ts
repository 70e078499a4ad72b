/**
 * What a gain is per, as the workspace writes it: a front end fed by a photodiode or a piezo is in V/A
 * or V/C (its dB relative to 1 V/A or 1 V/C), every other stage is a plain ratio. The unit by kind
 * agrees with the engine's own source description.
 */
import { describe, expect, it } from "vitest";
import { fmtGain } from "@/components/editor/format";
import { isSourceKind } from "@/lib/chain/types";
import { sourceOutputOf, sourceSignal, stageGainPerUnit } from "@/lib/engine";
import { demo } from "./handoff-support";

describe("gain units", () => {
  it("each demo chain's source kind puts out what sourceSignal says it does", () => {
    const outputs = Object.values(demo()).map((c) => {
      const src = c.nodes.find((n) => isSourceKind(n.kind))!;
      expect(sourceOutputOf(src.kind as Parameters<typeof sourceOutputOf>[0])).toBe(sourceSignal(src).output);
      return sourceSignal(src).output;
    });
    // the three demos cover a charge, a differential pair and a current
    expect(new Set(outputs)).toEqual(new Set(["charge", "differential", "current"]));
  });

  it("only the stage that takes the sensor's current or charge has a gain per ampere or coulomb", () => {
    expect(stageGainPerUnit("transimpedance", "photodiode")).toBe("A");
    expect(stageGainPerUnit("chargeAmp", "piezo")).toBe("C");
    expect(stageGainPerUnit("transimpedance", "piezo")).toBe("C");
    expect(stageGainPerUnit("noninverting", "photodiode")).toBe("V");
    expect(stageGainPerUnit("inAmp", "bridge")).toBe("V");
    expect(stageGainPerUnit("transimpedance", undefined)).toBe("V");
  });

  it("writes a transimpedance with its unit and its dB relative to 1 V/A (20·log10 8e5 = 118.06)", () => {
    expect(fmtGain(-8e5, "A")).toBe("−800.0 kV/A (118.1 dB re 1 V/A)");
    expect(fmtGain(-10)).toBe("−10 (20.0 dB)");
    expect(fmtGain(0, "C")).toBe("0 V/C (−∞ dB re 1 V/C)");
    expect(fmtGain(1e9, "C")).toBe("1.000 GV/C (180.0 dB re 1 V/C)");
    expect(fmtGain(null, "A")).toBe("unbounded");
  });
});
