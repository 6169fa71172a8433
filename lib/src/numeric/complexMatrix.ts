/**
 * Small complex dense matrices in planar form (row-major Float64Arrays for real and imaginary
 * parts) and conversion from the shapes users write: number[][], nested arrays of mathjs Complex
 * (or any {re, im}), mathjs Matrix, or { re, im } planar arrays.
 */
import { InputError, describeValue } from "../errors.js";

export interface PlanarMatrix {
  n: number;
  re: Float64Array;
  im: Float64Array;
}

function entry(x: unknown, where: string, parameter: string): [number, number] {
  if (typeof x === "number") return [x, 0];
  if (x && typeof x === "object") {
    const o = x as { re?: unknown; im?: unknown; toNumber?: () => number };
    if (typeof o.re === "number" && typeof o.im === "number") return [o.re, o.im];
    if (typeof o.toNumber === "function") return [o.toNumber(), 0];
  }
  throw new InputError(parameter, `${where} = ${describeValue(x)}`, "matrix entries that are numbers or complex numbers {re, im}");
}

/** Convert a user's square matrix to planar form (a new copy; the input is not modified). */
export function toPlanarMatrix(value: unknown, parameter = "H"): PlanarMatrix {
  let v = value as { toArray?: () => unknown; re?: unknown; im?: unknown };
  if (v && typeof v === "object" && typeof v.toArray === "function") v = v.toArray() as typeof v;
  if (v && typeof v === "object" && !Array.isArray(v) && Array.isArray(v.re)) {
    const re = toPlanarMatrix(v.re, parameter);
    const im = v.im === undefined ? null : toPlanarMatrix(v.im, parameter);
    if (im && im.n !== re.n) throw new InputError(parameter, value, "re and im parts of the same size");
    return { n: re.n, re: re.re, im: im ? im.re : new Float64Array(re.n * re.n) };
  }
  if (!Array.isArray(v) || v.length === 0) throw new InputError(parameter, value, "a square matrix (array of rows)");
  const n = v.length;
  const re = new Float64Array(n * n);
  const im = new Float64Array(n * n);
  for (let i = 0; i < n; i++) {
    const row = (v as unknown[])[i];
    if (!Array.isArray(row) || row.length !== n)
      throw new InputError(parameter, value, `a square ${n} x ${n} matrix (row ${i} has ${Array.isArray(row) ? row.length : "no"} entries)`);
    for (let j = 0; j < n; j++) {
      const [a, b] = entry(row[j], `[${i}][${j}]`, parameter);
      if (!Number.isFinite(a) || !Number.isFinite(b)) throw new InputError(parameter, `[${i}][${j}] = ${a} + ${b}i`, "finite matrix entries");
      re[i * n + j] = a;
      im[i * n + j] = b;
    }
  }
  return { n, re, im };
}

/** Largest |A_ij - B_ij|. */
export function maxAbsDifference(a: PlanarMatrix, b: PlanarMatrix): number {
  let m = 0;
  for (let i = 0; i < a.re.length; i++) m = Math.max(m, Math.hypot(a.re[i]! - b.re[i]!, a.im[i]! - b.im[i]!));
  return m;
}

/** Largest |A_ij|. */
export function maxAbsEntry(a: PlanarMatrix): number {
  let m = 0;
  for (let i = 0; i < a.re.length; i++) m = Math.max(m, Math.hypot(a.re[i]!, a.im[i]!));
  return m;
}

/**
 * Determinant of a small k x k complex matrix (planar, row-major; copied), by LU with partial
 * pivoting. Returns [re, im].
 */
export function complexDeterminant(k: number, re: ArrayLike<number>, im: ArrayLike<number>, scratchRe?: Float64Array, scratchIm?: Float64Array): [number, number] {
  if (k === 1) return [re[0]!, im[0]!];
  if (k === 2) {
    const ar = re[0]! * re[3]! - im[0]! * im[3]! - (re[1]! * re[2]! - im[1]! * im[2]!);
    const ai = re[0]! * im[3]! + im[0]! * re[3]! - (re[1]! * im[2]! + im[1]! * re[2]!);
    return [ar, ai];
  }
  const a = scratchRe ?? new Float64Array(k * k);
  const b = scratchIm ?? new Float64Array(k * k);
  for (let i = 0; i < k * k; i++) {
    a[i] = re[i]!;
    b[i] = im[i]!;
  }
  let dr = 1;
  let di = 0;
  for (let c = 0; c < k; c++) {
    let p = c;
    let best = a[c * k + c]! ** 2 + b[c * k + c]! ** 2;
    for (let r = c + 1; r < k; r++) {
      const m = a[r * k + c]! ** 2 + b[r * k + c]! ** 2;
      if (m > best) {
        best = m;
        p = r;
      }
    }
    if (best === 0) return [0, 0];
    if (p !== c) {
      for (let j = 0; j < k; j++) {
        let t = a[c * k + j]!;
        a[c * k + j] = a[p * k + j]!;
        a[p * k + j] = t;
        t = b[c * k + j]!;
        b[c * k + j] = b[p * k + j]!;
        b[p * k + j] = t;
      }
      dr = -dr;
      di = -di;
    }
    const pr = a[c * k + c]!;
    const pi = b[c * k + c]!;
    const nr = dr * pr - di * pi;
    di = dr * pi + di * pr;
    dr = nr;
    const inv = 1 / best;
    for (let r = c + 1; r < k; r++) {
      // f = A[r][c] / pivot
      const xr = a[r * k + c]!;
      const xi = b[r * k + c]!;
      const fr = (xr * pr + xi * pi) * inv;
      const fi = (xi * pr - xr * pi) * inv;
      for (let j = c + 1; j < k; j++) {
        const yr = a[c * k + j]!;
        const yi = b[c * k + j]!;
        a[r * k + j] = a[r * k + j]! - (fr * yr - fi * yi);
        b[r * k + j] = b[r * k + j]! - (fr * yi + fi * yr);
      }
    }
  }
  return [dr, di];
}
