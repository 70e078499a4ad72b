/**
 * Seeded random chains (seedrandom, our own generator) of every kind, with fan-outs,
 * source resistance, ADC input resistance and op-amp parts of every model (ideal, aol
 * and gbw, gbw only, aol only), compared with the whole-chain nodal reference: path
 * responses, every op-amp stage's DC interval and AC peak, the ADC's path DC gain, and
 * the output noise; and the same for chains from each sensor source (bridge, thermocouple,
 * photodiode, piezo) through its front-end stage (issue 14). Cases nobody wrote by hand, so they reach what the authors of the
 * engine did not think of.
 */
import { describe, it, vi } from "vitest";
import { randomChain, randomSensorChain, SENSOR_KINDS } from "./support/random-chain";
import { validateChain } from "@/lib/chain/schema";
import { dB, near, nearPhase, phaseDeg, same } from "./support/checks";
import type { Chain, Interval, StageStatus } from "@/lib/chain/types";
import { buildNet, isOpAmpKind, transfer } from "./support/nodal";
import { acPeak, acPeakAtNet, dcInterval, dcIntervalAtNet, magAt, maxOverBand, netOf, noiseRms, slewNeeded, signalOf } from "./support/reference-analysis";
import { analyze, pathTo, stageOf } from "./support/engine-access";

// Heavy reference integrals and spawned processes: room for a loaded two-core machine.
vi.setConfig({ testTimeout: 180_000, hookTimeout: 180_000 });

/**
 * Status from chain-format.md "Headroom": clip if the peak interval leaves its range,
 * tight if the nearer margin is under 10 % of the span (common practice), else ok.
 * Returns null when a margin lies within `guard` volts of a threshold, where rounding
 * or the (unspecified) inclusion of the stage's own vos in its (+) interval could
 * decide; those cases are not compared.
 */
function expectedStatus(out: Interval, low: number, high: number, input: Interval | null, inLow: number, inHigh: number, guard: number): StageStatus | null {
  const span = high - low;
  const margin = Math.min(out.min - low, high - out.max);
  const inMargin = input ? Math.min(input.min - inLow, inHigh - input.max) : Infinity;
  if (Math.abs(margin) < guard || Math.abs(inMargin) < guard || Math.abs(margin - 0.1 * span) < guard) return null;
  if (margin < 0 || inMargin < 0) return "clip";
  return margin < 0.1 * span ? "tight" : "ok";
}

function widen(iv: Interval, by: number): Interval {
  return { min: iv.min - by, max: iv.max + by };
}

