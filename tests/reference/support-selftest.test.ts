/**
 * Proof of the reference tools themselves (no engine involved): the mathjs nodal
 * solver against the closed forms and the check values of references.md, the
 * adaptive Simpson against integrals with known values, the odex harness against the
 * analytic step response. If these pass, a disagreement with the engine elsewhere
 * points at the engine (or at the spec), not at the reference.
 */
import { describe, it, vi } from "vitest";
import {
  adc,
  inverting,
  lossyIntegrator,
  makeChain,
  mfb,
  noninverting,
  rcHighpass,
  rcLowpass,
  sallenKey,
  single,
  source,
  integrator,
} from "./support/chain-builders";
import { assemble, buildNet, jw, responseAt, solve } from "./support/nodal";
import { cx } from "./support/cx";
import { dcInterval, noiseDensityAt, noiseRms, maxOverBand } from "./support/reference-analysis";
import {
  integratorH,
  invertingFiniteH,
  invertingH,
  lossyIntegratorH,
  mfbH,
  noninvertingFiniteH,
  noninvertingH,
  opAmpGain,
  rcHighpassH,
  rcLadder2H,
  rcLowpassH,
  sallenKeyFiniteH,
  sallenKeyH,
} from "./support/closed-forms";
import { dB, near, nearPhase, phaseDeg } from "./support/checks";
import { adaptiveSimpson, integrateLogVec } from "./support/simpson";
import { integrate, sineSteadyState } from "./support/ode";

// Heavy reference integrals and spawned processes: room for a loaded two-core machine.
vi.setConfig({ testTimeout: 180_000, hookTimeout: 180_000 });

const at = (chain: ReturnType<typeof single>, f: number) => responseAt(chain, "adc", f);

