/**
 * Rigid motion of an isolated axisymmetric skyrmion in a thin film (Thiele equation) under a force,
 * spin-transfer torque (u, beta) and a damping-like spin-orbit torque, with the gyrovector and the
 * dissipation taken from a radial profile (the 360-degree-wall ansatz or the exact profile of
 * walls/skyrmionAnsatz.ts and walls/skyrmionExact.ts).
 *
 * Conventions (as in the rest of the library): background m = +z, core at -z, skyrmion number
 * Q = (1/4pi) Integral m . (d_x m x d_y m) d^2r, so the core-down skyrmion of vorticity +1 has Q = -1;
 * helicity h in m = (sin theta cos(varphi + h), sin theta sin(varphi + h), cos theta).
 *
 * Derivation (ours, after A. Thiele, PRL 30, 230 (1973)). For a rigid texture m(r - X(t)) the LLG
 * equation with Zhang-Li torques, dm/dt + (u.grad) m = -gamma m x B + alpha m x dm/dt + beta m x (u.grad) m,
 * crossed with m, dotted with d_i m and integrated over the film (thickness t) gives
 *   F_i + G_ij (v - u)_j - D_ij (alpha v - beta u)_j = 0,
 *   G_ij = (Ms t / gamma) Integral m . (d_i m x d_j m) d^2r,  so G_xy = -G_yx = G = 4 pi Q Ms t / gamma,
 *   D_ij = (Ms t / gamma) Integral d_i m . d_j m d^2r = delta_ij Dis,
 *   Dis = (Ms t / gamma) pi Integral (theta'^2 + sin^2 theta / rho^2) rho drho = (Ms t / gamma) pi I,
 * and F = -dE/dX (N) any external force; I = 4 exactly for the Belavin-Polyakov profile (its exchange
 * energy is 8 pi A t, A. Belavin, A. Polyakov, JETP Lett. 22, 245 (1975)), I ~ 2 (R/w + w/R) for the
 * ansatz with R >~ 3w.
 * Solving the 2x2 system: with a = alpha Dis, det = a^2 + G^2, R_x = -F_x + G u_y - beta Dis u_x,
 * R_y = -F_y - G u_x - beta Dis u_y: v_x = -(a R_x + G R_y) / det, v_y = (G R_x - a R_y) / det.
 * Checks: beta = alpha gives v = u; a pure force F x^ moves the skyrmion with tan(angle) = -G / (alpha Dis).
 * Damping-like spin-orbit torque -gamma m x (B_DL m x y^) (spin polarization along +y, see
 * wallMotion.ts): its force is F_i = -Ms t Integral B_DL (m x y^) . d_i m d^2r, which for the
 * axisymmetric profile integrates (over the angle) to
 *   F = pi Ms t B_DL I_D (cos h, -sin h),   I_D = Integral (theta' + sin theta cos theta / rho) rho drho (m),
 * the integral of the interfacial DMI energy: the force turns with the helicity (Neel h = 0 along x,
 * Bloch h = pi/2 along -y). Sources for the current-driven forms: J. Iwasaki, M. Mochizuki, N. Nagaosa,
 * Nat. Nanotechnol. 8, 742 (2013); R. Tomasello et al., Sci. Rep. 4, 6784 (2014) (from memory); the
 * coefficients above are our own derivation and are checked in test/lib/dynamics/skyrmionDrift.test.ts.
 * Assumptions: rigid profile (no deformation or breathing), no pinning, T = 0, thin film.
 */
import { InputError } from "../errors.js";
import { gammaElectron } from "../quantity/constants.js";
import { type Film } from "../material/film.js";
import { compositeGaussLegendre } from "../numeric/gaussLegendre.js";
import { ansatzProfile, solveSkyrmionAnsatz } from "../walls/skyrmionAnsatz.js";
import { solveSkyrmionExact } from "../walls/skyrmionExact.js";
import type { RadialProfile } from "../walls/skyrmionEnergy.js";

/** Integrals of an axisymmetric profile that enter the Thiele equation. */
export interface ThieleIntegrals {
  /** I = Integral (theta'^2 + sin^2 theta / rho^2) rho drho (dimensionless). */
  dissipation: number;
  /** I_D = Integral (theta' + sin theta cos theta / rho) rho drho (m); negative for a core-down skyrmion. */
  dmi: number;
  /** Skyrmion number of the profile (vorticity +1), see skyrmionNumberOfProfile. */
  charge: number;
}

/**
 * Skyrmion number of an axisymmetric profile of vorticity +1: Q = (1/2) Integral sin theta theta' drho
 * = (cos theta(0) - cos theta(inf)) / 2, so -1 for a core-down skyrmion on a +z background.
 */
export function skyrmionNumberOfProfile(profile: RadialProfile): number {
  const c0 = Math.cos(profile.theta(0));
  const c1 = Math.cos(profile.theta(profile.rhoMax));
  return Math.round(((c0 - c1) / 2) * 1e9) / 1e9;
}

