/**
 * Stability of an axisymmetric skyrmion (exact profile of the local model, skyrmionExact.ts) against
 * small deformations with angular dependence m: the lowest eigenvalues of the linearized energy
 * (radial fluctuation operator) for the angular modes m = 0, 1, 2, ... . Source of the method:
 * A. Bogdanov, A. Hubert, JMMM 138, 255 (1994) and the stability analyses of isolated skyrmions cited
 * there; the operator below is our own derivation from the energy functional of skyrmionEnergy.ts with
 * local magnetostatics (K_eff), stated here in full.
 *
 * Energy per thickness, polar coordinates (rho, chi), m = (sin theta cos Phi, sin theta sin Phi, cos theta):
 *   e = A [theta_rho^2 + theta_chi^2 / rho^2 + sin^2 theta (Phi_rho^2 + Phi_chi^2 / rho^2)] + K sin^2 theta
 *       + Ms B (1 - cos theta) + D [cos(Phi - chi) theta_rho + sin(Phi - chi) theta_chi / rho
 *       + sin theta cos theta (-sin(Phi - chi) Phi_rho + cos(Phi - chi) Phi_chi / rho)]
 * (interfacial DMI m_z div m - (m . grad) m_z written in the angles; K = K_eff). The skyrmion is
 * theta_0(rho), Phi_0 = chi + psi_0 with D cos psi_0 = |D|. Fluctuations along the local frame,
 *   delta m = u(rho) cos(m chi) e_theta + v(rho) sin(m chi) e_Phi,
 * (the other parity, u sin and -v cos, gives the same operator; -m is m with v -> -v), i.e.
 * theta = theta_0 + u cos(m chi), Phi = Phi_0 + (v / sin theta_0) sin(m chi). Expanding e to second
 * order, averaging over chi, integrating the terms in v v' by parts and using the Euler-Lagrange
 * equation of theta_0 to remove theta_0'', the second variation is (m >= 1; for m = 0 the factor pi is
 * 2 pi and the two components decouple)
 *   E2 = pi t Int [ A (u'^2 + v'^2) + U_u u^2 + U_v v^2 + 2 C u v ] rho d rho,
 *   U_u = A (m^2 + cos 2 theta) / rho^2 + K cos 2 theta + (Ms B / 2) cos theta - |D| sin 2 theta / rho,
 *   U_v = A (m^2 + cos^2 theta) / rho^2 - A theta'^2 + K cos^2 theta + (Ms B / 2) cos theta
 *         - |D| sin theta cos theta / rho - |D| theta',
 *   C   = m (2 A cos theta / rho^2 - |D| sin theta / rho),
 * all at theta = theta_0(rho). In units of Delta = sqrt(A / K) (x = rho / Delta) and K, with
 * b = Ms B / (2 K) and d = |D| / sqrt(A K), the eigenvalue problem is
 *   -(1/x)(x u')' + U_u u + C v = lambda u,   -(1/x)(x v')' + U_v v + C u = lambda v,
 *   U_u = (m^2 + cos 2 theta) / x^2 + cos 2 theta + b cos theta - d sin 2 theta / x,
 *   U_v = (m^2 + cos^2 theta) / x^2 - theta'^2 + cos^2 theta + b cos theta - d sin theta cos theta / x - d theta',
 *   C   = m (2 cos theta / x^2 - d sin theta / x),
 * with weight x (the norm Int |delta m|^2 dA). lambda is in units of K_eff. Checks: far from the core
 * U_u, U_v -> 1 + b, the edge of the continuum (spin waves of the uniform film); in the uniform film
 * (theta = 0) the centrifugal terms combine into (m -+ 1)^2 / x^2, the Cartesian components; for
 * m = 1 the translation of the skyrmion, u = -theta_0', v = sin theta_0 / x, is an exact zero mode
 * (tested). A state is stable when the lowest eigenvalue of every mode is positive, except the m = 1
 * zero mode. The m = 2 mode (elliptic deformation) is the one that softens for large bubbles
 * (strip-out); modes m = 3, 4 are computed too.
 *
 * Discretization: finite volumes on cells x_j = (j - 1/2) h, j = 1..N (no flux through x = 0, the
 * regular solution; u = v = 0 beyond x = L), weight x_j h; symmetrized, the matrix is block
 * tridiagonal with 2 x 2 blocks. Eigenvalues by bisection on the Sylvester inertia of the block LDL^T
 * factorization (count of eigenvalues below a shift), on grids h and h / 2 with Richardson
 * extrapolation (error O(h^2) -> O(h^4)); eigenvectors by inverse iteration with the block solver.
 * Checked against a finite-difference second derivative of the 2D energy on a grid (scipy/numpy) in
 * test/lib/walls/skyrmionStability.test.ts.
 */