describe("reference nodal solver: ideal stages against their closed forms", () => {
  const freqs = [0.3, 10, 159.15494, 1000, 1591.549, 12345, 2e5];

  it("every stage kind equals its chain-format.md ideal H(s) to 1e-9", () => {
    const cases = [
      { c: single(inverting("u", { r1: 4700, r2: 33000 })), h: () => invertingH(4700, 33000) },
      { c: single(noninverting("u", { rf: 22000, rg: 4700 })), h: () => noninvertingH(22000, 4700) },
      { c: single(lossyIntegrator("u", { r1: 1e4, r2: 1e5, c2: 1e-8 })), h: (f: number) => lossyIntegratorH(1e4, 1e5, 1e-8, f) },
      { c: single(integrator("u", { r1: 1e4, c2: 1e-8 })), h: (f: number) => integratorH(1e4, 1e-8, f) },
      { c: single(rcLowpass("u", { r: 1e4, c: 1e-8 })), h: (f: number) => rcLowpassH(1e4, 1e-8, f) },
      { c: single(rcHighpass("u", { r: 1e5, c: 1e-6 })), h: (f: number) => rcHighpassH(1e5, 1e-6, f) },
      { c: single(sallenKey("u", { r1: 1e4, r2: 2.2e4, c1: 2.2e-8, c2: 4.7e-9 })), h: (f: number) => sallenKeyH(1e4, 2.2e4, 2.2e-8, 4.7e-9, f) },
      { c: single(mfb("u", { r1: 1e3, r2: 1e4, r3: 1e4, c1: 1e-7, c2: 2.2e-9 })), h: (f: number) => mfbH(1e3, 1e4, 1e4, 1e-7, 2.2e-9, f) },
    ];
    for (const { c, h } of cases) {
      for (const f of freqs) {
        const ref = h(f);
        const got = at(c, f);
        near(dB(got), dB(ref), { abs: 1e-9 }, `derived from the ideal H of chain-format.md, ${c.nodes[1].kind} at ${f} Hz`);
        nearPhase(phaseDeg(got), phaseDeg(ref), 1e-7, `derived from the ideal H of chain-format.md, ${c.nodes[1].kind} at ${f} Hz`);
      }
    }
  });

  it("RC low-pass check values (references.md §2, R = 10 kΩ, C = 10 nF)", () => {
    const c = single(rcLowpass("u", { r: 1e4, c: 1e-8 }));
    const fc = 1591.5494309189535;
    const rows: [number, number, number][] = [
      [0.1 * fc, -0.0432137, -5.7105931],
      [fc, -3.0102999566, -45],
      [10 * fc, -20.0432137, -84.2894069],
      [1000, -1.4450701, -32.1419076],
      [1e5, -35.9646973, -89.0881863],
    ];
    for (const [f, db, ph] of rows) {
      near(dB(at(c, f)), db, { abs: 5e-7 }, "references.md §2 RC low-pass table [DERIVED]");
      nearPhase(phaseDeg(at(c, f)), ph, 5e-7, "references.md §2 RC low-pass table [DERIVED]");
    }
  });

  it("lossy integrator check values (references.md §5, R1 = 10 kΩ, R2 = 100 kΩ, C2 = 10 nF)", () => {
    const c = single(lossyIntegrator("u", { r1: 1e4, r2: 1e5, c2: 1e-8 }));
    const rows: [number, number, number][] = [
      [1, 19.99983, 179.64],
      [159.15494, 16.9897, 135.0],
      [1000, 3.92776, 99.04306],
      [1591.5494, -0.0432137, 95.71059],
      [1e4, -15.9647, 90.91181],
    ];
    for (const [f, db, ph] of rows) {
      near(dB(at(c, f)), db, { abs: 6e-6 }, "references.md §5 lossy integrator table [DERIVED]");
      nearPhase(phaseDeg(at(c, f)), ph, 6e-5, "references.md §5 lossy integrator table [DERIVED]");
    }
  });

  it("Sallen-Key and MFB check values (references.md §6(a), §6(c), §7(a), §7(c))", () => {
    const sk = single(sallenKey("u", { r1: 1e4, r2: 1e4, c1: 2e-8, c2: 1e-8 }));
    const f0 = 1125.3954;
    near(dB(at(sk, f0)), -3.0103, { abs: 5e-5 }, "references.md §6(a) ideal at f0");
    nearPhase(phaseDeg(at(sk, 2 * f0)), -136.6861, 5e-4, "references.md §6(a) ideal at 2·f0");
    near(dB(at(sk, 10 * f0)), -40.00043, { abs: 5e-5 }, "references.md §6(a) ideal at 10·f0");
    const skc = single(sallenKey("u", { r1: 1e4, r2: 1e4, c1: 1e-8, c2: 1e-8 }));
    near(dB(at(skc, 1591.5494)), -6.0206, { abs: 5e-5 }, "references.md §6(c): |H(f0)| = Q = 0.5");
    const m = single(mfb("u", { r1: 1e4, r2: 1e4, r3: 1e4, c1: 45e-9, c2: 1e-8 }));
    near(dB(at(m, 750.2636)), -3.0103, { abs: 5e-5 }, "references.md §7(a) ideal at f0");
    nearPhase(phaseDeg(at(m, 750.2636)), 90, 1e-4, "references.md §7(a) ideal at f0, +90°");
    nearPhase(phaseDeg(at(m, 1.0)), 179.892, 5e-4, "references.md §7(a) ideal at 1 Hz");
    nearPhase(phaseDeg(at(m, 2 * 750.2636)), 43.3139, 5e-4, "references.md §7(a) ideal at 2·f0");
    const mc = single(mfb("u", { r1: 1e3, r2: 1e4, r3: 1e4, c1: 1e-7, c2: 2.2e-9 }));
    near(dB(at(mc, 1073.02241)), 14.99215, { abs: 5e-5 }, "references.md §7(c) ideal at f0");
    near(dB(at(mc, 10730.2241)), -20.05086, { abs: 5e-5 }, "references.md §7(c) ideal at 10·f0");
  });

  it("two equal loaded RC sections give 1/(1 + 3sRC + (sRC)²) (chain-format.md, 'Loading is exact')", () => {
    const c = makeChain({ nodes: [source(), rcLowpass("a", { r: 1e4, c: 1e-8 }), rcLowpass("b", { r: 1e4, c: 1e-8 }), adc("adc")] });
    for (const f of [1, 300, 1591.55, 5000, 1e5]) {
      near(dB(at(c, f)), dB(rcLadder2H(1e4, 1e-8, f)), { abs: 1e-9 }, "chain-format.md loaded ladder formula");
    }
  });
});

