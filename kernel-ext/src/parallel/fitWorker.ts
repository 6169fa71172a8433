/**
 * Worker thread of the fit panel: runs one profile fit (`fitProfile` with a catalogue model id),
 * posts its progress after every accepted iteration and its result; a shared flag set by the panel's
 * Stop button ends the fit between evaluations (the result then has status "stopped").
 */
import { parentPort } from "node:worker_threads";
import { fitProfile, type FitProfileOptions, type ProfileData } from "@helicoid/lib";

export interface FitJob {
  data: ProfileData;
  model: string;
  options: FitProfileOptions;
  /** Int32Array over a SharedArrayBuffer: 1 = stop. */
  stop: SharedArrayBuffer;
}

export type FitWorkerMessage =
  | { progress: { iteration: number; evaluations: number; sumOfSquares: number } }
  | { result: ReturnType<typeof fitProfile> }
  | { error: { name: string; message: string; parameter?: string } };

parentPort?.on("message", (job: FitJob) => {
  const flag = new Int32Array(job.stop);
  const signal = {
    get aborted() {
      return Atomics.load(flag, 0) === 1;
    },
  };
  try {
    const result = fitProfile(job.data, job.model, {
      ...job.options,
      signal,
      onProgress: (p) => parentPort!.postMessage({ progress: { iteration: p.iteration, evaluations: p.evaluations, sumOfSquares: p.sumOfSquares } } satisfies FitWorkerMessage),
    });
    parentPort!.postMessage({ result } satisfies FitWorkerMessage);
  } catch (err) {
    const e = err as Error & { parameter?: string };
    parentPort!.postMessage({
      error: { name: e?.name ?? "Error", message: e?.message ?? String(err), ...(e?.parameter ? { parameter: e.parameter } : {}) },
    } satisfies FitWorkerMessage);
  }
});
