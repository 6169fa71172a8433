/**
 * Angular-momentum matrices and Stevens operator equivalents O_l^m (l = 2, 4, 6; -l <= m <= l) in
 * the |J, M> basis, for J = 1/2 ... 8 (integer and half-integer).
 *
 * Basis: index i = 0 .. 2J holds M = J - i (highest M first). Matrices are n x n, n = 2J + 1,
 * complex, stored planar row-major (re, im), as the library's Hermitian eigensolver takes them.
 *
 * Construction (Stevens' operator-equivalent rule): O_l^m is the fully symmetrized operator of a
 * harmonic polynomial p_lm(x, y, z) of degree l, with x, y, z -> J_x, J_y, J_z:
 *   p_lm = P_lm(z, r) Re[(x + i y)^m]        (m >= 0, "cosine" operators)
 *   p_l,-m = P_lm(z, r) Im[(x + i y)^m]      (m > 0, "sine" operators)
 * where P_lm(z, r) is d^m P_l(z) / dz^m (P_l the Legendre polynomial) made homogeneous of degree
 * l - m with r^2 = x^2 + y^2 + z^2 and scaled to coprime integer coefficients with a positive
 * leading coefficient. This reproduces the normalization of the tables: O_2^0 = 3 J_z^2 - X,
 * O_4^0 = 35 J_z^4 - (30 X - 25) J_z^2 + 3 X^2 - 6 X, O_l^l = (J_+^l + J_-^l) / 2, and for the sine
 * operators O_l^-l = (J_+^l - J_-^l) / (2i) (X = J(J+1)).
 * Sources: K. Stevens, Proc. Phys. Soc. A 65, 209 (1952); M. Hutchings, Solid State Physics 16, 227
 * (1964) (table of O_l^m in terms of J_z, J_+, J_-).
 *
 * Symmetrization: Sym(x^a y^b z^c) is the average over all orderings of the l factors. It is read off
 * the expansion (s . J)^l = sum_{a+b+c=l} [l! / (a! b! c!)] s_x^a s_y^b s_z^c Sym(J_x^a J_y^b J_z^c),
 * built by l successive multiplications of a polynomial with matrix coefficients (at most 28
 * monomials for l = 6), so Sym(x^a y^b z^c) = (a! b! c! / l!) [coefficient of s^(a,b,c)].
 * A symmetrized harmonic polynomial of degree l is a pure rank-l tensor operator; the lower-order
 * terms of the tables (the -25 in O_4^0 and so on) come out of the symmetrization.
 */
import { InputError } from "../errors.js";

/** A complex n x n matrix, planar row-major. */
export interface ComplexMatrix {
  n: number;
  re: Float64Array;
  im: Float64Array;
}

export const maxTwiceJ = 16;

/** Check J: a positive multiple of 1/2 up to 8. Returns 2J. */
export function twiceJ(J: number, parameter = "J"): number {
  const t = 2 * J;
  if (!Number.isFinite(J) || Math.abs(t - Math.round(t)) > 1e-9 || Math.round(t) < 1 || Math.round(t) > maxTwiceJ) {
    throw new InputError(parameter, J, "a total angular momentum J = 1/2, 1, 3/2, ... 8");
  }
  return Math.round(t);
}

export function zeroMatrix(n: number): ComplexMatrix {
  return { n, re: new Float64Array(n * n), im: new Float64Array(n * n) };
}

export function matMul(a: ComplexMatrix, b: ComplexMatrix): ComplexMatrix {
  const n = a.n;
  const c = zeroMatrix(n);
  for (let i = 0; i < n; i++) {
    for (let k = 0; k < n; k++) {
      const ar = a.re[i * n + k]!,
        ai = a.im[i * n + k]!;
      if (ar === 0 && ai === 0) continue;
      for (let j = 0; j < n; j++) {
        const br = b.re[k * n + j]!,
          bi = b.im[k * n + j]!;
        c.re[i * n + j]! += ar * br - ai * bi;
        c.im[i * n + j]! += ar * bi + ai * br;
      }
    }
  }
  return c;
}

/** a += s b (s real). */
export function addScaled(a: ComplexMatrix, b: ComplexMatrix, s: number): void {
  for (let q = 0; q < a.re.length; q++) {
    a.re[q]! += s * b.re[q]!;
    a.im[q]! += s * b.im[q]!;
  }
}

