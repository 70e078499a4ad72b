/**
 * Bill of materials of a complete chain: every resistor and capacitor the stages call for, with a
 * generated reference designator (R1…, C1… in signal order), its value, the nearest preferred value of
 * the E-series that goes with the chain's tolerance, and the stage it belongs to; the same rows grouped
 * by value; and the op-amps (U1…) grouped by part model. Pure: no I/O.
 *
 * What counts as a component: every param of a stage whose unit is ohms or farads, except on the nodes
 * that feed the chain (a source's resistance is the sensor's own) and on converters (an ADC's input
 * resistance models the converter). A null value (a non-inverting stage's absent rf or rg) is no part.
 * Some params stand for more than one part or for none (PARTS_PER_PARAM): the instrumentation amplifier's
 * rf is two resistors (one per input op-amp) and its rd four (the difference stage), and it is three
 * op-amps of its one part; a TIA's or charge amp's cin is the op-amp's own input capacitance, no part.
 */
import type { Chain, ChainNode } from "../chain/types";
import { PARAM_SPECS } from "../chain/params";
import { isOpAmpKind } from "../chain/graph";
import { nearestPreferred, type ESeries } from "../units";
import { isFeed, nodeTitle, signalOrder } from "./order";

export type ComponentType = "resistor" | "capacitor";

export interface BomLine {
  ref: string;
  type: ComponentType;
  /** ohms or farads, as designed */
  value: number;
  /** nearest value of `series` (equal to value when it already is one) */
  standard: number;
  series: ESeries;
  /** fraction, from the chain's tolerances */
  tolerance: number;
  nodeId: string;
  stage: string;
  /** the param it sets (r1, c2, …); `rf#1`, `rf#2` where one param is several parts (an in-amp's rf, rd) */
  param: string;
}

export interface BomGroup {
  type: ComponentType;
  value: number;
  standard: number;
  tolerance: number;
  refs: string[];
  quantity: number;
}

export interface OpAmpGroup {
  /** part key in the chain, or null for stages left with an ideal op-amp */
  part: string | null;
  model: string;
  refs: string[];
  stages: string[];
  quantity: number;
}

export interface Bom {
  lines: BomLine[];
  groups: BomGroup[];
  opAmps: OpAmpGroup[];
}

/**
 * The E-series customarily paired with a tolerance (IEC 60063 pairs E6 with 20 %, E12 with 10 %, E24
 * with 5 %, E48 with 2 %, E96 with 1 %; from memory of the standard's table). A tolerance between two
 * steps takes the finer series.
 */
export function seriesForTolerance(tolerance: number): ESeries {
  if (tolerance <= 0.01) return "E96";
  if (tolerance <= 0.02) return "E48";
  if (tolerance <= 0.05) return "E24";
  if (tolerance <= 0.1) return "E12";
  return "E6";
}

/** How many physical parts a param stands for where it is not one (topology in lib/chain/README.md). */
const PARTS_PER_PARAM: Partial<Record<ChainNode["kind"], Record<string, number>>> = {
  inAmp: { rf: 2, rd: 4 },
  transimpedance: { cin: 0 },
  chargeAmp: { cin: 0 },
};

/** Op-amps per stage where a stage is more than one (the instrumentation amplifier's A1, A2, A3). */
const OPAMPS_PER_STAGE: Partial<Record<ChainNode["kind"], number>> = { inAmp: 3 };

/** One entry per physical part; a param that is several parts gives `rf#1`, `rf#2`, … as its param. */
function componentParams(node: ChainNode): { param: string; source: string; type: ComponentType; value: number }[] {
  const out: { param: string; source: string; type: ComponentType; value: number }[] = [];
  const specs = PARAM_SPECS[node.kind] ?? {};
  for (const [param, spec] of Object.entries(specs)) {
    const unit = spec.rule?.unit;
    if (unit !== "ohm" && unit !== "farad") continue;
    const value = (node.params as unknown as Record<string, unknown>)[param];
    if (typeof value !== "number" || !(value > 0)) continue;
    const n = PARTS_PER_PARAM[node.kind]?.[param] ?? 1;
    for (let k = 1; k <= n; k++)
      out.push({ param: n === 1 ? param : `${param}#${k}`, source: param, type: unit === "ohm" ? "resistor" : "capacitor", value });
  }
  return out;
}

export function buildBom(chain: Chain): Bom {
  const lines: BomLine[] = [];
  const count = { resistor: 0, capacitor: 0 };
  const opAmpByPart = new Map<string, OpAmpGroup>();
  let u = 0;
  for (const node of signalOrder(chain)) {
    if (node.kind === "adc" || isFeed(chain, node)) continue;
    for (const c of componentParams(node)) {
      // a per-part tolerance (tolerances.overrides["nodeId.param"]) wins over the chain's default
      const overrides = (chain.tolerances as { overrides?: Record<string, number> }).overrides ?? {};
      const tolerance = overrides[`${node.id}.${c.source}`] ?? (c.type === "resistor" ? chain.tolerances.resistor : chain.tolerances.capacitor);
      const series = seriesForTolerance(tolerance);
      count[c.type] += 1;
      lines.push({
        ref: `${c.type === "resistor" ? "R" : "C"}${count[c.type]}`,
        type: c.type,
        value: c.value,
        standard: nearestPreferred(c.value, series),
        series,
        tolerance,
        nodeId: node.id,
        stage: nodeTitle(node),
        param: c.param,
      });
    }
    if (isOpAmpKind(node.kind)) {
      const key = ("part" in node ? node.part : null) ?? null;
      const mapKey = key ?? "\u0000ideal";
      let g = opAmpByPart.get(mapKey);
      if (!g) {
        const label = key ? chain.parts[key]?.label : undefined;
        g = { part: key, model: key ? (label ? `${label} (${key})` : key) : "ideal op-amp (no model chosen)", refs: [], stages: [], quantity: 0 };
        opAmpByPart.set(mapKey, g);
      }
      for (let k = OPAMPS_PER_STAGE[node.kind] ?? 1; k > 0; k--) {
        u += 1;
        g.refs.push(`U${u}`);
        g.quantity += 1;
      }
      g.stages.push(nodeTitle(node));
    }
  }
  return { lines, groups: groupByValue(lines), opAmps: [...opAmpByPart.values()] };
}

/** Same type, value (to 1e-9 relative, so 10e3 and 1e4 typed differently still meet) and tolerance. */
function groupByValue(lines: BomLine[]): BomGroup[] {
  const groups: BomGroup[] = [];
  for (const l of lines) {
    const g = groups.find(
      (x) => x.type === l.type && x.tolerance === l.tolerance && Math.abs(x.value - l.value) <= 1e-9 * Math.max(x.value, l.value),
    );
    if (g) {
      g.refs.push(l.ref);
      g.quantity += 1;
    } else groups.push({ type: l.type, value: l.value, standard: l.standard, tolerance: l.tolerance, refs: [l.ref], quantity: 1 });
  }
  return groups.sort((a, b) => (a.type === b.type ? a.value - b.value : a.type === "resistor" ? -1 : 1));
}
