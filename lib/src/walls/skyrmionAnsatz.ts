/**
 * Isolated skyrmion with the 360-degree-wall ansatz tan(theta/2) = sinh(R/w) / sinh(rho/w):
 * minimize the full energy (skyrmionEnergy.ts, including non-local thin-film magnetostatics) over the
 * radius R (m_z = 0 at rho = R), the wall width w and, for interfacial DMI, the helicity.
 * Sources: ansatz of H.-B. Braun, PRB 50, 16501 (1994) and F. Buettner, I. Lemesh, G. Beach,
 * Sci. Rep. 8, 4464 (2018); energy functional of S. Rohart, A. Thiaville, PRB 88, 184422 (2013).
 *
 * Scaling (ours). With x = rho / w and a = R / w the profile depends on a only, so
 *   E(a, w, psi) = 2 pi t [ A I_ex(a) + (K_eff I_K(a) + Ms B I_Z(a)) w^2 + D h I_D(a) w ]
 *                  + mu0 Ms^2 t w^2 [ Phi_s(a, t/w) + cos^2(psi) Phi_v(a, t/w) ],
 *   I_ex = Int (theta_x^2 + sin^2 theta / x^2) x dx, I_K = Int sin^2 theta x dx,
 *   I_D = Int (theta_x x + sin theta cos theta) dx (< 0), I_Z = Int (1 - cos theta) x dx,
 * h = cos psi (interfacial) or sin psi (bulk), and Phi_s, Phi_v the dimensionless surface and volume
 * magnetostatic integrals of magnetostatics.ts in the length unit w. Closed forms used for the profile:
 * 1 - cos theta = 2 sinh^2 a / (sinh^2 x + sinh^2 a), sin theta = 2 sinh a sinh x / (sinh^2 x + sinh^2 a),
 * theta_x = -sin theta coth x.
 *
 * Speed: I_* are computed exactly for every a (Gauss-Legendre, no allocation). Phi_s, Phi_v are
 * universal functions of (a, tau = t / w); their Hankel transforms are computed once per row of a
 * table in ln a (step 0.1) on first use, with ln(-Phi_s), ln(Phi_v) tabulated in ln tau (step 0.25)
 * and interpolated by bicubic Catmull-Rom (exact in tau from the stored transforms outside the tau
 * range). The table is shared by all films and fields. For fixed a the energy is minimized over w by
 * Brent's method (with the interfacial helicity in closed form: cos psi = clamp(-X / 2Y), X the DMI
 * term, Y the volume-charge term); the outer minimization over ln a walks downhill from a start
 * (a warm start in sweeps) to a bracket, then Brent. A run to the table edge a < 0.3 (R < 0.3 w) is
 * reported as collapse, a run to a > 100 as run-away expansion.
 */
import { ConvergenceError, InputError } from "../errors.js";
import { mu0 } from "../quantity/constants.js";
import { criticalDmi, requirePerpendicular, spiralState, wallWidthParameter, type Film } from "../material/film.js";
import { gaussLegendre, compositeGaussLegendre } from "../numeric/gaussLegendre.js";
import { brentMinimize } from "../numeric/brentMinimize.js";
import { nonlocalFromTransforms, radialTransforms, wavenumberNodes, type RadialTransforms } from "./magnetostatics.js";
import type { RadialProfile, SkyrmionEnergyParts } from "./skyrmionEnergy.js";

/** Smallest and largest a = R / w covered by the ansatz solver. */
export const ANSATZ_A_MIN = 0.3;
export const ANSATZ_A_MAX = 100;

/** theta(rho) of the ansatz, with derivative, as a RadialProfile (R, w in m). */
export function ansatzProfile(R: number, w: number): RadialProfile {
  if (!(R > 0)) throw new InputError("R", R, "a positive radius in m");
  if (!(w > 0)) throw new InputError("w", w, "a positive wall width in m");
  const a = R / w;
  const sa = Math.sinh(a);
  const S = sa * sa;
  return {
    theta: (rho: number) => 2 * Math.atan2(sa, Math.sinh(rho / w)),
    dtheta: (rho: number) => {
      const x = rho / w;
      const sx = Math.sinh(x);
      return (-2 * sa * Math.cosh(x)) / (sx * sx + S) / w;
    },
    rhoMax: R + 40 * w,
    scale: Math.min(R, w),
    saturatedCore: a > 32 ? (a - 30) * w : 0,
  };
}

