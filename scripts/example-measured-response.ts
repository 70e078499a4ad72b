/**
 * Writes public/examples/keelwater-hull-vibration-measured.csv: an invented bench sweep of the demo's
 * hull vibration channel at its converter input, for trying the measured-response overlay. It is the
 * computed response of the demo chain built a little off its drawn values, as a real board would be
 * (charge amplifier's cf 3 % high, anti-alias c2 4 % high, gain resistor rf 0.5 % low), seen through a
 * 1.5 µs delay in the measuring set-up, with a small seeded scatter (±0.03 dB, ±0.3°) standing in for
 * measurement noise. The source is a charge (a piezo), so the magnitude is in dB re 1 V/C, as the
 * response plot shows it (a bench would inject the charge through a known test capacitor).
 * Run: npx tsx scripts/example-measured-response.ts
 */
import { writeFileSync } from "node:fs";
import { hullVibration } from "../db/seed-data/chains";
import { analyzeChain } from "../lib/engine/analyze";
import { wrapDegrees } from "../lib/engine/measured-response";
import type { Chain } from "../lib/chain/types";

const built = structuredClone(hullVibration) as unknown as Chain;
const param = (id: string, key: string, factor: number) => {
  const n = built.nodes.find((x) => x.id === id) as unknown as { params: Record<string, number> };
  n.params[key] *= factor;
};
param("ca", "cf", 1.03);
param("aa", "c2", 1.04);
param("gain", "rf", 0.995);

const perDecade = 10;
const freqs = Array.from({ length: Math.round(Math.log10(20e3 / 1) * perDecade) + 1 }, (_, k) => Number((10 ** (k / perDecade)).toPrecision(3)));
const path = analyzeChain(built, { freqs, noise: false }).paths[0];

let seed = 0x6b77; // mulberry32, so the file comes out the same every run
const rand = () => {
  seed = (seed + 0x6d2b79f5) | 0;
  let t = Math.imul(seed ^ (seed >>> 15), 1 | seed);
  t = (t + Math.imul(t ^ (t >>> 7), 61 | t)) ^ t;
  return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
};
const delay = 1.5e-6;
const rows = ["frequency_Hz,magnitude_dB,phase_deg"];
path.response.f.forEach((f, k) => {
  const db = path.response.magDb[k]! + (rand() - 0.5) * 0.06;
  const deg = wrapDegrees(path.response.phaseDeg[k]! - 360 * f * delay + (rand() - 0.5) * 0.6);
  rows.push(`${f},${db.toFixed(3)},${deg.toFixed(2)}`);
});
writeFileSync("public/examples/keelwater-hull-vibration-measured.csv", `${rows.join("\n")}\n`);
console.log(`${rows.length - 1} rows`);
