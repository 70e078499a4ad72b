"use client";
/**
 * The selected node's own figures from the live analysis: gain, corner (or f0 and Q), DC interval,
 * signal peak, margin to the usable swing and the slew rate the signal needs. For an ADC the converter's
 * figures; for a node not analysed yet, the reason in words.
 */
import type { StageResult } from "@/lib/chain/types";
import { isSourceKind } from "@/lib/chain/types";
import { useEditor } from "@/lib/store/editor-context";
import type { DraftNode } from "@/lib/store/draft";
import { fmt, fmtDb, fmtGain, fmtVolts } from "./format";
import { RailSpan } from "./rail-span";
import { marginOf } from "./stage-figures";

function Row({ name, children, testId }: { name: string; children: React.ReactNode; testId?: string }) {
  return (
    <div className="contents">
      <dt className="text-graphite-500">{name}</dt>
      <dd className="num text-right text-graphite-950" data-testid={testId}>
        {children}
      </dd>
    </div>
  );
}

const interval = (iv: { min: number; max: number } | null | undefined) =>
  iv === null ? "unbounded" : iv ? `${fmtVolts(iv.min)} … ${fmtVolts(iv.max)}` : "—";

export function StageNumbers({ node }: { node: DraftNode }) {
  const stage = useEditor((s) => s.live?.stageById[node.id]);
  const adc = useEditor((s) => s.live?.adcById[node.id]);
  const reason = useEditor((s) => s.live?.reasonById[node.id]);
  const warnings = useEditor((s) => s.live?.warningsByNode[node.id]);

  if (isSourceKind(node.kind)) return null;
  if (!stage && !adc) {
    return (
      <section className="border-t border-paper-rule pt-2 text-[12px] text-graphite-500" data-testid="stage-numbers">
        <h3 className="mb-1 text-[12px] font-semibold uppercase tracking-wide">Figures</h3>
        {reason ?? "Not analysed yet."}
      </section>
    );
  }
  return (
    <section className="flex flex-col gap-2 border-t border-paper-rule pt-2" data-testid="stage-numbers">
      <h3 className="text-[12px] font-semibold uppercase tracking-wide text-graphite-500">Figures</h3>
      {stage && <StageFigures stage={stage} railsOf={node.rails} />}
      {adc && (
        <dl className="grid grid-cols-[1fr_auto] gap-x-3 gap-y-0.5 text-[12.5px]">
          <Row name="LSB">{fmt(adc.lsb, "volt")}</Row>
          <Row name="Range used">{adc.rangeUse === null ? "—" : `${(adc.rangeUse * 100).toFixed(1)} %`}</Row>
          <Row name="Path DC gain">{fmtGain(adc.pathDcGain)}</Row>
          <Row name="Alias attenuation">{fmtDb(adc.aliasAttenuationDb)}</Row>
          <Row name="Ideal SNR">{fmtDb(adc.idealSnrDb)}</Row>
          <Row name="SNR">{fmtDb(adc.snrDb)}</Row>
          <Row name="ENOB">{adc.enob === null ? "—" : `${adc.enob.toFixed(2)} bits`}</Row>
        </dl>
      )}
      {warnings && warnings.length > 0 && (
        <ul className="flex flex-col gap-1 text-[12px] text-graphite-700">
          {warnings.map((w, i) => (
            <li key={i} className="rounded-card bg-paper-sunk px-2 py-1">
              <span className="font-medium">{w.code}</span>: {w.message}
            </li>
          ))}
        </ul>
      )}
    </section>
  );
}

function StageFigures({ stage, railsOf }: { stage: StageResult; railsOf?: { low: number; high: number } }) {
  const margin = marginOf(stage);
  const slew = stage.slewNeeded;
  return (
    <>
      {stage.usable && (
        <RailSpan
          rails={railsOf ?? stage.usable}
          usable={stage.usable}
          dcOut={stage.dcOut}
          peakOut={stage.peakOut}
          status={stage.status ?? null}
        />
      )}
      <dl className="grid grid-cols-[1fr_auto] gap-x-3 gap-y-0.5 text-[12.5px]">
        <Row name="DC gain" testId="fig-gain">{fmtGain(stage.dcGain)}</Row>
        {stage.f0 !== null && (
          <Row name={stage.q === null ? "Corner" : "f0 · Q"} testId="fig-f0q">
            {fmt(stage.f0, "hertz")}
            {stage.q !== null && ` · ${stage.q.toFixed(3)}`}
          </Row>
        )}
        <Row name="DC out" testId="fig-dc">{interval(stage.dcOut)}</Row>
        <Row name="Signal peak">{stage.acPeak === null ? "—" : `± ${fmtVolts(stage.acPeak)}`}</Row>
        <Row name="With signal">{interval(stage.peakOut)}</Row>
        {stage.usable && <Row name="Usable">{`${fmtVolts(stage.usable.low)} … ${fmtVolts(stage.usable.high)}`}</Row>}
        {margin && (
          <Row name="Margin" testId="fig-margin">
            {`${fmtVolts(margin.volts)} (${(margin.share * 100).toFixed(0)} %)`}
          </Row>
        )}
        {slew !== undefined && (
          <Row name="Slew needed">
            {fmt(slew, "V/s")}
            {typeof stage.slewRate === "number" && ` of ${fmt(stage.slewRate, "V/s")}`}
          </Row>
        )}
      </dl>
    </>
  );
}
