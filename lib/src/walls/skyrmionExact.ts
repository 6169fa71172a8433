/**
 * Exact radial profile of an isolated skyrmion (local magnetostatics through K_eff), from the
 * Euler-Lagrange equation of the energy functional of skyrmionEnergy.ts.
 *
 * In units of Delta = sqrt(A / K_eff) (x = rho / Delta) the functional per 2 pi t A is
 *   e = theta'^2 + sin^2 theta / x^2 + sin^2 theta + d (theta' + sin theta cos theta / x) + 2 b (1 - cos theta),
 *   d = |D| / sqrt(A K_eff) (helicity chosen so that D h = |D|), b = Ms B / (2 K_eff),
 * and its Euler-Lagrange equation (derived here) is
 *   theta'' + theta' / x - sin theta cos theta / x^2 - sin theta cos theta + d sin^2 theta / x - b sin theta = 0,
 * with theta(0) = pi, theta(L) = 0 (L = R + 25 Delta or more; the tail decays as exp(-sqrt(1 + b) x)).
 * Source: S. Rohart, A. Thiaville, PRB 88, 184422 (2013) (same equation, their sign conventions).
 *
 * Method: relaxation. Second-order central differences on a uniform grid, Newton's method with
 * the tridiagonal Jacobian (Thomas algorithm) and backtracking on the residual norm, started from
 * the ansatz minimum of the same local model. Solved on grids h and h/2; the radius (theta = pi/2,
 * cubic interpolation) and the energy are Richardson-extrapolated (error O(h^4)). Checked against
 * scipy.integrate.solve_bvp in test/lib/walls/skyrmionExact.test.ts.
 */
import { ConvergenceError, InputError } from "../errors.js";
import { criticalDmi, requirePerpendicular, spiralState, wallWidthParameter, type Film } from "../material/film.js";
import { solveSkyrmionAnsatz } from "./skyrmionAnsatz.js";
import { saturationField } from "./wall360.js";
import { dmiHelicity, type RadialProfile } from "./skyrmionEnergy.js";

/** Result of the exact profile solve. */
export interface ExactSkyrmion {
  /** "ok", or "spiral" when |D| > D_c and B <= B_sat (spiral or strips lower; spiralPeriod given). */
  status: "ok" | "spiral";
  /** Radius (m) where m_z = 0 (theta = pi/2), Richardson-extrapolated. */
  radius: number;
  /** Energy relative to the uniform film (J), local magnetostatics, Richardson-extrapolated. */
  energy: number;
  /** Helicity psi (rad) selected by the sign of D. */
  helicity: number;
  /** Grid rho (m) and theta (rad) of the finer solution. */
  rho: Float64Array;
  theta: Float64Array;
  /** Profile as a function (cubic Hermite interpolation of the finer grid). */
  profile: RadialProfile;
  /** Parameters of the dimensionless equation. */
  d: number;
  b: number;
  /** Domain length in units of Delta and the finer grid step. */
  length: number;
  step: number;
  newtonIterations: number;
  spiralPeriod?: number;
  notes: string[];
}

/** Options for the exact solver. */
export interface ExactOptions {
  /** Grid step of the coarse grid in units of Delta (default 0.02; the fine grid has half). */
  step?: number;
  /** Domain length in units of Delta (default: ansatz radius / Delta + 25, at least 30). */
  length?: number;
}

interface GridSolution {
  theta: Float64Array;
  iterations: number;
  residual: number;
}

