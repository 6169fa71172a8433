/**
 * Spin-S operators in the (2S+1)-dimensional basis |S, m>, ordered m = S, S-1, ..., -S (index
 * i = S - m). Standard phase convention (Condon-Shortley): <m+1|S+|m> = sqrt(S(S+1) - m(m+1)) > 0,
 * Sx = (S+ + S-)/2 real, Sy = (S+ - S-)/(2i) imaginary, in units of hbar.
 * Source: J. J. Sakurai, *Modern Quantum Mechanics* (1994), sec. 3.5.
 */
import { InputError } from "../errors.js";

/** Raise an InputError unless S is a positive multiple of 1/2 (within 1e-12). Returns 2S. */
export function checkSpin(S: number, parameter = "S"): number {
  const twoS = Math.round(2 * S);
  if (!Number.isFinite(S) || S <= 0 || Math.abs(2 * S - twoS) > 1e-12) {
    throw new InputError(parameter, S, "a positive multiple of 1/2 (1/2, 1, 3/2, ...)");
  }
  return twoS;
}

/** Basis size 2S+1 and the m value of each index. */
export function spinBasis(S: number): { dim: number; m: Float64Array } {
  const twoS = checkSpin(S);
  const dim = twoS + 1;
  const m = new Float64Array(dim);
  for (let i = 0; i < dim; i++) m[i] = S - i;
  return { dim, m };
}

/** <m+1|S+|m> for the basis state of index i (m = S - i); zero for m = S. */
export function raisingElement(S: number, m: number): number {
  return Math.sqrt(Math.max(0, S * (S + 1) - m * (m + 1)));
}

/** Dense spin matrices (row-major, planar complex): Sx, Sy, Sz. */
export function spinMatrices(S: number): {
  dim: number;
  sxRe: Float64Array;
  syIm: Float64Array;
  szRe: Float64Array;
} {
  const { dim, m } = spinBasis(S);
  const sxRe = new Float64Array(dim * dim);
  const syIm = new Float64Array(dim * dim);
  const szRe = new Float64Array(dim * dim);
  for (let i = 0; i < dim; i++) {
    szRe[i * dim + i] = m[i]!;
    if (i + 1 < dim) {
      // row i (m), column i+1 (m-1): <m|S+|m-1> = sqrt(S(S+1) - (m-1)m)
      const up = raisingElement(S, m[i + 1]!);
      sxRe[i * dim + i + 1] = up / 2;
      sxRe[(i + 1) * dim + i] = up / 2;
      // Sy = (S+ - S-)/(2i): <m|Sy|m-1> = up/(2i) = -i up/2
      syIm[i * dim + i + 1] = -up / 2;
      syIm[(i + 1) * dim + i] = up / 2;
    }
  }
  return { dim, sxRe, syIm, szRe };
}
