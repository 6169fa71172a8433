/**
 * `helicoid run NOTEBOOK [-o OUT]`: execute a notebook in this process, without Jupyter, through
 * the same tslab executor the kernel uses. Cells run in order; stream, display, result and error
 * outputs are captured as nbformat outputs; the widget state is saved in the notebook metadata the
 * way Jupyter saves it. The first failing cell stops the run (as nbconvert does) and is reported
 * with its number and message. The input file is never modified.
 *
 * One notebook per process: tslab's executor is process-wide.
 */
import { readFileSync, writeFileSync, realpathSync, existsSync } from "node:fs";
import { dirname, resolve } from "node:path";
import { comms } from "../comm/comms.js";
import { resetPlotlyEmbedding } from "../display/figure.js";
import { hookProcessStreams, setFallbackContext, type OutputContext, type OutputSink } from "../display/output.js";
import { widgetStateDocument } from "../widgets/widget.js";
import { cellSource, helicoidKernelspec, NotebookError, parseNotebook, splitLines, typescriptLanguageInfo, WIDGET_STATE_MIME, type Notebook, type NotebookCell } from "./nbformat.js";
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
}

type Output = Record<string, unknown>;

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

export async function runNotebookFile(
  input: string,
  options: { out?: string; onCell?: (index: number, total: number) => void } = {},
): Promise<RunResult> {
  const file = resolve(input);
  if (!existsSync(file)) throw new NotebookError(input, "no such file");
  const nb = parseNotebook(readFileSync(file, "utf8"), input);
  if (options.out && existsSync(options.out) && realpathSync(options.out) === realpathSync(file)) {
    throw new NotebookError(input, "the output path is the input notebook; choose another -o path (the input is never modified)");
  }
  const dir = dirname(file);
  process.chdir(dir);
  const result = await runNotebook(nb, dir, options.onCell);
  if (options.out) writeFileSync(options.out, JSON.stringify(result.notebook, null, 1) + "\n");
  return result;
}

export async function runNotebook(nb: Notebook, dir: string, onCell?: (index: number, total: number) => void): Promise<RunResult> {
  const t0 = performance.now();
  comms.channel = null;
  hookProcessStreams();
  resetPlotlyEmbedding();
  const session = new ExecutionSession(dir);
  let count = 0;
  let failure: RunFailure | null = null;
  const code = nb.cells.map((c, i) => [c, i] as const).filter(([c]) => c.cell_type === "code");
  for (const [cell, index] of code) {
    onCell?.(index, nb.cells.length);
    cell.outputs = [];
    cell.execution_count = ++count;
    const ctx: OutputContext = { sink: cellSink(cell.outputs, count) };
    setFallbackContext(ctx);
    const outcome = await session.run(cellSource(cell), ctx);
    if (!outcome.ok) {
      failure = { cell: index + 1, ename: outcome.error!.ename, evalue: outcome.error!.evalue };
      break;
    }
  }
  // Let timers and promises the cells started settle before the state is saved.
  await new Promise((r) => setTimeout(r, 10));
  setFallbackContext(null);
  markExecuted(nb);
  const state = widgetStateDocument();
  if (Object.keys(state.state).length > 0) nb.metadata.widgets = { [WIDGET_STATE_MIME]: state };
  else delete nb.metadata.widgets;
  return { notebook: nb, failure, cellsRun: count, seconds: (performance.now() - t0) / 1000 };
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
