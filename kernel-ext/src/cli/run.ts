import { NotebookError } from "../notebook/nbformat.js";
import { runNotebookFile } from "../notebook/runner.js";
import { parseArgs, type CommandIO } from "./args.js";

export const runUsage = "helicoid run NOTEBOOK [-o OUT.ipynb] [--quiet]   execute a notebook in process (no Jupyter needed)";

/** `helicoid run NOTEBOOK [-o OUT]`. Exit 0 when every cell ran, 1 when a cell failed, 2 on bad input. */
export async function runCommand(args: string[], io: CommandIO): Promise<number> {
  const a = parseArgs(args, ["-o", "--output"]);
  const input = a.positional[0];
  if (!input || a.positional.length > 1) {
    io.stderr(`usage: ${runUsage}\n`);
    return 2;
  }
  const out = a.options.get("-o") ?? a.options.get("--output");
  const quiet = a.flags.has("--quiet");
  try {
    const r = await runNotebookFile(input, {
      out,
      onCell: quiet ? undefined : (i, n) => io.stderr(`  cell ${i + 1}/${n}\n`),
    });
    if (r.failure) {
      io.stderr(`${input}: cell ${r.failure.cell} failed: ${r.failure.ename}: ${r.failure.evalue}\n`);
      if (out) io.stderr(`partial output written to ${out}\n`);
      return 1;
    }
    if (!quiet) io.stderr(`${input}: ${r.cellsRun} code cells ran in ${r.seconds.toFixed(1)} s${out ? `; wrote ${out}` : ""}\n`);
    return 0;
  } catch (err) {
    if (err instanceof NotebookError) {
      io.stderr(`${err.message}\n`);
      return 2;
    }
    throw err;
  }
}
