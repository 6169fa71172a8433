/**
 * The 180-degree wall of a perpendicular thin film: profile, magnetization of Bloch, Neel and
 * intermediate walls, named width conventions, energy with and without DMI, and the helicity
 * selected by the DMI against the magnetostatic cost of the Neel wall's volume charges.
 *
 * Geometry and conventions (used by every function here):
 * - The wall normal is +x; the +z ("up") domain is at x < 0, the -z ("down") domain at x > 0.
 *   Polar angle theta(x) = 2 arctan(exp((x - x0) / Delta)), so m_z = cos theta = -tanh((x - x0) / Delta).
 *   Source: L. Landau, E. Lifshitz (1935); A. Hubert, R. Schaefer, Magnetic Domains (1998).
 * - Helicity gamma: the angle of the wall's in-plane moment measured (counter-clockwise about +z) from
 *   the direction that points from the down domain toward the up domain (here -x). So
 *   m = (-sin theta cos gamma, -sin theta sin gamma, cos theta). gamma = 0: Neel wall whose central moment
 *   points toward the up domain; gamma = pi: Neel wall pointing toward the down domain; gamma = +-pi/2:
 *   Bloch walls. This is the helicity of an axisymmetric skyrmion
 *   m = (sin theta cos(phi + gamma), sin theta sin(phi + gamma), cos theta) (core down, background up)
 *   cut along any radius, so walls and skyrmions share one convention.
 * - Interfacial DMI w = D [m_z div m - (m . grad) m_z] gives a wall energy -pi D cos gamma; bulk DMI
 *   w = D m . curl m gives -pi D sin gamma (derived in the comments below; tested by evaluating the
 *   energy densities numerically for both chiralities). Hence D > 0 selects gamma = 0 (interfacial,
 *   Neel toward the up domain) or gamma = +pi/2 (bulk, Bloch); D < 0 selects gamma = pi or -pi/2.
 *
 * Assumptions: continuum, T = 0, magnetization uniform through the thickness t, local magnetostatics
 * through K_eff unless the Neel volume-charge term is asked for. The non-local surface-charge
 * correction is the same for Bloch and Neel walls and is not included.
 */
import { InputError } from "../errors.js";
import { mu0 } from "../quantity/constants.js";
import { integrateHalfLine } from "../numeric/tanhSinhQuadrature.js";
import { type Film, requirePerpendicular, wallWidthParameter } from "../material/film.js";

/** Named helicities (see the module comment). */
export const helicities = {
  /** Neel wall, central moment toward the up (+z) domain: favoured by interfacial D > 0. */
  neelTowardUp: 0,
  /** Neel wall, central moment toward the down (-z) domain: favoured by interfacial D < 0. */
  neelTowardDown: Math.PI,
  /** Bloch wall favoured by bulk D > 0. */
  blochPlus: Math.PI / 2,
  /** Bloch wall favoured by bulk D < 0. */
  blochMinus: -Math.PI / 2,
} as const;

/** Polar angle of the 180-degree wall, theta(x) = 2 arctan(exp((x - x0) / Delta)), from 0 (x -> -inf) to pi. */
export function wallAngle(x: number, Delta: number, x0 = 0): number {
  return 2 * Math.atan(Math.exp((x - x0) / Delta));
}

/** d theta / dx = 1 / (Delta cosh((x - x0) / Delta)) = sin(theta) / Delta. */
export function wallAngleSlope(x: number, Delta: number, x0 = 0): number {
  return 1 / (Delta * Math.cosh((x - x0) / Delta));
}

/** Unit magnetization [m_x, m_y, m_z] of the wall at x for helicity gamma. */
export function wallMagnetization(x: number, Delta: number, helicity: number, x0 = 0): [number, number, number] {
  const u = (x - x0) / Delta;
  const s = 1 / Math.cosh(u); // sin theta
  const mz = -Math.tanh(u); // cos theta
  return [-s * Math.cos(helicity), -s * Math.sin(helicity), mz];
}

/** Width conventions of the same wall, each named. All in m. */
export interface WallWidths {
  /** Wall width parameter Delta = sqrt(A / K_eff) (the length in the profile). */
  Delta: number;
  /** Lilley width pi Delta = pi / theta'(0) (tangent of theta at the centre). */
  lilleyWidth: number;
  /** Slope width of m_z: 2 / |m_z'(0)| = 2 Delta (tangent of m_z at the centre from -1 to +1). */
  mzSlopeWidth: number;
  /** Integral width Integral (1 - m_z^2) dx = Integral sin^2 theta dx = 2 Delta. */
  integralWidth: number;
  /** Full width at half maximum of the in-plane component sin theta = sech(x / Delta): 2 arccosh(2) Delta. */
  inPlaneFwhm: number;
  /** Distance between m_z = +0.8 and m_z = -0.8 (10 to 90 percent of the m_z swing): 2 artanh(0.8) Delta. */
  mz10to90Width: number;
}

