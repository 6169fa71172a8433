/**
 * Our JSON form of a vector field ("helicoid-vector-field", version 1):
 *
 *   {
 *     "kind": "helicoid-vector-field",      required, identifies the form
 *     "version": 1,                          required
 *     "nx": 64, "ny": 64, "nz": 1,           cells along x, y, z (nz optional, default 1)
 *     "cell": ["1 nm", "1 nm", "2 nm"],      dx, dy, dz: numbers in m or strings with a length unit
 *                                            (optional, default 1 nm; dz optional)
 *     "lattice": "square",                   or "triangular" (optional, default "square")
 *     "boundary": "periodic",                optional hint for analyses: periodic, open, periodic-x, periodic-y
 *     "m": [mx0, my0, mz0, mx1, ...]         interleaved components, x fastest, then y, then z;
 *        or [[mx, my, mz], null, ...]        one triple per cell, null = vacuum;
 *     or "mx": [...], "my": [...], "mz": [...]  planar components (null = vacuum)
 *     "note": "invented demo material ..."   free text (optional), kept in the notes
 *   }
 *
 * JSON has no NaN: vacuum cells are null (or zero vectors). Vectors are normalized on reading.
 */
import { InputError } from "../errors.js";
import { checkFieldBudget } from "./budget.js";
import { parseQuantity } from "../quantity/units.js";
import { BOUNDARIES } from "../topology/boundary.js";
import { adoptInterleaved, type VectorField } from "../topology/field.js";
import type { ReadOptions, ReadResult } from "./readResult.js";
import { bytesToText } from "./text.js";

export const JSON_FIELD_KIND = "helicoid-vector-field";

function num(file: string, where: string, v: unknown): number {
  if (v === null) return NaN;
  if (typeof v !== "number" || !Number.isFinite(v)) throw new InputError(`${file}: ${where}`, v, "a finite number (or null for vacuum)");
  return v;
}

