/**
 * compileChain: the fast path against closed forms (references.md values, each cited beside its check)
 * and against the independent complex.js nodal path on seeded random chains.
 */
import Complex from "complex.js";
import { describe, expect, it } from "vitest";
import { compileChain, referenceResponse, referenceTransfer } from "@/lib/engine";
import type { Chain, ChainNode, Part } from "@/lib/chain/types";
import seedrandom from "seedrandom";
import { adc, chainOf, line, randomChain, randomSensorChain, rails, source } from "./engine-fixtures";

const TAU = 2 * Math.PI;

/** Cumulative response of node `id` at the given frequencies as {db, deg, c}. */
function respond(chain: Chain, id: string, freqs: number[]) {
  const cc = compileChain(chain);
  const i = cc.nodeIds.indexOf(id);
  const sw = cc.sweep(Float64Array.from(freqs));
  return freqs.map((_, k) => {
    const c = new Complex(sw.cumRe[i][k], sw.cumIm[i][k]);
    return { c, db: 20 * Math.log10(c.abs()), deg: (c.arg() * 180) / Math.PI };
  });
}

/** Phase difference modulo 360°, in (−180, 180]. */
const dphase = (a: number, b: number) => {
  const d = (((a - b) % 360) + 540) % 360 - 180;
  return d === -180 ? 180 : d;
};

const op = (id: string, kind: string, params: Record<string, number | null>, part?: string): ChainNode =>
  ({ id, kind, params: { vref: 0, ...params }, rails: rails(), part: part ?? null }) as ChainNode;

const parts: Record<string, Part> = {
  a5g1: { aol: 1e5, gbw: 1e6 },
  a5g10: { aol: 1e5, gbw: 1e7 },
  a3: { aol: 1e3 },
  a5: { aol: 1e5 },
};

