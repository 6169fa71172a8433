/**
 * `helicoid run NOTEBOOK [-o OUT]`: execute a notebook in this process, without Jupyter, through
 * the same tslab executor the kernel uses. Cells run in order; stream, display, result and error
 * outputs are captured as nbformat outputs; the widget state is saved in the notebook metadata the
 * way Jupyter saves it. The first failing cell stops the run (as nbconvert does) and is reported
 * with its number and message. The input file is never modified.
 *
 * One notebook per process: tslab's executor is process-wide.
 */
import { readFileSync, writeFileSync, existsSync, statSync } from "node:fs";
import { dirname, resolve } from "node:path";
import { comms } from "../comm/comms.js";
import { resetPlotlyEmbedding } from "../display/figure.js";
import { currentContext, describeError, hookProcessStreams, realStderr, setFallbackContext, type OutputContext, type OutputSink } from "../display/output.js";
import { widgetStateDocument } from "../widgets/widget.js";
import {
  cellSource,
  helicoidKernelspec,
  NotebookError,
  parseNotebook,
  splitLines,
  typescriptLanguageInfo,
  WIDGET_STATE_MIME,
  type Notebook,
  type NotebookCell,
} from "./nbformat.js";
import { ExecutionSession } from "./session.js";

export interface RunFailure {
  cell: number;
  ename: string;
  evalue: string;
}

export interface RunResult {
  notebook: Notebook;
  failure: RunFailure | null;
  cellsRun: number;
  seconds: number;
  /** Timers the cells started that were still pending when the run ended (they were stopped). */
  pendingTimers?: number;
}

export type Output = Record<string, unknown>;

/** nbformat outputs store text as lists of lines; mime bundles too, for text types. */
function nbData(data: Record<string, unknown>): Record<string, unknown> {
  const out: Record<string, unknown> = {};
  for (const [k, v] of Object.entries(data)) out[k] = typeof v === "string" && (k.startsWith("text/") || k === "image/svg+xml") ? splitLines(v) : v;
  return out;
}

function cellSink(outputs: Output[], count: number): OutputSink {
  const byDisplayId = new Map<string, Output>();
  return {
    stream: (name, text) => {
      const last = outputs[outputs.length - 1];
      if (last && last.output_type === "stream" && last.name === name) last.text = [...(last.text as string[]), ...splitLines(text)];
      else outputs.push({ output_type: "stream", name, text: splitLines(text) });
    },
    display: (data, metadata = {}, transient = {}, update = false) => {
      const known = transient.display_id ? byDisplayId.get(transient.display_id) : undefined;
      if (update) {
        if (known) Object.assign(known, { data: nbData(data), metadata });
        return;
      }
      const o: Output = { output_type: "display_data", data: nbData(data), metadata };
      outputs.push(o);
      if (transient.display_id) byDisplayId.set(transient.display_id, o);
    },
    result: (data, metadata = {}) => outputs.push({ output_type: "execute_result", execution_count: count, data: nbData(data), metadata }),
    error: (ename, evalue, traceback) => outputs.push({ output_type: "error", ename, evalue, traceback }),
    clear: () => outputs.splice(0),
  };
}

export async function runNotebookFile(input: string, options: { out?: string; onCell?: (index: number, total: number) => void } = {}): Promise<RunResult> {
  const file = resolve(input);
  if (!existsSync(file)) throw new NotebookError(input, "no such file");
  const nb = parseNotebook(readFileSync(file, "utf8"), input);
  if (options.out && sameFile(options.out, file)) {
    throw new NotebookError(input, "the output path is the input notebook (or a link to it); choose another -o path (the input is never modified)");
  }
  const dir = dirname(file);
  process.chdir(dir);
  const result = await runNotebook(nb, dir, { onCell: options.onCell });
  if (options.out) writeFileSync(options.out, JSON.stringify(result.notebook, null, 1) + "\n");
  return result;
}

/** Are `a` and `b` the same file (same device and inode: a symbolic or hard link counts)? */
export function sameFile(a: string, b: string): boolean {
  try {
    const sa = statSync(a);
    const sb = statSync(b);
    return sa.dev === sb.dev && sa.ino === sb.ino;
  } catch {
    return false;
  }
}