/** Solve the dimensionless equation on x_i = i h, i = 0..n, theta_0 = pi, theta_n = 0, from `guess` (length n + 1). */
function relax(d: number, b: number, h: number, n: number, guess: Float64Array): GridSolution {
  const th = Float64Array.from(guess);
  const m = n - 1;
  const F = new Float64Array(m);
  const lo = new Float64Array(m);
  const di = new Float64Array(m);
  const up = new Float64Array(m);
  const cp = new Float64Array(m);
  const dp = new Float64Array(m);
  const trial = new Float64Array(n + 1);
  const ih2 = 1 / (h * h);
  const residual = (t: Float64Array, out: Float64Array | null): number => {
    let s = 0;
    for (let i = 1; i < n; i++) {
      const x = i * h;
      const sn = Math.sin(t[i]!);
      const cs = Math.cos(t[i]!);
      const r = (t[i + 1]! - 2 * t[i]! + t[i - 1]!) * ih2 + (t[i + 1]! - t[i - 1]!) / (2 * h * x) - (sn * cs) / (x * x) - sn * cs + (d * sn * sn) / x - b * sn;
      if (out) out[i - 1] = r;
      s += r * r;
    }
    return Math.sqrt(s / m);
  };
  let res = residual(th, F);
  let it = 0;
  for (; it < 60 && res > 1e-11; it++) {
    for (let i = 1; i < n; i++) {
      const x = i * h;
      const t = th[i]!;
      const c2 = Math.cos(2 * t);
      const s2 = Math.sin(2 * t);
      di[i - 1] = -2 * ih2 - c2 / (x * x) - c2 + (d * s2) / x - b * Math.cos(t);
      lo[i - 1] = ih2 - 1 / (2 * h * x);
      up[i - 1] = ih2 + 1 / (2 * h * x);
    }
    // Thomas algorithm for J delta = -F
    cp[0] = up[0]! / di[0]!;
    dp[0] = -F[0]! / di[0]!;
    for (let i = 1; i < m; i++) {
      const den = di[i]! - lo[i]! * cp[i - 1]!;
      cp[i] = up[i]! / den;
      dp[i] = (-F[i]! - lo[i]! * dp[i - 1]!) / den;
    }
    for (let i = m - 2; i >= 0; i--) dp[i] = dp[i]! - cp[i]! * dp[i + 1]!;
    // backtracking on the residual
    let lam = 1;
    let accepted = false;
    for (let k = 0; k < 30; k++) {
      trial[0] = th[0]!;
      trial[n] = th[n]!;
      for (let i = 1; i < n; i++) trial[i] = th[i]! + lam * dp[i - 1]!;
      const r = residual(trial, null);
      if (r < res * (1 - 1e-4 * lam) || r < 1e-11) {
        th.set(trial);
        res = residual(th, F);
        accepted = true;
        break;
      }
      lam *= 0.5;
    }
    if (!accepted) break;
  }
  return { theta: th, iterations: it, residual: res };
}

/** Radius (in grid units x) where theta = pi/2, by cubic interpolation of four neighbours. */
function crossing(th: Float64Array, h: number): number {
  const half = Math.PI / 2;
  let i = 0;
  while (i < th.length - 1 && !(th[i]! >= half && th[i + 1]! < half)) i++;
  if (i >= th.length - 1) return NaN;
  const i0 = Math.max(0, Math.min(th.length - 4, i - 1));
  const xs = [i0 * h, (i0 + 1) * h, (i0 + 2) * h, (i0 + 3) * h];
  const ys = [th[i0]!, th[i0 + 1]!, th[i0 + 2]!, th[i0 + 3]!];
  const p = (x: number) => {
    let s = 0;
    for (let j = 0; j < 4; j++) {
      let l = 1;
      for (let k = 0; k < 4; k++) if (k !== j) l *= (x - xs[k]!) / (xs[j]! - xs[k]!);
      s += ys[j]! * l;
    }
    return s - half;
  };
  let a = i * h;
  let c = (i + 1) * h;
  for (let k = 0; k < 80; k++) {
    const mid = 0.5 * (a + c);
    if (p(mid) > 0) a = mid;
    else c = mid;
  }
  return 0.5 * (a + c);
}

