/**
 * Double-double arithmetic (about 32 significant digits) and a symmetric eigenvalue routine in it,
 * for quantities that are tiny differences of large eigenvalues (tunnel splittings of a large spin
 * are 1e-10 to 1e-30 of the level energies; double precision leaves ~1e-15 of the largest level).
 * A value is the unevaluated sum hi + lo with |lo| <= ulp(hi) / 2.
 * Sources: T. J. Dekker, Numer. Math. 18, 224 (1971) (exact product by splitting, double-length
 * arithmetic); D. E. Knuth, *The Art of Computer Programming* vol. 2, 4.2.2 (two-sum);
 * Y. Hida, X. S. Li, D. H. Bailey, "Algorithms for quad-double precision" (ARITH 15, 2001).
 */
import { InputError } from "../errors.js";

export type DD = readonly [number, number];

const SPLIT = 134217729; // 2^27 + 1

function twoSum(a: number, b: number): [number, number] {
  const s = a + b;
  const bb = s - a;
  return [s, a - (s - bb) + (b - bb)];
}
function quickTwoSum(a: number, b: number): [number, number] {
  const s = a + b;
  return [s, b - (s - a)];
}
function twoProd(a: number, b: number): [number, number] {
  const p = a * b;
  let t = SPLIT * a;
  const ah = t - (t - a);
  const al = a - ah;
  t = SPLIT * b;
  const bh = t - (t - b);
  const bl = b - bh;
  return [p, ah * bh - p + ah * bl + al * bh + al * bl];
}

export function dd(x: number): DD {
  return [x, 0];
}
export function ddAdd(a: DD, b: DD): DD {
  const [s, e0] = twoSum(a[0], b[0]);
  const [t, f] = twoSum(a[1], b[1]);
  let [s1, e1] = quickTwoSum(s, e0 + t);
  [s1, e1] = quickTwoSum(s1, e1 + f);
  return [s1, e1];
}
export function ddNeg(a: DD): DD {
  return [-a[0], -a[1]];
}
export function ddSub(a: DD, b: DD): DD {
  return ddAdd(a, [-b[0], -b[1]]);
}
export function ddMul(a: DD, b: DD): DD {
  const [p, e] = twoProd(a[0], b[0]);
  return quickTwoSum(p, e + (a[0] * b[1] + a[1] * b[0]));
}
export function ddDiv(a: DD, b: DD): DD {
  const q1 = a[0] / b[0];
  let r = ddSub(a, ddMul(b, [q1, 0]));
  const q2 = r[0] / b[0];
  r = ddSub(r, ddMul(b, [q2, 0]));
  const q3 = r[0] / b[0];
  const [s, e] = quickTwoSum(q1, q2);
  return ddAdd([s, e], [q3, 0]);
}
export function ddSqrt(a: DD): DD {
  if (a[0] <= 0) return [0, 0];
  const x = Math.sqrt(a[0]);
  // One Newton step from the double root doubles the digits.
  const sq = ddMul([x, 0], [x, 0]);
  const corr = ddSub(a, sq)[0] / (2 * x);
  return quickTwoSum(x, corr);
}
export function ddToNumber(a: DD): number {
  return a[0] + a[1];
}

/**
 * Selected eigenvalues (by ascending index) of a real symmetric n x n matrix (row-major, double
 * entries taken as exact), in double-double: Householder tridiagonalization in double-double, then
 * bisection on the Sturm count of the tridiagonal, started from a Gershgorin bracket. The result is
 * accurate to about n * 1e-32 of the matrix norm.
 */
