/**
 * A precessing skyrmion held by spin torque in a nanocontact (a dynamically stabilized skyrmion or
 * topological droplet): a film without DMI, a reversed disc whose radius R(t) and precession angle
 * Phi(t) are the collective coordinates, Gilbert damping alpha and a Slonczewski torque confined to a
 * contact of radius rho_c.
 *
 * Model. Background m = +z, core -z, profile of the 360-degree-wall ansatz with wall width w = Delta
 * (walls/skyrmionAnsatz.ts), a = R / w, x = rho / w:
 *   m = (sin theta cos(varphi + Phi), sin theta sin(varphi + Phi), cos theta),
 *   tan(theta / 2) = sinh(a) / sinh(x).
 * Energy (local magnetostatics through K_eff, field B along +z, no DMI, so nothing depends on Phi):
 *   E(R) = 2 pi t [A I_ex(a) + (K_eff I_K(a) + Ms B I_Z(a)) w^2]   (the I_* of skyrmionAnsatz.ts).
 * Torque: dm/dt|_ST = sigma(rho) m x (m x z^), sigma(rho) = sigma for rho < rho_c and 0 outside,
 * sigma = gamma hbar P j / (2 e Ms t) (1/s) for a current density j through the contact with
 * polarization P (Slonczewski's angular dependence taken as constant); with sigma > 0 it pushes m
 * toward -z, i.e. it pumps reversed spins into the contact.
 * Lagrangian and dissipation function (derived here from LLG, whose Euler-Lagrange form in the angles
 * is L = (Ms / gamma) (1 - cos theta) d(varphi + Phi)/dt - e, F = (alpha Ms / 2 gamma)(theta_t^2 +
 * sin^2 theta Phi_t^2)); per film:
 *   L(R, Phi, dPhi/dt) = (Ms t / gamma) N(R) dPhi/dt - E(R),   N(R) = Integral (1 - cos theta) d^2r,
 *   F = (alpha Ms t / 2 gamma) [I_RR (dR/dt)^2 + I_PP (dPhi/dt)^2],
 *   I_RR = Integral (d theta / dR)^2 d^2r,  I_PP = Integral sin^2 theta d^2r,
 * and the torque is the generalized force Q_Phi = (Ms t / gamma) sigma I_c(R), I_c = Integral_{rho<rho_c}
 * sin^2 theta d^2r (the torque's e_theta component sigma sin theta enters the Phi equation; it has no
 * component conjugate to R). Euler-Lagrange equations:
 *   N'(R) dPhi/dt - (gamma / Ms t) E'(R) = alpha I_RR dR/dt
 *   N'(R) dR/dt = -alpha I_PP dPhi/dt + sigma I_c(R)
 * Results:
 * - Conservative precession (alpha = sigma = 0): dR/dt = 0 and dPhi/dt = omega(R) = gamma E'(R) /
 *   (Ms t N'(R)) = dE / d(hbar n), n = Ms t N / (gamma hbar) the number of reversed spin quanta.
 *   Thin-wall limit (R >> w, E ~ 2 pi R t sigma_w + Ms B t N, N ~ 2 pi R^2):
 *   omega -> gamma B + gamma sigma_w / (2 Ms R), sigma_w = 4 sqrt(A K_eff). (Not gamma sigma_w /
 *   (4 pi Ms R): N'(R) = 4 pi R and E'(R) = 2 pi t sigma_w, so the 2 pi cancels.)
 * - Eliminating dPhi/dt: dR/dt = I_c [sigma - sigma_b(R)] / [N' + alpha^2 I_PP I_RR / N'], with the
 *   balance torque sigma_b(R) = alpha omega(R) I_PP(R) / I_c(R). A precessing state of radius R* exists
 *   for sigma = sigma_b(R*) and is stable where d sigma_b / dR > 0. sigma_b grows for R -> 0 (omega
 *   grows) and for R >> rho_c (the contact sits in the saturated core, I_c -> 0), so its minimum is the
 *   threshold torque sigma_th: below it every reversed disc decays; above it the stable radius is the
 *   larger root. dPhi/dt = omega + alpha I_RR (dR/dt) / N'.
 * Sources: M. Hoefer, T. Silva, M. Keller, PRB 82, 054432 (2010) (droplet solitons in nanocontacts);
 * S. Mohseni et al., Science 339, 1295 (2013); Y. Zhou et al., Nat. Commun. 6, 8193 (2015)
 * (dynamically stabilized skyrmions; from memory); the ansatz of H.-B. Braun, PRB 50, 16501 (1994);
 * J. Slonczewski, JMMM 159, L1 (1996). The equations above are our own derivation; the tests check
 * omega = dE/dN against finite differences of the energy, the thin-wall limit, and the ODE against the
 * balance condition and scipy.
 * Assumptions: rigid ansatz shape (w = Delta fixed, no deformation or non-axisymmetric modes), local
 * magnetostatics, no DMI, uniform torque in the contact, T = 0, no Oersted field.
 */
