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
/** The common length units of coordinate columns, so that reading a table needs no unit engine (the
 * values parseQuantity gives, checked in the tests); other units go to parseQuantity. */
export const LENGTH_UNITS: Readonly<Record<string, number>> = { m: 1, mm: 1e-3, um: 1e-6, µm: 1e-6, μm: 1e-6, nm: 1e-9, pm: 1e-12 };
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

/**
 * The distinct values, sorted: gathered in a Set (a grid axis has few distinct values, so this is
 * one pass without a copy of the column), or a sorted copy when there are very many.
 */
function distinctSorted(values: Float64Array): Float64Array {
  const set = new Set<number>();
  let last = NaN;
  for (let k = 0; k < values.length; k++) {
    const v = values[k]!;
    if (v === last) continue;
    last = v;
    set.add(v);
    if (set.size > 1 << 20) return Float64Array.from(values).sort();
  }
  return Float64Array.from(set).sort();
}

/** Distinct sorted values with a uniform spacing: returns origin, spacing and count. */
function gridAxis(values: Float64Array, file: string, column: string): { origin: number; step: number; n: number } {
  const sorted = distinctSorted(values);
  const min = sorted[0]!,
    max = sorted[sorted.length - 1]!;
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
      throw new InputError(
        `${file}: column ${column}`,
        `spacings ${steps.map((s) => s.toPrecision(4)).join(", ")}${distinct.length > 6 ? ", ..." : ""}`,
        "coordinates on a uniform grid (one spacing per axis)",
      );
    }
  }
  return { origin: min, step, n };
}

export function readDelimitedVectorField(input: Uint8Array | string, options: ReadOptions = {}): ReadResult {
  const parser = new DelimitedFieldParser(options);
  if (typeof input !== "string") {
    parser.bytes(input, true);
    return parser.finish();
  }
  const lines = bytesToText(input).split(/\r?\n/);
  for (let r = 0; r < lines.length; r++) parser.line(lines[r]!, r + 1);
  return parser.finish();
}

/** Exact powers of ten 1e0 .. 1e22 (each a double without rounding). */
const POW10 = Array.from({ length: 23 }, (_, k) => Number(`1e${k}`));
const TWO53 = 2 ** 53;

/** A growable Float64Array (rows of a table of unknown length, without a JS array per value). */
class Column {
  data = new Float64Array(1024);
  length = 0;
  push(v: number): void {
    if (this.length === this.data.length) this.reserve(Math.ceil(this.data.length * 1.5));
    this.data[this.length++] = v;
  }
  /** Grow the storage to `capacity` values (once, when the number of rows can be estimated). */
  reserve(capacity: number): void {
    if (capacity <= this.data.length) return;
    const next = new Float64Array(capacity);
    next.set(this.data.subarray(0, this.length));
    this.data = next;
  }
  view(): Float64Array {
    return this.data.subarray(0, this.length);
  }
}

/** Line numbers of the rows (for messages): 4 bytes a row. */
class LineColumn {
  data = new Uint32Array(1024);
  length = 0;
  push(v: number): void {
    if (this.length === this.data.length) this.reserve(Math.ceil(this.data.length * 1.5));
    this.data[this.length++] = Math.min(v, 0xffffffff);
  }
  reserve(capacity: number): void {
    if (capacity <= this.data.length) return;
    const next = new Uint32Array(capacity);
    next.set(this.data.subarray(0, this.length));
    this.data = next;
  }
  view(): Uint32Array {
    return this.data.subarray(0, this.length);
  }
}

/** Longest line of a table read from bytes: a row of six numbers is under 200 bytes. */
export const MAX_LINE_BYTES = 1 << 20;

/**
 * A plain decimal number (the grammar of numberRe, spaces and tabs around it allowed) from bytes,
 * exactly as Number() converts it, when at most 15 significant digits and a decimal exponent within
 * 22 make the conversion one correctly rounded operation (Clinger's exact case); "nan" where
 * `nanAllowed`. The value goes to out[at] (no number returned: no boxed double per value); false
 * when the token needs the text path.
 */
