/**
 * Dipolar interaction of classical moments on a two-dimensional Bravais lattice with a basis, by
 * Ewald summation; its Fourier transform J^{ab}(q) (3n x 3n, n basis sites), the bands, and the
 * Luttinger-Tisza minimum with the spin-length check.
 *
 * Energy (units: D = mu0 mu^2 / (4 pi d^3), lengths in d, the unit of the lattice vectors):
 *   E = (1/2) sum_{i != j} S_i . D(r_ij) . S_j,   D_ab(r) = delta_ab / r^3 - 3 r_a r_b / r^5 = -d_a d_b (1/r),
 * with unit vectors S (3 components; the lattice lies in the xy plane).
 *   J^{ab}_{ab'}(q) = sum'_R D(r) e^{+i q . r},  r = R + tau_b - tau_a   (R = 0 left out for a = b)
 * (sign chosen so that the state S_i = Re(u_a e^{i q . r_i}) has sum_j D(r_ij) S_j = Re(e^{i q . r_i} J(q) u)_a).
 * For a mode S_i = Re(u_a e^{i q . r_i}) the energy per site is (1 / 4n) u^dag J(q) u, so for unit
 * spins the energy per site is lambda / 2 when u is an eigenvector of eigenvalue lambda whose spins
 * all have unit length (Luttinger-Tisza: min over q of the lowest eigenvalue bounds the ground
 * state from below; it is the ground state when the spin lengths come out equal).
 *
 * Ewald splitting 1/r = erfc(eta r)/r + erf(eta r)/r (derived here; D. Parry, Surf. Sci. 49, 433
 * (1975) for the two-dimensional sums; K. De'Bell, A. MacIsaac, J. Whitehead, Rev. Mod. Phys. 72, 225
 * (2000) for dipolar lattices):
 * - real space: -d_a d_b [erfc(eta r)/r] = B(r) delta_ab - C(r) r_a r_b with
 *   B = erfc(eta r)/r^3 + (2 eta/sqrt(pi)) e^{-eta^2 r^2}/r^2,
 *   C = 3 erfc(eta r)/r^5 + (2 eta/sqrt(pi)) (3/r^4 + 2 eta^2/r^2) e^{-eta^2 r^2};
 * - reciprocal space (Poisson summation over the 2D lattice, cell area A): the 2D Fourier transform
 *   of erf(eta sqrt(s^2 + z^2)) / sqrt(s^2 + z^2) is
 *   F(k, z) = (pi/k) [e^{kz} erfc(k/2eta + eta z) + e^{-kz} erfc(k/2eta - eta z)],
 *   so with k = G - q:  in-plane  (1/A) sum_G k_a k_b F(k, 0) e^{i G . rho},
 *   F(k, 0) = (2 pi / k) erfc(k / 2 eta);  zz: (1/A) sum_G [-d_z^2 F](k, 0) e^{i G . rho},
 *   -d_z^2 F(k, 0) = -2 pi k erfc(k/2eta) + 4 sqrt(pi) eta e^{-k^2/4eta^2};  xz = yz = 0 (F even in z).
 *   At k = 0 the in-plane term vanishes (k_a k_b / k -> 0) and zz -> 4 sqrt(pi) eta: in two
 *   dimensions the q -> 0 sum converges absolutely, with a term linear in |q| (no shape term).
 * - self term (a = b, R = 0 removed): -d_a d_b [erf(eta r)/r] at r -> 0 = (4 eta^3 / 3 sqrt(pi)) delta_ab,
 *   subtracted.
 * The result does not depend on eta (tested); cutoffs are chosen so that the neglected terms are
 * below 1e-15 relative (erfc(6.5) ~ 4e-20).
 */
import { InputError } from "../errors.js";
import { HermitianEigenSolver } from "../numeric/eigenHermitian.js";
import { erfc } from "../numeric/distributions.js"; // relative error below 1.5e-15 (tested against mpmath)

export type Vec2 = [number, number];

