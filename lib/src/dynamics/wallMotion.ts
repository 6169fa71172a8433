/**
 * The 180-degree wall of a perpendicular thin film in collective coordinates: position q and the
 * in-plane angle phi of its central moment, driven by an out-of-plane field, in-plane fields,
 * spin-transfer torque (adiabatic u, non-adiabatic beta) and spin-orbit torques (damping-like and
 * field-like), with Gilbert damping alpha, interfacial DMI and the thin-film shape anisotropy of the
 * Neel wall. Closed forms (steady motion, Walker thresholds, the mean velocity above breakdown by
 * the period integral, intrinsic pinning, the spin-orbit-torque saturation velocity) and the same
 * equations integrated in time (Dormand-Prince 5(4), dormandPrince.ts).
 *
 * Geometry. Wall normal +x, magnetization m = (sin theta cos phi, sin theta sin phi, cos theta),
 * theta(x) = 2 arctan exp(p (x - q) / Delta) with the wall polarity p: p = +1 is the up|down wall
 * of walls/wall180.ts (+z domain at x < q), p = -1 the down|up wall. phi is the azimuth of the
 * wall's central moment measured from +x, so a p = +1 wall of helicity gamma (wall180.ts) has
 * phi = gamma + pi. Delta = sqrt(A / K_eff) is kept fixed (rigid profile) in the closed forms and in
 * wallTrace; wallTraceBreathing (end of file) adds Delta(t) as a third coordinate.
 *
 * Derivation (ours, the usual route of Schryer and Walker; Malozemoff and Slonczewski; Thiaville
 * et al.). LLG dm/dt = -gamma m x B_eff + alpha m x dm/dt in spherical angles is the Euler-Lagrange
 * equation of L = (Ms / gamma) (1 - cos theta) dPhi/dt - e with the Rayleigh function
 * F = (alpha Ms / 2 gamma) (theta_t^2 + sin^2 theta Phi_t^2). With the wall ansatz (Integral
 * sin^2 theta dx = 2 Delta) the energy per unit wall area is
 *   sigma(q, phi) = sigma_0 - 2 p mu0 Ms H_z q + p pi D cos phi + C cos^2 phi
 *                   - pi Delta Ms (B_x cos phi + B_y sin phi),
 * C the Neel volume-charge energy (walls/wall180.ts neelWallChargeEnergy: the wall's demagnetizing
 * factor N_x = t ln2 / (pi Delta) in the thin-film limit, so C = Delta Ms mu0 H_K with
 * mu0 H_K = N_x mu0 Ms), and the Euler-Lagrange equations for q and phi are
 *   (1)  dphi/dt + p alpha (dq/dt) / Delta = A1 = gamma B_z + p beta u / Delta + (pi/2) gamma B_DL cos phi
 *   (2)  p (dq/dt) / Delta - alpha dphi/dt = A2 = p u / Delta + (gamma / 2 Ms Delta) dsigma/dphi
 *        with (gamma / 2 Ms Delta) dsigma/dphi = (pi/2) gamma [(B_x - p B_D) sin phi - B_y cos phi] - (gamma B_K / 2) sin 2phi,
 * B_D = D / (Ms Delta) the DMI field, B_K = mu0 H_K = C / (Ms Delta), all fields as mu0 H in tesla.
 * Hence dphi/dt = (A1 - alpha A2) / (1 + alpha^2) and dq/dt = p Delta (alpha A1 + A2) / (1 + alpha^2)
 * = (p Delta / alpha) (A1 - dphi/dt): both are degree-two trigonometric polynomials in phi alone,
 * so phi obeys an autonomous equation on the circle.
 * - Spin-transfer torque (S. Zhang, Z. Li, PRL 93, 127204 (2004)): -(u . grad) m + beta m x (u . grad) m
 *   with u along +x; in the gyrotropic terms dq/dt -> dq/dt - u, in the damping alpha dq/dt ->
 *   alpha dq/dt - beta u. u = g muB P j / (2 e Ms), P the spin polarization of the current density j;
 *   our sign convention: positive u (and positive j for STT) is the direction the electrons flow,
 *   so that for beta = alpha the wall moves rigidly at v = u.
 * - Damping-like spin-orbit torque -gamma m x (B_DL m x y^) with B_DL = mu0 H_DL = hbar theta_SH j /
 *   (2 e Ms t) (spin polarization along +y for positive theta_SH j; flip the sign of theta_SH for the
 *   other stacking). Projected on q it acts as an out-of-plane field (pi/2) B_DL cos phi, the same for
 *   both polarities; projected on phi it gives nothing. Field-like torque: a field B_FL along +y,
 *   B_FL = (field-like ratio) B_DL.
 * Closed forms:
 * - Steady motion: the first zero phi* of dphi/dt met from the start angle in the direction of the
 *   flow (exactly what the time integration reaches); v = p Delta A1(phi*) / alpha.
 * - Walker thresholds: (1 + alpha^2) dphi/dt = gamma B_z + R(phi) with R a degree-two trigonometric
 *   polynomial; a steady state exists iff -gamma B_z lies in [min R, max R], so the Walker fields are
 *   B_W = -min R / gamma (upper) and -max R / gamma (lower), with the exact extremes over phi
 *   (trig2.ts), not only the Bloch (D = 0: alpha B_K / 2) or Neel (large D: (pi/2) alpha B_D) limits.
 *   The same with u in place of B_z gives the spin-transfer Walker drift velocities, and with
 *   beta = 0, B_z = 0 the intrinsic-pinning drift (G. Tatara, H. Kohno, PRL 92, 086601 (2004)).
 * - Above breakdown: period T = Integral_0^2pi dphi / |dphi/dt|, advance per period
 *   Dq = Integral_0^2pi (dq/dt) / |dphi/dt| dphi, mean velocity Dq / T. The integrands are periodic and
 *   analytic, so the trapezoidal rule converges geometrically; we double the points until the relative
 *   change is below 1e-13. Without DMI or torques this gives (gamma Delta / alpha)[B - sqrt(B^2 -
 *   B_W^2) / (1 + alpha^2)] (checked in the tests).
 * - Spin-orbit torque with DMI: for large B_DL, cos phi -> 0 and |v| -> (pi/2) gamma |D| / Ms
 *   (Thiaville et al., EPL 100, 57002 (2012)).
 * Sources: N. Schryer, L. Walker, J. Appl. Phys. 45, 5406 (1974); A. Malozemoff, J. Slonczewski,
 * Magnetic Domain Walls in Bubble Materials (Academic Press 1979); A. Thiaville, Y. Nakatani,
 * J. Miltat, Y. Suzuki, EPL 69, 990 (2005); A. Thiaville et al., EPL 100, 57002 (2012); S. Zhang,
 * Z. Li, PRL 93, 127204 (2004); A. Khvalkovskiy et al., PRB 87, 020402 (2013) (spin-orbit torques in
 * the wall model; from memory).
 */
