"use client";
/**
 * The cards on the canvas. Not a circuit drawing: a pictogram of the topology, the key values in
 * engineering notation, and for op-amp stages and converters the rail span with its status in words.
 * Each card reads its own analysis figures from the store by id.
 */
import { memo } from "react";
import { Handle, Position, type NodeProps } from "@xyflow/react";
import { isSourceKind, type NodeKind } from "@/lib/chain/types";
import { cx } from "@/components/ui/cx";
import { useEditor } from "@/lib/store/editor-context";
import { STAGE_CATALOG, paramRule, paramUnit } from "@/lib/store/stage-catalog";
import type { AdcResult, StageResult } from "@/lib/chain/types";
import type { StageFlowNode } from "./flow-types";
import { Pictogram } from "./pictograms";
import { RailSpan } from "./rail-span";
import { fmt, fmtCompact, fmtGainValue } from "./format";
import { useSourceKind } from "./stage-figures";
import { stageGainPerUnit } from "@/lib/engine/sensors";

type CardProps = NodeProps<StageFlowNode>;

/** Params the node still needs before it can be analysed (draft level), by name. */
function missingOf(kind: NodeKind, data: StageFlowNode["data"]): string[] {
  const spec = STAGE_CATALOG[kind];
  const out = spec.fields.filter((f) => paramRule(kind, f.key)?.required && data.params[f.key] === undefined).map((f) => f.key);
  if (spec.opAmp && !data.rails) out.push("rails");
  return out;
}

function CardShell({ props, children, status }: { props: CardProps; children: React.ReactNode; status?: string | null }) {
  const kind = props.type as NodeKind;
  const spec = STAGE_CATALOG[kind];
  const title = props.data.label || spec.title;
  const missing = missingOf(kind, props.data);
  return (
    <div
      className={cx(
        "w-[184px] rounded-card border bg-paper-raised px-2.5 pb-2 pt-1.5 text-graphite-900 shadow-card",
        props.selected ? "border-accent-600 ring-2 ring-accent-100" : "border-paper-rule",
        status === "clip" && "border-l-4 border-l-status-clip",
        status === "tight" && "border-l-4 border-l-status-tight",
      )}
      data-testid={`card-${props.id}`}
      data-status={status ?? "none"}
      aria-label={`${title}, ${spec.title}, ${props.id}${status ? `, status ${status}` : ""}`}
    >
      {!isSourceKind(kind) && <Handle type="target" position={Position.Left} className="!h-3 !w-3 !border-graphite-500 !bg-paper-raised" />}
      <div className="flex items-start gap-1.5">
        <Pictogram kind={kind} className="mt-0.5 shrink-0 text-graphite-700" />
        <div className="min-w-0 flex-1">
          <div className="truncate text-[12.5px] font-semibold leading-4 text-graphite-950">{title}</div>
          <div className="num truncate text-[10.5px] leading-4 text-graphite-500">
            {props.id}
            {props.data.label ? ` · ${spec.title}` : ""}
          </div>
        </div>
      </div>
      {children}
      {missing.length > 0 && (
        <p className="mt-1 text-[10.5px] text-status-tight">
          <span aria-hidden>▲ </span>needs {missing.join(", ")}
        </p>
      )}
      {kind !== "adc" && <Handle type="source" position={Position.Right} className="!h-3 !w-3 !border-graphite-500 !bg-paper-raised" />}
    </div>
  );
}

function Values({ kind, params }: { kind: NodeKind; params: StageFlowNode["data"]["params"] }) {
  const spec = STAGE_CATALOG[kind];
  return (
    <dl className="num mt-1 grid grid-cols-2 gap-x-2 text-[11px] leading-4">
      {spec.cardFields.map(([key, short]) => {
        const v = params[key];
        return (
          <div key={key} className="flex min-w-0 justify-between gap-1">
            <dt className="text-graphite-500">{short}</dt>
            <dd className="text-graphite-950">{typeof v === "number" ? fmtCompact(v, paramUnit(kind, key)) : v === null ? "none" : "—"}</dd>
          </div>
        );
      })}
    </dl>
  );
}

/**
 * Until the chain's first analysis is back, a card keeps room for the lines the analysis fills (an empty
 * line of the same height), so the cards do not grow and shift under the pointer when the figures arrive.
 */
const useFirstAnalysisPending = () => useEditor((s) => s.live === null);

function StageLine({ stage, pending }: { stage: StageResult | undefined; pending: boolean }) {
  const sourceKind = useSourceKind();
  if (!stage) return pending ? <p aria-hidden className="num invisible mt-1 text-[10.5px]">gain</p> : null;
  // a front end's gain is per ampere or coulomb of the sensor (a TIA's −800 kV/A)
  const per = stageGainPerUnit(stage.kind, sourceKind);
  // a stage that blocks DC (high-pass, charge amplifier) is shown by what it does in the band
  const inBand = stage.dcGain === 0 && typeof stage.bandGain === "number" && stage.bandGain > 0 ? stage.bandGain : null;
  const gain =
    stage.dcGain === null
      ? "DC gain unbounded"
      : inBand !== null
        ? `in band ${fmtGainValue(inBand, per)}`
        : per !== "V" && stage.dcGain !== 0
          ? `gain ${fmtGainValue(stage.dcGain, per)}`
          : `gain ${fmtGainValue(stage.dcGain, "V", 3)}`;
  const corner = stage.f0 === null ? "" : stage.q === null ? ` · fc ${fmt(stage.f0, "hertz")}` : ` · f0 ${fmt(stage.f0, "hertz")} Q ${stage.q.toFixed(2)}`;
  return <p className="num mt-1 text-[10.5px] text-graphite-700">{gain + corner}</p>;
}