export interface Lattice2D {
  name: string;
  a1: Vec2;
  a2: Vec2;
  /** Basis positions (same length unit). */
  basis: Vec2[];
}

/** Presets: lengths in the nearest-neighbour distance d. */
export function latticePreset(name: "square" | "triangular" | "honeycomb"): Lattice2D {
  const s3 = Math.sqrt(3);
  switch (name) {
    case "square":
      return { name, a1: [1, 0], a2: [0, 1], basis: [[0, 0]] };
    case "triangular":
      return { name, a1: [1, 0], a2: [0.5, s3 / 2], basis: [[0, 0]] };
    case "honeycomb":
      return {
        name,
        a1: [s3, 0],
        a2: [s3 / 2, 1.5],
        basis: [
          [0, 0],
          [0, 1],
        ],
      };
    default:
      throw new InputError("lattice", name, "square, triangular or honeycomb");
  }
}

export function reciprocalVectors(lat: Lattice2D): { b1: Vec2; b2: Vec2; area: number } {
  const [a1, a2] = [lat.a1, lat.a2];
  const area = a1[0] * a2[1] - a1[1] * a2[0];
  if (!(Math.abs(area) > 1e-12)) throw new InputError("a1, a2", [a1, a2], "two non-parallel lattice vectors");
  const f = (2 * Math.PI) / area;
  return { b1: [f * a2[1], -f * a2[0]], b2: [-f * a1[1], f * a1[0]], area: Math.abs(area) };
}

function checkLattice(lat: Lattice2D): void {
  for (const v of [lat.a1, lat.a2, ...lat.basis]) {
    if (v.length !== 2 || !v.every(Number.isFinite)) throw new InputError("lattice", lat, "finite 2D lattice and basis vectors");
  }
  if (lat.basis.length < 1 || lat.basis.length > 64) throw new InputError("basis", lat.basis.length, "1 to 64 basis sites");
  // distinct basis sites (modulo the lattice)
  const { b1, b2 } = reciprocalVectors(lat);
  for (let i = 0; i < lat.basis.length; i++)
    for (let j = 0; j < i; j++) {
      const d: Vec2 = [lat.basis[i]![0] - lat.basis[j]![0], lat.basis[i]![1] - lat.basis[j]![1]];
      const f1 = (d[0] * b1[0] + d[1] * b1[1]) / (2 * Math.PI),
        f2 = (d[0] * b2[0] + d[1] * b2[1]) / (2 * Math.PI);
      if (Math.abs(f1 - Math.round(f1)) < 1e-9 && Math.abs(f2 - Math.round(f2)) < 1e-9)
        throw new InputError("basis", lat.basis, "basis sites that are distinct modulo the lattice");
    }
}

/** Integer ranges covering all lattice points R (plus offsets up to `shift`) with |R| <= radius. */
function latticeRange(a1: Vec2, a2: Vec2, radius: number): number {
  // |n1 a1 + n2 a2| >= |n_i| * (area / |a_other|): bound each index by radius |a_other| / area
  const area = Math.abs(a1[0] * a2[1] - a1[1] * a2[0]);
  return Math.ceil((radius * Math.max(Math.hypot(...a1), Math.hypot(...a2))) / area) + 1;
}

export interface EwaldOptions {
  /** Splitting parameter eta (1 / length); default sqrt(pi / A). */
  eta?: number;
  /** exp(-x^2) cutoff exponent: real radius = cut / eta, reciprocal radius = 2 eta cut (default 6.5). */
  cut?: number;
}

const sqrtPi = Math.sqrt(Math.PI);

/**
 * J(q) as a Hermitian 3n x 3n matrix (planar re/im, row index 3a + alpha, column 3b + beta), in
 * units of D = mu0 mu^2 / (4 pi d^3). q in radians per length unit.
 */
