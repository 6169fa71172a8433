/**
 * One TypeScript execution session on tslab's converter and executor, shared by the ZeroMQ kernel
 * and the in-process notebook runner. What tslab prints through its console interface becomes
 * Jupyter output here:
 * - a cell's last expression -> an `execute_result` (a widget, figure or table as its rich bundle);
 * - compile diagnostics and uncaught exceptions -> one `error` output (ename, evalue, traceback).
 */
import { createRequire } from "node:module";
import { join } from "node:path";
import { format } from "node:util";
import type { Converter } from "tslab/dist/converter";
import { createExecutor, type ConverterSet, type Executor } from "tslab/dist/executor";
import { bundleOf } from "../display/display.js";
import { cancelAllWork, currentContext, describeError, isInterruption, runInContext, type OutputContext } from "../display/output.js";
import { exposeOwnPackages } from "./ownPackages.js";
import { loadConverterModule } from "./patchedConverter.js";

export interface CellError {
  ename: string;
  evalue: string;
  traceback: string[];
}

export interface CellOutcome {
  ok: boolean;
  error?: CellError;
}

class Converters implements ConverterSet {
  private _node?: Converter;
  private _browser?: Converter;
  get node(): Converter {
    return (this._node ??= loadConverterModule().createConverter({ isJS: false, isBrowser: false }));
  }
  get browser(): Converter {
    return (this._browser ??= loadConverterModule().createConverter({ isJS: false, isBrowser: true }));
  }
  close(): void {
    this._node?.close();
    this._browser?.close();
  }
}

export class ExecutionSession {
  readonly executor: Executor;
  private readonly converters = new Converters();
  private diagnostics: string[] = [];
  private exception: { value: unknown } | null = null;

  /** `rootDir` is where user code resolves modules from (the notebook's folder). */
  constructor(private readonly rootDir: string = process.cwd()) {
    exposeOwnPackages(rootDir);
    this.executor = createExecutor(rootDir, this.converters, {
      log: (value: unknown) => {
        const ctx = currentContext();
        if (!ctx) return;
        const b = bundleOf(value, { asResult: true });
        ctx.sink.result(b.data, b.metadata);
      },
      error: (first?: unknown, ...rest: unknown[]) => {
        if (rest.length === 0 && (first instanceof Error || typeof first !== "string")) this.exception = { value: first };
        else this.diagnostics.push(format(first, ...rest));
      },
    });
  }

  /**
   * Build the TypeScript program now (it takes a second or two), instead of at the first cell; and
   * since notebooks of this kernel begin by importing @helicoid/lib, read its declarations into
   * that program (parsed and bound once, reused by every later program that imports it) and load
   * its modules the way a cell's `require` will (from `rootDir`). The warm-up compiles a
   * throw-away source outside the executor: no cell sees it. A library that cannot be found is
   * left to the first cell that imports it (which then reports it).
   */
  warm(): void {
    const node = this.converters.node;
    try {
      node.convert("", 'import * as __helicoidWarm from "@helicoid/lib";\n');
    } catch {
      // the cell that imports it will say what is wrong
    }
    try {
      createRequire(join(this.rootDir, "src.js"))("@helicoid/lib");
    } catch {
      // idem
    }
  }

  /** Run one cell in output context `ctx`. Errors are reported to `ctx.sink` and returned. */
  async run(code: string, ctx: OutputContext): Promise<CellOutcome> {
    this.diagnostics = [];
    this.exception = null;
    let ok: boolean;
    try {
      ok = await runInContext(ctx, () => this.executor.execute(code));
    } catch (err) {
      ok = false;
      this.exception = { value: err };
    }
    if (ok) return { ok: true };
    // An interrupted cell also stops the timers and intervals that cells and callbacks started.
    if (this.exception && isInterruption(this.exception.value)) cancelAllWork();
    const error = this.exception
      ? describeError(this.exception.value)
      : { ename: "CompileError", evalue: this.diagnostics.join("; ") || "the cell did not compile", traceback: this.diagnostics };
    ctx.sink.error(error.ename, error.evalue, error.traceback);
    return { ok: false, error };
  }

  /** Interrupt the running cell (its awaited promise) and cancel pending timers of all requests. */
  interrupt(): void {
    this.executor.interrupt();
    cancelAllWork();
  }

  close(): void {
    this.executor.close();
  }
}