/** The Thiele integrals of a profile by composite Gauss-Legendre quadrature (panels of scale / 4, graded near the axis). */
export function thieleIntegrals(profile: RadialProfile): ThieleIntegrals {
  const { rhoMax, scale } = profile;
  if (!(scale > 0) || !(rhoMax > scale)) throw new InputError("profile", { scale, rhoMax }, "a radial profile with 0 < scale < rhoMax");
  const core = Math.max(0, profile.saturatedCore ?? 0);
  const breaks: number[] = [];
  // graded panels near the axis, then uniform panels of scale / 4 up to rhoMax
  const h = scale / 4;
  if (core > 0) breaks.push(0, core);
  else {
    breaks.push(0);
    for (let k = 12; k >= 1; k--) breaks.push(h / 2 ** k);
  }
  // uniform panels of scale / 4 over the body of the profile, then geometric panels (ratio 1.25)
  // for algebraic tails (Belavin-Polyakov) up to rhoMax
  const x0 = breaks[breaks.length - 1]!;
  const uniformEnd = Math.min(rhoMax, x0 + 2000 * h);
  const nPanels = Math.ceil((uniformEnd - x0) / h);
  for (let i = 1; i <= nPanels; i++) breaks.push(x0 + ((uniformEnd - x0) * i) / nPanels);
  let x = uniformEnd;
  while (x < rhoMax && breaks.length < 20000) {
    x = Math.min(rhoMax, x * 1.25);
    breaks.push(x);
  }
  const { x: nodes, w } = compositeGaussLegendre(breaks, 10);
  let I = 0;
  let ID = 0;
  for (let i = 0; i < nodes.length; i++) {
    const r = nodes[i]!;
    const th = profile.theta(r);
    const dth = profile.dtheta(r);
    const s = Math.sin(th);
    I += w[i]! * (dth * dth * r + (s * s) / r);
    ID += w[i]! * (dth * r + s * Math.cos(th));
  }
  // the saturated core contributes nothing to I and I_D (theta = pi, theta' = 0)
  return { dissipation: I, dmi: ID, charge: skyrmionNumberOfProfile(profile) };
}

/** Drive and film data of the Thiele equation (SI). */
export interface ThieleInput {
  Ms: number;
  t: number;
  alpha: number;
  gamma?: number;
  /** Skyrmion number (default -1: core down on a +z background). */
  Q?: number;
  /** Helicity h (rad). */
  helicity: number;
  integrals: Pick<ThieleIntegrals, "dissipation" | "dmi">;
  /** Spin-drift velocity (m/s) along +x (electron flow), and beta. */
  u?: number;
  beta?: number;
  /** Damping-like spin-orbit field mu0 H_DL (T). */
  BDL?: number;
  /** External force (N), [Fx, Fy]. */
  force?: [number, number];
}

export interface ThieleResult {
  vx: number;
  vy: number;
  speed: number;
  /** Angle of the velocity from +x (rad): the skyrmion Hall angle for a drive along +x. */
  hallAngle: number;
  /** G (kg/s), Dis (kg/s), and the spin-orbit force (N). */
  gyrocoupling: number;
  dissipation: number;
  spinOrbitForce: [number, number];
}

export function thieleVelocity(inp: ThieleInput): ThieleResult {
  const gamma = inp.gamma ?? gammaElectron;
  const Q = inp.Q ?? -1;
  for (const [k, v] of Object.entries({ Ms: inp.Ms, t: inp.t, alpha: inp.alpha, gamma })) {
    if (!(v > 0) || !Number.isFinite(v)) throw new InputError(k, v, "a positive finite number (SI)");
  }
  const I = inp.integrals.dissipation;
  if (!(I > 0)) throw new InputError("dissipation", I, "a positive dissipation integral");
  const pre = (inp.Ms * inp.t) / gamma;
  const G = 4 * Math.PI * Q * pre;
  const Dis = pre * Math.PI * I;
  const u = inp.u ?? 0;
  const beta = inp.beta ?? 0;
  const B = inp.BDL ?? 0;
  const Fs: [number, number] = [
    Math.PI * inp.Ms * inp.t * B * inp.integrals.dmi * Math.cos(inp.helicity),
    -Math.PI * inp.Ms * inp.t * B * inp.integrals.dmi * Math.sin(inp.helicity),
  ];
  const Fx = Fs[0] + (inp.force?.[0] ?? 0);
  const Fy = Fs[1] + (inp.force?.[1] ?? 0);
  const a = inp.alpha * Dis;
  const det = a * a + G * G;
  const Rx = -Fx - beta * Dis * u;
  const Ry = -Fy - G * u;
  const vx = -(a * Rx + G * Ry) / det;
  const vy = (G * Rx - a * Ry) / det;
  return { vx, vy, speed: Math.hypot(vx, vy), hallAngle: Math.atan2(vy, vx), gyrocoupling: G, dissipation: Dis, spinOrbitForce: Fs };
}

/** The skyrmion of a film at field B with its profile, from the existing solvers. */
export interface DriftProfile {
  radius: number;
  helicity: number;
  profile: RadialProfile;
  integrals: ThieleIntegrals;
  /** Wall width of the ansatz (m); NaN for the exact profile. */
  wallWidth: number;
  notes: string[];
}

/** The equilibrium skyrmion (ansatz with local magnetostatics, or the exact profile) and its Thiele integrals. */
export function driftProfileOfFilm(film: Film, B: number, kind: "ansatz" | "exact" = "ansatz"): DriftProfile {
  if (kind === "exact") {
    const s = solveSkyrmionExact(film, B);
    if (s.status !== "ok") throw new InputError("D", film.D, "|D| below D_c (an isolated skyrmion; here a spiral is the ground state)");
    return { radius: s.radius, helicity: s.helicity, profile: s.profile, integrals: thieleIntegrals(s.profile), wallWidth: NaN, notes: s.notes };
  }
  const s = solveSkyrmionAnsatz(film, B, { nonlocal: false });
  if (s.status !== "ok") {
    throw new InputError("B", B, "a field at which the film holds a metastable isolated skyrmion", `the ansatz solve reports "${s.status}"`);
  }
  const profile = ansatzProfile(s.radius, s.wallWidth);
  return { radius: s.radius, helicity: s.helicity, profile, integrals: thieleIntegrals(profile), wallWidth: s.wallWidth, notes: s.notes };
}
