/**
 * Lattice skyrmion number on several cores (Node worker threads): the plaquette rows of a layer are
 * split into equal blocks; the calling thread sums one block, each worker another, on the same
 * memory (SharedArrayBuffer). Same kernels and the same result as skyrmionNumber() of @helicoid/lib
 * up to the order of summation (differences ~1e-13). A field not yet in shared memory is copied once
 * (use readVectorFieldFile(path, { shared: true }) or toSharedField to avoid it).
 */
import { cpus } from "node:os";
import { InputError, type Boundary, type VectorField } from "@helicoid/lib";
import { wrapFlags, requireAtLeast, requireSomeMatter, solidAngleSumGeneral, solidAngleSumSquare } from "@helicoid/lib/internal";
import type { ChargeJob } from "./chargeWorker.js";
import { WorkerPool } from "./workerPool.js";

const pool = new WorkerPool<ChargeJob, { id: number; sum: number }>("chargeWorker.js");

/** Stop the worker threads (they are unref'd, so a process may also just exit). */
export async function closeChargeWorkers(): Promise<void> {
  await pool.close();
}

/** A copy of the field whose arrays live in shared memory. */
export function toSharedField(field: VectorField): VectorField {
  const m = new Float64Array(new SharedArrayBuffer(field.m.byteLength));
  m.set(field.m);
  let vacuum: Uint8Array | null = null;
  if (field.vacuum !== null) {
    vacuum = new Uint8Array(new SharedArrayBuffer(field.vacuum.byteLength));
    vacuum.set(field.vacuum);
  }
  return { ...field, m, vacuum };
}

export interface ParallelChargeResult {
  Q: number;
  threads: number;
  /** True when the field had to be copied into shared memory first. */
  copied: boolean;
}

export async function parallelSkyrmionNumber(field: VectorField, options: { boundary?: Boundary; layer?: number; threads?: number } = {}): Promise<ParallelChargeResult> {
  const { wrapX, wrapY } = wrapFlags(options.boundary);
  const layer = options.layer ?? 0;
  if (!Number.isInteger(layer) || layer < 0 || layer >= field.nz) throw new InputError("layer", options.layer, `a whole number from 0 to ${field.nz - 1}`);
  const threads = options.threads ?? Math.max(1, cpus().length);
  if (!Number.isInteger(threads) || threads < 1 || threads > 64) throw new InputError("threads", options.threads, "a whole number from 1 to 64");
  requireAtLeast(field, 2, 2, "the lattice skyrmion number (one plaquette needs 2x2 cells)");
  requireSomeMatter(field, "the skyrmion number");
  const rows = wrapY ? field.ny : field.ny - 1;
  const blocks = Math.min(threads, rows);
  const triangular = field.lattice === "triangular";
  const shared = field.m.buffer instanceof SharedArrayBuffer && (field.vacuum === null || field.vacuum.buffer instanceof SharedArrayBuffer);
  const f = shared ? field : toSharedField(field);
  const base = layer * f.nx * f.ny;
  const sumRows = (j0: number, j1: number) =>
    f.vacuum === null && !triangular
      ? solidAngleSumSquare(f.m, f.nx, f.ny, base, j0, j1, wrapX)
      : solidAngleSumGeneral(f.m, f.vacuum, f.nx, f.ny, base, j0, j1, wrapX, triangular, null, null);
  const edges = Array.from({ length: blocks + 1 }, (_, b) => Math.round((b * rows) / blocks));
  pool.ensure(blocks - 1);
  const promises: Promise<{ sum: number }>[] = [];
  for (let b = 1; b < blocks; b++) {
    promises.push(pool.run(b - 1, { m: f.m, vacuum: f.vacuum, nx: f.nx, ny: f.ny, base, j0: edges[b]!, j1: edges[b + 1]!, wrapX, triangular }));
  }
  let sum = sumRows(edges[0]!, edges[1]!);
  for (const r of await Promise.all(promises)) sum += r.sum;
  return { Q: sum / (4 * Math.PI), threads: blocks, copied: !shared };
}
