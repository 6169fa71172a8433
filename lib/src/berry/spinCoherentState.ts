/**
 * Spin-S states |S, m; n> quantized along a unit vector n = (sin t cos p, sin t sin p, cos t):
 * |S, m; n> = exp(-i p Sz) exp(-i t Sy) |S, m>, so that (n . S) |S, m; n> = m |S, m; n>.
 * Components <m'|S, m; n> = exp(-i m' p) d^S_{m' m}(t) (Wigner D with gamma = 0).
 *
 * The Wigner small-d matrix d^S(t) = exp(-i t Sy) is built by exponentiating Sy through its
 * eigen-decomposition (Sy = U diag(mu) U^H, mu = S..-S): d(t) = U diag(exp(-i t mu)) U^H. This is
 * accurate to ~1e-15 for every S, unlike the alternating factorial sum, which loses digits for
 * large S; the factorial sum is kept as an independent check in the tests.
 * Sources: E. P. Wigner, *Group Theory* (1959), ch. 15; Sakurai (1994), eq. (3.5.50).
 */
import { HermitianEigenSolver } from "../numeric/eigenHermitian.js";
import { spinMatrices, spinBasis } from "./spinOperators.js";

interface SyDecomposition {
  dim: number;
  mu: Float64Array;
  ur: Float64Array;
  ui: Float64Array;
  cr: Float64Array;
  ci: Float64Array;
}
const cache = new Map<number, SyDecomposition>();

function syDecomposition(S: number): SyDecomposition {
  let dec = cache.get(S);
  if (dec) return dec;
  const { dim, syIm } = spinMatrices(S);
  const solver = new HermitianEigenSolver(dim);
  solver.solve(new Float64Array(dim * dim), syIm, true);
  // Eigenvalues are exactly -S..S; use the exact values (removes 1e-16 noise in the phases).
  const mu = new Float64Array(dim);
  for (let k = 0; k < dim; k++) mu[k] = -S + k;
  dec = { dim, mu, ur: Float64Array.from(solver.vectorsRe), ui: Float64Array.from(solver.vectorsIm), cr: new Float64Array(dim), ci: new Float64Array(dim) };
  if (cache.size > 64) cache.clear();
  cache.set(S, dec);
  return dec;
}

/** Column of m of the Wigner small-d matrix: out[i] = d^S_{m_i, m}(t), m_i = S - i. */
export function wignerSmallDColumn(S: number, m: number, t: number, out?: Float64Array): Float64Array {
  if (m === S) return coherentColumn(S, t, out);
  const { dim, mu, ur, ui, cr, ci } = syDecomposition(S);
  const col = Math.round(S - m);
  const res = out ?? new Float64Array(dim);
  // d_{i,col} = sum_k U_ik exp(-i t mu_k) conj(U_col,k); the result is real.
  for (let k = 0; k < dim; k++) {
    const c = Math.cos(t * mu[k]!);
    const s = -Math.sin(t * mu[k]!);
    // exp(-i t mu) * conj(U_col,k)
    const ar = ur[col * dim + k]!;
    const ai = -ui[col * dim + k]!;
    cr[k] = c * ar - s * ai;
    ci[k] = c * ai + s * ar;
  }
  for (let i = 0; i < dim; i++) {
    let sr = 0;
    for (let k = 0; k < dim; k++) sr += ur[i * dim + k]! * cr[k]! - ui[i * dim + k]! * ci[k]!;
    res[i] = sr;
  }
  return res;
}

/**
 * Column m = S (the spin coherent state) in closed form,
 * d^S_{m', S}(t) = sqrt(C(2S, S - m')) cos(t/2)^(S + m') sin(t/2)^(S - m'), evaluated through
 * logarithms: accurate to ~1e-15 RELATIVE in every component, where the eigen-decomposition route
 * is accurate to ~1e-15 absolute only (so its components below ~1e-10 lose digits for S >~ 15, which
 * shows in Berry phases of large spins). Source: Sakurai (1994), eq. (3.8.33); Wigner (1959), ch. 15.
 */
function coherentColumn(S: number, t: number, out?: Float64Array): Float64Array {
  const dim = Math.round(2 * S) + 1;
  const res = out ?? new Float64Array(dim);
  const c = Math.cos(t / 2);
  const s = Math.sin(t / 2);
  const lc = Math.log(Math.abs(c));
  const ls = Math.log(Math.abs(s));
  const twoS = dim - 1;
  // log C(2S, k) accumulated: C(2S, k + 1) = C(2S, k) (2S - k) / (k + 1)
  let logBinom = 0;
  for (let k = 0; k < dim; k++) {
    // index k <-> m' = S - k: cos power 2S - k, sin power k
    const pc = twoS - k;
    const mag = pc === 0 && c === 0 ? 1 : k === 0 && s === 0 ? 1 : Math.exp(0.5 * logBinom + (pc === 0 ? 0 : pc * lc) + (k === 0 ? 0 : k * ls));
    const zero = (c === 0 && pc > 0) || (s === 0 && k > 0);
    const sign = (c < 0 && pc % 2 === 1 ? -1 : 1) * (s < 0 && k % 2 === 1 ? -1 : 1);
    res[k] = zero ? 0 : sign * mag;
    logBinom += Math.log((twoS - k) / (k + 1));
  }
  return res;
}

/** The full small-d matrix, row-major: [i * dim + j] = d^S_{m_i, m_j}(t). */
export function wignerSmallD(S: number, t: number): Float64Array {
  const { dim } = spinBasis(S);
  const out = new Float64Array(dim * dim);
  const col = new Float64Array(dim);
  for (let j = 0; j < dim; j++) {
    wignerSmallDColumn(S, S - j, t, col);
    for (let i = 0; i < dim; i++) out[i * dim + j] = col[i]!;
  }
  return out;
}

/** Planar components of |S, m; n(t, p)>. */
export function spinCoherentState(S: number, m: number, t: number, p: number): { re: Float64Array; im: Float64Array } {
  const { dim, m: ms } = spinBasis(S);
  const d = wignerSmallDColumn(S, m, t);
  const re = new Float64Array(dim);
  const im = new Float64Array(dim);
  for (let i = 0; i < dim; i++) {
    re[i] = Math.cos(ms[i]! * p) * d[i]!;
    im[i] = -Math.sin(ms[i]! * p) * d[i]!;
  }
  return { re, im };
}
