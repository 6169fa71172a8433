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
  let z = 0, zm = 0;
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
  /** Number of theta-series terms used. */
  terms: number;
}

/** Rotor (theta-function) form of <Sz> for the unrestricted model, integer (nu = 0) or half-integer. */
export function rotorMagnetization(D: number, b: number, T: number, halfInteger: boolean): RotorMagnetization {
  checkDT(D, T);
  const bD = D / (kB * T); // beta D
  const x = b / (2 * D);
  const q = -Math.PI * Math.PI / bD; // ln q
  const z = Math.PI * x;
  let th = 1, dth = 0, k = 1;
  for (; k < 100000; k++) {
    const w = Math.exp(q * k * k);
    if (w < 1e-18 * Math.abs(th) && k > 1) break;
    const s = halfInteger && k % 2 === 1 ? -1 : 1;
    th += 2 * s * w * Math.cos(2 * k * z);
    dth += -4 * s * k * w * Math.sin(2 * k * z);
  }
  return { value: x + (Math.PI / (2 * bD)) * (dth / th), terms: k };
}

/** The unrestricted sum over m in Z + nu done directly (the rotor model without the dual form). */
export function rotorMagnetizationDirect(D: number, b: number, T: number, halfInteger: boolean): number {
  checkDT(D, T);
  const beta = 1 / (kB * T);
  const nu = halfInteger ? 0.5 : 0;
  const x = b / (2 * D);
  const m0 = Math.round(x - nu) + nu;
  let z = 0, zm = 0;
  for (let j = 0; j < 100000; j++) {
    let any = false;
    for (const m of j === 0 ? [m0] : [m0 + j, m0 - j]) {
      const w = Math.exp(-beta * D * ((m - x) ** 2 - (m0 - x) ** 2));
      z += w;
      zm += m * w;
      if (w > 1e-20) any = true;
    }
    if (!any && j > 2) break;
  }
  return zm / z;
}

/** Weight of the levels beyond |m| = S relative to the ground level (0 means the rotor limit is exact). */
export function rotorTruncation(S: number, D: number, b: number, T: number): number {
  checkSpin(S);
  checkDT(D, T);
  const x = b / (2 * D);
  const beta = 1 / (kB * T);
  const m0 = Math.max(-S, Math.min(S, easyPlaneGroundM(S, D, b)));
  const e = (m: number) => beta * D * ((m - x) ** 2 - (m0 - x) ** 2);
  // nearest excluded levels S + 1 and -S - 1 dominate; the geometric tail is bounded by 2x them
  return 2 * (Math.exp(-e(S + 1)) + Math.exp(-e(-S - 1)));
}