/** All named widths for a given Delta. Source: Hubert and Schaefer (1998), sec. 3.6 (width definitions). */
export function wallWidthsFromDelta(Delta: number): WallWidths {
  if (!(Delta > 0) || !Number.isFinite(Delta)) throw new InputError("Delta", Delta, "a positive finite wall width parameter in m");
  return {
    Delta,
    lilleyWidth: Math.PI * Delta,
    mzSlopeWidth: 2 * Delta,
    integralWidth: 2 * Delta,
    inPlaneFwhm: 2 * Math.acosh(2) * Delta,
    mz10to90Width: 2 * Math.atanh(0.8) * Delta,
  };
}

/** All named widths of the film's 180-degree wall. InputError if K_eff <= 0. */
export function wallWidths(f: Film): WallWidths {
  return wallWidthsFromDelta(wallWidthParameter(f));
}

/** Sampled wall profile for plots: x from -span*Delta to +span*Delta. */
export interface WallProfile {
  x: number[];
  theta: number[];
  mx: number[];
  my: number[];
  mz: number[];
  /** Signed in-plane component along the helicity direction, sin theta (>= 0). */
  mInPlane: number[];
}

export function wallProfile(Delta: number, helicity = 0, points = 201, span = 5): WallProfile {
  if (!(Delta > 0)) throw new InputError("Delta", Delta, "a positive wall width parameter in m");
  if (!Number.isInteger(points) || points < 2) throw new InputError("points", points, "a whole number >= 2");
  const out: WallProfile = { x: [], theta: [], mx: [], my: [], mz: [], mInPlane: [] };
  for (let i = 0; i < points; i++) {
    const x = -span * Delta + (2 * span * Delta * i) / (points - 1);
    const [mx, my, mz] = wallMagnetization(x, Delta, helicity);
    out.x.push(x);
    out.theta.push(wallAngle(x, Delta));
    out.mx.push(mx);
    out.my.push(my);
    out.mz.push(mz);
    out.mInPlane.push(1 / Math.cosh(x / Delta));
  }
  return out;
}

/**
 * DMI energy per unit wall area of the wall of helicity gamma (J/m^2).
 * Interfacial: w = D [m_z d_x m_x - m_x d_x m_z] = -D cos(gamma) theta' (with m above), whose integral
 * over theta from 0 to pi is -pi D cos(gamma). Bulk: w = D m . curl m = D [m_z d_x m_y - m_y d_x m_z]
 * = -D sin(gamma) theta', integral -pi D sin(gamma). Exact for any monotonic profile from 0 to pi.
 */
export function dmiWallEnergy(f: Film, helicity: number): number {
  return f.dmi === "interfacial" ? -Math.PI * f.D * Math.cos(helicity) : -Math.PI * f.D * Math.sin(helicity);
}

/** The helicity the DMI alone favours; null without DMI (Bloch, either sense). */
export function dmiFavouredHelicity(f: Film): number | null {
  if (f.D === 0) return null;
  if (f.dmi === "interfacial") return f.D > 0 ? helicities.neelTowardUp : helicities.neelTowardDown;
  return f.D > 0 ? helicities.blochPlus : helicities.blochMinus;
}

/**
 * Energy per unit area of the DMI-favoured chiral wall, local model: sigma = 4 sqrt(A K_eff) - pi |D|
 * (J/m^2); negative above D_c. Sources: Thiaville et al., EPL 100, 57002 (2012); Hubert and Schaefer.
 */
export function chiralWallEnergy(f: Film): number {
  const Keff = requirePerpendicular(f, "the wall energy");
  return 4 * Math.sqrt(f.A * Keff) - Math.PI * Math.abs(f.D);
}

/** 1 - g(z) with g(z) = (1 - e^{-z}) / z, the in-plane (volume-charge) thin-film kernel, without cancellation. */
export function inPlaneKernel(z: number): number {
  if (z < 1e-3) return z / 2 - (z * z) / 6 + (z * z * z) / 24 - (z * z * z * z) / 120;
  return (z + Math.expm1(-z)) / z;
}

/** Magnetostatic model for the Neel wall's volume charges. */
export type NeelChargeModel = "none" | "thin-film" | "full-kernel";

