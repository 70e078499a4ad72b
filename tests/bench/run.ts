/**
 * `npm run bench`: the fast path against the complex.js per-point path, side by side in one run.
 *
 *  1. One 10-stage chain of mixed kinds (two loaded RC sections, Sallen-Key and MFB sections, gain stages
 *     and a lossy integrator, every op-amp with a finite-GBW part) at 2,000 log-spaced points.
 *  2. 1,000 Monte-Carlo-style re-evaluations: every R and C drawn within its tolerance (seeded), each
 *     draw evaluated at the same 2,000 points. The fast path reloads values into one compiled chain
 *     (`retune`) and sweeps; the complex.js path prepares each draw's network and solves it per point.
 *
 * Rates are stage-points per second (stages × points / time) from the MEDIAN time per sweep or per draw,
 * the same statistic for both paths, so that a busy machine's spikes do not decide the ratio; the mean
 * and the total are printed too. Both paths are warmed up first.
 *  3. The tolerance spread (lib/engine/spread.ts) of the same chain at 1,000 points: 1,000 builds and
 *     10,000 builds (envelopes, DC gain, f0, Q and worst margin of every stage per build, sensitivities
 *     and worst-case corners first), against one sweep at the same 1,000 points measured in the same run.
 *     It runs in this thread here; the workspace runs the same code in a worker in 20 ms slices.
 * Options: --draws N (default 1000), --ref-draws N (complex.js draws, default 50: at a few hundred ms per
 * draw the full 1,000 take minutes; pass --ref-draws 1000 for all), --points N (default 2000),
 * --spread-trials N (the larger spread run, default 10000; 0 skips it).
 */
import os from "node:os";
import { compileChain, planTimeDomain, referenceResponse, stimulusWave } from "@/lib/engine";
import { runSpread, startSpread } from "@/lib/engine/spread";
import { logGrid } from "@/lib/engine/grids";
import { benchChain, perturbed, stageCount } from "./chains";

const arg = (name: string, fallback: number) => {
  const i = process.argv.indexOf(`--${name}`);
  return i >= 0 ? Number(process.argv[i + 1]) : fallback;
};
const points = arg("points", 2000);
const draws = arg("draws", 1000);
const refDraws = Math.min(draws, arg("ref-draws", 50));
const bigSpread = arg("spread-trials", 10_000);
/** --spread-only: section 3 alone */
const spreadOnly = process.argv.includes("--spread-only");

const chain = benchChain();
const stages = stageCount(chain);
const grid = logGrid(chain.analysis.fMin, chain.analysis.fMax, points);
const gridList = Array.from(grid);

/** Times each call of fn; returns the per-call times in ms. */
function times(n: number, fn: (i: number) => void): number[] {
  const out: number[] = [];
  for (let i = 0; i < n; i++) {
    const t = performance.now();
    fn(i);
    out.push(performance.now() - t);
  }
  return out;
}
const median = (xs: number[]) => {
  const s = [...xs].sort((a, b) => a - b);
  return s.length % 2 ? s[(s.length - 1) / 2] : (s[s.length / 2 - 1] + s[s.length / 2]) / 2;
};
const mean = (xs: number[]) => xs.reduce((a, b) => a + b, 0) / xs.length;
const rate = (msPerRun: number) => (stages * points) / (msPerRun / 1000);
const fmt = (x: number) => (x >= 1e6 ? `${(x / 1e6).toFixed(1)} M` : `${(x / 1e3).toFixed(1)} k`);
const row = (name: string, t: number[]) =>
  `   ${name.padEnd(12)} median ${median(t).toFixed(3).padStart(9)} ms   ${fmt(rate(median(t))).padStart(8)}stage-points/s` +
  `   (mean ${mean(t).toFixed(3)} ms, ${t.length} runs, ${(t.reduce((a, b) => a + b, 0) / 1000).toFixed(2)} s in all)`;

// ---- warm-up of both paths, so neither pays for the JIT in its timed runs
const cc = compileChain(chain);
let out = cc.sweep(grid);
for (const c of perturbed(chain, 400, "warm-up")) {
  cc.retune(c);
  out = cc.sweep(grid, out);
}
cc.retune(chain);
for (const c of perturbed(chain, 3, "warm-up")) referenceResponse(c, gridList.slice(0, 300));

console.log(`chain: ${stages} stages (${chain.nodes.map((n) => n.kind).join(" → ")}), ${points} points`);
console.log("");

