/**
 * analyzeChain: the whole analysis of chain-format.md ("Analysis result") for a complete chain.
 * Pure and synchronous. Every figure comes from the linear network; figures with no finite value are
 * null with a warning, never Infinity or NaN.
 */
import type {
  AdcResult,
  AnalysisResult,
  AnalysisWarning,
  AnalyzeOptions,
  Chain,
  ChainNode,
  Interval,
  OpAmpNode,
  Part,
  PathResult,
  StageResult,
  StageStatus,
} from "../chain/types";
import { ANALYSIS_FORMAT } from "../chain/types";
import { TIGHT_SHARE, TWO_PI } from "./constants";
import { compileChain, type CompiledChain, type SweepResult } from "./compile-chain";
import { operatingPoint, type DcPoint, type DcTerm } from "./dc";
import { db, si } from "./format";
import { bandGrid, bandMax, bandMaxMany, logGrid } from "./grids";
import { idealCharacteristics } from "./ideal";
import { pathNoise, pathNoiseDensity, pathNoiseDensityBy } from "./noise";
import { ratioMagAt } from "./poly";
import { toMagnitudePhase } from "./response";
import { isOpAmpKind } from "./topology";
import { isSourceKind } from "../chain/types";
import { sourceSignal, transferPerUnit } from "./sensors";
import { frontEndChecks } from "./sensors-checks";
import { ENGINE_VERSION } from "./version";

class Warnings {
  readonly list: AnalysisWarning[] = [];
  private seen = new Set<string>();
  add(nodeId: string, code: string, message: string) {
    const key = `${nodeId}|${code}|${message}`;
    if (this.seen.has(key)) return;
    this.seen.add(key);
    this.list.push({ nodeId, code, message });
  }
}

const nodeName = (node: ChainNode) => (node.label ? `${node.id} ("${node.label}")` : node.id);

function partOf(chain: Chain, node: ChainNode): Part | undefined {
  const key = "part" in node ? node.part : null;
  return key ? chain.parts[key] : undefined;
}

/** One term pushing an interval toward a limit, for warning messages. */
interface Push {
  label: string;
  volts: number;
}

const termLabel = (t: DcTerm): string => {
  if (t.cause === "source-dc") return t.what === "source DC" ? "the source's DC" : "the source's DC spread";
  return `the ${t.what} of ${t.nodeId}`;
};

/**
 * What pushes a peak interval past a limit: each DC term's contribution toward that side (fixed terms
 * with their sign, ± terms by their half-width) and the signal peak, largest first. The largest is named
 * as the cause (our attribution rule, documented in README.md).
 */
function pushes(side: "high" | "low", dc: DcPoint, acPeak: number): Push[] {
  const sign = side === "high" ? 1 : -1;
  const out: Push[] = [];
  for (const t of dc.terms) {
    const v = t.symmetric ? t.value : sign * t.value;
    if (v > 0) out.push({ label: termLabel(t), volts: v });
  }
  if (acPeak > 0) out.push({ label: "the signal peak", volts: acPeak });
  return out.sort((a, b) => b.volts - a.volts);
}

function causeText(list: Push[]): string {
  if (!list.length) return "";
  const [first, ...rest] = list;
  const others = rest.slice(0, 2).map((p) => `${p.label} ${si(p.volts, "V")}`);
  return ` Largest push: ${first.label} (${si(first.volts, "V")})${others.length ? `; then ${others.join(", ")}` : ""}.`;
}

interface LimitCheck {
  ok: boolean;
  side?: "high" | "low";
  excess?: number;
  cause?: string;
  message?: string;
}

