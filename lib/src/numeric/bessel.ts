/**
 * Bessel functions of the first kind J0 and J1 of real argument, fast and accurate to about 1e-13
 * absolute (worst near x = 64), for hot loops (Hankel transforms of axisymmetric textures).
 *
 * Method: for |x| < 64, piecewise Chebyshev series of degree 12 on unit intervals, their
 * coefficients built once (lazily) from the exact integral representation
 *   J_n(x) = (1 / 2 pi) Integral_0^{2 pi} cos(n tau - x sin tau) d tau
 * evaluated with the trapezoid rule (spectrally exact for this periodic integrand: 128 points give
 * machine precision for x < 64); for |x| >= 64 the Hankel asymptotic expansion
 *   J_nu(x) = sqrt(2 / (pi x)) [P cos(chi) - Q sin(chi)],  chi = x - (nu/2 + 1/4) pi,
 * with P, Q to order x^-6 / x^-5 (truncation error below 1e-13 there). Sources: M. Abramowitz, I. Stegun,
 * Handbook of Mathematical Functions, 9.1.21 (integral), 9.2.5, 9.2.9, 9.2.10 (asymptotics).
 * Hand-written because mathjs has no Bessel functions. Verified against scipy.special.j0/j1 and
 * mpmath in test/lib/numeric/bessel.test.ts (measured worst absolute error about 4e-14 on [-10, 150]).
 * Library or hand-written, by measurement (test/bench/libraries.bench.mjs, interleaved): the @stdlib
 * besselj0 / besselj1 packages are accurate to 1e-16 absolute and about as fast per function (ratio
 * 0.9-1.1, within the spread), but our hot loops need J0 and J1 together (besselJ01: one table
 * look-up for both, so about twice as fast as two library calls), and the library adds packages to
 * the page bundle. Kept ours; 4e-14 absolute is far below what the Hankel transforms need.
 */

const X_SPLIT = 64;
const DEG = 12;
const NC = DEG + 1;
let table: Float64Array | null = null; // [interval][fn 0/1][coef]

function buildTable(): Float64Array {
  const t = new Float64Array(X_SPLIT * 2 * NC);
  const M = 128;
  const cosT = new Float64Array(M);
  const sinT = new Float64Array(M);
  for (let j = 0; j < M; j++) {
    cosT[j] = Math.cos((2 * Math.PI * j) / M);
    sinT[j] = Math.sin((2 * Math.PI * j) / M);
  }
  const f0 = new Float64Array(NC);
  const f1 = new Float64Array(NC);
  for (let iv = 0; iv < X_SPLIT; iv++) {
    for (let i = 0; i < NC; i++) {
      const u = Math.cos((Math.PI * (i + 0.5)) / NC);
      const x = iv + 0.5 + 0.5 * u;
      let s0 = 0;
      let s1 = 0;
      for (let j = 0; j < M; j++) {
        const arg = x * sinT[j]!;
        s0 += Math.cos(arg);
        // cos(tau - x sin tau) = cos tau cos(x sin tau) + sin tau sin(x sin tau)
        s1 += cosT[j]! * Math.cos(arg) + sinT[j]! * Math.sin(arg);
      }
      f0[i] = s0 / M;
      f1[i] = s1 / M;
    }
    for (let k = 0; k < NC; k++) {
      let c0 = 0;
      let c1 = 0;
      for (let i = 0; i < NC; i++) {
        const tk = Math.cos((Math.PI * k * (i + 0.5)) / NC);
        c0 += f0[i]! * tk;
        c1 += f1[i]! * tk;
      }
      const norm = (k === 0 ? 1 : 2) / NC;
      t[(iv * 2 + 0) * NC + k] = c0 * norm;
      t[(iv * 2 + 1) * NC + k] = c1 * norm;
    }
  }
  return t;
}

function chebAt(t: Float64Array, base: number, u: number): number {
  // Clenshaw recurrence for sum c_k T_k(u)
  let b1 = 0;
  let b2 = 0;
  const u2 = 2 * u;
  for (let k = DEG; k >= 1; k--) {
    const b0 = t[base + k]! + u2 * b1 - b2;
    b2 = b1;
    b1 = b0;
  }
  return t[base]! + u * b1 - b2;
}

/** J0 and J1 at x written to out[0], out[1] (no allocation; for hot loops). */
export function besselJ01(x: number, out: Float64Array): void {
  const ax = Math.abs(x);
  if (ax < X_SPLIT) {
    const t = table ?? (table = buildTable());
    const iv = Math.floor(ax);
    const u = 2 * (ax - iv) - 1;
    out[0] = chebAt(t, iv * 2 * NC, u);
    const j1 = chebAt(t, (iv * 2 + 1) * NC, u);
    out[1] = x < 0 ? -j1 : j1;
    return;
  }
  const z = 1 / ax;
  const z2 = z * z;
  // A&S 9.2.9, 9.2.10 with mu = 4 nu^2 = 0 (J0) and 4 (J1), written out to x^-6 / x^-5.
  const p0 = 1 + z2 * (-9 / 128 + z2 * (11025 / 98304 - z2 * (108056025 / 188743680)));
  const q0 = z * (-1 / 8 + z2 * (225 / 3072 - z2 * (893025 / 3932160)));
  const p1 = 1 + z2 * (15 / 128 + z2 * (-14175 / 98304 + z2 * (127702575 / 188743680)));
  const q1 = z * (3 / 8 + z2 * (-315 / 3072 + z2 * (1091475 / 3932160)));
  const c = Math.cos(ax);
  const s = Math.sin(ax);
  const amp = Math.sqrt((2 / Math.PI) * z) * Math.SQRT1_2;
  // chi0 = x - pi/4: cos = (c + s)/sqrt2, sin = (s - c)/sqrt2; chi1 = x - 3pi/4: cos = (s - c)/sqrt2, sin = -(s + c)/sqrt2
  out[0] = amp * (p0 * (c + s) - q0 * (s - c));
  const j1 = amp * (p1 * (s - c) + q1 * (s + c));
  out[1] = x < 0 ? -j1 : j1;
}

const scratch = new Float64Array(2);

/** Bessel function J0(x). */
export function besselJ0(x: number): number {
  besselJ01(x, scratch);
  return scratch[0]!;
}

/** Bessel function J1(x). */
export function besselJ1(x: number): number {
  besselJ01(x, scratch);
  return scratch[1]!;
}