const OpAmpCard = memo(function OpAmpCard(props: CardProps) {
  const stage = useEditor((s) => s.live?.stageById[props.id]);
  const pending = useFirstAnalysisPending();
  return (
    <CardShell props={props} status={stage?.status}>
      <Values kind={props.type as NodeKind} params={props.data.params} />
      <StageLine stage={stage} pending={pending} />
      <RailSpan
        className="mt-1.5"
        rails={props.data.rails}
        usable={stage?.usable}
        dcOut={stage ? stage.dcOut : undefined}
        peakOut={stage ? stage.peakOut : undefined}
        status={stage?.status ?? null}
      />
    </CardShell>
  );
});

const PassiveCard = memo(function PassiveCard(props: CardProps) {
  const stage = useEditor((s) => s.live?.stageById[props.id]);
  const pending = useFirstAnalysisPending();
  return (
    <CardShell props={props}>
      <Values kind={props.type as NodeKind} params={props.data.params} />
      <StageLine stage={stage} pending={pending} />
      {stage?.dcOut !== undefined ? (
        <p className="num mt-0.5 text-[10.5px] text-graphite-500">
          DC {stage.dcOut ? `${fmt(stage.dcOut.min, "volt")} … ${fmt(stage.dcOut.max, "volt")}` : "unbounded"}
        </p>
      ) : (
        pending && <p aria-hidden className="num invisible mt-0.5 text-[10.5px]">DC</p>
      )}
    </CardShell>
  );
});

const SAFETY_SHORT: Record<string, string> = { "mains-connected": "mains-connected", "body-connected": "on a person" };

const SourceCard = memo(function SourceCard(props: CardProps) {
  const safety = props.data.params.safety as string | undefined;
  return (
    <CardShell props={props}>
      <Values kind={props.type as NodeKind} params={props.data.params} />
      {safety && safety !== "low-voltage" && (
        <p className="mt-1 rounded bg-[#f5eddf] px-1.5 py-0.5 text-[10.5px] font-medium text-graphite-900" data-testid="card-safety">
          <span aria-hidden className="text-status-tight">▲ </span>
          {SAFETY_SHORT[safety] ?? safety}: see the caution
        </p>
      )}
    </CardShell>
  );
});

const AdcCard = memo(function AdcCard(props: CardProps) {
  const adc = useEditor((s) => s.live?.adcById[props.id]) as (AdcResult & { dcIn?: StageResult["dcOut"]; peakIn?: StageResult["peakOut"] }) | undefined;
  const pending = useFirstAnalysisPending();
  const p = props.data.params;
  const range = typeof p.vinLow === "number" && typeof p.vinHigh === "number" && p.vinLow < p.vinHigh ? { low: p.vinLow, high: p.vinHigh } : null;
  return (
    <CardShell props={props} status={adc?.status}>
      <Values kind="adc" params={p} />
      {adc ? (
        <p className="num mt-1 text-[10.5px] text-graphite-700">
          {adc.rangeUse === null ? "range use —" : `uses ${(adc.rangeUse * 100).toFixed(0)} % of range`}
          {adc.enob !== null && ` · ENOB ${adc.enob.toFixed(1)}`}
        </p>
      ) : (
        pending && <p aria-hidden className="num invisible mt-1 text-[10.5px]">range</p>
      )}
      <RailSpan
        className="mt-1.5"
        railsName="input range"
        rails={range}
        dcOut={adc ? (adc.dcIn ?? null) : undefined}
        peakOut={adc ? (adc.peakIn ?? null) : undefined}
        status={adc?.status ?? null}
      />
    </CardShell>
  );
});

/** One component per kind, at module scope so React Flow never sees a new map. */
export const nodeTypes = {
  source: SourceCard,
  inverting: OpAmpCard,
  noninverting: OpAmpCard,
  lossyIntegrator: OpAmpCard,
  integrator: OpAmpCard,
  sallenKeyLowpass: OpAmpCard,
  mfbLowpass: OpAmpCard,
  sallenKeyHighpass: OpAmpCard,
  mfbHighpass: OpAmpCard,
  rcLowpass: PassiveCard,
  rcHighpass: PassiveCard,
  adc: AdcCard,
  bridge: SourceCard,
  photodiode: SourceCard,
  piezo: SourceCard,
  thermocouple: SourceCard,
  transimpedance: OpAmpCard,
  chargeAmp: OpAmpCard,
  differenceAmp: OpAmpCard,
  inAmp: OpAmpCard,
} satisfies Record<NodeKind, React.ComponentType<CardProps>>;

