/**
 * Magnons of a honeycomb ferromagnet with out-of-plane DMI between next-nearest neighbours, in
 * linear spin-wave theory, and their thermal Hall conductivity.
 *
 * Model (spins S, energies in J): H = -J sum_<ij> S_i . S_j + D sum_<<ij>> nu_ij z . (S_i x S_j)
 *   - g muB B sum_i S_i^z, B along +z, J > 0, ground state all spins along +z.
 * Holstein-Primakoff to linear order (S_i^z = S - a^dag a, S_i^+ = sqrt(2S) a) gives a
 * number-conserving two-band Bloch Hamiltonian (no anomalous terms for this collinear state):
 *   H(k) = (3 J S + g muB B) 1 - J S [f(k) sigma^+ + h.c.] + NNN hopping t2 e^{+-i phi},
 * with t2 = D S and phi = pi/2: z . (S_i x S_j) = (i/2)(S_i^+ S_j^- - S_i^- S_j^+) -> the hopping
 * amplitude of a_i^dag a_j is -i D S nu_ij. We take nu_ij = +1 for a left (counterclockwise) turn
 * i -> common neighbour -> j; for our lattice the A-sublattice hops along b1, b2, b3 are right turns
 * (nu = -1), so this is exactly the Haldane model of blochModel.ts with t1 = -J S, t2 = D S,
 * phi = +pi/2, M = 0, shifted by 3 J S + g muB B. Bands:
 *   E+-(k) = 3 J S + g muB B +- sqrt(J^2 S^2 |f(k)|^2 + 4 D^2 S^2 (sum_i sin k.b_i)^2),
 * gap 6 sqrt(3) |D| S at K, K'. Sources: S. A. Owerre, J. Phys.: Condens. Matter 28, 386001 (2016);
 * S. K. Kim, H. Ochoa, R. Zarzuela, Y. Tserkovnyak, PRL 117, 227201 (2016); Haldane PRL 61, 2015 (1988).
 *
 * Thermal Hall conductivity of the magnons, per layer (2D), in W/K:
 *   kappa_xy = -(k_B^2 T / hbar) sum_n int_BZ d^2k / (2 pi)^2 c2(rho_n(k)) Omega_n(k),
 *   c2(rho) = (1 + rho) ln^2((1 + rho) / rho) - ln^2(rho) - 2 Li2(-rho),
 * rho_n = 1 / (exp(E_n / k_B T) - 1), Omega_n the Berry curvature (-2 Im <d_x u|d_y u>).
 * Source: R. Matsumoto, S. Murakami, PRL 106, 197202 (2011) (formula from memory; cross-checked
 * against an independent numpy/scipy evaluation with the Kubo form of Omega in the tests).
 * On the grid, int d^2k Omega -> the plaquette fluxes F (chernNumbers.ts), so the dimensionless
 * kappa_xy / (k_B^2 T / hbar) = -(1 / 4 pi^2) sum_{n, plaquettes} c2 F, independent of the lattice
 * constant. A bulk crystal of layers a distance d apart has kappa_xy^3D = kappa_xy^2D / d (W/(K m)).
 */
import { InputError } from "../errors.js";
import { kB, hbar } from "../quantity/constants.js";
import { haldaneSpec, tightBindingModel, type TightBindingModel } from "./blochModel.js";
import { chernNumbers, type ChernResult } from "./chernNumbers.js";
import { dilogarithm } from "../numeric/dilogarithm.js";

export interface HoneycombMagnonParams {
  /** Nearest-neighbour exchange (J), > 0 (ferromagnet). */
  J: number;
  /** NNN DMI (J), any sign. */
  D: number;
  /** Spin length. */
  S: number;
  /** Zeeman energy g muB B (J), >= 0. */
  zeeman?: number;
}

function check(p: HoneycombMagnonParams): void {
  if (!(p.J > 0) || !Number.isFinite(p.J)) throw new InputError("J", p.J, "a positive exchange energy (ferromagnet), in J");
  if (!Number.isFinite(p.D)) throw new InputError("D", p.D, "a finite DMI energy in J");
  if (!(p.S > 0) || Math.abs(2 * p.S - Math.round(2 * p.S)) > 1e-12) throw new InputError("S", p.S, "a positive multiple of 1/2");
  if (p.zeeman !== undefined && (!(p.zeeman >= 0) || !Number.isFinite(p.zeeman)))
    throw new InputError("zeeman", p.zeeman, "a Zeeman energy g muB B >= 0 (field along the magnetization)");
}