/** Checks a peak interval against [low, high] and explains the worse violation. */
function checkRange(
  what: string,
  peak: Interval,
  low: number,
  high: number,
  dc: DcPoint,
  acPeak: number,
): LimitCheck {
  const overHigh = peak.max - high;
  const underLow = low - peak.min;
  if (overHigh <= 0 && underLow <= 0) return { ok: true };
  const side = overHigh >= underLow ? "high" : "low";
  const excess = side === "high" ? overHigh : underLow;
  const list = pushes(side, dc, acPeak);
  const reach = side === "high" ? peak.max : peak.min;
  const limit = side === "high" ? high : low;
  return {
    ok: false,
    side,
    excess,
    cause: list[0]?.label,
    message: `${what} reaches ${si(reach, "V")}, ${si(excess, "V")} ${side === "high" ? "above" : "below"} its ${side} limit ${si(limit, "V")}.${causeText(list)}`,
  };
}

export interface NodeFigures {
  gain: number | null; // max |H_src→node| over the source band
  slope: number | null; // max 2πf·|H| over the band, 1/s
  plusGain: number | null; // max |H_src→(+)| over the band
  /**
   * max of the node's own |H| (as loaded in place, per unit of what feeds it) over the band; searched only
   * for the full set (not with `only`). What a stage with DC gain 0 (high-pass, charge amplifier) does.
   */
  own: number | null;
}

/**
 * Band maxima of every node's response (and op-amp (+) pins) over the source band: dense samples, then
 * every node's golden-section refinements side by side (bandMaxMany), one sweep of the chain per step
 * for all of them instead of one per point. `tol` stops the refinement earlier (the tolerance spread
 * uses 1e-6: near a smooth maximum the value is then within about 1e-12 of the true peak); `only`, when
 * given, limits the searches to headroom: the gain of the nodes it marks and their (+) pins, no slew
 * (the rest stay null).
 */
export function bandFigures(cc: CompiledChain, fLow: number, fHigh: number, tol?: number, only?: Uint8Array): NodeFigures[] {
  const grid = bandGrid(fLow, fHigh);
  const sw = cc.sweep(grid);
  const mag = (r: SweepResult, i: number, k: number) => Math.hypot(r.cumRe[i][k], r.cumIm[i][k]);
  const finite = (x: number) => (Number.isFinite(x) ? x : null);
  /** |V+/Vin| of op-amp stage i at f (Hz) */
  const plusRatio = (i: number, f: number) => {
    const model = cc.models[i]!;
    return ratioMagAt(model.vin.p, model.den, TWO_PI * f);
  };
  const n = cc.nodeIds.length;
  // what each search maximises: 0 |H| of node i, 1 2πf·|H| of node i, 2 |H| at the (+) pin of stage i,
  // 3 node i's own |H| (in the same batched steps: no sweep of its own)
  const own = (r: SweepResult, i: number, k: number) => Math.hypot(r.indRe[i][k], r.indIm[i][k]);
  const searches: { grid: Float64Array; values: Float64Array; what: 0 | 1 | 2 | 3; node: number }[] = [];
  for (let i = 0; i < n; i++) {
    if (only && !only[i]) continue;
    const g = new Float64Array(grid.length);
    for (let k = 0; k < grid.length; k++) g[k] = mag(sw, i, k);
    searches.push({ grid, values: g, what: 0, node: i });
    if (!only) {
      const sl = new Float64Array(grid.length);
      for (let k = 0; k < grid.length; k++) sl[k] = grid[k] === 0 ? 0 : TWO_PI * grid[k] * g[k];
      searches.push({ grid, values: sl, what: 1, node: i });
      searches.push({ grid, values: Float64Array.from(grid, (_, k) => own(sw, i, k)), what: 3, node: i });
    }
    if (cc.models[i]) {
      const p = cc.topology.parent[i];
      const pv = new Float64Array(grid.length);
      for (let k = 0; k < grid.length; k++) pv[k] = mag(sw, p, k) * plusRatio(i, grid[k]);
      searches.push({ grid, values: pv, what: 2, node: i });
    }
  }
  let step: SweepResult | undefined;
  const peaks = bandMaxMany(searches, (freqs, which, out, count) => {
    // the whole buffer is swept (its length stays fixed, so the sweep's arrays are reused); slots past
    // `count` hold earlier frequencies and are not read
    step = cc.sweep(freqs, step);
    for (let c = 0; c < count; c++) {
      const s = searches[which[c]];
      const f = freqs[c];
      if (s.what === 0) out[c] = mag(step, s.node, c);
      else if (s.what === 1) out[c] = TWO_PI * f * mag(step, s.node, c);
      else if (s.what === 3) out[c] = own(step, s.node, c);
      else out[c] = mag(step, cc.topology.parent[s.node], c) * plusRatio(s.node, f);
    }
  }, tol);
  const out: NodeFigures[] = Array.from({ length: n }, () => ({ gain: null, slope: null, plusGain: null, own: null }));
  searches.forEach((s, j) => {
    const v = finite(peaks[j].value);
    if (s.what === 0) out[s.node].gain = v;
    else if (s.what === 1) out[s.node].slope = v;
    else if (s.what === 3) out[s.node].own = v;
    else out[s.node].plusGain = v;
  });
  return out;
}

