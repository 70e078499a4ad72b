/**
 * The hand-offs as CSV: plain SI numbers in the value columns (so a spreadsheet can compute with them)
 * beside a readable column where it helps. Text cells that start like a formula are escaped. Pure.
 */
import Papa from "papaparse";
import type { AnalysisResult, Chain } from "../chain/types";
import { chainSourceUnit, compileChain, magnitudeDbLabel } from "../engine";
import { formatQuantity } from "../units";
import type { Bom } from "./bom";
import type { BringUpSheet } from "./bring-up";
import { gainPhase, isFeed, nodeTitle, signalOrder } from "./order";

type Cell = string | number | null;

export function toCsv(fields: string[], rows: Cell[][]): string {
  const data = rows.map((r) => r.map((c) => (c === null || (typeof c === "number" && !Number.isFinite(c)) ? "" : c)));
  return `${Papa.unparse({ fields, data }, { escapeFormulae: true, newline: "\r\n" })}\r\n`;
}

const unitOf = (type: "resistor" | "capacitor"): "ohm" | "farad" => (type === "resistor" ? "ohm" : "farad");
const percent = (x: number) => Number((x * 100).toPrecision(6));

/** Every component on its own line, then the op-amps, one line each. */
export function bomCsv(bom: Bom): string {
  const fields = ["ref", "type", "value", "value_text", "nearest_standard", "series", "tolerance_percent", "stage", "node", "param_or_model"];
  const rows: Cell[][] = bom.lines.map((l) => [
    l.ref,
    l.type,
    l.value,
    formatQuantity(l.value, unitOf(l.type)),
    l.standard,
    l.series,
    percent(l.tolerance),
    l.stage,
    l.nodeId,
    l.param,
  ]);
  for (const g of bom.opAmps) {
    g.refs.forEach((ref, k) => rows.push([ref, "op-amp", null, null, null, null, null, g.stages[k], null, g.model]));
  }
  return toCsv(fields, rows);
}

/** One line per value (and tolerance): quantity and designators, for purchasing. */
export function bomGroupsCsv(bom: Bom): string {
  const fields = ["type", "value", "value_text", "nearest_standard", "tolerance_percent", "quantity", "refs"];
  const rows: Cell[][] = bom.groups.map((g) => [g.type, g.value, formatQuantity(g.value, unitOf(g.type)), g.standard, percent(g.tolerance), g.quantity, g.refs.join(" ")]);
  for (const g of bom.opAmps) rows.push(["op-amp", null, g.model, null, null, g.quantity, g.refs.join(" ")]);
  return toCsv(fields, rows);
}

/**
 * One line per test point. With the sheet's spread: the DC reading over the builds (`spread_dc_*`: each
 * build's interval joined), the range of the DC nominal, the AC amplitude's range per frequency, and the
 * builds and seed on every line (so a line read alone still says where its range came from).
 */
export function bringUpCsv(sheet: BringUpSheet): string {
  const { spread } = sheet;
  const fields = ["test_point", "node", "where", "dc_nominal_V", "dc_min_V", "dc_max_V", "status"];
  for (const f of sheet.frequencies) fields.push(`ac_peak_V_at_${f}_Hz`, `phase_deg_at_${f}_Hz`);
  if (spread) {
    fields.push("spread_dc_min_V", "spread_dc_max_V", "spread_dc_nominal_min_V", "spread_dc_nominal_max_V");
    for (const f of sheet.frequencies) fields.push(`spread_ac_peak_min_V_at_${f}_Hz`, `spread_ac_peak_max_V_at_${f}_Hz`);
    fields.push("spread_builds", "spread_seed");
  }
  const rows = sheet.points.map((p, j) => {
    const row: Cell[] = [p.tp, p.nodeId, p.where, p.dcNominal, p.dcInterval?.min ?? null, p.dcInterval?.max ?? null, p.status ?? ""];
    for (const a of p.ac) row.push(a.amplitude, a.phaseDeg);
    if (spread) {
      const s = spread.points[j];
      row.push(s.dcInterval?.min ?? null, s.dcInterval?.max ?? null, s.dcNominal?.min ?? null, s.dcNominal?.max ?? null);
      for (const a of s.amplitude) row.push(a?.min ?? null, a?.max ?? null);
      row.push(spread.trials, spread.seed);
    }
    return row;
  });
  return toCsv(fields, rows);
}

export const PLOT_TABLES = ["response", "noise"] as const;
export type PlotTable = (typeof PLOT_TABLES)[number];

/**
 * The data behind the plots, on the analysis grid: `response` is every node's response from the source
 * (magnitude dB and phase degrees, each stage's cascade as the response plot draws it); `noise` is the
 * total output noise density at the end of each path, V/√Hz.
 */
export function plotCsv(chain: Chain, result: AnalysisResult, table: PlotTable): string {
  const f = result.paths[0]?.response.f ?? [];
  if (table === "noise") {
    const fields = ["frequency_Hz", ...result.paths.map((p) => `${p.nodes[p.nodes.length - 1]} noise_density_V_per_rtHz`)];
    const rows = f.map((fk, k) => [fk, ...result.paths.map((p) => ((p.noise.density as (number | null)[] | undefined) ?? [])[k] ?? null)]);
    return toCsv(fields, rows);
  }
  const cc = compileChain(chain);
  const sw = f.length ? cc.sweep(Float64Array.from(f)) : null;
  const index = new Map(cc.nodeIds.map((id, i) => [id, i]));
  const nodes = signalOrder(chain).filter((n) => !isFeed(chain, n) && index.has(n.id));
  // from a current or charge source the cascade is in V/A or V/C, and the column says what its dB are relative to
  const mag = `magnitude_${magnitudeDbLabel(chainSourceUnit(chain.nodes))}`;
  const fields = ["frequency_Hz", ...nodes.flatMap((n) => [`${nodeTitle(n)} ${mag}`, `${nodeTitle(n)} phase_deg`])];
  const rows = f.map((fk, k) => {
    const row: Cell[] = [fk];
    for (const n of nodes) {
      const i = index.get(n.id)!;
      const { gain, phaseDeg } = gainPhase(sw!.cumRe[i][k], sw!.cumIm[i][k]);
      row.push(gain ? 20 * Math.log10(gain) : null, gain ? phaseDeg : null);
    }
    return row;
  });
  return toCsv(fields, rows);
}