describe("reference nodal solver: sparse and dense mathjs solves agree", () => {
  it("slu + lusolve equals dense lusolve on a long chain's MNA matrix", () => {
    const c = makeChain({
      nodes: [
        source({ resistance: 100 }),
        sallenKey("a", { r1: 1e4, r2: 2.2e4, c1: 1e-8, c2: 4.7e-9 }, { part: "p" }),
        mfb("b", { r1: 1e4, r2: 1e4, r3: 4.7e3, c1: 1e-8, c2: 1e-9 }, { part: "p" }),
        rcLowpass("c", { r: 1e4, c: 1e-8 }),
        inverting("d", { r1: 1e4, r2: 3.3e4 }, { part: "p" }),
        adc("adc", { inputResistance: 1e5 }),
      ],
      parts: { p: { aol: 1e5, gbw: 1e6 } },
    });
    const net = buildNet(c);
    for (const f of [3, 700, 2e4]) {
      const A = assemble(net, jw(f));
      const b = A.map((_, i) => cx(Math.cos(i), Math.sin(2 * i)));
      const xs = solve(A, b)!;
      const xd = solve(A, b, true)!;
      xs.forEach((v, i) => near(v.sub(xd[i]).abs(), 0, { abs: 1e-12 * Math.max(1, xd[i].abs()) }, "two mathjs solvers on one matrix"));
    }
  });
});

