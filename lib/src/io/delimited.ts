/**
 * CSV / TSV / whitespace-separated tables of a vector field, one row per cell.
 *
 * - Header: the first line that is not empty and does not start with '#'. It names the columns x, y,
 *   z (optional), mx, my, mz in any order (case-insensitive, quotes allowed); a unit may follow a name in
 *   brackets, "x (nm)" or "x [nm]". Other columns are ignored (and reported).
 * - Units row (optional): a line right after the header in which no field is a number, giving the unit
 *   of each column ("nm, nm, nm, , , "). Coordinates without a unit are taken as metres (noted).
 * - Delimiter: tab if the header has one, else comma, else semicolon, else runs of whitespace.
 * - Values: plain numbers; "nan" in an m column marks a vacuum cell. Anything else is an InputError
 *   naming the file, the row (line number in the file) and the column.
 * - Grid: the distinct x, y, z values must lie on uniform spacings; cells with no row become vacuum
 *   (counted as missing); two rows for the same cell are an error.
 */
import { InputError } from "../errors.js";
import { checkFieldBudget } from "./budget.js";
import { parseQuantity } from "../quantity/units.js";
import { adoptInterleaved } from "../topology/field.js";
import type { ReadOptions, ReadResult } from "./readResult.js";
import { bytesToText } from "./text.js";

const NAMES = ["x", "y", "z", "mx", "my", "mz"] as const;
type Name = (typeof NAMES)[number];
const REQUIRED: Name[] = ["x", "y", "mx", "my", "mz"];
const numberRe = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;
const nanRe = /^[+-]?nan$/i;

function splitter(header: string): { split: (line: string) => string[]; name: string } {
  if (header.includes("\t")) return { split: (l) => l.split("\t"), name: "tab" };
  if (header.includes(",")) return { split: (l) => l.split(","), name: "comma" };
  if (header.includes(";")) return { split: (l) => l.split(";"), name: "semicolon" };
  return { split: (l) => l.trim().split(/\s+/), name: "whitespace" };
}

function unquote(s: string): string {
  const t = s.trim();
  return t.length >= 2 && (t[0] === '"' || t[0] === "'") && t[t.length - 1] === t[0] ? t.slice(1, -1).trim() : t;
}

/** Distinct sorted values with a uniform spacing: returns origin, spacing and count. */
function gridAxis(values: Float64Array, file: string, column: string): { origin: number; step: number; n: number } {
  const sorted = Float64Array.from(values).sort();
  const min = sorted[0]!, max = sorted[sorted.length - 1]!;
  const span = max - min;
  const tol = span === 0 ? 0 : span * 1e-9;
  const distinct: number[] = [min];
  for (const v of sorted) if (v - distinct[distinct.length - 1]! > tol * 1e3) distinct.push(v);
  if (distinct.length === 1) return { origin: min, step: NaN, n: 1 };
  let step = Infinity;
  for (let k = 1; k < distinct.length; k++) step = Math.min(step, distinct[k]! - distinct[k - 1]!);
  const n = Math.round(span / step) + 1;
  for (const v of distinct) {
    const f = (v - min) / step;
    if (Math.abs(f - Math.round(f)) > 1e-3) {
      const steps = distinct.slice(1, 6).map((d, k) => d - distinct[k]!);
      throw new InputError(`${file}: column ${column}`, `spacings ${steps.map((s) => s.toPrecision(4)).join(", ")}${distinct.length > 6 ? ", ..." : ""}`, "coordinates on a uniform grid (one spacing per axis)");
    }
  }
  return { origin: min, step, n };
}

