/**
 * The rail span: a horizontal bar from the low rail to the high rail. The usable output swing is the
 * lighter band, the DC interval the solid bar, the DC interval widened by the signal peak the outlined bar.
 * Anything past a rail is pinned to the end with an arrow. The status is a word and a shape beside it.
 */
import { memo } from "react";
import type { Interval, StageStatus } from "@/lib/chain/types";
import { StatusMark, type Status } from "@/components/ui/status-mark";
import { railSpanGeometry, type Segment, type Span } from "./rail-span-geometry";
import { fmtVolts } from "./format";

export interface RailSpanProps {
  rails: Span | null | undefined;
  usable?: Span | null;
  dcOut?: Interval | null;
  peakOut?: Interval | null;
  status?: StageStatus | null;
  /** "rails" for op-amp stages, "input range" for an ADC */
  railsName?: string;
  className?: string;
}

function pct(x: number) {
  return `${(x * 100).toFixed(2)}%`;
}

function Bar({ seg, part, className }: { seg: Segment | null; part: string; className: string }) {
  if (!seg) return null;
  return (
    <span
      data-part={part}
      data-from={seg.from.toFixed(4)}
      data-to={seg.to.toFixed(4)}
      className={`absolute ${className}`}
      style={{ left: pct(seg.from), width: pct(Math.max(seg.to - seg.from, 0.006)) }}
    />
  );
}

const STATUS_TONE: Record<Status, string> = {
  ok: "border-graphite-700",
  tight: "border-status-tight",
  clip: "border-status-clip",
};
const PAST_TONE: Record<Status, string> = { ok: "text-graphite-700", tight: "text-status-tight", clip: "text-status-clip" };

function describeSpan(p: RailSpanProps, status: Status | null): string {
  const r = p.rails!;
  const bits = [`${p.railsName ?? "rails"} ${fmtVolts(r.low)} to ${fmtVolts(r.high)}`];
  if (p.usable) bits.push(`usable ${fmtVolts(p.usable.low)} to ${fmtVolts(p.usable.high)}`);
  if (p.dcOut === null) bits.push("DC unbounded");
  else if (p.dcOut) bits.push(`DC ${fmtVolts(p.dcOut.min)} to ${fmtVolts(p.dcOut.max)}`);
  if (p.peakOut) bits.push(`with signal ${fmtVolts(p.peakOut.min)} to ${fmtVolts(p.peakOut.max)}`);
  bits.push(status ? `status ${status}` : "not analysed");
  return bits.join("; ");
}

export const RailSpan = memo(function RailSpan(props: RailSpanProps) {
  const status: Status | null = props.status ?? null;
  const g = railSpanGeometry(props);
  if (!g) {
    return (
      <div className={`text-[11px] text-graphite-400 ${props.className ?? ""}`} data-testid="rail-span" data-status="none">
        {props.railsName ?? "rails"} not set
      </div>
    );
  }
  const past = (g.peak ?? g.dc);
  const pastLow = g.unbounded || !!past?.pastLow;
  const pastHigh = g.unbounded || !!past?.pastHigh;
  return (
    <div
      className={props.className}
      role="img"
      aria-label={describeSpan(props, status)}
      data-testid="rail-span"
      data-status={status ?? "none"}
    >
      <div className="relative mx-2 h-3.5 rounded-[2px] border border-paper-rule bg-paper-sunk">
        <Bar seg={g.usable} part="usable" className="inset-y-0 bg-paper-raised" />
        {g.zero !== null && <span data-part="zero" className="absolute inset-y-0 w-px bg-graphite-300" style={{ left: pct(g.zero) }} />}
        <Bar seg={g.peak} part="peak" className={`top-[2px] bottom-[2px] rounded-[1px] border ${STATUS_TONE[status ?? "ok"]}`} />
        <Bar seg={g.dc} part="dc" className="top-[4px] bottom-[4px] bg-graphite-900" />
        {g.unbounded && <span data-part="unbounded" className="absolute inset-x-0 top-[5px] bottom-[5px] bg-[repeating-linear-gradient(90deg,var(--color-status-clip)_0_4px,transparent_4px_7px)]" />}
        {pastLow && <span data-part="past-low" className={`absolute -left-2.5 -top-px text-[10px] leading-[14px] ${PAST_TONE[status ?? "ok"]}`} aria-hidden>◂</span>}
        {pastHigh && <span data-part="past-high" className={`absolute -right-2.5 -top-px text-[10px] leading-[14px] ${PAST_TONE[status ?? "ok"]}`} aria-hidden>▸</span>}
      </div>
      <div className="num mt-1 flex items-center justify-between gap-1 text-[10px] leading-3 text-graphite-500">
        <span>{fmtVolts(props.rails!.low)}</span>
        <StatusMark status={status} className="font-sans text-[10.5px]! font-medium text-graphite-900" />
        <span>{fmtVolts(props.rails!.high)}</span>
      </div>
    </div>
  );
});
