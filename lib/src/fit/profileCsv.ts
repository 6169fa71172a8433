/**
 * Line profiles from CSV/TSV text: position, signal and optional sigma columns. Units come from the
 * header ("x (nm)", "signal [mT]") or from options; positions are converted to m and field signals
 * to T, other signals are kept as given with their unit label. The text is never modified; rows with
 * NaN are reported and dropped only when asked; unsorted positions are sorted with a note.
 */
import { InputError } from "../errors.js";
import { parseQuantity } from "../quantity/units.js";

export interface ProfileCsvOptions {
  /** Column names or 0-based indices (defaults: 0, 1 and 2 if present). */
  xColumn?: string | number;
  yColumn?: string | number;
  sigmaColumn?: string | number | null;
  /** Units when the header has none (position default "m"). */
  xUnit?: string;
  yUnit?: string;
  /** Drop rows with NaN / empty values (otherwise they are an error naming the rows). */
  dropNaN?: boolean;
  /** Name for messages (a file name). */
  source?: string;
}

export interface ProfileCsv {
  x: number[];
  y: number[];
  sigma: number[] | null;
  columns: string[];
  xUnit: string;
  /** Unit of y and sigma after conversion ("T" for field units, else as given or ""). */
  yUnit: string;
  droppedRows: number[];
  notes: string[];
}

const unitInName = /^(.*?)\s*[([]\s*([^)\]]*)\s*[)\]]\s*$/;

