/**
 * Easy-plane spin with the field along the hard axis: H = D Sz^2 - b Sz (D > 0, b = g muB B, J).
 * Levels E_m = D m^2 - b m, m = -S..S. The ground state m0(b) steps by one at the level crossings
 * E_m = E_{m+1}, i.e. b = D (2m + 1): odd multiples of D for integer S, even multiples (including
 * b = 0, the Kramers doublet) for half-integer S -- the half-step offset between the two.
 *
 * Thermal magnetization <Sz>(b, T) = sum_m m w_m / sum_m w_m, w_m = exp(-(E_m - E_min) / k_B T),
 * as an exact finite sum over m = -S..S.
 *
 * Rotor form (derived here): for the unrestricted model m in Z + nu (nu = 0 integer, 1/2 half-integer
 * S), complete the square, D m^2 - b m = D (m - x)^2 - b^2 / 4D with x = b / 2D, and apply Poisson
 * summation (the Jacobi imaginary transformation):
 *   sum_{m in Z+nu} exp(-beta D (m - x)^2) = sqrt(pi / (beta D)) theta(pi x, q),  q = exp(-pi^2 / (beta D)),
 * with theta = theta3(z, q) = 1 + 2 sum_k q^(k^2) cos 2kz for nu = 0 and theta4 (signs (-1)^k)
 * for nu = 1/2. Then Z = exp(beta b^2 / 4D) sqrt(pi / beta D) theta(pi x, q) and
 *   <Sz> = (1/beta) d ln Z / db = x + (pi / (2 beta D)) theta'(pi x, q) / theta(pi x, q),
 * theta' the derivative in z. This is an identity for the unrestricted sum; the finite-S sum equals it
 * up to the Boltzmann weight of the levels beyond |m| = S (the "rotor limit": S large, |b| well below
 * 2 D S, k_B T << D S^2), which the function reports as `truncation`.
 * Sources: E. T. Whittaker, G. N. Watson, *A Course of Modern Analysis* (1927), ch. 21 (theta
 * functions, the transformation formula); the spin model is the textbook easy-plane paramagnet.
 */
import { InputError } from "../errors.js";
import { kB } from "../quantity/constants.js";
import { checkSpin } from "./spinOperators.js";

function checkDT(D: number, T?: number) {
  if (!(D > 0) || !Number.isFinite(D)) throw new InputError("D", D, "a positive easy-plane anisotropy energy in J");
  if (T !== undefined && (!(T > 0) || !Number.isFinite(T))) throw new InputError("T", T, "a positive temperature in K");
}

/** Levels E_m (J) for m = S..-S. */
export function easyPlaneLevels(S: number, D: number, b: number): Float64Array {
  const twoS = checkSpin(S);
  checkDT(D);
  const out = new Float64Array(twoS + 1);
  for (let i = 0; i <= twoS; i++) {
    const m = S - i;
    out[i] = D * m * m - b * m;
  }
  return out;
}

/** Crossing fields b = D (2m + 1) between m and m + 1, m = -S..S-1 (J). */
export function easyPlaneCrossings(S: number, D: number): number[] {
  const twoS = checkSpin(S);
  checkDT(D);
  const out: number[] = [];
  for (let k = 0; k < twoS; k++) out.push(D * (2 * (-S + k) + 1));
  return out;
}

/** T = 0 ground-state m for field b (the larger m at a crossing). */
export function easyPlaneGroundM(S: number, D: number, b: number): number {
  checkSpin(S);
  checkDT(D);
  const x = b / (2 * D);
  // nearest m in Z + nu to x, ties to the larger
  const nu = Math.round(2 * S) % 2 === 1 ? 0.5 : 0;
  const m = Math.floor(x - nu + 0.5) + nu;
  return Math.max(-S, Math.min(S, m));
}

/** Exact thermal <Sz> of spin S (finite sum). */
export function easyPlaneMagnetization(S: number, D: number, b: number, T: number): number {
  const twoS = checkSpin(S);
  checkDT(D, T);
  const beta = 1 / (kB * T);
  let emin = Infinity;
  for (let i = 0; i <= twoS; i++) {
    const m = S - i;
    emin = Math.min(emin, D * m * m - b * m);
  }
  let z = 0,
    zm = 0;
  for (let i = 0; i <= twoS; i++) {
    const m = S - i;
    const w = Math.exp(-beta * (D * m * m - b * m - emin));
    z += w;
    zm += m * w;
  }
  return zm / z;
}

export interface RotorMagnetization {
  value: number;
  /** Number of series terms used. */
  terms: number;
  /** Which of the two equal series was summed: the direct sum over m (beta D >= pi) or its Poisson dual (beta D < pi). */
  series: "direct" | "dual";
}