import { InputError } from "../errors.js";
import { e as eCharge, gammaElectron, gElectron, hbar, muB } from "../quantity/constants.js";
import { type Film, requirePerpendicular, wallWidthParameter } from "../material/film.js";
import { neelWallChargeEnergy, type NeelChargeModel } from "../walls/wall180.js";
import { brentRoot } from "../numeric/brentRoot.js";
import { integrateDormandPrince, type OdeSolution } from "./dormandPrince.js";
import { type Trig2, type Trig2Critical, trig2, trig2Combine, trig2Critical, trig2Extremes } from "./trig2.js";

/** The parameters of the collective-coordinate wall, SI. */
export interface WallMotionModel {
  Ms: number;
  /** Wall width parameter Delta = sqrt(A / K_eff) (m), fixed. */
  Delta: number;
  alpha: number;
  /** Gyromagnetic ratio (rad/(s T)). */
  gamma: number;
  /** Interfacial DMI (J/m^2). */
  D: number;
  /** Neel volume-charge energy per wall area C (J/m^2). */
  C: number;
  /** Wall polarity: +1 up|down (+z domain at x < q), -1 down|up. */
  polarity: 1 | -1;
  /** DMI field B_D = D / (Ms Delta) (T). */
  dmiField: number;
  /** Shape-anisotropy field of the wall B_K = mu0 H_K = C / (Ms Delta) (T). */
  shapeField: number;
  /** Film thickness (m), for the spin-orbit field. */
  t: number;
  /** Exchange stiffness (J/m) and effective anisotropy K_eff (J/m^3), for the breathing wall. */
  A: number;
  Keff: number;
  /** Neel charge model used for C. */
  chargeModel: NeelChargeModel;
}

