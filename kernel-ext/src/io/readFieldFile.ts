/**
 * Node file access for vector fields: read a file and hand it to the readers of @helicoid/lib
 * (pure TS). The file is only opened for reading, never written.
 *
 * Large files: the size a file declares (a .npy header) is checked against the memory budget
 * (@helicoid/lib checkFieldBudget) before anything is allocated; .npy data are read in chunks
 * straight into the field's own buffer, in any byte order, width and memory order (no copy of the
 * whole file, so a file over 2 GiB is no problem for the reader itself). Tables (CSV, TSV,
 * whitespace) are streamed line by line into typed arrays, the budget checked as rows arrive.
 * JSON is parsed as text, which costs several bytes of memory per byte of file: a JSON file over
 * TEXT_FILE_LIMIT is refused with that estimate and a pointer to .npy.
 */
import { closeSync, openSync, readSync, fstatSync } from "node:fs";
import { basename } from "node:path";
import { InputError, readNpyVectorField, readVectorField, type ReadOptions, type ReadResult } from "@helicoid/lib";
import { DelimitedFieldParser, adoptInterleaved, checkFieldBudget, formatBytes, parseNpyHeader, isNpy, FIELD_MEMORY_BUDGET } from "@helicoid/lib/internal";

export interface FileReadOptions extends Omit<ReadOptions, "file"> {
  /** Allocate the field in a SharedArrayBuffer (for parallelSkyrmionNumber). Default false. */
  shared?: boolean;
}

/** Largest text field file read (bytes); parsing text takes about 6 bytes of memory per byte of file. */
export const TEXT_FILE_LIMIT = 256e6;
const TEXT_BYTES_PER_BYTE = 6;
const CHUNK = 1 << 24;

function openForReading(path: string): number {
  try {
    return openSync(path, "r");
  } catch (err) {
    const code = (err as NodeJS.ErrnoException).code;
    throw new InputError("file", path, "an existing, readable file", code === "ENOENT" ? "no such file" : code === "EISDIR" ? "it is a directory" : (err as Error).message);
  }
}

function readFully(fd: number, into: Uint8Array, position: number): number {
  let got = 0;
  while (got < into.length) {
    const n = readSync(fd, into, got, Math.min(into.length - got, 1 << 30), position + got);
    if (n <= 0) break;
    got += n;
  }
  return got;
}

/** Read a vector field file (.npy, .csv, .tsv, .txt, .json; chosen by extension or content). */
export function readVectorFieldFile(path: string, options: FileReadOptions = {}): ReadResult {
  const fd = openForReading(path);
  const name = basename(path);
  try {
    const st = fstatSync(fd);
    if (st.isDirectory()) throw new InputError("file", path, "a file, not a directory");
    const size = st.size;
    let head = new Uint8Array(Math.min(size, 65536));
    readFully(fd, head, 0);
    if (isNpy(head) || /\.npy$/i.test(name)) {
      // A header longer than the first read (allowed by format 2.0) is read in full first.
      if (isNpy(head) && head.length >= 12 && head[6]! >= 2) {
        const len = 12 + (head[8]! | (head[9]! << 8) | (head[10]! << 16)) + head[11]! * 16777216;
        if (len > head.length && len <= Math.min(size, 1 << 24)) {
          head = new Uint8Array(len);
          readFully(fd, head, 0);
        }
      }
      return readNpyChunked(fd, size, head, name, options);
    }
    const ext = /\.([a-z0-9]+)$/i.exec(name)?.[1]?.toLowerCase();
    const json =
      ext === "json" || ((ext === undefined || !["csv", "tsv", "txt", "dat", "tab"].includes(ext)) && new TextDecoder().decode(head.subarray(0, 64)).trimStart().startsWith("{"));
    if (!json) return sharedIfAsked(readDelimitedStreaming(fd, size, name, options), options);
    if (size > TEXT_FILE_LIMIT) {
      throw new InputError(
        `${name}: size`,
        formatBytes(size),
        `a JSON field file of at most ${formatBytes(TEXT_FILE_LIMIT)}`,
        `Parsing text needs about ${formatBytes(size * TEXT_BYTES_PER_BYTE)} of memory (budget ${formatBytes(FIELD_MEMORY_BUDGET)}); save large fields as .npy (float64 or float32, shape (ny, nx, 3)), which is read in chunks`,
      );
    }
    const bytes = new Uint8Array(size);
    const got = readFully(fd, bytes, 0);
    return sharedIfAsked(readVectorField(bytes.subarray(0, got), { ...options, file: name }), options);
  } finally {
    closeSync(fd);
  }
}

function sharedIfAsked(result: ReadResult, options: FileReadOptions): ReadResult {
  if (options.shared) {
    const sab = new SharedArrayBuffer(result.field.m.byteLength);
    const m = new Float64Array(sab);
    m.set(result.field.m);
    result.field.m = m;
  }
  return result;
}