export function honeycombMagnonModel(p: HoneycombMagnonParams): TightBindingModel {
  check(p);
  const spec = haldaneSpec({ t1: -p.J * p.S, t2: p.D * p.S, phi: Math.PI / 2, M: 0 });
  const shift = 3 * p.J * p.S + (p.zeeman ?? 0);
  return tightBindingModel({ ...spec, onsite: [shift, shift], name: "honeycomb ferromagnet magnons (LSWT)" });
}

/** Closed-form bands E-(k), E+(k) at a fractional k (for checks and plots). */
export function honeycombMagnonBands(p: HoneycombMagnonParams, k1: number, k2: number): [number, number] {
  check(p);
  const t1 = 2 * Math.PI * k1,
    t2 = 2 * Math.PI * k2;
  const fr = 1 + Math.cos(t1) + Math.cos(t2),
    fi = -Math.sin(t1) - Math.sin(t2);
  const s = Math.sin(t2 - t1) + Math.sin(-t2) + Math.sin(t1);
  const e0 = 3 * p.J * p.S + (p.zeeman ?? 0);
  const r = Math.sqrt(p.J * p.J * p.S * p.S * (fr * fr + fi * fi) + 4 * p.D * p.D * p.S * p.S * s * s);
  return [e0 - r, e0 + r];
}

/** c2(rho) as a function of x = E / k_B T > 0, without cancellation at large x. */
export function c2Weight(x: number): number {
  if (!(x > 0)) {
    if (x === 0) return (Math.PI * Math.PI) / 3;
    throw new InputError("E / kT", x, "a non-negative magnon energy");
  }
  if (x > 700) return 0;
  const q = Math.exp(-x);
  const oneMinusQ = -Math.expm1(-x);
  const rho = q / oneMinusQ;
  const l1q = Math.log1p(-q); // ln(1 - q)
  // (1 + rho) x^2 - ln^2 rho = x^2 q / (1 - q) - 2 x ln(1 - q) - ln^2(1 - q)
  // small rho: Li2(-rho) = -rho + rho^2/4 - rho^3/9 + O(rho^4) (relative error < 1e-16 of c2 for rho < 1e-4)
  const li2 = rho < 1e-4 ? rho * (-1 + rho * (0.25 - rho / 9)) : dilogarithm(-rho);
  return x * x * rho - 2 * x * l1q - l1q * l1q - 2 * li2;
}

export interface HoneycombMagnonResult {
  chern: [number, number] | null;
  status: "ok" | "gapless" | "unresolved";
  notes: string[];
  /** Temperatures (K) and kappa_xy per layer (W/K) and in units of k_B^2 T / hbar. */
  temperatures: number[];
  kappaXY: number[];
  kappaXYReduced: number[];
  gapAtK: number;
  bandBottom: number;
  bandTop: number;
  chernResult: ChernResult;
}

/**
 * Bands, Chern numbers and kappa_xy(T) on an n x n grid. At D = 0 the bands touch at K and K'
 * (Dirac magnons): the Chern numbers are undefined (status "gapless", chern null) while the Berry
 * curvature and kappa_xy vanish identically.
 */