export function symmetricEigenvaluesDD(n: number, input: ArrayLike<number>, indices: number[]): DD[] {
  if (input.length !== n * n) throw new InputError("matrix", input, `an ${n} x ${n} row-major matrix`);
  for (const k of indices) if (!Number.isInteger(k) || k < 0 || k >= n) throw new InputError("indices", k, `whole numbers from 0 to ${n - 1}`);
  const a: DD[] = new Array(n * n);
  for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) a[i * n + j] = [input[Math.max(i, j) * n + Math.min(i, j)]!, 0];
  const v: DD[] = new Array(n).fill([0, 0]);
  const p: DD[] = new Array(n).fill([0, 0]);
  for (let k = 0; k < n - 2; k++) {
    let tail: DD = [0, 0];
    for (let i = k + 2; i < n; i++) tail = ddAdd(tail, ddMul(a[i * n + k]!, a[i * n + k]!));
    if (tail[0] === 0) continue;
    const x0 = a[(k + 1) * n + k]!;
    const norm = ddSqrt(ddAdd(ddMul(x0, x0), tail));
    const alpha = x0[0] >= 0 ? ddNeg(norm) : norm;
    v[k + 1] = ddSub(x0, alpha);
    for (let i = k + 2; i < n; i++) v[i] = a[i * n + k]!;
    const tau = ddDiv([2, 0], ddAdd(ddMul(v[k + 1]!, v[k + 1]!), tail));
    let beta: DD = [0, 0];
    for (let i = k + 1; i < n; i++) {
      let s: DD = [0, 0];
      for (let j = k + 1; j < n; j++) s = ddAdd(s, ddMul(a[i * n + j]!, v[j]!));
      p[i] = ddMul(tau, s);
      beta = ddAdd(beta, ddMul(v[i]!, p[i]!));
    }
    const half = ddMul([0.5, 0], ddMul(tau, beta));
    for (let i = k + 1; i < n; i++) p[i] = ddSub(p[i]!, ddMul(half, v[i]!));
    for (let i = k + 1; i < n; i++) {
      for (let j = k + 1; j <= i; j++) {
        const x = ddSub(a[i * n + j]!, ddAdd(ddMul(v[i]!, p[j]!), ddMul(p[i]!, v[j]!)));
        a[i * n + j] = x;
        a[j * n + i] = x;
      }
    }
    a[(k + 1) * n + k] = alpha;
  }
  const d: DD[] = [];
  const e2: DD[] = [];
  let lo = Infinity;
  let hi = -Infinity;
  for (let i = 0; i < n; i++) {
    d.push(a[i * n + i]!);
    const left = i > 0 ? Math.abs(a[i * n + i - 1]![0]) : 0;
    const right = i < n - 1 ? Math.abs(a[(i + 1) * n + i]![0]) : 0;
    if (i < n - 1) e2.push(ddMul(a[(i + 1) * n + i]!, a[(i + 1) * n + i]!));
    lo = Math.min(lo, d[i]![0] - left - right);
    hi = Math.max(hi, d[i]![0] + left + right);
  }
  const width = Math.max(hi - lo, 1e-300);
  lo -= 1e-6 * width + 1e-300;
  hi += 1e-6 * width + 1e-300;
  const count = (x: DD): number => {
    // Number of eigenvalues below x (Sturm sequence of the LDL^T pivots).
    let c = 0;
    let q = ddSub(d[0]!, x);
    const tiny = 1e-300;
    if (q[0] === 0) q = [-tiny, 0];
    if (q[0] < 0) c++;
    for (let i = 1; i < n; i++) {
      q = ddSub(ddSub(d[i]!, x), ddDiv(e2[i - 1]!, q));
      if (q[0] === 0) q = [-tiny, 0];
      if (q[0] < 0) c++;
    }
    return c;
  };
  return indices.map((k) => {
    let a0: DD = [lo, 0];
    let b0: DD = [hi, 0];
    for (let it = 0; it < 260; it++) {
      const mid = ddMul(ddAdd(a0, b0), [0.5, 0]);
      const gap = ddSub(b0, a0);
      if (Math.abs(gap[0]) <= 1e-31 * Math.max(Math.abs(mid[0]), width)) break;
      if ((mid[0] === a0[0] && mid[1] === a0[1]) || (mid[0] === b0[0] && mid[1] === b0[1])) break;
      if (count(mid) > k) b0 = mid;
      else a0 = mid;
    }
    return ddMul(ddAdd(a0, b0), [0.5, 0]);
  });
}

