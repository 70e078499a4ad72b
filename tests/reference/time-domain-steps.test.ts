/**
 * Time-domain runs against closed forms and an independent ODE solve.
 *
 * - First-order step 1 − e^(−t/τ) and its 10–90 % rise ln 9·τ (the first-order step response of any
 *   circuits textbook; ln 9 = ln(0.9/0.1) follows from it).
 * - Second-order Butterworth step overshoot exp(−πζ/√(1 − ζ²)) = e^(−π) = 4.32 % at ζ = 1/√2, peak at
 *   π/ωd (derived from the underdamped second-order step response formula).
 * - A five-stage loaded chain (source resistance, two RC sections loading each other and an inverting
 *   input, a finite-GBW non-inverting stage, a Sallen-Key) written as ODEs by hand and solved with odex
 *   (references.md §16); the engine's samples must follow it.
 * - A sine through a linear chain settles to the frequency engine's |H| and phase at every node.
 * - A stage driven past its usable swing clamps there, and rejoins the linear response when the drive
 *   falls back; a slew-limited output ramps at the part's slew rate (the definition of slew rate).
 * - DC starting levels: the ideal inverting stage with (+) at vref gives −(r2/r1)·Vin + (1 + r2/r1)·vref;
 *   an ideal integrator starts at vref and ramps at −ΔV/(r1·c2) (derived from the ideal op-amp laws).
 *
 * The bilinear transform treats the input as linear between samples, so a step between samples n−1 and
 * n acts at t_n − T/2 (lib/engine/time-domain.ts); the closed forms below are shifted by that half sample.
 */
import { describe, it } from "vitest";
import { compileChain, planTimeDomain, runWaveform, stimulusWave } from "@/lib/engine";
import {
  adc,
  integrator,
  inverting,
  makeChain,
  mfb,
  noninverting,
  rcHighpass,
  rcLowpass,
  sallenKey,
  source,
} from "./support/chain-builders";
import { holds, near, nearPhase, same } from "./support/checks";
import { integrate } from "./support/ode";

const traceOf = (run: ReturnType<typeof runWaveform>, id: string) => {
  const t = run.nodes.find((n) => n.id === id);
  if (!t) throw new Error(`no trace ${id}`);
  return t;
};

/** Time (s) where v first crosses `level` going up, by linear interpolation between samples. */
function crossing(v: Float64Array, level: number, fs: number): number {
  for (let i = 1; i < v.length; i++) if (v[i - 1] < level && v[i] >= level) return (i - 1 + (level - v[i - 1]) / (v[i] - v[i - 1])) / fs;
  throw new Error(`never reaches ${level}`);
}

describe("first-order step", () => {
  const fs = 1e6;
  const tau = 1e-3; // 1 kΩ · 1 µF
  const at = 1e-4; // sample 100
  const chain = makeChain({ nodes: [source(), rcLowpass("rc", { r: 1e3, c: 1e-6 }), adc("adc")] });
  const run = runWaveform(chain, stimulusWave({ kind: "step", at, amplitude: 1 }, fs, 8000), { sampleRate: fs });
  const v = traceOf(run, "rc").v;

  it("follows 1 − e^(−t/τ)", () => {
    for (const i of [100, 150, 500, 1100, 2300, 5000, 7999]) {
      const t = i / fs - (at - 0.5 / fs);
      near(v[i], 1 - Math.exp(-t / tau), { abs: 1e-6 }, `first-order step response 1 − e^(−t/τ) (circuits textbook) at sample ${i}`);
    }
    near(v[99], 0, { abs: 0 }, "at rest before the step");
  });

  it("rises from 10 % to 90 % in ln 9·τ", () => {
    const rise = crossing(v, 0.9, fs) - crossing(v, 0.1, fs);
    near(rise, Math.log(9) * tau, { rel: 1e-5 }, "10–90 % rise of a first-order step = ln 9·τ (derived from 1 − e^(−t/τ))");
  });

  it("a source resistance adds to the section's resistance: τ = (Rs + r)·c", () => {
    const ch = makeChain({ nodes: [source({ resistance: 1e3 }), rcLowpass("rc", { r: 1e3, c: 1e-6 }), adc("adc")] });
    const w = traceOf(runWaveform(ch, stimulusWave({ kind: "step", at, amplitude: 1 }, fs, 8000), { sampleRate: fs }), "rc").v;
    const rise = crossing(w, 0.9, fs) - crossing(w, 0.1, fs);
    near(rise, Math.log(9) * 2e-3, { rel: 1e-5 }, "first-order rise ln 9·(Rs + r)·c (series resistances add)");
  });
});