export interface RunHooks {
  onCell?: (index: number, total: number) => void;
  /** A code cell starts (the watchdog of `helicoid run` arms its timer here). */
  cellStarted?: (index: number, count: number) => void;
  /** The outputs of cell `index` changed (for a parent process that keeps what a cell printed). */
  outputsChanged?: (index: number, outputs: Output[]) => void;
  /** Per-cell time limit in seconds (0: none). Only used to name an interrupt a timeout. */
  timeoutSeconds?: number;
  /** Was the interrupt of cell `index` the watchdog's (a timeout), not the user's Ctrl-C? */
  wasTimedOut?: (index: number) => Promise<boolean>;
  /** After the last cell, wait at most this long (ms) for timers the cells started. */
  settleMs?: number;
}

/** `process.exit()` called in a cell: the call is refused and shown under the cell. */
export class ProcessExitCalled extends Error {
  override readonly name = "ProcessExitCalled";
  constructor(code: unknown) {
    super(`process.exit called (code ${String(code ?? 0).slice(0, 40)}): a cell cannot end the run; the run stopped at this cell`);
  }
}

export function pendingTimers(): number {
  const info = (process as unknown as { getActiveResourcesInfo?: () => string[] }).getActiveResourcesInfo?.() ?? [];
  return info.filter((r) => r === "Timeout" || r === "Immediate").length;
}

export async function runNotebook(nb: Notebook, dir: string, hooksOrOnCell?: RunHooks | ((index: number, total: number) => void)): Promise<RunResult> {
  const hooks: RunHooks = typeof hooksOrOnCell === "function" ? { onCell: hooksOrOnCell } : (hooksOrOnCell ?? {});
  const t0 = performance.now();
  comms.channel = null;
  hookProcessStreams();
  resetPlotlyEmbedding();
  const session = new ExecutionSession(dir);
  let count = 0;
  let failure: RunFailure | null = null;
  const code = nb.cells.map((c, i) => [c, i] as const).filter(([c]) => c.cell_type === "code");
  // Which cell an output context belongs to, so an error thrown later by a cell's timer or promise
  // is shown under that cell.
  const cellOf = new Map<OutputSink, number>();
  const sinks = new Map<number, OutputSink>();
  let current = -1;
  let lastRan = -1;
  const asyncError = (err: unknown, how: string) => {
    const ctxSink = currentContext()?.sink;
    const index = (ctxSink && cellOf.get(ctxSink)) ?? (current >= 0 ? current : lastRan);
    const { ename, evalue, traceback } = describeError(err);
    const value = `${evalue} (${how})`;
    const sink = sinks.get(index);
    if (sink) sink.error(ename, value, traceback);
    else realStderr(`${ename}: ${value}\n`);
    failure ??= { cell: index + 1, ename, evalue: value };
  };
  const onException = (err: unknown) => asyncError(err, "thrown after the cell returned");
  const onRejection = (reason: unknown) => asyncError(reason, "a promise was rejected and nothing handled it");
  // SIGINT (Ctrl-C, or the watchdog of --timeout) interrupts the running cell and stops the run.
  let stopRequested = false;
  const onSigint = () => {
    stopRequested = true;
    session.interrupt();
  };
  process.on("uncaughtException", onException);
  process.on("unhandledRejection", onRejection);
  process.on("SIGINT", onSigint);
  const realExit = process.exit;
  process.exit = ((c?: number) => {
    throw new ProcessExitCalled(c);
  }) as typeof process.exit;
  try {
    // The TypeScript program is built before the first cell's clock starts.
    if (code.length > 0) session.warm();
    for (const [cell, index] of code) {
      if (stopRequested && !failure) {
        const evalue = "the run was interrupted (SIGINT) before this cell";
        cell.outputs = [{ output_type: "error", ename: "Interrupted", evalue, traceback: [`Interrupted: ${evalue}`] }];
        hooks.outputsChanged?.(index, cell.outputs);
        failure = { cell: index + 1, ename: "Interrupted", evalue };
      }
      if (failure) break;
      hooks.onCell?.(index, nb.cells.length);
      cell.outputs = [];
      cell.execution_count = ++count;
      current = index;
      const outputs = cell.outputs;
      const base = cellSink(outputs, count);
      const notify = hooks.outputsChanged;
      const sink: OutputSink = notify
        ? {
            stream: (n, t) => (base.stream(n, t), notify(index, outputs)),
            display: (d, m, t, u) => (base.display(d, m, t, u), notify(index, outputs)),
            result: (d, m) => (base.result(d, m), notify(index, outputs)),
            error: (e, v, t) => (base.error(e, v, t), notify(index, outputs)),
            clear: (w) => (base.clear(w), notify(index, outputs)),
          }
        : base;
      cellOf.set(sink, index);
      sinks.set(index, sink);
      const ctx: OutputContext = { sink };
      setFallbackContext(ctx);
      hooks.cellStarted?.(index, count);
      const started = performance.now();
      const outcome = await session.run(cellSource(cell), ctx);
      lastRan = index;
      current = -1;
      if (!outcome.ok) {
        const limit = hooks.timeoutSeconds ?? 0;
        const last = outputs[outputs.length - 1];
        const interrupted = /^(Script execution (was )?interrupted|Interrupted asynchronously)/.test(outcome.error?.evalue ?? "");
        const elapsed = (performance.now() - started) / 1000;
        const timedOut = limit > 0 && interrupted && (hooks.wasTimedOut ? await hooks.wasTimedOut(index) : elapsed >= limit - 0.05);
        if (timedOut && last?.output_type === "error") {
          const evalue = `cell ${index + 1} did not finish within ${limit} s (--timeout ${limit}); it was interrupted and the run stopped`;
          Object.assign(last, { ename: "TimeoutError", evalue, traceback: [`TimeoutError: ${evalue}`] });
          notify?.(index, outputs);
          failure ??= { cell: index + 1, ename: "TimeoutError", evalue };
        } else failure ??= { cell: index + 1, ename: outcome.error!.ename, evalue: outcome.error!.evalue };
      }
      if (failure) break;
    }
    // Let timers and promises the cells started settle before the state is saved; an error they
    // throw meanwhile is shown under the cell that started them (or the last cell).
    const settle = hooks.settleMs ?? 10;
    const until = performance.now() + settle;
    do await new Promise((r) => setTimeout(r, 10));
    while (performance.now() < until && pendingTimers() > 0 && !failure);
  } finally {
    process.exit = realExit;
    process.off("SIGINT", onSigint);
    // A late error after this point has no cell to go under: say so rather than crash.
    process.off("uncaughtException", onException);
    process.off("unhandledRejection", onRejection);
  }
  setFallbackContext(null);
  markExecuted(nb);
  const state = widgetStateDocument();
  if (Object.keys(state.state).length > 0) nb.metadata.widgets = { [WIDGET_STATE_MIME]: state };
  else delete nb.metadata.widgets;
  if (failure) nb.metadata.helicoid_run = { status: "stopped", cell: failure.cell, reason: `${failure.ename}: ${failure.evalue}` };
  else delete nb.metadata.helicoid_run;
  return { notebook: nb, failure, cellsRun: count, seconds: (performance.now() - t0) / 1000, pendingTimers: pendingTimers() };
}

