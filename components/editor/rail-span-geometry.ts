/**
 * Where the marks of a rail span fall, as fractions 0..1 of the bar's width. The bar runs from the low rail
 * to the high rail; anything beyond a rail is pinned to the end and flagged, so a stage that swings far
 * outside its supply still reads as "past the rail" without squashing the rest of the bar.
 */
import type { Interval } from "@/lib/chain/types";

export interface Span {
  low: number;
  high: number;
}

export interface RailSpanInput {
  /** the rails (op-amp) or the input range (ADC) */
  rails: Span | null | undefined;
  /** output swing the part can reach; defaults to the rails */
  usable?: Span | null;
  /** DC interval; null = unbounded (no DC path) */
  dcOut?: Interval | null;
  /** DC interval widened by the AC peak; null = unbounded */
  peakOut?: Interval | null;
}

export interface Segment {
  from: number;
  to: number;
  /** the interval runs past the low / high end of the bar */
  pastLow: boolean;
  pastHigh: boolean;
}

export interface RailSpanGeometry {
  usable: Segment | null;
  dc: Segment | null;
  peak: Segment | null;
  /** the DC interval is unknown because it is unbounded */
  unbounded: boolean;
  /** where 0 V falls, when it lies between the rails */
  zero: number | null;
  /** spare output span at the tighter end, as a share of the usable span (negative: beyond it) */
  spare: number | null;
}

export function railSpanGeometry(input: RailSpanInput): RailSpanGeometry | null {
  const rails = input.rails;
  if (!rails || !Number.isFinite(rails.low) || !Number.isFinite(rails.high) || rails.high <= rails.low) return null;
  const width = rails.high - rails.low;
  const frac = (v: number) => (v - rails.low) / width;
  const seg = (iv: { min: number; max: number } | Span | null | undefined): Segment | null => {
    if (!iv) return null;
    const lo = "min" in iv ? iv.min : iv.low;
    const hi = "max" in iv ? iv.max : iv.high;
    if (!Number.isFinite(lo) || !Number.isFinite(hi)) return null;
    const a = frac(Math.min(lo, hi));
    const b = frac(Math.max(lo, hi));
    return { from: clamp01(a), to: clamp01(b), pastLow: a < 0, pastHigh: b > 1 };
  };
  const usableSpan = input.usable ?? rails;
  const peak = input.peakOut ?? input.dcOut ?? null;
  let spare: number | null = null;
  const uw = usableSpan.high - usableSpan.low;
  if (peak && uw > 0) spare = Math.min(peak.min - usableSpan.low, usableSpan.high - peak.max) / uw;
  return {
    usable: seg(usableSpan),
    dc: seg(input.dcOut),
    peak: seg(input.peakOut),
    unbounded: input.dcOut === null,
    zero: rails.low < 0 && rails.high > 0 ? frac(0) : null,
    spare,
  };
}

function clamp01(x: number) {
  return x < 0 ? 0 : x > 1 ? 1 : x;
}