/** Runs the full analysis of a complete chain (defaults applied). */
export function analyzeChain(chain: Chain, opts: AnalyzeOptions = {}): AnalysisResult {
  const cc = compileChain(chain);
  const W = new Warnings();
  const topo = cc.topology;
  const nodes = topo.nodes;
  const src = nodes[0];
  if (!isSourceKind(src.kind)) throw new Error("chain must start at its source");
  const sp = sourceSignal(src);
  const { fMin, fMax } = chain.analysis;

  if (sp.safety !== "low-voltage") {
    W.add(
      src.id,
      "safety",
      `${nodeName(src)} is marked ${sp.safety === "mains-connected" ? "mains-connected" : "body-connected"}. Chainwright does not check isolation, creepage, leakage or safety ratings; verify the design on hardware. Local codes and licensed practice govern.`,
    );
  }
  nodes.forEach((node, i) => {
    if (cc.openLoops[i]?.degenerate)
      W.add(node.id, "part-zero-gain", `${nodeName(node)}: its part gives aol or gbw as 0, so the op-amp has no gain.`);
  });

  // ---- response on the plot grid (or exactly the requested frequencies)
  const points = opts.points ?? chain.analysis.points;
  // requested frequencies that are not numbers cannot be echoed (no NaN in a result): left out, with a
  // warning; negative ones stay, with null values
  const requested = opts.freqs?.filter((f) => Number.isFinite(f));
  if (opts.freqs && requested!.length < opts.freqs.length)
    W.add(src.id, "bad-frequency", `${opts.freqs.length - requested!.length} requested frequencies were not finite numbers and are left out of the response.`);
  const freqs = requested ? Float64Array.from(requested) : logGrid(fMin, fMax, points);
  const usable = freqs.map((f) => (f >= 0 ? f : 0));
  const resp = cc.sweep(usable);

  // ---- DC operating point and band figures
  const op = operatingPoint(chain, cc);
  const band = bandFigures(cc, sp.fLow, sp.fHigh);
  const amp = sp.amplitude;

  // ---- per-node results (shared by every path through the node)
  const stageResults = new Map<number, StageResult>();
  nodes.forEach((node, i) => {
    if (i === 0 || node.kind === "adc") return;
    const ideal = idealCharacteristics(node);
    const dc = op.out[i];
    const figures = band[i];
    const acPeak = figures.gain === null ? null : amp * figures.gain;
    const dcOut = dc.interval;
    const peakOut = dcOut && acPeak !== null ? { min: dcOut.min - acPeak, max: dcOut.max + acPeak } : null;
    const res: StageResult = {
      id: node.id,
      kind: node.kind,
      ...(node.label ? { label: node.label } : {}),
      dcGain: op.stageGain[i],
      f0: ideal.f0,
      q: ideal.q,
      bandGain: figures.own,
      dcOut,
      acPeak,
      peakOut,
    };
    if (figures.gain === null)
      W.add(node.id, "pole", `${nodeName(node)}: the signal peak has no finite value (the source band reaches DC, where the gain up to here is unbounded).`);
    if (!isOpAmpKind(node.kind)) {
      stageResults.set(i, res);
      return;
    }
    const st = node as OpAmpNode;
    const part = partOf(chain, node);
    const usableRange = { low: st.rails.low + (part?.swingLow ?? 0), high: st.rails.high - (part?.swingHigh ?? 0) };
    const allowed = { low: st.rails.low + (part?.inputLow ?? 0), high: st.rails.high - (part?.inputHigh ?? 0) };
    const plusDc = op.plus[i]!;
    const plusPeakAc = figures.plusGain === null ? null : amp * figures.plusGain;
    const plusPeak =
      plusDc.interval && plusPeakAc !== null
        ? { min: plusDc.interval.min - plusPeakAc, max: plusDc.interval.max + plusPeakAc }
        : null;
    let status: StageStatus = "ok";
    const name = nodeName(node);
    if (node.kind === "integrator") {
      status = "clip";
      W.add(
        node.id,
        "no-dc-path",
        `${name}: an integrator has no DC feedback path, so its DC output is unbounded and it will sit against a rail. A resistor across c2 (a lossy integrator) bounds its DC gain.`,
      );
    } else if (!dcOut) {
      status = "clip";
      W.add(
        node.id,
        "dc-unbounded",
        `${name}: its DC level is unbounded because it is DC-coupled to integrator ${dc.driftFrom.join(", ")}, which has no DC feedback path.`,
      );
    }
    let cause: Record<string, unknown> | undefined;
    if (peakOut) {
      const chk = checkRange(`${name}: the output`, peakOut, usableRange.low, usableRange.high, dc, acPeak ?? 0);
      if (!chk.ok) {
        status = "clip";
        cause = { check: "output", side: chk.side, excess: chk.excess, cause: chk.cause };
        W.add(node.id, "rail-clip", `${chk.message} Usable output ${si(usableRange.low, "V")} to ${si(usableRange.high, "V")} (rails less output swing).`);
      }
    } else if (status !== "clip") {
      status = "clip";
    }
    if (plusPeak) {
      const chk = checkRange(`${name}: the (+) input`, plusPeak, allowed.low, allowed.high, plusDc, plusPeakAc ?? 0);
      if (!chk.ok) {
        status = "clip";
        cause ??= { check: "input", side: chk.side, excess: chk.excess, cause: chk.cause };
        W.add(node.id, "input-range", `${chk.message} Input range ${si(allowed.low, "V")} to ${si(allowed.high, "V")}.`);
      }
    }
    let margins: { low: number; high: number } | null = null;
    if (peakOut) {
      margins = { low: peakOut.min - usableRange.low, high: usableRange.high - peakOut.max };
      const span = usableRange.high - usableRange.low;
      const spare = Math.min(margins.low, margins.high);
      if (status === "ok" && spare < TIGHT_SHARE * span) {
        status = "tight";
        const side = margins.low < margins.high ? "low" : "high";
        W.add(
          node.id,
          "rail-tight",
          `${name}: only ${si(spare, "V")} to spare at the ${side} end of its usable output (under 10 % of the ${si(span, "V")} span, a rule of thumb).${causeText(pushes(side, dc, acPeak ?? 0))}`,
        );
      }
    }
    const slewNeeded = figures.slope === null ? null : amp * figures.slope;
    const slewRate = part?.slewRate ?? null;
    if (slewNeeded !== null && slewRate !== null && slewNeeded > slewRate) {
      W.add(
        node.id,
        "slew",
        `${name}: the signal needs ${si(slewNeeded, "V/s")} at its output but the part slews ${si(slewRate, "V/s")} (${si(slewNeeded - slewRate, "V/s")} short).`,
      );
    }
    Object.assign(res, {
      usable: usableRange,
      inputRange: { peak: plusPeak, allowed },
      status,
      slewNeeded,
      slewRate,
      margins,
      ...(cause ? { cause } : {}),
    });
    // the checks of the sensor front-end stages (sensors-checks.ts)
    const extra = frontEndChecks(chain, st, i, { op, band, amp, usable: usableRange, allowed, W: (code, message) => W.add(node.id, code, message) });
    if (extra) {
      Object.assign(res, extra.figures);
      if (extra.clip) res.status = "clip";
    }
    stageResults.set(i, res);
  });

  // ---- paths
  const paths: PathResult[] = cc.paths.map((path) => {
    const end = path.end;
    const endNode = nodes[end];
    const mp = toMagnitudePhase(resp.cumRe[end], resp.cumIm[end]);
    const f = Array.from(freqs);
    const bad = (k: number) => freqs[k] < 0 || Number.isNaN(mp.magDb[k]);
    const magDb = f.map((_, k) => (bad(k) ? null : mp.magDb[k]));
    const phaseDeg = f.map((_, k) => (bad(k) ? null : mp.phaseDeg[k]));
    const poles = magDb.filter((v) => v === null).length;
    if (poles)
      W.add(
        endNode.id,
        "pole",
        `The response to ${endNode.id} has no finite value at ${poles} of the requested frequencies (a pole or a zero of the network there, or an invalid frequency); those points are null.`,
      );
    const stages = path.indices.filter((i) => stageResults.has(i)).map((i) => stageResults.get(i)!);
    // opts.noise === false (the workspace's quick live tier): no noise figures, marked as skipped.
    const withNoise = opts.noise !== false;
    const nz = withNoise
      ? pathNoise(chain, cc, end)
      : { outputRms: 0, low: chain.analysis.noiseLow, high: chain.analysis.noiseHigh ?? fMax, totalRms: 0, contributions: [], skipped: true };
    if (withNoise && chain.analysis.noiseLow >= fMax)
      W.add(endNode.id, "noise-band", `noiseLow is at or above fMax, so the noise up to fMax (totalRms) is empty and reported as 0.`);
    const density = withNoise ? pathNoiseDensity(chain, cc, end, freqs).map((v) => (Number.isFinite(v) ? v : null)) : [];
    const adc = endNode.kind === "adc" ? adcFigures(chain, cc, end, op.out[end], band[end], withNoise ? nz.totalRms : null, W) : null;
    // the budget's figures ride with the noise (full analysis only; the quick tier's one-point grid has no curves)
    const noise = {
      ...nz,
      density,
      ...(withNoise ? noiseBudgetFigures(chain, cc, end, freqs, resp, band[end].gain, nz, transferPerUnit(sp.output)) : {}),
      ...(withNoise && adc ? aliasFigures(chain, cc, end, freqs, resp, band[end].gain, adc.quantNoiseRms, nz.totalRms) : {}),
    };
    return { nodes: path.nodes, response: { f, magDb, phaseDeg }, stages, noise, adc };
  });

  return { format: ANALYSIS_FORMAT, engine: ENGINE_VERSION, paths, warnings: W.list };
}