describe("second-order Butterworth step (unity-gain Sallen-Key, r1 = r2, c1 = 2·c2)", () => {
  const fs = 1e6;
  const [r, c2] = [1e4, 1e-8];
  const w0 = 1 / (r * Math.sqrt(2 * c2 * c2));
  const chain = makeChain({ nodes: [source(), sallenKey("sk", { r1: r, r2: r, c1: 2 * c2, c2 }), adc("adc")] });
  const run = runWaveform(chain, stimulusWave({ kind: "step", at: 1e-4, amplitude: 1 }, fs, 6000), { sampleRate: fs });
  const v = traceOf(run, "sk").v;
  let peak = 0;
  let at = 0;
  v.forEach((x, i) => {
    if (x > peak) [peak, at] = [x, i];
  });

  it("overshoots by 4.32 %", () => {
    const zeta = 1 / Math.SQRT2;
    near(peak - 1, Math.exp((-Math.PI * zeta) / Math.sqrt(1 - zeta * zeta)), { abs: 2e-6 }, "overshoot exp(−πζ/√(1−ζ²)) at ζ = 1/√2 (derived from the second-order step response)");
    near(peak - 1, 0.0432, { abs: 5e-5 }, "Butterworth second-order overshoot 4.32 % (derived, as above)");
  });

  it("peaks at π/ωd, ωd = ω0·√(1 − ζ²)", () => {
    const tp = at / fs - (1e-4 - 0.5 / fs);
    near(tp, Math.PI / (w0 / Math.SQRT2), { abs: 1.5 / fs }, "peak time π/ωd of the second-order step response (derived)");
  });

  it("settles to the DC gain 1", () => {
    near(v[v.length - 1], 1, { abs: 1e-9 }, "unity-gain Sallen-Key: H(0) = 1");
  });
});