function parseDecimal(b: Uint8Array, p: number, q: number, nanAllowed: boolean, out: Float64Array, at: number): boolean {
  while (p < q && (b[p] === 32 || b[p] === 9)) p++;
  while (q > p && (b[q - 1] === 32 || b[q - 1] === 9)) q--;
  if (p >= q) return false;
  let neg = false;
  if (b[p] === 45) {
    neg = true;
    p++;
  } else if (b[p] === 43) p++;
  let w = 0;
  let sig = 0;
  let digits = 0;
  let frac = 0;
  let c = b[p];
  while (p < q && (c = b[p]!) >= 48 && c <= 57) {
    if (w !== 0 || c !== 48) {
      w = w * 10 + (c - 48);
      sig++;
    }
    digits++;
    p++;
  }
  if (p < q && b[p] === 46) {
    p++;
    while (p < q && (c = b[p]!) >= 48 && c <= 57) {
      if (w !== 0 || c !== 48) {
        w = w * 10 + (c - 48);
        sig++;
      }
      frac++;
      digits++;
      p++;
    }
  }
  if (digits === 0) {
    if (nanAllowed && q - p === 3 && (b[p]! | 32) === 110 && (b[p + 1]! | 32) === 97 && (b[p + 2]! | 32) === 110) {
      out[at] = NaN;
      return true;
    }
    return false;
  }
  let exp = 0;
  if (p < q && (b[p] === 101 || b[p] === 69)) {
    p++;
    let eneg = false;
    if (p < q && b[p] === 45) {
      eneg = true;
      p++;
    } else if (p < q && b[p] === 43) p++;
    const e0 = p;
    while (p < q && (c = b[p]!) >= 48 && c <= 57) {
      if (exp < 10000) exp = exp * 10 + (c - 48);
      p++;
    }
    if (p === e0) return false;
    if (eneg) exp = -exp;
  }
  if (p !== q) return false;
  if (w === 0) {
    out[at] = neg ? -0 : 0;
    return true;
  }
  if (sig > 15 || w > TWO53) return false;
  const e10 = exp - frac;
  let v: number;
  if (e10 >= 0 && e10 <= 22) v = w * POW10[e10]!;
  else if (e10 < 0 && e10 >= -22) v = w / POW10[-e10]!;
  else return false;
  out[at] = neg ? -v : v;
  return true;
}