/**
 * Converter figures (chain-format.md, "ADC"): LSB = (vinHigh − vinLow)/2^bits, quantisation noise LSB/√12,
 * ideal SNR 6.02·bits + 1.76 dB (the rounded constants), SNR and ENOB for a full-scale sine with the path's
 * totalRms and the quantisation noise added in power, alias attenuation over [sampleRate − fHigh, fMax].
 * When sampleRate − fHigh lies above fMax the alias band shrinks to that one frequency (the lowest that
 * folds into the band), so the figure stays defined.
 */
function adcFigures(
  chain: Chain,
  cc: CompiledChain,
  i: number,
  dc: DcPoint,
  fig: NodeFigures,
  /** null when the noise figures were skipped: snrDb and enob are then null */
  totalRms: number | null,
  W: Warnings,
): AdcResult {
  const node = cc.topology.nodes[i];
  if (node.kind !== "adc") throw new Error("not an ADC");
  const { bits, sampleRate, vinLow, vinHigh } = node.params;
  const { fHigh, amplitude } = sourceSignal(cc.topology.nodes[0]);
  const span = vinHigh - vinLow;
  const lsb = span / 2 ** bits;
  const quantNoiseRms = lsb / Math.sqrt(12);
  const idealSnrDb = 6.02 * bits + 1.76;
  const signalRms = span / (2 * Math.SQRT2);
  const noiseRms = totalRms === null ? null : Math.sqrt(totalRms * totalRms + quantNoiseRms * quantNoiseRms);
  const snrDb = noiseRms === null ? null : 20 * Math.log10(signalRms / noiseRms);
  const enob = snrDb === null ? null : (snrDb - 1.76) / 6.02;
  const name = nodeName(node);

  let status: StageStatus = "ok";
  let aliasAttenuationDb: number | null = null;
  let aliasBand: { low: number; high: number; worstF: number | null } | null = null;
  if (fHigh >= sampleRate / 2) {
    status = "clip";
    W.add(
      node.id,
      "nyquist",
      `${name}: the source band reaches ${si(fHigh, "Hz")}, at or above half the sample rate (${si(sampleRate / 2, "Hz")}); in-band signals alias and alias attenuation is not defined.`,
    );
  } else if (fig.gain !== null && fig.gain > 0) {
    const lo = sampleRate - fHigh;
    const hi = Math.max(chain.analysis.fMax, lo);
    const grid = bandGrid(lo, hi);
    const sw = cc.sweep(grid);
    const one = cc.sweep(Float64Array.of(lo));
    const vals = grid.map((_, k) => Math.hypot(sw.cumRe[i][k], sw.cumIm[i][k]));
    const peak = bandMax(grid, vals, (f) => {
      const r = cc.sweep(Float64Array.of(f), one);
      return Math.hypot(r.cumRe[i][0], r.cumIm[i][0]);
    });
    aliasBand = { low: lo, high: hi, worstF: Number.isFinite(peak.value) ? peak.f : null };
    if (Number.isFinite(peak.value) && peak.value > 0) {
      aliasAttenuationDb = 20 * Math.log10(fig.gain / peak.value);
      const target = chain.analysis.aliasTargetDb ?? idealSnrDb;
      if (aliasAttenuationDb < target) {
        W.add(
          node.id,
          "alias",
          `${name}: tones that fold into the band are only ${db(aliasAttenuationDb)} below the band's gain (worst at ${si(peak.f, "Hz")}, in ${si(lo, "Hz")} to ${si(hi, "Hz")}); the target is ${db(target)}${chain.analysis.aliasTargetDb === null ? ` (the ideal SNR of ${bits} bits)` : ""}, ${db(target - aliasAttenuationDb)} short.`,
        );
      }
    }
  }

  const acPeak = fig.gain === null ? null : amplitude * fig.gain;
  const dcIn = dc.interval;
  const peakIn = dcIn && acPeak !== null ? { min: dcIn.min - acPeak, max: dcIn.max + acPeak } : null;
  let rangeUse: number | null = null;
  if (!peakIn) {
    status = "clip";
    if (!dcIn)
      W.add(node.id, "dc-unbounded", `${name}: its input DC level is unbounded because it is DC-coupled to integrator ${dc.driftFrom.join(", ")}, which has no DC feedback path.`);
  } else {
    rangeUse = (peakIn.max - peakIn.min) / span;
    const chk = checkRange(`${name}: the input`, peakIn, vinLow, vinHigh, dc, acPeak ?? 0);
    if (!chk.ok) {
      status = "clip";
      W.add(node.id, "adc-range", `${chk.message} Input range ${si(vinLow, "V")} to ${si(vinHigh, "V")}.`);
    } else if (status === "ok") {
      const spare = Math.min(peakIn.min - vinLow, vinHigh - peakIn.max);
      if (spare < TIGHT_SHARE * span) {
        status = "tight";
        W.add(node.id, "adc-tight", `${name}: only ${si(spare, "V")} of its input range to spare (under 10 % of the span, a rule of thumb).`);
      }
    }
  }
  return {
    id: node.id,
    lsb,
    quantNoiseRms,
    idealSnrDb,
    snrDb,
    enob,
    aliasAttenuationDb,
    pathDcGain: dc.gainFromEmf,
    rangeUse,
    status,
    dcIn,
    acPeak,
    peakIn,
    aliasBand,
    signalRms,
  };
}