export interface RayleighQuotientDD {
  /** rho = x^T A x / x^T x in double-double. */
  value: DD;
  /** |A x - rho x| / |x| (double). */
  residual: number;
}

/**
 * Rayleigh quotient of a real symmetric matrix (dense row-major, double entries taken as exact,
 * only |i - j| <= bandwidth read) at a double vector x, accumulated in double-double (exact
 * products by Dekker splitting, two-sums). If x is an eigenvector accurate to an angle phi
 * (phi ~ eps |A| / gap for a backward-stable double solver), rho differs from the eigenvalue by
 * about gap phi^2, i.e. ~ (eps |A|)^2 / gap: double-double accuracy from a double eigenvector. The
 * a-posteriori bound |lambda - rho| <= residual^2 / gap (gap: distance from rho to the rest of the
 * spectrum) holds for the nearest eigenvalue lambda.
 * Sources: B. N. Parlett, *The Symmetric Eigenvalue Problem* (SIAM 1998), theorems 4.5.1 (Rayleigh
 * quotient error) and 11.7.1 (Kato-Temple bound); Dekker (1971) for the exact products.
 */
export function rayleighQuotientDD(n: number, a: ArrayLike<number>, x: ArrayLike<number>, bandwidth = n - 1): RayleighQuotientDD {
  if (a.length !== n * n) throw new InputError("matrix", a, `an ${n} x ${n} row-major matrix`);
  if (x.length < n) throw new InputError("x", x, `a vector of ${n} components`);
  const yh = new Float64Array(n);
  const yl = new Float64Array(n);
  // y = A x in double-double
  for (let i = 0; i < n; i++) {
    let sh = 0;
    let sl = 0;
    const lo = Math.max(0, i - bandwidth),
      hi = Math.min(n - 1, i + bandwidth);
    for (let j = lo; j <= hi; j++) {
      const aij = a[Math.max(i, j) * n + Math.min(i, j)]!;
      const xj = x[j]!;
      const p = aij * xj;
      let t = SPLIT * aij;
      const ah = t - (t - aij);
      const al = aij - ah;
      t = SPLIT * xj;
      const bh = t - (t - xj);
      const bl = xj - bh;
      const pe = ah * bh - p + ah * bl + al * bh + al * bl;
      const s = sh + p;
      const bb = s - sh;
      sl += sh - (s - bb) + (p - bb) + pe;
      sh = s;
    }
    const s = sh + sl;
    yl[i] = sl - (s - sh);
    yh[i] = s;
  }
  // num = x . y, den = x . x in double-double
  let nh = 0,
    nl = 0,
    dh = 0,
    dl = 0;
  for (let i = 0; i < n; i++) {
    const xi = x[i]!;
    let [p, pe] = twoProd(xi, yh[i]!);
    pe += xi * yl[i]!;
    let s = nh + p;
    let bb = s - nh;
    nl += nh - (s - bb) + (p - bb) + pe;
    nh = s;
    [p, pe] = twoProd(xi, xi);
    s = dh + p;
    bb = s - dh;
    dl += dh - (s - bb) + (p - bb) + pe;
    dh = s;
  }
  const num = quickTwoSum(nh, nl);
  const den = quickTwoSum(dh, dl);
  if (den[0] === 0) throw new InputError("x", x, "a non-zero vector");
  const rho = ddDiv(num, den);
  let r2 = 0;
  for (let i = 0; i < n; i++) {
    const [ph, pe] = twoProd(rho[0], x[i]!);
    const r = yh[i]! - ph + (yl[i]! - pe - rho[1] * x[i]!);
    r2 += r * r;
  }
  return { value: rho, residual: Math.sqrt(r2 / ddToNumber(den)) };
}