import { ConvergenceError, InputError } from "../errors.js";
import { brentRoot } from "../numeric/brentRoot.js";
import { criticalDmi, requirePerpendicular, wallWidthParameter, type Film } from "../material/film.js";
import { solveSkyrmionExact, type ExactSkyrmion } from "./skyrmionExact.js";
import { saturationField } from "./wall360.js";

/** The block-tridiagonal operator of one angular mode on a grid (symmetrized, see the header). */
interface ModeOperator {
  N: number;
  /** Diagonal blocks: a11, a12, a22 for each cell (length 3 N). */
  diag: Float64Array;
  /** Off-diagonal (j, j+1), the same for both components (length N - 1): -x_{j+1/2} / (h^2 sqrt(x_j x_{j+1})). */
  off: Float64Array;
  h: number;
}

function buildOperator(theta: (x: number) => number, dtheta: (x: number) => number, d: number, b: number, m: number, L: number, h: number): ModeOperator {
  const N = Math.round(L / h);
  const hh = L / N;
  const diag = new Float64Array(3 * N);
  const off = new Float64Array(Math.max(0, N - 1));
  for (let j = 0; j < N; j++) {
    const x = (j + 0.5) * hh;
    const xl = j * hh;
    const xr = (j + 1) * hh;
    const th = theta(x);
    const T = dtheta(x);
    const s = Math.sin(th);
    const c = Math.cos(th);
    const c2 = c * c - s * s;
    const s2 = 2 * s * c;
    const m2 = m * m;
    const Uu = (m2 + c2) / (x * x) + c2 + b * c - (d * s2) / x;
    const Uv = (m2 + c * c) / (x * x) - T * T + c * c + b * c - (d * s * c) / x - d * T;
    const C = m * ((2 * c) / (x * x) - (d * s) / x);
    // stiffness (xl + xr) / (x h^2) on the diagonal (the outer face has u = 0 beyond L: ghost -u)
    const stiff = (xl + (j === N - 1 ? 2 * xr : xr)) / (x * hh * hh);
    diag[3 * j] = stiff + Uu;
    diag[3 * j + 1] = C;
    diag[3 * j + 2] = stiff + Uv;
    if (j < N - 1) {
      const xn = (j + 1.5) * hh;
      off[j] = -xr / (hh * hh * Math.sqrt(x * xn));
    }
  }
  return { N, diag, off, h: hh };
}

