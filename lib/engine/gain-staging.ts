/**
 * Gain-staging advisor for one path ending at a converter: how to split the gain between the stages, and
 * where to shift a reference, so that every stage stays clear of its rails by a chosen margin and the
 * converter's range is used as fully as that margin allows.
 *
 * Planning model (ideal, DC plus passband): the signal at a point is a centre c, a DC half-width d (the
 * source's dcSpread, scaled) and an AC peak a. A gain stage of gain g and sign s (−1 inverting, lossy
 * integrator, MFB; +1 non-inverting) maps c → s·g·c + (1 − s·g)·vref [the DC forms of chain-format.md:
 * inverting −(r2/r1)(Vin − vref) + vref, non-inverting (1 + rf/rg)Vin − (rf/rg)vref], d → g·d, a → g·a.
 * Sallen-Key and RC low-pass sections pass all three; an RC high-pass sets c to its vbias and d to 0.
 * The front-end stages add their reference at unity instead: an instrumentation or difference amplifier
 * (gain g = 1 + 2·rf/rg or r2/r1, sign +1) maps the differential c → g·c + vref [chain-format additions,
 * lib/chain/README.md]; a transimpedance stage (fixed here) c → −rf·c + (1 + rf/rsh)·vref, rsh the
 * sensor's shunt from (−) to ground, and a charge amplifier (fixed) passes no charge at DC:
 * c → (1 + rf/rsh)·vref, d → 0, a → a/cf.
 * An in-amp's gain is also capped by its input stage: those outputs sit at vcm ± g·Vd/2 and must keep to
 * the same window as the stage's output.
 * Every stage's window is its usable output (rails less the part's swing) shrunk by the margin (a share of
 * its span) on each side; the converter's window is its input range shrunk the same way.
 *
 * Rule (common practice: gain early for noise, never past a rail): walking the path, each adjustable stage
 * takes the gain still needed to fill the converter's window, but no more than its own window — and the
 * windows of the unity stages after it, up to the next adjustable stage — allows; its vref (kept inside its
 * rails) centres its output in that window, or, for the last adjustable stage, in the converter's window.
 * A high-pass after the last adjustable stage gets its vbias at the converter's centre.
 *
 * The plan is then realised with standard values (`solveStage`: lossy integrators and MFB sections keep
 * their f0 and Q) and checked with the full engine (`analyzeChain`: part offsets, bias currents, the real
 * frequency response). If a stage or the converter still comes inside its margin, the plan is redone with
 * that window shrunk by the excess, up to a few rounds.
 */
import { chainSource, sourceSignal } from "./sensors";
import type { AnalysisResult, Chain, ChainNode, OpAmpNode, StageResult } from "../chain/types";
import { analyzeChain } from "./analyze";
import { solveStage, type SolvableKind, type SolvedParams } from "./solve";
import { idealCharacteristics, sallenKeyGain } from "./ideal";
import { nearestPreferred, neighbours } from "../units/eseries";

/** Sections that block DC: the output's DC level is their vbias / vref, whatever comes in. */
const DC_BLOCKING = new Set(["rcHighpass", "sallenKeyHighpass", "mfbHighpass"]);

export interface AdviceOptions {
  /** the converter the path ends at (default: the first path that ends at an ADC) */
  adcId?: string;
  /** share of each stage's usable span (and of the converter's span) kept clear on each side; default 0.1 */
  margin?: number;
  /** the converter range use the advice must reach (0…1); default 0.7 */
  targetRangeUse?: number;
}

export interface SplitStage {
  id: string;
  label: string;
  kind: string;
  /** signed passband gain of the stage (V/V), null for the source and converter */
  gain: number | null;
  vref: number | null;
  status: string | null;
  /** volts to spare at each end of the usable output; null when unknown (unbounded, passive) */
  margins: { low: number; high: number } | null;
}

export interface SplitFigures {
  stages: SplitStage[];
  /** the engine's ADC range use (peak-to-peak input interval over the converter span) */
  rangeUse: number | null;
  /** stages (and the converter) whose status is clip */
  clips: string[];
  /** the smallest spare as a share of its usable span, over the op-amp stages */
  worstHeadroom: number | null;
  /** V rms at the converter input over the analysis noise band */
  noiseRms: number | null;
  /** the same referred to the source (over the path's passband gain), V rms */
  inputNoiseRms: number | null;
  snrDb: number | null;
}

