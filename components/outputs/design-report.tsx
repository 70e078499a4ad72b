/**
 * The design report: everything a reviewer, a technician and a firmware engineer need from one chain,
 * laid out for print (A4 or Letter, report.css). Server-rendered from the engine result; only the
 * response plots are drawn in the browser (ReportPlots).
 */
import type { ReactNode } from "react";
import type { AnalysisResult, Chain } from "@/lib/chain/types";
import { ENGINE_VERSION, stageGainUnits } from "@/lib/engine";
import {
  buildBom,
  buildBringUpSheet,
  buildFirmwareScaling,
  defaultTestFrequencies,
  headroomRows,
  pathCurves,
  reportSpread,
  safetyCalls,
  signalOrder,
  SOURCE_QUANTITY,
  withSpread,
} from "@/lib/handoff";
import { formatQuantity } from "@/lib/units";
import { fmt, fmtVolts } from "@/components/editor/format";
import { StatusMark } from "@/components/ui/status-mark";
import { SafetyCaution } from "@/components/safety-caution";
import { ReviewBadge } from "@/components/review/review-badge";
import { DECISION_WORDS, REVIEW_LOOK } from "@/components/review/review-words";
import { ChainCards } from "./chain-cards";
import { ReportPlots } from "./report-plots";
import { BringUpTable } from "./bring-up-table";
import { ReportTable, td, tdText } from "./report-table";
import { SpreadSummaryView } from "./spread-summary";

export interface ReviewLine {
  reviewer: string;
  requestedBy: string | null;
  decision: string;
  askedRevision: number;
  decidedRevision: number | null;
  decidedAt: string | null;
  note: string;
  closed: string | null;
}

export interface ReportProps {
  chainId: string;
  chain: Chain;
  result: AnalysisResult;
  revision: number | null;
  version: number;
  reviewState: string;
  reviews: ReviewLine[];
  generatedAt: string;
  paper: "a4" | "letter";
}

function Section({ title, children, id }: { title: string; children: ReactNode; id: string }) {
  return (
    <section aria-labelledby={id} className="report-section mt-6">
      <h2 id={id} className="border-b border-paper-rule pb-1 text-[15px] font-semibold text-graphite-950">
        {title}
      </h2>
      <div className="mt-2">{children}</div>
    </section>
  );
}

const v = (x: number | null | undefined) => (x === null || x === undefined ? "—" : fmtVolts(x));

