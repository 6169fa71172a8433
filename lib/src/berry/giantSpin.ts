/**
 * A single large spin (molecular-magnet "giant spin") by exact diagonalization in the 2S+1 basis:
 *   H = -D_ax Sz^2 + E (Sx^2 - Sy^2) + C (S+^4 + S-^4) - g muB B . S
 *   (D_ax > 0 easy axis z, E >= 0: x hard, y medium; C the fourth-order transverse term, default 0)
 * Energies in J, B in T, basis m = S..-S (spinOperators.ts).
 *
 * Tunnel splitting of the ground doublet (m ~ +-S) with the field along the hard axis x:
 * H then commutes with the reflection P |m> = |-m> (the pi rotation about x up to phases), so it
 * splits into a symmetric and an antisymmetric block (sizes ~S+1). The two members of the tunnel-split
 * doublet are the lowest level of each block, and Delta = E0(antisymmetric) - E0(symmetric) is a
 * signed, smooth function of Bx that changes sign at each quenching field (a true crossing of two
 * symmetry sectors), so root finding on it locates the zeros exactly.
 *
 * Precision: Delta is 1e-10 to 1e-30 of the level energies (~D S^2). In double precision an
 * eigenvalue carries an absolute error ~1e-16 D S^2, which would swamp it. The block matrices are
 * built in double (their entries are smooth in the parameters, so their rounding changes Delta only
 * by a relative ~1e-15). The lowest eigenvector of each block is computed in double (banded solver,
 * the blocks are pentadiagonal) and its Rayleigh quotient is accumulated in double-double
 * (doubleDouble.ts): the eigenvalue error is ~ residual^2 / gap ~ (1e-16 D S^2)^2 / (D S), i.e.
 * ~1e-31 of D S^2, with the a-posteriori (Kato-Temple) bound reported. Delta is resolved down to
 * ~1e-29 of D S^2 (or the bound, if larger); below that the result says "below resolution".
 * (An earlier version did Householder + Sturm bisection entirely in double-double, symmetricEigenvaluesDD;
 * it agrees to that resolution and is kept as a cross-check in the tests, ~100 times slower.)
 *
 * Semiclassical quenching period along the hard axis (two interfering instanton paths):
 *   Delta B = (2 / (g muB)) sqrt(2 E (E + D_ax))   [= (2 k_B / g muB) sqrt(2 E (E + D)) with D, E in K].
 * Source: A. Garg, EPL 22, 205 (1993); observed by W. Wernsdorfer, R. Sessoli, Science 284, 133 (1999).
 * For the quadratic Hamiltonian (C = 0) these zeros are not only semiclassical: they are exact, equally
 * spaced with exactly Garg's period, for every S (E. Kececioglu, A. Garg, PRB 63, 064422 (2001)). The
 * deviation of the computed period from Garg's is then rounding (~1e-13 and below), a check of the
 * numerics, not physics. The C (S+^4 + S-^4) term keeps the P symmetry (it connects m to m +- 4 with
 * the same elements for m and -m), so the zeros stay true crossings found by root finding, but their
 * spacing is no longer Garg's (and no longer uniform in general).
 * A field off the hard axis (azimuth phi in the hard xy plane, toward the medium axis y) breaks P: the
 * zeros become minima of the splitting of finite depth, found here by minimization of the splitting
 * by the (double-precision) Hermitian solver.
 */
import { InputError } from "../errors.js";
import { muB } from "../quantity/constants.js";
import { HermitianEigenSolver } from "../numeric/eigenHermitian.js";
import { SymmetricBandEigenSolver, matrixBandwidth } from "../numeric/eigenSymmetricBand.js";
import { rayleighQuotientDD, ddSub, ddToNumber, type DD } from "../numeric/doubleDouble.js";
import { rootsOnGrid } from "../numeric/brentRoot.js";
import { brentMinimize } from "../numeric/brentMinimize.js";
import { checkSpin, raisingElement, spinMatrices } from "./spinOperators.js";

export interface GiantSpinParams {
  S: number;
  /** Axial anisotropy D_ax (J), > 0 for an easy axis. */
  D: number;
  /** Rhombic anisotropy E (J), >= 0. */
  E: number;
  /** g factor (default 2). */
  g?: number;
  /** Fourth-order transverse anisotropy C (J) of C (S+^4 + S-^4) (default 0). */
  C?: number;
}

