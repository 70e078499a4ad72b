/**
 * Headroom rows from the engine's stage and converter results: DC interval, interval with the signal
 * peak, usable range, spare margin and the slew the signal needs. The workspace's table and the design
 * report both read these. Pure.
 */
import type { AdcResult, ChainNode, Interval, NodeKind, StageResult, StageStatus } from "../chain/types";

export interface HeadroomRow {
  id: string;
  name: string;
  kind: NodeKind;
  status: StageStatus | null;
  dcMin: number | null;
  dcMax: number | null;
  peakMin: number | null;
  peakMax: number | null;
  low: number | null;
  high: number | null;
  margin: number | null;
  share: number | null;
  slew: number | null;
}

/**
 * Spare output swing at the tighter end: min(peak.min − usable.low, usable.high − peak.max), in volts
 * and as a share of the usable span. Negative means past the usable swing. Null when unknown.
 */
export function marginOf(stage: Pick<StageResult, "peakOut" | "usable">): { volts: number; share: number } | null {
  const p = stage.peakOut;
  const u = stage.usable;
  if (!p || !u || !(u.high > u.low)) return null;
  const volts = Math.min(p.min - u.low, u.high - p.max);
  return { volts, share: volts / (u.high - u.low) };
}

type AdcFigures = AdcResult & { dcIn?: Interval | null; peakIn?: Interval | null };

/** One row per op-amp stage with a status and per converter, in the order of `nodes`. */
export function headroomRows(
  nodes: readonly ChainNode[],
  stageById: Readonly<Record<string, StageResult | undefined>>,
  adcById: Readonly<Record<string, AdcResult | undefined>>,
): HeadroomRow[] {
  const rows: HeadroomRow[] = [];
  for (const n of nodes) {
    const name = n.label ? `${n.id} ${n.label}` : n.id;
    const s = stageById[n.id];
    if (s && s.status) {
      const m = marginOf(s);
      rows.push({
        id: n.id, name, kind: n.kind, status: s.status,
        dcMin: s.dcOut?.min ?? null, dcMax: s.dcOut?.max ?? null,
        peakMin: s.peakOut?.min ?? null, peakMax: s.peakOut?.max ?? null,
        low: s.usable?.low ?? null, high: s.usable?.high ?? null,
        margin: m?.volts ?? null, share: m?.share ?? null, slew: s.slewNeeded ?? null,
      });
    }
    const a = adcById[n.id] as AdcFigures | undefined;
    if (a && n.kind === "adc") {
      const m = a.peakIn ? marginOf({ peakOut: a.peakIn, usable: { low: n.params.vinLow, high: n.params.vinHigh } }) : null;
      rows.push({
        id: n.id, name, kind: n.kind, status: a.status,
        dcMin: a.dcIn?.min ?? null, dcMax: a.dcIn?.max ?? null,
        peakMin: a.peakIn?.min ?? null, peakMax: a.peakIn?.max ?? null,
        low: n.params.vinLow, high: n.params.vinHigh,
        margin: m?.volts ?? null, share: m?.share ?? null, slew: null,
      });
    }
  }
  return rows;
}
