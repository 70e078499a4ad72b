/** Messages between the waveform panel and its worker (waveform.worker.ts). */
import type { Chain } from "@/lib/chain/types";
import type { Stimulus, WaveformRun } from "@/lib/engine/time-domain";
import type { CsvResult, ResponseData, WaveformData } from "@/lib/waveform-csv";

export type WaveformRequest =
  | { type: "parse"; id: number; kind: "waveform"; text: string; sampleRate: number | null; tolerance?: number }
  | { type: "parse"; id: number; kind: "response"; text: string }
  | { type: "run"; id: number; chain: Chain; sampleRate: number; emf: Float64Array }
  | { type: "run"; id: number; chain: Chain; sampleRate: number; stimulus: Stimulus; samples: number; offset: number };

export type WaveformResponse =
  | { type: "parsed"; id: number; kind: "waveform"; result: CsvResult<WaveformData> }
  | { type: "parsed"; id: number; kind: "response"; result: CsvResult<ResponseData> }
  | { type: "ran"; id: number; run: WaveformRun; ms: number }
  | { type: "failed"; id: number; message: string };