export interface StageEdit {
  id: string;
  /** params to set (only what changes) */
  params: Record<string, number | null>;
  /** plain words: "gain 500 → 252.6, vref 0 → 12.05 mV" */
  summary: string;
}

export interface GainAdvice {
  adcId: string;
  path: string[];
  margin: number;
  targetRangeUse: number;
  current: SplitFigures;
  advised: SplitFigures;
  edits: StageEdit[];
  /** the chain with the edits applied */
  chain: Chain;
  /** extra recommendations (AC coupling) */
  notes: string[];
  /** null when the advice meets every check; otherwise the constraint that stops it, in words */
  problem: string | null;
  /** rounds of plan → realise → check */
  rounds: number;
}

type GainNode = Extract<ChainNode, { kind: "inverting" | "noninverting" | "lossyIntegrator" | "mfbLowpass" | "inAmp" | "differenceAmp" }>;
const GAIN_KINDS = new Set(["inverting", "noninverting", "lossyIntegrator", "mfbLowpass", "inAmp", "differenceAmp"]);
const isGainNode = (n: ChainNode): n is GainNode => GAIN_KINDS.has(n.kind);
/** Stages whose reference reaches the output at unity (a reference pin), not through the gain network. */
const REF_AT_UNITY = new Set(["inAmp", "differenceAmp"]);
const signOf = (n: GainNode) => (n.kind === "noninverting" || REF_AT_UNITY.has(n.kind) ? 1 : -1);
/** k in the DC form c → s·g·c + k·vref */
const refCoefficient = (n: GainNode, g: number) => (REF_AT_UNITY.has(n.kind) ? 1 : 1 - signOf(n) * g);
/** stages whose gain cannot go below 1 (a follower at most) */
const atLeastUnity = (n: GainNode) => n.kind === "noninverting" || n.kind === "inAmp";

function stageGain(n: ChainNode): number | null {
  switch (n.kind) {
    case "inverting":
    case "lossyIntegrator":
    case "mfbLowpass":
      return -n.params.r2 / n.params.r1;
    case "noninverting":
      return n.params.rf == null || n.params.rg == null ? 1 : 1 + n.params.rf / n.params.rg;
    case "sallenKeyLowpass":
    case "sallenKeyHighpass":
      return sallenKeyGain(n.params); // passband K = 1 + rf/rg
    case "mfbHighpass":
      return -n.params.c1 / n.params.c2; // H(∞)
    case "inAmp":
      return 1 + (2 * n.params.rf) / n.params.rg;
    case "differenceAmp":
      return n.params.r2 / n.params.r1;
    case "transimpedance":
      return -n.params.rf; // V/A
    case "chargeAmp":
      return -1 / n.params.cf; // V/C above its low corner
    case "source":
    case "adc":
      return null;
    default:
      return 1;
  }
}

interface Window {
  lo: number;
  hi: number;
}
const shrink = (lo: number, hi: number, m: number): Window => ({ lo: lo + m * (hi - lo), hi: hi - m * (hi - lo) });
const meet = (a: Window, b: Window): Window => ({ lo: Math.max(a.lo, b.lo), hi: Math.min(a.hi, b.hi) });

function usableOf(chain: Chain, n: ChainNode): Window | null {
  if (!("rails" in n) || !n.rails) return null;
  const part = (n as OpAmpNode).part ? chain.parts[(n as OpAmpNode).part as string] : undefined;
  return { lo: n.rails.low + (part?.swingLow ?? 0), hi: n.rails.high - (part?.swingHigh ?? 0) };
}

const fmtV = (v: number) => {
  const a = Math.abs(v);
  if (a !== 0 && a < 1) return `${Number((v * 1e3).toPrecision(4))} mV`;
  return `${Number(v.toPrecision(4))} V`;
};
const fmtG = (g: number) => Number(g.toPrecision(4)).toString();