/** Dimensionless local integrals of the ansatz at a = R / w (see the file header). */
export interface AnsatzIntegrals {
  ex: number;
  K: number;
  D: number;
  Z: number;
}

const GL10 = gaussLegendre(10);

/** I_ex, I_K, I_D, I_Z of the ansatz at a = R / w (exact quadrature; no allocation besides the result). */
export function ansatzLocalIntegrals(a: number): AnsatzIntegrals {
  const out = { ex: 0, K: 0, D: 0, Z: 0 };
  ansatzLocalIntegralsInto(a, out);
  return out;
}

function ansatzLocalIntegralsInto(a: number, out: AnsatzIntegrals): void {
  const sa = Math.sinh(a);
  const S = sa * sa;
  // sin(theta) cos(theta) in I_D decays only as exp(-|x - a|): integrate over a +- 36 (1e-15)
  const xc = a > 38 ? a - 36 : 0;
  const xEnd = a + 36;
  let ex = 0;
  let K = 0;
  let D = 0;
  let Z = xc * xc; // saturated core: Int_0^xc 2 x dx
  const gx = GL10.x;
  const gw = GL10.w;
  const panel = (lo: number, hi: number) => {
    const c = 0.5 * (lo + hi);
    const h = 0.5 * (hi - lo);
    for (let i = 0; i < 10; i++) {
      const x = c + h * gx[i]!;
      const wt = h * gw[i]!;
      let sx: number;
      let cx: number;
      if (x > 0.1) {
        const ep = Math.exp(x);
        const em = 1 / ep;
        sx = 0.5 * (ep - em);
        cx = 0.5 * (ep + em);
      } else {
        sx = Math.sinh(x);
        cx = Math.cosh(x);
      }
      const d = sx * sx + S;
      const omc = (2 * S) / d;
      const sn = (2 * sa * sx) / d;
      const cs = (sx * sx - S) / d;
      const thx = (-2 * sa * cx) / d;
      ex += wt * (thx * thx * x + (sn * sn) / x);
      K += wt * sn * sn * x;
      D += wt * (thx * x + sn * cs);
      Z += wt * omc * x;
    }
  };
  let x0 = xc;
  if (xc === 0) {
    const s = Math.min(a, 1);
    let lo = 0;
    for (let b = s / 64; b < s; b *= 2) {
      panel(lo, b);
      lo = b;
    }
    panel(lo, s);
    x0 = s;
  }
  const n = Math.max(1, Math.ceil((xEnd - x0) / 0.8));
  const hp = (xEnd - x0) / n;
  for (let p = 0; p < n; p++) panel(x0 + p * hp, x0 + (p + 1) * hp);
  out.ex = ex;
  out.K = K;
  out.D = D;
  out.Z = Z;
}

/** Hankel transforms of the ansatz at a = R / w (length unit w), computed directly. */
export function ansatzTransforms(a: number): RadialTransforms {
  if (!(a > 0)) throw new InputError("a", a, "a positive ratio R / w");
  const sa = Math.sinh(a);
  const S = sa * sa;
  const qMax = Math.max(8, 12 / a);
  const xc = a > 22 ? a - 20 : 0;
  const xFine = a + 8;
  const xEnd = a + 21;
  const hFine = Math.min(0.5, 6 / qMax);
  const breaks: number[] = [];
  let x0 = xc;
  if (xc === 0) {
    const s = Math.min(a, hFine);
    breaks.push(0);
    for (let b = s / 32; b < s; b *= 2) breaks.push(b);
    x0 = s;
  }
  const nf = Math.max(1, Math.ceil((xFine - x0) / hFine));
  for (let p = 0; p <= nf; p++) breaks.push(x0 + ((xFine - x0) * p) / nf);
  const nc = Math.ceil((xEnd - xFine) / 0.5);
  for (let p = 1; p <= nc; p++) breaks.push(xFine + ((xEnd - xFine) * p) / nc);
  const { x, w } = compositeGaussLegendre(breaks, 8);
  const omc = new Float64Array(x.length);
  const sn = new Float64Array(x.length);
  for (let i = 0; i < x.length; i++) {
    const sx = Math.sinh(x[i]!);
    const d = sx * sx + S;
    omc[i] = (2 * S) / d;
    sn[i] = (2 * sa * sx) / d;
  }
  const kn = wavenumberNodes(a + 6, qMax);
  return radialTransforms(x, w, omc, sn, xc, kn.x, kn.w);
}