export interface WallModelOptions {
  alpha?: number;
  gamma?: number;
  polarity?: number;
  /** Neel charge model of walls/wall180.ts (default "thin-film": N_x = t ln2 / (pi Delta)). */
  chargeModel?: NeelChargeModel;
}

/** Build the wall model of a film. alpha and gamma default to the film's, then to gamma_e. */
export function wallMotionModel(film: Film, options: WallModelOptions = {}): WallMotionModel {
  requirePerpendicular(film, "wall dynamics");
  if (film.dmi !== "interfacial" && film.D !== 0) throw new InputError("dmi", film.dmi, '"interfacial" (the wall-motion model treats interfacial DMI)');
  const alpha = options.alpha ?? film.alpha;
  if (alpha === undefined || !(alpha > 0) || !Number.isFinite(alpha)) throw new InputError("alpha", alpha, "a positive Gilbert damping (the wall model divides by alpha)");
  const gamma = options.gamma ?? film.gamma ?? gammaElectron;
  if (!(gamma > 0)) throw new InputError("gamma", gamma, "a positive gyromagnetic ratio in rad/(s T)");
  const p = options.polarity ?? 1;
  if (p !== 1 && p !== -1) throw new InputError("polarity", options.polarity, "+1 (up|down wall) or -1 (down|up wall)");
  const Delta = wallWidthParameter(film);
  const chargeModel = options.chargeModel ?? "thin-film";
  const C = neelWallChargeEnergy(film, chargeModel);
  return {
    Ms: film.Ms,
    Delta,
    alpha,
    gamma,
    D: film.D,
    C,
    polarity: p,
    dmiField: film.D / (film.Ms * Delta),
    shapeField: C / (film.Ms * Delta),
    t: film.t,
    A: film.A,
    Keff: requirePerpendicular(film, "wall dynamics"),
    chargeModel,
  };
}

/** What drives the wall. Fields as mu0 H in T, u in m/s. Missing entries are zero. */
export interface WallDrive {
  Bz?: number;
  Bx?: number;
  By?: number;
  /** Spin-drift velocity u (m/s), positive along the electron flow (+x). */
  u?: number;
  /** Non-adiabatic parameter beta. */
  beta?: number;
  /** Damping-like spin-orbit field mu0 H_DL (T). */
  BDL?: number;
  /** Field-like spin-orbit field mu0 H_FL along +y (T). */
  BFL?: number;
}

/** u = g muB P j / (2 e Ms) (m/s), with g = |g_e|. */
export function spinDriftVelocity(j: number, P: number, Ms: number, g = Math.abs(gElectron)): number {
  return (g * muB * P * j) / (2 * eCharge * Ms);
}

/** Damping-like spin-orbit field mu0 H_DL = hbar theta_SH j / (2 e Ms t) (T). */
export function spinOrbitField(j: number, thetaSH: number, Ms: number, t: number): number {
  return (hbar * thetaSH * j) / (2 * eCharge * Ms * t);
}

/** Read a drive, refusing non-finite entries by name. */
function driveOf(d: WallDrive): Required<WallDrive> {
  const out = { Bz: d.Bz ?? 0, Bx: d.Bx ?? 0, By: d.By ?? 0, u: d.u ?? 0, beta: d.beta ?? 0, BDL: d.BDL ?? 0, BFL: d.BFL ?? 0 };
  for (const [k, v] of Object.entries(out)) if (!Number.isFinite(v)) throw new InputError(k, (d as Record<string, unknown>)[k], "a finite number (SI)");
  return out;
}

/** A1(phi) and A2(phi) of the header (1/s) as degree-two trigonometric polynomials. */
export function wallDrivingTerms(m: WallMotionModel, drive: WallDrive): { A1: Trig2; A2: Trig2 } {
  const d = driveOf(drive);
  const p = m.polarity;
  const g = m.gamma;
  const A1: Trig2 = [g * d.Bz + (p * d.beta * d.u) / m.Delta, (Math.PI / 2) * g * d.BDL, 0, 0, 0];
  const A2: Trig2 = [(p * d.u) / m.Delta, -(Math.PI / 2) * g * (d.By + d.BFL), (Math.PI / 2) * g * (d.Bx - p * m.dmiField), 0, -(g * m.shapeField) / 2];
  return { A1, A2 };
}