function figures(chain: Chain, res: AnalysisResult, adcId: string): SplitFigures {
  const path = res.paths.find((p) => p.nodes[p.nodes.length - 1] === adcId)!;
  const byId = new Map(chain.nodes.map((n) => [n.id, n]));
  const stages: SplitStage[] = [];
  const clips: string[] = [];
  let worst: number | null = null;
  for (const st of path.stages as StageResult[]) {
    const n = byId.get(st.id)!;
    const margins = (st.margins as { low: number; high: number } | undefined) ?? null;
    if (st.status === "clip") clips.push(st.id);
    if (margins && st.usable) {
      const share = Math.min(margins.low, margins.high) / (st.usable.high - st.usable.low);
      worst = worst === null ? share : Math.min(worst, share);
    }
    stages.push({
      id: st.id,
      label: n.label ?? n.id,
      kind: n.kind,
      gain: stageGain(n),
      vref: "vref" in n.params ? (n.params as { vref: number }).vref : "vbias" in n.params ? (n.params as { vbias: number }).vbias : null,
      status: st.status ?? null,
      margins,
    });
  }
  const adc = path.adc;
  if (adc && adc.status === "clip") clips.push(adc.id);
  const src = sourceSignal(chainSource(chain));
  const acPeak = adc ? (adc.acPeak as number | null) : null;
  const passGain = acPeak != null && src.amplitude > 0 ? acPeak / src.amplitude : null;
  const noiseRms = path.noise.skipped ? null : path.noise.outputRms;
  return {
    stages,
    rangeUse: adc?.rangeUse ?? null,
    clips,
    worstHeadroom: worst,
    noiseRms,
    inputNoiseRms: noiseRms != null && passGain ? noiseRms / passGain : null,
    snrDb: adc?.snrDb ?? null,
  };
}

interface PlanStep {
  index: number;
  gain: number;
  vref: number;
}

/**
 * The ideal plan: gains and vrefs per adjustable stage (and a vbias for a trailing high-pass).
 * `squeeze[i]` narrows the window of node i (a share of its half-width), from the checking rounds.
 */