export function dipolarTensor(lat: Lattice2D, q: Vec2, options: EwaldOptions = {}): { n: number; re: Float64Array; im: Float64Array } {
  checkLattice(lat);
  if (!q.every(Number.isFinite)) throw new InputError("q", q, "a finite wavevector");
  const { b1, b2, area } = reciprocalVectors(lat);
  const eta = options.eta ?? Math.sqrt(Math.PI / area);
  if (!(eta > 0)) throw new InputError("eta", eta, "a positive Ewald splitting parameter");
  const cut = options.cut ?? 6.5;
  const nb = lat.basis.length;
  const N = 3 * nb;
  const re = new Float64Array(N * N),
    im = new Float64Array(N * N);
  const rCut = cut / eta,
    kCut = 2 * eta * cut;
  const nR = latticeRange(lat.a1, lat.a2, rCut + 2 * maxBasisSpread(lat));
  const nG = latticeRange(b1, b2, kCut + Math.hypot(...q));
  if ((2 * nR + 1) ** 2 * nb * nb > 5e7 || (2 * nG + 1) ** 2 * nb * nb > 5e7) throw new InputError("eta", eta, "a splitting parameter that keeps both Ewald sums below 5e7 terms");
  const twoEtaOverSqrtPi = (2 * eta) / sqrtPi;
  for (let a = 0; a < nb; a++)
    for (let b = 0; b < nb; b++) {
      const rho: Vec2 = [lat.basis[b]![0] - lat.basis[a]![0], lat.basis[b]![1] - lat.basis[a]![1]];
      let xx = 0,
        xy = 0,
        yy = 0,
        zz = 0,
        ixx = 0,
        ixy = 0,
        iyy = 0,
        izz = 0;
      // real space
      for (let n1 = -nR; n1 <= nR; n1++)
        for (let n2 = -nR; n2 <= nR; n2++) {
          const rx = n1 * lat.a1[0] + n2 * lat.a2[0] + rho[0];
          const ry = n1 * lat.a1[1] + n2 * lat.a2[1] + rho[1];
          const r2 = rx * rx + ry * ry;
          if (r2 < 1e-24 || r2 > rCut * rCut) continue;
          const r = Math.sqrt(r2);
          const ec = erfc(eta * r);
          const g = twoEtaOverSqrtPi * Math.exp(-eta * eta * r2);
          const B = ec / (r2 * r) + g / r2;
          const C = (3 * ec) / (r2 * r2 * r) + g * (3 / (r2 * r2) + (2 * eta * eta) / r2);
          const ph = q[0] * rx + q[1] * ry;
          const c = Math.cos(ph),
            s = Math.sin(ph);
          const dxx = B - C * rx * rx,
            dxy = -C * rx * ry,
            dyy = B - C * ry * ry,
            dzz = B;
          xx += dxx * c;
          ixx += dxx * s;
          xy += dxy * c;
          ixy += dxy * s;
          yy += dyy * c;
          iyy += dyy * s;
          zz += dzz * c;
          izz += dzz * s;
        }
      // reciprocal space: (1/A) sum_G f(G + q) e^{i G . rho} (Poisson summation of D(r) e^{i q . r}: the transform at G - q)
      for (let m1 = -nG; m1 <= nG; m1++)
        for (let m2 = -nG; m2 <= nG; m2++) {
          const Gx = m1 * b1[0] + m2 * b2[0],
            Gy = m1 * b1[1] + m2 * b2[1];
          const kx = Gx - q[0],
            ky = Gy - q[1];
          const k = Math.hypot(kx, ky);
          if (k > kCut) continue;
          const u = k / (2 * eta);
          const ph = Gx * rho[0] + Gy * rho[1];
          const c = Math.cos(ph) / area,
            s = Math.sin(ph) / area;
          const fz = -2 * Math.PI * k * erfc(u) + 4 * sqrtPi * eta * Math.exp(-u * u);
          zz += fz * c;
          izz += fz * s;
          if (k > 0) {
            const F = ((2 * Math.PI) / k) * erfc(u);
            xx += kx * kx * F * c;
            ixx += kx * kx * F * s;
            xy += kx * ky * F * c;
            ixy += kx * ky * F * s;
            yy += ky * ky * F * c;
            iyy += ky * ky * F * s;
          }
        }
      if (a === b) {
        const self = (4 * eta ** 3) / (3 * sqrtPi);
        xx -= self;
        yy -= self;
        zz -= self;
      }
      const put = (al: number, be: number, vr: number, vi: number) => {
        re[(3 * a + al) * N + 3 * b + be] = vr;
        im[(3 * a + al) * N + 3 * b + be] = vi;
      };
      put(0, 0, xx, ixx);
      put(0, 1, xy, ixy);
      put(1, 0, xy, ixy);
      put(1, 1, yy, iyy);
      put(2, 2, zz, izz);
    }
  // exact Hermitian symmetry (J^{ba} = conj J^{ab}) against rounding
  for (let i = 0; i < N; i++)
    for (let j = 0; j < i; j++) {
      const r = (re[i * N + j]! + re[j * N + i]!) / 2,
        s = (im[i * N + j]! - im[j * N + i]!) / 2;
      re[i * N + j] = r;
      re[j * N + i] = r;
      im[i * N + j] = s;
      im[j * N + i] = -s;
    }
  for (let i = 0; i < N; i++) im[i * N + i] = 0;
  return { n: N, re, im };
}