/** Number of eigenvalues below sigma (Sylvester inertia of the block LDL^T of H - sigma I). */
function countBelow(op: ModeOperator, sigma: number): number {
  const { N, diag, off } = op;
  let count = 0;
  // S_j = A_j - sigma - o_{j-1}^2 S_{j-1}^{-1} (the off-diagonal block is o I)
  let p11 = 0;
  let p12 = 0;
  let p22 = 0; // S_{j-1}^{-1}
  for (let j = 0; j < N; j++) {
    let s11 = diag[3 * j]! - sigma;
    let s12 = diag[3 * j + 1]!;
    let s22 = diag[3 * j + 2]! - sigma;
    if (j > 0) {
      const o = off[j - 1]!;
      const o2 = o * o;
      s11 -= o2 * p11;
      s12 -= o2 * p12;
      s22 -= o2 * p22;
    }
    let det = s11 * s22 - s12 * s12;
    if (det === 0) {
      s11 += 1e-300;
      s22 += 1e-300;
      det = s11 * s22 - s12 * s12 || 1e-300;
    }
    // inertia of the 2 x 2 block: det < 0 -> one negative; det > 0 -> both of the sign of the trace
    if (det < 0) count += 1;
    else if (s11 + s22 < 0) count += 2;
    p11 = s22 / det;
    p12 = -s12 / det;
    p22 = s11 / det;
  }
  return count;
}

/** The k lowest eigenvalues (ascending) by bisection on the inertia count, to absolute tolerance tol. */
function lowestEigenvalues(op: ModeOperator, k: number, tol = 1e-10): number[] {
  // Gershgorin bounds
  let lo = Infinity;
  let hi = -Infinity;
  for (let j = 0; j < op.N; j++) {
    const o = (j > 0 ? Math.abs(op.off[j - 1]!) : 0) + (j < op.N - 1 ? Math.abs(op.off[j]!) : 0);
    const r1 = Math.abs(op.diag[3 * j + 1]!) + o;
    lo = Math.min(lo, op.diag[3 * j]! - r1, op.diag[3 * j + 2]! - r1);
    hi = Math.max(hi, op.diag[3 * j]! + r1, op.diag[3 * j + 2]! + r1);
  }
  const out: number[] = [];
  for (let i = 0; i < k; i++) {
    let a = lo;
    let c = hi;
    for (let it = 0; it < 200 && c - a > tol * Math.max(1, Math.abs(a)); it++) {
      const mid = 0.5 * (a + c);
      if (countBelow(op, mid) > i) c = mid;
      else a = mid;
    }
    out.push(0.5 * (a + c));
  }
  return out;
}

/** Solve (H - sigma I) y = r by block Thomas; returns y (length 2 N, u and v interleaved). */
function blockSolve(op: ModeOperator, sigma: number, r: Float64Array): Float64Array {
  const { N, diag, off } = op;
  const inv = new Float64Array(3 * N);
  const g = new Float64Array(2 * N);
  let p11 = 0;
  let p12 = 0;
  let p22 = 0;
  for (let j = 0; j < N; j++) {
    let s11 = diag[3 * j]! - sigma;
    let s12 = diag[3 * j + 1]!;
    let s22 = diag[3 * j + 2]! - sigma;
    let r1 = r[2 * j]!;
    let r2 = r[2 * j + 1]!;
    if (j > 0) {
      const o = off[j - 1]!;
      s11 -= o * o * p11;
      s12 -= o * o * p12;
      s22 -= o * o * p22;
      r1 -= o * g[2 * j - 2]!;
      r2 -= o * g[2 * j - 1]!;
    }
    const det = s11 * s22 - s12 * s12 || 1e-300;
    p11 = s22 / det;
    p12 = -s12 / det;
    p22 = s11 / det;
    inv[3 * j] = p11;
    inv[3 * j + 1] = p12;
    inv[3 * j + 2] = p22;
    g[2 * j] = p11 * r1 + p12 * r2;
    g[2 * j + 1] = p12 * r1 + p22 * r2;
  }
  const y = new Float64Array(2 * N);
  for (let j = N - 1; j >= 0; j--) {
    let y1 = g[2 * j]!;
    let y2 = g[2 * j + 1]!;
    if (j < N - 1) {
      const o = off[j]!;
      const q1 = o * y[2 * j + 2]!;
      const q2 = o * y[2 * j + 3]!;
      y1 -= inv[3 * j]! * q1 + inv[3 * j + 1]! * q2;
      y2 -= inv[3 * j + 1]! * q1 + inv[3 * j + 2]! * q2;
    }
    y[2 * j] = y1;
    y[2 * j + 1] = y2;
  }
  return y;
}