/** dphi/dt and dq/dt as trigonometric polynomials in phi (1/s and m/s). */
export function wallRates(m: WallMotionModel, drive: WallDrive): { phiDot: Trig2; qDot: Trig2 } {
  const { A1, A2 } = wallDrivingTerms(m, drive);
  const a = m.alpha;
  const k = 1 / (1 + a * a);
  const phiDot = trig2Combine(k, A1, -a * k, A2);
  const qDot = trig2Combine(m.polarity * m.Delta * a * k, A1, m.polarity * m.Delta * k, A2);
  return { phiDot, qDot };
}

/**
 * Equilibrium in-plane angle without drive (B_z = 0, no currents), in the in-plane fields of the drive:
 * the global minimum of sigma(phi) = p pi D cos phi + C cos^2 phi - pi Delta Ms (B_x cos phi + B_y sin phi).
 * Without DMI and in-plane field the two Bloch walls are degenerate; we take phi = +pi/2.
 */
export function wallEquilibriumAngle(m: WallMotionModel, drive: WallDrive = {}): number {
  const d = driveOf(drive);
  const By = d.By + d.BFL;
  // sigma(phi) - const as a Trig2: C cos^2 = C/2 + (C/2) cos 2phi.
  const sigma: Trig2 = [m.C / 2, m.polarity * Math.PI * m.D - Math.PI * m.Delta * m.Ms * d.Bx, -Math.PI * m.Delta * m.Ms * By, m.C / 2, 0];
  if (sigma[1] === 0 && sigma[2] === 0) return m.C > 0 ? Math.PI / 2 : 0;
  return wrapAngle(trig2Extremes(sigma).argMin);
}

function wrapAngle(x: number): number {
  const y = x - 2 * Math.PI * Math.floor((x + Math.PI) / (2 * Math.PI));
  return y;
}

/** Thresholds of a steady state along one drive parameter; [lower, upper], +-Infinity when unbounded. */
export interface WallThresholds {
  lower: number;
  upper: number;
}

/**
 * Walker fields: the range of B_z (T) with a steady state for the other drives as given (B_z of the
 * drive is ignored). Exact extremes over phi of the restoring term.
 */
export function walkerFields(m: WallMotionModel, drive: WallDrive = {}): WallThresholds & { phiUpper: number; phiLower: number } {
  const { phiDot } = wallRates(m, { ...drive, Bz: 0 });
  // (1 + alpha^2) phiDot = gamma B_z + R(phi)
  const k = 1 + m.alpha * m.alpha;
  const R: Trig2 = [phiDot[0] * k, phiDot[1] * k, phiDot[2] * k, phiDot[3] * k, phiDot[4] * k];
  const ex = trig2Extremes(R);
  return { lower: -ex.max / m.gamma, upper: -ex.min / m.gamma, phiUpper: ex.argMin, phiLower: ex.argMax };
}

/**
 * Spin-transfer Walker thresholds: the range of u (m/s) with a steady state, for the drive's beta and
 * other drives (u of the drive ignored). Infinite when beta = alpha and nothing else breaks the balance.
 */
export function walkerDriftVelocities(m: WallMotionModel, drive: WallDrive = {}): WallThresholds {
  const beta = drive.beta ?? 0;
  const { phiDot } = wallRates(m, { ...drive, u: 0 });
  const k = 1 + m.alpha * m.alpha;
  const S: Trig2 = [phiDot[0] * k, phiDot[1] * k, phiDot[2] * k, phiDot[3] * k, phiDot[4] * k];
  const slope = (m.polarity * (beta - m.alpha)) / m.Delta; // (1 + alpha^2) phiDot = slope u + S(phi)
  const ex = trig2Extremes(S);
  if (ex.min > 0 || ex.max < 0) return { lower: NaN, upper: NaN }; // no steady state even at u = 0
  if (slope === 0) return { lower: -Infinity, upper: Infinity };
  const a = -ex.max / slope;
  const b = -ex.min / slope;
  return { lower: Math.min(a, b), upper: Math.max(a, b) };
}

/** Intrinsic pinning: the drift velocities u_c below which a wall with beta = 0 does not move (no field). */
export function intrinsicPinningDrift(m: WallMotionModel, drive: WallDrive = {}): WallThresholds {
  return walkerDriftVelocities(m, { ...drive, Bz: 0, beta: 0, BDL: 0 });
}

/** Saturation speed (pi/2) gamma |D| / Ms of a wall driven by a large damping-like spin-orbit torque (m/s). */
export function spinOrbitSaturationVelocity(m: WallMotionModel): number {
  return ((Math.PI / 2) * m.gamma * Math.abs(m.D)) / m.Ms;
}