import { InputError } from "../errors.js";
import { e as eCharge, gammaElectron, hbar } from "../quantity/constants.js";
import { type Film, effectiveAnisotropy, requirePerpendicular, wallWidthParameter } from "../material/film.js";
import { ansatzLocalIntegrals } from "../walls/skyrmionAnsatz.js";
import { compositeGaussLegendre } from "../numeric/gaussLegendre.js";
import { brentMinimize } from "../numeric/brentMinimize.js";
import { brentRoot } from "../numeric/brentRoot.js";
import { integrateDormandPrince } from "./dormandPrince.js";

/** Model data, SI. */
export interface DropletModel {
  Ms: number;
  A: number;
  Keff: number;
  t: number;
  /** Field along +z (T). */
  B: number;
  alpha: number;
  gamma: number;
  /** Wall width of the ansatz w = Delta (m). */
  w: number;
  /** Contact radius (m). */
  rhoC: number;
}

export function dropletModel(film: Film, options: { B?: number; alpha?: number; gamma?: number; contactRadius: number }): DropletModel {
  requirePerpendicular(film, "the precessing skyrmion");
  if (film.D !== 0) throw new InputError("D", film.D, "0 (the precessing-skyrmion model has no DMI; with DMI the energy depends on the precession angle)");
  const alpha = options.alpha ?? film.alpha;
  if (alpha === undefined || !(alpha > 0) || !Number.isFinite(alpha)) throw new InputError("alpha", alpha, "a positive Gilbert damping");
  const gamma = options.gamma ?? film.gamma ?? gammaElectron;
  const B = options.B ?? 0;
  if (!Number.isFinite(B)) throw new InputError("B", B, "a finite field in T");
  const rhoC = options.contactRadius;
  if (!(rhoC > 0) || !Number.isFinite(rhoC)) throw new InputError("contactRadius", rhoC, "a positive contact radius in m");
  const w = wallWidthParameter(film);
  if (rhoC / w > 200) throw new InputError("contactRadius", rhoC, `a contact radius below 200 Delta = ${(200 * w).toPrecision(3)} m (model bound)`);
  return { Ms: film.Ms, A: film.A, Keff: effectiveAnisotropy(film), t: film.t, B, alpha, gamma, w, rhoC };
}

/** Slonczewski torque rate sigma = gamma hbar P j / (2 e Ms t) (1/s) of a current I through a contact of radius rhoC. */
export function slonczewskiRate(current: number, P: number, rhoC: number, Ms: number, t: number, gamma = gammaElectron): number {
  const j = current / (Math.PI * rhoC * rhoC);
  return (gamma * hbar * P * j) / (2 * eCharge * Ms * t);
}

/** Dimensionless integrals of the ansatz at a = R / w and x_c = rho_c / w. */
export interface DropletIntegrals {
  /** dI_ex/da, dI_K/da, dI_Z/da. */
  dEx: number;
  dK: number;
  dZ: number;
  /** I_K = Integral sin^2 theta x dx, I_c = the same over x < x_c, I_RR = Integral (d theta / da)^2 x dx. */
  K: number;
  c: number;
  RR: number;
}

const GL = 10;