export function readJsonVectorField(input: Uint8Array | string | object, options: ReadOptions = {}): ReadResult {
  const file = options.file ?? "field.json";
  let doc: unknown;
  if (typeof input === "object" && !(input instanceof Uint8Array)) doc = input;
  else {
    const text = bytesToText(input as Uint8Array | string);
    try {
      doc = JSON.parse(text);
    } catch (err) {
      throw new InputError(file, `${text.length} characters`, "a JSON document", (err as Error).message);
    }
  }
  if (typeof doc !== "object" || doc === null || Array.isArray(doc)) throw new InputError(file, doc, `a JSON object with "kind": "${JSON_FIELD_KIND}"`);
  const d = doc as Record<string, unknown>;
  if (d.kind !== JSON_FIELD_KIND) throw new InputError(`${file}: kind`, d.kind, `"${JSON_FIELD_KIND}"`);
  if (d.version !== 1) throw new InputError(`${file}: version`, d.version, "1");
  const dims = ["nx", "ny", "nz"].map((k) => {
    const v = d[k] ?? (k === "nz" ? 1 : undefined);
    if (!Number.isInteger(v) || (v as number) < 1) throw new InputError(`${file}: ${k}`, v, "a whole number >= 1");
    return v as number;
  });
  const [nx, ny, nz] = dims as [number, number, number];
  const n = nx * ny * nz;
  const lattice = d.lattice ?? "square";
  if (lattice !== "square" && lattice !== "triangular") throw new InputError(`${file}: lattice`, lattice, '"square" or "triangular"');
  const cell = d.cell ?? [];
  if (!Array.isArray(cell) || cell.length > 3) throw new InputError(`${file}: cell`, cell, "an array [dx, dy, dz] of lengths (numbers in m or strings with a unit)");
  const sizes = cell.map((c, k) => parseQuantity(`${file}: cell[${k}]`, c as number | string, "m"));
  // The declared size is checked before anything is allocated: against the budget, and against
  // the data actually present.
  checkFieldBudget(file, nx, ny, nz);
  if (Array.isArray(d.m) && d.m.length !== n && d.m.length !== 3 * n) {
    throw new InputError(`${file}: m`, d.m, `${3 * n} numbers (interleaved) or ${n} triples for nx*ny*nz = ${nx}*${ny}*${nz} cells`, `found ${d.m.length} entries`);
  }
  if (d.m === undefined && Array.isArray(d.mx) && d.mx.length !== n) {
    throw new InputError(`${file}: mx`, d.mx, `an array of ${n} numbers (nx*ny*nz = ${nx}*${ny}*${nz})`);
  }
  const m = new Float64Array(3 * n);
  const notes: string[] = [];
  if (d.m !== undefined) {
    if (!Array.isArray(d.m)) throw new InputError(`${file}: m`, d.m, "an array of components");
    const a = d.m as unknown[];
    if (a.length === 3 * n && a.every((v) => !Array.isArray(v))) {
      for (let k = 0; k < 3 * n; k++) m[k] = num(file, `m[${k}]`, a[k]);
    } else if (a.length === n) {
      for (let c = 0; c < n; c++) {
        const v = a[c];
        if (v === null) {
          m[3 * c] = NaN;
          continue;
        }
        if (!Array.isArray(v) || v.length !== 3) throw new InputError(`${file}: m[${c}]`, v, "[mx, my, mz] or null (vacuum)");
        for (let q = 0; q < 3; q++) m[3 * c + q] = num(file, `m[${c}][${q}]`, v[q]);
      }
    } else {
      throw new InputError(`${file}: m`, a, `${3 * n} numbers (interleaved) or ${n} triples for nx*ny*nz = ${nx}*${ny}*${nz} cells`, `found ${a.length} entries`);
    }
  } else if (d.mx !== undefined || d.my !== undefined || d.mz !== undefined) {
    ["mx", "my", "mz"].forEach((key, q) => {
      const a = d[key];
      if (!Array.isArray(a) || a.length !== n) throw new InputError(`${file}: ${key}`, a, `an array of ${n} numbers (nx*ny*nz = ${nx}*${ny}*${nz})`);
      for (let c = 0; c < n; c++) m[3 * c + q] = num(file, `${key}[${c}]`, a[c]);
    });
  } else {
    throw new InputError(file, Object.keys(d).join(", "), 'components in "m" (interleaved or triples) or in "mx", "my", "mz"');
  }
  const boundary = d.boundary;
  if (boundary !== undefined && !BOUNDARIES.includes(boundary as never)) throw new InputError(`${file}: boundary`, boundary, BOUNDARIES.join(", "));
  if (typeof d.note === "string") notes.push(d.note);
  const g: Parameters<typeof adoptInterleaved>[1] = { nx, ny, nz, lattice, source: file, dx: sizes[0] ?? options.dx ?? 1e-9 };
  if (sizes[1] !== undefined) g.dy = sizes[1];
  if (sizes[2] !== undefined) g.dz = sizes[2];
  if (sizes.length === 0) notes.push("no cell size given: 1 nm assumed");
  const normOpts = options.threshold !== undefined ? { threshold: options.threshold, source: file } : { source: file };
  const field = adoptInterleaved(m, g, normOpts);
  const info: ReadResult["info"] = { file, format: "json", vacuumCells: field.vacuumCells, missingCells: 0, notes };
  if (typeof boundary === "string") info.boundary = boundary;
  return { field, info };
}

/** Serialize a field in our JSON form (interleaved components, null for vacuum, cell sizes in m). */
export function vectorFieldToJson(field: VectorField, extra: { boundary?: string; note?: string } = {}): string {
  const n = field.nx * field.ny * field.nz;
  const m: Array<number | null> = new Array(3 * n);
  for (let c = 0; c < n; c++) {
    const vac = field.vacuum !== null && field.vacuum[c] === 1;
    for (let q = 0; q < 3; q++) m[3 * c + q] = vac ? null : field.m[3 * c + q]!;
  }
  return JSON.stringify({
    kind: JSON_FIELD_KIND,
    version: 1,
    nx: field.nx,
    ny: field.ny,
    nz: field.nz,
    cell: [field.dx, field.dy, field.dz],
    lattice: field.lattice,
    ...extra,
    m,
  });
}
