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
import { Worker } from "node:worker_threads";
import { existsSync } from "node:fs";
import { join } from "node:path";
import { cpus } from "node:os";
import {
  InputError, checkChernInput, chernStrip, combineChernStrips, tightBindingModel,
  type ChernOptions, type ChernPartial, type ChernResult, type TightBindingSpec, type TightBindingModel,
} from "@helicoid/lib";
import type { ChernJob, ChernReply } from "./chernWorker.js";

let pool: Worker[] = [];
let nextId = 1;
const pending = new Map<number, { resolve: (v: ChernPartial) => void; reject: (e: unknown) => void }>();

function workerScript(): string {
  const here = join(__dirname, "chernWorker.js");
  if (existsSync(here)) return here;
  // running from the TypeScript sources (tests): use the build
  return join(__dirname, "..", "..", "dist", "parallel", "chernWorker.js");
}

function ensurePool(n: number): Worker[] {
  while (pool.length < n) {
    const w = new Worker(workerScript());
    w.unref();
    w.on("message", (msg: ChernReply) => {
      const p = pending.get(msg.id);
      if (!p) return;
      pending.delete(msg.id);
      if ("part" in msg) p.resolve(msg.part);
      else {
        const err = new Error(msg.error.message);
        err.name = msg.error.name;
        p.reject(err);
      }
    });
    w.on("error", (err) => {
      for (const p of pending.values()) p.reject(err);
      pending.clear();
      pool = pool.filter((x) => x !== w);
    });
    pool.push(w);
  }
  return pool;
}

/** Stop the worker threads (they are unref'd, so a process may also just exit). */
export async function closeChernWorkers(): Promise<void> {
  const p = pool;
  pool = [];
  await Promise.all(p.map((w) => w.terminate()));
}

export interface ParallelChernOptions extends ChernOptions {
  /** Threads including the calling one (default: the number of cores). */
  threads?: number;
}

export async function parallelChernNumbers(model: TightBindingSpec | TightBindingModel, options: ParallelChernOptions = {}): Promise<ChernResult & { threads: number }> {
  const spec: TightBindingSpec | undefined = "spec" in model ? model.spec : "hoppings" in model ? model : undefined;
  if (!spec) {
    throw new InputError("model", typeof model, "a tight-binding spec or a model made by tightBindingModel / supercellModel / haldaneModel (a model given as a function cannot be sent to worker threads: use chernNumbers)");
  }
  const { threads: threadsOpt, ...chernOptions } = options;
  const threads = threadsOpt ?? Math.max(1, cpus().length);
  if (!Number.isInteger(threads) || threads < 1 || threads > 64) throw new InputError("threads", threadsOpt, "a whole number from 1 to 64");
  const local = "spec" in model ? model : tightBindingModel(spec);
  const n2 = chernOptions.n2 ?? chernOptions.n1 ?? 60;
  const blocks = Number.isInteger(n2) && n2 >= 3 ? Math.min(threads, n2) : 1;
  const edges = Array.from({ length: blocks + 1 }, (_, b) => Math.round((b * n2) / blocks));
  // Bad input throws here, in the calling thread, before any job is sent.
  checkChernInput(local, chernOptions);
  const workers = blocks > 1 ? ensurePool(blocks - 1) : [];
  const jobs: Promise<ChernPartial>[] = [];
  for (let b = 1; b < blocks; b++) {
    const id = nextId++;
    const job: ChernJob = { id, spec, options: chernOptions, rowFrom: edges[b]!, rowTo: edges[b + 1]! };
    jobs.push(new Promise<ChernPartial>((resolve, reject) => pending.set(id, { resolve, reject })));
    workers[b - 1]!.postMessage(job);
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