/** parseDecimal for callers and tests: the number, or null when the fast path leaves the token to Number(). */
export function parseDecimalBytes(bytes: Uint8Array, start: number, end: number, nanAllowed = false): number | null {
  const out = new Float64Array(1);
  return parseDecimal(bytes, start, end, nanAllowed, out, 0) ? out[0]! : null;
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
  private readonly rowOf = new LineColumn();
  private readonly vals: Partial<Record<Name, number>> = {};

  /**
   * `sizeHint`: the size of the whole input in bytes when known (a file's size): after the first
   * rows the columns are sized once for the rows expected, instead of growing step by step.
   */
  constructor(
    private readonly options: ReadOptions = {},
    private readonly sizeHint = 0,
  ) {
    this.file = options.file ?? "table.csv";
  }

  // ----- byte input: the fast path for large tables -----

  private carry: Uint8Array | null = null;
  private lineNo = 0;
  private rowBytes = 0;
  private reserved = false;
  private delimByte = 44;
  /** Per field of a row: index into NAMES of the value it carries, or -1 (ignored column). */
  private wanted = new Int8Array(0);
  private readonly fast = new Float64Array(NAMES.length);
  private decoder: { decode(b: Uint8Array): string } | null = null;

  /**
   * Feed the table's bytes in pieces of any size, in order (`last` on the final piece). Rows of
   * plain decimal numbers are parsed from the bytes straight into the columns; a header, units row,
   * comment or any row the fast path does not take (quotes, "nan", more than 15 significant digits,
   * exponents beyond 22, other characters) goes through `line()` as text, so the values and the
   * errors are exactly those of the text path (values equal to Number(), correctly rounded:
   * W. D. Clinger, "How to read floating point numbers accurately", PLDI 1990, the exact case).
   */
  bytes(chunk: Uint8Array, last = false): void {
    let buf = chunk;
    if (this.carry) {
      buf = new Uint8Array(this.carry.length + chunk.length);
      buf.set(this.carry);
      buf.set(chunk, this.carry.length);
      this.carry = null;
    }
    const n = buf.length;
    let start = 0;
    for (;;) {
      const end = buf.indexOf(10, start);
      if (end < 0) break;
      this.byteLine(buf, start, end > start && buf[end - 1] === 13 ? end - 1 : end);
      start = end + 1;
    }
    if (start < n) {
      if (last) this.byteLine(buf, start, buf[n - 1] === 13 ? n - 1 : n);
      else {
        if (n - start > MAX_LINE_BYTES) {
          throw new InputError(
            `${this.file}: line ${this.lineNo + 1}`,
            `a line longer than ${formatBytes(MAX_LINE_BYTES)}`,
            "a table of short lines (one row per cell)",
            "This does not look like a text table",
          );
        }
        this.carry = buf.slice(start);
      }
    }
  }

  private byteLine(buf: Uint8Array, s: number, e: number): void {
    const lineNumber = ++this.lineNo;
    if (this.state === "rows" && this.fastRow(buf, s, e, lineNumber)) return;
    if (!this.decoder) {
      const TD = (globalThis as unknown as { TextDecoder?: new (label: string) => { decode(b: Uint8Array): string } }).TextDecoder;
      this.decoder = TD ? new TD("utf-8") : { decode: (b: Uint8Array) => bytesToText(b) };
    }
    const wasRows = this.state === "rows";
    this.line(this.decoder.decode(buf.subarray(s, e)), lineNumber);
    if (!wasRows && this.state === "rows") this.prepareFast();
  }

  private prepareFast(): void {
    this.delimByte = this.delim === "tab" ? 9 : this.delim === "comma" ? 44 : this.delim === "semicolon" ? 59 : -1;
    this.wanted = new Int8Array(this.width).fill(-1);
    for (const [name, k] of this.numCols) this.wanted[k] = NAMES.indexOf(name);
  }

  /** One data row from bytes; false when the row needs the text path. */
  private fastRow(buf: Uint8Array, s: number, e: number, lineNumber: number): boolean {
    const width = this.width;
    const delim = this.delimByte;
    const wanted = this.wanted;
    const vals = this.fast;
    let p = s;
    if (delim < 0) while (p < e && (buf[p] === 32 || buf[p] === 9)) p++;
    if (p >= e) return false;
    let field = 0;
    for (;;) {
      let q = p;
      if (delim >= 0) while (q < e && buf[q] !== delim) q++;
      else while (q < e && buf[q] !== 32 && buf[q] !== 9) q++;
      if (field >= width) return false;
      const want = wanted[field]!;
      if (want >= 0 && !parseDecimal(buf, p, q, want >= 3, vals, want)) return false;
      field++;
      if (q >= e) break;
      if (delim >= 0) p = q + 1;
      else {
        p = q;
        while (p < e && (buf[p] === 32 || buf[p] === 9)) p++;
        if (p >= e) break;
      }
    }
    if (field !== width) return false;
    this.rowBytes += e - s + 1;
    this.store(vals[0]!, vals[1]!, vals[2]!, vals[3]!, vals[4]!, vals[5]!, lineNumber);
    return true;
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
      const base = (m ? m[1]! : raw)
        .trim()
        .toLowerCase()
        .replace(/^m_([xyz])$/, "m$1");
      this.units[k] = m ? m[2]!.trim() : "";
      if ((NAMES as readonly string[]).includes(base)) {
        if (this.col[base as Name] !== undefined) throw new InputError(`${file}: header, column ${k + 1}`, raw, `each of ${NAMES.join(", ")} once (${base} appears twice)`);
        this.col[base as Name] = k;
      } else ignored.push(raw);
    });
    const missing = REQUIRED.filter((n) => this.col[n] === undefined);
    if (missing.length > 0) {
      throw new InputError(
        `${file}: header (row ${lineNumber})`,
        line.trim(),
        `columns named ${REQUIRED.join(", ")} (and optionally z), in any order`,
        `missing: ${missing.join(", ")}`,
      );
    }
    if (ignored.length > 0) this.notes.push(`ignored columns: ${ignored.join(", ")}`);
    this.numCols = NAMES.filter((n) => this.col[n] !== undefined).map((n) => [n, this.col[n]!]);
  }

  /** The optional units row (the first non-empty line after the header), then the coordinate scales. */
  private setScales(candidate: string | null): void {
    if (candidate !== null) {
      const f = this.split(candidate).map(unquote);
      if (f.length === this.width && f.every((s) => !numberRe.test(s) && !nanRe.test(s))) {
        f.forEach((u, k) => {
          if (u !== "") this.units[k] = u.replace(/^[([]|[)\]]$/g, "");
        });
        this.unitsConsumed = true;
      }
    }
    let unitless = false;
    for (const a of ["x", "y", "z"] as const) {
      const k = this.col[a];
      if (k === undefined) continue;
      const u = this.units[k] ?? "";
      if (u === "") {
        unitless = true;
        continue;
      }
      this.scale[a] = LENGTH_UNITS[u] ?? parseQuantity(`${this.file}: unit of column ${a}`, `1 ${u}`, "m");
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
        if (!Number.isFinite(v))
          throw new InputError(`${file}: row ${lineNumber}, column ${k + 1} (${n})`, s, "a finite number (this one is beyond the range of double precision)");
      } else if (nanRe.test(s) && n.startsWith("m")) v = NaN;
      else {
        throw new InputError(`${file}: row ${lineNumber}, column ${k + 1} (${n})`, s, n.startsWith("m") ? 'a number (or "nan" for a vacuum cell)' : "a number");
      }
      vals[n] = v;
    }
    this.store(vals.x!, vals.y!, vals.z ?? 0, vals.mx!, vals.my!, vals.mz!, lineNumber);
  }

  /** One row into the columns (coordinates scaled to metres), within the memory budget. */
  private store(x: number, y: number, z: number, mx: number, my: number, mz: number, lineNumber: number): void {
    const file = this.file;
    const rows = this.xs.length + 1;
    if (!this.reserved && rows === 4096 && this.sizeHint > 0 && this.rowBytes > 0) {
      // Size the columns once for the rows the file holds (estimated from the bytes per row so far).
      this.reserved = true;
      const expect = Math.min(Math.ceil((this.sizeHint / (this.rowBytes / 4095)) * 1.02) + 1024, Math.floor(FIELD_MEMORY_BUDGET / DELIMITED_BYTES_PER_ROW) + 65536);
      for (const c of this.col.z === undefined ? [this.xs, this.ys, this.rowOf] : [this.xs, this.ys, this.zs, this.rowOf]) c.reserve(expect);
      this.ms.reserve(3 * expect);
    }
    if (rows % 65536 === 0 && rows * DELIMITED_BYTES_PER_ROW > FIELD_MEMORY_BUDGET) {
      throw new InputError(
        `${file}: size`,
        `more than ${rows} rows`,
        `a table that fits the memory budget of ${formatBytes(FIELD_MEMORY_BUDGET)}`,
        `Reading it needs more than ${formatBytes(rows * DELIMITED_BYTES_PER_ROW)} (${DELIMITED_BYTES_PER_ROW} bytes per row); crop or downsample the field, or save it as .npy`,
      );
    }
    this.xs.push(x * this.scale.x);
    this.ys.push(y * this.scale.y);
    if (this.col.z !== undefined) this.zs.push(z * this.scale.z);
    this.ms.push(mx);
    this.ms.push(my);
    this.ms.push(mz);
    this.rowOf.push(lineNumber);
  }

  finish(): ReadResult {
    const { file, options, notes } = this;
    if (this.state === "header") throw new InputError(file, "an empty table", `a header line naming the columns ${NAMES.join(", ")} (z optional)`);
    if (this.state === "units") this.setScales(null);
    if (this.xs.length === 0) throw new InputError(file, "a header and no data rows", "at least one data row");
    const xs = this.xs.view(),
      ys = this.ys.view(),
      zs = this.zs.view(),
      ms = this.ms.view(),
      rowOf = this.rowOf.view();
    const ax = gridAxis(xs, file, "x");
    const ay = gridAxis(ys, file, "y");
    const az = this.col.z === undefined ? { origin: 0, step: NaN, n: 1 } : gridAxis(zs, file, "z");
    const nx = ax.n,
      ny = ay.n,
      nz = az.n;
    const n = nx * ny * nz;
    checkFieldBudget(file, nx, ny, nz);
    // Rows in the field's own order (x fastest, one row per cell, none missing, the usual way a
    // table is written): the components read are already the field, no second copy is made.
    let inOrder = xs.length === n;
    for (let k = 0; inOrder && k < xs.length; k++) {
      const i = nx === 1 ? 0 : Math.round((xs[k]! - ax.origin) / ax.step);
      const j = ny === 1 ? 0 : Math.round((ys[k]! - ay.origin) / ay.step);
      const l = nz === 1 ? 0 : Math.round((zs[k]! - az.origin) / az.step);
      if ((l * ny + j) * nx + i !== k) inOrder = false;
    }
    if (inOrder) {
      const dx = Number.isFinite(ax.step) ? ax.step : (options.dx ?? (Number.isFinite(ay.step) ? ay.step : 1e-9));
      const dy = Number.isFinite(ay.step) ? ay.step : (options.dy ?? dx);
      const dz = Number.isFinite(az.step) ? az.step : (options.dz ?? dx);
      const normOpts = options.threshold !== undefined ? { threshold: options.threshold, source: file } : { source: file };
      const field = adoptInterleaved(ms, { nx, ny, nz, dx, dy, dz, source: file }, normOpts, null);
      const format = this.delim === "tab" ? "tsv" : this.delim === "comma" ? "csv" : "text";
      return { field, info: { file, format, vacuumCells: field.vacuumCells, missingCells: 0, notes } };
    }
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
      m[3 * c] = ms[3 * k]!;
      m[3 * c + 1] = ms[3 * k + 1]!;
      m[3 * c + 2] = ms[3 * k + 2]!;
    }
    let missingCells = 0;
    const pre = new Uint8Array(n);
    for (let c = 0; c < n; c++)
      if (present[c] === 0) {
        pre[c] = 1;
        missingCells++;
      }
    if (missingCells > 0) notes.push(`${missingCells} grid cells had no row and are vacuum`);
    const dx = Number.isFinite(ax.step) ? ax.step : (options.dx ?? (Number.isFinite(ay.step) ? ay.step : 1e-9));
    const dy = Number.isFinite(ay.step) ? ay.step : (options.dy ?? dx);
    const dz = Number.isFinite(az.step) ? az.step : (options.dz ?? dx);
    const normOpts = options.threshold !== undefined ? { threshold: options.threshold, source: file } : { source: file };
    const field = adoptInterleaved(m, { nx, ny, nz, dx, dy, dz, source: file }, normOpts, missingCells > 0 ? pre : null);
    const format = this.delim === "tab" ? "tsv" : this.delim === "comma" ? "csv" : "text";
    return { field, info: { file, format, vacuumCells: field.vacuumCells, missingCells, notes } };
  }
}

/** Write a field as CSV with a units row (x, y, z in nm). */
export function writeCsvVectorField(field: { nx: number; ny: number; nz: number; dx: number; dy: number; dz: number; m: Float64Array; vacuum: Uint8Array | null }): string {
  const out: string[] = ["x,y,z,mx,my,mz", "nm,nm,nm,,,"];
  for (let k = 0, c = 0; k < field.nz; k++)
    for (let j = 0; j < field.ny; j++)
      for (let i = 0; i < field.nx; i++, c++) {
        const vac = field.vacuum !== null && field.vacuum[c] === 1;
        const v = vac ? ["nan", "nan", "nan"] : [field.m[3 * c]!, field.m[3 * c + 1]!, field.m[3 * c + 2]!].map(String);
        out.push([(i * field.dx * 1e9).toPrecision(12), (j * field.dy * 1e9).toPrecision(12), (k * field.dz * 1e9).toPrecision(12), ...v].join(","));
      }
  return out.join("\n") + "\n";
}
