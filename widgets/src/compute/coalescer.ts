/**
 * Coalesces recompute requests while a slider moves: at most one job is in flight; newer requests
 * replace the waiting one, so the last position is always computed and stale ones are skipped.
 * Runs jobs in a Web Worker when one can be started, else on the page (still coalesced). The worker
 * starts on the first job (or on `prewarm()`, when the person points at an explorer), not at page
 * load: a page whose explorers show their saved results never pays for it.
 */
import type { ComputeJob, ComputeOutcome } from "./job.js";
import { runJob } from "./runJob.js";
// Replaced at build time by the worker bundle's source text (see widgets/build.mjs).
import workerSource from "helicoid:worker-source";

type Sink = (outcome: ComputeOutcome) => void;

let sharedWorker: Worker | null | undefined;
let workerUrl: string | undefined;

/** Whether this page can start a worker at all (checked without starting one). */
function workerPossible(): boolean {
  return sharedWorker !== null && typeof Worker !== "undefined" && typeof Blob !== "undefined" && !!workerSource;
}

/** One worker per page, shared by every explorer, started on first use. `null` when workers are not available. */
function pageWorker(): Worker | null {
  if (sharedWorker !== undefined) return sharedWorker;
  try {
    if (!workerPossible()) throw new Error("no Worker");
    const source = typeof workerSource === "function" ? workerSource() : workerSource;
    if (!source) throw new Error("no worker source");
    workerUrl = URL.createObjectURL(new Blob([source], { type: "text/javascript" }));
    sharedWorker = new Worker(workerUrl);
  } catch {
    sharedWorker = null;
  }
  if (sharedWorker) listen(sharedWorker);
  return sharedWorker;
}

function listen(w: Worker): void {
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

let nextChannel = 1;
const sinks = new Map<number, (o: ComputeOutcome) => void>();
/** Coalescers to move to the page if the worker fails. */
const live = new Set<Coalescer>();

export class Coalescer {
  private seq = 0;
  private inFlight: ComputeJob | null = null;
  private waiting: ComputeJob | null = null;
  private readonly channel = nextChannel++;
  /** Where jobs run: "worker" or "page" (the page also when the worker failed). */
  where: "worker" | "page";

  constructor(
    private readonly sink: Sink,
    useWorker = true,
  ) {
    this.where = useWorker && workerPossible() ? "worker" : "page";
    if (this.where === "worker") sinks.set(this.channel, (o) => this.done(o));
    live.add(this);
  }

  /** Start the page's worker now (it is about to be needed), so the first job does not wait for it. */
  prewarm(): void {
    if (this.where === "worker" && !pageWorker()) this.where = "page";
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
    const w = this.where === "worker" ? pageWorker() : null;
    if (this.where === "worker" && !w) this.where = "page";
    if (w) {
      w.postMessage(job);
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