/** One angular mode: its lowest eigenvalues (units of K_eff), Richardson-extrapolated. */
export interface ModeSpectrum {
  m: number;
  /** The two lowest eigenvalues in units of K_eff (extrapolated from grids h and h / 2). */
  eigenvalues: [number, number];
  /** The same on the finer grid alone (the difference is an error estimate). */
  eigenvaluesFine: [number, number];
}

/** Result of the stability analysis of one exact skyrmion. */
export interface SkyrmionStability {
  /** Field (T) and the exact skyrmion analysed. */
  B: number;
  skyrmion: ExactSkyrmion;
  /** Spectra of the modes m = 0 .. 4. */
  modes: ModeSpectrum[];
  /** Edge of the continuum 1 + b (units of K_eff): eigenvalues above it are spin waves, not bound modes. */
  continuumEdge: number;
  /** True when every mode's lowest eigenvalue is positive (m = 1: its second; the first is the translation zero mode). */
  stable: boolean;
  /** The mode that is unstable first (lowest negative eigenvalue), or undefined. */
  unstableMode?: number;
  /** Tolerance (units of K_eff) used for "zero" of the translation mode and for the sign decisions. */
  tolerance: number;
  notes: string[];
}

/** Options of the stability analysis. */
export interface StabilityOptions {
  /** Grid step (units of Delta) of the coarse eigenvalue grid (default 0.04, or R / 15 for small cores; the fine grid has half). */
  step?: number;
  /** An exact skyrmion already solved at this field (else solveSkyrmionExact). */
  skyrmion?: ExactSkyrmion;
}

function dimensionlessProfile(sk: ExactSkyrmion, Delta: number) {
  return {
    theta: (x: number) => sk.profile.theta(x * Delta),
    dtheta: (x: number) => sk.profile.dtheta(x * Delta) * Delta,
  };
}

/**
 * Lowest eigenvalues of the radial fluctuation operator for m = 0 .. 4 around the exact skyrmion of
 * the local model at field B (T), and the verdict stable / unstable. ConvergenceError when no exact
 * skyrmion exists at this field.
 */
export function skyrmionStability(film: Film, B: number, options: StabilityOptions = {}): SkyrmionStability {
  if (!Number.isFinite(B)) throw new InputError("B", B, "a finite field in T");
  const K = requirePerpendicular(film, "the skyrmion stability analysis");
  const sk = options.skyrmion ?? solveSkyrmionExact(film, B);
  if (sk.status !== "ok") throw new ConvergenceError("skyrmion stability", "no exact skyrmion at this field", { B, status: sk.status, notes: sk.notes.join(" ") });
  const Delta = wallWidthParameter(film);
  // grid: 0.04 Delta, finer for small cores (at least 15 cells across the radius)
  const step = options.step ?? Math.max(0.004, Math.min(0.04, sk.radius / Delta / 15));
  if (!(step > 0 && step <= 0.2)) throw new InputError("step", step, "a grid step between 0 and 0.2 (units of Delta)");
  const d = Math.abs(film.D) / Math.sqrt(film.A * K);
  const b = (film.Ms * B) / (2 * K);
  const L = sk.length;
  const prof = dimensionlessProfile(sk, Delta);
  const modes: ModeSpectrum[] = [];
  for (let m = 0; m <= 4; m++) {
    const ec = lowestEigenvalues(buildOperator(prof.theta, prof.dtheta, d, b, m, L, step), 2);
    const ef = lowestEigenvalues(buildOperator(prof.theta, prof.dtheta, d, b, m, L, step / 2), 2);
    const ex: [number, number] = [(4 * ef[0]! - ec[0]!) / 3, (4 * ef[1]! - ec[1]!) / 3];
    modes.push({ m, eigenvalues: ex, eigenvaluesFine: [ef[0]!, ef[1]!] });
  }
  // "zero": the translation mode's distance from 0 plus the extrapolation change, at least 1e-6
  const m1 = modes[1]!;
  const tolerance = Math.max(1e-6, 3 * Math.abs(m1.eigenvalues[0]), 3 * Math.abs(m1.eigenvalues[0] - m1.eigenvaluesFine[0]));
  const notes: string[] = [];
  let worst: { m: number; l: number } | undefined;
  for (const md of modes) {
    const l = md.m === 1 ? md.eigenvalues[1] : md.eigenvalues[0];
    if (l < -tolerance && (!worst || l < worst.l)) worst = { m: md.m, l };
  }
  if (Math.abs(m1.eigenvalues[0]) > 1e-3)
    notes.push(`The m = 1 translation mode is at ${m1.eigenvalues[0].toExponential(2)} K_eff instead of 0: the grid is too coarse for this profile.`);
  const Dc = criticalDmi(film);
  if (Math.abs(film.D) > Dc) notes.push(`|D| > D_c: B_sat = ${(saturationField(film) * 1e3).toPrecision(4)} mT.`);
  const out: SkyrmionStability = { B, skyrmion: sk, modes, continuumEdge: 1 + b, stable: !worst, tolerance, notes };
  if (worst) out.unstableMode = worst.m;
  return out;
}