describe("loaded five-stage chain against an odex solve of its ODEs", () => {
  // source (Rs) → RC a → RC b → inverting (r1 loads b) → non-inverting with gbw only → Sallen-Key → ADC
  const E = { rs: 1e3, ra: 1e4, ca: 1e-8, rb: 1e4, cb: 4.7e-9, r1: 2.2e4, r2: 4.7e4, rf: 9e3, rg: 1e3, gbw: 1e5, s1: 1e4, s2: 1e4, c1: 2.2e-8, c2: 1e-8 };
  const wt = 2 * Math.PI * E.gbw;
  const chain = makeChain({
    nodes: [
      source({ resistance: E.rs }),
      rcLowpass("a", { r: E.ra, c: E.ca }),
      rcLowpass("b", { r: E.rb, c: E.cb }),
      inverting("inv", { r1: E.r1, r2: E.r2 }),
      noninverting("ni", { rf: E.rf, rg: E.rg }, { part: "slow" }),
      sallenKey("sk", { r1: E.s1, r2: E.s2, c1: E.c1, c2: E.c2 }),
      adc("adc", { inputResistance: 1e5 }),
    ],
    parts: { slow: { gbw: E.gbw } },
  });
  const burst = { f: 2000, cycles: 3, at: 5e-4, amp: 0.5 };
  const u = (t: number) => {
    const x = t - burst.at;
    return x >= 0 && x < burst.cycles / burst.f ? burst.amp * Math.sin(2 * Math.PI * burst.f * x) : 0;
  };
  // states: va, vb (capacitor voltages), vni (op-amp output, A = ωt/s), vc1 = V_A − V_out and vp of the Sallen-Key
  const rhs = (t: number, y: number[]) => {
    const [va, vb, vni, vc1, vp] = y;
    const vinv = -(E.r2 / E.r1) * vb; // ideal inverting stage, (−) at virtual ground
    const dva = ((u(t) - va) / (E.rs + E.ra) - (va - vb) / E.rb) / E.ca;
    const dvb = ((va - vb) / E.rb - vb / E.r1) / E.cb;
    const dvni = wt * (vinv - (vni * E.rg) / (E.rf + E.rg));
    const vA = vc1 + vp;
    const i1 = (vni - vA) / E.s1;
    const i2 = (vA - vp) / E.s2;
    return [dva, dvb, dvni, (i1 - i2) / E.c1, i2 / E.c2];
  };
  const fs = 2e6;
  const N = 8000;
  const run = runWaveform(chain, stimulusWave({ kind: "burst", at: burst.at, frequency: burst.f, cycles: burst.cycles, amplitude: burst.amp }, fs, N), { sampleRate: fs });

  it("every node follows the ODE solution at 40 instants", () => {
    let y = [0, 0, 0, 0, 0];
    let t = 0;
    const scale = { b: 0.5, inv: 1, ni: 10, sk: 10 };
    for (let i = 200; i < N; i += 200) {
      // integrate piecewise, stopping at the burst's start and end so odex sees the kinks at step edges
      const tNext = i / fs;
      for (const edge of [burst.at, burst.at + burst.cycles / burst.f]) {
        if (t < edge && edge < tNext) {
          y = integrate(rhs, t, y, edge, 1e-10);
          t = edge;
        }
      }
      y = integrate(rhs, t, y, tNext, 1e-10);
      t = tNext;
      const [, vb, vni, , vp] = y;
      const ref = { b: vb, inv: -(E.r2 / E.r1) * vb, ni: vni, sk: vp };
      for (const id of ["b", "inv", "ni", "sk"] as const) {
        near(traceOf(run, id).v[i], ref[id], { abs: 2e-4 * scale[id] }, `odex solve of the hand-written ODEs (references.md §16): ${id} at ${(tNext * 1e3).toFixed(2)} ms`);
      }
    }
  });
});

