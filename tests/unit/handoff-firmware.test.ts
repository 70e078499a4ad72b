/**
 * Firmware scaling: known inputs go through the engine to the converter, are quantised to codes by the
 * ideal converter, and come back through the scaling constants within half an LSB referred to the input.
 * Gains and group delays are also checked against closed forms worked by hand.
 */
import { execFileSync } from "node:child_process";
import { existsSync, mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import type { Chain } from "@/lib/chain/types";
import { analyzeChain } from "@/lib/engine";
import { nominalOf } from "@/lib/handoff/bring-up";
import { buildFirmwareScaling, codeOf, measurandOf, scalingHeader, sourceVoltsOf, type FirmwareScaling } from "@/lib/handoff/firmware";
import { complete, demo, withParams } from "./handoff-support";

function scalingOf(chain: Chain): FirmwareScaling {
  const [r] = buildFirmwareScaling(chain, analyzeChain(chain));
  if (!r.ok) throw new Error(r.reason);
  return r.scaling;
}

/**
 * The params that hold a source's output at `v` DC in its own unit (volts, differential volts,
 * amperes), with no spread: a photodiode without dark current, a bridge at one load (its DC is the
 * middle of loadLow…loadHigh, Vd = excitation·fullScale·load) and no zero-balance spread.
 */
function dcParams(chain: Chain, sourceId: string, v: number): Record<string, unknown> {
  const n = chain.nodes.find((x) => x.id === sourceId)!;
  if (n.kind === "photodiode") return { dc: v, dcSpread: 0, darkCurrent: 0 };
  if (n.kind === "bridge") {
    const load = v / (n.params.excitation * n.params.fullScale);
    return { loadLow: load - 1e-3, loadHigh: load + 1e-3, offset: 0 };
  }
  return { dc: v, dcSpread: 0 };
}

/** Converter input for a source output held at `v` DC, from a fresh engine run. */
function adcVoltsForDc(chain: Chain, sourceId: string, v: number): number {
  const result = analyzeChain(withParams(chain, sourceId, dcParams(chain, sourceId, v)));
  return nominalOf(result.paths[0].adc!.dcIn as { min: number; max: number })!;
}

describe("DC-coupled paths round-trip a known input within half an LSB", () => {
  const cases: [string, string, number[]][] = [
    // photodiode currents (A): 0.8 V/µA puts 0…3.1 µA on the 0–2.5 V converter
    ["turbidity", "pd", [0.1e-6, 0.62e-6, 1e-6, 1.554e-6, 2.4e-6]],
    ["ballast", "bridge", [-0.006, 0, 0.0012345, 0.004, 0.008]],
  ];
  for (const [name, src, inputs] of cases) {
    it(`${name}: every input comes back within LSB/(2·|gain|)`, () => {
      const chain = withParams(demo()[name as "turbidity" | "ballast"], src, dcParams(demo()[name as "turbidity" | "ballast"], src, 0));
      const s = scalingOf(chain);
      expect(s.coupling).toBe("dc");
      const halfLsbAtInput = s.adc.lsb / (2 * Math.abs(s.gain));
      for (const v of inputs) {
        const volts = adcVoltsForDc(chain, src, v);
        expect(volts).toBeGreaterThan(s.adc.vinLow);
        expect(volts).toBeLessThan(s.adc.vinHigh);
        const back = sourceVoltsOf(s, codeOf(s, volts));
        expect(Math.abs(back - v)).toBeLessThanOrEqual(halfLsbAtInput * (1 + 1e-9));
      }
    });
  }

  it("the round trip fails when the reconstruction is off by one code (the check can fail)", () => {
    const chain = withParams(demo().turbidity, "pd", { darkCurrent: 0 });
    const s = scalingOf(chain);
    const v = 1e-6;
    const volts = adcVoltsForDc(chain, "pd", v);
    expect(Math.abs(sourceVoltsOf(s, codeOf(s, volts) + 1) - v)).toBeGreaterThan(s.adc.lsb / (2 * Math.abs(s.gain)));
  });

  it("converts to the measurand's unit with the declared sensitivity", () => {
    // 10 nA of scattered light per NTU (an invented figure for the test)
    const chain = withParams(demo().turbidity, "pd", { sensitivity: 1e-8, unit: "NTU", darkCurrent: 0 });
    const s = scalingOf(chain);
    expect(s.measurand).toMatchObject({ unit: "NTU", sensitivity: 1e-8 });
    for (const ntu of [5, 31, 77.7]) {
      const volts = adcVoltsForDc(chain, "pd", ntu * 1e-8);
      const back = measurandOf(s, codeOf(s, volts))!;
      expect(Math.abs(back - ntu)).toBeLessThanOrEqual((s.adc.lsb / (2 * Math.abs(s.gain) * 1e-8)) * (1 + 1e-9));
    }
    expect(scalingOf(demo().turbidity).measurand).toBeNull();
  });

  it("gain, zero-input code and sign match the circuit worked by hand", () => {
    const t = scalingOf(demo().turbidity);
    // −rf of the TIA (V/A) · (−r2/r1 of the MFB = −1) · 1 (the RC into a converter that draws nothing):
    // +800 kΩ, moved by about 1e-6 of itself by the parts' finite gain and the photodiode's 200 MΩ shunt
    expect(Math.abs(t.gain / 800e3 - 1)).toBeLessThan(1e-4);
    expect(t.gain).toBe(analyzeChain(demo().turbidity).paths[0].adc!.pathDcGain);
    expect(t.zeroInputVolts).toBeCloseTo(0, 9);
    expect(t.zeroInputCode).toBe(0);
    const b = scalingOf(demo().ballast);
    // in-amp 1 + 2·24.95k/100 = 500, then the lossy integrator's −r2/r1 = −1
    expect(b.gain).toBeCloseTo(-500, -1);
    expect(b.gainPhaseDeg).toBe(180);
    expect(b.zeroInputCode).toBe(32768); // 0 V on a ±4.096 V, 16-bit range
  });
});

describe("AC-coupled path (hull vibration)", () => {
  it("is scaled at the band's middle about the resting level, and a sine comes back within half an LSB", () => {
    const chain = demo().hull;
    const s = scalingOf(chain);
    expect(s.coupling).toBe("ac");
    expect(s.scalingFrequency).toBeCloseTo(Math.sqrt(2 * 2000), 9);
    // resting level: the charge amplifier passes no DC from the sensor; its vref sits at its output through
    // the noise gain 1 + rf/leakage, the ×2 stage (rg to its own vref) gives 2·that − vref:
    // 2·2.5·(1 + 1 GΩ/100 GΩ) − 2.5 = 2.55 V, and 2.55 V / (5 V / 4096) = 2088.96 → code 2089
    expect(s.zeroInputCode).toBe(2089);
    const [resp] = [analyzeChain(chain, { freqs: [s.scalingFrequency] }).paths[0].response];
    const mag = 10 ** (resp.magDb[0]! / 20);
    const phase = (resp.phaseDeg[0]! * Math.PI) / 180;
    expect(Math.abs(Math.abs(s.gain) / mag - 1)).toBeLessThan(1e-9); // V per coulomb: compared relative
    const w = 2 * Math.PI * s.scalingFrequency;
    const amp = (chain.nodes[0].params as { amplitude: number }).amplitude;
    for (let k = 0; k < 40; k++) {
      const t = k / (40 * s.scalingFrequency);
      const volts = s.zeroInputVolts + amp * mag * Math.cos(w * t + phase);
      const back = sourceVoltsOf(s, codeOf(s, volts));
      const input = amp * Math.cos(w * t + phase - (s.gain < 0 ? Math.PI : 0));
      expect(Math.abs(back - input)).toBeLessThanOrEqual((s.adc.lsb / (2 * Math.abs(s.gain))) * (1 + 1e-9));
    }
  });
});

describe("group delay at low frequency", () => {
  const base = (stage: Record<string, unknown>) =>
    complete({
      format: "chainwright.chain/1",
      name: "delay check",
      nodes: [
        { id: "s", kind: "source", params: { dc: 0, amplitude: 0.1, fLow: 0, fHigh: 1000 } },
        stage,
        { id: "adc", kind: "adc", params: { bits: 16, sampleRate: 1e5, vinLow: -5, vinHigh: 5 } },
      ],
      edges: [{ from: "s", to: "x" }, { from: "x", to: "adc" }],
    });

  it("an RC low-pass delays by r·c (−dφ/dω of −atan(ωrc) at ω → 0)", () => {
    const s = scalingOf(base({ id: "x", kind: "rcLowpass", params: { r: 10e3, c: 10e-9 } }));
    expect(s.groupDelayFrequency).toBe(1);
    expect(Math.abs(s.groupDelay - 1e-4) / 1e-4).toBeLessThan(1e-5);
  });

  it("a unity-gain Sallen-Key low-pass delays by c2·(r1 + r2) (first coefficient of its denominator)", () => {
    const s = scalingOf(
      base({ id: "x", kind: "sallenKeyLowpass", params: { r1: 10e3, r2: 22e3, c1: 20e-9, c2: 10e-9 }, rails: { low: -12, high: 12 } }),
    );
    const want = 10e-9 * (10e3 + 22e3);
    expect(Math.abs(s.groupDelay - want) / want).toBeLessThan(1e-5);
    expect(s.gain).toBeCloseTo(1, 12);
  });

  it("no scaling for a converter behind an integrator (no bounded DC level)", () => {
    const chain = base({ id: "x", kind: "integrator", params: { r1: 10e3, c2: 1e-6 }, rails: { low: -12, high: 12 } });
    const [r] = buildFirmwareScaling(chain, analyzeChain(chain));
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.reason).toMatch(/integrator/);
  });
});

