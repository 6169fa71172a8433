/**
 * NumPy .npy reader for vector fields, after the format specification (numpy/lib/format.py, versions
 * 1.0, 2.0 and 3.0): magic "\x93NUMPY", major and minor version bytes, header length (uint16 little
 * endian for v1, uint32 for v2/v3), an ASCII (v1/v2) or UTF-8 (v3) Python dict literal with keys
 * 'descr', 'fortran_order' and 'shape', padded with spaces and ending in "\n"; then the raw data.
 * Accepted: float32/float64 in either byte order ('<f4', '>f4', '<f8', '>f8'; '=' is read as
 * little endian), shapes (ny, nx, 3) and (nz, ny, nx, 3), or component-first (3, ny, nx) and
 * (3, nz, ny, nx) (the layout read is said in a note), C or Fortran order. The output is a new
 * Float64Array (the input bytes are never changed). Hand-written: no TypeScript .npy library is
 * maintained for both Node and browsers.
 */
import { InputError } from "../errors.js";
import { checkFieldBudget } from "./budget.js";
import { adoptInterleaved } from "../topology/field.js";
import type { ReadOptions, ReadResult } from "./readResult.js";
import { bytesToText } from "./text.js";

export interface NpyHeader {
  version: [number, number];
  descr: string;
  fortranOrder: boolean;
  shape: number[];
  /** Byte offset of the data. */
  dataOffset: number;
}

const MAGIC = [0x93, 0x4e, 0x55, 0x4d, 0x50, 0x59];

export function isNpy(bytes: Uint8Array): boolean {
  return bytes.length >= 6 && MAGIC.every((b, k) => bytes[k] === b);
}