function check(p: GiantSpinParams): number {
  const twoS = checkSpin(p.S);
  if (!Number.isFinite(p.D)) throw new InputError("D", p.D, "a finite anisotropy energy in J");
  if (!(p.E >= 0) || !Number.isFinite(p.E)) throw new InputError("E", p.E, "a rhombic anisotropy E >= 0 in J (x is the hard axis)");
  const g = p.g ?? 2;
  if (!(g > 0)) throw new InputError("g", g, "a positive g factor");
  if (p.C !== undefined && !Number.isFinite(p.C)) throw new InputError("C", p.C, "a finite fourth-order anisotropy energy in J");
  return twoS + 1;
}

/** Planar Hermitian matrix of H for a field B = [Bx, By, Bz] (T). */
export function giantSpinMatrix(p: GiantSpinParams, B: readonly [number, number, number]): { dim: number; re: Float64Array; im: Float64Array } {
  const dim = check(p);
  const S = p.S;
  const g = p.g ?? 2;
  const { sxRe, syIm, szRe } = spinMatrices(S);
  const re = new Float64Array(dim * dim);
  const im = new Float64Array(dim * dim);
  const z = g * muB;
  for (let i = 0; i < dim; i++) {
    const m = S - i;
    re[i * dim + i] = -p.D * m * m - z * B[2] * szRe[i * dim + i]!;
    if (i + 2 < dim) {
      // <m|S+^2|m-2> = <m|S+|m-1><m-1|S+|m-2>; (Sx^2 - Sy^2) = (S+^2 + S-^2) / 2
      const v = (p.E / 2) * raisingElement(S, m - 1) * raisingElement(S, m - 2);
      re[i * dim + i + 2] = v;
      re[(i + 2) * dim + i] = v;
    }
    if (p.C && i + 4 < dim) {
      // <m|S+^4|m-4> = prod_{j=1..4} <m-j+1|S+|m-j>
      const v = p.C * raisingElement(S, m - 1) * raisingElement(S, m - 2) * raisingElement(S, m - 3) * raisingElement(S, m - 4);
      re[i * dim + i + 4] = v;
      re[(i + 4) * dim + i] = v;
    }
    if (i + 1 < dim) {
      re[i * dim + i + 1] = -z * B[0] * sxRe[i * dim + i + 1]!;
      re[(i + 1) * dim + i] = -z * B[0] * sxRe[(i + 1) * dim + i]!;
      im[i * dim + i + 1] = -z * B[1] * syIm[i * dim + i + 1]!;
      im[(i + 1) * dim + i] = -z * B[1] * syIm[(i + 1) * dim + i]!;
    }
  }
  return { dim, re, im };
}

/** All levels (J, ascending) for each field magnitude along a unit direction. */
export function giantSpinLevels(p: GiantSpinParams, fields: ArrayLike<number>, direction: readonly [number, number, number] = [0, 0, 1]): Float64Array[] {
  const dim = check(p);
  const r = Math.hypot(...direction);
  if (!(r > 0)) throw new InputError("direction", direction, "a non-zero field direction");
  const u = direction.map((x) => x / r) as [number, number, number];
  // Real (field in the xz plane): pentadiagonal, banded solver; otherwise the Hermitian solver.
  const real = u[1] === 0;
  const hs = real ? null : new HermitianEigenSolver(dim);
  const rs = real ? new SymmetricBandEigenSolver(dim, 2) : null;
  const out: Float64Array[] = [];
  for (let k = 0; k < fields.length; k++) {
    const b = fields[k]!;
    const H = giantSpinMatrix(p, [b * u[0], b * u[1], b * u[2]]);
    if (rs) {
      rs.solve(H.re, false);
      out.push(Float64Array.from(rs.values));
    } else {
      hs!.solve(H.re, H.im, false);
      out.push(Float64Array.from(hs!.values));
    }
  }
  return out;
}

