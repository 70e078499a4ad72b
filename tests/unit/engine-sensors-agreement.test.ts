/**
 * Sensor sources and their front-end stages: the fast path (compile-chain.ts with the closed forms of
 * stage-models.ts) against the independent complex.js nodal path (reference-path.ts), on seeded random
 * chains that start at every sensor kind, responses and every noise/DC transfer, to 1e-9.
 */
import Complex from "complex.js";
import { describe, expect, it } from "vitest";
import { compileChain, referenceResponse, referenceTransfer } from "@/lib/engine";
import type { Chain } from "@/lib/chain/types";
import { randomSensorChain } from "./engine-fixtures";

const shuntOf = (ch: Chain) => {
  const src = ch.nodes[0];
  return src.kind === "photodiode" ? src.params.shuntResistance : src.kind === "piezo" ? src.params.leakage : 0;
};
const relErr = (a: Complex, b: Complex) => a.sub(b).abs() / Math.max(b.abs(), 1e-300);
const seeds = Array.from({ length: 30 }, (_, k) => `sensor-${k}`);

describe("sensor chains: fast path against the complex.js path", () => {
  it.each(seeds)("responses of every node agree to 1e-9 (%s)", (seed) => {
    const ch = randomSensorChain(seed, 5);
    const freqs = [0.013, 0.7, 12, 333, 4.1e3, 5.5e4, 7.7e5, 9e6];
    const cc = compileChain(ch);
    const sw = cc.sweep(Float64Array.from(freqs));
    const ref = referenceResponse(ch, freqs);
    let checks = 0;
    cc.nodeIds.forEach((id, i) => {
      const r = ref.get(id)!;
      freqs.forEach((_, k) => {
        const fast = new Complex(sw.cumRe[i][k], sw.cumIm[i][k]);
        expect(relErr(fast, r.cum[k]!), `${id} at ${freqs[k]} Hz`).toBeLessThan(1e-9);
        checks++;
      });
    });
    expect(checks).toBe(cc.nodeIds.length * freqs.length);
  });

  it.each(seeds.slice(0, 16))("transfers of every noise and DC source agree (%s)", (seed) => {
    const ch = randomSensorChain(`t-${seed}`, 4);
    const cc = compileChain(ch);
    const re = new Float64Array(cc.sources.length);
    const im = new Float64Array(cc.sources.length);
    let compared = 0;
    for (const f of [0, 3.3, 2.2e3, 4.4e5]) {
      cc.setFrequency(f);
      const targets: [number, boolean][] = cc.paths.map((p) => [p.end, false]);
      cc.models.forEach((m, i) => m && targets.push([i, true]));
      for (const [node, plus] of targets) {
        cc.transfersTo(node, plus, re, im);
        const isCurrent = (k: number) => cc.sources[k].type === "in+" || cc.sources[k].type === "in-";
        const refs = cc.sources.map((s) => referenceTransfer(ch, s.key, cc.nodeIds[node], plus, f));
        const scale = [1, 1e3];
        refs.forEach((r, k) => r && k > 0 && (scale[+isCurrent(k)] = Math.max(scale[+isCurrent(k)], r.abs())));
        cc.sources.forEach((s, k) => {
          const r = refs[k];
          if (s.type === "drift" || s.type === "cm-error" || !r) return;
          const a = new Complex(re[k], im[k]);
          // the emf of a current or charge source is per ampere or coulomb: its own scale
          // a Johnson voltage e in r beside a Norton source drives e/r into an impedance up to the shunt's:
          // exact zeros come out as rounding of that size
          const sh = shuntOf(ch);
          const johnson = s.resistance ? Math.max(1, sh / s.resistance) : 1;
          const floor = k === 0 ? 1e-14 * r.abs() : 1e-14 * scale[+isCurrent(k)] * johnson;
          expect(a.sub(r).abs(), `${s.key} → ${cc.nodeIds[node]}${plus ? " (+)" : ""} at ${f} Hz`).toBeLessThanOrEqual(1e-9 * r.abs() + floor);
          compared++;
        });
      }
    }
    expect(compared).toBeGreaterThan(20);
  });
});
