/**
 * Complete elliptic integrals of the first and second kind, K(k) and E(k), by the
 * arithmetic-geometric mean. Argument: the modulus k (0 <= k < 1 for K, 0 <= k <= 1 for E),
 * NOT the parameter m = k^2 that scipy.special.ellipk/ellipe take.
 *
 * K(k) = Integral_0^{pi/2} d psi / sqrt(1 - k^2 sin^2 psi)
 * E(k) = Integral_0^{pi/2} sqrt(1 - k^2 sin^2 psi) d psi
 *
 * Method: M. Abramowitz, I. Stegun, Handbook of Mathematical Functions (1964), 17.6
 * (K = pi / (2 AGM(1, k')), E = K (1 - Sum 2^{n-1} c_n^2)). Hand-written because mathjs has no
 * elliptic integrals; checked against scipy.special in test/lib/numeric/ellipticIntegrals.test.ts.
 * Library or hand-written, by measurement (test/bench/libraries.bench.mjs, interleaved, errors
 * against mpmath): @stdlib ellipk + ellipe are about 1.5 times faster for the pair but their worst
 * relative error was 2e-11 (moduli near 1) against 1e-14 here; kept ours (accuracy first).
 */
import { InputError } from "../errors.js";

/** K(k) and E(k) together (one AGM run). K(1) = Infinity, E(1) = 1. */
export function completeEllipticIntegrals(k: number): { K: number; E: number } {
  if (!Number.isFinite(k) || Math.abs(k) > 1) {
    throw new InputError("k", k, "an elliptic modulus with |k| <= 1");
  }
  const kk = Math.abs(k);
  if (kk === 1) return { K: Infinity, E: 1 };
  let a = 1;
  let b = Math.sqrt((1 - kk) * (1 + kk));
  let c = kk;
  let sum = 0.5 * c * c; // 2^{-1} c_0^2
  let pow = 0.5;
  for (let n = 0; n < 60; n++) {
    const an = 0.5 * (a + b);
    const bn = Math.sqrt(a * b);
    c = 0.5 * (a - b);
    a = an;
    b = bn;
    pow *= 2;
    sum += pow * c * c;
    if (Math.abs(c) <= 1e-17 * a) break;
  }
  const K = Math.PI / (2 * a);
  return { K, E: K * (1 - sum) };
}

/** Complete elliptic integral of the first kind K(k), modulus k. */
export function ellipticK(k: number): number {
  return completeEllipticIntegrals(k).K;
}

/** Complete elliptic integral of the second kind E(k), modulus k. */
export function ellipticE(k: number): number {
  return completeEllipticIntegrals(k).E;
}
