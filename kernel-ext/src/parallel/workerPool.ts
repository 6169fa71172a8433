/**
 * A lazily grown pool of Node worker threads running one script, with request ids: a job is
 * posted with an id and the worker answers `{ id, ... }`; `{ id, error: { name, message } }`
 * rejects. Workers are unref'd (a process may exit without closing the pool).
 * Common practice, no source.
 */
import { Worker, type TransferListItem } from "node:worker_threads";
import { existsSync } from "node:fs";
import { join } from "node:path";

export interface WorkerReplyError {
  id: number;
  error: { name: string; message: string };
}

export class WorkerPool<Job extends { id: number }, Reply extends { id: number }> {
  private workers: Worker[] = [];
  private nextId = 1;
  private readonly pending = new Map<number, { resolve: (v: Reply) => void; reject: (e: unknown) => void }>();

  /** `script`: the built worker file next to this module (dist/parallel/NAME.js). */
  constructor(private readonly script: string) {}

  private scriptPath(): string {
    const here = join(__dirname, this.script);
    if (existsSync(here)) return here;
    // running from the TypeScript sources (tests): use the build
    return join(__dirname, "..", "..", "dist", "parallel", this.script);
  }

  /** Make sure at least n workers exist. */
  ensure(n: number): void {
    while (this.workers.length < n) {
      const w = new Worker(this.scriptPath());
      w.unref();
      w.on("message", (msg: Reply | WorkerReplyError) => {
        const p = this.pending.get(msg.id);
        if (!p) return;
        this.pending.delete(msg.id);
        if ("error" in msg && msg.error && typeof (msg.error as { message?: unknown }).message === "string") {
          const e = (msg as WorkerReplyError).error;
          const err = new Error(e.message);
          err.name = e.name;
          p.reject(err);
        } else p.resolve(msg as Reply);
      });
      w.on("error", (err) => {
        for (const p of this.pending.values()) p.reject(err);
        this.pending.clear();
        this.workers = this.workers.filter((x) => x !== w);
      });
      this.workers.push(w);
    }
  }

  /** Post a job (its id is set here) to worker `index` (< ensure(n)'s n); resolves with the reply. */
  run(index: number, job: Omit<Job, "id">, transfer: TransferListItem[] = []): Promise<Reply> {
    const worker = this.workers[index];
    if (!worker) throw new Error(`worker ${index} of ${this.workers.length} does not exist (call ensure first)`);
    const id = this.nextId++;
    const promise = new Promise<Reply>((resolve, reject) => this.pending.set(id, { resolve, reject }));
    worker.postMessage({ ...job, id }, transfer);
    return promise;
  }

  /** Stop the workers; the pool can grow again afterwards. */
  async close(): Promise<void> {
    const w = this.workers;
    this.workers = [];
    await Promise.all(w.map((x) => x.terminate()));
  }
}