/** The integrals by composite Gauss-Legendre (graded near the axis, unit panels over the wall, a break at x_c). */
export function dropletIntegrals(a: number, xc: number): DropletIntegrals {
  if (!(a > 0) || !Number.isFinite(a)) throw new InputError("R", a, "a positive radius (in units of w)");
  if (a > 300) throw new InputError("R", a, "a radius below 300 w (sinh(R / w)^2 overflows beyond; the disc is then a large domain, outside this model)");
  // The integrands vary on the unit scale of x (poles of the sinh ratio at distance pi/2 from the real
  // axis), so 10-point panels of width 1 are accurate to ~1e-15; beyond |x - a| > 20 they are below
  // e^-40 of their peak (the saturated core and the far tail contribute nothing).
  const lo = Math.max(0, a - 20);
  const hi = a + 22;
  const breaks: number[] = [lo];
  if (lo === 0) {
    let x = Math.min(a, 1) / 256;
    while (x < Math.min(1, hi)) {
      breaks.push(x);
      x *= 2;
    }
  }
  let x = breaks[breaks.length - 1]!;
  while (x < hi) {
    x = Math.min(hi, x + 1);
    breaks.push(x);
  }
  if (xc > lo && xc < hi && !breaks.some((b) => Math.abs(b - xc) <= 1e-12 * hi)) {
    breaks.push(xc);
    breaks.sort((p, q) => p - q);
  }
  const { x: nodes, w } = compositeGaussLegendre(breaks, GL);
  const sa = Math.sinh(a);
  const S = sa * sa;
  const ca = Math.cosh(a);
  let dEx = 0,
    dK = 0,
    dZ = 0,
    K = 0,
    c = 0,
    RR = 0;
  for (let i = 0; i < nodes.length; i++) {
    const xi = nodes[i]!;
    const wt = w[i]!;
    let sx: number;
    let cx: number;
    if (xi > 0.1) {
      const ep = Math.exp(xi);
      const em = 1 / ep;
      sx = 0.5 * (ep - em);
      cx = 0.5 * (ep + em);
    } else {
      sx = Math.sinh(xi);
      cx = Math.cosh(xi);
    }
    const d = sx * sx + S;
    const sn = (2 * sa * sx) / d; // sin theta
    const cs = (sx * sx - S) / d; // cos theta
    const thx = (-2 * sa * cx) / d; // d theta / dx
    const tha = (2 * ca * sx) / d; // d theta / da
    const thax = (2 * ca * cx * (S - sx * sx)) / (d * d); // d^2 theta / da dx
    dEx += wt * 2 * (thx * thax * xi + (sn * cs * tha) / xi);
    dK += wt * 2 * sn * cs * tha * xi;
    dZ += wt * sn * tha * xi;
    const s2 = sn * sn * xi;
    K += wt * s2;
    if (xi < xc) c += wt * s2;
    RR += wt * tha * tha * xi;
  }
  return { dEx, dK, dZ, K, c, RR };
}

/** State of the precessing skyrmion at radius R. */
export interface DropletState {
  /** Conservative precession frequency omega(R) = gamma E'(R) / (Ms t N'(R)) (rad/s). */
  omega: number;
  /** Torque rate that balances damping at this radius, sigma_b(R) (1/s); Infinity where I_c = 0. */
  balanceTorque: number;
  /** E(R) (J), N(R) (m^2) and the number of reversed spin quanta n = Ms t N / (gamma hbar). */
  energy: number;
  reversedArea: number;
  reversedSpins: number;
}

/** omega(R) and the balance torque only (no energy): what the threshold and radius searches need. */
function omegaAndBalance(m: DropletModel, R: number): { omega: number; balanceTorque: number } {
  const I = dropletIntegrals(R / m.w, m.rhoC / m.w);
  const omega = m.gamma * m.B + (m.gamma * ((m.A * I.dEx) / (m.w * m.w) + m.Keff * I.dK)) / (m.Ms * I.dZ);
  return { omega, balanceTorque: I.c > 0 ? (m.alpha * omega * I.K) / I.c : Infinity };
}

export function dropletState(m: DropletModel, R: number): DropletState {
  const a = R / m.w;
  const { omega, balanceTorque } = omegaAndBalance(m, R);
  const L = ansatzLocalIntegrals(a);
  const energy = 2 * Math.PI * m.t * (m.A * L.ex + (m.Keff * L.K + m.Ms * m.B * L.Z) * m.w * m.w);
  const reversedArea = 2 * Math.PI * m.w * m.w * L.Z;
  return { omega, balanceTorque, energy, reversedArea, reversedSpins: (m.Ms * m.t * reversedArea) / (m.gamma * hbar) };
}

/** Thin-wall limit of omega: gamma B + gamma sigma_w / (2 Ms R), sigma_w = 4 sqrt(A K_eff) (rad/s). */
export function thinWallFrequency(m: DropletModel, R: number): number {
  return m.gamma * m.B + (m.gamma * 4 * Math.sqrt(m.A * m.Keff)) / (2 * m.Ms * R);
}

/** Rates dR/dt (m/s) and dPhi/dt (rad/s) at radius R under torque sigma (1/s). */
export function dropletRates(m: DropletModel, R: number, sigma: number): { dR: number; dPhi: number } {
  const a = R / m.w;
  const I = dropletIntegrals(a, m.rhoC / m.w);
  const omega = m.gamma * m.B + (m.gamma * ((m.A * I.dEx) / (m.w * m.w) + m.Keff * I.dK)) / (m.Ms * I.dZ);
  const al = m.alpha;
  // da/dt = [sigma I_c - alpha omega I_K] / (I_Z' + alpha^2 I_K I_RR / I_Z')
  const da = (sigma * I.c - al * omega * I.K) / (I.dZ + (al * al * I.K * I.RR) / I.dZ);
  return { dR: da * m.w, dPhi: omega + (al * I.RR * da) / I.dZ };
}