/** How many of the largest contributors the budget carries a density curve for. */
const BUDGET_TOP = 6;
/** Most folding bands listed (beyond, they tile the axis and say nothing more). */
const MAX_FOLD_BANDS = 64;
const finiteOrNull = (x: number) => (Number.isFinite(x) ? x : null);

/**
 * Extra noise figures for the budget (noise-budget panel, report): the signal gain over the source band
 * (max |H| from the EMF to the path end), the noise referred to the input through it (rms over the noise
 * band and over all the converter samples, and the density curve divided by |H(f)|), and the density of
 * the largest contributors (by rms over what the converter samples) on the response grid. The
 * input-referred figures are in the source's own unit (`inputUnit`): volts, or amperes from a photodiode
 * and coulombs from a piezo, whose transfers are per ampere and per coulomb.
 */
function noiseBudgetFigures(
  chain: Chain,
  cc: CompiledChain,
  end: number,
  freqs: Float64Array,
  resp: SweepResult,
  bandGain: number | null,
  nz: { outputRms: number; totalRms: number; contributions: { nodeId: string; element: string; totalRms?: unknown }[] },
  inputUnit: "V" | "A" | "C",
) {
  const g = bandGain !== null && bandGain > 0 ? bandGain : null;
  const top = [...nz.contributions].sort((a, b) => (b.totalRms as number) - (a.totalRms as number)).slice(0, BUDGET_TOP);
  const curves = pathNoiseDensityBy(chain, cc, end, freqs, top);
  const total = pathNoiseDensity(chain, cc, end, freqs);
  const inputDensity = total.map((d, k) => finiteOrNull(d / Math.hypot(resp.cumRe[end][k], resp.cumIm[end][k])));
  return {
    bandGain: g,
    inputUnit,
    inputReferredRms: g === null ? null : nz.outputRms / g,
    inputReferredTotalRms: g === null ? null : nz.totalRms / g,
    inputDensity,
    topDensities: top.map((c, j) => ({ nodeId: c.nodeId, element: c.element, density: curves[j].map(finiteOrNull) })),
  };
}