export function honeycombMagnonHall(p: HoneycombMagnonParams, temperatures: number[], n = 60): HoneycombMagnonResult {
  check(p);
  for (const T of temperatures) if (!(T > 0) || !Number.isFinite(T)) throw new InputError("T", T, "positive temperatures in K");
  const model = honeycombMagnonModel(p);
  const res = chernNumbers(model, { n1: n, onUnresolved: "report", map: true, energies: true });
  const gapAtK = 6 * Math.sqrt(3) * Math.abs(p.D) * p.S;
  const notes = [...res.notes];
  let status: HoneycombMagnonResult["status"] = res.status === "ok" ? "ok" : "unresolved";
  let chern: [number, number] | null = res.status === "ok" ? [res.chern[0]!, res.chern[1]!] : null;
  if (p.D === 0) {
    status = "gapless";
    chern = null;
    notes.length = 0;
    notes.push("D = 0: the two magnon bands touch at K and K' (Dirac magnons); the Chern numbers are not defined, the Berry curvature vanishes away from K, K' and kappa_xy = 0");
  }
  const E = res.energies!;
  let lo = Infinity,
    hi = -Infinity;
  for (let i = 0; i < E.length; i++) {
    lo = Math.min(lo, E[i]!);
    hi = Math.max(hi, E[i]!);
  }
  const kappaXYReduced: number[] = [];
  const kappaXY: number[] = [];
  const fluxLimit = 1;
  // Grid points where the bands touch (D = 0 with K on the grid): their eigenvectors are arbitrary.
  const degenerate = new Uint8Array(n * n);
  for (let q = 0; q < n * n; q++) if (E[q * 2 + 1]! - E[q * 2]! < 1e-9 * (hi - lo || 1)) degenerate[q] = 1;
  // Plaquette weight = mean of c2 at its four corners, so sum_plaquettes c f = sum_corners c2(q) G(q)
  // with G(q) = (1/4) sum of the fluxes of the plaquettes touching q: G is computed once, and each
  // temperature costs one c2 per grid point and band.
  const G = new Float64Array(n * n * 2);
  for (let b = 0; b < 2; b++) {
    const F = res.flux![b]!;
    for (let j = 0; j < n; j++)
      for (let i = 0; i < n; i++) {
        const f = F[j * n + i]!;
        // At D = 0 the plaquettes around K, K' carry an ambiguous flux near +-pi: leave them out
        // (the curvature is singular there and zero elsewhere).
        const ip = (i + 1) % n,
          jp = (j + 1) % n;
        if (p.D === 0 && (Math.abs(f) > fluxLimit || degenerate[j * n + i] || degenerate[j * n + ip] || degenerate[jp * n + i] || degenerate[jp * n + ip])) continue;
        const q = 0.25 * f;
        G[(j * n + i) * 2 + b] = G[(j * n + i) * 2 + b]! + q;
        G[(j * n + ip) * 2 + b] = G[(j * n + ip) * 2 + b]! + q;
        G[(jp * n + i) * 2 + b] = G[(jp * n + i) * 2 + b]! + q;
        G[(jp * n + ip) * 2 + b] = G[(jp * n + ip) * 2 + b]! + q;
      }
  }
  for (const T of temperatures) {
    const red = kappaReducedOnGrid(G, E, T);
    kappaXYReduced.push(red + 0);
    kappaXY.push((red * kB * kB * T) / hbar + 0);
  }
  const out: HoneycombMagnonResult = { chern, status, notes, temperatures: temperatures.slice(), kappaXY, kappaXYReduced, gapAtK, bandBottom: lo, bandTop: hi, chernResult: res };
  gridWeights.set(out, G);
  return out;
}

/** The corner-weighted fluxes G of each result (kept for evaluating further temperatures on the same grid). */
const gridWeights = new WeakMap<HoneycombMagnonResult, Float64Array>();

function kappaReducedOnGrid(G: Float64Array, E: Float64Array, T: number): number {
  let sum = 0;
  const kT = kB * T;
  for (let q = 0; q < G.length; q++) {
    const g = G[q]!;
    if (g !== 0) sum += c2Weight(Math.max(E[q]!, 0) / kT) * g;
  }
  return -sum / (4 * Math.PI * Math.PI);
}

export interface ConvergedMagnonHall {
  /** The last grid's result (Chern numbers, band range, status). */
  last: HoneycombMagnonResult;
  /** Richardson-extrapolated kappa_xy / (k_B^2 T / hbar) per temperature (null where not converged). */
  kappaXYReduced: Array<number | null>;
  /** kappa_xy per layer (W/K) per temperature (null where not converged). */
  kappaXY: Array<number | null>;
  /** Error estimate of each reduced value: the change of the extrapolation between the last two grid pairs. */
  errorReduced: number[];
  /** Whether each temperature met the tolerance. */
  converged: boolean[];
  /** Grids used, in order. */
  grids: number[];
  /** Thermal magnon depletion delta S / S = (1 / 2 N S) sum_k,n rho_n(k) per temperature, on the last grid (LSWT reliability). */
  depletion: number[];
}