/** The threshold torque: the minimum over R of the balance torque, with the radius where it is reached. */
export interface DropletThreshold {
  torque: number;
  radius: number;
  /** "ok", or "no-minimum" when omega <= 0 on the whole range (the field expands the disc: no balance). */
  status: "ok" | "no-minimum";
}

export function dropletThreshold(m: DropletModel): DropletThreshold {
  const xc = m.rhoC / m.w;
  const aLo = 0.1;
  const aHi = Math.max(10, 4 * xc + 10);
  const n = 60;
  let best = Infinity;
  let bestI = -1;
  const as: number[] = [];
  for (let i = 0; i < n; i++) {
    const a = aLo * Math.pow(aHi / aLo, i / (n - 1));
    as.push(a);
    const s = omegaAndBalance(m, a * m.w);
    const v = s.omega > 0 ? s.balanceTorque : Infinity;
    if (v < best) {
      best = v;
      bestI = i;
    }
  }
  if (bestI < 0 || !Number.isFinite(best)) return { torque: NaN, radius: NaN, status: "no-minimum" };
  const l = as[Math.max(0, bestI - 1)]!;
  const r = as[Math.min(n - 1, bestI + 1)]!;
  const f = (la: number): number => {
    const s = omegaAndBalance(m, Math.exp(la) * m.w);
    return s.omega > 0 ? s.balanceTorque : Infinity;
  };
  const min = brentMinimize(f, Math.log(l), Math.log(r), 1e-10);
  return { torque: min.f, radius: Math.exp(min.x) * m.w, status: "ok" };
}

/** The stable precessing radius under torque sigma (on the rising branch of sigma_b), or NaN below threshold. */
export function dropletStableRadius(m: DropletModel, sigma: number, threshold = dropletThreshold(m)): number {
  if (threshold.status !== "ok" || !(sigma >= threshold.torque)) return NaN;
  const g = (R: number): number => omegaAndBalance(m, R).balanceTorque - sigma;
  let lo = threshold.radius;
  let hi = lo * 1.2 + m.w;
  let it = 0;
  while (g(hi) < 0 && it++ < 60) {
    lo = hi;
    hi = hi * 1.3;
  }
  if (g(hi) < 0) return NaN;
  if (g(lo) > 0) return lo;
  return brentRoot(g, lo, hi, { xtol: 1e-13 * hi }).root;
}

export interface DropletTrace {
  t: number[];
  R: number[];
  Phi: number[];
  /** "running" (reached the end time), or "collapsed" (R fell below 0.1 w: the ansatz no longer holds a skyrmion). */
  status: "running" | "collapsed";
  tEnd: number;
}

/** Integrate R(t), Phi(t) from R0 (Dormand-Prince 5(4), state [R / w, Phi], time in ns). */
export function dropletTrace(m: DropletModel, sigma: number, R0: number, duration: number, points = 401, rtol = 1e-9): DropletTrace {
  if (!(R0 > 0)) throw new InputError("R0", R0, "a positive start radius in m");
  if (!(duration > 0) || !Number.isFinite(duration)) throw new InputError("duration", duration, "a positive finite time in s");
  if (!Number.isFinite(sigma)) throw new InputError("sigma", sigma, "a finite torque rate in 1/s");
  const NS = 1e-9;
  const T1 = duration / NS;
  const rhs = (_t: number, y: Float64Array, dy: Float64Array): void => {
    const r = dropletRates(m, Math.max(y[0]!, 1e-3) * m.w, sigma);
    dy[0] = (r.dR / m.w) * NS;
    dy[1] = r.dPhi * NS;
  };
  const tEval = Array.from({ length: points }, (_, i) => (i === points - 1 ? T1 : (T1 * i) / (points - 1)));
  const sol = integrateDormandPrince(rhs, 0, [R0 / m.w, 0], T1, {
    rtol,
    atol: 1e-11,
    tEval,
    maxSteps: 100000,
    events: [{ g: (_t, y) => y[0]! - 0.1, direction: -1, terminal: true }],
  });
  return {
    t: sol.t.map((x) => x * NS),
    R: sol.y.map((y) => y[0]! * m.w),
    Phi: sol.y.map((y) => y[1]!),
    status: sol.status === "event" ? "collapsed" : "running",
    tEnd: sol.tEnd * NS,
  };
}
