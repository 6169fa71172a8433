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
 * Search (findAnsatzMinima). Window: 0.3 <= a <= 100 (the tables), Delta / 40 <= w <= 40 Delta.
 *  1. Global scan: at 74 points of ln a (step 0.08) the energy is minimized over w on the whole
 *     window (coarse scan of ln w, step 0.5, then Brent); every discrete minimum of this w-minimized
 *     curve is a candidate, and so is the last interval at a window edge the curve falls towards.
 *  2. Local search from each candidate and from each warm start (a state of a neighbouring field):
 *     Brent over ln a with the inner minimum over w followed from the last one (Newton with the
 *     analytic w-dependence of each term and the table's derivatives in ln tau, Brent as fallback;
 *     the interfacial helicity in closed form, cos psi = clamp(-X / 2Y)), then Newton steps on a
 *     central-difference stencil in (ln a, ln w) (results do not depend on last-ulp differences
 *     between JavaScript engines).
 *  3. Verification of each candidate before it is reported: relative gradient below 1e-6, Hessian in
 *     (ln a, ln w) positive definite at stencils 1e-3 and 1e-2, and at least 0.03 (in ln) away from
 *     every window edge. A point on an edge is never reported; the trend towards an edge is
 *     (status "below-window": the minimum, if any, is smaller than the window, where the continuum
 *     energy tends to the Belavin-Polyakov value 8 pi A t, not a collapse; "expanded": run-away
 *     expansion or a bubble larger than the window).
 * Branches over a field sweep (skyrmionBranches): minima at neighbouring fields are linked by
 * continuation with step control, up and down in field; each end of a branch inside the range is
 * located by halving the continuation step to a stated tolerance. Above D_c the ground state at each
 * field follows from the saturation field B_sat of wall360.ts (Bogdanov and Hubert 1994) and the sign
 * of the skyrmion energy (fieldPhase).
 */
import { ConvergenceError, InputError } from "../errors.js";
import { mu0 } from "../quantity/constants.js";
import { criticalDmi, requirePerpendicular, spiralState, wallWidthParameter, type Film } from "../material/film.js";
import { gaussLegendre, compositeGaussLegendre } from "../numeric/gaussLegendre.js";
import { brentMinimize } from "../numeric/brentMinimize.js";
import { saturationField } from "./wall360.js";
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
  localSums[0]! += ex;
  localSums[1]! += K;
  localSums[2]! += D;
  localSums[3]! += Z;
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
  constructor(
    a: number,
    private readonly d: number,
    private readonly L: number,
  ) {
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
  sliceDer[1]! *= k1;
  sliceDer[2]! *= k2;
  sliceDer[4]! *= k1;
  sliceDer[5]! *= k2;
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
  /** Start radius (m) for a local search besides the global scan (warm start); picks the minimum reported. */
  startRadius?: number;
  /** Start wall width (m) with startRadius (default Delta). */
  startWidth?: number;
}

