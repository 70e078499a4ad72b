"use client";
/**
 * The selected node's own figures from the live analysis: gain, corner (or f0 and Q), DC interval,
 * signal peak, margin to the usable swing and the slew rate the signal needs. For an ADC the converter's
 * figures; for a node not analysed yet, the reason in words.
 */
import type { StageResult } from "@/lib/chain/types";
import { isSourceKind } from "@/lib/chain/types";
import { stageGainPerUnit, transferPerUnit, sourceOutputOf, type TiaStability } from "@/lib/engine/sensors";
import { neighbours } from "@/lib/units/eseries";
import { useEditor, useEditorActions } from "@/lib/store/editor-context";
import type { DraftNode } from "@/lib/store/draft";
import { fmt, fmtDb, fmtGain, fmtVolts } from "./format";
import { RailSpan } from "./rail-span";
import { marginOf, useSourceKind } from "./stage-figures";

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
  const sourceKind = useSourceKind();
  const pathUnit = sourceKind ? transferPerUnit(sourceOutputOf(sourceKind)) : "V";

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
      {stage && <StageFigures stage={stage} railsOf={node.rails} perUnit={stageGainPerUnit(node.kind, sourceKind)} />}
      {stage && <LoopFigures node={node} stage={stage} unstable={!!warnings?.some((w) => w.code === "tia-stability")} />}
      {adc && (
        <dl className="grid grid-cols-[1fr_auto] gap-x-3 gap-y-0.5 text-[12.5px]">
          <Row name="LSB">{fmt(adc.lsb, "volt")}</Row>
          <Row name="Range used">{adc.rangeUse === null ? "—" : `${(adc.rangeUse * 100).toFixed(1)} %`}</Row>
          <Row name="Path DC gain">{fmtGain(adc.pathDcGain, pathUnit)}</Row>
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

function StageFigures({ stage, railsOf, perUnit }: { stage: StageResult; railsOf?: { low: number; high: number }; perUnit: "V" | "A" | "C" }) {
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
        <Row name="DC gain" testId="fig-gain">{fmtGain(stage.dcGain, perUnit)}</Row>
        {typeof stage.bandGain === "number" && Math.abs(stage.bandGain - Math.abs(stage.dcGain ?? 0)) > 1e-3 * stage.bandGain && (
          <Row name="Largest gain in the band" testId="fig-band-gain">{fmtGain(stage.bandGain, perUnit)}</Row>
        )}
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

/**
 * A transimpedance or charge amplifier's loop (the engine's noise-gain construction): phase margin, peaking
 * and the feedback capacitor the common design rule suggests, rounded up to E12. When the stability check
 * fires, one click sets cf to that value (an ordinary, undoable edit).
 */
function LoopFigures({ node, stage, unstable }: { node: DraftNode; stage: StageResult; unstable: boolean }) {
  const readOnly = useEditor((s) => s.readOnly);
  const actions = useEditorActions();
  const stab = (stage as unknown as { stability?: TiaStability }).stability;
  if (!stab) return null;
  const suggested = stab.suggestedCf !== null && stab.suggestedCf > 0 ? neighbours(stab.suggestedCf, "E12").above : null;
  const cf = typeof node.params.cf === "number" ? node.params.cf : 0;
  return (
    <dl className="grid grid-cols-[1fr_auto] gap-x-3 gap-y-0.5 text-[12.5px]" data-testid="loop-figures">
      <Row name="Phase margin" testId="fig-phase-margin">
        {stab.phaseMarginDeg === null ? "— (ideal op-amp)" : `${stab.phaseMarginDeg.toFixed(1)}°`}
      </Row>
      {stab.peakingDb !== null && <Row name="Peaking" testId="fig-peaking">{`${stab.peakingDb.toFixed(1)} dB`}</Row>}
      {stab.crossover !== null && <Row name="Loop crossover">{fmt(stab.crossover, "hertz")}</Row>}
      <Row name="Input capacitance">{fmt(stab.cin, "farad")}</Row>
      {/* below the rule's cf it is a suggestion; above it, the least cf the rule (about 45°) asks for. A charge
          amplifier's cf sets its gain, so there it is shown only when cf is below it. */}
      {suggested !== null && (cf < suggested || node.kind !== "chargeAmp") && (
        <Row name={cf < suggested ? "Suggested cf" : "Least cf for about 45°"} testId="fig-suggested-cf">
          {fmt(suggested, "farad")}
        </Row>
      )}
      {unstable && suggested !== null && suggested > cf && !readOnly && (
        <div className="col-span-2 mt-1">
          <button
            type="button"
            data-testid="use-suggested-cf"
            onClick={() => actions.setParam(node.id, "cf", suggested)}
            className="rounded-card border border-paper-rule bg-paper-raised px-2 py-0.5 text-[12px] hover:bg-paper-sunk"
          >
            Set cf to {fmt(suggested, "farad")}
          </button>
        </div>
      )}
    </dl>
  );
}