/** Dimensionless non-local integrals Phi_s (<= 0), Phi_v (>= 0) of the ansatz, computed directly. */
export function ansatzNonlocalDirect(a: number, tau: number): { surface: number; volume: number } {
  return nonlocalFromTransforms(ansatzTransforms(a), tau);
}

// ---- table of Phi_s, Phi_v over (ln a, ln tau) ----
const LNA0 = Math.log(ANSATZ_A_MIN) - 0.2;
const DLNA = 0.1;
const NA = Math.ceil((Math.log(ANSATZ_A_MAX) + 0.2 - LNA0) / DLNA) + 1;
const LNT0 = Math.log(1e-3);
const DLNT = 0.25;
const NT = 47;

interface Row {
  lnS: Float64Array;
  lnV: Float64Array;
  tr: RadialTransforms;
  /** ln I_ex, ln I_K, ln(-I_D), ln I_Z at the row's a (exact). */
  lnI: Float64Array;
}
const rows: Array<Row | undefined> = new Array(NA);
let rowsBuilt = 0;

function row(j: number): Row {
  const jj = Math.min(NA - 1, Math.max(0, j));
  let r = rows[jj];
  if (r) return r;
  const aRow = Math.exp(LNA0 + jj * DLNA);
  const tr = ansatzTransforms(aRow);
  const I = ansatzLocalIntegrals(aRow);
  const lnI = Float64Array.of(Math.log(I.ex), Math.log(I.K), Math.log(-I.D), Math.log(I.Z));
  const lnS = new Float64Array(NT);
  const lnV = new Float64Array(NT);
  for (let m = 0; m < NT; m++) {
    const d = nonlocalFromTransforms(tr, Math.exp(LNT0 + m * DLNT));
    lnS[m] = Math.log(-d.surface);
    lnV[m] = Math.log(d.volume);
  }
  r = { lnS, lnV, tr, lnI };
  rows[jj] = r;
  rowsBuilt++;
  return r;
}

/** How many rows of the shared magnetostatics table have been built (for diagnostics). */
export function ansatzTableRowsBuilt(): number {
  return rowsBuilt;
}

function catmullRom(s: number, out: Float64Array): void {
  const s2 = s * s;
  const s3 = s2 * s;
  out[0] = 0.5 * (-s3 + 2 * s2 - s);
  out[1] = 0.5 * (3 * s3 - 5 * s2 + 2);
  out[2] = 0.5 * (-3 * s3 + 4 * s2 + s);
  out[3] = 0.5 * (s3 - s2);
}

const wa = new Float64Array(4);
const wt = new Float64Array(4);
const nlOut = { surface: 0, volume: 0 };

/**
 * Phi_s(a, tau), Phi_v(a, tau) from the shared table (interpolated; rows built on first use).
 * Returns a shared object (overwritten by the next call).
 */
