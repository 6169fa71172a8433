/**
 * Order-0 Hankel transforms of smooth radial functions by the two-dimensional trapezoid (lattice) rule.
 *
 *   F(q) = Int_0^inf f(r) J0(q r) r dr = (1 / 2 pi) Int f(|r|) exp(-i q x) d^2 r
 *        = (1 / 2 pi) Int P(x) cos(q x) dx,   P(x) = Int f(sqrt(x^2 + y^2)) dy (Abel projection)
 *        ~ (h / 2 pi) [P_0 + 2 Sum_{i >= 1} P_i cos(q h i)],   P_i = P(i h) by the trapezoid rule in y.
 * By Poisson summation the error of the trapezoid sum in x is the aliased transform
 * Sum_{m != 0} F(|q + 2 pi m / h|), so for f analytic in a strip |Im r| < d it falls like
 * exp(-d (2 pi / h - q)): spectral accuracy, no Bessel functions, and f is sampled once for all q.
 * The trapezoid rule in y converges the same way (step chosen per x, see yStep). Truncation at rMax
 * adds the tail of f beyond rMax.
 * Sources: the trapezoid rule's exponential convergence for analytic integrands and the Poisson
 * summation formula (L. N. Trefethen, J. A. C. Weideman, SIAM Rev. 56, 385 (2014)); the Abel
 * projection / Fourier-slice relation of the 2D transform (R. Bracewell, *The Fourier Transform and
 * Its Applications*, McGraw-Hill 1978). Hand-written: no library does this for TypeScript. Checked
 * against direct Gauss-Legendre Hankel quadrature with Bessel functions in
 * test/lib/walls/magnetostatics.test.ts (through the skyrmion ansatz tables).
 */
import { InputError } from "../errors.js";

/**
 * Radial functions to transform: `sample(r, out)` writes the `count` function values at r to
 * out[0 .. count-1] (called once per quadrature point; no allocation). Optional `yStep(x)`: the step of
 * the trapezoid rule along y at abscissa x (default: the lattice spacing h). An object with methods
 * (one class per use) keeps the call sites monomorphic across calls.
 */
export interface RadialSampler {
  readonly count: number;
  sample(r: number, out: Float64Array): void;
  yStep?(x: number): number;
}

/**
 * Order-0 Hankel transforms of the sampler's radial functions at the wavenumbers q, by the trapezoid
 * rule with spacing h along x over the disc r <= rMax. Along y the projection
 * P(x_i) = Int f(sqrt(x_i^2 + y^2)) dy uses the trapezoid rule with step sampler.yStep(x_i): an
 * integrand analytic in |Im y| < s(x) needs only a step of about 2 pi s(x) / ln(1 / tolerance), and
 * s(x) often grows with x (for a pole of f at r = i d, s(x) = sqrt(x^2 + d^2)).
 * Returns one Float64Array per function: result[k][j] = Int_0^inf f_k(r) J0(q_j r) r dr.
 */
export function latticeHankel0(sampler: RadialSampler, h: number, rMax: number, q: ArrayLike<number>): Float64Array[] {
  const count = sampler.count;
  if (!(h > 0) || !Number.isFinite(h)) throw new InputError("h", h, "a positive lattice spacing");
  if (!(rMax > h)) throw new InputError("rMax", rMax, `a radius larger than the spacing h = ${h}`);
  if (!Number.isInteger(count) || count < 1) throw new InputError("count", count, "a whole number of functions >= 1");
  const n = Math.ceil(rMax / h);
  if (n > 20000) throw new InputError("rMax", rMax, `at most 20000 lattice spacings (h = ${h})`);
  const stride = n + 1;
  const P = abelProjections(sampler, count, h, n, rMax);
  const out: Float64Array[] = [];
  for (let k = 0; k < count; k++) {
    const res = new Float64Array(q.length);
    cosineSums(P, k * stride, significantLength(P, k * stride, n), h, q, res);
    out.push(res);
  }
  return out;
}

/** Trapezoid Abel projections P[k * (n + 1) + i] = h_y Sum_j f_k(sqrt((i h)^2 + (j h_y)^2)), j in Z. */
function abelProjections(sampler: RadialSampler, count: number, h: number, n: number, rMax: number): Float64Array {
  const stride = n + 1;
  const P = new Float64Array(count * stride);
  const v = new Float64Array(count);
  for (let i = 0; i <= n; i++) {
    const x = i * h;
    const x2 = x * x;
    const hy = sampler.yStep ? sampler.yStep(x) : h;
    if (!(hy > 0)) throw new InputError("yStep", hy, `a positive step at x = ${x}`);
    const Y = Math.sqrt(Math.max(0, rMax * rMax - x2));
    const nj = Math.floor(Y / hy);
    sampler.sample(x, v);
    for (let k = 0; k < count; k++) P[k * stride + i] = v[k]!;
    for (let j = 1; j <= nj; j++) {
      const y = j * hy;
      sampler.sample(Math.sqrt(x2 + y * y), v);
      for (let k = 0; k < count; k++) P[k * stride + i]! += 2 * v[k]!;
    }
    for (let k = 0; k < count; k++) P[k * stride + i]! *= hy;
  }
  return P;
}

/** Index of the last projection above 1e-18 of the peak (the cosine sums stop there). */
function significantLength(P: Float64Array, base: number, n: number): number {
  let peak = 0;
  for (let i = 0; i <= n; i++) peak = Math.max(peak, Math.abs(P[base + i]!));
  let i = n;
  while (i > 0 && Math.abs(P[base + i]!) <= 1e-18 * peak) i -= 1;
  return i;
}

/** res[m] = (h / 2 pi) [P_0 + 2 Sum_{i=1..nk} P_i cos(q_m h i)], cosines by rotation (re-seeded every 64 steps). */
function cosineSums(P: Float64Array, base: number, nk: number, h: number, q: ArrayLike<number>, res: Float64Array): void {
  const pre = h / (2 * Math.PI);
  const p0 = P[base]!;
  for (let m = 0; m < q.length; m++) {
    const th = q[m]! * h;
    const c1 = Math.cos(th);
    const s1 = Math.sin(th);
    let c = 1;
    let s = 0;
    let acc = 0;
    for (let i = 1; i <= nk; i++) {
      if ((i & 63) === 0) {
        c = Math.cos(i * th);
        s = Math.sin(i * th);
      } else {
        const cn = c * c1 - s * s1;
        s = s * c1 + c * s1;
        c = cn;
      }
      acc += P[base + i]! * c;
    }
    res[m] = pre * (p0 + 2 * acc);
  }
}
