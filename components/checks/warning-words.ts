/**
 * Our names for the engine's warning codes, and how serious each is. The engine's message already
 * states the cause in plain words (which stage, what drives it, by how much); this adds a short title and
 * a severity shown as a word and a shape.
 */
export type Severity = "clip" | "tight" | "caution" | "note";

const WORDS: Record<string, { title: string; severity: Severity }> = {
  "rail-clip": { title: "Output runs past its swing", severity: "clip" },
  "no-dc-path": { title: "No DC feedback path", severity: "clip" },
  "dc-unbounded": { title: "DC level unbounded", severity: "clip" },
  "input-range": { title: "Input outside its range", severity: "clip" },
  "adc-range": { title: "Converter input over range", severity: "clip" },
  nyquist: { title: "Band reaches Nyquist", severity: "clip" },
  "rail-tight": { title: "Little headroom", severity: "tight" },
  "adc-tight": { title: "Converter nearly full", severity: "tight" },
  slew: { title: "Too slow for the signal", severity: "tight" },
  alias: { title: "Weak alias rejection", severity: "tight" },
  pole: { title: "No finite value", severity: "tight" },
  "part-zero-gain": { title: "Model without gain", severity: "tight" },
  // sensor front ends (issue 14): the in-amp's inner nodes clip like an output; a loop with little phase
  // margin rings or oscillates, which matters as much as a tight rail
  "inamp-common-mode": { title: "In-amp common mode out of range", severity: "clip" },
  "tia-stability": { title: "Loop may ring or oscillate", severity: "tight" },
  "tia-bandwidth": { title: "Feedback pole inside the band", severity: "tight" },
  "charge-corner": { title: "Low corner inside the band", severity: "tight" },
  safety: { title: "Safety", severity: "caution" },
  "noise-band": { title: "Noise band empty", severity: "note" },
};

export function warningWords(code: string): { title: string; severity: Severity } {
  return WORDS[code] ?? { title: code, severity: "note" };
}

export const SEVERITY_LOOK: Record<Severity, { shape: string; word: string; tone: string; rank: number }> = {
  clip: { shape: "■", word: "Fault", tone: "text-status-clip", rank: 0 },
  caution: { shape: "▲", word: "Caution", tone: "text-status-tight", rank: 1 },
  tight: { shape: "▲", word: "Watch", tone: "text-status-tight", rank: 2 },
  note: { shape: "○", word: "Note", tone: "text-graphite-500", rank: 3 },
};
