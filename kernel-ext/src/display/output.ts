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
