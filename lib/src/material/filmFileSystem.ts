/**
 * Node (CommonJS): film files read from and written to disk. Bundles for the browser use
 * `filmFileSystem.browser.ts` instead (the "browser" field of lib/package.json), where there are
 * no files: a page reads the text itself and calls parseFilmFile.
 */
import { InputError } from "../errors.js";
import { FILM_FILE_LIMIT, filmFileText, parseFilmFile, type FilmRecord, type FilmToSave } from "./filmFile.js";

// CommonJS output: `require` is Node's; lib is compiled with no ambient types.
declare const require: (id: string) => unknown;
interface Fs {
  statSync(p: string): { size: number; isFile(): boolean };
  readFileSync(p: string, enc: "utf8"): string;
  writeFileSync(p: string, text: string, opts: { encoding: "utf8"; flag?: string }): void;
  renameSync(a: string, b: string): void;
}

function reason(err: unknown): string {
  const code = (err as { code?: string }).code;
  return code === "ENOENT" ? "no such file" : code === "EACCES" ? "permission denied" : code === "EISDIR" ? "a folder, not a file" : (err as Error).message;
}

/** Read a film file (JSON, see filmFile.ts). The file is never modified. */
export function loadFilm(path: string): FilmRecord {
  if (typeof path !== "string" || path === "") throw new InputError("path", path, "the path of a film file");
  const fs = require("node:fs") as Fs;
  let text: string;
  try {
    const st = fs.statSync(path);
    if (!st.isFile()) throw Object.assign(new Error("not a file"), { code: "EISDIR" });
    if (st.size > FILM_FILE_LIMIT) throw new InputError(path, `${st.size} bytes`, `a film file of at most ${FILM_FILE_LIMIT / 1e6} MB`);
    text = fs.readFileSync(path, "utf8");
  } catch (err) {
    if (err instanceof InputError) throw err;
    throw new InputError("film file", path, "a readable film file", reason(err));
  }
  return { ...parseFilmFile(text, path), source: path };
}

/**
 * Write a film file: a film read by loadFilm, a Film from makeFilm (with `meta.name`), or
 * { name, notes, values, correlations }. The document is checked by reading it back before the
 * file is touched, and written whole (a temporary file renamed), so a failed save leaves the old
 * file as it was. Returns the text written.
 */
export function saveFilm(film: FilmToSave, path: string, meta: { name?: string; notes?: string | string[] } = {}): string {
  if (typeof path !== "string" || path === "") throw new InputError("path", path, "the path of the film file to write");
  const text = filmFileText(film, meta);
  const fs = require("node:fs") as Fs;
  const tmp = `${path}.${processId()}.tmp`;
  try {
    fs.writeFileSync(tmp, text, { encoding: "utf8", flag: "wx" });
    fs.renameSync(tmp, path);
  } catch (err) {
    throw new InputError("path", path, "a film file that can be written", reason(err));
  }
  return text;
}

function processId(): number {
  const p = (globalThis as { process?: { pid?: number } }).process;
  return p?.pid ?? Math.floor(Math.random() * 1e9);
}