function plan(
  chain: Chain,
  nodes: ChainNode[],
  margin: number,
  squeeze: number[],
  loss: number[],
): { steps: PlanStep[]; vbias: Map<number, number>; binding: string | null } {
  const src = sourceSignal(nodes[0]);
  let c = src.dc;
  let d = src.dcSpread;
  let a = src.amplitude;
  const adcNode = nodes[nodes.length - 1] as Extract<ChainNode, { kind: "adc" }>;
  const squeezeW = (w: Window, i: number): Window => {
    const mid = (w.lo + w.hi) / 2;
    const hw = ((w.hi - w.lo) / 2) * (1 - (squeeze[i] ?? 0));
    return { lo: mid - hw, hi: mid + hw };
  };
  const adcWin = squeezeW(shrink(adcNode.params.vinLow, adcNode.params.vinHigh, margin), nodes.length - 1);
  const gainIdx = nodes.map((n, i) => (isGainNode(n) ? i : -1)).filter((i) => i >= 0);
  const steps: PlanStep[] = [];
  const vbias = new Map<number, number>();
  let binding: string | null = null;
  const hpAfter = (i: number) => nodes.slice(i + 1, -1).some((n) => DC_BLOCKING.has(n.kind));
  /** |gain| of the fixed stages after i (as measured in place), which the converter also sees */
  const downstream = (i: number) => nodes.slice(i + 1, -1).reduce((g, n, k) => (isGainNode(n) ? g : g * Math.abs(stageGain(n) ?? 1) * loss[i + 1 + k]), 1);

  for (let i = 1; i < nodes.length - 1; i++) {
    const n = nodes[i];
    if (!isGainNode(n)) {
      const k = Math.abs(stageGain(n) ?? 1);
      a *= loss[i] * k;
      if (n.kind === "sallenKeyLowpass" && k !== 1) {
        c = k * c - (k - 1) * n.params.vref; // DC form with rg to vref
        d *= k;
      } else if (n.kind === "sallenKeyHighpass" || n.kind === "mfbHighpass") {
        c = n.params.vref;
        d = 0;
      } else if (n.kind === "transimpedance" || n.kind === "chargeAmp") {
        // vref reaches the output through the noise gain 1 + rf/rsh (the sensor's shunt from (−) to ground)
        const refGain = 1 + (src.shunt ? n.params.rf / src.shunt.r : 0);
        c = (n.kind === "transimpedance" ? -n.params.rf * c : 0) + refGain * n.params.vref;
        d = n.kind === "transimpedance" ? d * n.params.rf : 0;
      }
      if (n.kind === "rcHighpass") {
        c = n.params.vbias;
        d = 0;
        // a trailing high-pass (no adjustable stage after it) sets the converter's centre
        if (!gainIdx.some((g) => g > i)) {
          const mid = (adcWin.lo + adcWin.hi) / 2;
          vbias.set(i, mid);
          c = mid;
        }
      }
      continue;
    }
    const last = !gainIdx.some((g) => g > i);
    // the window this stage's output must fit: its own, the unity stages up to the next adjustable stage,
    // and the converter's when it is the last adjustable stage (a high-pass in between resets the DC part)
    const usable = usableOf(chain, n)!;
    let win = squeezeW(shrink(usable.lo, usable.hi, margin), i);
    let dcReset = false;
    for (let j = i + 1; j < nodes.length - 1 && !isGainNode(nodes[j]); j++) {
      if (DC_BLOCKING.has(nodes[j].kind) || Math.abs(stageGain(nodes[j]) ?? 1) !== 1) {
        dcReset = true; // the DC or the scale changes there: the converter's window no longer applies here
        break;
      }
      const u = usableOf(chain, nodes[j]);
      if (u) win = meet(win, squeezeW(shrink(u.lo, u.hi, margin), j));
    }
    const toAdc = last && !dcReset;
    const target = toAdc ? meet(win, adcWin) : win;
    // gain still needed to fill the converter: its half-width over (DC part that reaches it + AC peak)
    const dReach = hpAfter(i) ? 0 : d;
    const adcHalf = (adcWin.hi - adcWin.lo) / 2;
    const need = adcHalf / ((dReach + a) * downstream(i));
    const s = signOf(n);
    const vr = n.rails;
    let g = need;
    let cOut = 0;
    let vref = (n.params as { vref: number }).vref;
    // an in-amp's input stage: vcm ± g·Vd/2 inside the stage's own window
    const own = squeezeW(shrink(usable.lo, usable.hi, margin), i);
    const vcm = src.vcm;
    const gInner = n.kind === "inAmp" ? (2 * Math.max(0, Math.min(vcm - own.lo, own.hi - vcm))) / (Math.abs(c) + d + a) : Infinity;
    for (let round = 0; round < 4; round++) {
      // where the output centre can go with vref inside the rails
      const k = refCoefficient(n, g);
      const ends = [s * g * c + k * vr.low, s * g * c + k * vr.high];
      const reachLo = Math.min(...ends);
      const reachHi = Math.max(...ends);
      const wantMid = toAdc ? (adcWin.lo + adcWin.hi) / 2 : (target.lo + target.hi) / 2;
      cOut = Math.abs(k) < 1e-12 ? c : Math.min(reachHi, Math.max(reachLo, Math.min(target.hi, Math.max(target.lo, wantMid))));
      vref = Math.abs(k) < 1e-12 ? vref : (cOut - s * g * c) / k;
      const room = Math.min(cOut - target.lo, target.hi - cOut);
      const gMax = room > 0 ? Math.min(room / (d + a), gInner) : 0;
      let next = Math.min(need, gMax);
      if (atLeastUnity(n)) next = Math.max(1, next);
      if (Math.abs(next - g) <= 1e-12 * g) break;
      g = next;
    }
    if (g < need * (1 - 1e-9)) binding = n.label ?? n.id;
    // g is the gain the signal must see in place; the stage's own gain makes up for the loss measured there
    // (source resistance or a section loading its input, band edges) in the previous round
    const inPlace = g / loss[i];
    steps.push({ index: i, gain: atLeastUnity(n) ? Math.max(1, inPlace) : inPlace, vref });
    c = cOut;
    d *= g;
    a *= g;
  }
  return { steps, vbias, binding };
}

/** Standard values for a stage's new gain, keeping f0 and Q where the kind has them. */
function realise(n: GainNode, gain: number): SolvedParams | null {
  const now = Math.abs(stageGain(n) as number);
  if (Math.abs(gain / now - 1) < 5e-3) return {}; // close enough: keep the present values
  if (n.kind === "noninverting" && Math.abs(gain - 1) < 5e-3) return { rf: null, rg: null };
  // in-amp: rf is the input stage's fixed pair, rg sets the gain; difference amp: r1, r3 (the input
  // resistance) stay, r2 and r4 scale together so the pair stays matched
  // (rg rounds up: a gain a little under the plan leaves the margin whole, one over it eats into it)
  if (n.kind === "inAmp") return { rg: neighbours((2 * n.params.rf) / Math.max(gain - 1, 1e-3), "E96").above };
  if (n.kind === "differenceAmp") return { r2: nearestPreferred(gain * n.params.r1, "E96"), r4: nearestPreferred(gain * n.params.r3, "E96") };
  const ideal = idealCharacteristics(n);
  const caps = Object.entries(n.params).filter(([k]) => k.startsWith("c")).map(([, v]) => v as number);
  const r = solveStage(n.kind as SolvableKind, {
    gain,
    f0: ideal.f0,
    q: ideal.q,
    series: "E96",
    tolerance: 0.01,
    limit: 1,
    maxCapacitance: Math.max(1e-6, ...caps),
    // keep the load on the driving node as it is (the measured loss stays valid between rounds)
    minInputImpedance: n.kind === "noninverting" ? null : n.params.r1,
  });
  return r.sets[0]?.params ?? null;
}