/** Stage status, ADC status, rangeUse, slew and alias from the reference, compared with the engine. */
function headroomChecks(chain: Chain, seed: string) {
  const result = analyze(chain);
  const net = netOf(chain);
  const dcNet = buildNet(chain, { dcMode: true });
  const src = signalOf(chain);
  for (const n of chain.nodes) {
    if (!isOpAmpKind(n.kind) || !("rails" in n)) continue;
    const s = stageOf(result, n.id);
    near(s.slewNeeded, slewNeeded(chain, n.id), { rel: 1e-5, abs: 2 * Math.PI * src.fHigh * src.amplitude * 1e-8 }, `chain-format.md slew definition vs nodal band maximum, ${seed}, ${n.id}`);
    const dc = dcInterval(chain, n.id);
    if (dc === null || dcNet.dcUnbounded.has(n.id)) continue;
    const out = widen(dc, acPeak(chain, n.id));
    // the stage's (+) input: for the in-amp that is A1's, the E+ input (its first op-amp)
    const plus = net.stageOpamps.get(n.id)![0].p;
    const plusIv = widen(dcIntervalAtNet(chain, plus)!, acPeakAtNet(chain, plus));
    const engineIn = s.inputRange?.peak;
    near(engineIn?.min, plusIv.min, { abs: 1e-9 * Math.max(1, Math.abs(plusIv.min)) + 1e-6 * (plusIv.max - plusIv.min) }, `chain-format.md: (+) input interval DC ± AC peak, nodal reference, ${seed}, ${n.id} (${n.kind}) min`);
    near(engineIn?.max, plusIv.max, { abs: 1e-9 * Math.max(1, Math.abs(plusIv.max)) + 1e-6 * (plusIv.max - plusIv.min) }, `chain-format.md: (+) input interval DC ± AC peak, nodal reference, ${seed}, ${n.id} (${n.kind}) max`);
    const part = (n.part ? chain.parts[n.part] : undefined) ?? {};
    const want = expectedStatus(
      out,
      n.rails.low + (part.swingLow ?? 0),
      n.rails.high - (part.swingHigh ?? 0),
      plusIv,
      n.rails.low + (part.inputLow ?? 0),
      n.rails.high - (part.inputHigh ?? 0),
      0.01,
    );
    if (want) same(s.status, want, `chain-format.md 'Headroom' from the nodal reference, ${seed}, ${n.id} (${n.kind})`);
  }
  for (const n of chain.nodes) {
    if (n.kind !== "adc") continue;
    const a = pathTo(result, n.id).adc!;
    const { vinLow, vinHigh, sampleRate } = n.params;
    if (src.fHigh >= sampleRate / 2) {
      same([a.status, a.aliasAttenuationDb], ["clip", null], `chain-format.md: nyquist → status clip, alias null, ${seed}, ${n.id}`);
      continue;
    }
    const lo = sampleRate - src.fHigh;
    if (lo <= chain.analysis.fMax) {
      const pin = net.outputOf.get(n.id)!;
      const band = maxOverBand((f) => magAt(net, pin, f), src.fLow, src.fHigh).value;
      const att = 20 * Math.log10(band / maxOverBand((f) => magAt(net, pin, f), lo, chain.analysis.fMax).value);
      // below −160 dB in the band the double-precision nodal solve resolves nothing to compare
      if (band > 1e-8) near(a.aliasAttenuationDb, att, { abs: 1e-4 }, `chain-format.md alias definition vs nodal maxima, ${seed}, ${n.id}`);
    }
    const dc = dcInterval(chain, n.id);
    if (dc === null) continue;
    const pk = widen(dc, acPeak(chain, n.id));
    near(a.rangeUse, (pk.max - pk.min) / (vinHigh - vinLow), { rel: 1e-6 }, `chain-format.md rangeUse vs nodal reference, ${seed}, ${n.id}`);
    const want = expectedStatus(pk, vinLow, vinHigh, null, 0, 0, 1e-6);
    if (want) same(a.status, want, `chain-format.md: ADC held to [vinLow, vinHigh] like a stage, ${seed}, ${n.id}`);
  }
}

const SEEDS = Array.from({ length: 24 }, (_, i) => `chainwright-ref-${i}`);
// issue 14: 32 chains from the sensor sources, eight from each kind (bridge, thermocouple, photodiode, piezo)
const SENSOR_SEEDS = Array.from({ length: 32 }, (_, i) => ({ seed: `chainwright-sensor-${i}`, kind: SENSOR_KINDS[i % 4] }));
const FREQS = Array.from({ length: 15 }, (_, i) => Math.pow(1e5, i / 14));

