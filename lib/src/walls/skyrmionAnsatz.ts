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
 * Speed. Phi_s, Phi_v and the I_* are universal functions of (a, tau = t / w), shared by all films
 * and fields, kept in a table built lazily where solves go: one row per step 0.1 in ln a, built on
 * first use, holding the row's exact I_* and its Hankel transforms; ln(-Phi_s), ln(Phi_v) are
 * computed from them per column of step 0.25 in ln tau, again on first use, and interpolated by
 * 6-point Lagrange (tensor product in ln a, ln tau; outside the tau range Phi is computed from the
 * row's transforms at the exact tau). A row's transforms come from the lattice (2D trapezoid) rule
 * (ansatzTransformsLattice; spacing set by the profile's analytic strip, about 1 ms per row), not from
 * Bessel-function quadrature: ansatzTransforms / ansatzNonlocalDirect keep the direct Gauss-Legendre
 * route as the independent reference (agreement to about 2e-6, the direct route's own k-grid error).
 * Accuracy of the interpolated energy terms: about 1e-6 relative (Phi) and 1e-7 (I_*), checked in
 * test/lib/walls/magnetostatics.test.ts and skyrmionAnsatz.test.ts.
 * Minimization: for fixed a the energy is minimized over w by Newton's method in ln w with the
 * analytic w-dependence of each term and the table's derivatives in ln tau (Brent's method as the
 * fallback), from the last inner minimum (with the interfacial helicity in closed form: cos psi =
 * clamp(-X / 2Y), X the DMI term, Y the volume-charge term); the outer minimization over ln a walks
 * downhill from a start (a warm start in sweeps) to a bracket, then Brent, then Newton steps on a
 * central-difference stencil in (ln a, ln w) fix the minimum far below the tolerances (results do
 * not depend on last-ulp differences between engines). A run to the table edge a < 0.3 (R < 0.3 w)
 * is reported as collapse, a run to a > 100 as run-away expansion.
 */
import { ConvergenceError, InputError } from "../errors.js";
import { mu0 } from "../quantity/constants.js";
import { criticalDmi, requirePerpendicular, spiralState, wallWidthParameter, type Film } from "../material/film.js";
import { gaussLegendre, compositeGaussLegendre } from "../numeric/gaussLegendre.js";
import { brentMinimize } from "../numeric/brentMinimize.js";
import { nonlocalFromTransforms, radialTransforms, wavenumberNodes, type RadialTransforms } from "./magnetostatics.js";
import { latticeHankel0 } from "../numeric/latticeHankelTransform.js";
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

/** Running sums of ansatzLocalIntegralsInto (module level: no closure per call). */
const localSums = new Float64Array(4);

/** Add the 10-point Gauss-Legendre panel [lo, hi] of the four local integrands at sinh a = sa to localSums. */
function localPanel(sa: number, S: number, lo: number, hi: number): void {
  const gx = GL10.x;
  const gw = GL10.w;
  const c = 0.5 * (lo + hi);
  const h = 0.5 * (hi - lo);
  let ex = 0;
  let K = 0;
  let D = 0;
  let Z = 0;
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
  localSums[0] += ex;
  localSums[1] += K;
  localSums[2] += D;
  localSums[3] += Z;
}

function ansatzLocalIntegralsInto(a: number, out: AnsatzIntegrals): void {
  const sa = Math.sinh(a);
  const S = sa * sa;
  // sin(theta) cos(theta) in I_D decays only as exp(-|x - a|): integrate over a +- 36 (1e-15)
  const xc = a > 38 ? a - 36 : 0;
  const xEnd = a + 36;
  localSums.fill(0);
  let x0 = xc;
  if (xc === 0) {
    const s = Math.min(a, 1);
    let lo = 0;
    for (let b = s / 64; b < s; b *= 2) {
      localPanel(sa, S, lo, b);
      lo = b;
    }
    localPanel(sa, S, lo, s);
    x0 = s;
  }
  // panels of width 0.8 over the wall (a +- 6), widths doubling (up to 8) towards the saturated core
  // and the tail, where the integrands are 2 x, 0, 0, 2 x plus terms decaying like exp(-|x - a|)
  // (10-point Gauss-Legendre on a width-8 panel of exp(-x): relative error below 1e-11)
  const wLo = Math.max(x0, a - 6);
  const wHi = a + 6;
  let hi = wLo;
  let width = 0.8;
  while (hi > x0 + 1e-12) {
    const lo = Math.max(x0, hi - width);
    localPanel(sa, S, lo, hi);
    hi = lo;
    width = Math.min(8, 2 * width);
  }
  // (from a small core, widths double from the core radius: the profile's poles sit at x = +-i a)
  let b = wLo;
  width = Math.min(0.8, Math.max(b, 1e-3));
  while (b < wHi - 1e-12) {
    const h2 = Math.min(wHi, b + width);
    localPanel(sa, S, b, h2);
    b = h2;
    width = Math.min(0.8, 2 * width);
  }
  let lo = wHi;
  width = 0.8;
  while (lo < xEnd - 1e-12) {
    const h2 = Math.min(xEnd, lo + width);
    localPanel(sa, S, lo, h2);
    lo = h2;
    width = Math.min(8, 2 * width);
  }
  out.ex = localSums[0]!;
  out.K = localSums[1]!;
  out.D = localSums[2]!;
  out.Z = localSums[3]! + xc * xc; // saturated core: Int_0^xc 2 x dx
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

/**
 * Half-width of the strip |Im x| < d in which the ansatz profile at a = R / w is analytic: the zeros
 * of sinh^2 x + sinh^2 a lie at x = +-i asin(sinh a) (a < asinh 1) or +-acosh(sinh a) + i pi / 2.
 */
export function ansatzAnalyticStrip(a: number): number {
  const s = Math.sinh(a);
  return s < 1 ? Math.asin(s) : Math.PI / 2;
}

/**
 * The two radial functions of the ansatz for the lattice rule: 1 - cos theta and
 * (rho sin theta)' / rho = (2 s / D) [sinh x / x - (sinh^2 x - S) cosh x / D] (s = sinh a, S = s^2,
 * D = sinh^2 x + S; from sin theta = 2 s sinh x / D, cos theta = (sinh^2 x - S) / D,
 * theta_x = -sin theta coth x). Along y at abscissa x the profile f(sqrt(x^2 + y^2)) is analytic for
 * |Im y| < sqrt(x^2 + d^2) (poles at r = +-i d, a < asinh 1) or |Im y| < pi / 2 (larger a): trapezoid
 * step 2 pi s(x) / (L + 4).
 */
class AnsatzLatticeSampler {
  readonly count = 2;
  private readonly sa: number;
  private readonly S: number;
  constructor(a: number, private readonly d: number, private readonly L: number) {
    this.sa = Math.sinh(a);
    this.S = this.sa * this.sa;
  }
  sample(x: number, out: Float64Array): void {
    let sx: number;
    let cx: number;
    let shc: number;
    if (x < 0.1) {
      sx = Math.sinh(x);
      cx = Math.cosh(x);
      const x2 = x * x;
      shc = 1 + (x2 / 6) * (1 + (x2 / 20) * (1 + x2 / 42));
    } else {
      const ep = Math.exp(x);
      const em = 1 / ep;
      sx = 0.5 * (ep - em);
      cx = 0.5 * (ep + em);
      shc = sx / x;
    }
    const S = this.S;
    const sx2 = sx * sx;
    const D = sx2 + S;
    out[0] = (2 * S) / D;
    out[1] = ((2 * this.sa) / D) * (shc - ((sx2 - S) * cx) / D);
  }
  yStep(x: number): number {
    const d = this.d;
    if (d < Math.PI / 2) return Math.min(1.5, (2 * Math.PI * Math.sqrt(x * x + d * d)) / (this.L + 4));
    return (Math.PI * Math.PI) / (this.L + 4);
  }
}

/** Options of the lattice (fast) transforms of the ansatz. */
export interface LatticeTransformOptions {
  /** ln(1 / tolerance) of the aliasing error (default 20). */
  aliasExponent?: number;
  /** k range in units of the strip: qMax = kExponent / d (default 12). */
  kExponent?: number;
  /** Profile extent beyond a: rMax = a + tail (default 20; sin theta ~ 4 sinh(a) exp(-x) there). */
  tail?: number;
  /** k nodes and weights (default ansatzWavenumberNodes(a, qMax)). */
  wavenumbers?: { x: Float64Array; w: Float64Array };
}

/**
 * Gauss-Legendre k nodes (order 8 panels) for the non-local integrals of the ansatz at a = R / w, up to
 * qMax: narrow panels near k = 0 (the thick-film kernel varies on the scale 1 / tau there), widths
 * growing by 30 percent per panel, capped at 5 / (a + 2) because F0^2 and G1^2 oscillate with period
 * about pi / a (the ring at rho = R).
 */
export function ansatzWavenumberNodes(a: number, qMax: number): { x: Float64Array; w: Float64Array } {
  const cap = 5 / (a + 2);
  const breaks: number[] = [0];
  let b = 0;
  let width = Math.min(0.05, cap);
  while (b < qMax) {
    b = Math.min(qMax, b + width);
    breaks.push(b);
    width = Math.min(cap, width * 1.3);
  }
  return compositeGaussLegendre(breaks, 8);
}

/**
 * Hankel transforms of the ansatz at a = R / w (length unit w) by the lattice rule
 * (numeric/latticeHankelTransform.ts): F0 of 1 - cos theta and G1 = D0 / q, D0 the order-0 transform
 * of div(sin theta rhohat) = (rho sin theta)' / rho (integration by parts: Int sin theta J1(q rho)
 * rho d rho = (1/q) Int (rho sin theta)' J0(q rho) d rho). The spacing follows the analytic strip d of
 * the profile: h = 2 pi d / (kExponent + aliasExponent), so the aliasing error is about
 * exp(-aliasExponent) of F0(0) at every q up to qMax = kExponent / d.
 */
export function ansatzTransformsLattice(a: number, options: LatticeTransformOptions = {}): RadialTransforms {
  if (!(a > 0)) throw new InputError("a", a, "a positive ratio R / w");
  const L = options.aliasExponent ?? 20;
  const Lq = options.kExponent ?? 12;
  const tail = options.tail ?? 20;
  const d = ansatzAnalyticStrip(a);
  const h = (2 * Math.PI * d) / (Lq + L);
  const qMax = Math.max(Lq / d, 6);
  const kn = options.wavenumbers ?? ansatzWavenumberNodes(a, qMax);
  const [F0, D0] = latticeHankel0(new AnsatzLatticeSampler(a, d, L), h, a + tail, kn.x);
  const nq = kn.x.length;
  const f0sq = new Float64Array(nq);
  const g1sq = new Float64Array(nq);
  for (let j = 0; j < nq; j++) {
    const qj = kn.x[j]!;
    f0sq[j] = F0![j]! * F0![j]!;
    const g = D0![j]! / qj;
    g1sq[j] = g * g;
  }
  return { q: kn.x, wq: kn.w, f0sq, g1sq };
}

/** Dimensionless non-local integrals Phi_s (<= 0), Phi_v (>= 0) of the ansatz, computed directly. */
export function ansatzNonlocalDirect(a: number, tau: number): { surface: number; volume: number } {
  return nonlocalFromTransforms(ansatzTransforms(a), tau);
}

// ---- table of Phi_s, Phi_v over (ln a, ln tau) ----
const LNA0 = Math.log(ANSATZ_A_MIN) - 0.3;
const DLNA = 0.1;
const NA = Math.ceil((Math.log(ANSATZ_A_MAX) + 0.3 - LNA0) / DLNA) + 1;
const LNT0 = Math.log(1e-3);
const DLNT = 0.25;
const NT = 47;
/** Table range of tau = t / w (inside it Phi is interpolated; outside it is computed from the row's transforms). */
export const ANSATZ_TABLE_TAU_RANGE: readonly [number, number] = [Math.exp(LNT0 + 2 * DLNT), Math.exp(LNT0 + (NT - 3) * DLNT)];

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
  if (j < 0 || j >= NA) throw new InputError("a", Math.exp(LNA0 + j * DLNA), `a ratio R / w inside the table range ${ANSATZ_A_MIN} .. ${ANSATZ_A_MAX}`);
  let r = rows[j];
  if (r) return r;
  const aRow = Math.exp(LNA0 + j * DLNA);
  const tr = ansatzTransformsLattice(aRow);
  const I = ansatzLocalIntegrals(aRow);
  const lnI = Float64Array.of(Math.log(I.ex), Math.log(I.K), Math.log(-I.D), Math.log(I.Z));
  // tau columns are computed on first use (a solve touches a few around t / w)
  const lnS = new Float64Array(NT).fill(NaN);
  const lnV = new Float64Array(NT).fill(NaN);
  r = { lnS, lnV, tr, lnI };
  rows[j] = r;
  rowsBuilt++;
  return r;
}

/** Make sure tau columns m0 .. m0 + 5 of row r are computed. */
function columns(r: Row, m0: number): void {
  for (let m = m0; m < m0 + 6; m++) {
    if (r.lnS[m] === r.lnS[m]) continue; // computed (not NaN)
    const d = nonlocalFromTransforms(r.tr, Math.exp(LNT0 + m * DLNT));
    r.lnS[m] = Math.log(-d.surface);
    r.lnV[m] = Math.log(d.volume);
  }
}

/** How many rows of the shared magnetostatics table have been built (for diagnostics). */
export function ansatzTableRowsBuilt(): number {
  return rowsBuilt;
}

/**
 * Weights of 6-point Lagrange interpolation on the nodes -2, -1, 0, 1, 2, 3 at s in [0, 1)
 * (error O(h^6); measured below 1e-6 relative for Phi and 1e-7 for the local integrals with the
 * steps used here, test/lib/walls/magnetostatics.test.ts and skyrmionAnsatz.test.ts).
 */
function lagrange6(s: number, out: Float64Array): void {
  const a = s + 2;
  const b = s + 1;
  const c = s;
  const d = s - 1;
  const e = s - 2;
  const f = s - 3;
  out[0] = (-b * c * d * e * f) / 120;
  out[1] = (a * c * d * e * f) / 24;
  out[2] = (-a * b * d * e * f) / 12;
  out[3] = (a * b * c * e * f) / 12;
  out[4] = (-a * b * c * d * f) / 24;
  out[5] = (a * b * c * d * e) / 120;
}

const wa = new Float64Array(6);
const wt = new Float64Array(6);
const nlOut = { surface: 0, volume: 0 };

/**
 * Phi_s(a, tau), Phi_v(a, tau) from the shared table (interpolated; rows built on first use).
 * Returns a shared object (overwritten by the next call).
 */
export function ansatzNonlocal(a: number, tau: number): { surface: number; volume: number } {
  const ua = (Math.log(a) - LNA0) / DLNA;
  const ja = Math.floor(ua);
  lagrange6(ua - ja, wa);
  const ut = (Math.log(tau) - LNT0) / DLNT;
  let s = 0;
  let v = 0;
  if (ut >= 2 && ut < NT - 3) {
    const jt = Math.floor(ut);
    lagrange6(ut - jt, wt);
    for (let p = 0; p < 6; p++) {
      const r = row(ja - 2 + p);
      columns(r, jt - 2);
      const lS = r.lnS;
      const lV = r.lnV;
      let rs = 0;
      let rv = 0;
      for (let q = 0; q < 6; q++) {
        const k = jt - 2 + q;
        rs += wt[q]! * lS[k]!;
        rv += wt[q]! * lV[k]!;
      }
      s += wa[p]! * rs;
      v += wa[p]! * rv;
    }
  } else {
    for (let p = 0; p < 6; p++) {
      const d = nonlocalFromTransforms(row(ja - 2 + p).tr, tau);
      s += wa[p]! * Math.log(-d.surface);
      v += wa[p]! * Math.log(d.volume);
    }
  }
  nlOut.surface = -Math.exp(s);
  nlOut.volume = Math.exp(v);
  return nlOut;
}

const sliceS = new Float64Array(NT);
const sliceV = new Float64Array(NT);
const sliceW = new Float64Array(6);
const sliceRows: Row[] = [];
let sliceA = NaN;
/** tau interval whose monomial coefficients (sliceCoefS, sliceCoefV) are cached; -1: none. */
let sliceCoefJt = -1;
const sliceCoefS = new Float64Array(6);
const sliceCoefV = new Float64Array(6);

/**
 * As ansatzNonlocal, through a cached slice of the table at fixed a (the inner minimization over the
 * wall width keeps a fixed and varies tau only): the a-interpolation is done once per a.
 */
function ansatzNonlocalSlice(a: number, tau: number): { surface: number; volume: number } {
  const ut = (Math.log(tau) - LNT0) / DLNT;
  if (!(ut >= 2 && ut < NT - 3)) return ansatzNonlocal(a, tau);
  const jt = Math.floor(ut);
  ensureSlice(a, jt);
  lagrange6(ut - jt, wt);
  let s = 0;
  let v = 0;
  for (let q = 0; q < 6; q++) {
    s += wt[q]! * sliceS[jt - 2 + q]!;
    v += wt[q]! * sliceV[jt - 2 + q]!;
  }
  nlOut.surface = -Math.exp(s);
  nlOut.volume = Math.exp(v);
  return nlOut;
}

/** Make the slice at a hold the tau entries jt - 2 .. jt + 3 (a-interpolated once per a). */
function ensureSlice(a: number, jt: number): void {
  if (a !== sliceA) {
    const ua = (Math.log(a) - LNA0) / DLNA;
    const ja = Math.floor(ua);
    lagrange6(ua - ja, sliceW);
    for (let p = 0; p < 6; p++) sliceRows[p] = row(ja - 2 + p);
    sliceS.fill(NaN);
    sliceA = a;
    sliceCoefJt = -1;
  }
  if (sliceS[jt - 2]! === sliceS[jt - 2]! && sliceS[jt + 3]! === sliceS[jt + 3]!) return;
  for (let p = 0; p < 6; p++) columns(sliceRows[p]!, jt - 2);
  for (let m = jt - 2; m < jt + 4; m++) {
    if (sliceS[m]! === sliceS[m]!) continue;
    let ss = 0;
    let vv = 0;
    for (let p = 0; p < 6; p++) {
      const r = sliceRows[p]!;
      ss += sliceW[p]! * r.lnS[m]!;
      vv += sliceW[p]! * r.lnV[m]!;
    }
    sliceS[m] = ss;
    sliceV[m] = vv;
  }
}

/** Monomial coefficients of the 6-point interpolant on the nodes -2 .. 3: p(s) = Sum_k c_k s^k, c = M y. */
const POLY6: Float64Array = (() => {
  const M = new Float64Array(36); // M[k * 6 + i]
  for (let i = 0; i < 6; i++) {
    // coefficients of L_i(s) = Prod_{j != i} (s - x_j) / (x_i - x_j), x_j = j - 2
    let c = [1];
    let den = 1;
    for (let j = 0; j < 6; j++) {
      if (j === i) continue;
      const xj = j - 2;
      const next = new Array<number>(c.length + 1).fill(0);
      for (let k = 0; k < c.length; k++) {
        next[k + 1]! += c[k]!;
        next[k]! -= xj * c[k]!;
      }
      c = next;
      den *= i - 2 - xj;
    }
    for (let k = 0; k < 6; k++) M[k * 6 + i] = c[k]! / den;
  }
  return M;
})();

/** Monomial coefficients c (p(s) = Sum_k c_k s^k) of the interpolant through y[base .. base + 5] (nodes -2 .. 3). */
function poly6Coefficients(y: Float64Array, base: number, c: Float64Array): void {
  for (let k = 0; k < 6; k++) {
    let ck = 0;
    for (let i = 0; i < 6; i++) ck += POLY6[k * 6 + i]! * y[base + i]!;
    c[k] = ck;
  }
}

/** p(s), p'(s), p''(s) of p = Sum_k c_k s^k, to out[o .. o + 2]. */
function poly6At(c: Float64Array, s: number, out: Float64Array, o: number): void {
  let p = 0;
  let d1 = 0;
  let d2 = 0;
  for (let k = 5; k >= 0; k--) {
    d2 = d2 * s + 2 * d1;
    d1 = d1 * s + p;
    p = p * s + c[k]!;
  }
  out[o] = p;
  out[o + 1] = d1;
  out[o + 2] = d2;
}

const sliceDer = new Float64Array(6);

/**
 * ln(-Phi_s), ln(Phi_v) and their first two derivatives in ln tau at (a, tau = exp(lnTau)) from
 * the slice at fixed a (the same interpolant as ansatzNonlocalSlice), written to sliceDer as
 * [s, s', s'', v, v', v'']. Returns false outside the tau table.
 */
function ansatzNonlocalSliceDerivatives(a: number, lnTau: number): boolean {
  const ut = (lnTau - LNT0) / DLNT;
  if (!(ut >= 2 && ut < NT - 3)) return false;
  const jt = Math.floor(ut);
  ensureSlice(a, jt);
  if (jt !== sliceCoefJt) {
    poly6Coefficients(sliceS, jt - 2, sliceCoefS);
    poly6Coefficients(sliceV, jt - 2, sliceCoefV);
    sliceCoefJt = jt;
  }
  const st = ut - jt;
  poly6At(sliceCoefS, st, sliceDer, 0);
  poly6At(sliceCoefV, st, sliceDer, 3);
  const k1 = 1 / DLNT;
  const k2 = k1 * k1;
  sliceDer[1] *= k1;
  sliceDer[2] *= k2;
  sliceDer[4] *= k1;
  sliceDer[5] *= k2;
  return true;
}

/**
 * I_ex, I_K, I_D, I_Z at a from the shared table (6-point Lagrange in ln a of the logarithms;
 * relative accuracy about 1e-7, checked against ansatzLocalIntegrals in the tests). Writes into `out`.
 */
export function ansatzLocalIntegralsTabulated(a: number, out: AnsatzIntegrals): void {
  const ua = (Math.log(a) - LNA0) / DLNA;
  const ja = Math.floor(ua);
  lagrange6(ua - ja, wa);
  let e = 0;
  let k = 0;
  let d = 0;
  let z = 0;
  for (let p = 0; p < 6; p++) {
    const l = row(ja - 2 + p).lnI;
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
  /** ln(w / Delta) of the last inner minimum (NaN before the first). */
  lwLast: number;
  /** ln(t / Delta): ln tau = lnTauDelta - ln(w / Delta). */
  lnTauDelta: number;
  h: number;
  vf: number;
}

/** The terms of the ansatz energy (J) at one (a, w); see `ansatzEnergyTerms`. */
export interface AnsatzEnergyTerms {
  exchange: number;
  anisotropy: number;
  zeeman: number;
  /** DMI energy at helicity factor h = 1: the DMI term is dmiScale * h. */
  dmiScale: number;
  /** Surface-charge correction (J). */
  surface: number;
  /** Volume-charge correction at cos psi = 1 (J): the term is volumeScale * vf. */
  volumeScale: number;
  /** Helicity factor of the DMI term (cos psi interfacial, sin psi bulk). */
  h: number;
  /** cos^2 psi, the weight of the volume charges. */
  vf: number;
  total: number;
}

/**
 * The ansatz energy at (a = R/w, w) from the local integrals `I` at a and the dimensionless
 * nonlocal values (`surface`, `volume` of ansatzNonlocal(a, t/w); 0 for local magnetostatics), with
 * the optimal helicity (or `fixedPsi`): for interfacial DMI, cos psi minimizes X c + V c^2 on [-1, 1];
 * for bulk DMI the Bloch sign is chosen (no volume charges). Writes into and returns `out`.
 */
export function ansatzEnergyTerms(
  film: Film,
  B: number,
  Keff: number,
  I: AnsatzIntegrals,
  w: number,
  surface: number,
  volume: number,
  fixedPsi: number | undefined,
  out: AnsatzEnergyTerms,
): AnsatzEnergyTerms {
  const twoPiT = 2 * Math.PI * film.t;
  const pref = mu0 * film.Ms * film.Ms * film.t * w * w;
  const X = twoPiT * film.D * w * I.D;
  const V = pref * volume;
  let h: number;
  let vf: number;
  if (fixedPsi !== undefined) {
    h = film.dmi === "interfacial" ? Math.cos(fixedPsi) : Math.sin(fixedPsi);
    vf = Math.cos(fixedPsi) ** 2;
  } else if (film.dmi === "interfacial") {
    if (V > 0 && Math.abs(X) < 2 * V) h = -X / (2 * V);
    else h = X > 0 ? -1 : 1;
    vf = h * h;
  } else {
    h = X > 0 ? -1 : 1;
    vf = 0;
  }
  out.exchange = twoPiT * film.A * I.ex;
  out.anisotropy = twoPiT * Keff * w * w * I.K;
  out.zeeman = twoPiT * film.Ms * B * w * w * I.Z;
  out.dmiScale = X;
  out.surface = pref * surface;
  out.volumeScale = V;
  out.h = h;
  out.vf = vf;
  out.total = out.exchange + out.anisotropy + out.zeeman + X * h + out.surface + vf * V;
  return out;
}

const terms: AnsatzEnergyTerms = { exchange: 0, anisotropy: 0, zeeman: 0, dmiScale: 0, surface: 0, volumeScale: 0, h: 0, vf: 0, total: 0 };

function energyAt(ctx: Context, a: number, w: number, parts?: SkyrmionEnergyParts): number {
  let surface = 0;
  let volume = 0;
  if (ctx.nonlocal) {
    const nl = ansatzNonlocalSlice(a, ctx.film.t / w);
    surface = nl.surface;
    volume = nl.volume;
  }
  const T = ansatzEnergyTerms(ctx.film, ctx.B, ctx.Keff, ctx.I, w, surface, volume, ctx.fixedPsi, terms);
  ctx.h = T.h;
  ctx.vf = T.vf;
  if (parts) {
    parts.exchange = T.exchange;
    parts.anisotropy = T.anisotropy;
    parts.zeeman = T.zeeman;
    parts.dmi = T.dmiScale * T.h;
    parts.magnetostaticSurface = T.surface;
    parts.magnetostaticVolume = T.vf * T.volumeScale;
    parts.total = T.total;
  }
  return T.total;
}

const der = { e: 0, e1: 0, e2: 0 };

/**
 * Energy at (a, w = Delta exp(lw)) and its first two derivatives in lw (ctx.I must hold the local
 * integrals at a), from the analytic w-dependence of each term and the slice's derivatives in ln tau
 * (tau = t / w). Returns false outside the tau table.
 */
function energyDerivativesInLnW(ctx: Context, a: number, lw: number): boolean {
  const { film, B } = ctx;
  const I = ctx.I;
  const w = ctx.Delta * Math.exp(lw);
  if (!ansatzNonlocalSliceDerivatives(a, ctx.lnTauDelta - lw)) return false;
  const twoPiT = 2 * Math.PI * film.t;
  const ex = twoPiT * film.A * I.ex;
  const Q = twoPiT * (ctx.Keff * I.K + film.Ms * B * I.Z) * w * w; // Q' = 2Q, Q'' = 4Q
  const X = twoPiT * film.D * w * I.D; // X' = X'' = X
  const P = mu0 * film.Ms * film.Ms * film.t * w * w;
  // Phi_s = -exp(s), Phi_v = exp(v) with s, v functions of ln tau = const - lw
  const es = Math.exp(sliceDer[0]!);
  const s1 = sliceDer[1]!;
  const s2 = sliceDer[2]!;
  const ev = Math.exp(sliceDer[3]!);
  const v1 = sliceDer[4]!;
  const v2 = sliceDer[5]!;
  const fs = -es;
  const fs1 = es * s1;
  const fs2 = -es * (s1 * s1 + s2);
  const fv = ev;
  const fv1 = -ev * v1;
  const fv2 = ev * (v1 * v1 + v2);
  const S = P * fs;
  const S1 = P * (2 * fs + fs1);
  const S2 = P * (4 * fs + 4 * fs1 + fs2);
  const V = P * fv;
  const V1 = P * (2 * fv + fv1);
  const V2 = P * (4 * fv + 4 * fv1 + fv2);
  let H: number;
  let H1: number;
  let H2: number;
  if (ctx.fixedPsi !== undefined) {
    const h = film.dmi === "interfacial" ? Math.cos(ctx.fixedPsi) : Math.sin(ctx.fixedPsi);
    const vf = Math.cos(ctx.fixedPsi) ** 2;
    H = X * h + vf * V;
    H1 = X * h + vf * V1;
    H2 = X * h + vf * V2;
  } else if (film.dmi === "interfacial" && V > 0 && Math.abs(X) < 2 * V) {
    // H = -X^2 / (4 V) = -F / 4, ln F = 2 ln|X| - ln V
    const F = (X * X) / V;
    const g1 = 2 - V1 / V;
    const g2 = (V1 / V) ** 2 - V2 / V;
    H = -F / 4;
    H1 = (-F * g1) / 4;
    H2 = (-F * (g1 * g1 + g2)) / 4;
  } else {
    const h = X > 0 ? -1 : 1;
    const vf = film.dmi === "interfacial" ? 1 : 0;
    H = X * h + vf * V;
    H1 = X * h + vf * V1;
    H2 = X * h + vf * V2;
  }
  der.e = ex + Q + S + H;
  der.e1 = 2 * Q + S1 + H1;
  der.e2 = 4 * Q + S2 + H2;
  return true;
}

/**
 * Newton's method for the inner minimum over lw = ln(w / Delta) from l0, inside (lo, hi); NaN when
 * it does not converge there (then Brent takes over).
 */
function innerNewton(ctx: Context, a: number, l0: number, lo: number, hi: number): number {
  let l = l0;
  for (let it = 0; it < 12; it++) {
    if (!energyDerivativesInLnW(ctx, a, l)) return NaN;
    if (!(der.e2 > 0)) return NaN;
    let step = -der.e1 / der.e2;
    if (step > 0.25) step = 0.25;
    else if (step < -0.25) step = -0.25;
    l += step;
    if (!(l > lo && l < hi)) return NaN;
    if (Math.abs(step) < 1e-9) return l;
  }
  return NaN;
}

const W_LO = Math.log(1 / 40);
const W_HI = Math.log(40);

/** Energy at a, minimized over w (sets ctx.I and ctx.w). */
function profiledEnergy(ctx: Context, lna: number): number {
  const a = Math.exp(lna);
  ansatzLocalIntegralsTabulated(a, ctx.I);
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
  // bracket: around the last inner minimum (neighbouring a have similar w), else around the
  // local-model estimate; widened when the minimum lands at an edge
  // (clipped to the window around the estimate, which decides which minimum is meant)
  const l0 = Math.log(w0 / Delta);
  const wlo = Math.max(W_LO, l0 - 0.7);
  const whi = Math.min(W_HI, l0 + 0.7);
  let lw = NaN;
  if (ctx.nonlocal) {
    // Newton with the analytic w-dependence (a few steps), from the last minimum or the estimate
    const start = ctx.lwLast > wlo + 0.01 && ctx.lwLast < whi - 0.01 ? ctx.lwLast : l0;
    lw = innerNewton(ctx, a, start, wlo, whi);
  }
  if (Number.isNaN(lw) && ctx.lwLast > wlo + 0.01 && ctx.lwLast < whi - 0.01) {
    lo = Math.max(wlo, ctx.lwLast - 0.15);
    hi = Math.min(whi, ctx.lwLast + 0.15);
    const r = brentMinimize(f, lo, hi, 1e-6, 60);
    if (r.x - lo >= 1e-3 && hi - r.x >= 1e-3) lw = r.x;
  }
  if (Number.isNaN(lw)) {
    lo = wlo;
    hi = whi;
    const r = brentMinimize(f, lo, hi, 1e-6, 80);
    lw = r.x;
    if (lw - lo < 1e-3 || hi - lw < 1e-3) lw = brentMinimize(f, W_LO, W_HI, 1e-6, 120).x;
  }
  ctx.lwLast = lw;
  ctx.w = Delta * Math.exp(lw);
  return f(lw);
}

/** Wang-Yuan-Wang zero-field estimate R = pi D Delta / sqrt(16 A K_eff - pi^2 D^2) (m); From memory (lib/src/material/README.md). */
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
    lwLast: NaN,
    lnTauDelta: Math.log(film.t / Delta),
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

/**
 * Newton steps on E(ln a, ln w) with a central-difference gradient and Hessian (stencil 1e-3) from
 * the nested-Brent minimum (located to about 1e-6). Brent's path (and so its last digits) can change
 * with last-ulp differences of Math functions between JavaScript engines (the browser recomputes
 * what Node computes); the stencil's stationary point cannot: a 1-ulp change of D moves R(B) by about
 * 1e-11 (measured), against about 3e-7 without these steps. The stencil's own bias, about 2e-7 (third over
 * second derivative times delta^2 / 6), is below the table accuracy. Stops (keeping the last point)
 * when the Hessian is not positive definite or a step exceeds 0.02 (flat landscapes).
 */
function newtonPolish(ctx: Context, u0: number, v0: number): [number, number] {
  const d = 1e-3;
  let u = u0;
  let v = v0;
  const E = new Float64Array(9);
  for (let it = 0; it < 3; it++) {
    for (let p = 0; p < 3; p++) {
      const a = Math.exp(u + (p - 1) * d);
      ansatzLocalIntegralsTabulated(a, ctx.I);
      for (let q = 0; q < 3; q++) E[3 * p + q] = energyAt(ctx, a, Math.exp(v + (q - 1) * d));
    }
    const e0 = E[4]!;
    const gu = (E[7]! - E[1]!) / (2 * d);
    const gv = (E[5]! - E[3]!) / (2 * d);
    const huu = (E[7]! - 2 * e0 + E[1]!) / (d * d);
    const hvv = (E[5]! - 2 * e0 + E[3]!) / (d * d);
    const huv = (E[8]! - E[6]! - E[2]! + E[0]!) / (4 * d * d);
    const det = huu * hvv - huv * huv;
    if (!(huu > 0 && det > 0)) break;
    const su = -(hvv * gu - huv * gv) / det;
    const sv = -(huu * gv - huv * gu) / det;
    if (!(Math.abs(su) < 0.02 && Math.abs(sv) < 0.02)) break;
    u += su;
    v += sv;
    if (Math.abs(su) < 1e-10 && Math.abs(sv) < 1e-10) break;
  }
  return [u, v];
}

function finish(ctx: Context, lo: number, hi: number, notes: string[]): AnsatzSkyrmion {
  // The tables interpolate the local integrals to about 1e-7 and Phi to about 1e-6 (6-point
  // Lagrange): the minimum is located on the tabulated energy (Brent over ln a, then Newton polish).
  const r = brentMinimize((uu) => profiledEnergy(ctx, uu), lo, hi, 1e-6, 100);
  if (!r.converged) {
    throw new ConvergenceError("skyrmion ansatz minimization", "Brent's method did not converge inside its bracket", {
      B: ctx.B,
      lnA: r.x,
      bracket: [lo, hi],
      evaluations: ctx.evals,
    });
  }
  profiledEnergy(ctx, r.x);
  const [lnA, lnW] = newtonPolish(ctx, r.x, Math.log(ctx.w));
  const a = Math.exp(lnA);
  const w = Math.exp(lnW);
  ansatzLocalIntegralsTabulated(a, ctx.I);
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