if (!spreadOnly) {
  // ---- 1. one chain
  const fast1 = times(400, () => (out = cc.sweep(grid, out)));
  const ref1 = times(5, () => referenceResponse(chain, gridList));
  const ratio1 = median(ref1) / median(fast1);
  console.log("1. one sweep of the chain");
  console.log(row("fast path", fast1));
  console.log(row("complex.js", ref1));
  console.log(`   ratio        ${ratio1.toFixed(0)}×`);
  console.log("");

  // ---- 2. Monte Carlo re-evaluations
  const chains = perturbed(chain, draws);
  const e = cc.nodeIds.indexOf("adc");
  const fast2 = times(draws, (d) => {
    cc.retune(chains[d]);
    out = cc.sweep(grid, out);
  });
  const refEnd: number[][] = [];
  const ref2 = times(refDraws, (d) => refEnd.push(referenceResponse(chains[d], gridList).get("adc")!.cum.map((c) => c!.abs())));
  const ratio2 = median(ref2) / median(fast2);
  // outside the timed runs: how far apart the two paths are on the draws both evaluated
  let worst = 0;
  refEnd.forEach((ref, d) => {
    cc.retune(chains[d]);
    out = cc.sweep(grid, out);
    ref.forEach((m, k) => (worst = Math.max(worst, Math.abs(Math.hypot(out.cumRe[e][k], out.cumIm[e][k]) / m - 1))));
  });
  console.log(`2. Monte Carlo: ${draws} draws, each retuned and swept (complex.js path on the first ${refDraws})`);
  console.log(row("fast path", fast2));
  console.log(row("complex.js", ref2));
  console.log(`   ratio        ${ratio2.toFixed(0)}×`);
  console.log(`   largest relative difference of |H| at the ADC between the paths: ${worst.toExponential(2)}`);
  console.log("");

  const targetRate = 30e6;
  const okRate = rate(median(fast1)) >= targetRate && rate(median(fast2)) >= targetRate;
  const okRatio = ratio1 >= 15 && ratio2 >= 15;
  console.log(
    `targets: fast ≥ 30 M stage-points/s (${stages} × ${points} in < ${(((stages * points) / targetRate) * 1000).toFixed(2)} ms): ` +
      `${okRate ? "met" : "NOT met"}; fast ≥ 15× complex.js: ${okRatio ? "met" : "NOT met"}`,
  );
}

