/**
 * Thin-film magnetostatics of axisymmetric textures beyond the local shape anisotropy, by Hankel
 * transforms (SI units).
 *
 * Model: film of thickness t, magnetization m(rho) uniform through the thickness, unit length,
 * m = (sin(theta) cos(phi + psi), sin(theta) sin(phi + psi), cos(theta)) with theta(rho) the polar
 * angle (background theta = 0, +z), phi the azimuth of the position and psi the helicity
 * (psi = 0, pi: Neel; +-pi/2: Bloch).
 *
 * Derivation (ours; structure as in F. Buettner, I. Lemesh, G. Beach, Sci. Rep. 8, 4464 (2018)).
 * Magnetic charges: surface sigma = +-Ms m_z on the top/bottom faces, volume rho_v = -Ms div m
 * (uniform in z). With 2D Fourier transforms X(k) = Integral X(r) exp(-i k.r) d^2r, solving Laplace's
 * equation for the potential of each charge sheet and averaging over the thickness gives
 *   E_d = (mu0 Ms^2 t / 2) Integral d^2k/(2 pi)^2 [ |m_z(k)|^2 g(kt) + |khat . m_par(k)|^2 (1 - g(kt)) ],
 *   g(x) = (1 - exp(-x)) / x,
 * (surface-volume cross terms vanish: the surface pair is odd about the mid-plane, the volume charge
 * even). The kernel g is checked in real space in test/lib/walls/magnetostatics.test.ts: its 2D
 * inverse transform is the thickness-averaged Coulomb kernel (1 / 2 pi t) (1/s - 1/sqrt(s^2 + t^2)).
 * The local approximation replaces g by 1 for the surface term and by 0 for the volume term: it
 * gives (mu0 Ms^2 / 2) t Integral m_z^2 d^2r, which is the -mu0 Ms^2/2 sin^2(theta) inside
 * K_eff = Ku - mu0 Ms^2 / 2 (plus a constant). The non-local correction is therefore
 *   E_nl = (mu0 Ms^2 t / 2) Integral d^2k/(2 pi)^2 [ |m_z(k)|^2 (g - 1) + |khat . m_par(k)|^2 (1 - g) ].
 * Since g(0) = 1, the uniform background (a delta at k = 0 in m_z) drops out: m_z may be replaced by
 * -(1 - cos theta), so a uniform film has E_nl = 0 exactly. For axisymmetric textures:
 *   m_z:  Integral (1 - cos theta) exp(-i k.r) d^2r = 2 pi F0(k),  F0(k) = Int_0^inf (1 - cos theta) J0(k rho) rho d rho;
 *   m_par = sin(theta) [cos(psi) rhohat + sin(psi) phihat]; the azimuthal part is divergence-free
 *   (khat . phihat-part = 0); with Int_0^2pi cos(phi) exp(-i x cos(phi - phi_k)) d phi = -2 pi i J1(x) cos(phi_k):
 *   khat . m_par(k) = -2 pi i cos(psi) G1(k),  G1(k) = Int_0^inf sin(theta) J1(k rho) rho d rho.
 * With d^2k/(2 pi)^2 = k dk / (2 pi) after the angular integral:
 *   E_surface = pi mu0 Ms^2 t Int_0^inf k F0(k)^2 (g(kt) - 1) dk            (<= 0)
 *   E_volume  = pi mu0 Ms^2 t cos^2(psi) Int_0^inf k G1(k)^2 (1 - g(kt)) dk  (>= 0, Neel only)
 * In a length unit L (x = rho / L, q = k L, tau = t / L): E = pi mu0 Ms^2 t L^2 Int q Fhat(q)^2 h(q tau) dq.
 * Verified against a brute-force FFT of the same texture on a grid (walls/demagFft.ts) in
 * test/lib/walls/magnetostatics.test.ts.
 *
 * Numerics: composite Gauss-Legendre in rho and k; the saturated core (1 - cos theta = 2 to 1e-12)
 * is integrated analytically, Int_0^c 2 J0(k rho) rho d rho = 2 c J1(k c) / k. For the 360-degree
 * wall ansatz, skyrmionAnsatz.ts uses dimensionless tables built from the same transforms, computed
 * there by the lattice (2D trapezoid) rule of numeric/latticeHankelTransform.ts and checked against
 * this Gauss-Legendre / Bessel route in test/lib/walls/magnetostatics.test.ts.
 */