/**
 * Converter extras for the budget: the alias attenuation at every frequency of the response grid
 * (band gain over |H(f)|, dB: how far a tone at f is pushed below the band's gain), the bands that fold
 * into the source band [fLow, fHigh] (k·fs − fHigh … k·fs − fLow and k·fs + fLow … k·fs + fHigh, k ≥ 1,
 * up to fMax), and the analog noise against the quantisation noise (dB, positive when analog dominates).
 */
function aliasFigures(
  chain: Chain,
  cc: CompiledChain,
  end: number,
  freqs: Float64Array,
  resp: SweepResult,
  bandGain: number | null,
  quantNoiseRms: number,
  totalRms: number | null,
) {
  const node = cc.topology.nodes[end];
  const src = cc.topology.nodes[0];
  if (node.kind !== "adc" || !isSourceKind(src.kind)) return {};
  const fs = node.params.sampleRate;
  // the band of any source kind (a sensor's as its signal description gives it)
  const { fLow, fHigh } = sourceSignal(src);
  const attenuation = Array.from(freqs, (_, k) => {
    const m = Math.hypot(resp.cumRe[end][k], resp.cumIm[end][k]);
    return bandGain !== null && bandGain > 0 && m > 0 ? finiteOrNull(20 * Math.log10(bandGain / m)) : null;
  });
  const foldBands: { low: number; high: number; k: number }[] = [];
  for (let k = 1; foldBands.length < MAX_FOLD_BANDS && k * fs - fHigh <= chain.analysis.fMax; k++) {
    foldBands.push({ k, low: Math.max(0, k * fs - fHigh), high: k * fs - fLow });
    if (k * fs + fLow <= chain.analysis.fMax) foldBands.push({ k, low: k * fs + fLow, high: k * fs + fHigh });
  }
  return {
    aliasCurve: { f: Array.from(freqs), attenuationDb: attenuation },
    foldBands,
    analogOverQuantDb: totalRms !== null && totalRms > 0 ? 20 * Math.log10(totalRms / quantNoiseRms) : null,
  };
}
