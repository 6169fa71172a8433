/**
 * Memory budget of the vector-field readers: a request is estimated before anything is allocated
 * and refused, with the estimate, when it exceeds the budget (2 GB: what a laptop spares for one
 * field). Per cell a field holds 3 float64 components (24 bytes) plus a vacuum mask, and the
 * charge and object analyses add a density map and labels of about the same size again, so the
 * estimate is 48 bytes per cell. // Common practice, no source
 */
import { InputError } from "../errors.js";

export const FIELD_MEMORY_BUDGET = 2e9;
export const FIELD_BYTES_PER_CELL = 48;

/** "1.6 GB", "820 MB". */
export function formatBytes(bytes: number): string {
  if (bytes >= 1e9) return `${(bytes / 1e9).toPrecision(3)} GB`;
  if (bytes >= 1e6) return `${(bytes / 1e6).toPrecision(3)} MB`;
  return `${Math.round(bytes / 1e3)} kB`;
}

/** Refuse a field of nx*ny*nz cells whose estimated memory exceeds the budget (before allocating it). */
export function checkFieldBudget(file: string, nx: number, ny: number, nz: number, extraBytes = 0): void {
  const cells = nx * ny * nz;
  const bytes = cells * FIELD_BYTES_PER_CELL + extraBytes;
  if (!(bytes <= FIELD_MEMORY_BUDGET)) {
    throw new InputError(
      `${file}: size`,
      `${nx} x ${ny} x ${nz} cells`,
      `a field that fits the memory budget of ${formatBytes(FIELD_MEMORY_BUDGET)}`,
      `Reading and analysing it needs about ${formatBytes(bytes)} (${cells.toExponential(2)} cells x ${FIELD_BYTES_PER_CELL} bytes${extraBytes ? ` + ${formatBytes(extraBytes)}` : ""}); crop or downsample the field`,
    );
  }
}
