/**
 * Time-domain engine internals: the loaded transfers it builds as polynomials agree with the fast
 * path's per-node loaded transfers (the sweep), the discretised cascade equals the analog response at
 * its warping frequency, the root finder, stimuli and the min/max decimation.
 */
import { describe, expect, it } from "vitest";
import { compileChain } from "@/lib/engine/compile-chain";
import { polyRoots } from "@/lib/engine/roots";
import { poly, mul } from "@/lib/engine/poly";
import {
  discreteAt,
  discretise,
  loadedTransfers,
  minMaxDecimate,
  rationalAt,
  stimulusWave,
  planTimeDomain,
} from "@/lib/engine/time-domain";
import { randomChain } from "./engine-fixtures";

const TWO_PI = 2 * Math.PI;

describe("loaded transfers as polynomials", () => {
  for (const seed of ["td-a", "td-b", "td-c", "td-d", "td-e", "td-f"]) {
    it(`match the fast path's sweep on random chain ${seed} (every node, 1e-9)`, () => {
      const ch = randomChain(seed, 8);
      const cc = compileChain(ch);
      const plans = loadedTransfers(cc);
      const freqs = Float64Array.from([0.3, 3, 47, 520, 6e3, 8e4, 9e5]);
      const sw = cc.sweep(freqs);
      for (const p of plans) {
        if (!p.transfer) continue;
        for (let k = 0; k < freqs.length; k++) {
          const [re, im] = rationalAt(p.transfer, TWO_PI * freqs[k]);
          // expected: the node's cumulative response over its driver's cumulative response
          let er = sw.cumRe[p.index][k];
          let ei = sw.cumIm[p.index][k];
          if (p.driver >= 0) {
            const dr = sw.cumRe[p.driver][k];
            const di = sw.cumIm[p.driver][k];
            const d = dr * dr + di * di;
            [er, ei] = [(er * dr + ei * di) / d, (ei * dr - er * di) / d];
          }
          const err = Math.hypot(re - er, im - ei) / Math.max(1e-300, Math.hypot(er, ei));
          expect(err, `${p.id} at ${freqs[k]} Hz`).toBeLessThan(1e-9);
        }
      }
    });
  }
});

describe("discretisation", () => {
  it("the cascade equals the analog transfer at the warping frequency and is close elsewhere", () => {
    const ch = randomChain("td-warp", 7);
    const cc = compileChain(ch);
    const fs = 48e3;
    for (const p of loadedTransfers(cc)) {
      if (!p.transfer) continue;
      const f = discretise(p.transfer, fs);
      if (f.warpHz === null) continue;
      const [ar, ai] = rationalAt(p.transfer, TWO_PI * f.warpHz);
      const [dr, di] = discreteAt(f, f.warpHz, fs);
      expect(Math.hypot(ar - dr, ai - di) / Math.hypot(ar, ai), p.id).toBeLessThan(1e-9);
    }
  });

  it("a stable analog stage stays stable: every discrete pole inside the unit circle", () => {
    for (const seed of ["s1", "s2", "s3"]) {
      const cc = compileChain(randomChain(seed, 8));
      for (const p of loadedTransfers(cc)) {
        if (!p.transfer) continue;
        const f = discretise(p.transfer, 1e3); // far below most poles
        if (f.unstable) continue;
        for (let s = 0; s < f.sections; s++) {
          const a1 = f.sos[5 * s + 3];
          const a2 = f.sos[5 * s + 4];
          // Jury conditions for 1 + a1 z⁻¹ + a2 z⁻²
          expect(Math.abs(a2)).toBeLessThan(1 + 1e-12);
          expect(Math.abs(a1)).toBeLessThanOrEqual(1 + a2 + 1e-12);
        }
      }
    }
  });

  it("rejects a sample rate that is not positive", () => {
    expect(() => planTimeDomain(randomChain("x", 4), 0)).toThrow(/sampleRate/);
  });
});

describe("roots", () => {
  it("finds the roots of a product of known factors, exact zeros included", () => {
    const p = mul(poly(0, 1), poly(1e3, 1), poly(1e8, 2e3, 1), poly(-5e5, 1));
    const r = polyRoots(p);
    const byValue = (a: number[], b: number[]) => Math.round(a[0]) - Math.round(b[0]) || a[1] - b[1];
    const got = Array.from(r.re, (re, k) => [re, r.im[k]]).sort(byValue);
    const want = [[-1e3, -Math.sqrt(1e8 - 1e6)], [-1e3, Math.sqrt(1e8 - 1e6)], [-1e3, 0], [0, 0], [5e5, 0]].sort(byValue);
    got.forEach(([re, im], k) => {
      expect(Math.abs(re - want[k][0])).toBeLessThan(1e-9 * 5e5);
      expect(Math.abs(im - want[k][1])).toBeLessThan(1e-9 * 5e5);
    });
    expect(r.re[0]).toBe(0);
  });
});

describe("stimuli and decimation", () => {
  it("step, pulse and burst start on the first sample at or after `at`", () => {
    const s = stimulusWave({ kind: "step", at: 0.0105, amplitude: 2 }, 1000, 20, 1);
    expect(s[10]).toBe(1);
    expect(s[11]).toBe(3);
    const p = stimulusWave({ kind: "pulse", at: 0.002, width: 0.003, amplitude: 1 }, 1000, 10);
    expect(Array.from(p)).toEqual([0, 0, 1, 1, 1, 0, 0, 0, 0, 0]);
    const b = stimulusWave({ kind: "burst", at: 0, frequency: 250, cycles: 1, amplitude: 1 }, 1000, 8);
    expect(b[1]).toBeCloseTo(1, 12);
    expect(b[3]).toBeCloseTo(-1, 12);
    expect(b[5]).toBe(0);
  });

  it("a logarithmic chirp passes f1 at its start and f2 at its end", () => {
    const fs = 1e6;
    const c = stimulusWave({ kind: "chirp", at: 0, duration: 0.1, f1: 10, f2: 1000, amplitude: 1 }, fs, 100_000);
    // instantaneous frequency from the spacing of zero crossings near each end
    const crossings: number[] = [];
    for (let i = 1; i < c.length; i++) if (c[i - 1] < 0 && c[i] >= 0) crossings.push(i);
    const last = (crossings[crossings.length - 1] - crossings[crossings.length - 2]) / fs;
    expect(1 / last).toBeGreaterThan(950);
    expect(1 / last).toBeLessThan(1000);
    expect(crossings[0] / fs).toBeCloseTo(0.1 * Math.log(1 + Math.log(100) / (10 * 0.1)) / Math.log(100), 4);
  });

  it("refuses more than a million samples", () => {
    expect(() => stimulusWave({ kind: "step", at: 0, amplitude: 1 }, 1, 1_000_001)).toThrow(/samples/);
  });

  it("min/max decimation keeps every extreme of each bucket in time order", () => {
    const v = new Float64Array(10_000).map((_, i) => Math.sin(i / 37));
    v[4321] = 9;
    v[8765] = -9;
    const d = minMaxDecimate(v, 100);
    expect(d.value.length).toBe(200);
    expect(Math.max(...d.value)).toBe(9);
    expect(Math.min(...d.value)).toBe(-9);
    for (let i = 1; i < d.index.length; i++) expect(d.index[i]).toBeGreaterThan(d.index[i - 1]);
    const small = minMaxDecimate(v, 100, 10, 50);
    expect(Array.from(small.index)).toEqual(Array.from({ length: 40 }, (_, i) => 10 + i));
  });
});
