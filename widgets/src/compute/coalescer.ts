/**
 * Coalesces recompute requests while a slider moves: at most one job is in flight; newer requests
 * replace the waiting one, so the last position is always computed and stale ones are skipped.
 * Runs jobs in a Web Worker when one can be started, else on the page (still coalesced).
 */
import type { ComputeJob, ComputeOutcome } from "./job.js";
import { runJob } from "./runJob.js";
// Replaced at build time by the worker bundle's source text (see widgets/build.mjs).
import workerSource from "helicoid:worker-source";

type Sink = (outcome: ComputeOutcome) => void;

let sharedWorker: Worker | null | undefined;
let workerUrl: string | undefined;

/** One worker per page, shared by every explorer. `null` when workers are not available. */
function pageWorker(): Worker | null {
  if (sharedWorker !== undefined) return sharedWorker;
  try {
    if (typeof Worker === "undefined" || !workerSource) throw new Error("no Worker");
    workerUrl = URL.createObjectURL(new Blob([workerSource], { type: "text/javascript" }));
    sharedWorker = new Worker(workerUrl);
  } catch {
    sharedWorker = null;
  }
  return sharedWorker;
}

let nextChannel = 1;
const sinks = new Map<number, (o: ComputeOutcome) => void>();
/** Coalescers to move to the page if the worker fails. */
const live = new Set<Coalescer>();
let listening = false;

export class Coalescer {
  private seq = 0;
  private inFlight: ComputeJob | null = null;
  private waiting: ComputeJob | null = null;
  private readonly channel = nextChannel++;
  /** Where jobs run: "worker" or "page" (the page also when the worker failed). */
  where: "worker" | "page";

  constructor(private readonly sink: Sink, useWorker = true) {
    const w = useWorker ? pageWorker() : null;
    this.where = w ? "worker" : "page";
    if (w) {
      sinks.set(this.channel, (o) => this.done(o));
      if (!listening) {
        listening = true;
        w.addEventListener("message", (e: MessageEvent<ComputeOutcome>) => {
          const ch = Math.floor(e.data.seq / 1e9);
          sinks.get(ch)?.(e.data);
        });
        w.addEventListener("error", (e) => {
          console.error("helicoid compute worker failed; computing on the page instead", e);
          sharedWorker = null;
          for (const c of live) c.moveToPage();
        });
      }
    }
    live.add(this);
  }

  /** The worker failed: run the job it held (and all later ones) on the page. */
  moveToPage(): void {
    this.where = "page";
    const job = this.inFlight;
    if (job) this.start(job);
  }

  /** Ask for a recompute; the sink gets the outcome of the newest request. */
  submit(job: Omit<ComputeJob, "seq">): number {
    const full: ComputeJob = { ...job, seq: this.channel * 1e9 + ++this.seq };
    if (this.inFlight) {
      this.waiting = full;
    } else {
      this.start(full);
    }
    return full.seq;
  }

  /** True while a job is running or waiting. */
  get busy(): boolean {
    return this.inFlight !== null || this.waiting !== null;
  }

  dispose(): void {
    sinks.delete(this.channel);
    live.delete(this);
    this.waiting = null;
  }

  private start(job: ComputeJob): void {
    this.inFlight = job;
    if (this.where === "worker" && sharedWorker) {
      sharedWorker.postMessage(job);
    } else {
      // Yield to the page first so several slider events can coalesce.
      setTimeout(() => this.done(runJob(job)), 0);
    }
  }

  private done(outcome: ComputeOutcome): void {
    this.inFlight = null;
    const next = this.waiting;
    this.waiting = null;
    if (next) this.start(next);
    // An outcome superseded by a waiting job is still reported (it is the newest finished one);
    // the view ignores outcomes older than the last one it applied.
    this.sink(outcome);
  }
}
