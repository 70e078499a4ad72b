import { describe, expect, it } from "vitest";
import { bandGrid, bandMax, bandMaxMany, integrateLog, logGrid } from "@/lib/engine/grids";

describe("logGrid", () => {
  it("has exact ends and a constant ratio", () => {
    const g = logGrid(0.1, 1e6, 600);
    expect(g.length).toBe(600);
    expect(g[0]).toBe(0.1);
    expect(g[599]).toBe(1e6);
    const r = g[1] / g[0];
    for (let i = 1; i < g.length; i++) expect(g[i] / g[i - 1]).toBeCloseTo(r, 12);
  });
});

describe("integrateLog over a band of 300+ decades (found by tests/fuzz: the panel count overflowed)", () => {
  it("integrates a flat density from 0.1 Hz to 1e308 Hz to fb − fa", () => {
    const flat = (freqs: Float64Array, out: Float64Array[]) => out[0].fill(1, 0, freqs.length);
    const [area] = integrateLog(0.1, 1e308, 1, flat, 1e-6);
    // ∫ 1 df = fb − fa, exactly 1e308 to double precision
    expect(area / 1e308).toBeCloseTo(1, 6);
  });
});

describe("bandGrid", () => {
  it("keeps the band limits exactly and is dense", () => {
    const g = bandGrid(1, 200);
    expect(g[0]).toBe(1);
    expect(g[g.length - 1]).toBe(200);
    expect(g.length).toBeGreaterThan(200);
  });
  it("starts at f = 0 when the band reaches DC", () => {
    const g = bandGrid(0, 1000);
    expect(g[0]).toBe(0);
    expect(g[1]).toBeCloseTo(1e-6, 15);
    expect(g[g.length - 1]).toBe(1000);
  });
  it("is a single point for an empty band", () => {
    expect(Array.from(bandGrid(5, 5))).toEqual([5]);
  });
  it("spans a band from a subnormal lower limit without overflowing (found by tests/fuzz)", () => {
    const g = bandGrid(5e-324, 200);
    // log10(200) − log10(5e-324) ≈ 325.6 decades at 96 per decade
    expect(g.length).toBe(Math.ceil((Math.log10(200) - Math.log10(5e-324)) * 96) + 1);
    expect(g[0]).toBe(5e-324);
    expect(g[g.length - 1]).toBe(200);
    // non-decreasing (subnormals are too coarse to step by 10^(1/96) near the bottom), all finite
    expect(g.every((f, i) => Number.isFinite(f) && (i === 0 || f >= g[i - 1]))).toBe(true);
  });
});

describe("bandMax", () => {
  // a resonance |H| = 1/|1 − x² + j·x/Q| with x = f/f0 peaks at x = √(1 − 1/(2Q²)) with value
  // Q/√(1 − 1/(4Q²)) (derived from the second-order magnitude, references.md §6 notation)
  const Q = 3;
  const f0 = 1234.5;
  const h = (f: number) => {
    const x = f / f0;
    return 1 / Math.hypot(1 - x * x, x / Q);
  };
  it("refines a peak between grid points to full precision", () => {
    const g = bandGrid(10, 1e5);
    const peak = bandMax(g, Array.from(g, h), h);
    expect(peak.value / (Q / Math.sqrt(1 - 1 / (4 * Q * Q))) - 1).toBeLessThan(1e-12);
    expect(peak.f / (f0 * Math.sqrt(1 - 1 / (2 * Q * Q)))).toBeCloseTo(1, 5);
  });
  it("returns an edge maximum exactly", () => {
    const g = bandGrid(5000, 1e5);
    const peak = bandMax(g, Array.from(g, h), h);
    expect(peak.f).toBe(5000);
    expect(peak.value).toBe(h(5000));
  });
  it("passes a non-finite sample through", () => {
    const g = bandGrid(0, 10);
    const v = Array.from(g, (f) => 1 / f);
    expect(bandMax(g, v, (f) => 1 / f).value).toBe(Infinity);
  });
});