function maxBasisSpread(lat: Lattice2D): number {
  let m = 0;
  for (const p of lat.basis) m = Math.max(m, Math.hypot(...p));
  return m;
}

/**
 * The same tensor by direct summation over |r| <= radius (slowly convergent: the tail of
 * sum 1/r^3 over a 2D lattice falls as 2 pi / (A radius)); for checks only.
 */
export function dipolarTensorDirect(lat: Lattice2D, q: Vec2, radius: number): { n: number; re: Float64Array; im: Float64Array } {
  checkLattice(lat);
  const nb = lat.basis.length,
    N = 3 * nb;
  const re = new Float64Array(N * N),
    im = new Float64Array(N * N);
  const nR = latticeRange(lat.a1, lat.a2, radius + 2 * maxBasisSpread(lat));
  if ((2 * nR + 1) ** 2 * nb * nb > 2e8) throw new InputError("radius", radius, "a cutoff radius with at most 2e8 terms");
  for (let a = 0; a < nb; a++)
    for (let b = 0; b < nb; b++) {
      const rho: Vec2 = [lat.basis[b]![0] - lat.basis[a]![0], lat.basis[b]![1] - lat.basis[a]![1]];
      for (let n1 = -nR; n1 <= nR; n1++)
        for (let n2 = -nR; n2 <= nR; n2++) {
          const rx = n1 * lat.a1[0] + n2 * lat.a2[0] + rho[0];
          const ry = n1 * lat.a1[1] + n2 * lat.a2[1] + rho[1];
          const r2 = rx * rx + ry * ry;
          if (r2 < 1e-24 || r2 > radius * radius) continue;
          const r3 = r2 * Math.sqrt(r2),
            r5 = r3 * r2;
          const ph = q[0] * rx + q[1] * ry;
          const c = Math.cos(ph),
            s = Math.sin(ph);
          const d = [
            [1 / r3 - (3 * rx * rx) / r5, (-3 * rx * ry) / r5, 0],
            [(-3 * rx * ry) / r5, 1 / r3 - (3 * ry * ry) / r5, 0],
            [0, 0, 1 / r3],
          ];
          for (let al = 0; al < 3; al++)
            for (let be = 0; be < 3; be++) {
              re[(3 * a + al) * N + 3 * b + be]! += d[al]![be]! * c;
              im[(3 * a + al) * N + 3 * b + be]! += d[al]![be]! * s;
            }
        }
    }
  return { n: N, re, im };
}