/** J_x, J_y, J_z, J_+, J_- for the given J (basis M = J, J - 1, ..., -J). */
export function angularMomentum(J: number): { x: ComplexMatrix; y: ComplexMatrix; z: ComplexMatrix; plus: ComplexMatrix; minus: ComplexMatrix } {
  const t = twiceJ(J);
  const n = t + 1;
  const jj = t / 2;
  const x = zeroMatrix(n),
    y = zeroMatrix(n),
    z = zeroMatrix(n),
    plus = zeroMatrix(n),
    minus = zeroMatrix(n);
  for (let i = 0; i < n; i++) {
    const M = jj - i;
    z.re[i * n + i] = M;
    if (i > 0) {
      // <M + 1 | J+ | M> = sqrt(J(J+1) - M(M+1)); row i - 1 holds M + 1
      const v = Math.sqrt(jj * (jj + 1) - M * (M + 1));
      plus.re[(i - 1) * n + i] = v;
      minus.re[i * n + (i - 1)] = v;
      // J_x = (J+ + J-)/2, J_y = (J+ - J-)/(2i)
      x.re[(i - 1) * n + i] = v / 2;
      x.re[i * n + (i - 1)] = v / 2;
      y.im[(i - 1) * n + i] = -v / 2;
      y.im[i * n + (i - 1)] = v / 2;
    }
  }
  return { x, y, z, plus, minus };
}

// ------------------------------------------------------------ polynomials in x, y, z
type Poly = Map<number, number>; // key a * 64 + b * 8 + c -> coefficient of x^a y^b z^c
const key = (a: number, b: number, c: number) => a * 64 + b * 8 + c;
const unkey = (k: number): [number, number, number] => [k >> 6, (k >> 3) & 7, k & 7];

function polyMul(p: Poly, q: Poly): Poly {
  const out: Poly = new Map();
  for (const [kp, cp] of p) {
    const [a1, b1, c1] = unkey(kp);
    for (const [kq, cq] of q) {
      const [a2, b2, c2] = unkey(kq);
      const k = key(a1 + a2, b1 + b2, c1 + c2);
      out.set(k, (out.get(k) ?? 0) + cp * cq);
    }
  }
  return out;
}

function factorial(n: number): number {
  let f = 1;
  for (let i = 2; i <= n; i++) f *= i;
  return f;
}

function gcd(a: number, b: number): number {
  a = Math.abs(a);
  b = Math.abs(b);
  while (b) [a, b] = [b, a % b];
  return a;
}

/** Coprime integer coefficients c_k of d^m P_l / dz^m = sum_k c_k z^(l - m - 2k) (up to a positive factor). */
export function legendreDerivativeCoefficients(l: number, m: number): number[] {
  // 2^l P_l(z) = sum_k (-1)^k (2l - 2k)! / (k! (l - k)! (l - 2k)!) z^(l - 2k): integers
  const out: number[] = [];
  for (let k = 0; 2 * k <= l - m; k++) {
    const p = l - 2 * k;
    let c = ((-1) ** k * factorial(2 * l - 2 * k)) / (factorial(k) * factorial(l - k) * factorial(l - 2 * k));
    c *= factorial(p) / factorial(p - m); // m-th derivative of z^p
    out.push(Math.round(c));
  }
  const g = out.reduce((acc, c) => gcd(acc, c), 0);
  return out.map((c) => c / g);
}

/** The harmonic polynomial p_lm(x, y, z) of the operator O_l^m (see the file header). */
export function stevensPolynomial(l: number, m: number): Map<string, number> {
  const p = harmonic(l, m);
  const out = new Map<string, number>();
  for (const [k, c] of p) if (c !== 0) out.set(unkey(k).join(","), c);
  return out;
}

function harmonic(l: number, m: number): Poly {
  const am = Math.abs(m);
  const coeffs = legendreDerivativeCoefficients(l, am);
  const r2: Poly = new Map([
    [key(2, 0, 0), 1],
    [key(0, 2, 0), 1],
    [key(0, 0, 2), 1],
  ]);
  // z part: sum_k c_k z^(l - m - 2k) r^(2k)
  const zPart: Poly = new Map();
  let r2k: Poly = new Map([[0, 1]]);
  coeffs.forEach((c, k) => {
    if (k > 0) r2k = polyMul(r2k, r2);
    const term = polyMul(r2k, new Map([[key(0, 0, l - am - 2 * k), c]]));
    for (const [kk, v] of term) zPart.set(kk, (zPart.get(kk) ?? 0) + v);
  });
  // (x + i y)^m: Re (m >= 0) or Im (m < 0)
  const xy: Poly = new Map();
  for (let k = 0; k <= am; k++) {
    const binom = factorial(am) / (factorial(k) * factorial(am - k));
    // (i y)^k = i^k y^k
    const re = k % 4 === 0 ? 1 : k % 4 === 2 ? -1 : 0;
    const im = k % 4 === 1 ? 1 : k % 4 === 3 ? -1 : 0;
    const c = m >= 0 ? re : im;
    if (c !== 0) xy.set(key(am - k, k, 0), binom * c);
  }
  return polyMul(zPart, xy);
}