// ---- 3. tolerance spread
{
  const sp = 1000;
  const g1k = logGrid(chain.analysis.fMin, chain.analysis.fMax, sp);
  let o = cc.sweep(g1k);
  runSpread(chain, { trials: 300, seed: 99, points: sp }); // warm-up
  // one sweep at the same points, timed in between the spread's slices, so that both see the same load
  const sweepTimes: number[] = [];
  const sweepProbe = () => sweepTimes.push(...times(5, () => (o = cc.sweep(g1k, o))));
  const spreadRun = (trials: number) => {
    const run = startSpread(chain, { trials, seed: 1, points: sp });
    let work = 0;
    const timed = (fn: () => void) => {
      const t = performance.now();
      fn();
      work += performance.now() - t;
    };
    sweepProbe();
    // the fixed part first (nominal, sensitivities, corners), then the builds in slices of 100
    timed(() => {
      while (run.done < run.total - trials) run.step(1);
    });
    const setup = work;
    // each build timed on its own: its median, like the sweep's, leaves out the time another process took
    const each: number[] = [];
    for (let finished = false; !finished; ) {
      for (let k = 0; k < 100 && !finished; k++) {
        const before = work;
        timed(() => (finished = run.step(1)));
        each.push(work - before);
      }
      sweepProbe();
    }
    const builds = work - setup;
    let res!: ReturnType<typeof run.result>;
    timed(() => (res = run.result()));
    return { setup, builds, perBuild: median(each), result: work - setup - builds, all: work, res };
  };
  // three runs of 1,000 builds (the one with the median estimate is shown), then the larger run
  const estimateOf = (r: ReturnType<typeof spreadRun>) => r.setup + 1000 * r.perBuild + r.result;
  const a = [spreadRun(1000), spreadRun(1000), spreadRun(1000)].sort((x, y) => estimateOf(x) - estimateOf(y))[1];
  const b = bigSpread > 0 ? spreadRun(bigSpread) : null;
  const sweep1k = median(sweepTimes);
  console.log("");
  console.log(`3. tolerance spread: ${stages} stages, ${sp} points, ${a.res.parts.length} parts varied (1,000 builds: the median of three runs)`);
  console.log(`   one sweep at ${sp} points       median ${sweep1k.toFixed(3)} ms (${sweepTimes.length} sweeps between the spread's slices)`);
  const line = (n: number, r: ReturnType<typeof spreadRun>) =>
    console.log(
      `   ${String(n).padStart(6)} builds    ${(r.all / 1000).toFixed(2)} s in all ` +
        `(sensitivities and corners ${(r.setup / 1000).toFixed(3)} s, builds ${(r.builds / 1000).toFixed(2)} s, result ${r.result.toFixed(0)} ms); ` +
        `per build ${r.perBuild.toFixed(3)} ms (median) = ${(r.perBuild / sweep1k).toFixed(2)}× one sweep; ` +
        `${(r.res.clipShare * 100).toFixed(1)} % of builds clip`,
    );
  line(1000, a);
  if (b) line(bigSpread, b);
  // the spread's sweeps leave out the admittances nothing reads (SweepOptions), against a full sweep
  {
    const lean: number[] = [];
    const full: number[] = [];
    let ol = cc.sweep(g1k);
    let of = cc.sweep(g1k);
    for (let r = 0; r < 400; r++) {
      lean.push(...times(1, () => (ol = cc.sweep(g1k, ol, { admittances: false }))));
      full.push(...times(1, () => (of = cc.sweep(g1k, of))));
    }
    console.log(
      `   one sweep, responses only      median ${(median(lean) * 1000).toFixed(1)} µs, with every admittance ${(median(full) * 1000).toFixed(1)} µs: ` +
        `${(median(full) / median(lean)).toFixed(2)}× (${lean.length} sweeps each, alternated)`,
    );
  }
  // a build's reload of the values: the stage models built into the previous build's buffers (what the
  // spread does) against freshly allocated ones, alternated draw by draw so both see the same load
  {
    const draws = perturbed(chain, 2000, "retune");
    const reuse: number[] = [];
    const fresh: number[] = [];
    const cr = compileChain(chain);
    const cf = compileChain(chain);
    draws.forEach((d) => {
      reuse.push(...times(1, () => cr.retune(d, { reuse: true })));
      fresh.push(...times(1, () => cf.retune(d)));
    });
    console.log(
      `   retune of one build            reusing the stage-model buffers median ${(median(reuse) * 1000).toFixed(1)} µs, fresh ${(median(fresh) * 1000).toFixed(1)} µs: ` +
        `${(median(fresh) / median(reuse)).toFixed(2)}× (${draws.length} draws each)`,
    );
  }
  // medians on both sides, so a busy machine's stolen slices count for neither
  const estimate = estimateOf(a);
  console.log(
    `   target (issue 9): 1,000 builds in under 0.5 s: ${estimate < 500 ? "met" : "NOT met"} ` +
      `(${(estimate / 1000).toFixed(2)} s from the medians, ${(a.all / 1000).toFixed(2)} s by the wall clock; ` +
      `${(estimate / sweep1k).toFixed(0)} sweeps' worth); load average ${os.loadavg().map((x) => x.toFixed(2)).join(", ")}`,
  );
}

if (!spreadOnly) {
  // ---- 4. time domain
  {
    const N = 1_000_000;
    const fs = 2e6;
    const tp0 = performance.now();
    const plan = planTimeDomain(chain, fs);
    const tPlan = performance.now() - tp0;
    const emf = stimulusWave({ kind: "chirp", at: 0, duration: N / fs, f1: 10, f2: 2e4, amplitude: 0.05 }, fs, N);
    plan.run(emf.subarray(0, 20_000)); // warm-up
    const limited = times(3, () => plan.run(emf));
    const linear = times(3, () => plan.run(emf, { limits: false }));
    const g = logGrid(chain.analysis.fMin, chain.analysis.fMax, 2000);
    let o = cc.sweep(g);
    const sweep = median(times(50, () => (o = cc.sweep(g, o))));
    const sections = plan.filters.reduce((t, f) => t + (f?.sections ?? 0), 0);
    console.log("");
    console.log(`4. time domain: ${stages} stages (${sections} filter sections), ${N.toLocaleString("en")} samples at ${fs / 1e6} MS/s, in this thread`);
    console.log(`   plan (factor and discretise)  ${tPlan.toFixed(2)} ms`);
    console.log(`   run with rails and slew       median ${median(limited).toFixed(0)} ms   (${(N / (median(limited) / 1000) / 1e6).toFixed(1)} M samples/s)`);
    console.log(`   run unlimited (linear)        median ${median(linear).toFixed(0)} ms   limits cost ${(median(limited) / median(linear)).toFixed(2)}× the linear run`);
    console.log(`   one 2,000-point sweep         median ${sweep.toFixed(3)} ms   a 10⁶-sample run = ${(median(limited) / sweep).toFixed(0)} sweeps`);
    console.log(`   target (issue 10): 10⁶ samples through the chain in under 1 s: ${median(limited) < 1000 ? "met" : "NOT met"} (${(median(limited) / 1000).toFixed(2)} s)`);
  }
}
