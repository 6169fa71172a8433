/**
 * Hankel transforms of the skyrmion ansatz (see ../skyrmionAnsatz.ts): F0 of 1 - cos theta and G1 of
 * sin theta at a = R / w (length unit w), by the lattice (2D trapezoid) rule for the table, and by
 * direct Gauss-Legendre quadrature as the independent reference.
 */
import { InputError } from "../../errors.js";
import { compositeGaussLegendre } from "../../numeric/gaussLegendre.js";
import { latticeHankel0 } from "../../numeric/latticeHankelTransform.js";
import { nonlocalFromTransforms, radialTransforms, wavenumberNodes, type RadialTransforms } from "../magnetostatics.js";

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
  if (!F0 || !D0) throw new Error("latticeHankel0 returned fewer transforms than the sampler's 2 functions");
  const nq = kn.x.length;
  const f0sq = new Float64Array(nq);
  const g1sq = new Float64Array(nq);
  for (let j = 0; j < nq; j++) {
    const qj = kn.x[j]!;
    f0sq[j] = F0[j]! * F0[j]!;
    const g = D0[j]! / qj;
    g1sq[j] = g * g;
  }
  return { q: kn.x, wq: kn.w, f0sq, g1sq };
}

/** Dimensionless non-local integrals Phi_s (<= 0), Phi_v (>= 0) of the ansatz, computed directly. */
export function ansatzNonlocalDirect(a: number, tau: number): { surface: number; volume: number } {
  return nonlocalFromTransforms(ansatzTransforms(a), tau);
}