describe("compileChain", () => {
  describe("stage kinds against their closed forms", () => {
    it("rcLowpass, unloaded (references.md §2, R = 10 kΩ, C = 10 nF)", () => {
      const ch = line([source(), { id: "lp", kind: "rcLowpass", params: { r: 1e4, c: 1e-8 } }]);
      const rows: [number, number, number][] = [
        [159.15494309, -0.0432137, -5.7105931],
        [1591.5494309, -3.0102999566, -45],
        [15915.494309, -20.0432137, -84.2894069],
        [1000, -1.4450701, -32.1419076],
        [1e5, -35.9646973, -89.0881863],
      ];
      const r = respond(ch, "lp", rows.map((x) => x[0]));
      rows.forEach(([, db, deg], k) => {
        expect(r[k].db).toBeCloseTo(db, 6);
        expect(dphase(r[k].deg, deg)).toBeCloseTo(0, 6);
      });
    });

    it("rcHighpass, unloaded (references.md §2, R = 100 kΩ, C = 1 µF)", () => {
      const ch = line([source(), { id: "hp", kind: "rcHighpass", params: { r: 1e5, c: 1e-6, vbias: 2.5 } }]);
      const rows: [number, number, number][] = [
        [0.159155, -20.0432137, 84.2894069],
        [15.9155, -0.0432137, 5.7105931],
        [50, -0.0043981, 1.8231657],
        [0.5, -10.4657782, 72.5594055],
      ];
      const r = respond(ch, "hp", rows.map((x) => x[0]));
      rows.forEach(([, db, deg], k) => {
        expect(r[k].db).toBeCloseTo(db, 5);
        expect(dphase(r[k].deg, deg)).toBeCloseTo(0, 4);
      });
    });

    it("inverting and non-inverting stages, ideal: −r2/r1 and 1 + rf/rg (references.md §3)", () => {
      const inv = respond(line([source(), op("u", "inverting", { r1: 1e3, r2: 99e3 })]), "u", [10, 1e5]);
      for (const x of inv) {
        expect(x.c.re).toBeCloseTo(-99, 12);
        expect(x.c.im).toBeCloseTo(0, 12);
      }
      const non = respond(line([source(), op("u", "noninverting", { rf: 99e3, rg: 1e3 })]), "u", [10, 1e5]);
      for (const x of non) expect(x.c.re).toBeCloseTo(100, 12);
      const fol = respond(line([source(), op("u", "noninverting", { rf: 1e4, rg: null })]), "u", [10]);
      expect(fol[0].c.re).toBe(1);
    });

    it("finite aol: DC gains of Sedra & Smith Eq. (2.5) (references.md §4, [MEMORY] for the book)", () => {
      // inverting R2/R1 = 100: A = 1e3 → −90.8265; A = 1e5 → −99.8991 (derived from Eq. (2.5))
      const g3 = respond(line([source(), op("u", "inverting", { r1: 1e3, r2: 1e5 }, "a3")], parts), "u", [1]);
      expect(g3[0].c.re).toBeCloseTo(-90.8265, 4);
      const g5 = respond(line([source(), op("u", "inverting", { r1: 1e3, r2: 1e5 }, "a5")], parts), "u", [1]);
      expect(g5[0].c.re).toBeCloseTo(-99.8991, 4);
      // non-inverting β = 0.01, A0 = 1e5 → 99.90010 (derived from A0/(1 + A0β))
      const nn = respond(line([source(), op("u", "noninverting", { rf: 99e3, rg: 1e3 }, "a5")], parts), "u", [1]);
      expect(nn[0].c.re).toBeCloseTo(99.9001, 4);
    });

    it("finite GBW shapes gain stages as the single-pole closed loop (references.md §4, A0 = 1e5, GBW = 1 MHz)", () => {
      const g100 = respond(line([source(), op("u", "noninverting", { rf: 99e3, rg: 1e3 }, "a5g1")], parts), "u", [1000, 10010, 1e5]);
      expect(g100[0].c.abs()).toBeCloseTo(99.4053, 4);
      expect(g100[0].db).toBeCloseTo(39.94819, 5);
      expect(dphase(g100[0].deg, -5.70493)).toBeCloseTo(0, 4);
      expect(g100[1].c.abs()).toBeCloseTo(70.64004, 3);
      expect(g100[2].c.abs()).toBeCloseTo(9.950273, 5);
      expect(dphase(g100[2].deg, -84.28373)).toBeCloseTo(0, 4);
      const fol = respond(line([source(), op("u", "noninverting", { rf: null, rg: null }, "a5g1")], parts), "u", [1e5]);
      expect(fol[0].db).toBeCloseTo(-0.0432997, 6);
      expect(dphase(fol[0].deg, -5.710536)).toBeCloseTo(0, 5);
      const inv1 = respond(line([source(), op("u", "inverting", { r1: 1e4, r2: 1e4 }, "a5g1")], parts), "u", [1000]);
      expect(inv1[0].db).toBeCloseTo(-0.000191, 6);
      expect(dphase(inv1[0].deg, 179.8854)).toBeCloseTo(0, 3);
      const g11 = respond(line([source(), op("u", "noninverting", { rf: 1e4, rg: 1e3 }, "a5g1")], parts), "u", [1e-3, 1e5]);
      expect(g11[0].c.re).toBeCloseTo(10.99879, 5);
      expect(g11[1].db).toBeCloseTo(17.3835, 4);
      expect(dphase(g11[1].deg, -47.72317)).toBeCloseTo(0, 4);
    });

    it("lossy integrator (references.md §5: R1 = 10 kΩ, R2 = 100 kΩ, C2 = 10 nF)", () => {
      const ch = line([source(), op("u", "lossyIntegrator", { r1: 1e4, r2: 1e5, c2: 1e-8 })]);
      const rows: [number, number, number][] = [
        [1, 19.99983, 179.64],
        [159.15494, 16.9897, 135],
        [1000, 3.92776, 99.04306],
        [1591.5494, -0.0432137, 95.71059],
        [1e4, -15.9647, 90.91181],
      ];
      const r = respond(ch, "u", rows.map((x) => x[0]));
      rows.forEach(([, db, deg], k) => {
        expect(r[k].db).toBeCloseTo(db, 4);
        expect(dphase(r[k].deg, deg)).toBeCloseTo(0, 3);
      });
    });

    it("integrator: −1/(s·r1·c2) (chain-format.md table), and a flagged pole at f = 0", () => {
      const ch = line([source(), op("u", "integrator", { r1: 1e4, c2: 1e-8 })]);
      const cc = compileChain(ch);
      const sw = cc.sweep(Float64Array.of(0, 100, 1e4));
      for (const k of [1, 2]) {
        const f = sw.freqs[k];
        expect(sw.cumRe[1][k]).toBeCloseTo(0, 12);
        expect(sw.cumIm[1][k] / (1 / (TAU * f * 1e4 * 1e-8)) - 1).toBeLessThan(1e-13);
      }
      expect(Array.from(sw.pole)).toEqual([1, 0, 0]);
    });

    it("unity-gain Sallen-Key, ideal and GBW = 1 MHz (references.md §6(a), (c))", () => {
      const f0 = 1125.3954;
      const ideal = line([source(), op("u", "sallenKeyLowpass", { r1: 1e4, r2: 1e4, c1: 20e-9, c2: 10e-9 })]);
      const finite = line([source(), op("u", "sallenKeyLowpass", { r1: 1e4, r2: 1e4, c1: 20e-9, c2: 10e-9 }, "a5g1")], parts);
      const fs = [112.54, f0, 2 * f0, 10 * f0];
      const ri = respond(ideal, "u", fs);
      const rf = respond(finite, "u", fs);
      const idealRows = [[-0.00043, -8.1297], [-3.0103, -90], [-12.30449, -136.6861], [-40.00043, -171.8703]];
      const gbwRows = [[-0.00039, -8.1364], [-3.0105, -90.129], [-12.31442, -136.8753], [-40.01477, -172.5269]];
      idealRows.forEach(([db, deg], k) => {
        expect(ri[k].db).toBeCloseTo(db, 4);
        expect(dphase(ri[k].deg, deg)).toBeCloseTo(0, 3);
      });
      gbwRows.forEach(([db, deg], k) => {
        expect(rf[k].db).toBeCloseTo(db, 4);
        expect(dphase(rf[k].deg, deg)).toBeCloseTo(0, 3);
      });
      // equal components: Q = 0.5, |H(f0)| = Q = −6.02060 dB (references.md §6(c))
      const eq = respond(line([source(), op("u", "sallenKeyLowpass", { r1: 1e4, r2: 1e4, c1: 1e-8, c2: 1e-8 })]), "u", [1591.5494]);
      expect(eq[0].db).toBeCloseTo(-6.0206, 4);
    });

    it("MFB low-pass, ideal and GBW = 1 MHz (references.md §7(a), (c))", () => {
      const f0 = 750.2636;
      const p = { r1: 1e4, r2: 1e4, r3: 1e4, c1: 45e-9, c2: 10e-9 };
      const ri = respond(line([source(), op("u", "mfbLowpass", p)]), "u", [1, f0, 2 * f0, 10 * f0]);
      [[0, 179.892], [-3.0103, 90], [-12.30449, 43.3139], [-40.00043, 8.1297]].forEach(([db, deg], k) => {
        expect(ri[k].db).toBeCloseTo(db, 4);
        expect(dphase(ri[k].deg, deg)).toBeCloseTo(0, 3);
      });
      const rf = respond(line([source(), op("u", "mfbLowpass", p, "a5g1")], parts), "u", [f0, 10 * f0]);
      expect(rf[0].db).toBeCloseTo(-3.01514, 4);
      expect(dphase(rf[0].deg, 89.893)).toBeCloseTo(0, 3);
      expect(rf[1].db).toBeCloseTo(-40.01454, 4);
      expect(dphase(rf[1].deg, 7.692)).toBeCloseTo(0, 3);
      const c = { r1: 1e3, r2: 1e4, r3: 1e4, c1: 100e-9, c2: 2.2e-9 };
      const fc = 1073.02241;
      const rc = respond(line([source(), op("u", "mfbLowpass", c)]), "u", [fc, 10 * fc]);
      const rcf = respond(line([source(), op("u", "mfbLowpass", c, "a5g1")], parts), "u", [fc, 10 * fc]);
      expect(rc[0].db).toBeCloseTo(14.99215, 4);
      expect(rc[1].db).toBeCloseTo(-20.05086, 4);
      expect(dphase(rc[1].deg, 10.1921)).toBeCloseTo(0, 3);
      expect(rcf[0].db).toBeCloseTo(14.93942, 4);
      expect(dphase(rcf[0].deg, 89.7106)).toBeCloseTo(0, 3);
      expect(rcf[1].db).toBeCloseTo(-20.11436, 4);
    });

    it("cascade of AC coupling, gain 11 and Sallen-Key (references.md §8)", () => {
      const build = (part?: string) =>
        line(
          [
            source(),
            { id: "hp", kind: "rcHighpass", params: { r: 1e5, c: 1e-6, vbias: 0 } },
            op("g", "noninverting", { rf: 1e4, rg: 1e3 }, part),
            op("sk", "sallenKeyLowpass", { r1: 1e4, r2: 1e4, c1: 20e-9, c2: 10e-9 }),
            adc("adc", { vinLow: -2.5, vinHigh: 2.5 }),
          ],
          parts,
        );
      const rows: [number, number, number, number | null, number | null][] = [
        [0.5, 10.3621, 72.523, 10.3611, 72.523],
        [1.59155, 17.8176, 44.885, 17.8166, null],
        [10, 20.7192, 8.323, 20.7183, null],
        [100, 20.8265, -6.307, 20.8255, -6.313],
        [1000, 18.7235, -80.402, 18.7226, -80.465],
        [1125.395, 17.8175, -89.919, 17.8166, -89.99],
        [5000, -5.0899, -161.446, -5.091, -161.761],
      ];
      const ideal = respond(build(), "adc", rows.map((r) => r[0]));
      const finite = respond(build("a5g10"), "adc", rows.map((r) => r[0]));
      rows.forEach(([, db, deg, fdb, fdeg], k) => {
        expect(Math.abs(ideal[k].db - db)).toBeLessThan(6e-5);
        expect(Math.abs(dphase(ideal[k].deg, deg))).toBeLessThan(6e-4);
        expect(Math.abs(finite[k].db - (fdb as number))).toBeLessThan(6e-5);
        if (fdeg !== null) expect(Math.abs(dphase(finite[k].deg, fdeg))).toBeLessThan(6e-4);
      });
    });
  });

  describe("loading", () => {
    it("two equal RC sections in a row give 1/(1 + 3sRC + (sRC)²) (chain-format.md)", () => {
      const R = 4.7e3;
      const C = 33e-9;
      const ch = line([
        source(),
        { id: "a", kind: "rcLowpass", params: { r: R, c: C } },
        { id: "b", kind: "rcLowpass", params: { r: R, c: C } },
      ]);
      const fs = [10, 300, 1026, 5000, 1e5];
      const r = respond(ch, "b", fs);
      fs.forEach((f, k) => {
        const x = new Complex(0, TAU * f * R * C);
        const h = new Complex(1, 0).div(x.mul(x).add(x.mul(3)).add(1));
        expect(r[k].c.sub(h).abs() / h.abs()).toBeLessThan(1e-13);
      });
      // and not the square of one section
      const single = new Complex(1, 0).div(new Complex(1, TAU * 1026 * R * C));
      expect(Math.abs(r[2].c.abs() - single.mul(single).abs())).toBeGreaterThan(0.05);
    });

    it("an RC section is loaded by an inverting stage's r1 to the virtual earth, exactly with finite aol", () => {
      // derived by nodal analysis: T = 1/(1 + sRC + R/Zin), Zin = r1 + r2/(1 + A)
      const R = 1e4;
      const C = 1e-8;
      const r1 = 2e4;
      const r2 = 1e5;
      for (const part of [undefined, "a3"]) {
        const ch = line([source(), { id: "lp", kind: "rcLowpass", params: { r: R, c: C } }, op("u", "inverting", { r1, r2 }, part)], parts);
        const A = part ? 1e3 : Infinity;
        const zin = r1 + r2 / (1 + A);
        const fs = [1, 1591.5, 2e4];
        const r = respond(ch, "lp", fs);
        fs.forEach((f, k) => {
          const t = new Complex(1, 0).div(new Complex(1 + R / zin, TAU * f * R * C));
          expect(r[k].c.sub(t).abs() / t.abs()).toBeLessThan(1e-13);
        });
      }
    });

    it("the source resistance sees every node it feeds in parallel (fan-out to two ADCs)", () => {
      const rs = 1e3;
      const ch = chainOf(
        [source("src", { resistance: rs }), adc("a1", { inputResistance: 1e4 }), adc("a2", { inputResistance: 4e3 })],
        [
          { from: "src", to: "a1" },
          { from: "src", to: "a2" },
        ],
      );
      const rp = (1e4 * 4e3) / (1e4 + 4e3);
      for (const id of ["a1", "a2"]) expect(respond(ch, id, [50])[0].c.re).toBeCloseTo(rp / (rp + rs), 14);
      expect(compileChain(ch).paths.map((p) => p.nodes)).toEqual([
        ["src", "a1"],
        ["src", "a2"],
      ]);
    });

    it("an op-amp output isolates what follows", () => {
      const base = [source("src", { resistance: 600 }), op("u", "noninverting", { rf: null, rg: null })];
      const light = respond(line([...base, adc("a", { inputResistance: null })]), "a", [100])[0].c;
      const heavy = respond(line([...base, adc("a", { inputResistance: 10 })]), "a", [100])[0].c;
      expect(light.re).toBe(1);
      expect(heavy.re).toBe(1);
    });
  });

  describe("agreement with the complex.js path (seeded random chains)", () => {
    const seeds = Array.from({ length: 24 }, (_, k) => `chain-${k}`);
    const relErr = (a: Complex, b: Complex) => a.sub(b).abs() / Math.max(b.abs(), 1e-300);

    it.each(seeds)("responses of every node agree to 1e-9 (%s)", (seed) => {
      const ch = randomChain(seed, 8, { integrators: true });
      const freqs = [0.013, 0.7, 12, 333, 4.1e3, 5.5e4, 7.7e5, 9e6];
      const cc = compileChain(ch);
      const sw = cc.sweep(Float64Array.from(freqs));
      const ref = referenceResponse(ch, freqs);
      let checks = 0;
      cc.nodeIds.forEach((id, i) => {
        const r = ref.get(id)!;
        freqs.forEach((_, k) => {
          const fastCum = new Complex(sw.cumRe[i][k], sw.cumIm[i][k]);
          expect(relErr(fastCum, r.cum[k]!)).toBeLessThan(1e-9);
          const ri = r.ind[k];
          if (ri) expect(relErr(new Complex(sw.indRe[i][k], sw.indIm[i][k]), ri)).toBeLessThan(1e-9);
          checks++;
        });
      });
      expect(checks).toBe(cc.nodeIds.length * freqs.length);
    });

    it.each(seeds.slice(0, 12))("transfers of every noise and DC source to every path end agree (%s)", (seed) => {
      const ch = randomChain(`t-${seed}`, 6);
      const cc = compileChain(ch);
      const re = new Float64Array(cc.sources.length);
      const im = new Float64Array(cc.sources.length);
      for (const f of [0, 3.3, 2.2e3, 4.4e5]) {
        cc.setFrequency(f);
        const targets: [number, boolean][] = cc.paths.map((p) => [p.end, false]);
        cc.models.forEach((m, i) => m && targets.push([i, true]));
        for (const [node, plus] of targets) {
          cc.transfersTo(node, plus, re, im);
          // exact zeros come out of the nodal solve as rounding noise, so the floor is relative to the
          // largest transfer of the same unit (V/V for voltages, V/A for pin currents; at least 1 kΩ).
          // 1e-12 of it: the elimination's rounding grows with the network's conditioning (seen: 1.5e-13
          // where the fast path gives the exact 0 of an en that draws no input current)
          const isCurrent = (k: number) => cc.sources[k].type === "in+" || cc.sources[k].type === "in-";
          const refs = cc.sources.map((s) => referenceTransfer(ch, s.key, cc.nodeIds[node], plus, f));
          const scale = [1, 1e3];
          refs.forEach((r, k) => r && (scale[+isCurrent(k)] = Math.max(scale[+isCurrent(k)], r.abs())));
          cc.sources.forEach((s, k) => {
            const r = refs[k];
            if (s.type === "drift" || !r) return;
            const a = new Complex(re[k], im[k]);
            expect(a.sub(r).abs()).toBeLessThanOrEqual(1e-9 * r.abs() + 1e-12 * scale[+isCurrent(k)]);
          });
        }
      }
    });

    it("the emf transfer is the swept response", () => {
      const ch = randomChain("emf", 8);
      const cc = compileChain(ch);
      const sw = cc.sweep(Float64Array.of(777));
      const re = new Float64Array(cc.sources.length);
      const im = new Float64Array(cc.sources.length);
      cc.setFrequency(777);
      for (let i = 0; i < cc.nodeIds.length; i++) {
        cc.transfersTo(i, false, re, im);
        expect(re[0]).toBeCloseTo(sw.cumRe[i][0], 12);
        expect(im[0]).toBeCloseTo(sw.cumIm[i][0], 12);
      }
    });
  });

  // filters: every new filter section (and the Sallen-Key gain network) under every open-loop form,
  // driven through a source resistance and an RC section (so its input admittance matters) and loading
  // one (so its output drives a net), against the complex.js path: responses and every source's transfer.
  describe("filter sections against the complex.js path, every open-loop form", () => {
    const relErr = (a: Complex, b: Complex) => a.sub(b).abs() / Math.max(b.abs(), 1e-300);
    const forms = [null, "both", "gbwOnly", "aolOnly", "fast"];
    const variants: [string, Record<string, number | null>][] = [
      ["sallenKeyLowpass", { r1: 12e3, r2: 33e3, c1: 4.7e-9, c2: 2.2e-9, rf: 15e3, rg: 22e3 }],
      ["sallenKeyLowpass", { r1: 12e3, r2: 33e3, c1: 4.7e-9, c2: 2.2e-9, rf: 15e3, rg: null }],
      ["sallenKeyHighpass", { c1: 4.7e-9, c2: 10e-9, r1: 12e3, r2: 33e3, rf: null, rg: null }],
      ["sallenKeyHighpass", { c1: 4.7e-9, c2: 10e-9, r1: 12e3, r2: 33e3, rf: 15e3, rg: null }],
      ["sallenKeyHighpass", { c1: 4.7e-9, c2: 10e-9, r1: 12e3, r2: 33e3, rf: 5.6e3, rg: 10e3 }],
      ["mfbHighpass", { c1: 22e-9, c2: 10e-9, c3: 4.7e-9, r1: 3.3e3, r2: 47e3 }],
    ];
    const cases = variants.flatMap(([kind, p]) => forms.map((part) => [kind, p, part] as const));
    const partsAll: Record<string, Part> = { both: { gbw: 1e6, aol: 1e5 }, gbwOnly: { gbw: 3e6 }, aolOnly: { aol: 2e4 }, fast: { gbw: 5e7, aol: 1e6 } };
    it.each(cases)("%s %j with part %s", (kind, p, part) => {
      const ch = line(
        [
          source("src", { resistance: 1.5e3 }),
          { id: "rc", kind: "rcLowpass", params: { r: 2.2e3, c: 1e-10 } },
          { ...op("f", kind, p), part } as ChainNode,
          { id: "out", kind: "rcLowpass", params: { r: 1e3, c: 1e-8 } },
          adc("adc", { inputResistance: 5e4 }),
        ],
        partsAll,
      );
      const freqs = [0.02, 15, 900, 2.5e3, 4e4, 7e5, 8e6];
      const cc = compileChain(ch);
      const sw = cc.sweep(Float64Array.from(freqs));
      const ref = referenceResponse(ch, freqs);
      cc.nodeIds.forEach((id, i) =>
        freqs.forEach((_, k) => expect(relErr(new Complex(sw.cumRe[i][k], sw.cumIm[i][k]), ref.get(id)!.cum[k]!)).toBeLessThan(1e-9)),
      );
      const re = new Float64Array(cc.sources.length);
      const im = new Float64Array(cc.sources.length);
      const fi = cc.nodeIds.indexOf("f");
      for (const f of [0, 7, 1.1e3, 3e5]) {
        cc.setFrequency(f);
        for (const [node, plus] of [[cc.nodeIds.indexOf("adc"), false], [fi, false], [fi, true]] as [number, boolean][]) {
          cc.transfersTo(node, plus, re, im);
          cc.sources.forEach((s, k) => {
            const r = referenceTransfer(ch, s.key, cc.nodeIds[node], plus, f)!;
            const isCurrent = s.type === "in+" || s.type === "in-";
            expect(new Complex(re[k], im[k]).sub(r).abs()).toBeLessThanOrEqual(1e-9 * r.abs() + (isCurrent ? 1e-9 : 1e-12));
          });
        }
      }
      // the stage lists its gain-network resistors exactly when they are given
      const own = cc.sources.filter((s) => s.nodeId === "f").map((s) => s.element);
      expect(own.includes("rf")).toBe(p.rf != null);
      expect(own.includes("rg")).toBe(p.rg != null);
      expect(own.includes("in-")).toBe(kind === "mfbHighpass" || p.rf != null);
    });
  });

  describe("retune", () => {
    it("gives exactly what a fresh compile of the new values gives", () => {
      const a = randomChain("retune", 8);
      const b: Chain = {
        ...a,
        nodes: a.nodes.map((n) =>
          n.kind === "source" || n.kind === "adc"
            ? n
            : ({ ...n, params: Object.fromEntries(Object.entries(n.params).map(([k, v]) => [k, typeof v === "number" && k !== "vref" && k !== "vbias" ? v * 1.03 : v])) } as ChainNode),
        ),
      };
      const freqs = Float64Array.of(1, 100, 1e4, 1e6);
      const cc = compileChain(a);
      const before = cc.sweep(freqs).cumRe.map((x) => Array.from(x));
      cc.retune(b);
      const after = cc.sweep(freqs);
      const fresh = compileChain(b).sweep(freqs);
      after.cumRe.forEach((x, i) => expect(Array.from(x)).toEqual(Array.from(fresh.cumRe[i])));
      expect(after.cumRe.map((x) => Array.from(x))).not.toEqual(before);
      expect(cc.chain).toBe(b);
    });

    it("with reuse, builds into the same buffers and gives exactly what a fresh retune gives", () => {
      // the reusing path (RetuneOptions.reuse, PolyPool) must change allocations only: every sweep array,
      // every closed-form coefficient and every transfer bit for bit as the fresh path, over several draws
      const chains = [
        randomChain("reuse-a", 8, { integrators: true }),
        randomChain("reuse-b", 9),
        randomChain("reuse-c", 6),
        randomSensorChain("reuse-d", 6),
        randomSensorChain("reuse-e", 5),
      ];
      const freqs = Float64Array.of(0, 0.3, 10, 2e3, 1e5, 3e6);
      const polysOf = (cc: ReturnType<typeof compileChain>) =>
        cc.models.flatMap((m) => (m ? [m.den, m.vin.vo, m.vin.iin, m.vin.p, ...m.sources.flatMap((x) => [x.vo, x.iin, x.p])].map((p) => Array.from(p)) : []));
      const transfers = (cc: ReturnType<typeof compileChain>) => {
        const re = new Float64Array(cc.sources.length);
        const im = new Float64Array(cc.sources.length);
        const out: number[] = [];
        for (const f of [0, 50, 5e4]) {
          cc.setFrequency(f);
          cc.nodeIds.forEach((_, i) => {
            cc.transfersTo(i, false, re, im);
            out.push(...re, ...im);
            if (cc.models[i]) {
              cc.transfersTo(i, true, re, im);
              out.push(...re, ...im);
            }
          });
        }
        return out;
      };
      const sweepOf = (cc: ReturnType<typeof compileChain>) => {
        const sw = cc.sweep(freqs);
        return [sw.cumRe, sw.cumIm, sw.indRe, sw.indIm, sw.yRe, sw.yIm].flatMap((xs) => xs.map((x) => Array.from(x))).concat([Array.from(sw.pole)]);
      };
      let draws = 0;
      chains.forEach((base, c) => {
        const reused = compileChain(base);
        const fresh = compileChain(base);
        const rng = seedrandom(`reuse-draws-${c}`);
        let den: Float64Array[] | null = null;
        for (let d = 0; d < 4; d++) {
          const draw: Chain = {
            ...base,
            nodes: base.nodes.map((n) =>
              n.kind === "source" || n.kind === "adc"
                ? n
                : ({ ...n, params: Object.fromEntries(Object.entries(n.params).map(([k, v]) => [k, typeof v === "number" && v > 0 && k !== "vref" && k !== "vbias" ? v * (0.9 + 0.2 * rng()) : v])) } as ChainNode),
            ),
          };
          reused.retune(draw, { reuse: true });
          fresh.retune(draw);
          expect(polysOf(reused)).toEqual(polysOf(fresh));
          expect(sweepOf(reused)).toEqual(sweepOf(fresh));
          expect(transfers(reused)).toEqual(transfers(fresh));
          expect(reused.sources.map((x) => x.resistance)).toEqual(fresh.sources.map((x) => x.resistance));
          // from the second reusing retune on, the models sit in the buffers of the one before
          const now = reused.models.flatMap((m) => (m ? [m.den] : []));
          if (den) now.forEach((x, i) => expect(x).toBe(den![i]));
          den = now;
          draws++;
        }
      });
      expect(draws).toBe(20);
    });

    it("a sweep without the admittances nobody reads gives the same responses, bit for bit", () => {
      // SweepOptions.admittances = false (the spread): each stage's admittance only where a passive
      // section is loaded by it; every response and pole flag as the full sweep, on chains with fan-out,
      // sections between stages and sensor fronts
      const chains = [randomChain("loads-a", 9, { integrators: true }), randomChain("loads-b", 8), randomChain("loads-c", 7), randomSensorChain("loads-d", 6), randomSensorChain("loads-e", 6)];
      const freqs = Float64Array.of(0, 0.5, 20, 3e3, 2e5, 5e6);
      let sectionLoads = 0;
      for (const ch of chains) {
        const cc = compileChain(ch);
        const full = cc.sweep(freqs);
        const lean = compileChain(ch).sweep(freqs, undefined, { admittances: false });
        for (const key of ["cumRe", "cumIm", "indRe", "indIm"] as const) lean[key].forEach((x, i) => expect(Array.from(x), `${key} ${cc.nodeIds[i]}`).toEqual(Array.from(full[key][i])));
        expect(Array.from(lean.pole)).toEqual(Array.from(full.pole));
        // the admittances a section sees are there too
        cc.nodeIds.forEach((_, i) => {
          const p = cc.topology.parent[i];
          if (i > 0 && ["rcLowpass", "rcHighpass"].includes(cc.kinds[p]) && cc.models[i]) {
            sectionLoads++;
            expect(Array.from(lean.yRe[i])).toEqual(Array.from(full.yRe[i]));
            expect(Array.from(lean.yIm[i])).toEqual(Array.from(full.yIm[i]));
          }
        });
      }
      expect(sectionLoads).toBeGreaterThan(2);
    });

    it("refuses a chain of another shape", () => {
      const a = randomChain("shape", 5);
      const cc = compileChain(a);
      expect(() => cc.retune({ ...a, nodes: a.nodes.slice(0, -1), edges: a.edges.slice(0, -1) })).toThrow(/retune/);
      const other = randomChain("shape-2", 5);
      expect(() => cc.retune(other)).toThrow(/retune/);
    });
  });
});
