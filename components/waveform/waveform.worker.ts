/// <reference lib="webworker" />
/**
 * The waveform panel's worker: reads a chosen CSV (papaparse, the same reader the server checks
 * uploads with) and runs the time-domain engine, so a million-sample run never holds the page.
 */
import { planTimeDomain, stimulusWave } from "@/lib/engine/time-domain";
import { readResponseCsv, readWaveformCsv } from "@/lib/waveform-csv";
import type { WaveformRequest, WaveformResponse } from "./waveform-protocol";

const scope = self as unknown as DedicatedWorkerGlobalScope;

scope.onmessage = (e: MessageEvent<WaveformRequest>) => {
  const m = e.data;
  let out: WaveformResponse;
  const transfer: ArrayBuffer[] = [];
  try {
    if (m.type === "parse") {
      out =
        m.kind === "waveform"
          ? { type: "parsed", id: m.id, kind: "waveform", result: readWaveformCsv(m.text, { sampleRate: m.sampleRate, tolerance: m.tolerance }) }
          : { type: "parsed", id: m.id, kind: "response", result: readResponseCsv(m.text) };
    } else {
      const t0 = performance.now();
      const emf = "emf" in m ? m.emf : stimulusWave(m.stimulus, m.sampleRate, m.samples, m.offset);
      const run = planTimeDomain(m.chain, m.sampleRate).run(emf);
      out = { type: "ran", id: m.id, run, ms: performance.now() - t0 };
      const bufs = new Set<ArrayBuffer>([run.emf.buffer as ArrayBuffer, ...run.nodes.map((n) => n.v.buffer as ArrayBuffer)]);
      transfer.push(...bufs);
    }
  } catch (err) {
    out = { type: "failed", id: m.id, message: err instanceof Error ? err.message : String(err) };
  }
  scope.postMessage(out, transfer);
};