/** Dimensionless energy Int e x dx (Simpson on the grid, central-difference derivatives). */
function gridEnergy(th: Float64Array, h: number, d: number, b: number): number {
  const n = th.length - 1;
  const e = (i: number) => {
    if (i === 0) return 0; // integrand x e(x) -> 0 at the axis (theta' finite, sin^2/x -> 0)
    const x = i * h;
    const dt = i === n ? (th[n]! - th[n - 1]!) / h : (th[i + 1]! - th[i - 1]!) / (2 * h);
    const s = Math.sin(th[i]!);
    const c = Math.cos(th[i]!);
    return x * (dt * dt + (s * s) / (x * x) + s * s + d * (dt + (s * c) / x) + 2 * b * (1 - c));
  };
  let sum = 0;
  const nn = n % 2 === 0 ? n : n - 1;
  for (let i = 0; i <= nn; i++) sum += e(i) * (i === 0 || i === nn ? 1 : i % 2 === 1 ? 4 : 2);
  return (sum * h) / 3;
}

/**
 * Exact skyrmion profile for a film at field B (T): radius, energy (local model) and the profile.
 * InputError for a non-perpendicular film; status "spiral" for |D| > D_c at B <= B_sat (saturationField); ConvergenceError if the
 * Newton relaxation fails or the solution collapses (no metastable skyrmion at this field).
 */
