/**
 * Where output goes. Every piece of code the kernel runs (a cell, a widget callback, a timer a cell
 * started) runs inside an output context carried by AsyncLocalStorage, so a `console.log` or a
 * `display()` after an `await` still reaches the cell (or widget output) it belongs to.
 *
 * The kernel's contexts publish on iopub with the right parent header; the in-process notebook
 * runner's contexts append nbformat outputs to the cell; an Output widget's context appends to the
 * widget's `outputs` state.
 */
import { AsyncLocalStorage } from "node:async_hooks";
import { formatWithOptions, promisify } from "node:util";
import * as vm from "node:vm";

export type MimeBundle = Record<string, unknown>;

export interface OutputSink {
  stream(name: "stdout" | "stderr", text: string): void;
  display(data: MimeBundle, metadata?: Record<string, unknown>, transient?: { display_id?: string }, update?: boolean): void;
  /** The value of a cell's last expression (an `execute_result`). Sinks outside a cell show it as display data. */
  result(data: MimeBundle, metadata?: Record<string, unknown>): void;
  error(ename: string, evalue: string, traceback: string[]): void;
  clear(wait: boolean): void;
}

export interface OutputContext {
  sink: OutputSink;
  /** The header of the message this work answers (kernel only), used as parent of comm messages. */
  parent?: Record<string, unknown>;
  /** What to call widgets displayed here: the kernel attaches a callback-output area to each. */
  onWidgetDisplayed?: (modelId: string) => void;
  /** The timers this work started (kernel only): cleared on interrupt; their errors shown here. */
  work?: Work;
}

type TimerHandle = { ref?: () => unknown } | number;

/**
 * The pending work of one request (a cell, or a widget message): the timers, intervals and
 * immediates its code started. An interrupt clears them and cancels the work, so an asynchronous
 * loop that waits on a timer stops; a cancelled work starts no new timers.
 */
export class Work {
  readonly timers = new Set<TimerHandle>();
  private cancelHooks = new Set<() => void>();
  cancelled = false;

  /** Run `fn` if this work is cancelled (e.g. stop a worker thread it started). Returns a remover. */
  onCancel(fn: () => void): () => void {
    this.cancelHooks.add(fn);
    liveWork.add(this);
    return () => {
      this.cancelHooks.delete(fn);
      if (this.timers.size === 0 && this.cancelHooks.size === 0) liveWork.delete(this);
    };
  }

  cancel(): void {
    this.cancelled = true;
    for (const t of this.timers) clearAny(t);
    this.timers.clear();
    for (const fn of this.cancelHooks) {
      try {
        fn();
      } catch {
        // a hook that fails does not keep the others from running
      }
    }
    this.cancelHooks.clear();
    liveWork.delete(this);
  }
}
const liveWork = new Set<Work>();

/** Cancel the pending work of every request so far (what an interrupt does). Returns the number of timers cleared. */
export function cancelAllWork(): number {
  let n = 0;
  for (const w of [...liveWork]) {
    n += w.timers.size;
    w.cancel();
  }
  return n;
}

const key = Symbol.for("helicoid.outputContext");
type Registry = { als: AsyncLocalStorage<OutputContext>; fallback: OutputContext | null };
const g = globalThis as unknown as Record<symbol, Registry>;
const registry: Registry = (g[key] ??= { als: new AsyncLocalStorage<OutputContext>(), fallback: null });

/** Run `fn` with `ctx` as the output context of everything it does, including later async work. */
export function runInContext<T>(ctx: OutputContext, fn: () => T): T {
  return registry.als.run(ctx, fn);
}

/** The current output context: the one of the running cell or callback, else the last cell's. */
export function currentContext(): OutputContext | null {
  return registry.als.getStore() ?? registry.fallback;
}

/** Set the context used by work that has none of its own (e.g. a callback of a closed-over event). */
export function setFallbackContext(ctx: OutputContext | null): void {
  registry.fallback = ctx;
}

/** A sink that writes to the process's real stdout/stderr (used when no kernel context exists). */
export const consoleSink: OutputSink = {
  stream: (name, text) => (name === "stdout" ? realStdout : realStderr)(text),
  display: (data) => realStdout(String(data["text/plain"] ?? "[display]") + "\n"),
  result: (data) => realStdout(String(data["text/plain"] ?? "") + "\n"),
  error: (ename, evalue, tb) => realStderr((tb.length ? tb.join("\n") : `${ename}: ${evalue}`) + "\n"),
  clear: () => {},
};

const origStdoutWrite = process.stdout.write.bind(process.stdout);
const origStderrWrite = process.stderr.write.bind(process.stderr);
function realStdout(text: string): void {
  origStdoutWrite(text);
}
function realStderr(text: string): void {
  origStderrWrite(text);
}
export { realStdout, realStderr };