/**
 * Eigenvector of mode m for the eigenvalue nearest `lambda` on a grid of step h (units of Delta):
 * cell centres x (units of Delta) and u, v with Int (u^2 + v^2) x dx = 1. For tests and plots.
 */
export function skyrmionModeVector(film: Film, sk: ExactSkyrmion, m: number, lambda: number, h = 0.02): { x: Float64Array; u: Float64Array; v: Float64Array; eigenvalue: number } {
  requirePerpendicular(film, "the skyrmion mode vector");
  const Delta = wallWidthParameter(film);
  const { d, b } = sk;
  const prof = dimensionlessProfile(sk, Delta);
  const op = buildOperator(prof.theta, prof.dtheta, d, b, m, sk.length, h);
  const ev = lowestEigenvalues(op, 3);
  const target = ev.reduce((p, q) => (Math.abs(q - lambda) < Math.abs(p - lambda) ? q : p));
  const sigma = target - 1e-9 * Math.max(1, Math.abs(target));
  let y = new Float64Array(2 * op.N).fill(1);
  for (let it = 0; it < 6; it++) {
    const z = blockSolve(op, sigma, y);
    let nrm = 0;
    for (const q of z) nrm += q * q;
    nrm = Math.sqrt(nrm);
    y = z.map((q) => q / nrm);
  }
  // back from the symmetrized y = sqrt(x h) psi to psi, normalized with weight x
  const x = new Float64Array(op.N);
  const u = new Float64Array(op.N);
  const v = new Float64Array(op.N);
  let norm = 0;
  for (let j = 0; j < op.N; j++) {
    x[j] = (j + 0.5) * op.h;
    const s = Math.sqrt(x[j]! * op.h);
    u[j] = y[2 * j]! / s;
    v[j] = y[2 * j + 1]! / s;
    norm += (u[j]! * u[j]! + v[j]! * v[j]!) * x[j]! * op.h;
  }
  const f = 1 / Math.sqrt(norm);
  for (let j = 0; j < op.N; j++) {
    u[j]! *= f;
    v[j]! *= f;
  }
  return { x, u, v, eigenvalue: target };
}