describe("C header", () => {
  const gcc = ["/usr/bin/gcc", "/usr/bin/cc"].find((p) => existsSync(p));

  it("names every constant once per converter and reads back to the same numbers", () => {
    const s = scalingOf(withParams(demo().ballast, "bridge", { sensitivity: 2e-4, unit: "kPa" }));
    const h = scalingHeader([s], 4);
    expect(h).toMatch(/revision 4/);
    const num = (name: string) => Number(new RegExp(`#define ${name} (\\S+)`).exec(h)![1].replace(/L$/, ""));
    expect(num("CW_ADC_SOURCE_VOLTS_PER_CODE")).toBe(s.sourceVoltsPerCode);
    expect(num("CW_ADC_SOURCE_OFFSET_VOLTS")).toBe(s.sourceOffsetVolts);
    expect(num("CW_ADC_UNITS_PER_CODE")).toBe(s.measurand!.unitsPerCode);
    expect(num("CW_ADC_ZERO_INPUT_CODE")).toBe(s.zeroInputCode);
    expect(h.match(/#define CW_ADC_GAIN /g)).toHaveLength(1);
  });

  it("names the source quantity by the source's output: volts for a bridge, amperes for a photodiode, coulombs for a piezo in charge mode", () => {
    const { ballast, turbidity, hull } = demo();
    const cases: [Chain, "V" | "A" | "C", string][] = [
      [ballast, "V", "VOLTS"],
      [turbidity, "A", "AMPS"],
      [hull, "C", "COULOMBS"],
    ];
    for (const [chain, unit, word] of cases) {
      const s = scalingOf(chain);
      expect(s.sourceUnit, chain.name).toBe(unit);
      const h = scalingHeader([s]);
      expect(h).toContain(`/* V at the converter per ${unit} at the source */`);
      expect(Number(new RegExp(`#define CW_ADC_SOURCE_${word}_PER_CODE (\\S+)`).exec(h)![1])).toBe(s.sourceVoltsPerCode);
      expect(Number(new RegExp(`#define CW_ADC_SOURCE_OFFSET_${word} (\\S+)`).exec(h)![1])).toBe(s.sourceOffsetVolts);
      // the other quantities' names do not appear: firmware cannot read coulombs as volts
      for (const other of ["VOLTS", "AMPS", "COULOMBS"].filter((w) => w !== word)) expect(h).not.toContain(`_SOURCE_${other}_PER_CODE`);
    }
  });

  it.skipIf(!gcc)("compiles, and its functions give the same values as the JSON constants", () => {
    const s = scalingOf(withParams(demo().turbidity, "pd", { sensitivity: 1e-8, unit: "NTU" }));
    const dir = mkdtempSync(join(tmpdir(), "cw-header-"));
    writeFileSync(join(dir, "scaling.h"), scalingHeader([s], 2));
    writeFileSync(
      join(dir, "main.c"),
      [
        "#include <stdio.h>",
        '#include "scaling.h"',
        "int main(void) {",
        "  int32_t c[] = {0, 1, 1489, 4095};",
        "  for (int i = 0; i < 4; i++) {",
        '    printf("%.17g %.17g\\n", cw_adc_source_amps(c[i]), cw_adc_measurand(c[i]));',
        "  }",
        "  return 0;",
        "}",
        "",
      ].join("\n"),
    );
    execFileSync(gcc!, ["-std=c99", "-Wall", "-Werror", "-o", join(dir, "main"), join(dir, "main.c")], { cwd: dir });
    const out = execFileSync(join(dir, "main"), { encoding: "utf8" }).trim().split("\n");
    rmSync(dir, { recursive: true, force: true });
    [0, 1, 1489, 4095].forEach((code, i) => {
      const [v, m] = out[i].split(" ").map(Number);
      expect(v).toBeCloseTo(sourceVoltsOf(s, code), 12);
      expect(m).toBeCloseTo(measurandOf(s, code)!, 10);
    });
  });
});