export function DesignReport(p: ReportProps) {
  const { chain, result } = p;
  const order = signalOrder(chain);
  const stageById = Object.fromEntries(result.paths.flatMap((x) => x.stages.map((s) => [s.id, s])));
  const adcById = Object.fromEntries(result.paths.flatMap((x) => (x.adc ? [[x.adc.id, x.adc]] : [])));
  const headroom = headroomRows(order, stageById, adcById);
  const bom = buildBom(chain);
  const sheet = withSpread(chain, buildBringUpSheet(chain, result, defaultTestFrequencies(chain)));
  const scalings = buildFirmwareScaling(chain, result);
  const cautions = safetyCalls(chain);
  const curves = pathCurves(chain, result);
  const spread = reportSpread(chain);
  const names = new Map(chain.nodes.map((n) => [n.id, n.label ? `${n.id} ${n.label}` : n.id]));
  const gainUnits = stageGainUnits(chain.nodes);
  return (
    <article className="design-report mx-auto max-w-[52rem] bg-white text-[12.5px] leading-snug text-graphite-900" data-paper={p.paper} data-testid="design-report">
      <header className="report-keep">
        <p className="text-[11px] uppercase tracking-wide text-graphite-500">Design report</p>
        <h1 className="text-2xl font-semibold tracking-tight text-graphite-950">{chain.name}</h1>
        <p className="mt-1 flex flex-wrap items-center gap-x-3 text-graphite-700">
          <span>Revision {p.revision ?? "—"}</span>
          <span>Version {p.version}</span>
          <ReviewBadge state={p.reviewState} />
          <span>Generated {p.generatedAt} UTC</span>
          <span>Engine {ENGINE_VERSION}</span>
        </p>
      </header>

      {cautions.length > 0 && (
        <aside className="report-keep mt-4 border-2 border-status-clip px-3 py-2" data-testid="report-safety" aria-label="Safety cautions">
          <p className="font-semibold">Safety</p>
          <ul className="list-disc pl-5">
            {cautions.map((c) => (
              <li key={c.nodeId}>
                {c.name} is marked {c.safety === "mains-connected" ? "mains-connected" : "connected to a person"}. Isolation, creepage and
                clearance, leakage currents and the ratings of every part are outside this analysis and must be designed and verified to the
                applicable standard{c.safety === "body-connected" ? " for equipment connected to a person" : ""}.
              </li>
            ))}
          </ul>
          <SafetyCaution />
        </aside>
      )}

      <Section title="Purpose and notes" id="r-notes">
        {chain.notes.trim() ? <p className="whitespace-pre-wrap">{chain.notes}</p> : <p className="text-graphite-500">No notes were written for this chain.</p>}
      </Section>

      <Section title="The chain" id="r-chain">
        <ChainCards chain={chain} />
      </Section>

      <Section title="Response" id="r-response">
        <ReportPlots sets={curves} />
        <p className="report-screen-only mt-1 text-[12px]">
          <a href={`/api/chains/${p.chainId}/outputs/plot-data?table=response`}>Response data (CSV)</a> ·{" "}
          <a href={`/api/chains/${p.chainId}/outputs/plot-data?table=noise`}>Noise density data (CSV)</a>
        </p>
      </Section>

      <Section title="Headroom" id="r-headroom">
        <ReportTable head={["Stage", "Status", "DC min", "DC max", "Peak min", "Peak max", "Usable", "Margin", "Slew needed"]} testId="report-headroom" wide>
          {headroom.map((r) => (
            <tr key={r.id} className="report-keep">
              <td className={tdText}>{r.name}</td>
              <td className={td}>
                <StatusMark status={r.status} className="text-[11.5px]!" />
              </td>
              <td className={td}>{v(r.dcMin)}</td>
              <td className={td}>{v(r.dcMax)}</td>
              <td className={td}>{v(r.peakMin)}</td>
              <td className={td}>{v(r.peakMax)}</td>
              <td className={td}>{r.low === null ? "—" : `${v(r.low)} … ${v(r.high)}`}</td>
              <td className={td}>{r.margin === null ? "—" : `${v(r.margin)} (${((r.share ?? 0) * 100).toFixed(0)} %)`}</td>
              <td className={td}>{fmt(r.slew, "V/s")}</td>
            </tr>
          ))}
        </ReportTable>
      </Section>

      <Section title="Noise budget" id="r-noise">
        {result.paths.map((path) => {
          const end = path.nodes[path.nodes.length - 1];
          const top = [...path.noise.contributions].sort((a, b) => b.rms - a.rms).slice(0, 8);
          return (
            <div key={end} className="report-keep mb-3">
              <p>
                At <b>{names.get(end)}</b>: {fmt(path.noise.outputRms, "volt")} rms from {formatQuantity(path.noise.low, "hertz")} to{" "}
                {formatQuantity(path.noise.high, "hertz")}; {fmt(path.noise.totalRms, "volt")} rms up to fMax.
                {path.adc && (
                  <>
                    {" "}
                    Converter: LSB {fmt(path.adc.lsb, "volt")}, SNR {path.adc.snrDb === null ? "—" : `${path.adc.snrDb.toFixed(1)} dB`}, ENOB{" "}
                    {path.adc.enob === null ? "—" : path.adc.enob.toFixed(2)} bits.
                  </>
                )}
              </p>
              <ReportTable head={["Source of noise", "rms at the end", "Share"]} className="mt-1">
                {top.map((c) => (
                  <tr key={`${c.nodeId}-${c.element}`}>
                    <td className={tdText}>
                      {names.get(c.nodeId) ?? c.nodeId} · {c.element}
                    </td>
                    <td className={td}>{fmt(c.rms, "volt")}</td>
                    <td className={td}>{(c.share * 100).toFixed(1)} %</td>
                  </tr>
                ))}
              </ReportTable>
            </div>
          );
        })}
      </Section>

      <Section title="Spread from tolerances" id="r-spread">
        {spread.ok ? (
          <SpreadSummaryView summary={spread.summary} names={names} gainUnits={gainUnits} />
        ) : (
          <p data-testid="report-spread">The spread over the part tolerances could not be run on this chain: {spread.reason}.</p>
        )}
      </Section>

      <Section title="Warnings" id="r-warnings">
        {result.warnings.length === 0 ? (
          <p>The analysis raised no warnings.</p>
        ) : (
          <ul className="list-disc pl-5" data-testid="report-warnings">
            {result.warnings.map((w, k) => (
              <li key={k} className="report-keep">
                <span className="num text-graphite-500">[{w.code}]</span> {w.message}
              </li>
            ))}
          </ul>
        )}
      </Section>

      <Section title="Bill of materials" id="r-bom">
        <ReportTable head={["Qty", "Designators", "Part", "Nearest standard", "Tolerance"]}>
          {bom.groups.map((g) => (
            <tr key={`${g.type}-${g.value}-${g.tolerance}`}>
              <td className={td}>{g.quantity}</td>
              <td className={td}>{g.refs.join(", ")}</td>
              <td className={td}>
                {g.type} {formatQuantity(g.value, g.type === "resistor" ? "ohm" : "farad")}
              </td>
              <td className={td}>{formatQuantity(g.standard, g.type === "resistor" ? "ohm" : "farad")}</td>
              <td className={td}>{(g.tolerance * 100).toPrecision(2)} %</td>
            </tr>
          ))}
          {bom.opAmps.map((g) => (
            <tr key={g.part ?? "ideal"}>
              <td className={td}>{g.quantity}</td>
              <td className={td}>{g.refs.join(", ")}</td>
              <td className={td}>op-amp: {g.model}</td>
              <td className={td}>—</td>
              <td className={td}>—</td>
            </tr>
          ))}
        </ReportTable>
      </Section>

      <Section title="Bring-up" id="r-bringup">
        <p className="mb-1 text-graphite-700">
          For a sine of {fmt(sheet.sourceAmplitude, "volt")} peak at the source. DC intervals cover the source&apos;s DC spread and each op-amp&apos;s
          offset and bias currents.
        </p>
        <BringUpTable sheet={sheet} />
      </Section>

      <Section title="Converter scaling" id="r-scaling">
        {scalings.map((r) =>
          r.ok ? (
            <p key={r.scaling.adcId} className="report-keep mb-1">
              <b>{names.get(r.scaling.adcId)}</b> ({r.scaling.coupling === "dc" ? "DC-coupled" : `AC-coupled, at ${formatQuantity(r.scaling.scalingFrequency, "hertz")}`}): source {SOURCE_QUANTITY[r.scaling.sourceUnit ?? "V"]} ={" "}
              <span className="num">{r.scaling.sourceVoltsPerCode.toPrecision(6)}</span> × code + <span className="num">{r.scaling.sourceOffsetVolts.toPrecision(6)}</span> {r.scaling.sourceUnit ?? "V"}; zero input
              reads code <span className="num">{r.scaling.zeroInputCode}</span>; group delay {fmt(r.scaling.groupDelay, "second")}
              {r.scaling.measurand && (
                <>
                  ; {r.scaling.measurand.unit || "measurand"} = <span className="num">{r.scaling.measurand.unitsPerCode.toPrecision(6)}</span> × code +{" "}
                  <span className="num">{r.scaling.measurand.unitOffset.toPrecision(6)}</span>
                </>
              )}
              .
            </p>
          ) : (
            <p key={r.adcId}>
              <b>{names.get(r.adcId)}</b>: {r.reason}.
            </p>
          ),
        )}
      </Section>

      <Section title="Review record" id="r-review">
        {p.reviews.length === 0 ? (
          <p>No review request is recorded for this chain; its review state reads {REVIEW_LOOK[p.reviewState]?.word.toLowerCase() ?? p.reviewState}.</p>
        ) : (
          <ReportTable head={["Reviewer", "Asked by", "Revision asked", "Decision", "On revision", "When", "Note"]} testId="report-reviews">
            {p.reviews.map((r, k) => (
              <tr key={k}>
                <td className={tdText}>{r.reviewer}</td>
                <td className={tdText}>{r.requestedBy ?? "—"}</td>
                <td className={td}>{r.askedRevision}</td>
                <td className={tdText}>
                  {DECISION_WORDS[r.decision] ?? r.decision}
                  {r.closed ? ` (closed: ${r.closed})` : ""}
                </td>
                <td className={td}>{r.decidedRevision ?? "—"}</td>
                <td className={td}>{r.decidedAt ?? "—"}</td>
                <td className={tdText}>{r.note || "—"}</td>
              </tr>
            ))}
          </ReportTable>
        )}
      </Section>

      <footer className="mt-6 border-t border-paper-rule pt-2 text-[11px] text-graphite-500">
        <SafetyCaution />
      </footer>
    </article>
  );
}