/** Eigenvalues (ascending) and eigenvectors of J(q). */
export function dipolarBands(lat: Lattice2D, q: Vec2, options: EwaldOptions = {}): { values: Float64Array; vectorsRe: Float64Array; vectorsIm: Float64Array } {
  const J = dipolarTensor(lat, q, options);
  const s = new HermitianEigenSolver(J.n);
  s.solve(J.re, J.im, true);
  return { values: Float64Array.from(s.values), vectorsRe: Float64Array.from(s.vectorsRe), vectorsIm: Float64Array.from(s.vectorsIm) };
}

/** q = f1 b1 + f2 b2. */
export function fractionalToQ(lat: Lattice2D, f1: number, f2: number): Vec2 {
  const { b1, b2 } = reciprocalVectors(lat);
  return [f1 * b1[0] + f2 * b2[0], f1 * b1[1] + f2 * b2[1]];
}

export interface LuttingerTiszaResult {
  /** Lowest eigenvalue of J(q) over the zone (units D); energy bound per site lambda/2. */
  lambdaMin: number;
  energyPerSite: number;
  /** Wavevector(s) of the minimum (all grid points within tolerance of the minimum, refined). */
  qMin: Vec2[];
  /** Fractional coordinates of qMin. */
  fractional: Array<[number, number]>;
  /** Degeneracy of the lowest eigenvalue at the first qMin. */
  degeneracy: number;
  /**
   * Spin-length check of the best single-q (plus its -q partner) state built from the lowest
   * eigenvector(s): max |S| / min |S| - 1 over the sites; 0 means LT's bound is reached. Only
   * combinations of the two lowest eigenvectors at q_min are scanned: for a higher degeneracy, or
   * when only multi-q states reach the bound, a spread > 0 does not prove that the bound is missed.
   */
  spinLengthSpread: number;
  notes: string[];
}

/** Luttinger-Tisza minimum on a grid of the zone (grid x grid in fractional coordinates), refined. */
export function luttingerTisza(lat: Lattice2D, grid = 24, options: EwaldOptions = {}): LuttingerTiszaResult {
  if (!Number.isInteger(grid) || grid < 2 || grid > 200) throw new InputError("grid", grid, "a whole number of zone points per direction, 2 to 200");
  const nb = lat.basis.length;
  const lowest = (f1: number, f2: number) => dipolarBands(lat, fractionalToQ(lat, f1, f2), options).values[0]!;
  const vals: Array<[number, number, number]> = [];
  for (let i = 0; i < grid; i++) for (let j = 0; j < grid; j++) vals.push([i / grid, j / grid, lowest(i / grid, j / grid)]);
  const minVal = Math.min(...vals.map((v) => v[2]));
  const scale = Math.max(1, Math.abs(minVal));
  const cands = vals.filter((v) => v[2] < minVal + 1e-9 * scale);
  const notes: string[] = [];
  // refine the first candidate by coordinate descent (golden steps), staying on the grid if it does not improve
  let [f1, f2, best] = cands[0]!;
  let step = 0.5 / grid;
  for (let it = 0; it < 40 && step > 1e-7; it++) {
    let moved = false;
    for (const [d1, d2] of [
      [step, 0],
      [-step, 0],
      [0, step],
      [0, -step],
      [step, step],
      [-step, -step],
      [step, -step],
      [-step, step],
    ] as const) {
      const e = lowest(f1 + d1, f2 + d2);
      if (e < best - 1e-13 * scale) {
        [f1, f2, best] = [f1 + d1, f2 + d2, e];
        moved = true;
      }
    }
    if (!moved) step /= 2;
  }
  const qMin = fractionalToQ(lat, f1, f2);
  const bands = dipolarBands(lat, qMin, options);
  const N = 3 * nb;
  let degeneracy = 1;
  while (degeneracy < N && bands.values[degeneracy]! - bands.values[0]! < 1e-8 * scale) degeneracy++;
  const spread = spinLengthSpread(lat, qMin, bands, degeneracy);
  if (cands.length > 1) notes.push(`${cands.length} grid points share the minimum (symmetry-related or a degenerate line)`);
  if (spread > 1e-6)
    notes.push(`the Luttinger-Tisza eigenvectors at the minimum do not give equal spin lengths (spread ${spread.toExponential(2)}): E = lambda/2 is then a lower bound only`);
  return { lambdaMin: best, energyPerSite: best / 2, qMin: [qMin], fractional: [[f1, f2]], degeneracy, spinLengthSpread: spread, notes };
}

