import { analyzeChain } from "@/lib/engine";
import { makeChain, source, sallenKey, adc, rcLowpass, rcHighpass } from "./support/chain-builders";
import { responseAt } from "./support/nodal";
for (const ratio of [1e2, 1e4, 1e6, 1e8]) {
  const c1 = 1e-7 * Math.sqrt(ratio) / 10, c2 = c1 / ratio;
  const q = 0.5 * Math.sqrt(c1 / c2);
  const f0 = 1 / (2 * Math.PI * 1e4 * Math.sqrt(c1 * c2));
  const ch = makeChain({ nodes: [source({ amplitude: 1, fLow: f0 / 30, fHigh: f0 * 30 }), sallenKey("sk", { r1: 1e4, r2: 1e4, c1, c2 }), adc("adc")] });
  const s = analyzeChain(ch).paths[0].stages[0];
  const peak = q / Math.sqrt(1 - 1 / (4 * q * q));
  const wp = f0 * Math.sqrt(1 - 1 / (2 * q * q));
  console.log("Q", q, "f0", f0, "acPeak", s.acPeak, "expected", peak, "rel err", ((s.acPeak as number) - peak) / peak, "slew", s.slewNeeded);
}
// long passive ladder
const nodes: any[] = [source({ resistance: 50 })];
const rs = [100, 1e6, 1e3, 3e5, 1e4, 220, 4.7e4, 1e5];
const cs = [1e-5, 1e-10, 4.7e-7, 1e-9, 2.2e-8, 1e-6, 1e-9, 3.3e-10];
rs.forEach((r, i) => nodes.push(i % 3 === 2 ? rcHighpass(`s${i}`, { r, c: cs[i] }) : rcLowpass(`s${i}`, { r, c: cs[i] })));
nodes.push(adc("adc", { inputResistance: 1e6 }));
const lad = makeChain({ nodes, analysis: { fMin: 1e-3, fMax: 1e7 } });
const fs = Array.from({ length: 41 }, (_, i) => 1e-3 * Math.pow(1e10, i / 40));
const r = analyzeChain(lad, { freqs: fs }).paths[0].response;
let worst = 0;
fs.forEach((f, i) => { const h = 20 * Math.log10(responseAt(lad, "adc", f).abs()); if (h > -200) worst = Math.max(worst, Math.abs(h - (r.magDb[i] as number))); console.log(f.toExponential(2), h.toFixed(6), (r.magDb[i] as number).toFixed(6)); });
console.log("worst dB diff", worst);