/** Motion of the wall under a constant drive. */
export interface WallMotion {
  regime: "steady" | "precessing";
  /** Steady velocity, or the mean velocity over a precession period (m/s). */
  velocity: number;
  /** Steady angle phi* (rad); NaN when precessing. */
  phi: number;
  /** Precession period T (s) and mean dphi/dt (rad/s, signed); Infinity and 0 when steady. */
  period: number;
  meanPhiRate: number;
  /** Points used by the period integral (0 when steady). */
  quadraturePoints: number;
}

function maxAbs(p: Trig2): number {
  return Math.abs(p[0]) + Math.abs(p[1]) + Math.abs(p[2]) + Math.abs(p[3]) + Math.abs(p[4]);
}

/** cos and sin at the angles 2 pi (i + shift) / n, tabulated per (n, shift) up to n = 2^15 (1 MB in all). */
const angleTables = new Map<number, { c: Float64Array; s: Float64Array }>();
function angleTable(n: number, shift: number): { c: Float64Array; s: Float64Array } {
  const key = 2 * n + (shift === 0 ? 0 : 1);
  let t = angleTables.get(key);
  if (!t) {
    const c = new Float64Array(n);
    const sn = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      const phi = (2 * Math.PI * (i + shift)) / n;
      c[i] = Math.cos(phi);
      sn[i] = Math.sin(phi);
    }
    t = { c, s: sn };
    if (n <= 1 << 15) angleTables.set(key, t);
  }
  return t;
}

/** Sums of 1/|g| and h/|g| over the tabulated angles of (n, shift). */
function trapezoidSums(g: Trig2, h: Trig2, n: number, shift: number): [number, number] {
  const { c, s } = angleTable(n, shift);
  let sT = 0;
  let sQ = 0;
  for (let i = 0; i < n; i++) {
    const ci = c[i]!;
    const si = s[i]!;
    const c2 = ci * ci - si * si;
    const s2 = 2 * si * ci;
    const gi = Math.abs(g[0] + g[1] * ci + g[2] * si + g[3] * c2 + g[4] * s2);
    const hi = h[0] + h[1] * ci + h[2] * si + h[3] * c2 + h[4] * s2;
    sT += 1 / gi;
    sQ += hi / gi;
  }
  return [sT, sQ];
}

/** Periodic trapezoid of 1/|g| and h/|g| with doubling; returns [Integral 1/|g|, Integral h/|g|, points]. */
function periodIntegrals(g: Trig2, h: Trig2, relTol = 1e-13, maxPoints = 1 << 21): [number, number, number] {
  let n = 64;
  let [sT, sQ] = trapezoidSums(g, h, n, 0);
  let T = (2 * Math.PI * sT) / n;
  let Q = (2 * Math.PI * sQ) / n;
  const hScale = 1e-12 * maxAbs(h);
  while (n < maxPoints) {
    const [aT, aQ] = trapezoidSums(g, h, n, 0.5); // the midpoints
    sT += aT;
    sQ += aQ;
    n *= 2;
    const Tn = (2 * Math.PI * sT) / n;
    const Qn = (2 * Math.PI * sQ) / n;
    const done = Math.abs(Tn - T) <= relTol * Tn && Math.abs(Qn - Q) <= relTol * Math.max(Math.abs(Qn), hScale * Tn);
    T = Tn;
    Q = Qn;
    if (done) break;
  }
  return [T, Q, n];
}

/**
 * Closed-form motion under a constant drive, starting from the angle phiStart (default: the
 * zero-drive equilibrium): steady velocity, or mean velocity and period above breakdown.
 */
export function wallMotion(m: WallMotionModel, drive: WallDrive, phiStart?: number): WallMotion {
  const { phiDot, qDot } = wallRates(m, drive);
  const phi0 =
    phiStart ?? wallEquilibriumAngle(m, drive.Bx !== undefined || drive.By !== undefined || drive.BFL !== undefined ? { Bx: drive.Bx, By: drive.By, BFL: drive.BFL } : {});
  if (!Number.isFinite(phi0)) throw new InputError("phiStart", phiStart, "a finite angle in rad");
  const crit = trig2Critical(phiDot);
  const ex = trig2Extremes(phiDot, crit);
  const steadyExists = ex.min <= 0 && ex.max >= 0;
  if (steadyExists) {
    const phi = firstZeroAlongFlow(phiDot, phi0, crit);
    return { regime: "steady", velocity: trig2(qDot, phi), phi, period: Infinity, meanPhiRate: 0, quadraturePoints: 0 };
  }
  const [T, Q, n] = periodIntegrals(phiDot, qDot);
  const sgn = ex.min > 0 ? 1 : -1;
  return { regime: "precessing", velocity: Q / T, phi: NaN, period: T, meanPhiRate: (sgn * 2 * Math.PI) / T, quadraturePoints: n };
}