/**
 * kappa_xy converged in the zone grid: n0, 2 n0, 4 n0, ... up to maxN (the work bound: the largest grid
 * costs ~maxN^2 two-band diagonalizations and ~2 maxN^2 c2 evaluations per temperature). The grid sum
 * (plaquette fluxes with corner-averaged c2) has an O(1/n^2) error, so each pair of grids (n, 2n) gives
 * the Richardson value (4 k_2n - k_n) / 3; a temperature is converged when two successive Richardson
 * values differ by at most rtol |value| + atol (atol in units of k_B^2 T / hbar). Low temperatures, whose
 * integrand sits in a small pocket around the band bottom, need the finest grids. The Chern numbers
 * come from the last grid (its link-variable checks must pass, else no kappa is given).
 */
export function honeycombMagnonHallConverged(
  p: HoneycombMagnonParams,
  temperatures: number[],
  options: { n0?: number; maxN?: number; rtol?: number; atol?: number } = {},
): ConvergedMagnonHall {
  check(p);
  const n0 = options.n0 ?? 40,
    maxN = options.maxN ?? 640,
    rtol = options.rtol ?? 1e-3,
    atol = options.atol ?? 1e-9;
  if (!Number.isInteger(n0) || n0 < 6) throw new InputError("n0", n0, "a whole number of grid points >= 6");
  if (!Number.isInteger(maxN) || maxN < 4 * n0 || maxN > 2048) throw new InputError("maxN", maxN, `a whole number from 4 n0 = ${4 * n0} to 2048 (the work bound)`);
  if (!(rtol > 0) || !(atol >= 0)) throw new InputError("rtol, atol", [rtol, atol], "a positive relative and a non-negative absolute tolerance");
  const nT = temperatures.length;
  const grids: number[] = [];
  const runs: HoneycombMagnonResult[] = [];
  let prevR: number[] | null = null;
  let R: number[] = [];
  const err: number[] = new Array(nT).fill(Infinity);
  const done = new Array<boolean>(nT).fill(false);
  // values[g][i]: reduced kappa of temperature i on grid g (computed only while i is not converged)
  const values: number[][] = [];
  R = new Array(nT).fill(NaN);
  prevR = new Array(nT).fill(NaN);
  for (let n = n0; n <= maxN; n *= 2) {
    const r = honeycombMagnonHall(p, [], n);
    const G = gridWeights.get(r)!,
      E = r.chernResult.energies!;
    grids.push(n);
    runs.push(r);
    const g = values.length;
    values.push(temperatures.map((T, i) => (done[i] ? NaN : kappaReducedOnGrid(G, E, T))));
    if (g >= 1) {
      for (let i = 0; i < nT; i++) {
        if (done[i]) continue;
        const Ri = (4 * values[g]![i]! - values[g - 1]![i]!) / 3;
        if (g >= 2) {
          err[i] = Math.abs(Ri - R[i]!);
          done[i] = err[i]! <= rtol * Math.abs(Ri) + atol;
        }
        R[i] = Ri;
      }
    }
    if (done.every(Boolean) && r.status !== "unresolved") break;
  }
  void prevR;
  const last = runs[runs.length - 1]!;
  const resolved = last.status !== "unresolved";
  // magnon depletion per site from the last grid's energies (two sites per cell)
  const E = last.chernResult.energies!;
  const depletion = temperatures.map((T) => {
    let s = 0;
    for (let q = 0; q < E.length; q++) s += 1 / Math.expm1(Math.max(E[q]!, 1e-300) / (kB * T));
    return s / E.length / p.S;
  });
  const ok = done.map((d) => d && resolved);
  return {
    last,
    kappaXYReduced: R.map((x, i) => (ok[i] ? x + 0 : null)),
    kappaXY: R.map((x, i) => (ok[i] ? (x * kB * kB * temperatures[i]!) / hbar + 0 : null)),
    errorReduced: err,
    converged: ok,
    grids,
    depletion,
  };
}
