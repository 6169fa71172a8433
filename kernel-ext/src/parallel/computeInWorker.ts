/**
 * Run a catalogue calculator on a worker thread, so that a long computation (a dense sweep, a fit,
 * a large exact diagonalization) does not hold the kernel: while it runs, the cell shows how long
 * it has been running (one line, updated in place every half second), other output of the notebook
 * keeps flowing, and an interrupt (the stop button, SIGINT or interrupt_request) ends the worker at
 * once. The calculators report no fraction done, so the progress shown is the time elapsed.
 *
 *   const r = await computeInWorker("skyrmion", { B: "50 mT" }, { sweep: { over: "B", from: 0.01, to: 0.2, points: 5000 } });
 *
 * The result is the same object `runCalculator` returns (computed by the same library code).
 */
import { existsSync } from "node:fs";
import { join } from "node:path";
import { Worker } from "node:worker_threads";
import type { CalculatorId, CalculatorInputs, CalculatorResult, ComputeOptions, QuantityInput, ResultOf, SpecById } from "@helicoid/lib";
import { coerceInputs, getCalculator } from "@helicoid/lib";
import { knownQuantityConversions } from "@helicoid/lib/internal";
import { currentContext, realTimers } from "../display/output.js";

let displays = 0;
const ignore = () => {};
/** A worker kept after a finished job (loading the library takes a while), unref'd so it never holds the process. */
let idle: Worker | null = null;

function workerScript(): string {
  const here = join(__dirname, "calculatorWorker.js");
  return existsSync(here) ? here : join(__dirname, "..", "..", "dist", "parallel", "calculatorWorker.js");
}

export interface WorkerComputeOptions extends ComputeOptions {
  /** Show the elapsed-time line in the cell (default true). */
  progress?: boolean;
}

/** A calculator of the catalogue by id: typed inputs (a film accepted) and a typed result, as `runCalculator`. */
export function computeInWorker<Id extends CalculatorId>(id: Id, inputs?: CalculatorInputs<SpecById<Id>>, options?: WorkerComputeOptions): Promise<ResultOf<SpecById<Id>>>;
/** An id held in a `string` variable (a literal id must be one of the catalogue's). */
export function computeInWorker<T extends string>(
  id: string extends T ? T : never,
  inputs?: Record<string, QuantityInput | undefined>,
  options?: WorkerComputeOptions,
): Promise<CalculatorResult>;
export function computeInWorker(id: string, inputs: object = {}, options: WorkerComputeOptions = {}): Promise<CalculatorResult> {
  const { progress = true, ...compute } = options;
  const ctx = currentContext();
  const displayId = `helicoid-progress-${process.pid}-${++displays}`;
  const t0 = Date.now();
  const show = (text: string, update: boolean) => {
    if (!progress || !ctx) return;
    ctx.sink.display({ "text/plain": text }, {}, { display_id: displayId }, update);
  };
  return new Promise<CalculatorResult>((resolve, reject) => {
    const worker = idle ?? new Worker(workerScript());
    idle = null;
    worker.ref();
    let settled = false;
    show(`${id}: computing on a worker thread ...`, false);
    // The real timers: this line is the kernel's own, not work of the cell to be tracked.
    const tick = realTimers.setInterval(() => show(`${id}: computing on a worker thread ... ${((Date.now() - t0) / 1000).toFixed(1)} s`, true), 500);
    const finish = (fn: () => void, keep = false) => {
      if (settled) return;
      settled = true;
      realTimers.clearInterval(tick);
      removeHook?.();
      worker.off("message", onMessage);
      worker.off("error", onError);
      worker.off("exit", onExit);
      if (keep && idle === null) {
        worker.unref();
        worker.off("error", ignore);
        worker.on("error", ignore);
        idle = worker;
        worker.once("exit", () => {
          if (idle === worker) idle = null;
        });
      } else void worker.terminate();
      fn();
    };
    const removeHook = ctx?.work?.onCancel(() => {
      show(`${id}: interrupted after ${((Date.now() - t0) / 1000).toFixed(1)} s`, true);
      finish(() => reject(new Error(`${id}: interrupted; the worker thread was stopped`)));
    });
    const onMessage = (m: { result?: CalculatorResult; error?: { name: string; message: string; fields: Record<string, unknown> } }) => {
      if (m.result) {
        show(`${id}: done in ${((Date.now() - t0) / 1000).toFixed(1)} s`, true);
        finish(() => resolve(m.result!), true);
      } else {
        const e = Object.assign(new Error(m.error?.message ?? "the computation failed"), m.error?.fields ?? {});
        e.name = m.error?.name ?? "Error";
        show(`${id}: failed after ${((Date.now() - t0) / 1000).toFixed(1)} s`, true);
        finish(() => reject(e), true);
      }
    };
    const onError = (err: Error) => finish(() => reject(err));
    const onExit = (code: number) => finish(() => reject(new Error(`${id}: the worker thread ended (exit code ${code}) without a result`)));
    worker.on("message", onMessage);
    worker.on("error", onError);
    worker.on("exit", onExit);
    worker.postMessage({ id, inputs, options: compute, quantities: conversionsFor(id, inputs) });
  });
}

/**
 * The unit conversions of a job's inputs, made here (the kernel has mathjs set up) and handed to the
 * worker, which then need not build mathjs for them (about 0.15 s of CPU per new thread). The worker
 * still reads every input itself: a text this thread could not convert is left to it, and its
 * errors and notes are the same as runCalculator's.
 */
function conversionsFor(id: string, inputs: object): Array<[string, number]> {
  try {
    coerceInputs(getCalculator(id), inputs as never);
  } catch {
    // the worker reports it, with runCalculator's words
  }
  return knownQuantityConversions();
}