/**
 * The rest angle the flow dphi/dt = g(phi) reaches from phi0: g is monotonic between consecutive
 * critical points, so walking from phi0 along the flow through those points brackets the first zero
 * exactly (Brent's method inside the bracket). Assumes g has a zero.
 */
function firstZeroAlongFlow(g: Trig2, phi0: number, crit: Trig2Critical[]): number {
  const g0 = trig2(g, phi0);
  if (g0 === 0) return phi0;
  const dir = Math.sign(g0);
  // critical angles unrolled to lie strictly after phi0 along dir, within one turn, in walking order
  const twoPi = 2 * Math.PI;
  const marks = crit.map((c) => {
    let d = dir * (c.phi - phi0);
    d = d - twoPi * Math.floor(d / twoPi);
    if (d === 0) d = twoPi;
    return d;
  });
  marks.sort((a, b) => a - b);
  marks.push(twoPi);
  let a = phi0;
  let ga = g0;
  for (const d of marks) {
    const b = phi0 + dir * d;
    const gb = trig2(g, b);
    if (gb === 0) return b;
    if (Math.sign(gb) !== Math.sign(ga)) {
      const lo = Math.min(a, b);
      const hi = Math.max(a, b);
      return brentRoot((x) => trig2(g, x), lo, hi, { xtol: 1e-15 }).root;
    }
    a = b;
    ga = gb;
  }
  // touching zero (a double root at an extremum): the extremum closest to zero is the rest angle
  let best = phi0;
  let bv = Infinity;
  for (const c of crit) {
    if (Math.abs(c.value) < bv) {
      bv = Math.abs(c.value);
      best = c.phi;
    }
  }
  return best;
}

/** Velocity against B_z (T) for fixed other drives, with the Walker fields. */
export interface VelocityCurve {
  drive: number[];
  velocity: number[];
  /** 1 where the wall precesses (above breakdown), 0 where it moves steadily. */
  precessing: number[];
}

export function velocityFieldCurve(m: WallMotionModel, drive: WallDrive, fields: ArrayLike<number>, phiStart?: number): VelocityCurve {
  const out: VelocityCurve = { drive: [], velocity: [], precessing: [] };
  const phi0 = phiStart ?? wallEquilibriumAngle(m, { Bx: drive.Bx, By: drive.By, BFL: drive.BFL });
  for (let i = 0; i < fields.length; i++) {
    const r = wallMotion(m, { ...drive, Bz: fields[i]! }, phi0);
    out.drive.push(fields[i]!);
    out.velocity.push(r.velocity);
    out.precessing.push(r.regime === "precessing" ? 1 : 0);
  }
  return out;
}

/** Options of the time integration. */
export interface WallTraceOptions {
  /** Duration (s). */
  duration: number;
  /** Number of reported times (default 401). */
  points?: number;
  phiStart?: number;
  qStart?: number;
  rtol?: number;
  atol?: number;
}

export interface WallTrace {
  t: number[];
  q: number[];
  phi: number[];
  /** Times (s) at which phi has turned by a whole multiple of 2 pi from its start (events). */
  turnTimes: number[];
  /** q at those times (m). */
  turnPositions: number[];
  solution: Pick<OdeSolution, "accepted" | "rejected" | "evaluations">;
}

const NS = 1e-9;