import { InputError } from "../errors.js";
import { mu0 } from "../quantity/constants.js";
import { besselJ01 } from "../numeric/bessel.js";
import { compositeGaussLegendre } from "../numeric/gaussLegendre.js";

/** Thin-film kernel g(x) = (1 - exp(-x)) / x, g(0) = 1 (x = k t). */
export function thinFilmKernel(x: number): number {
  if (x < 1e-8) return 1 - 0.5 * x;
  return -Math.expm1(-x) / x;
}

/** Derivative g'(x) of the thin-film kernel. */
export function thinFilmKernelDerivative(x: number): number {
  if (x < 1e-4) return -0.5 + x / 3 - (x * x) / 8;
  const e = Math.exp(-x);
  return (e * x + Math.expm1(-x)) / (x * x);
}

/** Squared Hankel transforms of an axisymmetric texture on a set of k nodes (dimensionless units). */
export interface RadialTransforms {
  /** k nodes (in 1 / L). */
  q: Float64Array;
  /** Quadrature weights of the k nodes. */
  wq: Float64Array;
  /** F0(q)^2, F0 = Int (1 - cos theta) J0(q x) x dx. */
  f0sq: Float64Array;
  /** G1(q)^2, G1 = Int sin theta J1(q x) x dx. */
  g1sq: Float64Array;
}

/**
 * Hankel transforms F0 (order 0 of 1 - cos theta) and G1 (order 1 of sin theta) on k nodes `q`,
 * from rho nodes x with weights wx (Int ... x dx is Sum wx_i x_i ...), values oneMinusCos_i, sin_i,
 * plus an analytic saturated core of radius `core` (1 - cos theta = 2, sin theta = 0 for x < core).
 */
export function radialTransforms(
  x: Float64Array,
  wx: Float64Array,
  oneMinusCos: Float64Array,
  sinTheta: Float64Array,
  core: number,
  q: Float64Array,
  wq: Float64Array,
): RadialTransforms {
  const nq = q.length;
  const nx = x.length;
  const f0sq = new Float64Array(nq);
  const g1sq = new Float64Array(nq);
  const a = new Float64Array(nx);
  const b = new Float64Array(nx);
  for (let i = 0; i < nx; i++) {
    a[i] = wx[i]! * x[i]! * oneMinusCos[i]!;
    b[i] = wx[i]! * x[i]! * sinTheta[i]!;
  }
  const jj = new Float64Array(2);
  for (let j = 0; j < nq; j++) {
    const qj = q[j]!;
    let f0 = 0;
    let g1 = 0;
    if (core > 0) {
      besselJ01(qj * core, jj);
      f0 = (2 * core * jj[1]!) / qj;
    }
    for (let i = 0; i < nx; i++) {
      besselJ01(qj * x[i]!, jj);
      f0 += a[i]! * jj[0]!;
      g1 += b[i]! * jj[1]!;
    }
    f0sq[j] = f0 * f0;
    g1sq[j] = g1 * g1;
  }
  return { q, wq, f0sq, g1sq };
}

/**
 * Dimensionless non-local energies from transforms at thickness ratio tau = t / L:
 * surface = pi Int q F0^2 (g(q tau) - 1) dq, volume = pi Int q G1^2 (1 - g(q tau)) dq (without cos^2 psi).
 */
export function nonlocalFromTransforms(tr: RadialTransforms, tau: number): { surface: number; volume: number } {
  let s = 0;
  let v = 0;
  const { q, wq, f0sq, g1sq } = tr;
  for (let j = 0; j < q.length; j++) {
    const qj = q[j]!;
    const h = 1 - thinFilmKernel(qj * tau);
    const wqj = wq[j]! * qj;
    s -= wqj * f0sq[j]! * h;
    v += wqj * g1sq[j]! * h;
  }
  return { surface: Math.PI * s, volume: Math.PI * v };
}