describe("sine through a linear chain matches the frequency engine", () => {
  const chain = makeChain({
    nodes: [
      source({ resistance: 600 }),
      rcHighpass("hp", { c: 1e-6, r: 1e4 }),
      noninverting("ni", { rf: 1e4, rg: 1e3 }, { part: "p" }),
      mfb("mfb", { r1: 1e4, r2: 1e4, r3: 1e4, c1: 1e-8, c2: 2.2e-9 }),
      rcLowpass("rc", { r: 1e3, c: 1e-8 }),
      adc("adc", { inputResistance: 1e4 }),
    ],
    parts: { p: { gbw: 1e6, aol: 1e5 } },
  });
  const cc = compileChain(chain);
  const ids = ["hp", "ni", "mfb", "rc", "adc"];
  // fs well above every stage's poles: away from its warping frequency the bilinear transform compresses
  // frequency by (ωwT/2)/tan(ωwT/2) ≈ 1 − (ωwT/2)²/3, here under 3e-4 for the 17 kHz loaded RC section
  const fs = 2e6;
  for (const f of [80, 625, 3125]) {
    it(`at ${f} Hz: amplitude and phase at every node`, () => {
      const N = Math.round(Math.max(0.25, 24 / f) * fs); // the 16 Hz high-pass settles in 0.25 s (> 20 τ)
      const emf = stimulusWave({ kind: "burst", at: 0, frequency: f, cycles: f, amplitude: 0.01 }, fs, N);
      const run = runWaveform(chain, emf, { sampleRate: fs });
      const sw = cc.sweep(Float64Array.from([f]));
      // least-squares fit of a·sin + b·cos over the last 20 whole periods
      const M = Math.round((20 * fs) / f);
      for (const id of ids) {
        const v = traceOf(run, id).v;
        let a = 0;
        let b = 0;
        for (let i = N - M; i < N; i++) {
          const th = (2 * Math.PI * f * i) / fs;
          a += v[i] * Math.sin(th);
          b += v[i] * Math.cos(th);
        }
        a *= 2 / M;
        b *= 2 / M;
        const k = cc.nodeIds.indexOf(id);
        const hr = sw.cumRe[k][0];
        const hi = sw.cumIm[k][0];
        const mag = Math.hypot(a, b) / 0.01;
        near(mag, Math.hypot(hr, hi), { rel: 2e-4 }, `|H| of the frequency engine at ${f} Hz, ${id}`);
        nearPhase((Math.atan2(b, a) * 180) / Math.PI, (Math.atan2(hi, hr) * 180) / Math.PI, 0.02, `phase of the frequency engine at ${f} Hz, ${id}`);
      }
    });
  }

  it("exact at the warping frequency even at 8 samples per period", () => {
    const sk = makeChain({ nodes: [source(), sallenKey("sk", { r1: 1e4, r2: 2.2e4, c1: 1e-8, c2: 4.7e-9 }), adc("adc")] });
    const plan0 = planTimeDomain(sk, 1e5);
    const f = plan0.filters[1]!.warpHz!;
    const fs = 8 * f;
    const plan = planTimeDomain(sk, fs);
    same(plan.filters[1]!.warpHz !== null && Math.abs(plan.filters[1]!.warpHz! - f) < 1e-9 * f, true, "warping frequency is the dominant pole, independent of fs");
    const N = 8 * 4000;
    const run = plan.run(stimulusWave({ kind: "burst", at: 0, frequency: f, cycles: 5000, amplitude: 1 }, fs, N));
    const v = traceOf(run, "sk").v;
    let a = 0;
    let b = 0;
    for (let i = N - 800; i < N; i++) {
      a += v[i] * Math.sin((2 * Math.PI * i) / 8);
      b += v[i] * Math.cos((2 * Math.PI * i) / 8);
    }
    const sw = compileChain(sk).sweep(Float64Array.from([f]));
    near(Math.hypot(a, b) * (2 / 800), Math.hypot(sw.cumRe[1][0], sw.cumIm[1][0]), { rel: 1e-9 }, "bilinear transform with pre-warping is exact at the warping frequency (derived from the tan mapping)");
  });
});

describe("rails, swing and slew", () => {
  const fs = 1e6;
  const chain = makeChain({
    nodes: [source(), noninverting("g", { rf: 9e3, rg: 1e3 }, { part: "p", rails: { low: -5, high: 5 } }), rcLowpass("rc", { r: 1e3, c: 1e-9 }), adc("adc")],
    parts: { p: { swingLow: 0.5, swingHigh: 0.5 } },
  });
  const f = 1000;
  const emf = stimulusWave({ kind: "burst", at: 1e-3, frequency: f, cycles: 5, amplitude: 1 }, fs, 12_000);
  const plan = planTimeDomain(chain, fs);
  const clamped = plan.run(emf);
  const linear = plan.run(emf, { limits: false });
  const g = traceOf(clamped, "g");
  const gl = traceOf(linear, "g");

  it("clamps at the usable swing, rails less the part's swing", () => {
    same(g.band, { low: -4.5, high: 4.5 }, "usable band = rails ∓ swing (chain-format.md)");
    holds(Math.max(...g.v) === 4.5 && Math.min(...g.v) === -4.5, "output held exactly at the band edges");
    near(Math.max(...gl.v), 10, { rel: 1e-6 }, "unclamped: gain 1 + rf/rg = 10 on a 1 V peak");
    same(g.clips.length, 10, "one clipped stretch per half cycle: 5 cycles, 10 stretches");
    const expected = (Math.PI - 2 * Math.asin(0.45)) / (2 * Math.PI * f); // |10·sin| > 4.5
    for (const c of g.clips) near((c.end - c.start) / fs, expected, { abs: 1.5 / fs }, "clipped while |10·sin θ| > 4.5: (π − 2·asin 0.45)/ω per half cycle (derived)");
    near(g.clips[0].peak, 10, { rel: 1e-4 }, "the span records the peak the linear response asked for");
  });

  it("recovers: the output rejoins the linear response when the drive falls back", () => {
    let worst = 0;
    for (let i = 0; i < g.v.length; i++) if (Math.abs(gl.v[i]) < 4.5) worst = Math.max(worst, Math.abs(g.v[i] - gl.v[i]));
    near(worst, 0, { abs: 1e-12 }, "inside the band the clamped and the linear output are the same");
    const after = 6e-3 * fs + 10;
    near(g.v[after], 0, { abs: 1e-12 }, "after the burst the output is back at its operating point");
  });

  it("the next stage sees the clamped output", () => {
    const rc = traceOf(clamped, "rc");
    holds(Math.max(...rc.v) <= 4.5 + 1e-9, "an RC section fed by a clamped output stays within the clamp");
    holds(Math.max(...traceOf(linear, "rc").v) > 9, "while the linear run passes the full 10 V");
  });

  it("slew limit: a 1 V step at 0.1 V/µs ramps over 10 µs", () => {
    const ch = makeChain({ nodes: [source(), noninverting("f", { rf: null, rg: null }, { part: "s" }), adc("adc")], parts: { s: { slewRate: 1e5 } } });
    const t = traceOf(runWaveform(ch, stimulusWave({ kind: "step", at: 1e-5, amplitude: 1 }, 1e7, 400), { sampleRate: 1e7 }), "f");
    near(t.v[100], 0.01, { abs: 1e-12 }, "slew rate × T per sample (definition of slew rate)");
    near(t.v[149], 0.5, { abs: 1e-12 }, "half way after 5 µs at 0.1 V/µs");
    near(t.v[199], 1, { abs: 1e-12 }, "arrives after 1 V / 0.1 V/µs = 10 µs");
    same(t.slews.length === 1 && t.slews[0].end - t.slews[0].start, 99, "one slewing stretch of 99 samples before it reaches the target");
  });
});

