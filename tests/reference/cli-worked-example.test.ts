/**
 * Item 7: the worked example of chain-format.md ("Document" and "Analysis result")
 * through the command line, as a user runs it. Printed numbers are held to ± half a
 * unit in their last printed digit (references.md §0). The same numbers are first
 * re-derived with the independent nodal reference, so a wrong printed value in the
 * spec would show up here and not be blamed on the engine.
 */
import { spawnSync } from "node:child_process";
import { mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { beforeAll, describe, it, vi } from "vitest";
import type { AnalysisResult, Chain } from "@/lib/chain/types";
import { near, nearPhase, same, holds, dB, phaseDeg } from "./support/checks";
import { acPeak, dcInterval, noiseRms, slewNeeded, magAt, maxOverBand } from "./support/reference-analysis";
import { buildNet, responseAt } from "./support/nodal";

// Heavy reference integrals and spawned processes: room for a loaded two-core machine.
vi.setConfig({ testTimeout: 180_000, hookTimeout: 180_000 });

/** The document of chain-format.md, verbatim. */
const EXAMPLE = {
  format: "chainwright.chain/1",
  name: "Vibration channel, pump skid 3",
  notes: "free text",
  analysis: { fMin: 0.1, fMax: 1e6, points: 600, temperatureK: 298.15, noiseLow: 0.1, noiseHigh: null, aliasTargetDb: null },
  tolerances: { resistor: 0.01, capacitor: 0.05 },
  parts: {
    p1: {
      label: "Precision CMOS, generic", gbw: 1e6, aol: 1e5, slewRate: 5e5, vos: 1e-4, ib: 1e-11,
      en: 1.5e-8, in: 1e-15, enCorner: 0, inCorner: 0, swingLow: 0.05, swingHigh: 0.05, inputLow: 0, inputHigh: 1.5,
    },
  },
  nodes: [
    {
      id: "src", kind: "source",
      params: { dc: 0.2, dcSpread: 0.01, amplitude: 0.05, fLow: 1, fHigh: 200, resistance: 100, noiseDensity: 0, safety: "low-voltage" },
      position: { x: 0, y: 0 },
    },
    { id: "u1", kind: "lossyIntegrator", label: "Anti-alias 1", params: { r1: 10000, r2: 100000, c2: 1e-8, vref: 0 }, part: "p1", rails: { low: -5, high: 5 } },
    { id: "adc", kind: "adc", params: { bits: 16, sampleRate: 2000, vinLow: -4.096, vinHigh: 4.096, inputResistance: null } },
  ],
  edges: [{ from: "src", to: "u1" }, { from: "u1", to: "adc" }],
};
const chain = EXAMPLE as unknown as Chain;

const dir = mkdtempSync(join(tmpdir(), "chainwright-ref-"));
function cli(args: string[], doc?: unknown, raw?: string) {
  const file = join(dir, `doc-${Math.random().toString(36).slice(2)}.json`);
  writeFileSync(file, raw ?? JSON.stringify(doc));
  const r = spawnSync(join(process.cwd(), "node_modules/.bin/tsx"), ["scripts/analyze.ts", file, ...args], {
    cwd: process.cwd(),
    encoding: "utf8",
    timeout: 60_000,
  });
  return { code: r.status, out: r.stdout, err: r.stderr };
}

/** Printed value v with d decimals: ± half a unit in the last digit. */
const half = (decimals: number) => ({ abs: 0.5 * 10 ** -decimals + 1e-15 });

describe("chain-format.md printed numbers, re-derived by the reference (checks the spec itself)", () => {
  it("dcOut, acPeak, slew, path gain, noise, alias and rangeUse", () => {
    const dc = dcInterval(chain, "u1")!;
    near(dc.min, -2.08007, half(5), "chain-format.md dcOut.min vs mathjs nodal DC solve");
    near(dc.max, -1.87989, half(5), "chain-format.md dcOut.max vs mathjs nodal DC solve");
    near(acPeak(chain, "u1"), 0.494986, half(6), "chain-format.md acPeak vs nodal band maximum");
    near(slewNeeded(chain, "u1"), 386.97, half(2), "chain-format.md slewNeeded vs nodal band maximum");
    near(responseAt(chain, "adc", 1e-7).re, -9.8999, half(4), "chain-format.md pathDcGain vs nodal solve");
    near(noiseRms(chain, "adc", 0.1, 1e6).rms, 1.369e-5, half(8), "chain-format.md outputRms vs adaptive Simpson of nodal |T|²");
    const net = buildNet(chain);
    const pin = net.outputOf.get("adc")!;
    const att = 20 * Math.log10(maxOverBand((f) => magAt(net, pin, f), 1, 200).value / maxOverBand((f) => magAt(net, pin, f), 1800, 1e6).value);
    near(att, 21.115, half(3), "chain-format.md aliasAttenuationDb vs nodal maxima");
  });
});

describe("the worked example through `tsx scripts/analyze.ts` (chain-format.md 'Analysis result')", () => {
  let run: ReturnType<typeof cli>;
  let result: AnalysisResult | null = null;
  beforeAll(() => {
    run = cli([], EXAMPLE);
    try {
      result = JSON.parse(run.out) as AnalysisResult;
    } catch {
      result = null;
    }
  });

  it("exit 0, exactly one JSON document on stdout", () => {
    same(run.code, 0, "chain-format.md: exit 0 whenever the analysis ran");
    holds(result !== null, "chain-format.md: stdout is one JSON document");
    same(run.out.trim().split("\n").length, 1, "chain-format.md: exactly one document");
    same(result?.format, "chainwright.analysis/1", "chain-format.md: format chainwright.analysis/1");
    holds(typeof result?.engine === "string" && /^\d+\.\d+\.\d+/.test(result.engine), "chain-format.md: engine version string");
  });

  it("stage u1 numbers", () => {
    const p = result!.paths[0];
    same(p.nodes, ["src", "u1", "adc"], "chain-format.md: paths[0].nodes");
    const s = p.stages.find((x) => x.id === "u1")!;
    same(s.kind, "lossyIntegrator", "chain-format.md: stage kind");
    near(s.dcGain, -9.9989, half(5), "chain-format.md: dcGain −9.99890");
    near(s.f0, 159.15, half(2), "chain-format.md: f0 159.15");
    same(s.q, null, "chain-format.md: q null");
    near(s.dcOut?.min, -2.08007, half(5), "chain-format.md: dcOut.min −2.08007");
    near(s.dcOut?.max, -1.87989, half(5), "chain-format.md: dcOut.max −1.87989");
    near(s.acPeak, 0.494986, half(6), "chain-format.md: acPeak 0.494986");
    near(s.peakOut?.min, -2.57506, half(5), "chain-format.md: peakOut.min −2.57506");
    near(s.peakOut?.max, -1.38491, half(5), "chain-format.md: peakOut.max −1.38491");
    near(s.usable?.low, -4.95, half(2), "chain-format.md: usable.low −4.95");
    near(s.usable?.high, 4.95, half(2), "chain-format.md: usable.high 4.95");
    same(s.status, "ok", "chain-format.md: status ok");
    near(s.slewNeeded, 386.97, half(2), "chain-format.md: slewNeeded 386.97");
  });

  it("noise, ADC and warnings", () => {
    const p = result!.paths[0];
    near(p.noise.outputRms, 1.369e-5, half(8), "chain-format.md: outputRms 1.369e-5");
    near(p.noise.totalRms, 1.369e-5, half(8), "chain-format.md: totalRms 1.369e-5");
    near(p.noise.low, 0.1, { abs: 0 }, "chain-format.md: noise.low 0.1");
    near(p.noise.high, 1e6, { abs: 0 }, "chain-format.md: noise.high 1e6 (noiseHigh null = fMax)");
    const a = p.adc!;
    near(a.lsb, 1.25e-4, { rel: 1e-12 }, "chain-format.md: lsb 1.25e-4 = 8.192/2^16");
    near(a.quantNoiseRms, 3.608e-5, half(8), "chain-format.md: quantNoiseRms 3.608e-5");
    near(a.idealSnrDb, 98.08, half(2), "chain-format.md: idealSnrDb 98.08");
    near(a.aliasAttenuationDb, 21.115, half(3), "chain-format.md: aliasAttenuationDb 21.115");
    near(a.pathDcGain, -9.8999, half(4), "chain-format.md: pathDcGain −9.8999");
    near(a.rangeUse, 0.145, half(3), "chain-format.md: rangeUse 0.145");
    same(a.status, "ok", "chain-format.md: ADC status ok");
    // snrDb/enob are not printed in the spec; derived from its definition with the reference noise:
    const vn = noiseRms(chain, "adc", 0.1, 1e6).rms;
    const snr = 20 * Math.log10(8.192 / (2 * Math.SQRT2) / Math.hypot(vn, 8.192 / 2 ** 16 / Math.sqrt(12)));
    near(a.snrDb, snr, { abs: 1e-3 }, "chain-format.md: full-scale sine over √(totalRms² + q²/12) (references.md §12)");
    near(a.enob, (snr - 1.76) / 6.02, { abs: 2e-4 }, "references.md §12: ENOB = (SNR − 1.76)/6.02");
    holds(result!.warnings.some((w) => w.nodeId === "adc" && w.code === "alias"), "chain-format.md: warnings include alias at adc (21.1 dB < 98.08 dB)");
  });

  it("--freq evaluates exactly the given frequencies, engineering notation accepted", () => {
    const r = cli(["--freq", "10,1k,2.5k"], EXAMPLE);
    same(r.code, 0, "chain-format.md: exit 0");
    const resp = (JSON.parse(r.out) as AnalysisResult).paths[0].response;
    same(resp.f, [10, 1000, 2500], "chain-format.md: response at exactly the --freq frequencies");
    [10, 1000, 2500].forEach((f, i) => {
      const h = responseAt(chain, "adc", f);
      near(resp.magDb[i], dB(h), { abs: 1e-7 }, `mathjs nodal solve of the example at ${f} Hz`);
      nearPhase(resp.phaseDeg[i], phaseDeg(h), 1e-6, `mathjs nodal solve of the example at ${f} Hz`);
    });
    const g = cli(["--points", "5"], EXAMPLE);
    same((JSON.parse(g.out) as AnalysisResult).paths[0].response.f.length, 5, "chain-format.md: --points N");
  });

  it("a clipping chain is a result (exit 0); invalid input exits 2 with errors on stderr and nothing on stdout", () => {
    const clipping = JSON.parse(JSON.stringify(EXAMPLE));
    clipping.nodes[0].params.dc = 2;
    const c = cli([], clipping);
    same(c.code, 0, "chain-format.md: a clipping chain is a result, not an error");
    same((JSON.parse(c.out) as AnalysisResult).paths[0].stages[0].status, "clip", "derived: 2 V × −9.9 = −19.8 V, outside ±4.95 V");
    const notJson = cli([], undefined, "{ not json");
    same(notJson.code, 2, "chain-format.md: a file that is not JSON exits 2");
    same(notJson.out, "", "chain-format.md: nothing on stdout");
    holds(Array.isArray(JSON.parse(notJson.err).errors), "chain-format.md: {errors: [...]} on stderr");
    const missing = JSON.parse(JSON.stringify(EXAMPLE));
    delete missing.nodes[1].params.r1;
    const m = cli([], missing);
    same(m.code, 2, "chain-format.md: invalid chain exits 2");
    holds(
      (JSON.parse(m.err).errors as { path: string }[]).some((e) => e.path === "nodes[1].params.r1"),
      "chain-format.md: the error path names nodes[1].params.r1",
    );
  });
});
