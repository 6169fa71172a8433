/**
 * Reading and checking notebooks (nbformat 4). Errors name the file and what is wrong; the
 * caller's data is never modified (we return a deep copy to work on).
 */
export interface NotebookCell {
  cell_type: "code" | "markdown" | "raw";
  source: string | string[];
  metadata: Record<string, unknown>;
  outputs?: Array<Record<string, unknown>>;
  execution_count?: number | null;
  id?: string;
  attachments?: unknown;
}

export interface Notebook {
  nbformat: number;
  nbformat_minor: number;
  metadata: Record<string, unknown>;
  cells: NotebookCell[];
}

export class NotebookError extends Error {
  override readonly name = "NotebookError";
  constructor(
    readonly file: string,
    detail: string,
  ) {
    super(`${file}: ${detail}`);
  }
}

export function parseNotebook(text: string, file: string): Notebook {
  let raw: unknown;
  try {
    raw = JSON.parse(text);
  } catch (err) {
    const why = err instanceof RangeError ? "nested too deeply to read" : String((err as Error)?.message).slice(0, 200);
    throw new NotebookError(file, `not valid JSON (${why}); expected a Jupyter notebook (nbformat 4)`);
  }
  return checkNotebook(raw, file);
}

export function checkNotebook(raw: unknown, file: string): Notebook {
  if (!raw || typeof raw !== "object" || Array.isArray(raw)) throw new NotebookError(file, "the JSON is not an object; expected a Jupyter notebook (nbformat 4)");
  const nb = raw as Record<string, unknown>;
  if (nb.nbformat !== 4) throw new NotebookError(file, `nbformat is ${JSON.stringify(nb.nbformat)}; expected 4`);
  if (!Array.isArray(nb.cells)) throw new NotebookError(file, `"cells" is ${nb.cells === undefined ? "missing" : typeof nb.cells}; expected a list of cells`);
  nb.cells.forEach((c, i) => {
    const where = `cell ${i + 1}`;
    if (!c || typeof c !== "object") throw new NotebookError(file, `${where} is not an object`);
    const cell = c as Record<string, unknown>;
    if (!["code", "markdown", "raw"].includes(cell.cell_type as string))
      throw new NotebookError(file, `${where} has cell_type ${JSON.stringify(cell.cell_type)}; expected "code", "markdown" or "raw"`);
    if (!(typeof cell.source === "string" || (Array.isArray(cell.source) && cell.source.every((s) => typeof s === "string")))) {
      throw new NotebookError(file, `${where} has a source that is not text (a string or a list of strings)`);
    }
  });
  let copy: Notebook;
  try {
    copy = structuredClone(nb) as unknown as Notebook;
  } catch (err) {
    throw new NotebookError(
      file,
      err instanceof RangeError ? "nested too deeply to read (a notebook is a few levels of JSON)" : `cannot be copied (${String((err as Error)?.message).slice(0, 200)})`,
    );
  }
  copy.metadata = copy.metadata && typeof copy.metadata === "object" ? copy.metadata : {};
  copy.nbformat_minor = typeof copy.nbformat_minor === "number" ? copy.nbformat_minor : 4;
  for (const c of copy.cells) c.metadata = c.metadata && typeof c.metadata === "object" ? c.metadata : {};
  return copy;
}

export function cellSource(cell: NotebookCell): string {
  return Array.isArray(cell.source) ? cell.source.join("") : cell.source;
}

/** nbformat stores multi-line text as a list of lines, each keeping its "\n". */
export function splitLines(text: string): string[] {
  const parts = text.split(/(?<=\n)/);
  return parts.length === 1 && parts[0] === "" ? [] : parts;
}

export const WIDGET_STATE_MIME = "application/vnd.jupyter.widget-state+json";
export const WIDGET_VIEW_MIME = "application/vnd.jupyter.widget-view+json";

export const helicoidKernelspec = { name: "helicoid", display_name: "TypeScript (Helicoid)", language: "typescript" };
export const typescriptLanguageInfo = { name: "typescript", file_extension: ".ts", mimetype: "text/typescript" };