function markExecuted(nb: Notebook): void {
  nb.metadata.kernelspec ??= helicoidKernelspec;
  nb.metadata.language_info = { ...typescriptLanguageInfo, ...((nb.metadata.language_info as object) ?? {}) };
  for (const c of nb.cells as NotebookCell[]) if (c.cell_type !== "code") delete c.outputs;
  addCellIds(nb);
}

/**
 * nbformat 4.5 requires an id on every cell; readers (nbformat 5.x, so Jupyter) invent random ids for
 * cells without one, so such a notebook's signature never checks (the trust check reads different
 * ids each time). Cells without an id get `cell-<number>` (unique in the notebook), as saving in
 * Jupyter would give them one; older minor versions have no ids and stay as they are.
 */
export function addCellIds(nb: Notebook): void {
  if (nb.nbformat !== 4 || nb.nbformat_minor < 5) return;
  const used = new Set(nb.cells.map((c) => c.id).filter((id): id is string => typeof id === "string"));
  let n = 0;
  for (const c of nb.cells) {
    if (typeof c.id === "string" && /^[a-zA-Z0-9-_]{1,64}$/.test(c.id)) continue;
    let id: string;
    do id = `cell-${++n}`;
    while (used.has(id));
    used.add(id);
    c.id = id;
  }
}
