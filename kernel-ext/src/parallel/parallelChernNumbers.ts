/**
 * Chern numbers on several cores (Node worker threads): the plaquette rows of the zone are split
 * into equal strips (chernStrip of @helicoid/lib); the calling thread computes one strip, each
 * worker another, and combineChernStrips merges them. The result is that of chernNumbers() up to
 * the order of summation of the fluxes (differences ~1e-15 in chernSum; the integers, flux maps,
 * gaps and checks are identical). The model must be plain data (a tight-binding spec, or a model
 * built by tightBindingModel / supercellModel / haldaneModel, which carries its spec): a function
 * cannot be sent to another thread, so use chernNumbers() for models given as functions.
 * Each strip diagonalizes one row more than it owns (the row above its last), a cost of
 * (threads - 1) / n2 of the work.
 */
import { cpus } from "node:os";
import { InputError, tightBindingModel, type ChernOptions, type ChernResult, type TightBindingSpec, type TightBindingModel } from "@helicoid/lib";
import { checkChernInput, chernStrip, combineChernStrips, type ChernPartial } from "@helicoid/lib/internal";
import type { ChernJob, ChernReply } from "./chernWorker.js";
import { WorkerPool } from "./workerPool.js";

const pool = new WorkerPool<ChernJob, ChernReply>("chernWorker.js");

/** Stop the worker threads (they are unref'd, so a process may also just exit). */
export async function closeChernWorkers(): Promise<void> {
  await pool.close();
}

export interface ParallelChernOptions extends ChernOptions {
  /** Threads including the calling one (default: the number of cores). */
  threads?: number;
}

export async function parallelChernNumbers(model: TightBindingSpec | TightBindingModel, options: ParallelChernOptions = {}): Promise<ChernResult & { threads: number }> {
  const spec: TightBindingSpec | undefined = "spec" in model ? model.spec : "hoppings" in model ? model : undefined;
  if (!spec) {
    throw new InputError(
      "model",
      `a model without a tight-binding spec (${(model as { name?: string }).name ?? "unnamed"})`,
      "a tight-binding spec or a model made by tightBindingModel / supercellModel / haldaneModel (a model given as a function cannot be sent to worker threads: use chernNumbers)",
    );
  }
  const { threads: threadsOpt, ...chernOptions } = options;
  const threads = threadsOpt ?? Math.max(1, cpus().length);
  if (!Number.isInteger(threads) || threads < 1 || threads > 64) throw new InputError("threads", threadsOpt, "a whole number from 1 to 64");
  const local = "spec" in model ? model : tightBindingModel(spec);
  // Bad input throws here, in the calling thread, before any job is sent.
  const { n2 } = checkChernInput(local, chernOptions);
  const blocks = Math.min(threads, n2);
  const edges = Array.from({ length: blocks + 1 }, (_, b) => Math.round((b * n2) / blocks));
  pool.ensure(blocks - 1);
  const jobs: Promise<ChernPartial>[] = [];
  for (let b = 1; b < blocks; b++) {
    jobs.push(pool.run(b - 1, { spec, options: chernOptions, rowFrom: edges[b]!, rowTo: edges[b + 1]! }).then((r) => r.part));
  }
  let first: ChernPartial;
  try {
    first = chernStrip(local, chernOptions, edges[0]!, edges[1]!);
  } catch (err) {
    await Promise.allSettled(jobs); // no unhandled rejections from the workers' strips
    throw err;
  }
  const parts = [first, ...(await Promise.all(jobs))];
  return { ...combineChernStrips(local, chernOptions, parts), threads: blocks };
}