/** The P-symmetric and P-antisymmetric blocks of H for a field Bx along the hard axis. */
export function hardAxisParityBlocks(p: GiantSpinParams, Bx: number): { sym: Float64Array; nSym: number; anti: Float64Array; nAnti: number } {
  const { dim, re } = giantSpinMatrix(p, [Bx, 0, 0]);
  const integer = dim % 2 === 1;
  const P = Math.floor(dim / 2); // number of m > 0
  const nSym = P + (integer ? 1 : 0);
  const sym = new Float64Array(nSym * nSym);
  const anti = new Float64Array(P * P);
  const mir = (i: number) => dim - 1 - i;
  for (let a = 0; a < P; a++) {
    for (let b = 0; b < P; b++) {
      sym[a * nSym + b] = re[a * dim + b]! + re[a * dim + mir(b)]!;
      anti[a * P + b] = re[a * dim + b]! - re[a * dim + mir(b)]!;
    }
    if (integer) {
      const c = P; // index of m = 0
      sym[a * nSym + P] = Math.SQRT2 * re[a * dim + c]!;
      sym[P * nSym + a] = Math.SQRT2 * re[c * dim + a]!;
    }
  }
  if (integer) sym[P * nSym + P] = re[P * dim + P]!;
  return { sym, nSym, anti, nAnti: P };
}

export interface TunnelSplitting {
  /** E0(antisymmetric) - E0(symmetric) (J): changes sign at each quenching field. */
  signed: number;
  /** |signed| (J). */
  splitting: number;
  /** Smallest splitting the method resolves here (J). */
  resolution: number;
  /** The two doublet levels are the two lowest of the whole spectrum and well separated from the rest. */
  isolatedDoublet: boolean;
  /** Ground level (J). */
  ground: number;
}

/** Ground-doublet tunnel splitting for a field Bx (T) along the hard axis, in double-double. */
export function hardAxisTunnelSplitting(p: GiantSpinParams, Bx: number): TunnelSplitting {
  if (!Number.isFinite(Bx)) throw new InputError("Bx", Bx, "a finite field in T");
  const { sym, nSym, anti, nAnti } = hardAxisParityBlocks(p, Bx);
  const ls = lowestLevelDD(nSym, sym);
  const la = lowestLevelDD(nAnti, anti);
  const d = ddSub(la.value, ls.value);
  const signed = ddToNumber(d);
  const e0 = Math.min(ls.value[0], la.value[0]);
  const e1 = Math.max(ls.value[0], la.value[0]);
  const next = Math.min(ls.next, la.next);
  const norm = Math.abs(p.D) * p.S * p.S + Math.abs(p.E) * p.S * p.S + Math.abs(p.C ?? 0) * p.S ** 4 + (p.g ?? 2) * muB * Math.abs(Bx) * p.S;
  return {
    signed: signed + 0,
    splitting: Math.abs(signed),
    resolution: Math.max(1e-29 * norm, ls.bound + la.bound),
    isolatedDoublet: next - e1 > 10 * (e1 - e0),
    ground: e0,
  };
}

const bandSolvers = new Map<string, SymmetricBandEigenSolver>();

/**
 * Lowest eigenvalue of a small real symmetric (banded) block in double-double: double eigenvector
 * by the banded solver, Rayleigh quotient in double-double; `bound` is the Kato-Temple bound
 * residual^2 / gap on its error, `next` the second eigenvalue (double).
 */
function lowestLevelDD(n: number, a: Float64Array): { value: DD; bound: number; next: number } {
  const b = matrixBandwidth(n, a);
  const key = `${n},${b}`;
  let solver = bandSolvers.get(key);
  if (!solver) {
    if (bandSolvers.size > 32) bandSolvers.clear();
    solver = new SymmetricBandEigenSolver(n, b);
    bandSolvers.set(key, solver);
  }
  solver.solve(a, true, 1);
  const x = new Float64Array(n);
  for (let i = 0; i < n; i++) x[i] = solver.vectors[i * n]!;
  const rq = rayleighQuotientDD(n, a, x, b);
  const next = n > 1 ? solver.values[1]! : Infinity;
  const gap = next - rq.value[0];
  const bound = n > 1 ? (gap > 0 ? (rq.residual * rq.residual) / gap : Infinity) : 0;
  return { value: rq.value, bound, next };
}

