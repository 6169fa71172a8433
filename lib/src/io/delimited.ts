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
import { checkFieldBudget, FIELD_MEMORY_BUDGET, formatBytes } from "./budget.js";
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
  const parser = new DelimitedFieldParser(options);
  const lines = bytesToText(input).split(/\r?\n/);
  for (let r = 0; r < lines.length; r++) parser.line(lines[r]!, r + 1);
  return parser.finish();
}

/** A growable Float64Array (rows of a table of unknown length, without a JS array per value). */
class Column {
  data = new Float64Array(1024);
  length = 0;
  push(v: number): void {
    if (this.length === this.data.length) {
      const next = new Float64Array(this.data.length * 2);
      next.set(this.data);
      this.data = next;
    }
    this.data[this.length++] = v;
  }
  view(): Float64Array {
    return this.data.subarray(0, this.length);
  }
}

/** Memory per data row while a table is read: x, y, z, m (48 bytes), its line (8) and the grid arrays (34). */
export const DELIMITED_BYTES_PER_ROW = 90;

/**
 * The table reader as a line consumer: `line(text, lineNumber)` for each line in order, then
 * `finish()`. Values go into typed arrays as they come, so a caller can stream a large file line by
 * line (kernel-ext's readVectorFieldFile does) without holding its text. The rows read so far are
 * checked against the memory budget as they arrive.
 */
export class DelimitedFieldParser {
  private readonly file: string;
  private readonly notes: string[] = [];
  private state: "header" | "units" | "rows" = "header";
  private split: (line: string) => string[] = (l) => [l];
  private delim = "comma";
  private width = 0;
  private col: Partial<Record<Name, number>> = {};
  private units: string[] = [];
  private scale: Record<"x" | "y" | "z", number> = { x: 1, y: 1, z: 1 };
  private numCols: Array<[Name, number]> = [];
  private readonly xs = new Column();
  private readonly ys = new Column();
  private readonly zs = new Column();
  private readonly ms = new Column();
  private readonly rowOf = new Column();
  private readonly vals: Partial<Record<Name, number>> = {};

  constructor(private readonly options: ReadOptions = {}) {
    this.file = options.file ?? "table.csv";
  }

  line(raw: string, lineNumber: number): void {
    const trimmed = raw.trim();
    if (this.state === "header") {
      if (trimmed === "" || trimmed.startsWith("#")) return;
      this.header(raw, lineNumber);
      this.state = "units";
      return;
    }
    if (this.state === "units") {
      if (trimmed === "") return;
      this.state = "rows";
      this.setScales(trimmed.startsWith("#") ? null : raw);
      if (this.unitsConsumed) return;
    }
    if (trimmed === "" || trimmed.startsWith("#")) return;
    this.row(raw, lineNumber);
  }

  private unitsConsumed = false;