function checkWindows(chain: Chain, res: AnalysisResult, path: string[], margin: number): { index: number; excess: number }[] {
  const p = res.paths.find((q) => q.nodes[q.nodes.length - 1] === path[path.length - 1])!;
  const out: { index: number; excess: number }[] = [];
  for (const st of p.stages as StageResult[]) {
    if (!st.usable || !st.peakOut) continue;
    const w = shrink(st.usable.low, st.usable.high, margin);
    const half = (w.hi - w.lo) / 2;
    const ex = Math.max(w.lo - st.peakOut.min, st.peakOut.max - w.hi);
    if (ex > 1e-9 * half) out.push({ index: path.indexOf(st.id), excess: ex / half });
  }
  const adc = p.adc;
  const peakIn = adc?.peakIn as { min: number; max: number } | undefined;
  const node = chain.nodes.find((n) => n.id === adc?.id) as Extract<ChainNode, { kind: "adc" }> | undefined;
  if (peakIn && node) {
    const w = shrink(node.params.vinLow, node.params.vinHigh, margin);
    const half = (w.hi - w.lo) / 2;
    const ex = Math.max(w.lo - peakIn.min, peakIn.max - w.hi);
    if (ex > 1e-9 * half) out.push({ index: path.length - 1, excess: ex / half });
  }
  return out;
}

/**
 * Updates `loss` (per path node: the gain the signal sees in place over the stage's own passband gain) from
 * the engine's AC peaks; true when some entry moved by more than 0.5 %.
 */
function measureLoss(chain: Chain, res: AnalysisResult, path: string[], loss: number[]): boolean {
  const p = res.paths.find((q) => q.nodes[q.nodes.length - 1] === path[path.length - 1])!;
  const byId = new Map(chain.nodes.map((n) => [n.id, n]));
  const src = sourceSignal(byId.get(path[0])!);
  let prev = src.amplitude;
  let moved = false;
  for (const st of p.stages as StageResult[]) {
    const i = path.indexOf(st.id);
    const n = byId.get(st.id)!;
    const own = Math.abs(stageGain(n) ?? 1);
    if (st.acPeak == null || !(prev > 0)) break;
    const k = st.acPeak / prev / own;
    if (Number.isFinite(k) && k > 0) {
      if (Math.abs(k / loss[i] - 1) > 5e-3) moved = true;
      loss[i] = k;
    }
    prev = st.acPeak;
  }
  return moved;
}

