/**
 * Small SVG plots for the Spread and Noise budget panels, drawn directly (no plotting library): a
 * log-frequency plot of bands and lines, and a histogram. They draw the numbers they are given and
 * compute none of the figures; only the mapping to pixels happens here.
 */
import type { ReactNode } from "react";

export interface LogBand {
  lo: (number | null)[];
  hi: (number | null)[];
  className: string;
  label: string;
}
export interface LogLine {
  y: (number | null)[];
  className: string;
  label: string;
  dashed?: boolean;
}
/** shaded frequency ranges across the whole height (e.g. the bands that fold into the signal band) */
export interface FreqSpan {
  lo: number;
  hi: number;
}

const W = 520;
const H = 190;
const PAD = { l: 44, r: 8, t: 8, b: 22 };

function finiteRange(values: (number | null)[][]): [number, number] | null {
  let lo = Infinity;
  let hi = -Infinity;
  for (const list of values)
    for (const v of list) {
      if (v === null || !Number.isFinite(v)) continue;
      if (v < lo) lo = v;
      if (v > hi) hi = v;
    }
  return lo <= hi ? [lo, hi] : null;
}

const niceStep = (span: number) => {
  const raw = span / 5;
  const p = 10 ** Math.floor(Math.log10(raw));
  return [1, 2, 5, 10].map((m) => m * p).find((s) => s >= raw) ?? raw;
};

/**
 * A plot over log frequency: bands (filled between lo and hi), lines, and shaded spans. `yLabel` is the
 * axis unit; `floor` limits how far below the top of the data the axis reaches (deep stopbands would
 * squash the interesting part); `logY` plots the values on a log axis (noise densities).
 */
export function LogFreqPlot({
  f,
  bands = [],
  lines = [],
  spans = [],
  yLabel,
  floor,
  logY = false,
  title,
  testId,
}: {
  f: number[];
  bands?: LogBand[];
  lines?: LogLine[];
  spans?: FreqSpan[];
  yLabel: string;
  floor?: number;
  logY?: boolean;
  title: string;
  testId?: string;
}) {
  const tx = (v: number | null) => (v === null || !Number.isFinite(v) ? null : logY ? (v > 0 ? Math.log10(v) : null) : v);
  const bandsT = bands.map((b) => ({ ...b, lo: b.lo.map(tx), hi: b.hi.map(tx) }));
  const linesT = lines.map((l) => ({ ...l, y: l.y.map(tx) }));
  const range = finiteRange([...bandsT.flatMap((b) => [b.lo, b.hi]), ...linesT.map((l) => l.y)]);
  if (!range || f.length < 2) return <p className="p-2 text-[12px] text-graphite-500">Nothing to plot yet.</p>;
  let [ylo, yhi] = range;
  if (floor !== undefined && yhi - ylo > floor) ylo = yhi - floor;
  if (yhi - ylo < 1e-9) {
    yhi += logY ? 0.5 : 1;
    ylo -= logY ? 0.5 : 1;
  }
  const pad = (yhi - ylo) * 0.06;
  ylo -= pad;
  yhi += pad;
  const lx0 = Math.log10(f[0]);
  const lx1 = Math.log10(f[f.length - 1]);
  const X = (fr: number) => PAD.l + ((Math.log10(fr) - lx0) / (lx1 - lx0)) * (W - PAD.l - PAD.r);
  const Y = (v: number) => PAD.t + (1 - (Math.min(yhi, Math.max(ylo, v)) - ylo) / (yhi - ylo)) * (H - PAD.t - PAD.b);
  const path = (ys: (number | null)[]) => {
    let d = "";
    let pen = false;
    ys.forEach((v, k) => {
      if (v === null) {
        pen = false;
        return;
      }
      d += `${pen ? "L" : "M"}${X(f[k]).toFixed(1)},${Y(v).toFixed(1)}`;
      pen = true;
    });
    return d;
  };
  const area = (lo: (number | null)[], hi: (number | null)[]) => {
    const top: string[] = [];
    const bottom: string[] = [];
    f.forEach((fr, k) => {
      const a = lo[k];
      const b = hi[k];
      if (a === null || b === null) return;
      top.push(`${X(fr).toFixed(1)},${Y(b).toFixed(1)}`);
      bottom.push(`${X(fr).toFixed(1)},${Y(a).toFixed(1)}`);
    });
    return top.length ? `M${top.join("L")}L${bottom.reverse().join("L")}Z` : "";
  };
  const decades: number[] = [];
  for (let d = Math.ceil(lx0); d <= Math.floor(lx1); d++) decades.push(d);
  const step = logY ? 1 : niceStep(yhi - ylo);
  const yTicks: number[] = [];
  for (let v = Math.ceil(ylo / step) * step; v <= yhi; v += step) yTicks.push(v);
  const fLabel = (d: number) => {
    const v = 10 ** d;
    return v >= 1e6 ? `${v / 1e6}M` : v >= 1e3 ? `${v / 1e3}k` : `${v}`;
  };
  const yText = (v: number) => (logY ? `1e${Math.round(v)}` : `${Math.round(v * 10) / 10}`.replace("-", "−"));
  return (
    <figure className="m-0" data-testid={testId}>
      <svg viewBox={`0 0 ${W} ${H}`} className="h-auto w-full max-w-[560px]" role="img" aria-label={title}>
        <rect x={PAD.l} y={PAD.t} width={W - PAD.l - PAD.r} height={H - PAD.t - PAD.b} className="fill-paper-raised stroke-paper-rule" />
        {spans.map((s, i) => {
          const a = Math.max(s.lo, f[0]);
          const b = Math.min(s.hi, f[f.length - 1]);
          if (!(b > a)) return null;
          return <rect key={i} x={X(a)} y={PAD.t} width={Math.max(0.8, X(b) - X(a))} height={H - PAD.t - PAD.b} className="fill-status-tight/15" data-span />;
        })}
        {decades.map((d) => (
          <g key={d}>
            <line x1={X(10 ** d)} x2={X(10 ** d)} y1={PAD.t} y2={H - PAD.b} className="stroke-paper-rule" strokeWidth={0.6} />
            <text x={X(10 ** d)} y={H - 8} textAnchor="middle" className="fill-graphite-500 text-[9px]">
              {fLabel(d)}
            </text>
          </g>
        ))}
        {yTicks.map((v) => (
          <g key={v}>
            <line x1={PAD.l} x2={W - PAD.r} y1={Y(v)} y2={Y(v)} className="stroke-paper-rule" strokeWidth={0.6} />
            <text x={PAD.l - 4} y={Y(v) + 3} textAnchor="end" className="fill-graphite-500 text-[9px]">
              {yText(v)}
            </text>
          </g>
        ))}
        <text x={4} y={PAD.t + 8} className="fill-graphite-500 text-[9px]">
          {yLabel}
        </text>
        {bandsT.map((b) => (
          <path key={b.label} d={area(b.lo, b.hi)} className={b.className} data-band={b.label} />
        ))}
        {linesT.map((l) => (
          <path key={l.label} d={path(l.y)} className={`fill-none ${l.className}`} strokeWidth={1.3} strokeDasharray={l.dashed ? "4 3" : undefined} data-line={l.label} />
        ))}
      </svg>
      <figcaption className="flex flex-wrap gap-x-3 text-[11px] text-graphite-700">
        {bands.map((b) => (
          <Key key={b.label} className={b.className} label={b.label} />
        ))}
        {lines.map((l) => (
          <Key key={l.label} className={l.className} label={l.label} line />
        ))}
      </figcaption>
    </figure>
  );
}