/** Splitting E1 - E0 (J) for any field by the double-precision Hermitian solver (no symmetry). */
export function tunnelSplittingAnyField(p: GiantSpinParams, B: readonly [number, number, number]): { splitting: number; resolution: number } {
  const H = giantSpinMatrix(p, B);
  const s = new HermitianEigenSolver(H.dim);
  s.solve(H.re, H.im, false);
  const norm = Math.abs(p.D) * p.S * p.S + Math.abs(p.E) * p.S * p.S + Math.abs(p.C ?? 0) * p.S ** 4 + (p.g ?? 2) * muB * Math.hypot(...B) * p.S;
  return { splitting: s.values[1]! - s.values[0]!, resolution: 1e-14 * norm };
}

/** Garg's semiclassical period of the quenching fields along the hard axis (T). */
export function gargQuenchingPeriod(p: GiantSpinParams): number {
  check(p);
  return (2 * Math.sqrt(2 * p.E * (p.E + p.D))) / ((p.g ?? 2) * muB);
}

export interface QuenchingFields {
  /** Positive fields (T) where the ground-doublet splitting vanishes, ascending. */
  zeros: number[];
  /** Differences of consecutive zeros (T). */
  spacings: number[];
  /** Mean spacing (T); for integer S the first zero sits at half a period. */
  meanPeriod: number;
  gargPeriod: number;
  /** Relative deviation mean / Garg - 1. */
  deviation: number;
}

/** Zeros of the hard-axis tunnel splitting on (0, Bmax], found by sign changes + Brent refinement. */
export function hardAxisQuenchingFields(p: GiantSpinParams, Bmax: number, pointsPerPeriod = 12): QuenchingFields {
  check(p);
  if (!(Bmax > 0)) throw new InputError("Bmax", Bmax, "a positive field in T");
  const garg = gargQuenchingPeriod(p);
  const points = Math.min(4000, Math.max(40, Math.ceil((pointsPerPeriod * Bmax) / (garg || Bmax)) + 1));
  const f = (b: number) => hardAxisTunnelSplitting(p, b).signed;
  // start just above 0: at Bx = 0 half-integer spins are exactly degenerate (Kramers)
  const start = Bmax * 1e-9;
  const zeros = rootsOnGrid(f, start, Bmax, points, { xtol: 1e-13 * Bmax });
  const spacings = zeros.slice(1).map((z, i) => z - zeros[i]!);
  const meanPeriod = spacings.length ? spacings.reduce((a, b) => a + b, 0) / spacings.length : NaN;
  return { zeros, spacings, meanPeriod, gargPeriod: garg, deviation: spacings.length ? meanPeriod / garg - 1 : NaN };
}

export interface SplittingMinima {
  /** Fields (T) of the local minima of the ground splitting along the direction, ascending. */
  fields: number[];
  /** The splitting at each minimum (J). */
  splittings: number[];
  /** The double-precision resolution of the splitting there (J): a minimum below it is indistinguishable from 0. */
  resolution: number[];
}

/**
 * Local minima of the ground splitting E1 - E0 on (0, Bmax] for a field along the unit direction u
 * (any direction; complex Hermitian solver in double precision): a grid of `points` fields, then
 * Brent minimization in each bracketing cell. For a field off the hard axis these replace the zeros.
 */
export function splittingMinima(p: GiantSpinParams, Bmax: number, direction: readonly [number, number, number], points = 120): SplittingMinima {
  check(p);
  if (!(Bmax > 0)) throw new InputError("Bmax", Bmax, "a positive field in T");
  const r = Math.hypot(...direction);
  if (!(r > 0)) throw new InputError("direction", direction, "a non-zero field direction");
  const u = direction.map((x) => x / r);
  const at = (b: number) => tunnelSplittingAnyField(p, [b * u[0]!, b * u[1]!, b * u[2]!]);
  const bs = Array.from({ length: points }, (_, i) => (Bmax * (i + 1)) / points);
  const ls = bs.map((b) => Math.log(Math.max(at(b).splitting, 1e-300)));
  const out: SplittingMinima = { fields: [], splittings: [], resolution: [] };
  for (let i = 1; i + 1 < points; i++) {
    if (ls[i]! <= ls[i - 1]! && ls[i]! < ls[i + 1]!) {
      const m = brentMinimize((b) => Math.log(Math.max(at(b).splitting, 1e-300)), bs[i - 1]!, bs[i + 1]!, 1e-9 * Bmax);
      const s = at(m.x);
      out.fields.push(m.x);
      out.splittings.push(s.splitting);
      out.resolution.push(s.resolution);
    }
  }
  return out;
}