/** Integrate q(t), phi(t) with Dormand-Prince 5(4) (state q / Delta and phi, time in ns). */
export function wallTrace(m: WallMotionModel, drive: WallDrive, options: WallTraceOptions): WallTrace {
  const { phiDot, qDot } = wallRates(m, drive);
  if (!(options.duration > 0) || !Number.isFinite(options.duration)) throw new InputError("duration", options.duration, "a positive finite time in s");
  const points = options.points ?? 401;
  if (!Number.isInteger(points) || points < 2 || points > 100000) throw new InputError("points", points, "a whole number from 2 to 100000");
  const phi0 = options.phiStart ?? wallEquilibriumAngle(m, { Bx: drive.Bx, By: drive.By, BFL: drive.BFL });
  const q0 = options.qStart ?? 0;
  const T1 = options.duration / NS;
  const tEval = Array.from({ length: points }, (_, i) => (i === points - 1 ? T1 : (T1 * i) / (points - 1)));
  const rhs = (_t: number, y: Float64Array, dy: Float64Array): void => {
    dy[0] = (trig2(qDot, y[1]!) / m.Delta) * NS;
    dy[1] = trig2(phiDot, y[1]!) * NS;
  };
  const sol = integrateDormandPrince(rhs, 0, [q0 / m.Delta, phi0], T1, {
    rtol: options.rtol ?? 1e-10,
    atol: options.atol ?? 1e-12,
    tEval,
    events: [{ g: (_t, y) => Math.sin((y[1]! - phi0) / 2) }],
  });
  return {
    t: sol.t.map((x) => x * NS),
    q: sol.y.map((y) => y[0]! * m.Delta),
    phi: sol.y.map((y) => y[1]!),
    turnTimes: sol.tEvents[0]!.map((x) => x * NS),
    turnPositions: sol.yEvents[0]!.map((y) => y[0]! * m.Delta),
    solution: { accepted: sol.accepted, rejected: sol.rejected, evaluations: sol.evaluations },
  };
}

/**
 * The same motion found by time integration alone (no closed form used): integrate until phi has
 * turned by 2 pi (event) and take Dq / T over that turn, or, when no turn happens, integrate until
 * phi is at rest to 1e-10 of its rate scale and take dq/dt there.
 */
export function wallMotionByIntegration(m: WallMotionModel, drive: WallDrive, phiStart?: number, rtol = 1e-11): WallMotion {
  const { phiDot, qDot } = wallRates(m, drive);
  const phi0 = phiStart ?? wallEquilibriumAngle(m, { Bx: drive.Bx, By: drive.By, BFL: drive.BFL });
  const scale = Math.max(Math.abs(phiDot[0]), Math.abs(phiDot[1]), Math.abs(phiDot[2]), Math.abs(phiDot[3]), Math.abs(phiDot[4]), 1e-300);
  const rhs = (_t: number, y: Float64Array, dy: Float64Array): void => {
    dy[0] = (trig2(qDot, y[1]!) / m.Delta) * NS;
    dy[1] = trig2(phiDot, y[1]!) * NS;
  };
  let t = 0;
  let y: ArrayLike<number> = [0, phi0];
  let chunk = 20 / scale / NS; // 20 rate times
  let total = 0;
  for (let round = 0; round < 40; round++) {
    const sol = integrateDormandPrince(rhs, t, y, t + chunk, {
      rtol,
      atol: 1e-14,
      events: [{ g: (_t, yy) => Math.sin((yy[1]! - phi0) / 2), terminal: true }],
    });
    total += sol.accepted;
    if (sol.status === "event") {
      const T = sol.tEnd * NS;
      const Dq = sol.yEnd[0]! * m.Delta;
      return { regime: "precessing", velocity: Dq / T, phi: NaN, period: T, meanPhiRate: (Math.sign(sol.yEnd[1]! - phi0) * 2 * Math.PI) / T, quadraturePoints: total };
    }
    t = sol.tEnd;
    y = sol.yEnd;
    const rate = Math.abs(trig2(phiDot, y[1]!));
    if (rate < 1e-10 * scale) return { regime: "steady", velocity: trig2(qDot, y[1]!), phi: y[1]!, period: Infinity, meanPhiRate: 0, quadraturePoints: total };
    chunk *= 2;
  }
  throw new InputError(
    "drive",
    drive,
    "a drive for which phi either turns or comes to rest within the integration bound",
    "the integration neither found a full turn nor a rest state (at the edge of breakdown?)",
  );
}

/** A time trace with the wall width as a third coordinate. */
export interface BreathingWallTrace extends WallTrace {
  /** Delta(t) (m). */
  Delta: number[];
}