describe("reference nodal solver: finite gain and GBW (references.md §4, §6, §7)", () => {
  const part = { gbw: 1e6, aol: 1e5 };
  it("gain stages follow the closed-loop single-pole formulas", () => {
    const ni = single(noninverting("u", { rf: 99e3, rg: 1e3 }, { part: "p" }), { parts: { p: part } });
    near(at(ni, 1e-3).re, 99.9000999, { rel: 1e-8 }, "references.md §4 non-inverting DC, A0 = 1e5");
    near(dB(at(ni, 1000)), 39.94819, { abs: 5e-6 }, "references.md §4 G = 100 at 1 kHz");
    nearPhase(phaseDeg(at(ni, 1000)), -5.70493, 5e-6, "references.md §4 G = 100 at 1 kHz");
    near(dB(at(ni, 1e5)), 19.9567, { abs: 5e-6 }, "references.md §4 G = 100 at 100 kHz");
    nearPhase(phaseDeg(at(ni, 1e5)), -84.28373, 5e-6, "references.md §4 G = 100 at 100 kHz");
    const inv = single(inverting("u", { r1: 1e4, r2: 1e4 }, { part: "p" }), { parts: { p: part } });
    near(dB(at(inv, 1000)), -0.000191, { abs: 5e-7 }, "references.md §4 G = −1 at 1 kHz");
    nearPhase(phaseDeg(at(inv, 1000)), 179.8854, 5e-5, "references.md §4 G = −1 at 1 kHz");
    const g11 = single(noninverting("u", { rf: 1e4, rg: 1e3 }, { part: "p" }), { parts: { p: part } });
    near(dB(at(g11, 1e5)), 17.3835, { abs: 5e-5 }, "references.md §4 G = 11 at 100 kHz");
    nearPhase(phaseDeg(at(g11, 1e5)), -47.72317, 5e-6, "references.md §4 G = 11 at 100 kHz");
    for (const f of [1, 1e3, 3e4, 5e5]) {
      const a = opAmpGain(1e5, 1e6, f);
      near(dB(at(inv, f)), dB(invertingFiniteH(1e4, 1e4, a)), { abs: 1e-9 }, "references.md §4 inverting A(s)β/(1+A(s)β)");
      near(dB(at(ni, f)), dB(noninvertingFiniteH(99e3, 1e3, a)), { abs: 1e-9 }, "references.md §4 non-inverting A/(1+Aβ)");
    }
  });

  it("Sallen-Key with a single-pole op-amp matches the finite-A closed form and §6(a) values", () => {
    const c = single(sallenKey("u", { r1: 1e4, r2: 1e4, c1: 2e-8, c2: 1e-8 }, { part: "p" }), { parts: { p: part } });
    for (const f of [10, 1125.3954, 5e3, 1e5]) {
      const ref = sallenKeyFiniteH(1e4, 1e4, 2e-8, 1e-8, opAmpGain(1e5, 1e6, f), f);
      near(dB(at(c, f)), dB(ref), { abs: 1e-9 }, "references.md §6 finite-A form [DERIVED, SymPy]");
      nearPhase(phaseDeg(at(c, f)), phaseDeg(ref), 1e-8, "references.md §6 finite-A form [DERIVED, SymPy]");
    }
    near(dB(at(c, 1125.3954)), -3.0105, { abs: 5e-5 }, "references.md §6(a) GBW column at f0");
    nearPhase(phaseDeg(at(c, 1125.3954)), -90.129, 5e-4, "references.md §6(a) GBW column at f0");
    near(dB(at(c, 11253.954)), -40.01477, { abs: 5e-5 }, "references.md §6(a) GBW column at 10·f0");
    nearPhase(phaseDeg(at(c, 11253.954)), -172.5269, 5e-4, "references.md §6(a) GBW column at 10·f0");
  });

  it("MFB with a single-pole op-amp reproduces references.md §7 GBW columns", () => {
    const a = single(mfb("u", { r1: 1e4, r2: 1e4, r3: 1e4, c1: 45e-9, c2: 1e-8 }, { part: "p" }), { parts: { p: part } });
    near(dB(at(a, 750.2636)), -3.01514, { abs: 5e-5 }, "references.md §7(a) GBW column at f0");
    nearPhase(phaseDeg(at(a, 750.2636)), 89.893, 5e-4, "references.md §7(a) GBW column at f0");
    near(dB(at(a, 7502.636)), -40.01454, { abs: 5e-5 }, "references.md §7(a) GBW column at 10·f0");
    nearPhase(phaseDeg(at(a, 7502.636)), 7.692, 5e-4, "references.md §7(a) GBW column at 10·f0");
    const c = single(mfb("u", { r1: 1e3, r2: 1e4, r3: 1e4, c1: 1e-7, c2: 2.2e-9 }, { part: "p" }), { parts: { p: part } });
    near(dB(at(c, 1073.02241)), 14.93942, { abs: 5e-5 }, "references.md §7(c) GBW column at f0");
    nearPhase(phaseDeg(at(c, 1073.02241)), 89.7106, 5e-4, "references.md §7(c) GBW column at f0");
    near(dB(at(c, 10730.2241)), -20.11436, { abs: 5e-5 }, "references.md §7(c) GBW column at 10·f0");
  });

  it("references.md §8 cascade (AC coupling → G = 11 → Sallen-Key 6(a)) including the finite-GBW column", () => {
    const nodes = [
      source(),
      rcHighpass("hp", { r: 1e5, c: 1e-6 }),
      noninverting("g", { rf: 1e4, rg: 1e3 }),
      sallenKey("sk", { r1: 1e4, r2: 1e4, c1: 2e-8, c2: 1e-8 }),
      adc("adc"),
    ];
    const ideal = makeChain({ nodes });
    const rows: [number, number, number][] = [
      [0.5, 10.3621, 72.523],
      [100, 20.8265, -6.307],
      [1000, 18.7235, -80.402],
      [5000, -5.0899, -161.446],
    ];
    for (const [f, db, ph] of rows) {
      near(dB(at(ideal, f)), db, { abs: 5e-5 }, "references.md §8 cascade, ideal op-amps");
      nearPhase(phaseDeg(at(ideal, f)), ph, 5e-4, "references.md §8 cascade, ideal op-amps");
    }
    const finite = makeChain({
      nodes: [nodes[0], nodes[1], noninverting("g", { rf: 1e4, rg: 1e3 }, { part: "p" }), nodes[3], nodes[4]],
      parts: { p: { aol: 1e5, gbw: 1e7 } },
    });
    near(dB(at(finite, 100)), 20.8255, { abs: 5e-5 }, "references.md §8 cascade, GBW 10 MHz");
    nearPhase(phaseDeg(at(finite, 5000)), -161.761, 5e-4, "references.md §8 cascade, GBW 10 MHz");
  });
});