  private header(line: string, lineNumber: number): void {
    const file = this.file;
    const sp = splitter(line);
    this.split = sp.split;
    this.delim = sp.name;
    const headerFields = sp.split(line).map(unquote);
    this.width = headerFields.length;
    const ignored: string[] = [];
    headerFields.forEach((raw, k) => {
      const m = /^(.*?)\s*[([]\s*([^)\]]*)\s*[)\]]\s*$/.exec(raw);
      const base = (m ? m[1]! : raw).trim().toLowerCase().replace(/^m_([xyz])$/, "m$1");
      this.units[k] = m ? m[2]!.trim() : "";
      if ((NAMES as readonly string[]).includes(base)) {
        if (this.col[base as Name] !== undefined) throw new InputError(`${file}: header, column ${k + 1}`, raw, `each of ${NAMES.join(", ")} once (${base} appears twice)`);
        this.col[base as Name] = k;
      } else ignored.push(raw);
    });
    const missing = REQUIRED.filter((n) => this.col[n] === undefined);
    if (missing.length > 0) {
      throw new InputError(`${file}: header (row ${lineNumber})`, line.trim(), `columns named ${REQUIRED.join(", ")} (and optionally z), in any order`, `missing: ${missing.join(", ")}`);
    }
    if (ignored.length > 0) this.notes.push(`ignored columns: ${ignored.join(", ")}`);
    this.numCols = NAMES.filter((n) => this.col[n] !== undefined).map((n) => [n, this.col[n]!]);
  }

  /** The optional units row (the first non-empty line after the header), then the coordinate scales. */
  private setScales(candidate: string | null): void {
    if (candidate !== null) {
      const f = this.split(candidate).map(unquote);
      if (f.length === this.width && f.every((s) => !numberRe.test(s) && !nanRe.test(s))) {
        f.forEach((u, k) => { if (u !== "") this.units[k] = u.replace(/^[([]|[)\]]$/g, ""); });
        this.unitsConsumed = true;
      }
    }
    let unitless = false;
    for (const a of ["x", "y", "z"] as const) {
      const k = this.col[a];
      if (k === undefined) continue;
      const u = this.units[k] ?? "";
      if (u === "") { unitless = true; continue; }
      this.scale[a] = parseQuantity(`${this.file}: unit of column ${a}`, `1 ${u}`, "m");
    }
    if (unitless) this.notes.push("coordinates without a unit were taken as metres");
  }

  private row(line: string, lineNumber: number): void {
    const file = this.file;
    const f = this.split(line);
    if (f.length !== this.width) {
      throw new InputError(`${file}: row ${lineNumber}`, `${f.length} field${f.length === 1 ? "" : "s"}`, `${this.width} fields (${this.delim}-separated) as in the header`);
    }
    const vals = this.vals;
    for (const [n, k] of this.numCols) {
      const s = unquote(f[k]!);
      let v: number;
      if (numberRe.test(s)) {
        v = Number(s);
        if (!Number.isFinite(v)) throw new InputError(`${file}: row ${lineNumber}, column ${k + 1} (${n})`, s, "a finite number (this one is beyond the range of double precision)");
      } else if (nanRe.test(s) && n.startsWith("m")) v = NaN;
      else {
        throw new InputError(`${file}: row ${lineNumber}, column ${k + 1} (${n})`, s, n.startsWith("m") ? 'a number (or "nan" for a vacuum cell)' : "a number");
      }
      vals[n] = v;
    }
    const rows = this.xs.length + 1;
    if (rows % 65536 === 0 && rows * DELIMITED_BYTES_PER_ROW > FIELD_MEMORY_BUDGET) {
      throw new InputError(`${file}: size`, `more than ${rows} rows`, `a table that fits the memory budget of ${formatBytes(FIELD_MEMORY_BUDGET)}`, `Reading it needs more than ${formatBytes(rows * DELIMITED_BYTES_PER_ROW)} (${DELIMITED_BYTES_PER_ROW} bytes per row); crop or downsample the field, or save it as .npy`);
    }
    this.xs.push(vals.x! * this.scale.x);
    this.ys.push(vals.y! * this.scale.y);
    this.zs.push(this.col.z === undefined ? 0 : vals.z! * this.scale.z);
    this.ms.push(vals.mx!); this.ms.push(vals.my!); this.ms.push(vals.mz!);
    this.rowOf.push(lineNumber);
  }

  finish(): ReadResult {
    const { file, options, notes } = this;
    if (this.state === "header") throw new InputError(file, "an empty table", `a header line naming the columns ${NAMES.join(", ")} (z optional)`);
    if (this.state === "units") this.setScales(null);
    if (this.xs.length === 0) throw new InputError(file, "a header and no data rows", "at least one data row");
    const xs = this.xs.view(), ys = this.ys.view(), zs = this.zs.view(), ms = this.ms.view(), rowOf = this.rowOf.view();
    const ax = gridAxis(xs, file, "x");
    const ay = gridAxis(ys, file, "y");
    const az = gridAxis(zs, file, "z");
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
    const format = this.delim === "tab" ? "tsv" : this.delim === "comma" ? "csv" : "text";
    return { field, info: { file, format, vacuumCells: field.vacuumCells, missingCells, notes } };
  }
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