describe("bandMaxMany", () => {
  // second-order resonances of different Q and centre (same closed form as the bandMax case above)
  const resonance = (Q: number, f0: number) => (f: number) => {
    const x = f / f0;
    return 1 / Math.hypot(1 - x * x, x / Q);
  };
  const fns = [resonance(3, 1234.5), resonance(0.9, 40), resonance(12, 7.7e4), (f: number) => 1 / (1 + f)];
  it("gives bit for bit what each search gives alone, while asking once per step", () => {
    const g = bandGrid(10, 1e5);
    const searches = fns.map((fn) => ({ grid: g, values: Array.from(g, fn) }));
    let calls = 0;
    let points = 0;
    const together = bandMaxMany(searches, (freqs, which, out, count) => {
      calls++;
      points += count;
      for (let c = 0; c < count; c++) out[c] = fns[which[c]](freqs[c]);
    });
    let alone = 0;
    fns.forEach((fn, j) => {
      const single = bandMax(g, searches[j].values, (f) => (alone++, fn(f)));
      expect(together[j]).toEqual(single);
    });
    expect(points).toBe(alone); // the same evaluations, only grouped
    expect(calls).toBeLessThan(points); // and grouped: fewer batches than points
  });
  it("stops a search with a non-finite sample at once and lets the others run", () => {
    const g = bandGrid(0, 10);
    const bad = { grid: g, values: Array.from(g, (f) => 1 / f) };
    const good = { grid: g, values: Array.from(g, (f) => 1 / (1 + (f - 3) ** 2)) };
    const seen = new Set<number>();
    const [a, b] = bandMaxMany([bad, good], (freqs, which, out, count) => {
      for (let c = 0; c < count; c++) {
        seen.add(which[c]);
        out[c] = 1 / (1 + (freqs[c] - 3) ** 2);
      }
    });
    expect(a.value).toBe(Infinity);
    expect([...seen]).toEqual([1]);
    expect(b.value).toBeCloseTo(1, 12);
    expect(b.f).toBeCloseTo(3, 5);
  });
});

describe("integrateLog", () => {
  it("integrates a first-order power response to its closed form", () => {
    // ∫ df/(1 + (f/fc)²) = fc·(atan(b/fc) − atan(a/fc)) (derived from the RC noise integral, references.md §11.2)
    const fc = 1591.5494;
    const [v] = integrateLog(0.1, 1e7, 1, (fs, out) => fs.forEach((f, i) => (out[0][i] = 1 / (1 + (f / fc) ** 2))), 1e-9);
    const exact = fc * (Math.atan(1e7 / fc) - Math.atan(0.1 / fc));
    expect(Math.abs(v / exact - 1)).toBeLessThan(1e-8);
  });
  it("integrates a 1/f corner to k²·(fc·ln(b/a) + b − a)", () => {
    // references.md §11.4: white 10 nV/√Hz, corner 100 Hz, 0.1 Hz to 10 kHz → 1.05599 µV rms
    const [v] = integrateLog(0.1, 1e4, 1, (fs, out) => fs.forEach((f, i) => (out[0][i] = 1e-16 * (1 + 100 / f))), 1e-9);
    expect(Math.sqrt(v)).toBeCloseTo(1.05599e-6, 10);
    expect(v / (1e-16 * (100 * Math.log(1e5) + 1e4 - 0.1)) - 1).toBeLessThan(1e-9);
  });
  it("resolves a narrow resonance (Q = 20)", () => {
    // second-order low-pass: NEB = (π/2)·Q·f0 over 0…∞ (references.md §11.3), with f0 = 1 kHz
    const Q = 20;
    const f0 = 1000;
    const [v] = integrateLog(1e-3, 1e10, 1, (fs, out) =>
      fs.forEach((f, i) => {
        const x = f / f0;
        out[0][i] = 1 / ((1 - x * x) ** 2 + (x / Q) ** 2);
      }), 1e-9);
    expect(Math.abs(v / ((Math.PI / 2) * Q * f0) - 1)).toBeLessThan(1e-6);
  });
  it("returns zeros for an empty band", () => {
    expect(Array.from(integrateLog(10, 10, 2, () => {}, 1e-6))).toEqual([0, 0]);
  });
});