describe("reference DC intervals (references.md §5, §9)", () => {
  it("offset and bias terms", () => {
    const parts = { p: { vos: 1e-3, ib: 80e-9 } };
    const inv = single(inverting("u", { r1: 1e4, r2: 1e5 }, { part: "p" }), { parts });
    const iv = dcInterval(inv, "u")!;
    near(iv.max, 0.019, { rel: 1e-9 }, "references.md §9: uncompensated 11 mV + 8 mV = 19 mV");
    near(iv.min, -0.019, { rel: 1e-9 }, "references.md §9: uncompensated, symmetric");
    const ni = single(noninverting("u", { rf: 99e3, rg: 1e3 }, { part: "q" }), { parts: { q: { vos: 1e-3, ib: 1e-7 } } });
    near(dcInterval(ni, "u")!.max, 0.1099, { rel: 1e-9 }, "references.md §9: NG·Vos + Ib·Rf = 109.9 mV worst case");
  });

  it("integrator: unbounded DC is null", () => {
    const c = single(integrator("u", { r1: 1e4, c2: 1e-8 }));
    near(dcInterval(c, "u") === null ? 1 : 0, 1, { abs: 0 }, "chain-format.md: integrator has no DC path");
  });
});

describe("reference noise (references.md §11)", () => {
  it("op-amp stage output densities of §11.4 at 300 K", () => {
    const stage = (rf: number, rg: number, en: number, inn: number, rs: number) =>
      single(noninverting("u", { rf, rg }, { part: "p" }), {
        parts: { p: { en, in: inn } },
        src: { resistance: rs },
        analysis: { temperatureK: 300 },
      });
    near(noiseDensityAt(stage(1e4, 1e3, 10e-9, 1e-12, 0), "u", 10), 118.4165e-9, { rel: 5e-7 }, "references.md §11.4 stage 1");
    near(noiseDensityAt(stage(1e4, 1e3, 10e-9, 1e-12, 1e3), "u", 10), 127.0754e-9, { rel: 5e-7 }, "references.md §11.4 stage 1, Rs = 1 kΩ");
    near(noiseDensityAt(stage(99e3, 1e3, 4e-9, 0.5e-12, 0), "u", 10), 571.3767e-9, { rel: 5e-7 }, "references.md §11.4 stage 2");
    near(noiseDensityAt(stage(1e3, 1e3, 2.9e-9, 1.5e-12, 100), "u", 10), 8.703e-9, { rel: 1e-5 }, "references.md §11.4 stage 3");
  });

  it("closed-loop roll-off and the two-pole case of §11.4", () => {
    const mk = (extra: boolean) =>
      makeChain({
        nodes: [
          source(),
          noninverting("u", { rf: 1e4, rg: 1e3 }, { part: "p" }),
          ...(extra ? [rcLowpass("rc", { r: 1e4, c: 1 / (2 * Math.PI * 1e4 * 1000) })] : []),
          adc("adc"),
        ],
        parts: { p: { en: 10e-9, in: 1e-12, gbw: 1e7 } },
        analysis: { temperatureK: 300 },
      });
    near(noiseRms(mk(false), "adc", 1e-3, 1e12).rms, 141.506e-6, { rel: 5e-6 }, "references.md §11.4: 118.4165 nV/√Hz over NEB 1.427997 MHz");
    // The RC resistor adds its own 4kTR; §11.4 counts only the stage's density, so subtract the RC's term.
    const r = noiseRms(mk(true), "adc", 1e-3, 1e12);
    const rcTerm = r.parts.find((p) => p.owner === "rc")!.rms;
    near(Math.sqrt(r.rms ** 2 - rcTerm ** 2), 4.69065e-6, { rel: 5e-6 }, "references.md §11.4: exact two poles, 909 kHz and 1 kHz");
    // kT/C for the RC resistor alone (references.md §11.2), C = 15.915 nF
    near(rcTerm, Math.sqrt((1.380649e-23 * 300) / (1 / (2 * Math.PI * 1e4 * 1000))), { rel: 1e-5 }, "references.md §11.2 kT/C");
  });

  it("Sallen-Key and MFB resistor noise of §11.5 (300 K)", () => {
    const sk = single(sallenKey("u", { r1: 1e4, r2: 1e4, c1: 2e-8, c2: 1e-8 }), { analysis: { temperatureK: 300 } });
    const n = noiseRms(sk, "adc", 1e-3, 1e10);
    near(n.parts.find((p) => p.element === "r1")!.rms, 0.455079e-6, { rel: 2e-6 }, "references.md §11.5 SK R1");
    near(n.parts.find((p) => p.element === "r2")!.rms, 0.788221e-6, { rel: 2e-6 }, "references.md §11.5 SK R2");
    near(n.rms, 0.910159e-6, { rel: 2e-6 }, "references.md §11.5 SK both resistors");
    const m = single(mfb("u", { r1: 1e4, r2: 1e4, r3: 1e4, c1: 45e-9, c2: 1e-8 }), { analysis: { temperatureK: 300 } });
    const nm = noiseRms(m, "adc", 1e-3, 1e10);
    near(nm.parts.find((p) => p.element === "r3")!.rms, 1.083306e-6, { rel: 2e-6 }, "references.md §11.5 MFB R3");
    near(nm.rms, 1.204027e-6, { rel: 2e-6 }, "references.md §11.5 MFB all three resistors");
  });

  it("1/f corner integral (references.md §11.4: 10 nV/√Hz, corner 100 Hz, 0.1 Hz–10 kHz → 1.05599 µV)", () => {
    const c = single(noninverting("u", { rf: null, rg: null }, { part: "p" }), { parts: { p: { en: 10e-9, enCorner: 100 } } });
    near(noiseRms(c, "adc", 0.1, 1e4).rms, 1.05599e-6, { rel: 5e-6 }, "references.md §11.4 1/f example");
  });
});

