/**
 * Read a vector field from bytes or text, choosing the reader by file extension (.npy, .json,
 * .csv, .tsv, .txt, .dat) or, failing that, by content (the .npy magic, a leading "{", else a table).
 */
import { InputError } from "../errors.js";
import { readDelimitedVectorField } from "./delimited.js";
import { readJsonVectorField } from "./jsonField.js";
import { isNpy, readNpyVectorField } from "./npy.js";
import type { ReadOptions, ReadResult } from "./readResult.js";

export function readVectorField(input: Uint8Array | string, options: ReadOptions = {}): ReadResult {
  const file = options.file ?? "(input)";
  const ext = /\.([a-z0-9]+)$/i.exec(file)?.[1]?.toLowerCase();
  const bytes = typeof input === "string" ? null : input;
  if (ext === "npy" || (bytes !== null && isNpy(bytes))) {
    if (bytes === null) throw new InputError(file, "text", "the bytes of a .npy file (a Uint8Array)");
    return readNpyVectorField(bytes, { ...options, file });
  }
  if (ext === "json") return readJsonVectorField(input, { ...options, file });
  if (ext === undefined || !["csv", "tsv", "txt", "dat", "tab"].includes(ext)) {
    // sniff
    const head = typeof input === "string" ? input.slice(0, 64) : String.fromCharCode(...input.subarray(0, 64));
    if (head.trimStart().startsWith("{")) return readJsonVectorField(input, { ...options, file });
  }
  return readDelimitedVectorField(input, { ...options, file });
}