export function solveSkyrmionExact(film: Film, B: number, options: ExactOptions = {}): ExactSkyrmion {
  if (!Number.isFinite(B)) throw new InputError("B", B, "a finite field in T");
  const K = requirePerpendicular(film, "the exact skyrmion profile");
  const Delta = wallWidthParameter(film);
  const helicity = dmiHelicity(film);
  const d = Math.abs(film.D) / Math.sqrt(film.A * K);
  const b = (film.Ms * B) / (2 * K);
  const notes: string[] = [];
  const Dc = criticalDmi(film);
  const Bsat = Math.abs(film.D) > Dc ? saturationField(film) : 0;
  if (Math.abs(film.D) > Dc && B > Bsat) {
    notes.push(
      `|D| > D_c = ${(Dc * 1e3).toPrecision(4)} mJ/m^2 but B > B_sat = ${(Bsat * 1e3).toPrecision(4)} mT: the uniform film is lower than spiral or strips; the isolated skyrmion is an excitation of it when its energy is positive.`,
    );
  }
  if (Math.abs(film.D) > Dc && !(B > Bsat)) {
    const sp = spiralState(film);
    notes.push(
      `|D| > D_c = ${(Dc * 1e3).toPrecision(4)} mJ/m^2 and B <= B_sat = ${(Bsat * 1e3).toPrecision(4)} mT: a 360-degree wall has negative energy, a spiral or strip state is the ground state; no isolated skyrmion is solved for.`,
    );
    const empty = new Float64Array(0);
    return {
      status: "spiral",
      radius: NaN,
      energy: NaN,
      helicity,
      rho: empty,
      theta: empty,
      profile: { theta: () => 0, dtheta: () => 0, rhoMax: 1, scale: 0.5 },
      d,
      b,
      length: 0,
      step: 0,
      newtonIterations: 0,
      spiralPeriod: sp.period,
      notes,
    };
  }
  if (!(b > -1)) throw new InputError("B", B, `a field above -2 K_eff / Ms = ${((-2 * K) / film.Ms).toPrecision(4)} T (the background must be stable)`);
  const step = options.step ?? 0.02;
  if (!(step > 0 && step <= 0.2)) throw new InputError("step", step, "a grid step between 0 and 0.2 (units of Delta)");
  const guessSk = solveSkyrmionAnsatz(film, B, { nonlocal: false });
  if (guessSk.status !== "ok") {
    throw new ConvergenceError("exact skyrmion profile", `no starting profile: the ansatz of the local model reports '${guessSk.status}'`, {
      B,
      ansatzStatus: guessSk.status,
      notes: guessSk.notes.join(" "),
    });
  }
  const aR = guessSk.radius / Delta;
  const aw = guessSk.wallWidth / Delta;
  const L = options.length ?? Math.max(30, aR + 25);
  const solveOn = (h: number, prev?: { th: Float64Array; h: number }) => {
    const n = Math.round(L / h);
    const hh = L / n;
    const guess = new Float64Array(n + 1);
    for (let i = 0; i <= n; i++) {
      const x = i * hh;
      if (prev) {
        // linear interpolation of the coarse solution
        const u = x / prev.h;
        const j = Math.min(prev.th.length - 2, Math.floor(u));
        const f = u - j;
        guess[i] = prev.th[j]! * (1 - f) + prev.th[j + 1]! * f;
      } else {
        guess[i] = 2 * Math.atan2(Math.sinh(aR / aw), Math.sinh(x / aw));
      }
    }
    guess[0] = Math.PI;
    guess[n] = 0;
    const sol = relax(d, b, hh, n, guess);
    return { ...sol, h: hh, n };
  };
  const coarse = solveOn(step);
  const fine = solveOn(step / 2, { th: coarse.theta, h: coarse.h });
  for (const s of [coarse, fine]) {
    if (!(s.residual < 1e-8)) {
      throw new ConvergenceError("exact skyrmion profile (Newton relaxation)", "the residual did not fall below 1e-8", {
        B,
        residual: s.residual,
        iterations: s.iterations,
        gridStep: s.h,
      });
    }
  }
  const r1 = crossing(coarse.theta, coarse.h);
  const r2 = crossing(fine.theta, fine.h);
  if (!Number.isFinite(r1) || !Number.isFinite(r2) || r2 < 10 * fine.h) {
    throw new ConvergenceError("exact skyrmion profile", "the profile collapsed (no metastable skyrmion at this field)", {
      B,
      radiusCoarse: r1 * Delta,
      radiusFine: r2 * Delta,
    });
  }
  const xR = (4 * r2 - r1) / 3;
  const e1 = gridEnergy(coarse.theta, coarse.h, d, b);
  const e2 = gridEnergy(fine.theta, fine.h, d, b);
  const eDim = (4 * e2 - e1) / 3;
  const energy = 2 * Math.PI * film.t * film.A * eDim;
  const n = fine.n;
  const hF = fine.h;
  const th = fine.theta;
  const rho = new Float64Array(n + 1);
  for (let i = 0; i <= n; i++) rho[i] = i * hF * Delta;
  const dth = new Float64Array(n + 1);
  for (let i = 0; i <= n; i++) {
    dth[i] = i === 0 ? (-3 * th[0]! + 4 * th[1]! - th[2]!) / (2 * hF) : i === n ? (3 * th[n]! - 4 * th[n - 1]! + th[n - 2]!) / (2 * hF) : (th[i + 1]! - th[i - 1]!) / (2 * hF);
  }
  const hermite = (rhoQ: number, deriv: boolean) => {
    const x = rhoQ / Delta;
    if (x >= L) return 0;
    const u = x / hF;
    const j = Math.min(n - 1, Math.max(0, Math.floor(u)));
    const s = u - j;
    const y0 = th[j]!;
    const y1 = th[j + 1]!;
    const m0 = dth[j]! * hF;
    const m1 = dth[j + 1]! * hF;
    if (!deriv) {
      const s2 = s * s;
      const s3 = s2 * s;
      return (2 * s3 - 3 * s2 + 1) * y0 + (s3 - 2 * s2 + s) * m0 + (-2 * s3 + 3 * s2) * y1 + (s3 - s2) * m1;
    }
    const s2 = s * s;
    return ((6 * s2 - 6 * s) * y0 + (3 * s2 - 4 * s + 1) * m0 + (-6 * s2 + 6 * s) * y1 + (3 * s2 - 2 * s) * m1) / (hF * Delta);
  };
  const profile: RadialProfile = {
    theta: (r) => hermite(r, false),
    dtheta: (r) => hermite(r, true),
    rhoMax: L * Delta,
    scale: Math.min(Delta, Math.max(xR * Delta, 4 * hF * Delta)),
  };
  return {
    status: "ok",
    radius: xR * Delta,
    energy,
    helicity,
    rho,
    theta: th,
    profile,
    d,
    b,
    length: L,
    step: hF,
    newtonIterations: coarse.iterations + fine.iterations,
    notes,
  };
}