/** Options for the non-local energy of an arbitrary axisymmetric profile. */
export interface ProfileMagnetostaticsOptions {
  /** Outer radius (m) beyond which theta = 0 to the accuracy wanted. */
  rhoMax: number;
  /** Smallest length of the profile (m): wall width or core radius; sets the rho panels and the k range. */
  scale: number;
  /** Radius (m) inside which theta = pi to 1e-12 (integrated analytically); default 0. */
  saturatedCore?: number;
  /** cos(psi) of the helicity psi (1 or -1: Neel, 0: Bloch). */
  cosHelicity: number;
}

/** Non-local thin-film magnetostatic energy (J) of an axisymmetric texture, with its parts. */
export interface NonlocalEnergy {
  /** Surface-charge correction (J), <= 0. */
  surface: number;
  /** Volume-charge energy (J), >= 0 (zero for Bloch). */
  volume: number;
  /** surface + volume (J). */
  total: number;
}

/**
 * Non-local magnetostatic energy E_nl (J) of an axisymmetric profile theta(rho) (rad, rho in m) in a
 * film (Ms in A/m, t in m), beyond the local K_eff term. See the file header for the formulas.
 */
export function profileNonlocalEnergy(Ms: number, t: number, theta: (rho: number) => number, options: ProfileMagnetostaticsOptions): NonlocalEnergy {
  if (!(Ms > 0)) throw new InputError("Ms", Ms, "a positive saturation magnetization in A/m");
  if (!(t > 0)) throw new InputError("t", t, "a positive thickness in m");
  const { rhoMax, scale } = options;
  if (!(scale > 0)) throw new InputError("scale", scale, "a positive length in m (the profile's smallest feature)");
  if (!(rhoMax > scale)) throw new InputError("rhoMax", rhoMax, `a length in m larger than scale = ${scale}`);
  const core = Math.max(0, options.saturatedCore ?? 0);
  const L = scale;
  const xMax = rhoMax / L;
  const xCore = core / L;
  const nodes = profileNodes(xCore, xMax, 0.5);
  const n = nodes.x.length;
  const omc = new Float64Array(n);
  const sn = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const th = theta(nodes.x[i]! * L);
    if (!Number.isFinite(th)) throw new InputError("theta", th, `a finite angle at rho = ${nodes.x[i]! * L} m`);
    omc[i] = 1 - Math.cos(th);
    sn[i] = Math.sin(th);
  }
  const kn = wavenumberNodes(xMax, 10);
  const tr = radialTransforms(nodes.x, nodes.w, omc, sn, xCore, kn.x, kn.w);
  const d = nonlocalFromTransforms(tr, t / L);
  const pref = mu0 * Ms * Ms * t * L * L;
  const c2 = options.cosHelicity * options.cosHelicity;
  const surface = pref * d.surface;
  const volume = pref * c2 * d.volume;
  return { surface, volume, total: surface + volume };
}

/**
 * Composite Gauss-Legendre nodes (order 8) for Int_{core}^{xMax} ... x dx with panels of width about h
 * (graded near x = 0 when the core is empty).
 */
export function profileNodes(core: number, xMax: number, h: number): { x: Float64Array; w: Float64Array } {
  const breaks: number[] = [];
  let x0 = core;
  if (core === 0) {
    // graded panels near the axis (the integrand has the factor x)
    breaks.push(0);
    let b = h / 8;
    while (b < h) {
      breaks.push(b);
      b *= 2;
    }
    x0 = h;
  }
  const nPan = Math.max(1, Math.ceil((xMax - x0) / h));
  for (let p = 0; p <= nPan; p++) breaks.push(x0 + ((xMax - x0) * p) / nPan);
  return compositeGaussLegendre(breaks, 8);
}

/**
 * k nodes (order 8 panels) up to qMax for a texture extending to xMax: the squared transforms
 * oscillate with period ~ pi / xMax, so panels of width 3 / xMax (at most 0.5).
 */
export function wavenumberNodes(xMax: number, qMax: number): { x: Float64Array; w: Float64Array } {
  const dq = Math.min(0.5, 3 / xMax);
  const nPan = Math.max(4, Math.ceil(qMax / dq));
  const breaks = new Float64Array(nPan + 1);
  for (let p = 0; p <= nPan; p++) breaks[p] = (qMax * p) / nPan;
  return compositeGaussLegendre(breaks, 8);
}
