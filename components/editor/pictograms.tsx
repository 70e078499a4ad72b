/**
 * Small line drawings of each kind's topology for the cards and the shelf. Deliberately sketchy: enough
 * to tell an integrator from a gain stage at a glance, not a circuit drawing. Drawn on a 48×28 grid.
 */
import type { NodeKind } from "@/lib/chain/types";

const amp = (x: number, y: number) => `M${x} ${y - 7} L${x + 12} ${y} L${x} ${y + 7} Z`;
/** resistor as a small box from (x,y) to (x+w,y) */
const res = (x: number, y: number, w = 9) => `M${x} ${y - 2} h${w} v4 h-${w} Z`;
const resV = (x: number, y: number, h = 8) => `M${x - 2} ${y} h4 v${h} h-4 Z`;
/** capacitor plates across a horizontal wire at x */
const cap = (x: number, y: number) => `M${x} ${y - 4} v8 M${x + 2.5} ${y - 4} v8`;
const capV = (x: number, y: number) => `M${x - 4} ${y} h8 M${x - 4} ${y + 2.5} h8`;
const gnd = (x: number, y: number) => `M${x - 3} ${y} h6 M${x - 1.8} ${y + 1.6} h3.6`;

const DRAWINGS: Record<NodeKind, string[]> = {
  source: [
    "M6 14 m-6 0 a6 6 0 1 0 12 0 a6 6 0 1 0 -12 0",
    "M2.5 14 q1.75 -3.5 3.5 0 t3.5 0",
    "M12 14 h6",
    res(18, 14, 10),
    "M28 14 h18",
  ],
  inverting: ["M0 17 h4", res(4, 17, 8), "M12 17 h10", amp(22, 17), "M34 17 h14", "M18 17 v-12 h4", res(22, 5, 8), "M30 5 h10 v12"],
  noninverting: ["M0 20 h22", amp(22, 17), "M34 17 h14", "M40 17 v-12 h-6", res(26, 5, 8), "M26 5 h-8 v9 h4", "M18 14 v5", resV(18, 19, 5)],
  lossyIntegrator: [
    "M0 19 h3", res(3, 19, 7), "M10 19 h12", amp(22, 19), "M34 19 h14",
    "M17 19 v-15 h5", res(22, 4, 8), "M30 4 h10 v15",
    "M17 11 h8", cap(25, 11), "M27.5 11 h12.5",
  ],
  integrator: ["M0 19 h3", res(3, 19, 7), "M10 19 h12", amp(22, 19), "M34 19 h14", "M17 19 v-10 h8", cap(25, 9), "M27.5 9 h12.5 v10"],
  rcLowpass: ["M0 10 h10", res(10, 10, 12), "M22 10 h26", "M32 10 v6", capV(32, 16), "M32 18.5 v5", gnd(32, 23.5)],
  rcHighpass: ["M0 10 h16", cap(16, 10), "M18.5 10 h29.5", "M32 10 v3", resV(32, 13, 8), "M32 21 v2.5", gnd(32, 23.5)],
  sallenKeyLowpass: [
    "M0 20 h2", res(2, 20, 6), "M8 20 h3", res(11, 20, 6), "M17 20 h10", amp(27, 17),
    "M39 17 h9", "M10 20 v-14 h8", cap(18, 6), "M20.5 6 h22.5 v11", "M23 20 v2", capV(23, 22), "M23 24.5 v2",
  ],
  mfbLowpass: [
    "M0 17 h1", res(1, 17, 6), "M7 17 h4", res(11, 17, 6), "M17 17 h11", amp(28, 17), "M40 17 h8",
    "M10 17 v-10 h3", res(13, 7, 6), "M19 7 h25 v10", "M23 17 v-6 h3", cap(26, 11), "M28.5 11 h15.5",
    "M10 17 v3", capV(10, 20), "M10 22.5 v2",
  ],
  // filters: the high-pass sections (the low-pass drawings with resistors and capacitors swapped)
  sallenKeyHighpass: [
    "M0 20 h3", cap(3, 20), "M5.5 20 h5", cap(10.5, 20), "M13 20 h14", amp(27, 17),
    "M39 17 h9", "M8 20 v-14 h9", res(17, 6, 7), "M24 6 h19 v11", "M20 20 v1", resV(20, 21, 4), "M20 25 v1",
  ],
  mfbHighpass: [
    "M0 17 h2", cap(2, 17), "M4.5 17 h6", cap(10.5, 17), "M13 17 h15", amp(28, 17), "M40 17 h8",
    "M8 17 v-10 h5", cap(13, 7), "M15.5 7 h28.5 v10", "M20 17 v-6 h2", res(22, 11, 7), "M29 11 h15",
    "M8 17 v2", resV(8, 19, 4), "M8 23 v1.5",
  ],
  // ---- sensor sources and front-end stages (issue 14)
  bridge: [
    "M4 14 l8 -9 l8 9 l-8 9 Z", "M8 9.5 l1.6 -1.8", "M16 18.5 l1.6 -1.8", "M12 5 v-3", "M12 23 v3",
    "M20 14 h8", "M4 14 h-3 v8", "M28 11 h20", "M28 17 h20", "M28 14 v-3 M28 14 v3",
  ],
  photodiode: [
    "M14 8 v12", "M8 8 h12 l-6 8 Z", "M14 16 h0", "M4 2 l5 5 M3 6 l5 5", "M14 8 v-4 h34", "M14 20 v4", gnd(14, 24),
  ],
  piezo: ["M10 6 h8 v16 h-8 Z", "M12 6 v16 M16 6 v16", "M14 6 v-2 h34", "M14 22 v2", gnd(14, 24)],
  thermocouple: ["M4 14 l8 -6 M4 14 l8 6", "M4 14 m-2 0 a2 2 0 1 0 4 0 a2 2 0 1 0 -4 0", "M12 8 h36", "M12 20 h36"],
  transimpedance: ["M0 19 h22", amp(22, 19), "M34 19 h14", "M17 19 v-15 h5", res(22, 4, 8), "M30 4 h10 v15", "M17 11 h8", cap(25, 11), "M27.5 11 h12.5", "M4 15 l4 4 l-4 4"],
  chargeAmp: ["M0 19 h22", amp(22, 19), "M34 19 h14", "M17 19 v-15 h8", cap(25, 4), "M27.5 4 h12.5 v15", "M17 11 h5", res(22, 11, 8), "M30 11 h10", "M3 15 h4 v8 h-4 Z"],
  differenceAmp: ["M0 14 h3", res(3, 14, 7), "M10 14 h14", "M0 22 h3", res(3, 22, 7), "M10 22 h14", amp(24, 18), "M36 18 h12", "M18 14 v-10 h4", res(22, 4, 8), "M30 4 h10 v14"],
  inAmp: [amp(6, 7), amp(6, 21), amp(30, 14), "M0 5 h6", "M0 23 h6", "M18 7 h6 v5 h6", "M18 21 h6 v-5 h6", "M42 14 h6", resV(3, 11, 6)],
  adc: [
    "M0 14 h10",
    "M10 4 h22 l10 10 l-10 10 h-22 Z",
    "M15 19 h3 v-3 h3 v-3 h3 v-3 h3",
  ],
};

export function Pictogram({ kind, className = "" }: { kind: NodeKind; className?: string }) {
  return (
    <svg
      viewBox="-1 -1 50 30"
      width={48}
      height={28}
      className={`cw-pictogram ${className}`}
      aria-hidden
      fill="none"
      stroke="currentColor"
      strokeWidth={1.2}
      strokeLinejoin="round"
      strokeLinecap="round"
      data-kind={kind}
    >
      {DRAWINGS[kind].map((d, i) => (
        <path key={i} d={d} />
      ))}
    </svg>
  );
}