export function readDelimitedVectorField(input: Uint8Array | string, options: ReadOptions = {}): ReadResult {
  const file = options.file ?? "table.csv";
  const text = bytesToText(input);
  const lines = text.split(/\r?\n/);
  const notes: string[] = [];
  let h = 0;
  while (h < lines.length && (lines[h]!.trim() === "" || lines[h]!.trim().startsWith("#"))) h++;
  if (h === lines.length) throw new InputError(file, "an empty table", `a header line naming the columns ${NAMES.join(", ")} (z optional)`);
  const { split, name: delim } = splitter(lines[h]!);
  const headerFields = split(lines[h]!).map(unquote);
  const width = headerFields.length;
  const col: Partial<Record<Name, number>> = {};
  const headerUnits: string[] = [];
  const ignored: string[] = [];
  headerFields.forEach((raw, k) => {
    const m = /^(.*?)\s*[([]\s*([^)\]]*)\s*[)\]]\s*$/.exec(raw);
    const base = (m ? m[1]! : raw).trim().toLowerCase().replace(/^m_([xyz])$/, "m$1");
    headerUnits[k] = m ? m[2]!.trim() : "";
    if ((NAMES as readonly string[]).includes(base)) {
      if (col[base as Name] !== undefined) throw new InputError(`${file}: header, column ${k + 1}`, raw, `each of ${NAMES.join(", ")} once (${base} appears twice)`);
      col[base as Name] = k;
    } else ignored.push(raw);
  });
  const missing = REQUIRED.filter((n) => col[n] === undefined);
  if (missing.length > 0) {
    throw new InputError(`${file}: header (row ${h + 1})`, lines[h]!.trim(), `columns named ${REQUIRED.join(", ")} (and optionally z), in any order`, `missing: ${missing.join(", ")}`);
  }
  if (ignored.length > 0) notes.push(`ignored columns: ${ignored.join(", ")}`);
  // optional units row
  let r = h + 1;
  const units = headerUnits.slice();
  while (r < lines.length && lines[r]!.trim() === "") r++;
  if (r < lines.length && !lines[r]!.trim().startsWith("#")) {
    const f = split(lines[r]!).map(unquote);
    if (f.length === width && f.every((s) => !numberRe.test(s) && !nanRe.test(s))) {
      f.forEach((u, k) => { if (u !== "") units[k] = u.replace(/^[([]|[)\]]$/g, ""); });
      r++;
    }
  }
  const scale: Record<"x" | "y" | "z", number> = { x: 1, y: 1, z: 1 };
  let unitless = false;
  for (const a of ["x", "y", "z"] as const) {
    const k = col[a];
    if (k === undefined) continue;
    const u = units[k] ?? "";
    if (u === "") { unitless = true; continue; }
    scale[a] = parseQuantity(`${file}: unit of column ${a}`, `1 ${u}`, "m");
  }
  if (unitless) notes.push("coordinates without a unit were taken as metres");

  // rows
  const xs: number[] = [], ys: number[] = [], zs: number[] = [], ms: number[] = [], rowOf: number[] = [];
  const numCols: Array<[Name, number]> = NAMES.filter((n) => col[n] !== undefined).map((n) => [n, col[n]!]);
  for (; r < lines.length; r++) {
    const line = lines[r]!;
    if (line.trim() === "" || line.trim().startsWith("#")) continue;
    const f = split(line);
    if (f.length !== width) {
      throw new InputError(`${file}: row ${r + 1}`, `${f.length} field${f.length === 1 ? "" : "s"}`, `${width} fields (${delim}-separated) as in the header`);
    }
    const vals: Partial<Record<Name, number>> = {};
    for (const [n, k] of numCols) {
      const s = unquote(f[k]!);
      let v: number;
      if (numberRe.test(s)) {
        v = Number(s);
        if (!Number.isFinite(v)) throw new InputError(`${file}: row ${r + 1}, column ${k + 1} (${n})`, s, "a finite number (this one is beyond the range of double precision)");
      }
      else if (nanRe.test(s) && n.startsWith("m")) v = NaN;
      else {
        throw new InputError(`${file}: row ${r + 1}, column ${k + 1} (${n})`, s, n.startsWith("m") ? 'a number (or "nan" for a vacuum cell)' : "a number");
      }
      vals[n] = v;
    }
    xs.push(vals.x! * scale.x); ys.push(vals.y! * scale.y); zs.push(col.z === undefined ? 0 : vals.z! * scale.z);
    ms.push(vals.mx!, vals.my!, vals.mz!);
    rowOf.push(r + 1);
  }
  if (xs.length === 0) throw new InputError(file, "a header and no data rows", "at least one data row");
  const ax = gridAxis(Float64Array.from(xs), file, "x");
  const ay = gridAxis(Float64Array.from(ys), file, "y");
  const az = gridAxis(Float64Array.from(zs), file, "z");
  const nx = ax.n, ny = ay.n, nz = az.n;
  const n = nx * ny * nz;
  checkFieldBudget(file, nx, ny, nz);
  const m = new Float64Array(3 * n);
  const owner = new Int32Array(n).fill(-1);
  const present = new Uint8Array(n);
  for (let k = 0; k < xs.length; k++) {
    const i = nx === 1 ? 0 : Math.round((xs[k]! - ax.origin) / ax.step);
    const j = ny === 1 ? 0 : Math.round((ys[k]! - ay.origin) / ay.step);
    const l = nz === 1 ? 0 : Math.round((zs[k]! - az.origin) / az.step);
    const c = (l * ny + j) * nx + i;
    if (owner[c] !== -1) {
      throw new InputError(`${file}: row ${rowOf[k]}`, `x, y, z = ${xs[k]}, ${ys[k]}, ${zs[k]} m`, `one row per cell (row ${rowOf[owner[c]!]} has the same cell)`);
    }
    owner[c] = k;
    present[c] = 1;
    m[3 * c] = ms[3 * k]!; m[3 * c + 1] = ms[3 * k + 1]!; m[3 * c + 2] = ms[3 * k + 2]!;
  }
  let missingCells = 0;
  const pre = new Uint8Array(n);
  for (let c = 0; c < n; c++) if (present[c] === 0) { pre[c] = 1; missingCells++; }
  if (missingCells > 0) notes.push(`${missingCells} grid cells had no row and are vacuum`);
  const dx = Number.isFinite(ax.step) ? ax.step : options.dx ?? (Number.isFinite(ay.step) ? ay.step : 1e-9);
  const dy = Number.isFinite(ay.step) ? ay.step : options.dy ?? dx;
  const dz = Number.isFinite(az.step) ? az.step : options.dz ?? dx;
  const normOpts = options.threshold !== undefined ? { threshold: options.threshold, source: file } : { source: file };
  const field = adoptInterleaved(m, { nx, ny, nz, dx, dy, dz, source: file }, normOpts, missingCells > 0 ? pre : null);
  const format = delim === "tab" ? "tsv" : delim === "comma" ? "csv" : "text";
  return { field, info: { file, format, vacuumCells: field.vacuumCells, missingCells, notes } };
}

/** Write a field as CSV with a units row (x, y, z in nm). */
export function writeCsvVectorField(field: { nx: number; ny: number; nz: number; dx: number; dy: number; dz: number; m: Float64Array; vacuum: Uint8Array | null }): string {
  const out: string[] = ["x,y,z,mx,my,mz", "nm,nm,nm,,,"];
  for (let k = 0, c = 0; k < field.nz; k++) for (let j = 0; j < field.ny; j++) for (let i = 0; i < field.nx; i++, c++) {
    const vac = field.vacuum !== null && field.vacuum[c] === 1;
    const v = vac ? ["nan", "nan", "nan"] : [field.m[3 * c]!, field.m[3 * c + 1]!, field.m[3 * c + 2]!].map(String);
    out.push([(i * field.dx * 1e9).toPrecision(12), (j * field.dy * 1e9).toPrecision(12), (k * field.dz * 1e9).toPrecision(12), ...v].join(","));
  }
  return out.join("\n") + "\n";
}
