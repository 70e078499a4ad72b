/**
 * Item 6: a multi-stage chain driven by a sine to steady state with the odex ODE
 * solver (references.md §16), compared with the engine's |H| and phase. The state
 * equations are written by hand from Kirchhoff's laws for this one chain, so they
 * share nothing with either the engine or the nodal reference:
 *
 *   source EMF u(t) behind Rs → unity-gain Sallen-Key (ideal op-amp; r1 input→A,
 *   r2 A→(+), c1 A→out, c2 (+)→ground, out = (+)) → RC section (ra, ca) → RC
 *   section (rb, cb) → ADC pin loaded by Rin.
 *
 * States: vc1 = V_A − V_out, vp = V_(+) = V_out, v1 and v2 on ca and cb.
 *   i1 = (u − V_A)/(Rs + r1), i2 = (V_A − vp)/r2
 *   c1·vc1' = i1 − i2,  c2·vp' = i2
 *   ca·v1' = (vp − v1)/ra − (v1 − v2)/rb,  cb·v2' = (v1 − v2)/rb − v2/Rin
 */
import { describe, it } from "vitest";
import { adc, makeChain, rcLowpass, sallenKey, source } from "./support/chain-builders";
import { near, nearPhase, dB, phaseDeg } from "./support/checks";
import { integrate, sineSteadyState } from "./support/ode";
import { responseAt } from "./support/nodal";
import { responseOf } from "./support/engine-access";

const E = { rs: 1e3, r1: 1e4, r2: 1e4, c1: 2.2e-8, c2: 1e-8, ra: 4.7e3, ca: 1e-8, rb: 4.7e3, cb: 4.7e-9, rin: 4.7e4 };

const chain = makeChain({
  nodes: [
    source({ resistance: E.rs }),
    sallenKey("sk", { r1: E.r1, r2: E.r2, c1: E.c1, c2: E.c2 }),
    rcLowpass("ra", { r: E.ra, c: E.ca }),
    rcLowpass("rb", { r: E.rb, c: E.cb }),
    adc("adc", { inputResistance: E.rin }),
  ],
});

function rhs(_t: number, y: number[], u: number): number[] {
  const [vc1, vp, v1, v2] = y;
  const va = vc1 + vp;
  const i1 = (u - va) / (E.rs + E.r1);
  const i2 = (va - vp) / E.r2;
  return [(i1 - i2) / E.c1, i2 / E.c2, ((vp - v1) / E.ra - (v1 - v2) / E.rb) / E.ca, ((v1 - v2) / E.rb - v2 / E.rin) / E.cb];
}

describe("sine steady state of Sallen-Key + two loaded RC sections (odex 2.0.4)", () => {
  const freqs = [150, 700, 1500, 4000];
  // The slowest natural mode decays at ω0/(2Q) ≈ 4.6e3 s⁻¹; 12 ms is over 50 time constants.
  const ode = freqs.map((f) => sineSteadyState(f, 4, rhs, (y) => y[3], 12e-3, 4));

  it("the odex steady state agrees with the nodal reference (the two references agree)", () => {
    freqs.forEach((f, i) => {
      const h = responseAt(chain, "adc", f);
      near(20 * Math.log10(ode[i].mag), dB(h), { abs: 1e-6 }, `odex steady state vs mathjs nodal solve at ${f} Hz`);
      nearPhase(ode[i].phaseDeg, phaseDeg(h), 1e-5, `odex steady state vs mathjs nodal solve at ${f} Hz`);
    });
  });

  it("the engine's response equals the time-domain steady state", () => {
    const r = responseOf(chain, "adc", freqs);
    freqs.forEach((f, i) => {
      near(r.magDb[i], 20 * Math.log10(ode[i].mag), { abs: 1e-5 }, `odex sine steady state (references.md §16) at ${f} Hz`);
      nearPhase(r.phaseDeg[i], ode[i].phaseDeg, 1e-4, `odex sine steady state (references.md §16) at ${f} Hz`);
    });
  });

  it("DC gain of the chain from the step response's final value: Rin/(ra + rb + Rin)", () => {
    const y = integrate((t, x) => rhs(t, x, 1), 0, [0, 0, 0, 0], 20e-3);
    const dc = E.rin / (E.ra + E.rb + E.rin);
    near(y[3], dc, { rel: 1e-8 }, "derived: resistive divider at DC; odex step response settled");
    const r = responseOf(chain, "adc", [1e-3]);
    near(r.magDb[0], 20 * Math.log10(dc), { abs: 1e-6 }, "odex step final value vs engine at 1 mHz");
  });
});