export function ansatzNonlocal(a: number, tau: number): { surface: number; volume: number } {
  const ua = (Math.log(a) - LNA0) / DLNA;
  const ja = Math.floor(ua);
  catmullRom(ua - ja, wa);
  const ut = (Math.log(tau) - LNT0) / DLNT;
  let s = 0;
  let v = 0;
  if (ut >= 1 && ut < NT - 2) {
    const jt = Math.floor(ut);
    catmullRom(ut - jt, wt);
    for (let p = 0; p < 4; p++) {
      const r = row(ja - 1 + p);
      let rs = 0;
      let rv = 0;
      for (let q = 0; q < 4; q++) {
        rs += wt[q]! * r.lnS[jt - 1 + q]!;
        rv += wt[q]! * r.lnV[jt - 1 + q]!;
      }
      s += wa[p]! * rs;
      v += wa[p]! * rv;
    }
  } else {
    for (let p = 0; p < 4; p++) {
      const d = nonlocalFromTransforms(row(ja - 1 + p).tr, tau);
      s += wa[p]! * Math.log(-d.surface);
      v += wa[p]! * Math.log(d.volume);
    }
  }
  nlOut.surface = -Math.exp(s);
  nlOut.volume = Math.exp(v);
  return nlOut;
}

/**
 * I_ex, I_K, I_D, I_Z at a from the shared table (bicubic in ln a of the logarithms; relative
 * accuracy about 1e-6, checked against ansatzLocalIntegrals in the tests). Writes into `out`.
 */
export function ansatzLocalIntegralsTabulated(a: number, out: AnsatzIntegrals): void {
  const ua = (Math.log(a) - LNA0) / DLNA;
  const ja = Math.floor(ua);
  catmullRom(ua - ja, wa);
  let e = 0;
  let k = 0;
  let d = 0;
  let z = 0;
  for (let p = 0; p < 4; p++) {
    const l = row(ja - 1 + p).lnI;
    const c = wa[p]!;
    e += c * l[0]!;
    k += c * l[1]!;
    d += c * l[2]!;
    z += c * l[3]!;
  }
  out.ex = Math.exp(e);
  out.K = Math.exp(k);
  out.D = -Math.exp(d);
  out.Z = Math.exp(z);
}

// ---- solver ----

/** Options of the ansatz solver. */
export interface AnsatzOptions {
  /** Include non-local magnetostatics (default true); false: local K_eff model only. */
  nonlocal?: boolean;
  /** Fix the helicity psi (rad); default: optimized (interfacial) or DMI-favoured (bulk). */
  helicity?: number;
  /** Start radius (m) for the downhill search (warm start). */
  startRadius?: number;
}

/** Result of an ansatz skyrmion solve. */
export interface AnsatzSkyrmion {
  /**
   * "ok": a metastable skyrmion (local minimum); "collapsed": the minimum runs to R < 0.3 w (no
   * metastable skyrmion, it shrinks and collapses); "expanded": it runs to R > 100 w (run-away
   * expansion towards a stripe or domain); "spiral": |D| >= D_c, a spin spiral is the ground state.
   */
  status: "ok" | "collapsed" | "expanded" | "spiral";
  /** Radius R (m), m_z = 0 at rho = R; NaN unless status is "ok" (check status). */
  radius: number;
  /** Wall width w (m). */
  wallWidth: number;
  /** Helicity psi (rad). */
  helicity: number;
  /** Energy relative to the uniform film (J), with parts. */
  energy: SkyrmionEnergyParts;
  /** Spiral period with anisotropy (m) when status is "spiral". */
  spiralPeriod?: number;
  /** Number of energy evaluations. */
  evaluations: number;
  notes: string[];
}

interface Context {
  film: Film;
  B: number;
  Keff: number;
  Delta: number;
  nonlocal: boolean;
  fixedPsi: number | undefined;
  evals: number;
  I: AnsatzIntegrals;
  // last inner solution
  w: number;
  h: number;
  vf: number;
}