/** Where the elliptic (m = 2) mode softens, searched downwards in field from a stable state. */
export interface StripOut {
  /**
   * "softens": the lowest m = 2 eigenvalue crosses zero at `field`; "ends": the exact skyrmion stops
   * existing (no solution of the local model) at about `field` before m = 2 softens; "none": neither
   * happens down to the lowest field searched.
   */
  kind: "softens" | "ends" | "none";
  /** Field (T) of the crossing or of the end of existence; the lowest field searched for "none". */
  field: number;
  /** Half-width of the final bracket (T). */
  resolution: number;
  /** m = 2 eigenvalue (units of K_eff) at the start field. */
  startEigenvalue: number;
  /** m = 2 eigenvalue at the lowest field where the skyrmion was found (for "ends": how soft it got). */
  lastEigenvalue: number;
  /** That field (T). */
  lastField: number;
}

/**
 * Search downwards in field from B0 (T) for the strip-out field, where the lowest m = 2 eigenvalue of
 * the exact skyrmion crosses zero: steps of growing size (from 2 percent of the scale 2 K_eff / Ms)
 * down to Bmin bracket the crossing (or the end of existence), Brent's root method (or bisection on
 * existence) then locates it to `tol` (default 1e-5 T).
 */
export function stripOutField(film: Film, B0: number, Bmin: number, tol = 1e-5): StripOut {
  if (!Number.isFinite(B0)) throw new InputError("B0", B0, "a finite field in T");
  if (!(Bmin < B0)) throw new InputError("Bmin", Bmin, `a field below B0 = ${B0} T`);
  const K = requirePerpendicular(film, "the strip-out field");
  let lastField = B0;
  let lastEigenvalue = NaN;
  const lam2 = (B: number): number | undefined => {
    try {
      const l = skyrmionStability(film, B).modes[2]!.eigenvalues[0];
      if (B < lastField || lastEigenvalue !== lastEigenvalue) {
        lastField = B;
        lastEigenvalue = l;
      }
      return l;
    } catch (e) {
      if (e instanceof ConvergenceError) return undefined;
      throw e;
    }
  };
  const l0 = lam2(B0);
  if (l0 === undefined) throw new ConvergenceError("strip-out field", "no exact skyrmion at the start field", { B0 });
  const done = (r: Omit<StripOut, "lastEigenvalue" | "lastField">): StripOut => ({ ...r, lastEigenvalue, lastField });
  if (l0 <= 0) return done({ kind: "softens", field: B0, resolution: 0, startEigenvalue: l0 });
  let hi = B0;
  let step = 0.02 * ((2 * K) / film.Ms);
  step = Math.min(step, (B0 - Bmin) / 4);
  for (let it = 0; it < 60; it++) {
    const lo = Math.max(Bmin, hi - step);
    const l = lam2(lo);
    if (l === undefined) {
      // existence ends in (lo, hi): bisection, watching m = 2 on the way
      let a = lo;
      let c = hi;
      while (c - a > tol) {
        const mid = 0.5 * (a + c);
        const lm = lam2(mid);
        if (lm === undefined) a = mid;
        else if (lm <= 0) return done(softens(lam2, mid, c, tol, l0));
        else c = mid;
      }
      return done({ kind: "ends", field: 0.5 * (a + c), resolution: 0.5 * (c - a), startEigenvalue: l0 });
    }
    if (l <= 0) return done(softens(lam2, lo, hi, tol, l0));
    if (lo === Bmin) return done({ kind: "none", field: Bmin, resolution: 0, startEigenvalue: l0 });
    hi = lo;
    step *= 1.5;
  }
  return done({ kind: "none", field: hi, resolution: 0, startEigenvalue: l0 });
}

function softens(lam2: (B: number) => number | undefined, lo: number, hi: number, tol: number, l0: number): Omit<StripOut, "lastEigenvalue" | "lastField"> {
  const f = (B: number) => {
    const l = lam2(B);
    return l === undefined ? -1 : l;
  };
  const r = brentRoot(f, lo, hi, { xtol: tol });
  return { kind: "softens", field: r.root, resolution: tol, startEigenvalue: l0 };
}
