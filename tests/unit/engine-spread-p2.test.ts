/**
 * The spread's envelope quantiles (P2Quantiles, lib/engine/spread.ts) against the P² algorithm written out
 * one estimator at a time, as Jain and Chlamtac give it (Communications of the ACM 28(10), 1985; from
 * memory): five markers with heights q, positions n and desired positions n′ = n′ + dn per observation.
 * The class keeps n′ once per count for all points and adds a whole curve at a time (`addAll`); that must
 * change nothing, bit for bit, also when points skip non-finite values and so have different counts.
 */
import { describe, expect, it } from "vitest";
import { mulberry32, P2Quantiles } from "@/lib/engine/spread";

/** One P² estimator of quantile p, straight from the algorithm's steps. */
function plainP2(p: number) {
  const q: number[] = [];
  const n = [0, 1, 2, 3, 4];
  const np = [0, 2 * p, 4 * p, 2 + 2 * p, 4];
  const dn = [0, p / 2, p, (1 + p) / 2, 1];
  return {
    add(x: number) {
      if (!Number.isFinite(x)) return;
      if (q.length < 5) {
        q.push(x);
        q.sort((a, b) => a - b);
        return;
      }
      // B1: the cell of x, extremes replaced
      let k: number;
      if (x < q[0]) {
        q[0] = x;
        k = 0;
      } else if (x >= q[4]) {
        q[4] = x;
        k = 3;
      } else {
        k = 0;
        while (x >= q[k + 1]) k++;
      }
      // B2: positions above the cell, desired positions
      for (let i = k + 1; i < 5; i++) n[i] += 1;
      for (let i = 0; i < 5; i++) np[i] += dn[i];
      // B3: adjust the three middle markers, parabolic prediction or else linear
      for (let i = 1; i <= 3; i++) {
        const d = np[i] - n[i];
        if ((d >= 1 && n[i + 1] - n[i] > 1) || (d <= -1 && n[i - 1] - n[i] < -1)) {
          const s = d > 0 ? 1 : -1;
          const para = q[i] + (s / (n[i + 1] - n[i - 1])) * ((n[i] - n[i - 1] + s) * ((q[i + 1] - q[i]) / (n[i + 1] - n[i])) + (n[i + 1] - n[i] - s) * ((q[i] - q[i - 1]) / (n[i] - n[i - 1])));
          q[i] = q[i - 1] < para && para < q[i + 1] ? para : q[i] + (s * (q[i + s] - q[i])) / (n[i + s] - n[i]);
          n[i] += s;
        }
      }
    },
    value(): number {
      if (!q.length) return NaN;
      if (q.length < 5) return q[Math.min(q.length - 1, Math.round(p * (q.length - 1)))];
      return q[2];
    },
  };
}

describe("P2Quantiles", () => {
  it("gives what one plain P² estimator per point gives, bit for bit, curve by curve or value by value", () => {
    const G = 40;
    const rng = mulberry32(2024);
    for (const p of [0.05, 0.5, 0.95]) {
      const byCurve = new P2Quantiles(p, G);
      const byValue = new P2Quantiles(p, G);
      const plain = Array.from({ length: G }, () => plainP2(p));
      // 300 observations: past the first table size (64 counts), with a few non-finite values so that
      // points reach different counts; skewed and heavy-tailed values so the markers move both ways
      for (let t = 0; t < 300; t++) {
        const curve = Float64Array.from({ length: G }, (_, j) => {
          const u = rng();
          if (u < 0.03) return j % 2 ? NaN : Infinity;
          return j * 0.1 + Math.tan(Math.PI * (rng() - 0.5)) * (1 + (j % 3));
        });
        byCurve.addAll(curve);
        curve.forEach((x, j) => {
          byValue.add(j, x);
          plain[j].add(x);
        });
        if (t === 3 || t === 4 || t === 70 || t === 299)
          for (let j = 0; j < G; j++) {
            expect(byCurve.value(j)).toBe(plain[j].value());
            expect(byValue.value(j)).toBe(plain[j].value());
          }
      }
    }
  });

  it("follows a known quantile: the 95 % point of uniform draws on [0, 1)", () => {
    // P² converges to the true quantile (0.95 here) as observations accumulate; 20,000 draws put it
    // within 0.01 (a loose bound: the sample quantile's own standard error is about 0.0015)
    const est = new P2Quantiles(0.95, 1);
    const rng = mulberry32(5);
    const xs = new Float64Array(1);
    for (let t = 0; t < 20_000; t++) {
      xs[0] = rng();
      est.addAll(xs);
    }
    expect(Math.abs(est.value(0) - 0.95)).toBeLessThan(0.01);
  });
});