function energyAt(ctx: Context, a: number, w: number, parts?: SkyrmionEnergyParts): number {
  const { film, B } = ctx;
  const I = ctx.I;
  const twoPiT = 2 * Math.PI * film.t;
  const ex = twoPiT * film.A * I.ex;
  const an = twoPiT * ctx.Keff * w * w * I.K;
  const ze = twoPiT * film.Ms * B * w * w * I.Z;
  const X = twoPiT * film.D * w * I.D;
  let S = 0;
  let V = 0;
  if (ctx.nonlocal) {
    const pref = mu0 * film.Ms * film.Ms * film.t * w * w;
    const nl = ansatzNonlocal(a, film.t / w);
    S = pref * nl.surface;
    V = pref * nl.volume;
  }
  let h: number;
  let vf: number;
  if (ctx.fixedPsi !== undefined) {
    h = film.dmi === "interfacial" ? Math.cos(ctx.fixedPsi) : Math.sin(ctx.fixedPsi);
    vf = Math.cos(ctx.fixedPsi) ** 2;
  } else if (film.dmi === "interfacial") {
    // minimize X c + V c^2 over c = cos psi in [-1, 1]
    if (V > 0 && Math.abs(X) < 2 * V) h = -X / (2 * V);
    else h = X > 0 ? -1 : 1;
    vf = h * h;
  } else {
    h = X > 0 ? -1 : 1;
    vf = 0;
  }
  ctx.h = h;
  ctx.vf = vf;
  const dm = X * h;
  const total = ex + an + ze + dm + S + vf * V;
  if (parts) {
    parts.exchange = ex;
    parts.anisotropy = an;
    parts.zeeman = ze;
    parts.dmi = dm;
    parts.magnetostaticSurface = S;
    parts.magnetostaticVolume = vf * V;
    parts.total = total;
  }
  return total;
}

const W_LO = Math.log(1 / 40);
const W_HI = Math.log(40);

/** Energy at a, minimized over w (sets ctx.I and ctx.w). */
function profiledEnergy(ctx: Context, lna: number, exact = false): number {
  const a = Math.exp(lna);
  if (exact) ansatzLocalIntegralsInto(a, ctx.I);
  else ansatzLocalIntegralsTabulated(a, ctx.I);
  ctx.evals++;
  const { Delta } = ctx;
  // local-model start: w minimizing (K I_K + Ms B I_Z) w^2 - |D I_D| w
  const gam = ctx.Keff * ctx.I.K + ctx.film.Ms * ctx.B * ctx.I.Z;
  const bet = Math.abs(ctx.film.D * ctx.I.D);
  let w0 = gam > 0 ? Math.max(bet / (2 * gam), 1e-3 * Delta) : Delta;
  w0 = Math.min(Math.max(w0, Delta * Math.exp(W_LO + 0.5)), Delta * Math.exp(W_HI - 0.5));
  const f = (lw: number) => energyAt(ctx, a, Delta * Math.exp(lw));
  let lo: number;
  let hi: number;
  if (!ctx.nonlocal && gam > 0 && bet > 0) {
    // exact quadratic minimum in w
    const e = f(Math.log(w0 / Delta));
    ctx.w = w0;
    return e;
  }
  const l0 = Math.log(w0 / Delta);
  lo = Math.max(W_LO, l0 - 0.7);
  hi = Math.min(W_HI, l0 + 0.7);
  const r = brentMinimize(f, lo, hi, 1e-6, 80);
  let lw = r.x;
  if (lw - lo < 1e-3 || hi - lw < 1e-3) {
    const r2 = brentMinimize(f, W_LO, W_HI, 1e-6, 120);
    lw = r2.x;
  }
  ctx.w = Delta * Math.exp(lw);
  return f(lw);
}

/** Wang-Yuan-Wang zero-field estimate R = pi D Delta / sqrt(16 A K_eff - pi^2 D^2) (m); From memory (PHYSICS.md). */
export function zeroFieldRadiusEstimate(film: Film): number {
  const K = requirePerpendicular(film, "the zero-field skyrmion radius estimate");
  const D = Math.abs(film.D);
  const q = 16 * film.A * K - Math.PI * Math.PI * D * D;
  if (!(q > 0)) return Infinity;
  return (Math.PI * D * Math.sqrt(film.A / K)) / Math.sqrt(q);
}

/**
 * Minimize the ansatz energy for a film at field B (T, along +z, the background direction).
 * Throws InputError for a non-perpendicular film; returns a status for collapse, expansion and the
 * spiral regime; ConvergenceError if the minimization fails to converge.
 */
