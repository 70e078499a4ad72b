/**
 * The design report's spread summary: what lib/handoff/spread-summary.ts picked from the engine's
 * seeded spread over the chain's tolerances, with how it was made said first. Numbers only formatted
 * here, never computed.
 */
import type { SpreadMetric } from "@/lib/engine/spread";
import type { SpreadSummary } from "@/lib/handoff";
import { fmt, fmtVolts, perUnitName } from "@/components/editor/format";
import { ReportTable, td, tdText } from "./report-table";

const FIGURE_WORDS: Record<SpreadMetric, string> = { dcGain: "DC gain", f0: "corner / f0", q: "Q", margin: "worst margin" };

const minus = (text: string) => text.replace("-", "−");
const volts = (x: number) => minus(fmtVolts(x));

/** A figure as printed: hertz and volts in engineering notation, gains and Q as plain numbers (a Q of 0.7071, not 707.1m). */
export function figureText(metric: SpreadMetric, x: number | null): string {
  if (x === null || !Number.isFinite(x)) return "—";
  if (metric === "f0") return fmt(x, "hertz", 4);
  if (metric === "margin") return volts(x);
  return minus(Math.abs(x) >= 1e-3 && Math.abs(x) < 1e6 ? String(Number(x.toPrecision(4))) : x.toPrecision(4));
}

export const share = (x: number) => `${Number((x * 100).toPrecision(3))} %`;
/** |S|·t as a share; below 0.001 % it only says so (a Q that a resistor moves by 1e-9 % is not moved) */
const effect = (x: number | null) => (x === null || x === 0 ? "—" : x < 1e-5 ? "< 0.001 %" : `± ${share(x)}`);

export function spreadMethod(s: SpreadSummary): string {
  const own = s.tolerances.overrides;
  return (
    `Run when this report was built: ${s.trials} builds (seed ${s.seed}) of the chain, each of its ${s.parts} resistors and capacitors drawn ` +
    `${s.distribution === "uniform" ? "uniformly" : "from a truncated normal"} within its tolerance (resistors ±${share(s.tolerances.resistor)}, ` +
    `capacitors ±${share(s.tolerances.capacitor)}${own ? `, ${own} with ${own === 1 ? "its" : "their"} own` : ""}). ` +
    `Ranges are what these builds reached, not guaranteed bounds; the Spread tab runs more.`
  );
}

/**
 * `gainUnits`: what each stage's DC gain is per (V/V, or V/A and V/C for the front end that takes a
 * photodiode's current or a piezo's charge); the figure's name says it when it is not a plain ratio.
 */
export function SpreadSummaryView({ summary: s, names, gainUnits }: { summary: SpreadSummary; names: Map<string, string>; gainUnits?: Map<string, "V" | "A" | "C"> }) {
  const figureName = (id: string, metric: SpreadMetric) => perUnitName(FIGURE_WORDS[metric], metric === "dcGain" ? (gainUnits?.get(id) ?? "V") : "V");
  const name = (id: string | null) => (id === null ? "—" : (names.get(id) ?? id));
  const rows = s.stages.filter((st) => st.figures.length > 0);
  return (
    <div data-testid="report-spread">
      <p className="text-graphite-700" data-testid="report-spread-method">
        {spreadMethod(s)}
      </p>
      <p className="mt-1" data-testid="report-spread-clip">
        {s.clipCount === 0 ? "No build clips anywhere" : `${share(s.clipShare)} of the builds clip somewhere (${s.clipCount} of ${s.trials})`}
        {s.worstMargin && (
          <>
            ; the worst margin any build reached is {volts(s.worstMargin.min)} at {name(s.worstMargin.nodeId)} (5 % of builds below{" "}
            {volts(s.worstMargin.p5)})
          </>
        )}
        .
      </p>
      {rows.length > 0 && (
        <ReportTable head={["Stage", "Figure", "Nominal", "5 % … 95 %", "Min … max", "Builds clipping"]} testId="report-spread-stages" className="mt-1" wide>
          {rows.flatMap((st) =>
            st.figures.map((f, k) => (
              <tr key={`${st.id}-${f.metric}`} className="report-keep">
                {k === 0 && (
                  <td className={tdText} rowSpan={st.figures.length}>
                    {name(st.id)}
                  </td>
                )}
                <td className={tdText}>{figureName(st.id, f.metric)}</td>
                <td className={td}>{figureText(f.metric, f.nominal)}</td>
                <td className={td}>
                  {figureText(f.metric, f.p5)} … {figureText(f.metric, f.p95)}
                </td>
                <td className={td}>
                  {figureText(f.metric, f.min)} … {figureText(f.metric, f.max)}
                </td>
                {k === 0 && (
                  <td className={td} rowSpan={st.figures.length}>
                    {share(st.clipShare)}
                  </td>
                )}
              </tr>
            )),
          )}
        </ReportTable>
      )}
      {s.top.length > 0 && (
        <>
          <p className="mt-2">Parts whose tolerance moves a figure of their own stage most (|sensitivity| × tolerance):</p>
          <ReportTable head={["Part", "Tolerance", "DC gain", "Corner / f0", "Q", `Worst margin at ${name(s.criticalNode)}`]} testId="report-spread-top" className="mt-1">
            {s.top.map((p) => (
              <tr key={p.key}>
                <td className={tdText}>
                  {name(p.nodeId)} · {p.param}
                </td>
                <td className={td}>± {share(p.tolerance)}</td>
                <td className={td}>{effect(p.effect.dcGain)}</td>
                <td className={td}>{effect(p.effect.f0)}</td>
                <td className={td}>{effect(p.effect.q)}</td>
                <td className={td}>{p.effect.margin ? `± ${fmtVolts(p.effect.margin)}` : "—"}</td>
              </tr>
            ))}
          </ReportTable>
        </>
      )}
      {s.marginPart && (
        <p className="mt-1">
          The worst margin at {name(s.criticalNode)} moves most with {name(s.marginPart.nodeId)} · {s.marginPart.param} (± {fmtVolts(s.marginPart.effect.margin)} over
          its tolerance).
        </p>
      )}
    </div>
  );
}