function checkLm(l: number, m: number): void {
  if (![2, 4, 6].includes(l)) throw new InputError("l", l, "a Stevens operator rank l = 2, 4 or 6");
  if (!Number.isInteger(m) || Math.abs(m) > l) throw new InputError("m", m, `an integer with |m| <= l = ${l}`);
}

/** (s . J)^l as a polynomial in s with matrix coefficients: key(a, b, c) -> matrix. */
function powerExpansion(J: number, l: number): Map<number, ComplexMatrix> {
  const ops = angularMomentum(J);
  const n = ops.z.n;
  const unit = zeroMatrix(n);
  for (let i = 0; i < n; i++) unit.re[i * n + i] = 1;
  let cur = new Map<number, ComplexMatrix>([[0, unit]]);
  for (let step = 0; step < l; step++) {
    const next = new Map<number, ComplexMatrix>();
    for (const [k, mat] of cur) {
      const [a, b, c] = unkey(k);
      const parts: Array<[number, ComplexMatrix]> = [
        [key(a + 1, b, c), matMul(mat, ops.x)],
        [key(a, b + 1, c), matMul(mat, ops.y)],
        [key(a, b, c + 1), matMul(mat, ops.z)],
      ];
      for (const [kk, prod] of parts) {
        const acc = next.get(kk);
        if (acc) addScaled(acc, prod, 1);
        else next.set(kk, prod);
      }
    }
    cur = next;
  }
  return cur;
}

const expansionCache = new Map<string, Map<number, ComplexMatrix>>();
const operatorCache = new Map<string, ComplexMatrix>();

/**
 * The Stevens operator O_l^m for angular momentum J (l = 2, 4, 6; |m| <= l; m < 0 the sine-type
 * operators). Cached; the returned matrix must not be modified.
 */
export function stevensOperator(J: number, l: number, m: number): ComplexMatrix {
  const t = twiceJ(J);
  checkLm(l, m);
  const id = `${t}:${l}:${m}`;
  const hit = operatorCache.get(id);
  if (hit) return hit;
  if (l > t) {
    // no rank-l tensor operator in 2J + 1 states (triangle rule): exactly zero
    const zero = zeroMatrix(t + 1);
    operatorCache.set(id, zero);
    return zero;
  }
  const eKey = `${t}:${l}`;
  let expansion = expansionCache.get(eKey);
  if (!expansion) {
    expansion = powerExpansion(t / 2, l);
    expansionCache.set(eKey, expansion);
  }
  const n = t + 1;
  const out = zeroMatrix(n);
  for (const [k, c] of harmonic(l, m)) {
    if (c === 0) continue;
    const [a, b, cz] = unkey(k);
    const sym = expansion.get(k)!;
    addScaled(out, sym, (c * factorial(a) * factorial(b) * factorial(cz)) / factorial(l));
  }
  // clean rounding noise far below the largest entry (exact zeros by symmetry stay zero)
  let big = 0;
  for (let q = 0; q < out.re.length; q++) big = Math.max(big, Math.abs(out.re[q]!), Math.abs(out.im[q]!));
  for (let q = 0; q < out.re.length; q++) {
    if (Math.abs(out.re[q]!) < 1e-12 * big) out.re[q] = 0;
    if (Math.abs(out.im[q]!) < 1e-12 * big) out.im[q] = 0;
  }
  operatorCache.set(id, out);
  return out;
}

/** A crystal-field term B_l^m O_l^m (B in kelvin, E / k_B). */
export interface CrystalFieldTerm {
  l: number;
  m: number;
  /** Coefficient B_l^m in kelvin (E / k_B). */
  B: number;
}

/** Parse "B20", "B4-3", "B66" style names into (l, m). */
export function parseTermName(name: string): { l: number; m: number } {
  const match = /^B([246])(-?[0-6])$/.exec(name.trim());
  if (!match) throw new InputError("term", name, 'a crystal-field coefficient name like "B20", "B43", "B6-6"');
  const l = Number(match[1]);
  const m = Number(match[2]);
  checkLm(l, m);
  return { l, m };
}