export function solveSkyrmionAnsatz(film: Film, B: number, options: AnsatzOptions = {}): AnsatzSkyrmion {
  if (!Number.isFinite(B)) throw new InputError("B", B, "a finite field in T");
  const Keff = requirePerpendicular(film, "an isolated skyrmion");
  const Delta = wallWidthParameter(film);
  const notes: string[] = [];
  const emptyParts = (): SkyrmionEnergyParts => ({ exchange: 0, anisotropy: 0, dmi: 0, zeeman: 0, magnetostaticSurface: 0, magnetostaticVolume: 0, total: 0 });
  const Dc = criticalDmi(film);
  if (Math.abs(film.D) >= Dc) {
    const sp = spiralState(film);
    notes.push(
      `|D| = ${(Math.abs(film.D) * 1e3).toPrecision(4)} mJ/m^2 >= D_c = 4 sqrt(A K_eff) / pi = ${(Dc * 1e3).toPrecision(4)} mJ/m^2: walls have negative energy, a chiral spin spiral is the ground state (period ${Number.isFinite(sp.period) ? (sp.period * 1e9).toPrecision(4) + " nm" : "diverging at D_c"}); no isolated skyrmion.`,
    );
    return { status: "spiral", radius: NaN, wallWidth: NaN, helicity: NaN, energy: emptyParts(), spiralPeriod: sp.period, evaluations: 0, notes };
  }
  const ctx: Context = {
    film,
    B,
    Keff,
    Delta,
    nonlocal: options.nonlocal ?? true,
    fixedPsi: options.helicity,
    evals: 0,
    I: { ex: 0, K: 0, D: 0, Z: 0 },
    w: Delta,
    h: 1,
    vf: 1,
  };
  const uMin = Math.log(ANSATZ_A_MIN);
  const uMax = Math.log(ANSATZ_A_MAX);
  let R0 = options.startRadius;
  if (!(R0 !== undefined && R0 > 0)) {
    const Rw = zeroFieldRadiusEstimate(film);
    R0 = Number.isFinite(Rw) ? Rw : 10 * Delta;
    if (B > 0) R0 = R0 / (1 + (film.Ms * B) / (2 * Keff));
  }
  let u = Math.log(Math.min(Math.max(R0 / Delta, 1.2 * ANSATZ_A_MIN), 0.8 * ANSATZ_A_MAX));
  const E = (uu: number) => profiledEnergy(ctx, uu);
  // downhill walk to a bracket
  let step = 0.05;
  let fu = E(u);
  let up = Math.min(u + step, uMax);
  let fup = E(up);
  let dir = 1;
  let prev = u;
  let fprev = fu;
  let cur = up;
  let fcur = fup;
  if (fup > fu) {
    const um = Math.max(u - step, uMin);
    const fum = E(um);
    if (fum >= fu) {
      return finish(ctx, um, up, notes);
    }
    dir = -1;
    prev = u;
    fprev = fu;
    cur = um;
    fcur = fum;
  }
  for (let it = 0; it < 200; it++) {
    step *= 1.6;
    const next = Math.min(uMax, Math.max(uMin, cur + dir * step));
    const fnext = E(next);
    if (fnext >= fcur) {
      return finish(ctx, Math.min(prev, next), Math.max(prev, next), notes);
    }
    if (next === uMin || next === uMax) {
      const status = next === uMin ? "collapsed" : "expanded";
      energyAt(ctx, Math.exp(next), ctx.w);
      notes.push(
        status === "collapsed"
          ? `No metastable skyrmion at B = ${(B * 1e3).toPrecision(4)} mT: the energy decreases as the radius shrinks below 0.3 w (collapse).`
          : `No metastable skyrmion at B = ${(B * 1e3).toPrecision(4)} mT: the energy decreases as the radius grows beyond 100 w (run-away expansion to a stripe or reversed domain).`,
      );
      return { status, radius: NaN, wallWidth: NaN, helicity: NaN, energy: emptyParts(), evaluations: ctx.evals, notes };
    }
    prev = cur;
    fprev = fcur;
    cur = next;
    fcur = fnext;
  }
  throw new ConvergenceError("skyrmion ansatz search", "no bracket of a minimum within 200 steps", { B, lastLnA: cur, evaluations: ctx.evals });
  void fprev;
}