function Key({ className, label, line }: { className: string; label: string; line?: boolean }): ReactNode {
  return (
    <span className="inline-flex items-center gap-1">
      <svg width="14" height="8" aria-hidden>
        {line ? <line x1="0" x2="14" y1="4" y2="4" className={className} strokeWidth={2} /> : <rect width="14" height="8" className={className} />}
      </svg>
      {label}
    </span>
  );
}

/** A histogram of counts in equal bins between lo and hi, with the nominal value marked. */
export function Histogram({
  counts,
  lo,
  hi,
  nominal,
  label,
  format,
  testId,
}: {
  counts: number[];
  lo: number;
  hi: number;
  nominal: number | null;
  label: string;
  format: (v: number) => string;
  testId?: string;
}) {
  const w = 220;
  const h = 78;
  const max = Math.max(1, ...counts);
  const bw = counts.length ? (w - 8) / counts.length : 0;
  const nx = nominal !== null && hi > lo ? 4 + ((nominal - lo) / (hi - lo)) * (w - 8) : null;
  return (
    <figure className="m-0" data-testid={testId}>
      <figcaption className="text-[11px] font-medium text-graphite-900">{label}</figcaption>
      <svg viewBox={`0 0 ${w} ${h}`} className="h-auto w-full max-w-[240px]" role="img" aria-label={`Histogram of ${label}`}>
        {counts.map((c, i) => (
          <rect key={i} x={4 + i * bw + 0.5} width={Math.max(0.5, bw - 1)} y={h - 14 - (c / max) * (h - 20)} height={(c / max) * (h - 20)} className="fill-accent-700/70" data-bar />
        ))}
        {nx !== null && nx >= 0 && nx <= w && <line x1={nx} x2={nx} y1={2} y2={h - 14} className="stroke-graphite-950" strokeDasharray="2 2" />}
        <text x={4} y={h - 3} className="fill-graphite-500 text-[9px]">
          {format(lo)}
        </text>
        <text x={w - 4} y={h - 3} textAnchor="end" className="fill-graphite-500 text-[9px]">
          {format(hi)}
        </text>
      </svg>
    </figure>
  );
}
