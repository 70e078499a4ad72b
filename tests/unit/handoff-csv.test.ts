/**
 * CSV of the hand-offs: read back with the same CSV parser, every number equals the builder's (so
 * nothing is lost to formatting), and text that starts like a spreadsheet formula is escaped.
 */
import Papa from "papaparse";
import { describe, expect, it } from "vitest";
import { analyzeChain, sourceSignal } from "@/lib/engine";
import { isSourceKind } from "@/lib/chain/types";
import { bomCsv, bomGroupsCsv, bringUpCsv, buildBom, buildBringUpSheet, pathCurves, plotCsv, withSpread } from "@/lib/handoff";
import { demo } from "./handoff-support";

const read = (csv: string) => Papa.parse<Record<string, string>>(csv.trim(), { header: true }).data;

describe("hand-off CSV", () => {
  it("BOM lines read back with exact values and one line per op-amp", () => {
    const { turbidity } = demo();
    const bom = buildBom(turbidity);
    const rows = read(bomCsv(bom));
    expect(rows).toHaveLength(bom.lines.length + 2);
    bom.lines.forEach((l, k) => {
      expect(rows[k].ref).toBe(l.ref);
      expect(Number(rows[k].value)).toBe(l.value);
      expect(Number(rows[k].nearest_standard)).toBe(l.standard);
    });
    expect(rows[0].value_text).toBe("800 kΩ"); // the TIA's rf
    expect(rows[1].value_text).toBe("470 pF"); // and its cf
    expect(rows.filter((r) => r.type === "op-amp").map((r) => r.ref)).toEqual(["U1", "U2"]);
    const groups = read(bomGroupsCsv(bom));
    expect(groups.find((g) => g.value === "10000")!.refs).toBe("R2 R3 R4");
  });

  it("escapes a stage label that starts like a formula", () => {
    const { hull } = demo();
    hull.nodes[1].label = "=HYPERLINK(1)";
    const rows = read(bomCsv(buildBom(hull)));
    expect(rows[0].stage.startsWith("'=")).toBe(true);
  });

  it("bring-up sheet: one row per test point, a peak and a phase column per test frequency", () => {
    const { hull } = demo();
    const sheet = buildBringUpSheet(hull, analyzeChain(hull), [2, 63]);
    const rows = read(bringUpCsv(sheet));
    expect(rows.map((r) => r.test_point)).toEqual(["TP1", "TP2", "TP3", "TP4"]);
    expect(Number(rows[3]["ac_peak_V_at_63_Hz"])).toBe(sheet.points[3].ac[1].amplitude);
    expect(Number(rows[1].dc_min_V)).toBe(sheet.points[1].dcInterval!.min);
  });

  it("bring-up sheet with its spread: the spread columns read back as the sheet's spread, with builds and seed on every line", () => {
    const { turbidity } = demo();
    const freqs = [5, 400];
    const plain = buildBringUpSheet(turbidity, analyzeChain(turbidity), freqs);
    const sheet = withSpread(turbidity, plain, 25, 9);
    const rows = read(bringUpCsv(sheet));
    const cell = (x: string) => (x === "" ? null : Number(x));
    expect(rows).toHaveLength(sheet.points.length);
    sheet.spread!.points.forEach((s, j) => {
      const r = rows[j];
      expect(r.node).toBe(s.nodeId);
      expect(cell(r.spread_dc_min_V)).toBe(s.dcInterval?.min ?? null);
      expect(cell(r.spread_dc_max_V)).toBe(s.dcInterval?.max ?? null);
      expect(cell(r.spread_dc_nominal_min_V)).toBe(s.dcNominal?.min ?? null);
      expect(cell(r.spread_dc_nominal_max_V)).toBe(s.dcNominal?.max ?? null);
      freqs.forEach((f, k) => {
        expect(cell(r[`spread_ac_peak_min_V_at_${f}_Hz`])).toBe(s.amplitude[k]?.min ?? null);
        expect(cell(r[`spread_ac_peak_max_V_at_${f}_Hz`])).toBe(s.amplitude[k]?.max ?? null);
      });
      expect([r.spread_builds, r.spread_seed]).toEqual(["25", "9"]);
    });
    // the nominal columns are the sheet's whether or not the spread rides along
    const without = read(bringUpCsv(plain));
    expect(Object.keys(without[0]).some((k) => k.startsWith("spread_"))).toBe(false);
    without.forEach((r, j) => expect(rows[j]).toMatchObject(r));
  });

  it("response data: the converter's columns equal the engine's path response on its grid", () => {
    const { turbidity } = demo();
    const result = analyzeChain(turbidity);
    const rows = read(plotCsv(turbidity, result, "response"));
    const resp = result.paths[0].response;
    expect(rows).toHaveLength(resp.f.length);
    const key = Object.keys(rows[0]).find((k) => k.startsWith("ADC (adc) magnitude"))!;
    const ph = Object.keys(rows[0]).find((k) => k.startsWith("ADC (adc) phase"))!;
    for (const k of [0, 57, resp.f.length - 1]) {
      expect(Number(rows[k].frequency_Hz)).toBe(resp.f[k]);
      expect(Number(rows[k][key])).toBeCloseTo(resp.magDb[k]!, 9);
      expect(Number(rows[k][ph])).toBeCloseTo(resp.phaseDeg[k]!, 9);
    }
  });

  it("response data: the magnitude columns say what their dB are relative to (V/A from a photodiode, V/C from a piezo)", () => {
    const { turbidity, hull, ballast } = demo();
    const header = (c: typeof hull) => Object.keys(read(plotCsv(c, analyzeChain(c), "response"))[0]).filter((k) => k.includes("magnitude"));
    expect(header(turbidity).length).toBeGreaterThan(0);
    expect(header(turbidity).every((k) => k.endsWith(" magnitude_dB re 1 V/A"))).toBe(true);
    expect(header(hull).every((k) => k.endsWith(" magnitude_dB re 1 V/C"))).toBe(true);
    // a bridge is a differential voltage: a plain ratio
    expect(header(ballast).every((k) => k.endsWith(" magnitude_dB"))).toBe(true);
  });

  it("report plots: the magnitude axis per unit of the source, and the band as the source describes it", () => {
    const { turbidity, hull, ballast } = demo();
    for (const [c, axis] of [[turbidity, "dB re 1 V/A"], [hull, "dB re 1 V/C"], [ballast, "dB"]] as const) {
      const sets = pathCurves(c, analyzeChain(c));
      const sig = sourceSignal(c.nodes.find((n) => isSourceKind(n.kind))!);
      expect(sets.length).toBeGreaterThan(0);
      for (const set of sets) {
        expect(set.magnitudeAxis).toBe(axis);
        expect(set.band).toEqual({ fLow: sig.fLow, fHigh: sig.fHigh });
      }
    }
  });

  it("noise data: the path end's density as the engine gives it", () => {
    const { hull } = demo();
    const result = analyzeChain(hull);
    const rows = read(plotCsv(hull, result, "noise"));
    const d = result.paths[0].noise.density as number[];
    expect(Number(rows[10]["adc noise_density_V_per_rtHz"])).toBe(d[10]);
    expect(d[10]).toBeGreaterThan(0);
  });
});