/** Advice for the path ending at `opts.adcId`. Throws RangeError naming the option on bad options. */
export function adviseGainStaging(chain: Chain, opts: AdviceOptions = {}): GainAdvice {
  const margin = opts.margin ?? 0.1;
  const targetRangeUse = opts.targetRangeUse ?? 0.7;
  if (!(margin >= 0 && margin < 0.5)) throw new RangeError("margin: a share from 0 to under 0.5 of each span");
  if (!(targetRangeUse > 0 && targetRangeUse <= 1)) throw new RangeError("targetRangeUse: a share above 0 and at most 1");
  const before = analyzeChain(chain);
  const path = (opts.adcId ? before.paths.find((p) => p.nodes[p.nodes.length - 1] === opts.adcId) : before.paths.find((p) => p.adc))?.nodes;
  if (!path) throw new RangeError(opts.adcId ? `adcId: no path ends at "${opts.adcId}"` : "adcId: no path of this chain ends at a converter");
  const adcId = path[path.length - 1];
  const byId = new Map(chain.nodes.map((n) => [n.id, n]));
  const nodes = path.map((id) => byId.get(id)!);
  const current = figures(chain, before, adcId);
  const notes: string[] = [];
  const src = sourceSignal(nodes[0]);
  if (src.fLow > 0 && !nodes.some((n) => n.kind === "rcHighpass") && src.dcSpread > src.amplitude) {
    notes.push(
      `The source's DC spread (±${fmtV(src.dcSpread)}) is larger than its signal (${fmtV(src.amplitude)} peak) and the band starts at ${Number(src.fLow.toPrecision(3))} Hz: AC coupling before the first gain (an RC high-pass with its corner about a tenth of that, common practice) would free the range the spread takes.`,
    );
  }
  if (!nodes.some(isGainNode)) {
    return { adcId, path, margin, targetRangeUse, current, advised: current, edits: [], chain, notes, problem: "No stage on this path has an adjustable gain (inverting, non-inverting, lossy integrator, MFB low-pass, instrumentation or difference amplifier).", rounds: 0 };
  }

  const squeeze: number[] = path.map(() => 0);
  const loss: number[] = path.map(() => 1);
  let result: { chain: Chain; res: AnalysisResult; edits: StageEdit[]; binding: string | null } | null = null;
  let rounds = 0;
  let realiseProblem: string | null = null;
  for (; rounds < 6; ) {
    rounds++;
    const { steps, vbias, binding } = plan(chain, nodes, margin, squeeze, loss);
    const nextNodes = chain.nodes.slice();
    const edits: StageEdit[] = [];
    realiseProblem = null;
    for (const st of steps) {
      const n = nodes[st.index] as GainNode;
      const params = realise(n, st.gain);
      if (!params) {
        realiseProblem = `${n.label ?? n.id}: no standard values give a gain of ${fmtG(st.gain)} with its present f0 and Q.`;
        continue;
      }
      const vref = Number(st.vref.toPrecision(4)); // a reference is set to about 0.1 %
      const changed: Record<string, number | null> = {};
      for (const [k, v] of Object.entries(params)) if ((n.params as unknown as Record<string, unknown>)[k] !== v) changed[k] = v;
      if (Math.abs(vref - n.params.vref) > 1e-4 * Math.max(Math.abs(vref), 1e-3)) changed.vref = vref;
      const newNode = { ...n, params: { ...n.params, ...params, vref: changed.vref ?? n.params.vref } } as ChainNode;
      nextNodes[chain.nodes.indexOf(n)] = newNode;
      if (Object.keys(changed).length) {
        const g0 = stageGain(n) as number;
        const g1 = stageGain(newNode) as number;
        const parts = [Math.abs(g1 / g0 - 1) > 1e-9 ? `gain ${fmtG(g0)} → ${fmtG(g1)}` : null, "vref" in changed ? `vref ${fmtV(n.params.vref)} → ${fmtV(vref)}` : null];
        edits.push({ id: n.id, params: changed, summary: parts.filter(Boolean).join(", ") || "same gain, other standard values" });
      }
    }
    for (const [i, v] of vbias) {
      const n = nodes[i] as Extract<ChainNode, { kind: "rcHighpass" }>;
      const vb = Number(v.toPrecision(4));
      if (Math.abs(vb - n.params.vbias) > 1e-4 * Math.max(Math.abs(vb), 1e-3)) {
        nextNodes[chain.nodes.indexOf(n)] = { ...n, params: { ...n.params, vbias: vb } };
        edits.push({ id: n.id, params: { vbias: vb }, summary: `vbias ${fmtV(n.params.vbias)} → ${fmtV(vb)}` });
      }
    }
    const next: Chain = { ...chain, nodes: nextNodes };
    const res = analyzeChain(next);
    result = { chain: next, res, edits, binding };
    const over = checkWindows(next, res, path, margin);
    const moved = measureLoss(next, res, path, loss);
    if (!over.length && !moved) break;
    for (const o of over) squeeze[o.index] = Math.min(0.9, squeeze[o.index] + o.excess + 1e-3);
  }
  const { chain: advisedChain, res, edits, binding } = result!;
  const advised = figures(advisedChain, res, adcId);
  let problem: string | null = realiseProblem;
  if (!problem && advised.clips.length) {
    const names = advised.clips.map((id) => byId.get(id)?.label ?? id).join(", ");
    problem = `Still clipping after the advice: ${names}. ${res.warnings.filter((w) => advised.clips.includes(w.nodeId)).map((w) => w.message)[0] ?? ""}`.trim();
  }
  if (!problem && (advised.rangeUse ?? 0) < targetRangeUse) {
    problem = `The converter range use reaches only ${((advised.rangeUse ?? 0) * 100).toFixed(1)} % (target ${(targetRangeUse * 100).toFixed(0)} %)${binding ? `: ${binding}'s rails, less the ${(margin * 100).toFixed(0)} % margin, stop more gain there` : ""}.`;
  }
  return { adcId, path, margin, targetRangeUse, current, advised, edits, chain: advisedChain, notes, problem, rounds };
}
