/** Worker thread of parallelSkyrmionNumber: sums solid angles over a row range of a shared field. */
import { parentPort } from "node:worker_threads";
// The kernel module alone (not the whole library index), so a worker starts fast.
import { solidAngleSumGeneral, solidAngleSumSquare } from "@helicoid/lib/dist/topology/latticeKernel.js";

export interface ChargeJob {
  id: number;
  m: Float64Array;
  vacuum: Uint8Array | null;
  nx: number;
  ny: number;
  base: number;
  j0: number;
  j1: number;
  wrapX: boolean;
  triangular: boolean;
}

parentPort?.on("message", (job: ChargeJob) => {
  const sum =
    job.vacuum === null && !job.triangular
      ? solidAngleSumSquare(job.m, job.nx, job.ny, job.base, job.j0, job.j1, job.wrapX)
      : solidAngleSumGeneral(job.m, job.vacuum, job.nx, job.ny, job.base, job.j0, job.j1, job.wrapX, job.triangular, null, null);
  parentPort!.postMessage({ id: job.id, sum });
});