function finish(ctx: Context, lo: number, hi: number, notes: string[]): AnsatzSkyrmion {
  const r0 = brentMinimize((uu) => profiledEnergy(ctx, uu), lo, hi, 1e-5, 100);
  // polish with the exact local integrals (the table interpolates them to about 1e-6); widen the
  // bracket if the exact minimum lies at its edge (flat energy landscapes)
  let r = r0;
  let polished = false;
  // two parabolic steps on the exact energy (6 evaluations) usually suffice
  {
    const fx = (uu: number) => profiledEnergy(ctx, uu, true);
    let u = r0.x;
    let ok = true;
    for (const dlt of [0.01, 0.002]) {
      const fm = fx(u - dlt);
      const f0 = fx(u);
      const fp = fx(u + dlt);
      const curv = fp - 2 * f0 + fm;
      if (!(curv > 0)) {
        ok = false;
        break;
      }
      const shift = (0.5 * dlt * (fm - fp)) / curv;
      if (Math.abs(shift) > dlt) {
        ok = false;
        break;
      }
      u += shift;
    }
    if (ok) {
      r = { x: u, f: fx(u), evaluations: 7, converged: true };
      polished = true;
    }
  }
  for (const half of polished ? [] : [0.01, 0.05, 0.25]) {
    r = brentMinimize((uu) => profiledEnergy(ctx, uu, true), r0.x - half, r0.x + half, 1e-7, 80);
    if (r.converged && r.x - (r0.x - half) > 1e-6 && r0.x + half - r.x > 1e-6) {
      polished = true;
      break;
    }
  }
  if (!polished) {
    throw new ConvergenceError("skyrmion ansatz minimization", "Brent's method did not find the minimum inside its bracket", {
      B: ctx.B,
      lnA: r.x,
      tabulatedLnA: r0.x,
      evaluations: ctx.evals,
    });
  }
  profiledEnergy(ctx, r.x, true);
  const a = Math.exp(r.x);
  const w = ctx.w;
  const parts: SkyrmionEnergyParts = { exchange: 0, anisotropy: 0, dmi: 0, zeeman: 0, magnetostaticSurface: 0, magnetostaticVolume: 0, total: 0 };
  energyAt(ctx, a, w, parts);
  const film = ctx.film;
  let psi: number;
  if (film.dmi === "interfacial") psi = Math.acos(Math.max(-1, Math.min(1, ctx.h)));
  else psi = ctx.h > 0 ? Math.PI / 2 : -Math.PI / 2;
  if (ctx.fixedPsi !== undefined) psi = ctx.fixedPsi;
  if (w / ctx.Delta < Math.exp(W_LO + 0.01) || w / ctx.Delta > Math.exp(W_HI - 0.01)) {
    notes.push("The wall width is at the edge of the searched range (Delta / 40 ... 40 Delta): treat the result with caution.");
  }
  return { status: "ok", radius: a * w, wallWidth: w, helicity: psi, energy: parts, evaluations: ctx.evals, notes };
}

/** A field sweep of the ansatz skyrmion with continuation (warm starts). */
export interface AnsatzSweep {
  fields: number[];
  results: AnsatzSkyrmion[];
}

/**
 * Solve at each field of `fields` (T) in the order given, warm-starting from the last metastable
 * solution. Points without a metastable skyrmion carry their status.
 */
export function skyrmionFieldSweep(film: Film, fields: ArrayLike<number>, options: Omit<AnsatzOptions, "startRadius"> = {}): AnsatzSweep {
  const results: AnsatzSkyrmion[] = [];
  const fs: number[] = [];
  let start: number | undefined;
  for (let i = 0; i < fields.length; i++) {
    const B = fields[i]!;
    if (!Number.isFinite(B)) throw new InputError(`fields[${i}]`, B, "a finite field in T");
    const r = solveSkyrmionAnsatz(film, B, start !== undefined ? { ...options, startRadius: start } : options);
    if (r.status === "ok") start = r.radius;
    results.push(r);
    fs.push(B);
  }
  return { fields: fs, results };
}
