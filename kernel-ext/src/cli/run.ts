import { fork } from "node:child_process";
import { readFileSync, writeFileSync } from "node:fs";
import { dirname, join, resolve } from "node:path";
import { NotebookError, parseNotebook, type Notebook } from "../notebook/nbformat.js";
import { addCellIds, type Output, type RunFailure } from "../notebook/runner.js";
import { trustNotebook } from "../notebook/trust.js";
import { fileReason, inputFileReason, isSameFile as sameFile, outputFileProblem, parseStrict, shorten, UsageError, type CommandIO } from "./args.js";

export const runUsage =
  "helicoid run NOTEBOOK [-o OUT.ipynb] [--timeout SECONDS] [--quiet] [--no-trust]   execute a notebook (in a child process; no Jupyter needed); OUT is signed as trusted for you\n" +
  "  --timeout SECONDS   time limit of each cell (default 600; 0: none); a cell past it is interrupted and the run stops";

const OPTIONS = {
  flags: ["--quiet", "--no-trust"],
  valued: { "-o": "a file name such as OUT.ipynb", "--output": "a file name such as OUT.ipynb", "--timeout": "seconds per cell, such as 600 (0: no limit)" },
};

/** The default time limit of one cell, in seconds. */
export const DEFAULT_CELL_TIMEOUT = 600;
/** How long after the last cell the run waits for timers the cells started (ms). */
const SETTLE_MS = 2000;
/** How long a cell past its limit gets to stop after SIGINT before its process is killed (ms). */
const GRACE_MS = 5000;

export function parseTimeout(text: string): number {
  const v = /^\s*\d+(\.\d+)?\s*$/.test(text) ? Number(text) : NaN;
  if (!Number.isFinite(v) || v > 1e6) throw new UsageError(`--timeout is ${JSON.stringify(text.slice(0, 40))}; expected a number of seconds from 0 (no limit) to 1000000`);
  return v;
}

interface ChildOutcome {
  pendingTimers?: number;
  notebook: Notebook | null;
  failure: RunFailure | null;
  cellsRun: number;
  seconds: number;
  fatal?: string;
}

/**
 * Run the notebook in a child process (notebook/runChild.ts) and keep what each cell printed as it
 * goes: a cell past its limit is interrupted (SIGINT; the child names it a timeout), and if it does
 * not stop (a loop in a timer) its process is killed and the notebook is written from what arrived,
 * with the reason under the cell. A child that ends in the middle (a crash) is reported the same way.
 */
function runInChild(file: string, nb: Notebook, timeout: number, onCell?: (index: number, total: number) => void): Promise<ChildOutcome> {
  return new Promise((res) => {
    const t0 = performance.now();
    const child = fork(join(__dirname, "..", "notebook", "runChild.js"), [file, String(timeout), String(SETTLE_MS)], {
      cwd: dirname(file),
      stdio: ["ignore", "inherit", "inherit", "ipc"],
      execArgv: [],
    });
    const outputs = new Map<number, Output[]>();
    const counts = new Map<number, number>();
    let current = -1;
    let last = -1;
    let done: ChildOutcome | null = null;
    let killedForTime = false;
    let timer: NodeJS.Timeout | null = null;
    let grace: NodeJS.Timeout | null = null;
    const disarm = () => {
      if (timer) clearTimeout(timer);
      timer = null;
    };
    child.on("message", (m: Record<string, unknown>) => {
      if (m.t === "cell") {
        disarm();
        if (grace) clearTimeout(grace);
        current = m.index as number;
        last = current;
        counts.set(current, m.count as number);
        outputs.set(current, []);
        onCell?.(current, nb.cells.length);
        if (timeout > 0) {
          // SIGINT again every second (one that lands between two pieces of work is lost), then SIGKILL.
          timer = setTimeout(() => {
            if (child.connected) child.send({ t: "timeout", index: current });
            let tries = 0;
            const nudge = () => {
              if (++tries * 1000 > GRACE_MS) {
                killedForTime = true;
                child.kill("SIGKILL");
                return;
              }
              child.kill("SIGINT");
              grace = setTimeout(nudge, 1000);
            };
            nudge();
          }, timeout * 1000);
        }
      } else if (m.t === "outputs") outputs.set(m.index as number, m.outputs as Output[]);
      else if (m.t === "done") {
        disarm();
        if (grace) clearTimeout(grace);
        done = {
          notebook: m.notebook as Notebook,
          failure: m.failure as RunFailure | null,
          cellsRun: m.cellsRun as number,
          seconds: m.seconds as number,
          pendingTimers: m.pendingTimers as number | undefined,
        };
      } else if (m.t === "fatal") done = { notebook: null, failure: null, cellsRun: 0, seconds: 0, fatal: m.message as string };
    });
    // Ctrl-C reaches the child too (same process group): it interrupts its cell and writes; a
    // second Ctrl-C stops it at once.
    let interrupts = 0;
    const onSigint = () => {
      if (++interrupts > 1) child.kill("SIGKILL");
    };
    process.on("SIGINT", onSigint);
    // A failed send (the child already gone) or spawn is reported by its exit, or here.
    child.on("error", (err) => {
      if (child.exitCode === null && child.signalCode === null && !child.pid)
        res({ notebook: null, failure: null, cellsRun: 0, seconds: 0, fatal: `the notebook process could not start: ${err.message}` });
    });
    child.on("exit", (code, signal) => {
      disarm();
      if (grace) clearTimeout(grace);
      process.off("SIGINT", onSigint);
      if (done) return res(done);
      // The child ended without its answer: build the notebook from what it sent.
      const index = last >= 0 ? last : (nb.cells.findIndex((c) => c.cell_type === "code") ?? 0);
      const how = killedForTime
        ? `cell ${index + 1} did not finish within ${timeout} s (--timeout ${timeout}) and could not be interrupted (a loop outside the cell's own code, such as in a timer); its process was stopped`
        : `the notebook process ended ${last >= 0 ? `during cell ${index + 1}` : "before the first cell ran"} (${signal ? `signal ${signal}` : `exit code ${code}`}${signal === "SIGKILL" || signal === "SIGABRT" || code === 134 ? ", out of memory?" : ""}); the run stopped`;
      const ename = killedForTime ? "TimeoutError" : "RunStopped";
      let count = 0;
      nb.cells.forEach((c, i) => {
        if (c.cell_type !== "code") {
          delete c.outputs;
          return;
        }
        if (!counts.has(i)) return;
        c.outputs = outputs.get(i) ?? [];
        c.execution_count = counts.get(i) ?? ++count;
      });
      const cell = nb.cells[index];
      if (cell) {
        cell.outputs = [...(cell.outputs ?? []), { output_type: "error", ename, evalue: how, traceback: [`${ename}: ${how}`] }];
        cell.execution_count ??= null;
      }
      nb.metadata.helicoid_run = { status: "stopped", cell: index + 1, reason: `${ename}: ${how}` };
      res({ notebook: nb, failure: { cell: index + 1, ename, evalue: how }, cellsRun: counts.size, seconds: (performance.now() - t0) / 1000 });
    });
  });
}