const realTimers = {
  setTimeout: globalThis.setTimeout,
  setInterval: globalThis.setInterval,
  setImmediate: globalThis.setImmediate,
  clearTimeout: globalThis.clearTimeout,
  clearInterval: globalThis.clearInterval,
  clearImmediate: globalThis.clearImmediate,
};
export { realTimers };
const workOf = Symbol("helicoid.work");
const kindOfTimer = Symbol("helicoid.timerKind");
function clearAny(t: TimerHandle): void {
  const kind = (t as Record<symbol, unknown>)[kindOfTimer];
  if (kind === "immediate") realTimers.clearImmediate(t as unknown as NodeJS.Immediate);
  else realTimers.clearTimeout(t as unknown as NodeJS.Timeout);
}

/**
 * Run `fn` so that SIGINT stops it, as tslab runs a cell (`vm` with `breakOnSigint`): a widget
 * callback or a timer of a cell in an endless loop is interrupted like the cell itself. The error
 * thrown is then the interrupt's ("Script execution was interrupted by `SIGINT`").
 */
const callSlot = Symbol.for("helicoid.interruptibleCall");
const callScript = new vm.Script(`globalThis[Symbol.for("helicoid.interruptibleCall")]()`, { filename: "helicoid-callback.js" });
let interruptibleDepth = 0;
export function interruptibly<T>(fn: () => T): T {
  if (interruptibleDepth > 0) return fn();
  const g = globalThis as unknown as Record<symbol, unknown>;
  g[callSlot] = fn;
  interruptibleDepth++;
  try {
    return callScript.runInThisContext({ breakOnSigint: true }) as T;
  } finally {
    interruptibleDepth--;
    g[callSlot] = undefined;
  }
}

let interruptAll: () => void = () => void cancelAllWork();
/**
 * What an interrupt does (the kernel sets it: interrupt the running cell and cancel pending work).
 * Called also when SIGINT stopped a callback or timer: the signal is then consumed by that code, and
 * the cell that may be awaiting must be interrupted as well.
 */
export function setInterruptHandler(fn: () => void): void {
  interruptAll = fn;
}
export function interruptEverything(): void {
  interruptAll();
}

/** Is `err` the error of code stopped by SIGINT (tslab's cells, `interruptibly`)? */
export function isInterruption(err: unknown): boolean {
  return err instanceof Error && /interrupted by `?SIGINT`?|Interrupted asynchronously/.test(err.message);
}

function liveWorkCheck(work: Work): void {
  if ((work as unknown as { cancelHooks: Set<unknown> }).cancelHooks.size === 0) liveWork.delete(work);
}

function forget(work: Work, handle: TimerHandle): void {
  work.timers.delete(handle);
  if (work.timers.size === 0 && !work.cancelled) liveWorkCheck(work);
}

let timersHooked = false;
/**
 * Track the timers started by work that runs in a context with a `work` (the kernel's requests):
 * each timer's callback runs in its context, interruptibly, and an exception it throws is shown as
 * an error output of that context (the cell that started it) instead of ending up on stderr.
 */
export function hookTimers(): void {
  if (timersHooked) return;
  timersHooked = true;
  const g = globalThis as unknown as Record<string, unknown>;
  const wrap = (kind: "timeout" | "interval" | "immediate") => {
    const start = kind === "timeout" ? realTimers.setTimeout : kind === "interval" ? realTimers.setInterval : realTimers.setImmediate;
    const wrapped = function (this: unknown, cb: unknown, ...rest: unknown[]): unknown {
      const ctx = registry.als.getStore();
      const work = ctx?.work;
      if (!ctx || !work || typeof cb !== "function") return (start as (...a: unknown[]) => unknown).call(this, cb, ...rest);
      const args = kind === "immediate" ? rest : rest.slice(1);
      let handle: TimerHandle;
      const run = function (this: unknown) {
        if (kind !== "interval") forget(work, handle);
        if (work.cancelled) return;
        try {
          interruptibly(() => (cb as (...a: unknown[]) => unknown).apply(this, args));
        } catch (err) {
          if (isInterruption(err)) interruptEverything();
          reportError(err, ctx.sink);
        }
      };
      if (work.cancelled) {
        // A cancelled request starts nothing new; hand back a timer that never fires.
        handle = (kind === "immediate" ? realTimers.setImmediate : realTimers.setTimeout)(() => {}) as unknown as TimerHandle;
        clearAny(handle);
        return handle;
      }
      handle = (kind === "immediate" ? (start as typeof setImmediate)(run) : (start as typeof setTimeout)(run, rest[0] as number)) as unknown as TimerHandle;
      if (typeof handle === "object") {
        (handle as Record<symbol, unknown>)[workOf] = work;
        (handle as Record<symbol, unknown>)[kindOfTimer] = kind;
      }
      work.timers.add(handle);
      liveWork.add(work);
      return handle;
    };
    const custom = (start as unknown as Record<symbol, unknown>)[promisify.custom];
    if (custom) Object.defineProperty(wrapped, promisify.custom, { value: custom });
    return wrapped;
  };
  const unwrapClear = (clear: (t: never) => void) =>
    function (t: unknown): void {
      if (t && typeof t === "object") {
        const w = (t as Record<symbol, Work | undefined>)[workOf];
        if (w) forget(w, t as TimerHandle);
      }
      clear(t as never);
    };
  g.setTimeout = wrap("timeout");
  g.setInterval = wrap("interval");
  g.setImmediate = wrap("immediate");
  g.clearTimeout = unwrapClear(realTimers.clearTimeout);
  g.clearInterval = unwrapClear(realTimers.clearInterval);
  g.clearImmediate = unwrapClear(realTimers.clearImmediate);
}