function splitLine(line: string, delim: string | RegExp): string[] {
  const cells = line
    .trim()
    .split(delim)
    .map((s) => s.trim().replace(/^"(.*)"$/, "$1"));
  if (typeof delim === "string") return cells;
  // whitespace-separated: a unit token "(nm)" or "[mT]" belongs to the name before it
  const out: string[] = [];
  for (const c of cells) {
    if (/^[([]/.test(c) && out.length > 0 && !/^[([][-+.\d]/.test(c)) out[out.length - 1] += " " + c;
    else out.push(c);
  }
  return out;
}

/** A plain decimal number (no hex, binary or octal literals, no "Infinity", no separators). */
const decimalRe = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;

function numeric(tok: string): number {
  if (tok === "" || /^nan$/i.test(tok) || !decimalRe.test(tok)) return Number.NaN;
  return Number(tok);
}

export function readProfileCsv(text: string, options: ProfileCsvOptions = {}): ProfileCsv {
  const src = options.source ?? "profile";
  if (typeof text !== "string") throw new InputError(src, text, "CSV text");
  const lines = text.split(/\r?\n/);
  const body = lines.filter((l) => !l.trim().startsWith("#")).join("\n");
  const delim: string | RegExp = body.includes("\t") ? "\t" : body.includes(",") ? "," : body.includes(";") ? ";" : /\s+/;
  const rows: Array<{ line: number; cells: string[] }> = [];
  let header: string[] | null = null;
  let unitRow: string[] | null = null;
  let unitRowLine = 0;
  lines.forEach((raw, i) => {
    const line = raw.trim();
    if (line === "" || line.startsWith("#")) return;
    const cells = splitLine(line, delim);
    // An optional units row right under the header (as instruments and spreadsheets write it):
    // no cell is a number ("nm, mT, mT" or "(nm), [mT], ").
    if (header !== null && unitRow === null && rows.length === 0 && cells.every((c) => c === "" || (!/^nan$/i.test(c) && !decimalRe.test(c)))) {
      unitRow = cells.map((c) => c.replace(/^[([]\s*|\s*[)\]]$/g, "").trim());
      unitRowLine = i + 1;
      return;
    }
    if (header === null && rows.length === 0 && cells.some((c) => c !== "" && !/^nan$/i.test(c) && !decimalRe.test(c) && !/^[+-]?(0[xXbBoO][\da-fA-F]+|inf(inity)?)$/i.test(c))) {
      header = cells;
      return;
    }
    rows.push({ line: i + 1, cells });
  });
  if (rows.length === 0) throw new InputError(src, "(no data rows)", "at least one data row of numbers");
  const names: string[] = header ?? rows[0]!.cells.map((_, j) => `column ${j + 1}`);
  const units: string[] = names.map((n) => {
    const m = unitInName.exec(n);
    return m?.[2] ?? "";
  });
  const headerNotes: string[] = [];
  if (unitRow !== null) {
    const row: string[] = unitRow;
    row.forEach((u, j) => {
      if (j >= units.length || u === "") return;
      if (units[j] && units[j] !== u) {
        throw new InputError(`${src} line ${unitRowLine}`, u, `the unit of column "${names[j]}" once: the header says "${units[j]}", the units row "${u}"`);
      }
      units[j] = u;
    });
    headerNotes.push(`units row under the header (line ${unitRowLine}) read: ${names.map((n, j) => `${n} [${units[j] || "no unit"}]`).join(", ")}`);
  }
  const bare = names.map((n) => {
    const m = unitInName.exec(n);
    return (m ? m[1]! : n).trim();
  });
  const pick = (c: string | number | null | undefined, fallback: number | null, role: string): number | null => {
    if (c === null) return null;
    if (c === undefined) return fallback !== null && fallback < names.length ? fallback : null;
    if (typeof c === "number") {
      if (!Number.isInteger(c) || c < 0 || c >= names.length) throw new InputError(`${role}Column`, c, `a column index from 0 to ${names.length - 1}`);
      return c;
    }
    const j = bare.findIndex((b, k) => b === c || names[k] === c);
    if (j < 0) throw new InputError(`${role}Column`, c, `one of the columns: ${names.join(", ")}`);
    return j;
  };
  const jx = pick(options.xColumn, 0, "x");
  const jy = pick(options.yColumn, 1, "y");
  const js = pick(options.sigmaColumn, 2, "sigma");
  if (jx === null || jy === null || names.length < 2) {
    throw new InputError(src, `${names.length} column(s): ${names.join(", ")}`, "at least two columns: position and signal (and optionally sigma)");
  }
  const needed = Math.max(jx, jy, js ?? 0) + 1;
  const notes: string[] = [...headerNotes];
  // An option unit that contradicts the header's is an error, not silently ignored.
  for (const [j, opt, what] of [
    [jx, options.xUnit, "xUnit"],
    [jy, options.yUnit, "yUnit"],
  ] as const) {
    if (opt && units[j] && opt !== units[j]) {
      throw new InputError(what, opt, `no unit option, or the header's unit "${units[j]}" of column "${names[j]}" (the header wins; give one or the other)`);
    }
  }
  if (!units[jx] && !options.xUnit) notes.push(`the position column "${names[jx]}" has no unit in its header: metres assumed (write e.g. "x (nm)" or give a unit option)`);
  const xUnit = units[jx] || options.xUnit || "m";
  let xScale: number;
  try {
    xScale = parseQuantity(`${names[jx]} unit`, `1 ${xUnit}`, "m");
  } catch {
    throw new InputError(`${names[jx]} unit`, xUnit, 'a length unit such as "nm", "um" or "m"');
  }
  const yUnitRaw = units[jy] || options.yUnit || "";
  let yScale = 1;
  let yUnit = yUnitRaw;
  if (yUnitRaw) {
    try {
      yScale = parseQuantity("signal unit", `1 ${yUnitRaw}`, "T");
      yUnit = "T";
    } catch {
      yScale = 1; // not a field: keep the user's unit label
    }
  }
  const x: number[] = [];
  const y: number[] = [];
  const sigma: number[] | null = js !== null ? [] : null;
  const dropped: number[] = [];
  const nanRows: string[] = [];
  for (const r of rows) {
    if (r.cells.length < needed) {
      throw new InputError(
        `${src} line ${r.line}`,
        r.cells.join(", "),
        `${needed} columns (${[names[jx], names[jy], js !== null ? names[js] : null].filter(Boolean).join(", ")}); the row has ${r.cells.length}`,
      );
    }
    const vx = numeric(r.cells[jx]!);
    const vy = numeric(r.cells[jy]!);
    const vs = js !== null ? numeric(r.cells[js]!) : 1;
    for (const [v, j] of [
      [vx, jx],
      [vy, jy],
      [vs, js ?? jx],
    ] as Array<[number, number]>) {
      if (Number.isNaN(v) && !(r.cells[j] === "" || /^nan$/i.test(r.cells[j]!))) {
        throw new InputError(`${src} line ${r.line}, column ${names[j]}`, r.cells[j], "a decimal number such as 12.5 or -3e-9 (no hex, binary or octal literals, no Infinity)");
      }
      if (!Number.isNaN(v) && !Number.isFinite(v)) {
        throw new InputError(`${src} line ${r.line}, column ${names[j]}`, r.cells[j], "a finite number (this one is beyond the range of double precision)");
      }
    }
    if (Number.isNaN(vx) || Number.isNaN(vy) || Number.isNaN(vs)) {
      nanRows.push(`line ${r.line}`);
      dropped.push(r.line);
      continue;
    }
    if (js !== null && !(vs > 0 && Number.isFinite(vs))) {
      throw new InputError(`${src} line ${r.line}, column ${names[js]}`, r.cells[js], "a positive, finite standard deviation (drop the column if the errors are unknown)");
    }
    x.push(vx * xScale);
    y.push(vy * yScale);
    if (sigma) sigma.push(vs * yScale);
  }
  if (nanRows.length > 0) {
    if (!options.dropNaN) {
      throw new InputError(
        src,
        `NaN or empty values at ${nanRows.slice(0, 10).join(", ")}${nanRows.length > 10 ? ` and ${nanRows.length - 10} more` : ""}`,
        "finite numbers in every row, or the drop-NaN option (helicoid fit --drop-nan, readProfileCsv dropNaN) to drop those rows",
      );
    }
    notes.push(`dropped ${nanRows.length} row(s) with NaN or empty values: ${nanRows.slice(0, 10).join(", ")}${nanRows.length > 10 ? " ..." : ""}`);
  }
  let sorted = true;
  for (let i = 1; i < x.length; i++) if (x[i]! < x[i - 1]!) sorted = false;
  if (!sorted) {
    const order = x.map((_, i) => i).sort((a, b) => x[a]! - x[b]!);
    const xs = order.map((i) => x[i]);
    const ys = order.map((i) => y[i]);
    const ss = sigma ? order.map((i) => sigma[i]) : null;
    // Element by element (a spread of 10^5 values into splice overflows the call stack).
    for (let i = 0; i < order.length; i++) {
      x[i] = xs[i]!;
      y[i] = ys[i]!;
      if (sigma && ss) sigma[i] = ss[i]!;
    }
    notes.push("positions were not sorted: rows sorted by position (the file is unchanged)");
  }
  if (x.length >= 2 && x[0] === x[x.length - 1]) {
    throw new InputError(
      `${src}: column ${names[jx]}`,
      `all ${x.length} values equal to ${rows.find((r) => numeric(r.cells[jx]!) * xScale === x[0])?.cells[jx] ?? x[0]}`,
      "positions that vary: all x values are equal: a profile needs a range of positions",
    );
  }
  return { x, y, sigma, columns: names, xUnit, yUnit, droppedRows: dropped, notes };
}

/**
 * The applied field of a profile (T): `field` when given (a quantity such as "5 mT", e.g. the
 * FIELD of `FILE@FIELD` on the command line), else the first comment line of the text with
 * "field: <quantity>" ("# invented data; field: 5 mT; noise 0.02"). Refused with the source named
 * when neither is there. `helicoid fit --series` reads fields with this function.
 */
export function profileField(text: string, options: { source?: string; field?: string | number | null } = {}): number {
  const src = options.source ?? "profile";
  if (options.field !== undefined && options.field !== null) return parseQuantity(`field of ${src}`, options.field, "T");
  if (typeof text !== "string") throw new InputError(src, text, "the text of a profile file");
  for (const line of text.split(/\r?\n/)) {
    const t = line.trim();
    if (!t.startsWith("#")) continue;
    const m = /\bfield\s*:\s*([^;]+)/i.exec(t);
    if (m) return parseQuantity(`field of ${src} (header)`, m[1]!.trim().replace(/[.,]$/, ""), "T");
  }
  throw new InputError(`field of ${src}`, "(missing)", `an applied field: ${src}@<field> (e.g. ${src}@5mT) on the command line, or a comment line "# field: 5 mT" in the file`);
}