/**
 * Spin lengths of S_i = Re(u_a e^{i q . r_i}) for u in the lowest eigenspace: scan real combinations
 * of the degenerate eigenvectors (with a global complex phase) and return the best spread found.
 */
export function spinLengthSpread(lat: Lattice2D, q: Vec2, bands: { values: Float64Array; vectorsRe: Float64Array; vectorsIm: Float64Array }, degeneracy: number): number {
  const nb = lat.basis.length,
    N = 3 * nb;
  const sites: Array<[number, number, number]> = []; // basis index, rx, ry
  for (let n1 = -3; n1 <= 3; n1++)
    for (let n2 = -3; n2 <= 3; n2++)
      for (let a = 0; a < nb; a++) {
        sites.push([a, n1 * lat.a1[0] + n2 * lat.a2[0] + lat.basis[a]![0], n1 * lat.a1[1] + n2 * lat.a2[1] + lat.basis[a]![1]]);
      }
  const spreadOf = (uRe: number[], uIm: number[]) => {
    let lo = Infinity,
      hi = 0;
    for (const [a, rx, ry] of sites) {
      const ph = q[0] * rx + q[1] * ry;
      const c = Math.cos(ph),
        s = Math.sin(ph);
      let l2 = 0;
      for (let al = 0; al < 3; al++) {
        const x = uRe[3 * a + al]! * c - uIm[3 * a + al]! * s;
        l2 += x * x;
      }
      lo = Math.min(lo, l2);
      hi = Math.max(hi, l2);
    }
    return hi > 0 ? Math.sqrt(hi / Math.max(lo, 1e-300)) - 1 : Infinity;
  };
  let best = Infinity;
  const d = Math.min(degeneracy, 2);
  const steps = d === 1 ? 1 : 24;
  for (let t = 0; t < steps; t++) {
    for (let p = 0; p < (d === 1 ? 1 : 24); p++) {
      const th = (Math.PI * t) / steps,
        ps = (2 * Math.PI * p) / 24;
      // u = cos th v0 + e^{i ps} sin th v1
      const uRe: number[] = [],
        uIm: number[] = [];
      for (let k = 0; k < N; k++) {
        let r = Math.cos(th) * bands.vectorsRe[k * N]!,
          i = Math.cos(th) * bands.vectorsIm[k * N]!;
        if (d > 1) {
          const vr = bands.vectorsRe[k * N + 1]!,
            vi = bands.vectorsIm[k * N + 1]!;
          r += Math.sin(th) * (Math.cos(ps) * vr - Math.sin(ps) * vi);
          i += Math.sin(th) * (Math.cos(ps) * vi + Math.sin(ps) * vr);
        }
        uRe.push(r);
        uIm.push(i);
      }
      best = Math.min(best, spreadOf(uRe, uIm));
    }
  }
  return best;
}

/** Energy per site (units D) of the state S_i = Re(u_a e^{i q . r_i}) from J(q): (1 / 4n) u^dag J u, valid when 2q is not a reciprocal vector. */
export function modeEnergy(lat: Lattice2D, q: Vec2, uRe: number[], uIm: number[], options: EwaldOptions = {}): number {
  const J = dipolarTensor(lat, q, options);
  const N = J.n;
  let e = 0;
  for (let i = 0; i < N; i++)
    for (let j = 0; j < N; j++) {
      // Re[conj(u_i) J_ij u_j]
      const jr = J.re[i * N + j]!,
        ji = J.im[i * N + j]!;
      const pr = jr * uRe[j]! - ji * uIm[j]!,
        pi = jr * uIm[j]! + ji * uRe[j]!;
      e += uRe[i]! * pr + uIm[i]! * pi;
    }
  return e / (4 * lat.basis.length);
}