let streamsHooked = false;
/**
 * Send `process.stdout`/`process.stderr` writes to the current output context (so `console.log`
 * in a cell or a widget callback reaches the notebook). Writes with no context go to the real streams.
 */
export function hookProcessStreams(): void {
  if (streamsHooked) return;
  streamsHooked = true;
  const make = (name: "stdout" | "stderr", orig: (s: string) => void) =>
    function write(chunk: unknown, encodingOrCb?: unknown, cb?: unknown): boolean {
      const text = typeof chunk === "string" ? chunk : Buffer.from(chunk as Uint8Array).toString((typeof encodingOrCb === "string" ? encodingOrCb : "utf8") as BufferEncoding);
      const ctx = currentContext();
      if (ctx) ctx.sink.stream(name, text);
      else orig(text);
      const done = typeof encodingOrCb === "function" ? encodingOrCb : cb;
      if (typeof done === "function") process.nextTick(done as () => void);
      return true;
    };
  process.stdout.write = make("stdout", realStdout) as typeof process.stdout.write;
  process.stderr.write = make("stderr", realStderr) as typeof process.stderr.write;
}

/** Show an error (an exception of user code) in the current context, as a Jupyter error output. */
export function reportError(err: unknown, sink: OutputSink | undefined = currentContext()?.sink): void {
  const { ename, evalue, traceback } = describeError(err);
  (sink ?? consoleSink).error(ename, evalue, traceback);
}

export function describeError(err: unknown): { ename: string; evalue: string; traceback: string[] } {
  // A thrown value may be hostile (getters or toString that throw): every read is guarded.
  try {
    if (err instanceof Error) {
      const name = guarded(() => String(err.name || "Error"), "Error");
      const message = guarded(() => String(err.message), "(its message could not be read)");
      const stack = guarded(() => (typeof err.stack === "string" ? err.stack : `${name}: ${message}`), `${name}: ${message}`);
      return { ename: name, evalue: message, traceback: stack.split("\n").filter((l) => !internalFrame.test(l)) };
    }
    const text = typeof err === "string" ? err : safeString(err);
    return { ename: "Error", evalue: text, traceback: [`Uncaught ${text}`] };
  } catch {
    return { ename: "Error", evalue: "a value that cannot be shown was thrown", traceback: ["Uncaught a value that cannot be shown"] };
  }
}

function guarded<T>(read: () => T, fallback: T): T {
  try {
    return read();
  } catch {
    return fallback;
  }
}

/** Stack frames of the machinery that runs a cell (Node's vm, tslab, this kernel), not of user code. */
const internalFrame = /^\s+at .*(node:vm|node:async_hooks|node:internal|[\\/]tslab[\\/]dist[\\/]|[\\/]kernel-ext[\\/]dist[\\/](notebook|comm|display)[\\/]|sigintHandlersWrap)/;

function safeString(v: unknown): string {
  try {
    const j = JSON.stringify(v);
    if (j !== undefined) return j;
  } catch {
    /* fall through */
  }
  try {
    return String(v);
  } catch {
    return `a thrown ${typeof v} that cannot be shown (its toString throws)`;
  }
}

let consoleHooked = false;
/**
 * Faster `console.log/info/debug/warn/error` for the kernel: the text is formatted as Node's console
 * formats it for a pipe (no colours), indented by `console.group`, and handed straight to the
 * current output context. Node's own console adds an error listener and a write callback per call,
 * which costs more than the output itself when a cell prints many lines. Other console methods
 * (table, dir, time, count, trace) keep Node's implementation and reach the same context.
 */
export function hookConsole(): void {
  if (consoleHooked) return;
  const c = console as unknown as Record<string | symbol, unknown>;
  const kGroupIndent = Object.getOwnPropertySymbols(console).find((s) => s.description === "kGroupIndent");
  if (!kGroupIndent) return; // a Node whose console we do not know: keep it as it is
  consoleHooked = true;
  const make = (name: "stdout" | "stderr", orig: (s: string) => void) =>
    function (...args: unknown[]): void {
      let text = args.length === 1 && typeof args[0] === "string" ? args[0] : formatWithOptions({}, ...args);
      const indent = c[kGroupIndent];
      if (typeof indent === "string" && indent.length > 0) text = indent + (text.includes("\n") ? text.replace(/\n/g, `\n${indent}`) : text);
      const ctx = currentContext();
      if (ctx) ctx.sink.stream(name, text + "\n");
      else orig(text + "\n");
    };
  const out = make("stdout", realStdout);
  const err = make("stderr", realStderr);
  c.log = out;
  c.info = out;
  c.debug = out;
  c.warn = err;
  c.error = err;
}
