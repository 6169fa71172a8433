/**
 * Node file access for vector fields: read a file into bytes and hand them to the readers of
 * @helicoid/lib (pure TS). The file is only opened for reading, never written.
 * A little-endian float64 C-order .npy is read straight into the field's own buffer (one pass, no
 * second copy), optionally a SharedArrayBuffer for worker threads.
 */
import { closeSync, openSync, readSync, fstatSync, readFileSync } from "node:fs";
import { basename } from "node:path";
import { InputError, adoptInterleaved, parseNpyHeader, readVectorField, isNpy, type ReadOptions, type ReadResult } from "@helicoid/lib";

export interface FileReadOptions extends Omit<ReadOptions, "file"> {
  /** Allocate the field in a SharedArrayBuffer (for parallelSkyrmionNumber). Default false. */
  shared?: boolean;
}

function openForReading(path: string): number {
  try {
    return openSync(path, "r");
  } catch (err) {
    const code = (err as NodeJS.ErrnoException).code;
    throw new InputError("file", path, "an existing, readable file", code === "ENOENT" ? "no such file" : (err as Error).message);
  }
}

/** Read a vector field file (.npy, .csv, .tsv, .txt, .json; chosen by extension or content). */
export function readVectorFieldFile(path: string, options: FileReadOptions = {}): ReadResult {
  const fd = openForReading(path);
  const name = basename(path);
  try {
    const size = fstatSync(fd).size;
    const head = new Uint8Array(Math.min(size, 65536));
    readSync(fd, head, 0, head.length, 0);
    if (isNpy(head)) {
      let h: ReturnType<typeof parseNpyHeader> | null = null;
      try { h = parseNpyHeader(head, name); } catch { h = null; /* long header or bad file: the full reader reports it */ }
      const fast = h !== null && /^[<=]f8$/.test(h.descr) && !h.fortranOrder && (h.shape.length === 3 || h.shape.length === 4) && h.shape[h.shape.length - 1] === 3;
      if (fast && h !== null) {
        const [nz, ny, nx] = h.shape.length === 3 ? [1, h.shape[0]!, h.shape[1]!] : [h.shape[0]!, h.shape[1]!, h.shape[2]!];
        const count = 3 * nx * ny * nz;
        const need = 8 * count;
        if (size - h.dataOffset >= need && count > 0) {
          const buffer = options.shared ? new SharedArrayBuffer(need) : new ArrayBuffer(need);
          const bytes = new Uint8Array(buffer);
          let got = 0;
          while (got < need) {
            const n = readSync(fd, bytes, got, Math.min(need - got, 1 << 30), h.dataOffset + got);
            if (n <= 0) break;
            got += n;
          }
          if (got === need) {
            const notes: string[] = [];
            if (size - h.dataOffset > need) notes.push(`${size - h.dataOffset - need} bytes after the data were ignored`);
            const g: Parameters<typeof adoptInterleaved>[1] = { nx, ny, nz, dx: options.dx ?? 1e-9, source: name };
            if (options.dy !== undefined) g.dy = options.dy;
            if (options.dz !== undefined) g.dz = options.dz;
            if (options.dx === undefined) notes.push("a .npy file carries no cell size: 1 nm assumed (give dx, dy, dz to change it)");
            const field = adoptInterleaved(new Float64Array(buffer), g, options.threshold !== undefined ? { threshold: options.threshold } : {});
            return { field, info: { file: name, format: "npy", vacuumCells: field.vacuumCells, missingCells: 0, notes } };
          }
        }
      }
    }
  } finally {
    closeSync(fd);
  }
  const bytes = readFileSync(path);
  const result = readVectorField(new Uint8Array(bytes.buffer, bytes.byteOffset, bytes.byteLength), { ...options, file: name });
  if (options.shared) {
    const sab = new SharedArrayBuffer(result.field.m.byteLength);
    const m = new Float64Array(sab);
    m.set(result.field.m);
    result.field.m = m;
  }
  return result;
}
