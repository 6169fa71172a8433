import type { VectorField } from "../topology/field.js";

/** What a reader returns: the field (a fresh copy, normalized) and what it found on the way. */
export interface ReadResult {
  field: VectorField;
  info: {
    file: string;
    format: "csv" | "tsv" | "text" | "npy" | "json";
    /** Cells whose vector was zero, tiny or NaN (now vacuum), including missing cells. */
    vacuumCells: number;
    /** Grid cells with no row in a table (also vacuum). */
    missingCells: number;
    /** Statements about how the file was read (units assumed, columns ignored, byte order ...). */
    notes: string[];
    /** Optional boundary hint stored in the file (JSON form). */
    boundary?: string;
  };
}

export interface ReadOptions {
  /** File name used in messages (and to choose the format by extension). */
  file?: string;
  /** Cell sizes (m) for formats that do not carry them (.npy); default 1 nm. */
  dx?: number;
  dy?: number;
  dz?: number;
  /** Vacuum threshold relative to the largest magnitude (default 1e-6). */
  threshold?: number;
}