describe("DC starting levels", () => {
  it("inverting stage with (+) at vref starts at −(r2/r1)·Vin + (1 + r2/r1)·vref", () => {
    const ch = makeChain({ nodes: [source({ dc: 1 }), inverting("inv", { r1: 1e4, r2: 2e4, vref: 0.5 }), rcHighpass("hp", { c: 1e-6, r: 1e4, vbias: 2.5 }), adc("adc")] });
    const run = runWaveform(ch, new Float64Array(100).fill(1), { sampleRate: 1e4 });
    near(traceOf(run, "inv").v[0], -2 * 1 + 3 * 0.5, { abs: 1e-12 }, "ideal inverting stage with (+) at vref (derived)");
    near(traceOf(run, "inv").v[99], -0.5, { abs: 1e-12 }, "and stays there with a steady input");
    near(traceOf(run, "hp").v[50], 2.5, { abs: 1e-12 }, "a high-pass section sits at its vbias");
  });

  it("a recording that starts away from the source dc starts settled", () => {
    const ch = makeChain({ nodes: [source({ dc: 0 }), rcLowpass("rc", { r: 1e3, c: 1e-6 }), adc("adc")] });
    const run = runWaveform(ch, new Float64Array(100).fill(0.7), { sampleRate: 1e4 });
    near(traceOf(run, "rc").v[0], 0.7, { abs: 1e-12 }, "steady state for the first sample (DC gain 1)");
    near(traceOf(run, "rc").v[99], 0.7, { abs: 1e-12 }, "no transient");
  });

  it("an ideal integrator starts at vref and ramps at −ΔV/(r1·c2)", () => {
    const ch = makeChain({ nodes: [source(), integrator("int", { r1: 1e4, c2: 1e-7, vref: 1 }), adc("adc")] });
    const fs = 1e5;
    const run = runWaveform(ch, stimulusWave({ kind: "step", at: 1e-3, amplitude: 0.1 }, fs, 400), { sampleRate: fs });
    const v = traceOf(run, "int").v;
    near(v[0], 1, { abs: 1e-12 }, "integrator held at its (+) level until t = 0");
    const slope = (v[300] - v[200]) / (100 / fs);
    near(slope, -0.1 / (1e4 * 1e-7), { rel: 1e-9 }, "ideal integrator: dVo/dt = −Vin/(r1·c2) (derived)");
  });
});