/**
 * `helicoid run NOTEBOOK [-o OUT] [--timeout S]`. Exit 0 when every cell ran, 1 when a cell failed
 * (its error, a timeout, `process.exit`, a late asynchronous error; what ran is written), 2 on bad
 * input (a missing or malformed notebook, an output path that cannot be written or that is the
 * input: checked before any cell runs). OUT is relative to the current directory.
 */
export async function runCommand(args: string[], io: CommandIO): Promise<number> {
  let a: ReturnType<typeof parseStrict>;
  let timeout = DEFAULT_CELL_TIMEOUT;
  try {
    a = parseStrict(args, OPTIONS);
    if (a.positional.length === 0) throw new UsageError("no notebook given");
    if (a.positional.length > 1) throw new UsageError(`one notebook expected, ${a.positional.length} given (${a.positional.join(", ").slice(0, 200)})`);
    if (a.options.has("-o") && a.options.has("--output")) throw new UsageError(`-o and --output both given (${a.options.get("-o")}, ${a.options.get("--output")}): give one`);
    if (a.options.has("--timeout")) timeout = parseTimeout(a.options.get("--timeout")!);
  } catch (err) {
    if (!(err instanceof UsageError)) throw err;
    io.stderr(`helicoid run: ${err.message}\nusage: ${runUsage}\n`);
    return 2;
  }
  const input = a.positional[0]!;
  const given = a.options.get("-o") ?? a.options.get("--output");
  const out = given === undefined ? undefined : resolve(given);
  const quiet = a.flags.has("--quiet");
  const inputProblem = inputFileReason(input);
  if (inputProblem !== null) {
    io.stderr(`helicoid run: cannot read ${input}: ${inputProblem}\n`);
    return 2;
  }
  let nb: Notebook;
  try {
    nb = parseNotebook(readFileSync(input, "utf8"), input);
  } catch (err) {
    if (err instanceof NotebookError) {
      io.stderr(`${err.message}\n`);
      return 2;
    }
    io.stderr(`helicoid run: cannot read ${input}: ${fileReason(err)}\n`);
    return 2;
  }
  if (out !== undefined) {
    if (sameFile(out, input)) {
      io.stderr(
        `helicoid run: -o ${given}: the output path is the input notebook (the same file, or a link to it); choose another -o path (the input is never modified; nothing was run)\n`,
      );
      return 2;
    }
    const problem = outputFileProblem(given!);
    if (problem !== null) {
      io.stderr(`helicoid run: cannot write ${problem} (nothing was run)\n`);
      return 2;
    }
  }
  const file = resolve(input);
  const r = await runInChild(file, nb, timeout, quiet ? undefined : (i, n) => io.stderr(`  cell ${i + 1}/${n}\n`));
  if (r.fatal !== undefined) {
    io.stderr(`helicoid run: ${r.fatal}\n`);
    return 2;
  }
  if (out !== undefined && r.notebook) {
    addCellIds(r.notebook); // stable ids, so the signature below checks (see runner.ts)
    try {
      writeFileSync(out, JSON.stringify(r.notebook, null, 1) + "\n");
    } catch (err) {
      // The output directory went away (or filled up) while the notebook ran.
      io.stderr(`helicoid run: cannot write ${given}: ${fileReason(err)}\n`);
      return 2;
    }
    // The notebook this user just ran is trusted for them, as Jupyter does when it saves one.
    if (!a.flags.has("--no-trust")) {
      const t = trustNotebook(out);
      if (!quiet || !t.signed) io.stderr(`${given}: ${t.message}\n`);
    }
  }
  if (r.failure) {
    io.stderr(`${input}: cell ${r.failure.cell} failed: ${r.failure.ename}: ${shorten(r.failure.evalue)}\n`);
    if (given) io.stderr(`partial output written to ${given}\n`);
    return 1;
  }
  if (r.pendingTimers)
    io.stderr(
      `${input}: note: ${r.pendingTimers} timer(s) the cells started were still pending ${SETTLE_MS / 1000} s after the last cell and were stopped (await them in a cell to keep their work)\n`,
    );
  if (!quiet) io.stderr(`${input}: ${r.cellsRun} code cells ran in ${r.seconds.toFixed(1)} s${given ? `; wrote ${given}` : ""}\n`);
  return 0;
}
