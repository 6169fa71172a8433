/** Worker thread of computeInWorker: runs catalogue calculators, one job at a time, and posts each result. */
import { parentPort } from "node:worker_threads";
import { getCalculator, runCalculator } from "@helicoid/lib";
import { learnQuantities } from "@helicoid/lib/internal";

export interface CalculatorJob {
  id: string;
  inputs: Record<string, unknown>;
  options: Record<string, unknown>;
  /** Unit conversions the caller has made (text in an SI unit -> number), adopted before the run. */
  quantities?: Array<[string, number]>;
}

parentPort?.on("message", (job: CalculatorJob) => {
  try {
    if (Array.isArray(job.quantities)) learnQuantities(job.quantities);
    const result = runCalculator(getCalculator(job.id), job.inputs as never, job.options as never);
    parentPort!.postMessage({ result });
  } catch (err) {
    const e = err as Error & Record<string, unknown>;
    const fields: Record<string, unknown> = {};
    for (const k of Object.keys(e)) {
      try {
        fields[k] = structuredClone(e[k]);
      } catch {
        fields[k] = String(e[k]);
      }
    }
    parentPort!.postMessage({ error: { name: e?.name ?? "Error", message: e?.message ?? String(err), fields } });
  }
});