/** Result of an ansatz skyrmion solve. */
export interface AnsatzSkyrmion {
  /**
   * "ok": a verified local minimum (stationary, Hessian positive definite, inside the window);
   * "below-window": no minimum, the energy decreases towards R < 0.3 w (the continuum minimum, if
   * any, is smaller than the ansatz window; not a collapse of the continuum model);
   * "expanded": the energy decreases towards R > 100 w (run-away expansion, strip or domain);
   * "spiral": |D| > D_c at B <= B_sat and no minimum found (spiral or strips are lower);
   * "none": no verified minimum and no trend towards an edge.
   */
  status: "ok" | "below-window" | "expanded" | "spiral" | "none";
  /** Radius R (m), m_z = 0 at rho = R; NaN unless status is "ok" (check status). */
  radius: number;
  /** Wall width w (m). */
  wallWidth: number;
  /** Helicity psi (rad). */
  helicity: number;
  /** Energy relative to the uniform film (J), with parts. */
  energy: SkyrmionEnergyParts;
  /** Spiral period with anisotropy (m) when |D| > D_c. */
  spiralPeriod?: number;
  /** Number of energy evaluations. */
  evaluations: number;
  notes: string[];
  /** Every verified minimum at this field, sorted by radius. */
  minima: AnsatzState[];
  /** Verification of the reported state. */
  verification?: AnsatzVerification;
  /** E / (8 pi A t) of the reported state. */
  energyOverBelavinPolyakov?: number;
  /** Ground state at this field and the place of the skyrmion. */
  phase: FieldPhase;
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

/** Wang-Yuan-Wang zero-field estimate R = pi D Delta / sqrt(16 A K_eff - pi^2 D^2) (m); From memory (lib/src/walls/README.md). */
export function zeroFieldRadiusEstimate(film: Film): number {
  const K = requirePerpendicular(film, "the zero-field skyrmion radius estimate");
  const D = Math.abs(film.D);
  const q = 16 * film.A * K - Math.PI * Math.PI * D * D;
  if (!(q > 0)) return Infinity;
  return (Math.PI * D * Math.sqrt(film.A / K)) / Math.sqrt(q);
}

// ---- global search, verification, branches ----

/** Step of the global scan in ln(R / w) and of the coarse scan in ln w. */
const SCAN_DU = 0.08;
const SCAN_DW = 0.5;

/** Verification of a reported minimum (finite differences of the ansatz energy in ln(R/w), ln w). */
export interface AnsatzVerification {
  /** |grad E| in (ln(R/w), ln w), relative to the energy scale (sum of the magnitudes of the terms). */
  relativeGradient: number;
  /** Eigenvalues of the Hessian in (ln(R/w), ln w) relative to the energy scale, stencil 1e-3. */
  hessianEigenvalues: [number, number];
  /** The same with a stencil of 1e-2 (a minimum must be positive definite at both scales). */
  hessianEigenvaluesCoarse: [number, number];
  /** Energy scale (J): the sum of the magnitudes of the energy terms. */
  energyScale: number;
  /** Distance (in ln) of R / w and w from the edges of the searched window. */
  marginA: number;
  marginW: number;
  stationary: boolean;
  positiveDefinite: boolean;
  interior: boolean;
}

/** One verified local minimum of the ansatz energy at one field. */
export interface AnsatzState {
  radius: number;
  wallWidth: number;
  helicity: number;
  energy: SkyrmionEnergyParts;
  /** E / (8 pi A t): 1 is the Belavin-Polyakov limit approached as R -> 0 (local model). */
  energyOverBelavinPolyakov: number;
  verification: AnsatzVerification;
}

/** What the global search saw at one field. */
export interface AnsatzSearch {
  /** Verified minima, sorted by radius. */
  minima: AnsatzState[];
  /** The w-minimized energy decreases towards the small end of the window (R / w -> 0.3). */
  decreasesToSmallEdge: boolean;
  /** It decreases towards the large end (R / w -> 100). */
  decreasesToLargeEdge: boolean;
  /** The w-minimized energies (J) at the two ends of the scan (NaN without a scan). */
  smallEdgeEnergy: number;
  largeEdgeEnergy: number;
  /** Candidates that failed verification, in words. */
  rejected: string[];
  evaluations: number;
}

function makeContext(film: Film, B: number, options: AnsatzOptions): Context {
  const Keff = requirePerpendicular(film, "an isolated skyrmion");
  const Delta = wallWidthParameter(film);
  return {
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
}

interface Inner {
  e: number;
  /** ln(w / Delta) of the minimum over w. */
  lw: number;
  /** The minimum over w lies on an edge of the w window (no interior minimum in w). */
  edge: boolean;
}

/** Energy at u = ln(R / w) minimized over the whole w window: coarse scan in ln w, then Brent. */
function innerGlobal(ctx: Context, u: number): Inner {
  const a = Math.exp(u);
  ansatzLocalIntegralsTabulated(a, ctx.I);
  ctx.evals++;
  const { Delta } = ctx;
  const f = (lw: number) => energyAt(ctx, a, Delta * Math.exp(lw));
  if (!ctx.nonlocal) {
    const gam = ctx.Keff * ctx.I.K + ctx.film.Ms * ctx.B * ctx.I.Z;
    const bet = Math.abs(ctx.film.D * ctx.I.D);
    if (gam > 0 && bet > 0) {
      const l = Math.log(bet / (2 * gam) / Delta);
      if (l > W_LO && l < W_HI) return { e: f(l), lw: l, edge: false };
      const lc = Math.min(Math.max(l, W_LO), W_HI);
      return { e: f(lc), lw: lc, edge: true };
    }
    const lc = gam <= 0 ? W_HI : W_LO;
    return { e: f(lc), lw: lc, edge: true };
  }
  const nk = Math.ceil((W_HI - W_LO) / SCAN_DW);
  let best = 0;
  let eBest = Infinity;
  for (let k = 0; k <= nk; k++) {
    const e = f(W_LO + ((W_HI - W_LO) * k) / nk);
    if (e < eBest) {
      eBest = e;
      best = k;
    }
  }
  const lk = (k: number) => W_LO + ((W_HI - W_LO) * k) / nk;
  if (best === 0 || best === nk) return { e: eBest, lw: lk(best), edge: true };
  const r = brentMinimize(f, lk(best - 1), lk(best + 1), 1e-5, 60);
  return { e: r.f, lw: r.x, edge: false };
}

/**
 * Energy at u minimized over w near the last inner minimum ctx.lwLast (Newton, then Brent on
 * +-0.35 in ln w); the whole window (innerGlobal) when that local minimum sits on its bracket edge.
 * Sets ctx.lwLast and ctx.w.
 */
function innerLocal(ctx: Context, u: number): number {
  if (!ctx.nonlocal || !(ctx.lwLast === ctx.lwLast)) {
    const g = innerGlobal(ctx, u);
    ctx.lwLast = g.lw;
    ctx.w = ctx.Delta * Math.exp(g.lw);
    return g.e;
  }
  const a = Math.exp(u);
  ansatzLocalIntegralsTabulated(a, ctx.I);
  ctx.evals++;
  const { Delta } = ctx;
  const f = (lw: number) => energyAt(ctx, a, Delta * Math.exp(lw));
  const lo = Math.max(W_LO, ctx.lwLast - 0.35);
  const hi = Math.min(W_HI, ctx.lwLast + 0.35);
  let lw = innerNewton(ctx, a, ctx.lwLast, lo, hi);
  if (!(lw === lw)) {
    const r = brentMinimize(f, lo, hi, 1e-7, 80);
    lw = r.x;
    if (lw - lo < 1e-3 || hi - lw < 1e-3) {
      const g = innerGlobal(ctx, u);
      lw = g.lw;
    }
  }
  ctx.lwLast = lw;
  ctx.w = Delta * Math.exp(lw);
  return f(lw);
}

/**
 * Newton steps on E(ln a, ln w) with a central-difference gradient and Hessian (stencil 1e-3) from
 * a minimum located by Brent (to about 1e-7): the stencil's stationary point does not depend on
 * Brent's path (so not on last-ulp differences between JavaScript engines). Up to 12 steps, each
 * at most 0.05 long; stops when the Hessian is not positive definite.
 */
function newtonPolish(ctx: Context, u0: number, v0: number): [number, number] {
  const d = 1e-3;
  let u = u0;
  let v = v0;
  const E = new Float64Array(9);
  for (let it = 0; it < 12; it++) {
    stencil(ctx, u, v, d, E);
    const e0 = E[4]!;
    const gu = (E[7]! - E[1]!) / (2 * d);
    const gv = (E[5]! - E[3]!) / (2 * d);
    const huu = (E[7]! - 2 * e0 + E[1]!) / (d * d);
    const hvv = (E[5]! - 2 * e0 + E[3]!) / (d * d);
    const huv = (E[8]! - E[6]! - E[2]! + E[0]!) / (4 * d * d);
    const det = huu * hvv - huv * huv;
    if (!(huu > 0 && det > 0)) break;
    let su = -(hvv * gu - huv * gv) / det;
    let sv = -(huu * gv - huv * gu) / det;
    const len = Math.hypot(su, sv);
    if (len > 0.05) {
      su *= 0.05 / len;
      sv *= 0.05 / len;
    }
    // stay where the tables and the verification stencils reach (a point held here fails the margin)
    const uc = Math.min(Math.max(u + su, U_CLAMP[0]), U_CLAMP[1]);
    const lnD = Math.log(ctx.Delta);
    const vc = Math.min(Math.max(v + sv, lnD + W_LO + 0.011), lnD + W_HI - 0.011);
    const moved = Math.abs(uc - u) + Math.abs(vc - v);
    u = uc;
    v = vc;
    if (moved < 1e-11) break;
  }
  return [u, v];
}

const U_CLAMP: readonly [number, number] = [Math.log(ANSATZ_A_MIN) + 0.011, Math.log(ANSATZ_A_MAX) - 0.011];

/** Energies on the 3 x 3 stencil of step d around (u = ln a, v = ln w), E[3 p + q]. */
function stencil(ctx: Context, u: number, v: number, d: number, E: Float64Array): void {
  for (let p = 0; p < 3; p++) {
    const a = Math.exp(u + (p - 1) * d);
    ansatzLocalIntegralsTabulated(a, ctx.I);
    for (let q = 0; q < 3; q++) E[3 * p + q] = energyAt(ctx, a, Math.exp(v + (q - 1) * d));
  }
}

function sym2Eigen(a: number, b: number, c: number): [number, number] {
  const m = 0.5 * (a + c);
  const r = Math.hypot(0.5 * (a - c), b);
  return [m - r, m + r];
}

/** Relative gradient below which a point counts as stationary. */
export const ANSATZ_STATIONARY_TOLERANCE = 1e-6;

/** Finite-difference verification at (u = ln a, v = ln w); see AnsatzVerification. */
function verify(ctx: Context, u: number, v: number): AnsatzVerification {
  const E = new Float64Array(9);
  const parts: SkyrmionEnergyParts = { exchange: 0, anisotropy: 0, dmi: 0, zeeman: 0, magnetostaticSurface: 0, magnetostaticVolume: 0, total: 0 };
  ansatzLocalIntegralsTabulated(Math.exp(u), ctx.I);
  energyAt(ctx, Math.exp(u), Math.exp(v), parts);
  const scale =
    Math.abs(parts.exchange) +
    Math.abs(parts.anisotropy) +
    Math.abs(parts.dmi) +
    Math.abs(parts.zeeman) +
    Math.abs(parts.magnetostaticSurface) +
    Math.abs(parts.magnetostaticVolume);
  const hess = (d: number): { g: number; ev: [number, number] } => {
    stencil(ctx, u, v, d, E);
    const e0 = E[4]!;
    const gu = (E[7]! - E[1]!) / (2 * d);
    const gv = (E[5]! - E[3]!) / (2 * d);
    const huu = (E[7]! - 2 * e0 + E[1]!) / (d * d);
    const hvv = (E[5]! - 2 * e0 + E[3]!) / (d * d);
    const huv = (E[8]! - E[6]! - E[2]! + E[0]!) / (4 * d * d);
    const ev = sym2Eigen(huu, huv, hvv);
    return { g: Math.hypot(gu, gv) / scale, ev: [ev[0] / scale, ev[1] / scale] };
  };
  const fine = hess(1e-3);
  const coarse = hess(1e-2);
  const lw = v - Math.log(ctx.Delta);
  const marginA = Math.min(u - Math.log(ANSATZ_A_MIN), Math.log(ANSATZ_A_MAX) - u);
  const marginW = Math.min(lw - W_LO, W_HI - lw);
  const stationary = fine.g < ANSATZ_STATIONARY_TOLERANCE;
  const positiveDefinite = fine.ev[0] > 1e-9 && coarse.ev[0] > 1e-9;
  const interior = marginA > 0.03 && marginW > 0.03;
  return {
    relativeGradient: fine.g,
    hessianEigenvalues: fine.ev,
    hessianEigenvaluesCoarse: coarse.ev,
    energyScale: scale,
    marginA,
    marginW,
    stationary,
    positiveDefinite,
    interior,
  };
}

/** The state at (u, v) with its energy parts and verification. */
function stateAt(ctx: Context, u: number, v: number): AnsatzState {
  const verification = verify(ctx, u, v);
  const a = Math.exp(u);
  const w = Math.exp(v);
  ansatzLocalIntegralsTabulated(a, ctx.I);
  const parts: SkyrmionEnergyParts = { exchange: 0, anisotropy: 0, dmi: 0, zeeman: 0, magnetostaticSurface: 0, magnetostaticVolume: 0, total: 0 };
  energyAt(ctx, a, w, parts);
  const film = ctx.film;
  let psi: number;
  if (ctx.fixedPsi !== undefined) psi = ctx.fixedPsi;
  else if (film.dmi === "interfacial") psi = Math.acos(Math.max(-1, Math.min(1, ctx.h)));
  else psi = ctx.h > 0 ? Math.PI / 2 : -Math.PI / 2;
  return {
    radius: a * w,
    wallWidth: w,
    helicity: psi,
    energy: parts,
    energyOverBelavinPolyakov: parts.total / (8 * Math.PI * film.A * film.t),
    verification,
  };
}

type LocalOutcome = { kind: "min"; u: number; lw: number } | { kind: "small-edge" | "large-edge" };

/**
 * Downhill walk in u from u0 (inner w warm-started at lw0) to a bracket, then Brent and the Newton
 * polish; or the window edge the energy runs to.
 */
function localSearch(ctx: Context, u0: number, lw0: number): LocalOutcome {
  const uMin = Math.log(ANSATZ_A_MIN);
  const uMax = Math.log(ANSATZ_A_MAX);
  ctx.lwLast = lw0;
  const E = (uu: number) => innerLocal(ctx, uu);
  const u = Math.min(Math.max(u0, uMin), uMax);
  let step = 0.02;
  const f0 = E(u);
  const lwAt0 = ctx.lwLast;
  const up = Math.min(u + step, uMax);
  const fup = E(up);
  let dir = 1;
  let prev = u;
  let cur = up;
  let fcur = fup;
  if (!(fup < f0)) {
    ctx.lwLast = lwAt0;
    const um = Math.max(u - step, uMin);
    const fum = E(um);
    if (fum >= f0) return refine(ctx, um, up, lwAt0);
    dir = -1;
    cur = um;
    fcur = fum;
  }
  for (let it = 0; it < 400; it++) {
    step = Math.min(step * 1.5, 0.3);
    const next = Math.min(uMax, Math.max(uMin, cur + dir * step));
    const lwCur = ctx.lwLast;
    const fnext = E(next);
    if (fnext >= fcur) return refine(ctx, Math.min(prev, next), Math.max(prev, next), lwCur);
    if (next === uMin) return { kind: "small-edge" };
    if (next === uMax) return { kind: "large-edge" };
    prev = cur;
    cur = next;
    fcur = fnext;
  }
  throw new ConvergenceError("skyrmion ansatz search", "no bracket of a minimum within 400 steps", { B: ctx.B, lnA: cur, evaluations: ctx.evals });
}

/** Brent over u in [lo, hi] (inner w from lw0), then the Newton polish in (ln a, ln w). */
function refine(ctx: Context, lo: number, hi: number, lw0: number): LocalOutcome {
  ctx.lwLast = lw0;
  const r = brentMinimize((uu) => innerLocal(ctx, uu), lo, hi, 1e-7, 100);
  innerLocal(ctx, r.x);
  const [u, v] = newtonPolish(ctx, r.x, Math.log(ctx.w));
  return { kind: "min", u, lw: v - Math.log(ctx.Delta) };
}

/** Warm start for the global search (a state of a neighbouring field). */
export interface AnsatzStart {
  radius: number;
  wallWidth: number;
}

/**
 * All verified local minima of the ansatz energy at field B inside the window 0.3 <= R / w <= 100,
 * Delta / 40 <= w <= 40 Delta: a global scan of the w-minimized energy over ln(R / w) (step 0.08; at
 * each point a coarse scan of ln w, step 0.5, then Brent), a local search from each discrete minimum
 * of the scan and from each warm start, the Newton polish, and the verification of each candidate
 * (stationary, Hessian positive definite at two finite-difference steps, not on a window edge).
 */
export function findAnsatzMinima(film: Film, B: number, options: AnsatzOptions & { starts?: readonly AnsatzStart[]; scan?: boolean } = {}): AnsatzSearch {
  if (!Number.isFinite(B)) throw new InputError("B", B, "a finite field in T");
  const ctx = makeContext(film, B, options);
  const uMin = Math.log(ANSATZ_A_MIN);
  const uMax = Math.log(ANSATZ_A_MAX);
  const candidates: Array<{ u: number; lw: number; probe?: boolean }> = [];
  const rejected: string[] = [];
  let small = false;
  let large = false;
  let eSmall = NaN;
  let eLarge = NaN;
  const outcome = (o: LocalOutcome) => {
    if (o.kind === "min") candidates.push({ u: o.u, lw: o.lw });
    else if (o.kind === "small-edge") small = true;
    else large = true;
  };
  if (options.scan !== false) {
    const n = Math.ceil((uMax - uMin) / SCAN_DU);
    const us: number[] = [];
    const es: number[] = [];
    const lws: number[] = [];
    const edge: boolean[] = [];
    for (let i = 0; i <= n; i++) {
      const u = uMin + ((uMax - uMin) * i) / n;
      const g = innerGlobal(ctx, u);
      us.push(u);
      es.push(g.e);
      lws.push(g.lw);
      edge.push(g.edge);
    }
    small = es[0]! < es[1]!;
    large = es[n]! < es[n - 1]!;
    eSmall = es[0]!;
    eLarge = es[n]!;
    // a minimum between the last two scan points and the window edge is still reportable when it
    // keeps the margin: probe those intervals (a failed probe only confirms the trend)
    if (small) {
      const o = refine(ctx, us[0]!, us[1]!, lws[0]!);
      if (o.kind === "min") candidates.push({ u: o.u, lw: o.lw, probe: true });
    }
    if (large) {
      const o = refine(ctx, us[n - 1]!, us[n]!, lws[n]!);
      if (o.kind === "min") candidates.push({ u: o.u, lw: o.lw, probe: true });
    }
    for (let i = 1; i < n; i++) {
      if (edge[i] || !(es[i]! <= es[i - 1]! && es[i]! <= es[i + 1]!)) continue;
      const o = refine(ctx, us[i - 1]!, us[i + 1]!, lws[i]!);
      if (o.kind === "min" && Math.abs(o.u - us[i]!) > 2 * SCAN_DU) {
        // the polish left the scan bracket: a local search from the scan point decides
        outcome(localSearch(ctx, us[i]!, lws[i]!));
      } else outcome(o);
    }
  }
  for (const s of options.starts ?? []) {
    if (!(s.radius > 0 && s.wallWidth > 0)) continue;
    const lw = Math.min(Math.max(Math.log(s.wallWidth / ctx.Delta), W_LO + 0.01), W_HI - 0.01);
    outcome(localSearch(ctx, Math.log(s.radius / s.wallWidth), lw));
  }
  const minima: AnsatzState[] = [];
  const seen: Array<[number, number]> = [];
  for (const c of candidates) {
    const v = c.lw + Math.log(ctx.Delta);
    if (seen.some(([u, vv]) => Math.abs(u - c.u) < 1e-4 && Math.abs(vv - v) < 1e-4)) continue;
    seen.push([c.u, v]);
    const st = stateAt(ctx, c.u, v);
    const ver = st.verification;
    if (ver.stationary && ver.positiveDefinite && ver.interior) {
      if (!minima.some((m) => Math.abs(Math.log(m.radius / st.radius)) < 1e-4)) minima.push(st);
    } else {
      if (!ver.interior && ver.stationary) {
        if (c.u > 0.5 * (uMin + uMax)) large = true;
        else small = true;
      }
      if (c.probe) continue;
      rejected.push(
        `R = ${fmtLen(st.radius)}, w = ${fmtLen(st.wallWidth)} not reported: ${[
          ver.stationary ? "" : `gradient ${ver.relativeGradient.toExponential(1)} (relative) is not ~0`,
          ver.positiveDefinite ? "" : "the Hessian is not positive definite",
          ver.interior ? "" : "it lies on an edge of the searched window (0.3 <= R/w <= 100, Delta/40 <= w <= 40 Delta)",
        ]
          .filter((x) => x)
          .join("; ")}.`,
      );
    }
  }
  minima.sort((p, q) => p.radius - q.radius);
  return { minima, decreasesToSmallEdge: small, decreasesToLargeEdge: large, smallEdgeEnergy: eSmall, largeEdgeEnergy: eLarge, rejected, evaluations: ctx.evals };
}

function fmtLen(x: number): string {
  if (x >= 1e-6) return `${(x * 1e6).toPrecision(4)} um`;
  return `${(x * 1e9).toPrecision(4)} nm`;
}

/**
 * Ground state and the place of an isolated skyrmion at field B, in words, from the sign of the
 * 360-degree pair energy (B_sat, local model) and of the skyrmion energy (when one is given).
 */
export interface FieldPhase {
  /** Lowest of the states compared: the uniform film, a spiral or strip domains, or a dense skyrmion array. */
  groundState: "uniform" | "spiral-or-strips" | "skyrmion-array" | "reversed-uniform";
  /** Saturation field B_sat (T) when |D| > D_c, else 0. */
  saturationField: number;
  text: string;
}

/** See FieldPhase. `skyrmionEnergy` (J) is the energy of an isolated skyrmion relative to the uniform film. */
export function fieldPhase(film: Film, B: number, skyrmionEnergy?: number): FieldPhase {
  const Dc = criticalDmi(film);
  const Bsat = Math.abs(film.D) > Dc ? saturationField(film) : 0;
  const mT = (x: number) => `${(x * 1e3).toPrecision(4)} mT`;
  if (B < 0) {
    return {
      groundState: "reversed-uniform",
      saturationField: Bsat,
      text: `B = ${mT(B)} < 0 points against the +z background: the reversed uniform state is lower; the +z background and any skyrmion in it are metastable.`,
    };
  }
  if (Math.abs(film.D) > Dc && B <= Bsat) {
    return {
      groundState: "spiral-or-strips",
      saturationField: Bsat,
      text: `|D| > D_c and B <= B_sat = ${mT(Bsat)}: a 360-degree wall has negative energy, so a spiral or strip-domain state is lower than the uniform film; the uniform film and isolated skyrmions in it are at best metastable.`,
    };
  }
  const above = Math.abs(film.D) > Dc ? `|D| > D_c but B > B_sat = ${mT(Bsat)}: ` : "";
  if (skyrmionEnergy !== undefined && skyrmionEnergy < 0) {
    return {
      groundState: "skyrmion-array",
      saturationField: Bsat,
      text: `${above}the isolated skyrmion has negative energy relative to the uniform film, so a dense array of skyrmions (not computed here) is lower than the uniform film; the isolated skyrmion is not an excitation of the ground state.`,
    };
  }
  return {
    groundState: "uniform",
    saturationField: Bsat,
    text: `${above}the uniform film is the ground state${skyrmionEnergy !== undefined ? "; the isolated skyrmion (positive energy) is a metastable excitation of it" : ""}.`,
  };
}

/**
 * Minimize the ansatz energy for a film at field B (T, along +z, the background direction): all
 * verified minima (findAnsatzMinima); the one reported is the one nearest in ln R to
 * options.startRadius when given, else the lowest in energy; the others are in `minima`.
 * Throws InputError for a non-perpendicular film; ConvergenceError if a search fails.
 */
export function solveSkyrmionAnsatz(film: Film, B: number, options: AnsatzOptions & { starts?: readonly AnsatzStart[] } = {}): AnsatzSkyrmion {
  if (!Number.isFinite(B)) throw new InputError("B", B, "a finite field in T");
  requirePerpendicular(film, "an isolated skyrmion");
  const Delta = wallWidthParameter(film);
  const notes: string[] = [];
  const emptyParts = (): SkyrmionEnergyParts => ({ exchange: 0, anisotropy: 0, dmi: 0, zeeman: 0, magnetostaticSurface: 0, magnetostaticVolume: 0, total: 0 });
  const starts: AnsatzStart[] = [...(options.starts ?? [])];
  if (options.startRadius !== undefined && options.startRadius > 0) {
    starts.push({ radius: options.startRadius, wallWidth: options.startWidth ?? Delta });
  }
  const search = findAnsatzMinima(film, B, { ...options, starts });
  const mT = (x: number) => `${(x * 1e3).toPrecision(4)} mT`;
  notes.push(...search.rejected);
  const Dc = criticalDmi(film);
  const spiral = Math.abs(film.D) > Dc;
  let chosen: AnsatzState | undefined;
  if (search.minima.length > 0) {
    if (options.startRadius !== undefined && options.startRadius > 0) {
      const l = Math.log(options.startRadius);
      chosen = search.minima.reduce((p, q) => (Math.abs(Math.log(q.radius) - l) < Math.abs(Math.log(p.radius) - l) ? q : p));
    } else chosen = search.minima.reduce((p, q) => (q.energy.total < p.energy.total ? q : p));
  }
  const phase = fieldPhase(film, B, chosen?.energy.total);
  if (spiral) notes.push(phase.text);
  if (!chosen) {
    const edgeNotes: string[] = [];
    if (search.decreasesToSmallEdge)
      edgeNotes.push(
        "the energy decreases as R shrinks below 0.3 w, the edge of the ansatz window: the continuum minimum (if any) lies at smaller radius, where the energy approaches the Belavin-Polyakov value 8 pi A t; such a radius is below what a continuum model describes for lattice constants of a few tenths of a nm",
      );
    if (search.decreasesToLargeEdge)
      edgeNotes.push(
        "the energy decreases as R grows towards 100 w, the edge of the ansatz window: run-away expansion towards a strip or reversed domain, or a larger bubble than the window holds",
      );
    const toLarge = search.decreasesToLargeEdge && (!search.decreasesToSmallEdge || search.largeEdgeEnergy < search.smallEdgeEnergy);
    const status: AnsatzSkyrmion["status"] = spiral && B <= phase.saturationField ? "spiral" : toLarge ? "expanded" : search.decreasesToSmallEdge ? "below-window" : "none";
    notes.push(`No verified local minimum of the ansatz energy at B = ${mT(B)} inside the window${edgeNotes.length ? ": " + edgeNotes.join("; ") : ""}.`);
    const out: AnsatzSkyrmion = { status, radius: NaN, wallWidth: NaN, helicity: NaN, energy: emptyParts(), evaluations: search.evaluations, notes, minima: [], phase };
    if (spiral) out.spiralPeriod = spiralState(film).period;
    return out;
  }
  if (search.minima.length > 1) {
    notes.push(
      `${search.minima.length} local minima at this field (R = ${search.minima.map((m) => fmtLen(m.radius)).join(", ")}); the one reported is ${options.startRadius ? "the one continued from the start radius" : "the lowest in energy"}.`,
    );
  }
  const okOut: AnsatzSkyrmion = {
    status: "ok",
    radius: chosen.radius,
    wallWidth: chosen.wallWidth,
    helicity: chosen.helicity,
    energy: chosen.energy,
    evaluations: search.evaluations,
    notes,
    minima: search.minima,
    verification: chosen.verification,
    energyOverBelavinPolyakov: chosen.energyOverBelavinPolyakov,
    phase,
  };
  if (spiral) okOut.spiralPeriod = spiralState(film).period;
  return okOut;
}

/** A field sweep of the ansatz skyrmion: one solve per field, warm-started from the last state. */
export interface AnsatzSweep {
  fields: number[];
  results: AnsatzSkyrmion[];
}

/**
 * Solve at each field of `fields` (T) in the order given: every field gets the global search; the
 * state reported is the one continued from the previous field's state (nearest in ln R) when there
 * is one, else the lowest in energy. Points without a minimum carry their status.
 */
export function skyrmionFieldSweep(film: Film, fields: ArrayLike<number>, options: Omit<AnsatzOptions, "startRadius" | "startWidth"> = {}): AnsatzSweep {
  const results: AnsatzSkyrmion[] = [];
  const fs: number[] = [];
  let start: AnsatzStart | undefined;
  for (let i = 0; i < fields.length; i++) {
    const B = fields[i]!;
    if (!Number.isFinite(B)) throw new InputError(`fields[${i}]`, B, "a finite field in T");
    const r = solveSkyrmionAnsatz(film, B, start ? { ...options, startRadius: start.radius, startWidth: start.wallWidth } : options);
    if (r.status === "ok") start = { radius: r.radius, wallWidth: r.wallWidth };
    results.push(r);
    fs.push(B);
  }
  return { fields: fs, results };
}

/** One end of a branch inside the swept range. */
export interface BranchEnd {
  /** Boundary field (T): the middle of the final bracket between a field with and one without the state. */
  field: number;
  /** Half-width of the final bracket (T): the boundary lies within field +- resolution. */
  resolution: number;
  /** Last field (T) at which the state was verified. */
  lastField: number;
  /**
   * "expansion": beyond it the energy decreases towards R / w = 100 (run-away expansion or a bubble
   * larger than the window); "below-window": towards R / w = 0.3 (a smaller continuum minimum or none
   * the ansatz can hold); "fold": the minimum merges with a saddle and disappears (the state goes to
   * another minimum).
   */
  kind: "expansion" | "below-window" | "fold";
}

/** A branch of minima followed through the field sweep by continuation. */
export interface SkyrmionBranch {
  /** 1, 2, ... in order of increasing radius at the branch's middle field. */
  id: number;
  /** "compact skyrmion" (R / w < 4 throughout), "bubble" (R / w > 4 throughout) or "skyrmion-bubble". */
  label: string;
  fields: number[];
  states: AnsatzState[];
  /** End of the branch towards lower field (undefined when it reaches the first field of the sweep). */
  lowerEnd?: BranchEnd;
  /** End towards higher field (undefined when it reaches the last field). */
  upperEnd?: BranchEnd;
}

export interface SkyrmionBranchSweep {
  /** Fields (T), ascending. */
  fields: number[];
  branches: SkyrmionBranch[];
  /** Branch id of each verified minimum at each field (parallel to `fields`). */
  perField: Array<Array<{ branch: number; state: AnsatzState }>>;
  /** Absolute tolerance (T) of the boundary bisections. */
  boundaryTolerance: number;
  evaluations: number;
}

/** Largest |ln R| or |ln w| change accepted as one continuation step. */
const CONTINUATION_JUMP = 0.25;

/**
 * Follow a minimum from field Bfrom to Bto by continuation with step control: each step is accepted
 * when the local search from the current state finds a verified minimum within CONTINUATION_JUMP in
 * ln R and ln w; otherwise the step is halved. When the step falls below `tol` the state ends there.
 */
function followState(
  film: Film,
  opts: AnsatzOptions,
  state: AnsatzState,
  Bfrom: number,
  Bto: number,
  tol: number,
  count: { evals: number },
): { reached: AnsatzState } | { end: BranchEnd } {
  let cur = state;
  let B = Bfrom;
  let step = Bto - Bfrom;
  const full = Math.abs(step);
  for (let guard = 0; guard < 400; guard++) {
    if (B === Bto) return { reached: cur };
    const target = Math.abs(step) >= Math.abs(Bto - B) ? Bto : B + step;
    const sr = findAnsatzMinima(film, target, { ...opts, starts: [cur], scan: false });
    count.evals += sr.evaluations;
    let cand: AnsatzState | undefined;
    for (const m of sr.minima) {
      const dr = Math.abs(Math.log(m.radius / cur.radius));
      const dw = Math.abs(Math.log(m.wallWidth / cur.wallWidth));
      if (dr < CONTINUATION_JUMP && dw < CONTINUATION_JUMP && (!cand || dr < Math.abs(Math.log(cand.radius / cur.radius)))) cand = m;
    }
    if (cand) {
      cur = cand;
      B = target;
      step = Math.sign(step) * Math.min(full, 1.5 * Math.abs(step));
      continue;
    }
    if (Math.abs(step) <= 2 * tol) {
      const kind: BranchEnd["kind"] = sr.decreasesToLargeEdge ? "expansion" : sr.decreasesToSmallEdge ? "below-window" : "fold";
      return { end: { field: B + step / 2, resolution: Math.abs(step) / 2, lastField: B, kind } };
    }
    step /= 2;
  }
  throw new ConvergenceError("skyrmion branch continuation", "no end and no arrival within 400 steps", { Bfrom, Bto, B });
}

/**
 * Follow every verified minimum of the ansatz energy over a field sweep. At each field (ascending) a
 * global search (findAnsatzMinima) lists the minima; each branch alive at the previous field is
 * continued to this one with step control (followState) and matched to the listed minimum it lands
 * on (or adds it); a listed minimum no branch reaches starts a new branch, which is continued
 * downwards the same way until it ends. So every branch is followed both up and down in field, and
 * each end inside the range is located by halving the continuation step down to `boundaryTolerance`
 * (default 1e-6 of the sweep span, at least 1 nT): the ends do not depend on the sweep direction.
 */
export function skyrmionBranches(film: Film, fields: ArrayLike<number>, options: AnsatzOptions & { boundaryTolerance?: number } = {}): SkyrmionBranchSweep {
  const fs = Array.from(fields);
  fs.forEach((B, i) => {
    if (!Number.isFinite(B)) throw new InputError(`fields[${i}]`, B, "a finite field in T");
  });
  fs.sort((x, y) => x - y);
  for (let i = fs.length - 1; i > 0; i--) if (fs[i] === fs[i - 1]) fs.splice(i, 1);
  const n = fs.length;
  if (n < 2) throw new InputError("fields", n, "at least two different fields");
  const span = fs[n - 1]! - fs[0]!;
  const tol = options.boundaryTolerance ?? Math.max(1e-9, 1e-6 * span);
  const count = { evals: 0 };
  const opts: AnsatzOptions = { nonlocal: options.nonlocal, helicity: options.helicity };
  interface Raw {
    idx: number[];
    states: AnsatzState[];
    lowerEnd?: BranchEnd;
    upperEnd?: BranchEnd;
    alive: boolean;
  }
  const raws: Raw[] = [];
  const per: AnsatzState[][] = [];
  const owner: Array<Map<AnsatzState, Raw>> = [];
  const matchOrAdd = (i: number, st: AnsatzState): AnsatzState => {
    const hit = per[i]!.find((m) => Math.abs(Math.log(m.radius / st.radius)) < 1e-3 && Math.abs(Math.log(m.wallWidth / st.wallWidth)) < 1e-3);
    if (hit) return hit;
    per[i]!.push(st);
    per[i]!.sort((p, q) => p.radius - q.radius);
    return st;
  };
  for (let i = 0; i < n; i++) {
    const prevStates = i > 0 ? per[i - 1]! : [];
    const sr = findAnsatzMinima(film, fs[i]!, { ...opts, starts: prevStates });
    count.evals += sr.evaluations;
    per.push([...sr.minima]);
    owner.push(new Map());
    for (const r of raws) {
      if (!r.alive) continue;
      const res = followState(film, opts, r.states[r.states.length - 1]!, fs[i - 1]!, fs[i]!, tol, count);
      if ("end" in res) {
        r.upperEnd = res.end;
        r.alive = false;
        continue;
      }
      const st = matchOrAdd(i, res.reached);
      if (owner[i]!.has(st)) {
        // two branches land on the same minimum: the later one ends (merges) here
        r.upperEnd = { field: fs[i]!, resolution: fs[i]! - fs[i - 1]!, lastField: fs[i - 1]!, kind: "fold" };
        r.alive = false;
        continue;
      }
      owner[i]!.set(st, r);
      r.idx.push(i);
      r.states.push(st);
    }
    for (const st of [...per[i]!]) {
      if (owner[i]!.has(st)) continue;
      const r: Raw = { idx: [i], states: [st], alive: true };
      raws.push(r);
      owner[i]!.set(st, r);
      // continue downwards
      let j = i;
      while (j > 0) {
        const res = followState(film, opts, r.states[0]!, fs[j]!, fs[j - 1]!, tol, count);
        if ("end" in res) {
          r.lowerEnd = res.end;
          break;
        }
        const sj = matchOrAdd(j - 1, res.reached);
        if (owner[j - 1]!.has(sj)) {
          r.lowerEnd = { field: fs[j - 1]!, resolution: fs[j]! - fs[j - 1]!, lastField: fs[j]!, kind: "fold" };
          break;
        }
        owner[j - 1]!.set(sj, r);
        r.idx.unshift(j - 1);
        r.states.unshift(sj);
        j--;
      }
    }
  }
  const mid = (r: Raw) => r.states[Math.floor(r.states.length / 2)]!.radius;
  raws.sort((p, q) => mid(p) - mid(q));
  const branches: SkyrmionBranch[] = raws.map((r, k) => {
    const ratios = r.states.map((s) => s.radius / s.wallWidth);
    const label = Math.max(...ratios) < 4 ? "compact skyrmion" : Math.min(...ratios) > 4 ? "bubble" : "skyrmion-bubble";
    const b: SkyrmionBranch = { id: k + 1, label, fields: r.idx.map((i) => fs[i]!), states: r.states };
    if (r.lowerEnd) b.lowerEnd = r.lowerEnd;
    if (r.upperEnd) b.upperEnd = r.upperEnd;
    return b;
  });
  const idOf = new Map<Raw, number>();
  raws.forEach((r, k) => idOf.set(r, k + 1));
  const perField = per.map((list, i) => list.map((state) => ({ state, branch: idOf.get(owner[i]!.get(state)!)! })));
  return { fields: fs, branches, perField, boundaryTolerance: tol, evaluations: count.evals };
}