/**
 * beta D at which the two series are switched. The direct sum has terms exp(-beta D j^2) about its
 * largest term, the dual one q^(k^2) with q = exp(-pi^2 / beta D); at beta D = pi both ratios are
 * exp(-pi), and on each side the chosen one converges at least that fast. The dual form is never
 * used at large beta D, where q -> 1 and theta (exponentially small between its peaks) is the
 * difference of O(1) terms (the cancellation that ruins it in double precision).
 */
export const ROTOR_SERIES_SWITCH = Math.PI;

/**
 * Rotor form of <Sz> for the unrestricted model m in Z + nu, integer (nu = 0) or half-integer S.
 * The theta-function identity (header) gives one value from two series; we sum the one that converges
 * fast and without cancellation for this beta D, so the result is accurate to ~1e-15 (1 + |x|) for
 * every beta D > 0.
 */
export function rotorMagnetization(D: number, b: number, T: number, halfInteger: boolean): RotorMagnetization {
  checkDT(D, T);
  const bD = D / (kB * T); // beta D
  const x = b / (2 * D);
  if (bD >= ROTOR_SERIES_SWITCH) {
    const r = rotorDirectSum(bD, x, halfInteger ? 0.5 : 0);
    return { value: r.value, terms: r.terms, series: "direct" };
  }
  // Dual series: q = exp(-pi^2 / beta D) <= exp(-pi), theta >= 1 - 2 q / (1 - q) > 0.9, no cancellation.
  const lnq = (-Math.PI * Math.PI) / bD;
  const z = Math.PI * x;
  let th = 1,
    dth = 0,
    k = 1;
  for (; k < 1000; k++) {
    const w = Math.exp(lnq * k * k);
    if (k * w < 1e-19) break;
    const s = halfInteger && k % 2 === 1 ? -1 : 1;
    th += 2 * s * w * Math.cos(2 * k * z);
    dth += -4 * s * k * w * Math.sin(2 * k * z);
  }
  return { value: x + (Math.PI / (2 * bD)) * (dth / th), terms: k, series: "dual" };
}

/**
 * Direct sum over m in Z + nu of (m - x) exp(-beta D ((m - x)^2 - (m0 - x)^2)), outward from the
 * term m0 nearest to x (weight 1); every weight is positive, so the denominator has no cancellation
 * and the numerator's error is ~1e-16 of its largest term.
 */
function rotorDirectSum(bD: number, x: number, nu: number): { value: number; terms: number } {
  const m0 = Math.round(x - nu) + nu;
  const d0 = m0 - x;
  let z = 1,
    zm = d0,
    j = 1;
  for (; j < 1_000_000; j++) {
    const dp = d0 + j,
      dm = d0 - j;
    const wp = Math.exp(-bD * (dp * dp - d0 * d0));
    const wm = Math.exp(-bD * (dm * dm - d0 * d0));
    z += wp + wm;
    zm += dp * wp + dm * wm;
    if (j * (wp + wm) < 1e-19 * z && j > 1) break;
  }
  return { value: x + zm / z, terms: 2 * j + 1 };
}

/** The unrestricted sum over m in Z + nu done directly at every beta D (a check on the dual form). */
export function rotorMagnetizationDirect(D: number, b: number, T: number, halfInteger: boolean): number {
  checkDT(D, T);
  return rotorDirectSum(D / (kB * T), b / (2 * D), halfInteger ? 0.5 : 0).value;
}

/**
 * Boltzmann weight of the levels beyond |m| = S in the unrestricted (rotor) model:
 *   w = sum_{|m| > S} exp(-beta E_m) / sum_{m in Z + nu} exp(-beta E_m),  E_m = D m^2 - b m.
 * This is the fraction of the rotor's partition function that the finite spin does not have (0 in the
 * rotor limit, where the two forms of <Sz> agree). Both sums are done term by term (the tails outward
 * from m = +-(S + 1)), so small weights keep their relative accuracy.
 */
export function rotorTruncation(S: number, D: number, b: number, T: number): number {
  const twoS = checkSpin(S);
  checkDT(D, T);
  const x = b / (2 * D);
  const bD = D / (kB * T);
  // reference energy: the level of the rotor nearest x (the largest weight of the whole sum)
  const nu = twoS % 2 === 1 ? 0.5 : 0;
  const d0 = Math.round(x - nu) + nu - x;
  const w = (m: number) => Math.exp(-bD * ((m - x) ** 2 - d0 * d0));
  let inside = 0;
  for (let i = 0; i <= twoS; i++) inside += w(S - i);
  let outside = 0;
  for (const dir of [1, -1]) {
    for (let j = 1; j < 1_000_000; j++) {
      const m = dir * (S + j);
      const wm = w(m);
      outside += wm;
      // past the parabola's minimum the terms fall at least geometrically
      if ((wm < 1e-20 * (inside + outside) || wm === 0) && dir * (m - x) > 0) break;
    }
  }
  return outside / (inside + outside);
}