export function parseNpyHeader(bytes: Uint8Array, file = "array.npy"): NpyHeader {
  if (!isNpy(bytes))
    throw new InputError(file, `${bytes.length} bytes starting with ${JSON.stringify(bytesToText(bytes.subarray(0, 6)))}`, 'a .npy file starting with "\\x93NUMPY"');
  if (bytes.length < 10) throw new InputError(file, `${bytes.length} bytes`, "a .npy header of at least 10 bytes");
  const major = bytes[6]!,
    minor = bytes[7]!;
  let headerLen: number, start: number;
  if (major === 1) {
    headerLen = bytes[8]! | (bytes[9]! << 8);
    start = 10;
  } else if (major === 2 || major === 3) {
    if (bytes.length < 12) throw new InputError(file, `${bytes.length} bytes`, "a .npy v2/v3 header of at least 12 bytes");
    headerLen = (bytes[8]! | (bytes[9]! << 8) | (bytes[10]! << 16)) + bytes[11]! * 16777216;
    start = 12;
  } else {
    throw new InputError(`${file}: format version`, `${major}.${minor}`, ".npy format version 1.0, 2.0 or 3.0");
  }
  if (start + headerLen > bytes.length) throw new InputError(`${file}: header length`, headerLen, `at most ${bytes.length - start} bytes (the file is truncated)`);
  const text = bytesToText(bytes.subarray(start, start + headerLen));
  const descr = /['"]descr['"]\s*:\s*['"]([^'"]*)['"]/.exec(text)?.[1];
  const fo = /['"]fortran_order['"]\s*:\s*(True|False)/.exec(text)?.[1];
  const shapeText = /['"]shape['"]\s*:\s*\(([^)]*)\)/.exec(text)?.[1];
  if (descr === undefined || fo === undefined || shapeText === undefined) {
    throw new InputError(`${file}: header`, text.trim(), "a dict with 'descr', 'fortran_order' and 'shape'");
  }
  const shape = shapeText
    .split(",")
    .map((s) => s.trim())
    .filter((s) => s.length > 0)
    .map(Number);
  if (shape.some((n) => !Number.isInteger(n) || n < 0)) throw new InputError(`${file}: shape`, `(${shapeText})`, "a tuple of whole numbers");
  return { version: [major, minor], descr, fortranOrder: fo === "True", shape, dataOffset: start + headerLen };
}

const EXPECTED_SHAPES = "(ny, nx, 3) or (nz, ny, nx, 3), or component-first (3, ny, nx) or (3, nz, ny, nx)";

/** Read a .npy vector field (see the file comment for what is accepted). */
export function readNpyVectorField(bytes: Uint8Array, options: ReadOptions = {}): ReadResult {
  const file = options.file ?? "array.npy";
  const h = parseNpyHeader(bytes, file);
  const notes: string[] = [];
  const typeMatch = /^([<>=|])f([48])$/.exec(h.descr);
  if (!typeMatch) throw new InputError(`${file}: dtype`, h.descr, "float32 or float64 ('<f4', '>f4', '<f8', '>f8')");
  const little = typeMatch[1] !== ">";
  if (typeMatch[1] === "=") notes.push("byte order '=' (native) read as little endian");
  const size = Number(typeMatch[2]);
  const shapeStr = `(${h.shape.join(", ")}${h.shape.length === 1 ? "," : ""})`;
  const rank = h.shape.length;
  const componentLast = (rank === 3 || rank === 4) && h.shape[rank - 1] === 3;
  const componentFirst = !componentLast && (rank === 3 || rank === 4) && h.shape[0] === 3;
  if (!componentLast && !componentFirst) {
    throw new InputError(`${file}: shape`, shapeStr, EXPECTED_SHAPES);
  }
  const dims = componentLast ? h.shape.slice(0, rank - 1) : h.shape.slice(1);
  const [nz, ny, nx] = dims.length === 2 ? [1, dims[0]!, dims[1]!] : [dims[0]!, dims[1]!, dims[2]!];
  const names = rank === 3 ? "ny, nx" : "nz, ny, nx";
  notes.push(
    componentLast
      ? `layout read: component-last (${names}, 3) = ${shapeStr}${h.shape[0] === 3 ? " (the shape would also fit component-first (3, " + names + "); component-last was chosen, the default)" : ""}`
      : `layout read: component-first (3, ${names}) = ${shapeStr}`,
  );
  if (nx < 1 || ny < 1 || nz < 1) throw new InputError(`${file}: shape`, shapeStr, `${EXPECTED_SHAPES} with every size >= 1`);
  checkFieldBudget(file, nx, ny, nz);
  const count = 3 * nx * ny * nz;
  const need = count * size;
  const have = bytes.length - h.dataOffset;
  if (have < need) throw new InputError(`${file}: data`, `${have} bytes`, `${need} bytes for shape ${shapeStr} of ${h.descr} (the file is truncated)`);
  if (have > need) notes.push(`${have - need} bytes after the data were ignored`);

  const out = new Float64Array(count);
  const abs = bytes.byteOffset + h.dataOffset;
  if (componentFirst) {
    const view = new DataView(bytes.buffer, abs, need);
    const get = size === 8 ? (k: number) => view.getFloat64(8 * k, little) : (k: number) => view.getFloat32(4 * k, little);
    // element (c, k, j, i) of shape (3, nz, ny, nx): C order ((c nz + k) ny + j) nx + i; Fortran order c + 3 (k + nz (j + ny i))
    for (let c = 0; c < 3; c++)
      for (let k = 0; k < nz; k++)
        for (let j = 0; j < ny; j++)
          for (let i = 0; i < nx; i++) {
            const src = h.fortranOrder ? c + 3 * (k + nz * (j + ny * i)) : ((c * nz + k) * ny + j) * nx + i;
            out[3 * ((k * ny + j) * nx + i) + c] = get(src);
          }
  } else if (!h.fortranOrder && little && size === 8) {
    // C order little-endian float64 is our layout byte for byte: one copy.
    new Uint8Array(out.buffer).set(bytes.subarray(h.dataOffset, h.dataOffset + need));
  } else if (!h.fortranOrder && little && size === 4) {
    const src = abs % 4 === 0 ? new Float32Array(bytes.buffer, abs, count) : new Float32Array(bytes.slice(h.dataOffset, h.dataOffset + need).buffer);
    for (let k = 0; k < count; k++) out[k] = src[k]!;
  } else {
    const view = new DataView(bytes.buffer, abs, need);
    const get = size === 8 ? (k: number) => view.getFloat64(8 * k, little) : (k: number) => view.getFloat32(4 * k, little);
    if (!h.fortranOrder) {
      for (let k = 0; k < count; k++) out[k] = get(k);
    } else {
      // Fortran order: element (k, j, i, c) of shape (nz, ny, nx, 3) sits at k + nz*(j + ny*(i + nx*c)).
      let src = 0;
      for (let c = 0; c < 3; c++)
        for (let i = 0; i < nx; i++)
          for (let j = 0; j < ny; j++)
            for (let k = 0; k < nz; k++) {
              out[3 * ((k * ny + j) * nx + i) + c] = get(src++);
            }
    }
  }
  const g: Parameters<typeof adoptInterleaved>[1] = { nx, ny, nz, dx: options.dx ?? 1e-9, source: file };
  if (options.dy !== undefined) g.dy = options.dy;
  if (options.dz !== undefined) g.dz = options.dz;
  if (options.dx === undefined) notes.push("a .npy file carries no cell size: 1 nm assumed (give dx, dy, dz to change it)");
  const normOpts = options.threshold !== undefined ? { threshold: options.threshold, source: file } : { source: file };
  const field = adoptInterleaved(out, g, normOpts);
  return { field, info: { file, format: "npy", vacuumCells: field.vacuumCells, missingCells: 0, notes } };
}

/** Write a field as a little-endian float64 C-order .npy (v1.0), shape (ny, nx, 3) or (nz, ny, nx, 3). */
export function writeNpyVectorField(field: { nx: number; ny: number; nz: number; m: Float64Array }): Uint8Array {
  const shape = field.nz === 1 ? `(${field.ny}, ${field.nx}, 3)` : `(${field.nz}, ${field.ny}, ${field.nx}, 3)`;
  let header = `{'descr': '<f8', 'fortran_order': False, 'shape': ${shape}, }`;
  const total = 10 + header.length + 1;
  header += " ".repeat((64 - (total % 64)) % 64) + "\n";
  const out = new Uint8Array(10 + header.length + field.m.byteLength);
  out.set(MAGIC, 0);
  out[6] = 1;
  out[7] = 0;
  out[8] = header.length & 255;
  out[9] = header.length >> 8;
  for (let k = 0; k < header.length; k++) out[10 + k] = header.charCodeAt(k);
  out.set(new Uint8Array(field.m.buffer, field.m.byteOffset, field.m.byteLength), 10 + header.length);
  return out;
}