/**
 * The wall with breathing width: q, phi and Delta(t) integrated together (Dormand-Prince 5(4)).
 * With theta = 2 arctan exp(p (x - q) / Delta), the dissipation gains (alpha Ms / 2 gamma)(pi^2 / 6Delta)
 * (dDelta/dt)^2 (Integral u^2 sech^2 u du = pi^2 / 6; the q-Delta cross term vanishes by parity), the
 * gyrotropic term has no Delta, and sigma(Delta) = 2A / Delta + 2 Delta K_eff + C cos^2 phi
 * - pi Delta Ms (B_x cos phi + B_y sin phi) + ..., so
 *   dDelta/dt = -(6 gamma Delta / (alpha Ms pi^2)) [-2A / Delta^2 + 2 K_eff - pi Ms (B_x cos phi + B_y sin phi)],
 * while (1), (2) of the header hold with the instantaneous Delta. C is the thin-film Neel charge
 * energy (ln2 / pi) mu0 Ms^2 t, independent of Delta (the only model accepted here). Without in-plane
 * fields Delta stays at sqrt(A / K_eff) and the rigid results are recovered exactly. Source: the
 * breathing-wall coordinate of A. Thiaville, Y. Nakatani, J. Miltat, Y. Suzuki, EPL 69, 990 (2005)
 * (from memory), rederived here.
 */
export function wallTraceBreathing(m: WallMotionModel, drive: WallDrive, options: WallTraceOptions & { DeltaStart?: number }): BreathingWallTrace {
  if (m.chargeModel !== "thin-film") throw new InputError("chargeModel", m.chargeModel, '"thin-film" (the breathing wall uses the Delta-independent thin-film Neel charge energy)');
  const d = driveOf(drive);
  if (!(options.duration > 0) || !Number.isFinite(options.duration)) throw new InputError("duration", options.duration, "a positive finite time in s");
  const points = options.points ?? 401;
  if (!Number.isInteger(points) || points < 2 || points > 100000) throw new InputError("points", points, "a whole number from 2 to 100000");
  const D0 = m.Delta;
  const Dstart = options.DeltaStart ?? D0;
  if (!(Dstart > 0)) throw new InputError("DeltaStart", options.DeltaStart, "a positive wall width in m");
  const phi0 = options.phiStart ?? wallEquilibriumAngle(m, { Bx: drive.Bx, By: drive.By, BFL: drive.BFL });
  const p = m.polarity;
  const g = m.gamma;
  const a = m.alpha;
  const By = d.By + d.BFL;
  const T1 = options.duration / NS;
  const rhs = (_t: number, y: Float64Array, dy: Float64Array): void => {
    const phi = y[1]!;
    const De = y[2]! * D0;
    const c = Math.cos(phi);
    const sn = Math.sin(phi);
    const dsig = -p * Math.PI * m.D * sn - m.C * 2 * sn * c + Math.PI * De * m.Ms * (d.Bx * sn - By * c);
    const A1 = g * d.Bz + (p * d.beta * d.u) / De + (Math.PI / 2) * g * d.BDL * c;
    const A2 = (p * d.u) / De + (g * dsig) / (2 * m.Ms * De);
    const phiDot = (A1 - a * A2) / (1 + a * a);
    const qDot = (p * De * (a * A1 + A2)) / (1 + a * a);
    const dSdD = (-2 * m.A) / (De * De) + 2 * m.Keff - Math.PI * m.Ms * (d.Bx * c + By * sn);
    const DDot = -((6 * g * De) / (a * m.Ms * Math.PI * Math.PI)) * dSdD;
    dy[0] = (qDot / D0) * NS;
    dy[1] = phiDot * NS;
    dy[2] = (DDot / D0) * NS;
  };
  const tEval = Array.from({ length: points }, (_, i) => (i === points - 1 ? T1 : (T1 * i) / (points - 1)));
  const sol = integrateDormandPrince(rhs, 0, [(options.qStart ?? 0) / D0, phi0, Dstart / D0], T1, {
    rtol: options.rtol ?? 1e-10,
    atol: options.atol ?? 1e-12,
    tEval,
    events: [{ g: (_t, y) => Math.sin((y[1]! - phi0) / 2) }],
  });
  return {
    t: sol.t.map((x) => x * NS),
    q: sol.y.map((y) => y[0]! * D0),
    phi: sol.y.map((y) => y[1]!),
    Delta: sol.y.map((y) => y[2]! * D0),
    turnTimes: sol.tEvents[0]!.map((x) => x * NS),
    turnPositions: sol.yEvents[0]!.map((y) => y[0]! * D0),
    solution: { accepted: sol.accepted, rejected: sol.rejected, evaluations: sol.evaluations },
  };
}