/** Every path's response at FREQS, pathDcGain, and every op-amp stage's DC interval and AC peak. */
function responseAndDcChecks(chain: Chain, seed: string) {
  const result = analyze(chain, FREQS);
  const net = buildNet(chain);
  const ends = chain.nodes.filter((n) => n.kind === "adc").map((n) => n.id);
  for (const end of ends) {
    const p = pathTo(result, end);
    FREQS.forEach((f, i) => {
      const h = transfer(net, f, net.outputOf.get(end)!)!;
      if (dB(h) < -160) return; // below what a double-precision nodal solve resolves
      near(p.response.magDb[i], dB(h), { abs: 1e-7 }, `whole-chain nodal solve, ${seed}, ${end}, ${f.toPrecision(3)} Hz`);
      nearPhase(p.response.phaseDeg[i], phaseDeg(h), 1e-6, `whole-chain nodal solve, ${seed}, ${end}, ${f.toPrecision(3)} Hz`);
    });
    const dc = dcInterval(chain, end);
    const g = dc === null ? null : transfer(buildNet(chain, { dcMode: true }), 0, net.outputOf.get(end)!)!.re;
    if (g === null) same(p.adc?.pathDcGain ?? null, null, `chain-format.md: no finite path DC gain behind an integrator, ${seed}, ${end}`);
    else near(p.adc?.pathDcGain, g, { abs: 1e-9 * Math.max(1, Math.abs(g)) }, `nodal DC solve, pathDcGain, ${seed}, ${end}`);
  }
  for (const n of chain.nodes.filter((x) => isOpAmpKind(x.kind))) {
    const s = stageOf(result, n.id);
    const ref = dcInterval(chain, n.id);
    if (ref === null) same(s.dcOut, null, `chain-format.md: unbounded DC is null, ${seed}, ${n.id}`);
    else {
      near(s.dcOut?.min, ref.min, { abs: 1e-9 * Math.max(1, Math.abs(ref.min)) }, `nodal DC interval, ${seed}, ${n.id} (${n.kind}) min`);
      near(s.dcOut?.max, ref.max, { abs: 1e-9 * Math.max(1, Math.abs(ref.max)) }, `nodal DC interval, ${seed}, ${n.id} (${n.kind}) max`);
    }
    // floor: amplitude·1e-8 (−160 dB, what the double-precision nodal solve resolves, as for responses)
    near(s.acPeak, acPeak(chain, n.id), { rel: 1e-6, abs: 1e-8 * signalOf(chain).amplitude }, `nodal band maximum (chain-format.md acPeak), ${seed}, ${n.id} (${n.kind})`);
  }
}

function noiseChecks(chain: Chain, seed: string) {
  const result = analyze(chain);
  for (const end of chain.nodes.filter((n) => n.kind === "adc").map((n) => n.id)) {
    const ref = noiseRms(chain, end, 1, 1e5, 1e-8);
    near(pathTo(result, end).noise.totalRms, ref.rms, { rel: 1e-4 }, `adaptive Simpson of nodal |T|², ${seed}, ${end}`);
  }
}

describe("random chains against the whole-chain nodal reference", () => {
  for (const seed of SEEDS) it(`seed ${seed}`, () => responseAndDcChecks(randomChain(seed), seed));
  for (const seed of SEEDS.slice(0, 6)) it(`seed ${seed}: output noise of every ADC path`, () => noiseChecks(randomChain(seed), seed));
  for (const seed of SEEDS) {
    it(`seed ${seed}: headroom status, slew, ADC range and alias`, () => headroomChecks(randomChain(seed), seed));
  }
});

describe("random chains from the sensor sources against the whole-chain nodal reference (issue 14)", () => {
  for (const { seed, kind } of SENSOR_SEEDS) {
    it(`${kind} seed ${seed}: a complete chain by the schema's own rules`, () => {
      const v = validateChain(randomSensorChain(seed, kind));
      same(v.ok ? [] : v.errors.map((e) => `${e.path}: ${e.message}`), [], `lib/chain/README.md pairing rules: the generator builds only complete chains, ${seed}`);
    });
    it(`${kind} seed ${seed}: responses, DC intervals, AC peaks`, () => responseAndDcChecks(randomSensorChain(seed, kind), seed));
    it(`${kind} seed ${seed}: output noise of every ADC path`, () => noiseChecks(randomSensorChain(seed, kind), seed));
    it(`${kind} seed ${seed}: headroom status, (+) input interval, slew, ADC range and alias`, () => headroomChecks(randomSensorChain(seed, kind), seed));
  }
});
