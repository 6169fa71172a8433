/** Worker thread of parallelChernNumbers: the Berry fluxes of one strip of plaquette rows. */
import { parentPort } from "node:worker_threads";
import { tightBindingModel, type TightBindingSpec } from "@helicoid/lib/dist/berry/blochModel.js";
import { chernStrip, type ChernOptions, type ChernPartial } from "@helicoid/lib/dist/berry/chernNumbers.js";

export interface ChernJob {
  id: number;
  spec: TightBindingSpec;
  options: ChernOptions;
  rowFrom: number;
  rowTo: number;
}

/** The reply to a job; a failure is posted as { id, error: { name, message } } (WorkerPool rejects). */
export interface ChernReply {
  id: number;
  part: ChernPartial;
}

parentPort?.on("message", (job: ChernJob) => {
  try {
    const part = chernStrip(tightBindingModel(job.spec), job.options, job.rowFrom, job.rowTo);
    const transfer = [...(part.flux ?? []), ...(part.energies ? [part.energies] : [])].map((a) => a.buffer as ArrayBuffer);
    parentPort!.postMessage({ id: job.id, part } satisfies ChernReply, transfer);
  } catch (err) {
    const e = err as Error;
    parentPort!.postMessage({ id: job.id, error: { name: e?.name ?? "Error", message: e?.message ?? String(err) } });
  }
});
