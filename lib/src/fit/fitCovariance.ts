/**
 * Covariance of the fitted parameters at the optimum: C = (J^T W J)^-1 of the free parameters not on
 * a bound (J the model Jacobian, W = diag(1/sigma^2)), unscaled (the driver, leastSquares.ts, scales
 * it by the reduced chi-square when the sigmas are unknown). The columns of the weighted Jacobian are
 * normalized first, so the rank decision does not depend on the parameters' units; a clearly well
 * conditioned problem is inverted by Cholesky of the Gram matrix, any other by pivoted QR, and a
 * singular one names the groups of parameters the data cannot tell apart (the near-null space of the
 * normalized J^T J). Source: D. Bates, D. Watts, *Nonlinear Regression Analysis and Its Applications*
 * (Wiley 1988), ch. 2; G. Golub, C. Van Loan, *Matrix Computations* (4th ed. 2013), 5.4 (pivoted QR).
 */
import { pivotedQr, inverseNormalFromQr, symmetricEigen, choleskyLower } from "../numeric/denseLinalg.js";
import { gramMatrix } from "../numeric/gramMatrix.js";
import { gather } from "../numeric/indexing.js";
import type { LeastSquaresProblem } from "./leastSquares.js";
import { weightedJacobian } from "./leastSquaresMinimize.js";

export type CovarianceAtOptimum =
  /** Unscaled covariance of the parameters `inner` (column-major), or null if its inverse failed. */
  | { cov: Float64Array | null; degenerate?: undefined }
  /** Singular Jacobian: the groups of parameters that cannot be told apart, and a message saying so. */
  | { cov: null; degenerate: string[][]; message: string };

/** Covariance of the parameters with indices `inner` at x (see the file header). */
export function covarianceAtOptimum(
  problem: LeastSquaresProblem,
  x: Float64Array,
  inner: number[],
  lo: Float64Array,
  hi: Float64Array,
  singularThreshold: number,
): CovarianceAtOptimum {
  const { m } = problem;
  const names = gather(problem.parameters, inner, "parameters").map((p) => p.name);
  const J = weightedJacobian(problem, x, inner, lo, hi);
  // column-normalized J for the rank decision
  const nn = inner.length;
  const norms = new Float64Array(nn);
  const Jn = J; // normalized in place (J is not needed afterwards)
  for (let c = 0; c < nn; c++) {
    const off = c * m;
    let s = 0;
    for (let i = 0; i < m; i++) {
      const v = J[off + i]!;
      s += v * v;
    }
    const norm = Math.sqrt(s);
    norms[c] = norm;
    const inv = norm > 0 ? 1 / norm : 0;
    for (let i = 0; i < m; i++) Jn[off + i] = J[off + i]! * inv;
  }
  // a derivative that is not finite at the solution (a start or an end far outside the model's
  // range, e.g. w = 8 m for a nanometre wall): no covariance, and the parameters named
  const nonFinite = names.filter((_, c) => !Number.isFinite(norms[c]!));
  if (nonFinite.length > 0)
    return {
      cov: null,
      degenerate: [nonFinite],
      message: `the model's derivatives with respect to ${nonFinite.join(", ")} are not finite at the solution (the fit ended outside the range where the model is computable); no standard errors are reported. Check the start values and their units.`,
    };
  const zeroNames = names.filter((_, c) => norms[c] === 0);
  // fast path: Cholesky of the normalized Gram matrix when clearly well conditioned (its
  // inverse is then accurate to ~cond * eps <= 1e-9 relative); otherwise pivoted QR
  const gram = zeroNames.length === 0 ? gramInverse(Jn, m, nn) : null;
  if (gram) return { cov: unnormalized(gram, norms) };
  const qr = pivotedQr(Jn, m, nn, singularThreshold);
  if (qr.rank === nn && zeroNames.length === 0) {
    const inv = inverseNormalFromQr(qr);
    return { cov: inv ? unnormalized(inv, norms) : null };
  }
  // name the parameters in the near-null space of the normalized J^T J
  const jtj = new Float64Array(nn * nn);
  for (let a = 0; a < nn; a++)
    for (let b = a; b < nn; b++) {
      let s = 0;
      for (let i = 0; i < m; i++) s += Jn[a * m + i]! * Jn[b * m + i]!;
      jtj[a + b * nn] = s;
      jtj[b + a * nn] = s;
    }
  const eig = symmetricEigen(jtj, nn);
  const lmax = eig.values[nn - 1]!;
  const degenerate: string[][] = [];
  for (let e = 0; e < nn; e++) {
    if (eig.values[e]! > singularThreshold * lmax && !(e === 0 && zeroNames.length > 0 && eig.values[e] === 0)) break;
    const group = names.filter((_, c) => Math.abs(eig.vectors[c + e * nn]!) > 0.05);
    if (group.length > 0) degenerate.push(group);
  }
  if (degenerate.length === 0) {
    // rank-deficient for the factorization but no eigenvalue below the threshold: name the
    // parameters of the weakest direction (the eigenvector of the smallest eigenvalue)
    const weakest = names.filter((_, c) => Math.abs(eig.vectors[c]!) > 0.05);
    degenerate.push(zeroNames.length > 0 ? zeroNames : weakest.length > 0 ? weakest : names);
  }
  const message =
    `the Jacobian is singular at the solution: ` +
    degenerate
      .map((g) => (g.length === 1 ? `the data do not depend on ${g[0]}` : `parameters ${g.join(", ")} cannot be told apart (their effects on the model are linearly dependent)`))
      .join("; ") +
    ". Fix one of them or reparametrize; no standard errors are reported.";
  return { cov: null, degenerate, message };
}

/** C_ab = N_ab / (norm_a norm_b): the inverse of the normalized J^T J back in the parameters' units. */
function unnormalized(inv: Float64Array, norms: Float64Array): Float64Array {
  const nn = norms.length;
  const cov = new Float64Array(nn * nn);
  for (let a = 0; a < nn; a++) for (let b = 0; b < nn; b++) cov[a + b * nn] = inv[a + b * nn]! / (norms[a]! * norms[b]!);
  return cov;
}

/**
 * Inverse of the Gram matrix A^T A of a column-normalized A (m x n column-major) by Cholesky, or
 * null when the smallest Cholesky pivot is below 1e-5 of the largest (condition > ~1e10: use QR).
 */
function gramInverse(a: Float64Array, m: number, n: number): Float64Array | null {
  const L = choleskyLower(gramMatrix(a, m, n), n, 1e-5);
  if (!L) return null;
  // inverse: solve L L^T X = I column by column
  const inv = new Float64Array(n * n);
  const y = new Float64Array(n);
  for (let c = 0; c < n; c++) {
    for (let i = 0; i < n; i++) {
      let s = i === c ? 1 : 0;
      for (let k = 0; k < i; k++) s -= L[i + k * n]! * y[k]!;
      y[i] = s / L[i + i * n]!;
    }
    for (let i = n - 1; i >= 0; i--) {
      let s = y[i]!;
      for (let k = i + 1; k < n; k++) s -= L[k + i * n]! * inv[k + c * n]!;
      inv[i + c * n] = s / L[i + i * n]!;
    }
  }
  return inv;
}