/**
 * Extra magnetostatic energy per unit wall area of a Neel wall over a Bloch wall, C (J/m^2), from the
 * volume charges -Ms d m_x / dx of the profile m_x = sech(x / Delta), uniform through the thickness:
 *   C = (mu0 Ms^2 / 2) Integral dk/2pi |m_x(k)|^2 (1 - g(|k| t)),  m_x(k) = pi Delta sech(pi k Delta / 2)
 *     = mu0 Ms^2 Delta Integral_0^inf sech^2(u) (1 - g(2 t u / (pi Delta))) du      ("full-kernel")
 *     -> (ln 2 / pi) mu0 Ms^2 t  for t << Delta                                       ("thin-film")
 *     -> mu0 Ms^2 Delta          for t >> Delta (bulk Neel wall).
 * Our derivation with the thin-film kernel of the Fourier-space energy (as in R. Beardsley, IEEE
 * Trans. Magn. 25, 671 (1989)); the thin-film limit is the demagnetizing factor N_x = t ln2 / (pi Delta)
 * of M. Tarasenko et al., JMMM 189, 19 (1998) (from memory). The wall profile is kept rigid.
 */
export function neelWallChargeEnergy(f: Film, model: NeelChargeModel = "thin-film"): number {
  if (model === "none") return 0;
  if (model === "thin-film") return (Math.LN2 / Math.PI) * mu0 * f.Ms * f.Ms * f.t;
  const Delta = wallWidthParameter(f);
  const tau = (2 * f.t) / (Math.PI * Delta);
  const integral = integrateHalfLine(
    (u) => {
      const s = 1 / Math.cosh(u);
      return s * s * inPlaneKernel(tau * u);
    },
    0,
    1,
    { relTol: 1e-13 },
  ).value;
  return mu0 * f.Ms * f.Ms * Delta * integral;
}

/** Wall energy of a given helicity (J/m^2): sigma_0 + DMI + C cos^2(gamma). */
export function wallEnergyOfHelicity(f: Film, helicity: number, model: NeelChargeModel = "thin-film"): number {
  const Keff = requirePerpendicular(f, "the wall energy");
  const c = Math.cos(helicity);
  return 4 * Math.sqrt(f.A * Keff) + dmiWallEnergy(f, helicity) + neelWallChargeEnergy(f, model) * c * c;
}

/** The equilibrium 180-degree wall of a film. */
export interface EquilibriumWall {
  /** "Bloch" (|cos gamma| = 0), "Neel" (|cos gamma| = 1) or "intermediate". */
  character: "Bloch" | "Neel" | "intermediate";
  /** Helicity gamma (rad), see the module comment; for D = 0 one of the two degenerate Bloch walls (+pi/2). */
  helicity: number;
  /** cos gamma: the Neel fraction of the in-plane moment, signed. */
  cosHelicity: number;
  /** Is the sense of rotation degenerate (no DMI)? */
  degenerate: boolean;
  /** Energy per unit area with the chosen Neel-charge model (J/m^2). */
  energy: number;
  /** Energy of the DMI-favoured chiral wall in the local model, 4 sqrt(A K_eff) - pi |D| (J/m^2). */
  localEnergy: number;
  /** Neel volume-charge energy C (J/m^2) of the model used. */
  neelChargeEnergy: number;
  /** Neel threshold 2 C / pi of the model used (J/m^2); 0 for bulk DMI (Bloch walls have no charges). */
  neelThreshold: number;
  model: NeelChargeModel;
}

/**
 * Minimize sigma(gamma) = sigma_0 - pi D cos gamma + C cos^2 gamma (interfacial) or
 * sigma_0 - pi D sin gamma + C cos^2 gamma (bulk) over the helicity: interfacial walls are Neel for
 * |D| >= D_N = 2 C / pi and intermediate with cos gamma = D / D_N below; bulk walls are Bloch.
 * Collective-coordinate energy after Thiaville et al., EPL 100, 57002 (2012).
 */
export function equilibriumWall(f: Film, model: NeelChargeModel = "thin-film"): EquilibriumWall {
  const Keff = requirePerpendicular(f, "the wall type");
  const sigma0 = 4 * Math.sqrt(f.A * Keff);
  const C = neelWallChargeEnergy(f, model);
  const localEnergy = sigma0 - Math.PI * Math.abs(f.D);
  let cosG: number;
  let helicity: number;
  const degenerate = f.D === 0;
  if (f.dmi === "bulk") {
    cosG = 0;
    helicity = f.D < 0 ? -Math.PI / 2 : Math.PI / 2;
  } else if (C === 0) {
    cosG = f.D === 0 ? 0 : Math.sign(f.D);
    helicity = f.D === 0 ? Math.PI / 2 : Math.acos(cosG);
  } else {
    const DN = (2 * C) / Math.PI;
    cosG = Math.max(-1, Math.min(1, f.D / DN));
    helicity = Math.acos(cosG);
  }
  const energy = sigma0 + dmiWallEnergy(f, helicity) + C * cosG * cosG;
  const a = Math.abs(cosG);
  return {
    character: a === 0 ? "Bloch" : a === 1 ? "Neel" : "intermediate",
    helicity,
    cosHelicity: cosG,
    degenerate,
    energy,
    localEnergy,
    neelChargeEnergy: C,
    neelThreshold: f.dmi === "bulk" ? 0 : (2 * C) / Math.PI,
    model,
  };
}