describe("reference quadrature and band search", () => {
  it("adaptive Simpson on integrals with closed forms", () => {
    near(adaptiveSimpson((x) => Math.sin(x), 0, Math.PI, 1e-12), 2, { rel: 1e-10 }, "∫₀^π sin = 2");
    const fc = 1591.549;
    const v = integrateLogVec((f) => [1 / (1 + (f / fc) ** 2)], 0.1, 1e7)[0];
    near(v, fc * (Math.atan(1e7 / fc) - Math.atan(0.1 / fc)), { rel: 1e-9 }, "∫ 1/(1+(f/fc)²) df = fc·atan (first-order NEB, references.md §11.3)");
  });

  it("maxOverBand finds an interior peak (second-order, Q = 2: max |H| = Q/√(1 − 1/(4Q²)))", () => {
    const q = 2;
    const g = (f: number) => {
      const x = f / 1000;
      return 1 / Math.sqrt((1 - x * x) ** 2 + (x / q) ** 2);
    };
    near(maxOverBand(g, 10, 1e5).value, q / Math.sqrt(1 - 1 / (4 * q * q)), { rel: 1e-10 }, "derived: peak of a second-order low-pass");
  });
});

describe("odex harness (references.md §6 step response, §16)", () => {
  it("Sallen-Key 6(a) unit step: ideal values at 100 µs … 1 ms and the overshoot", () => {
    const w0 = 2 * Math.PI * 1125.3954;
    const q = Math.SQRT1_2;
    // x'' = ω0²(u − x) − (ω0/Q)x', u = 1 (references.md §16)
    const f = (_t: number, y: number[]) => [y[1], w0 * w0 * (1 - y[0]) - (w0 / q) * y[1]];
    const rows: [number, number][] = [
      [100e-6, 0.176933],
      [200e-6, 0.491674],
      [500e-6, 1.016636],
      [1e-3, 1.00455],
    ];
    for (const [t, v] of rows) near(integrate(f, 0, [0, 0], t)[0], v, { abs: 5e-7 }, "references.md §6 step response [DERIVED]");
    near(integrate(f, 0, [0, 0], 628.3185e-6)[0], 1.0432139, { abs: 5e-8 }, "references.md §6: peak 1 + exp(−π/√(4Q²−1))");
  });

  it("sine steady state of an RC low-pass equals the closed form", () => {
    const r = 1e4;
    const c = 1e-8;
    const f = 1000;
    const ss = sineSteadyState(f, 1, (_t, y, u) => [(u - y[0]) / (r * c)], (y) => y[0], 3e-3);
    const h = rcLowpassH(r, c, f);
    near(20 * Math.log10(ss.mag), dB(h), { abs: 1e-6 }, "references.md §2 first-order low-pass");
    nearPhase(ss.phaseDeg, phaseDeg(h), 1e-5, "references.md §2 first-order low-pass");
    // guard: the harness is not blind to a wrong answer
    near(ss.mag, 0.8467, { abs: 1e-3 }, "derived: 1/√(1 + (1000/1591.55)²)");
  });
});
