import { resolve } from "node:path";
import { NotebookError } from "../notebook/nbformat.js";
import { runNotebookFile } from "../notebook/runner.js";
import { trustNotebook } from "../notebook/trust.js";
import { fileReason, inputFileReason, isFileSystemError, outputFileProblem, parseStrict, UsageError, type CommandIO } from "./args.js";

export const runUsage = "helicoid run NOTEBOOK [-o OUT.ipynb] [--quiet] [--no-trust]   execute a notebook in process (no Jupyter needed); OUT is signed as trusted for you";

const OPTIONS = { flags: ["--quiet", "--no-trust"], valued: { "-o": "a file name such as OUT.ipynb", "--output": "a file name such as OUT.ipynb" } };

/**
 * `helicoid run NOTEBOOK [-o OUT]`. Exit 0 when every cell ran, 1 when a cell failed, 2 on bad input
 * (a missing or malformed notebook, an output path that cannot be written: checked before any
 * cell runs). OUT is relative to the current directory.
 */
export async function runCommand(args: string[], io: CommandIO): Promise<number> {
  let a: ReturnType<typeof parseStrict>;
  try {
    a = parseStrict(args, OPTIONS);
    if (a.positional.length === 0) throw new UsageError("no notebook given");
    if (a.positional.length > 1) throw new UsageError(`one notebook expected, ${a.positional.length} given (${a.positional.join(", ")})`);
    if (a.options.has("-o") && a.options.has("--output")) throw new UsageError(`-o and --output both given (${a.options.get("-o")}, ${a.options.get("--output")}): give one`);
  } catch (err) {
    if (!(err instanceof UsageError)) throw err;
    io.stderr(`helicoid run: ${err.message}\nusage: ${runUsage}\n`);
    return 2;
  }
  const input = a.positional[0]!;
  const given = a.options.get("-o") ?? a.options.get("--output");
  // The runner changes into the notebook's directory: the output path is taken from here, now.
  const out = given === undefined ? undefined : resolve(given);
  const quiet = a.flags.has("--quiet");
  const inputProblem = inputFileReason(input);
  if (inputProblem !== null) {
    io.stderr(`helicoid run: cannot read ${input}: ${inputProblem}\n`);
    return 2;
  }
  if (given !== undefined) {
    const problem = outputFileProblem(given);
    if (problem !== null) {
      io.stderr(`helicoid run: cannot write ${problem} (nothing was run)\n`);
      return 2;
    }
  }
  try {
    const r = await runNotebookFile(input, {
      out,
      onCell: quiet ? undefined : (i, n) => io.stderr(`  cell ${i + 1}/${n}\n`),
    });
    // The notebook this user just ran is trusted for them, as Jupyter does when it saves one.
    if (out !== undefined && !a.flags.has("--no-trust")) {
      const t = trustNotebook(out);
      if (!quiet || !t.signed) io.stderr(`${given}: ${t.message}\n`);
    }
    if (r.failure) {
      io.stderr(`${input}: cell ${r.failure.cell} failed: ${r.failure.ename}: ${r.failure.evalue}\n`);
      if (given) io.stderr(`partial output written to ${given}\n`);
      return 1;
    }
    if (!quiet) io.stderr(`${input}: ${r.cellsRun} code cells ran in ${r.seconds.toFixed(1)} s${given ? `; wrote ${given}` : ""}\n`);
    return 0;
  } catch (err) {
    if (err instanceof NotebookError) {
      io.stderr(`${err.message}\n`);
      return 2;
    }
    // The output directory went away (or filled up) while the notebook ran.
    if (isFileSystemError(err)) {
      io.stderr(`helicoid run: cannot write ${given ?? err.path ?? input}: ${fileReason(err)}\n`);
      return 2;
    }
    throw err;
  }
}