/**
 * A CSV/TSV/whitespace table read from the file 16 MB at a time into @helicoid/lib's
 * DelimitedFieldParser as bytes: rows of plain numbers are parsed from the bytes straight into typed
 * arrays (no string per line or per value), sized once from the file's size; the memory budget is
 * checked as rows arrive.
 */
function readDelimitedStreaming(fd: number, size: number, name: string, options: FileReadOptions): ReadResult {
  const parser = new DelimitedFieldParser({ ...options, file: name }, size);
  const chunk = new Uint8Array(Math.min(CHUNK, Math.max(size, 1)));
  for (let pos = 0; pos < size;) {
    const n = readSync(fd, chunk, 0, Math.min(chunk.length, size - pos), pos);
    if (n <= 0) break;
    pos += n;
    parser.bytes(chunk.subarray(0, n), false);
  }
  parser.bytes(new Uint8Array(0), true);
  return parser.finish();
}

/**
 * A .npy field read chunk by chunk into its Float64Array: float32/float64, either byte order, C or
 * Fortran order. Header, dtype and shape problems are reported by @helicoid/lib's reader (from
 * the header bytes alone), so the messages are the same as in the browser.
 */
function readNpyChunked(fd: number, size: number, head: Uint8Array, name: string, options: FileReadOptions): ReadResult {
  const h = parseNpyHeader(head, name);
  const typeMatch = /^([<>=|])f([48])$/.exec(h.descr);
  const shapeOk = (h.shape.length === 3 || h.shape.length === 4) && h.shape[h.shape.length - 1] === 3 && h.shape.every((n) => n >= 1);
  if (!typeMatch || !shapeOk) {
    readNpyVectorField(head, { ...options, file: name }); // throws the InputError naming dtype or shape
    throw new InputError(`${name}: header`, h.descr, "a float32 or float64 vector field");
  }
  const [nz, ny, nx] = h.shape.length === 3 ? [1, h.shape[0]!, h.shape[1]!] : [h.shape[0]!, h.shape[1]!, h.shape[2]!];
  checkFieldBudget(name, nx, ny, nz);
  const little = typeMatch[1] !== ">";
  const width = Number(typeMatch[2]);
  const count = 3 * nx * ny * nz;
  const need = count * width;
  const have = size - h.dataOffset;
  const shapeStr = `(${h.shape.join(", ")})`;
  if (have < need) throw new InputError(`${name}: data`, `${have} bytes`, `${need} bytes for shape ${shapeStr} of ${h.descr} (the file is truncated)`);
  const notes: string[] = [];
  if (typeMatch[1] === "=") notes.push("byte order '=' (native) read as little endian");
  if (have > need) notes.push(`${have - need} bytes after the data were ignored`);
  const buffer = options.shared ? new SharedArrayBuffer(8 * count) : new ArrayBuffer(8 * count);
  const out = new Float64Array(buffer);
  if (!h.fortranOrder && little && width === 8) {
    // Our own layout byte for byte: read straight into the field.
    const bytes = new Uint8Array(buffer);
    for (let off = 0; off < need; off += CHUNK) {
      const part = bytes.subarray(off, Math.min(need, off + CHUNK));
      if (readFully(fd, part, h.dataOffset + off) !== part.length) throw new InputError(`${name}: data`, "a short read", `${need} bytes`);
    }
  } else {
    const chunkElems = Math.floor(CHUNK / width);
    const chunk = new Uint8Array(chunkElems * width);
    const view = new DataView(chunk.buffer);
    // Fortran order: element (k, j, i, c) of shape (nz, ny, nx, 3) is at source index k + nz*(j + ny*(i + nx*c)).
    let k = 0,
      j = 0,
      i = 0,
      c = 0;
    for (let src = 0; src < count; src += chunkElems) {
      const n = Math.min(chunkElems, count - src);
      const part = chunk.subarray(0, n * width);
      if (readFully(fd, part, h.dataOffset + src * width) !== part.length) throw new InputError(`${name}: data`, "a short read", `${need} bytes`);
      for (let e = 0; e < n; e++) {
        const v = width === 8 ? view.getFloat64(8 * e, little) : view.getFloat32(4 * e, little);
        if (!h.fortranOrder) out[src + e] = v;
        else {
          out[3 * ((k * ny + j) * nx + i) + c] = v;
          if (++k === nz) {
            k = 0;
            if (++j === ny) {
              j = 0;
              if (++i === nx) {
                i = 0;
                c++;
              }
            }
          }
        }
      }
    }
  }
  const g: Parameters<typeof adoptInterleaved>[1] = { nx, ny, nz, dx: options.dx ?? 1e-9, source: name };
  if (options.dy !== undefined) g.dy = options.dy;
  if (options.dz !== undefined) g.dz = options.dz;
  if (options.dx === undefined) notes.push("a .npy file carries no cell size: 1 nm assumed (give dx, dy, dz to change it)");
  const field = adoptInterleaved(out, g, options.threshold !== undefined ? { threshold: options.threshold, source: name } : { source: name });
  return { field, info: { file: name, format: "npy", vacuumCells: field.vacuumCells, missingCells: 0, notes } };
}
