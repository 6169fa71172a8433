/**
 * A thin magnetic film: its parameter set, validation and derived quantities (SI throughout).
 *
 * Model: continuum micromagnetics, magnetization uniform through the thickness t, zero temperature.
 * Magnetostatics enter locally through the thin-film shape anisotropy -mu0 Ms^2 / 2 (surface charges
 * of a uniform perpendicular film); non-local corrections belong to the wall and skyrmion modules.
 *
 * Conventions (lib/src/README.md):
 * - Interfacial DMI energy density w = D [m_z div m - (m . grad) m_z]; bulk DMI w = D m . (curl m).
 *   For walls D > 0 (interfacial) makes the central moment of every Neel wall point toward the +z
 *   domain (helicity 0, see walls/wall180.ts); the sign is carried, |D| enters energies.
 * - Quality factor is `qualityFactor`, never `Q` (Q is the skyrmion number).
 */
import { InputError } from "../errors.js";
import { mu0 } from "../quantity/constants.js";
import { parseQuantity, type QuantityInput } from "../quantity/units.js";
import { completeEllipticIntegrals } from "../numeric/ellipticIntegrals.js";

/** Symmetry of the Dzyaloshinskii-Moriya interaction. */
export type DmiSymmetry = "interfacial" | "bulk";

/** A film parameter set, SI units. Frozen once made by `makeFilm`. */
export interface Film {
  /** Saturation magnetization Ms (A/m), > 0. */
  readonly Ms: number;
  /** Exchange stiffness A (J/m), > 0. */
  readonly A: number;
  /** Uniaxial (perpendicular, easy axis z) anisotropy constant Ku (J/m^3), >= 0. */
  readonly Ku: number;
  /** DMI constant D (J/m^2), any sign (sign selects the chirality). */
  readonly D: number;
  /** Symmetry of the DMI. */
  readonly dmi: DmiSymmetry;
  /** Thickness t (m), > 0. */
  readonly t: number;
  /** Gilbert damping alpha (dimensionless), >= 0, optional. */
  readonly alpha?: number;
  /** Gyromagnetic ratio gamma (rad/(s T), i.e. 1/(s T)), > 0, optional. */
  readonly gamma?: number;
}

/** What `makeFilm` accepts: SI numbers or strings with units, e.g. { A: "15 pJ/m", t: "1 nm" }. */
export interface FilmInput {
  Ms?: QuantityInput;
  A?: QuantityInput;
  Ku?: QuantityInput;
  D?: QuantityInput;
  /** Defaults to "interfacial". */
  dmi?: DmiSymmetry | string;
  t?: QuantityInput;
  alpha?: QuantityInput;
  gamma?: QuantityInput;
}

/** SI unit of each film parameter (as understood by `parseQuantity`). */
export const filmUnits = {
  Ms: "A/m",
  A: "J/m",
  Ku: "J/m^3",
  D: "J/m^2",
  t: "m",
  alpha: "",
  gamma: "s^-1 T^-1",
} as const;

function required(raw: FilmInput, name: "Ms" | "A" | "Ku" | "D" | "t"): number {
  const v = raw[name];
  if (v === undefined || v === null) {
    throw new InputError(name, undefined, `a value in ${filmUnits[name]} (a required film parameter)`);
  }
  return parseQuantity(name, v, filmUnits[name]);
}

function parseGamma(v: QuantityInput): number {
  if (typeof v === "string") {
    if (/hz/i.test(v)) {
      throw new InputError("gamma", v, "an angular rate per tesla in rad/(s T) (e.g. 1.76e11); a value in Hz/T is gamma/(2 pi) and would be off by 2 pi");
    }
    // mathjs treats rad as a dimension of its own; gamma is an angular rate, so drop "rad".
    return parseQuantity("gamma", v.replace(/\brad\b\s*/g, ""), filmUnits.gamma);
  }
  return parseQuantity("gamma", v, filmUnits.gamma);
}

/**
 * Make a validated, frozen film from SI numbers or strings with units. The raw object is not changed.
 * Throws `InputError` naming the parameter, the value given and what was expected.
 */
export function makeFilm(raw: FilmInput): Film {
  if (raw === null || typeof raw !== "object") {
    throw new InputError("film", raw, "an object with Ms, A, Ku, D, t (and optionally dmi, alpha, gamma)");
  }
  const Ms = required(raw, "Ms");
  if (!(Ms > 0)) throw new InputError("Ms", raw.Ms, 'a positive saturation magnetization in A/m (e.g. "1.1 MA/m")');
  const A = required(raw, "A");
  if (!(A > 0)) throw new InputError("A", raw.A, 'a positive exchange stiffness in J/m (e.g. "15 pJ/m")');
  const Ku = required(raw, "Ku");
  if (!(Ku >= 0)) throw new InputError("Ku", raw.Ku, 'a non-negative uniaxial anisotropy in J/m^3 (e.g. "1.2 MJ/m^3")');
  const D = required(raw, "D");
  const t = required(raw, "t");
  if (!(t > 0)) throw new InputError("t", raw.t, 'a positive film thickness in m (e.g. "1 nm")');
  const dmiRaw = raw.dmi ?? "interfacial";
  if (dmiRaw !== "interfacial" && dmiRaw !== "bulk") {
    throw new InputError("dmi", raw.dmi, '"interfacial" or "bulk"');
  }
  const film: { -readonly [K in keyof Film]: Film[K] } = { Ms, A, Ku, D, dmi: dmiRaw, t };
  if (raw.alpha !== undefined) {
    const alpha = parseQuantity("alpha", raw.alpha, filmUnits.alpha);
    if (!(alpha >= 0)) throw new InputError("alpha", raw.alpha, "a non-negative Gilbert damping (dimensionless)");
    film.alpha = alpha;
  }
  if (raw.gamma !== undefined) {
    const gamma = parseGamma(raw.gamma);
    if (!(gamma > 0)) throw new InputError("gamma", raw.gamma, "a positive gyromagnetic ratio in rad/(s T) (e.g. 1.76e11)");
    film.gamma = gamma;
  }
  return Object.freeze(film);
}

/** Thin-film shape anisotropy energy density Kd = mu0 Ms^2 / 2 (J/m^3). */
export function shapeAnisotropy(f: Film): number {
  return (mu0 * f.Ms * f.Ms) / 2;
}

/**
 * Effective anisotropy K_eff = Ku - mu0 Ms^2 / 2 (J/m^3): thin-film local shape anisotropy
 * (uniform through the thickness). K_eff > 0: perpendicular easy axis; K_eff < 0: in-plane.
 * Source: A. Hubert, R. Schaefer, Magnetic Domains (Springer 1998).
 */
export function effectiveAnisotropy(f: Film): number {
  return f.Ku - shapeAnisotropy(f);
}

/** Exchange length l_ex = sqrt(2A / (mu0 Ms^2)) (m). */
export function exchangeLength(f: Film): number {
  return Math.sqrt((2 * f.A) / (mu0 * f.Ms * f.Ms));
}

/** Quality factor Q_K = 2 Ku / (mu0 Ms^2) (dimensionless; > 1 means perpendicular). */
export function qualityFactor(f: Film): number {
  return (2 * f.Ku) / (mu0 * f.Ms * f.Ms);
}

/** K_eff, or an InputError if the film is not perpendicular (K_eff <= 0). */
export function requirePerpendicular(f: Film, what = "this calculation"): number {
  const Keff = effectiveAnisotropy(f);
  if (!(Keff > 0)) {
    throw new InputError(
      "Ku",
      f.Ku,
      `Ku > mu0 Ms^2 / 2 = ${shapeAnisotropy(f).toPrecision(4)} J/m^3, so that K_eff = Ku - mu0 Ms^2 / 2 > 0 (a perpendicular film) for ${what}`,
      `K_eff = ${Keff.toPrecision(4)} J/m^3: the film is in-plane magnetized`,
    );
  }
  return Keff;
}

/** Wall width parameter Delta = sqrt(A / K_eff) (m). InputError if K_eff <= 0. */
export function wallWidthParameter(f: Film): number {
  return Math.sqrt(f.A / requirePerpendicular(f, "the wall width Delta = sqrt(A / K_eff)"));
}

/**
 * Energy per unit area of a 180-degree wall without DMI, sigma_0 = 4 sqrt(A K_eff) (J/m^2).
 * Source: L. Landau, E. Lifshitz (1935); Hubert and Schaefer (1998).
 */
export function wallEnergy(f: Film): number {
  return 4 * Math.sqrt(f.A * requirePerpendicular(f, "the wall energy 4 sqrt(A K_eff)"));
}

/**
 * Critical DMI D_c = 4 sqrt(A K_eff) / pi (J/m^2): above it a DMI-favoured Neel wall has negative
 * energy and a spin spiral is the ground state. Source: A. Thiaville et al., EPL 100, 57002 (2012);
 * S. Rohart, A. Thiaville, PRB 88, 184422 (2013).
 */
export function criticalDmi(f: Film): number {
  return (4 * Math.sqrt(f.A * requirePerpendicular(f, "the critical DMI 4 sqrt(A K_eff) / pi"))) / Math.PI;
}

/**
 * Neel threshold D_N = 2 ln2 mu0 Ms^2 t / pi^2 (J/m^2), thin-film limit t << Delta.
 *
 * Derivation (our own, after the collective-coordinate wall energy of Thiaville et al. 2012 and the
 * Neel-wall demagnetizing factor of Tarasenko et al., JMMM 189, 19 (1998)): a wall with in-plane
 * angle psi has sigma(psi) = sigma_0 - pi D cos(psi) + C cos^2(psi), where C is the extra
 * magnetostatic energy per wall area of the Neel wall's volume charges. With the thin-film kernel,
 * C = (mu0 Ms^2 / 2) Integral dk/2pi |m_x(k)|^2 (1 - (1 - e^{-|k|t}) / (|k|t)); for t << Delta,
 * 1 - g ~ |k| t / 2 and m_x(k) = pi Delta sech(pi k Delta / 2) give C = (ln 2 / pi) mu0 Ms^2 t.
 * Minimizing sigma(psi): pure Neel (|cos psi| = 1) once pi |D| >= 2C, i.e. |D| >= D_N = 2C / pi;
 * below, cos psi = D / D_N (an intermediate wall). Verified numerically (full kernel) in
 * test/lib/material/film.test.ts; the finite-thickness value is in walls/wallType.ts.
 * From memory (lib/src/material/README.md) and re-derived here.
 */
export function neelThresholdDmi(f: Film): number {
  return (2 * Math.LN2 * mu0 * f.Ms * f.Ms * f.t) / (Math.PI * Math.PI);
}

/**
 * Period of the chiral spin spiral without anisotropy, L_0 = 4 pi A / |D| (m); Infinity for D = 0.
 * Source: Thiaville et al. (2012); Rohart and Thiaville (2013).
 */
export function spiralPeriod(f: Film): number {
  return f.D === 0 ? Infinity : (4 * Math.PI * f.A) / Math.abs(f.D);
}

/** The equilibrium chiral spiral of a film with uniaxial (local) anisotropy. */
export interface SpiralState {
  /** Is the spiral the ground state (|D| > 4 sqrt(A |K_eff|) / pi)? */
  groundState: boolean;
  /** Equilibrium period (m); Infinity when the spiral is not the ground state. */
  period: number;
  /** Zero-anisotropy period 4 pi A / |D| (m). */
  periodWithoutAnisotropy: number;
  /** Elliptic modulus k of the soliton lattice (1 at the threshold, -> 0 for strong DMI). */
  modulus: number;
  /** Mean energy density relative to the uniform state along the easy axis (J/m^3); 0 if not the ground state. */
  energyDensity: number;
}

/**
 * Equilibrium chiral spiral (soliton lattice) in a uniaxial anisotropy K = |K_eff| (local model,
 * magnetostatics only through K_eff; for K_eff < 0 the rotation passes through the in-plane easy
 * axis and the same result holds with |K_eff|).
 *
 * Derivation: the 1D energy density e = A theta'^2 + K sin^2 theta - D theta' has the first integral
 * A theta'^2 = K (1/k^2 - cos^2 theta). One turn has length L = 4 k Delta K(k) (Delta = sqrt(A/K)),
 * and the mean energy density is
 *   e(k) = [8 sqrt(A K) E(k) / k - 2 pi |D|] / L - K (1/k^2 - 1).
 * de/dk = 0 gives E(k) / k = pi |D| / (4 sqrt(A K)) = |D| / D_c, which has a root k in (0, 1)
 * exactly when |D| > D_c; then L = 4 k Delta K(k) -> 4 pi A / |D| for K -> 0 and -> Infinity for
 * |D| -> D_c. Source: I. Dzyaloshinskii, Sov. Phys. JETP 20, 665 (1965) (soliton lattice; citation from memory);
 * verified by direct minimization of the quadrature energy over the period in
 * test/lib/material/film.test.ts.
 */
export function spiralState(f: Film): SpiralState {
  const periodWithoutAnisotropy = spiralPeriod(f);
  const K = Math.abs(effectiveAnisotropy(f));
  const absD = Math.abs(f.D);
  if (K === 0) {
    const groundState = absD > 0;
    return {
      groundState,
      period: periodWithoutAnisotropy,
      periodWithoutAnisotropy,
      modulus: 0,
      energyDensity: groundState ? -(f.D * f.D) / (4 * f.A) : 0,
    };
  }
  const Dc = (4 * Math.sqrt(f.A * K)) / Math.PI;
  const ratio = absD / Dc;
  if (!(ratio > 1)) {
    return { groundState: false, period: Infinity, periodWithoutAnisotropy, modulus: 1, energyDensity: 0 };
  }
  // Solve E(k)/k = ratio; E(k)/k decreases monotonically from +Infinity (k -> 0) to 1 (k = 1).
  let lo = 0;
  let hi = 1;
  for (let i = 0; i < 200 && hi - lo > 1e-16; i++) {
    const mid = 0.5 * (lo + hi);
    if (mid === lo || mid === hi) break;
    const { E } = completeEllipticIntegrals(mid);
    if (E / mid > ratio) lo = mid;
    else hi = mid;
  }
  const k = 0.5 * (lo + hi);
  const { K: Kk, E: Ek } = completeEllipticIntegrals(k);
  const Delta = Math.sqrt(f.A / K);
  const period = 4 * k * Delta * Kk;
  const energyDensity = ((8 * Math.sqrt(f.A * K) * Ek) / k - 2 * Math.PI * absD) / period - K * (1 / (k * k) - 1);
  return { groundState: true, period, periodWithoutAnisotropy, modulus: k, energyDensity };
}

/** Equilibrium spiral period with anisotropy (m); Infinity when walls are stable (|D| <= D_c). */
export function spiralPeriodWithAnisotropy(f: Film): number {
  return spiralState(f).period;
}

/** A structured statement of what a film does. */
export interface FilmRegime {
  /** Easy direction from K_eff: "perpendicular" (K_eff > 0), "in-plane" (< 0) or "isotropic" (= 0). */
  anisotropy: "perpendicular" | "in-plane" | "isotropic";
  /** "uniform" (domains and walls stable) or "spiral" (a chiral spiral is the ground state). */
  groundState: "uniform" | "spiral";
  /** Wall character in a perpendicular film: "Bloch" (D = 0), "intermediate", or "Neel" (|D| >= D_N). */
  wallCharacter: "Bloch" | "intermediate" | "Neel" | "none";
  /** |D| / D_c (NaN-free: Infinity if D_c = 0 and D != 0, 0 if D = 0). */
  dmiRatio: number;
  /** Is the thin-film assumption t < Delta (or t < l_ex for in-plane films) met? */
  thinFilm: boolean;
  /** The statement in words. */
  text: string;
}

/** Perpendicular or in-plane, walls stable or spiral ground state, Bloch or Neel walls, in words. */
export function filmRegime(f: Film, options: { neelThreshold?: number; neelThresholdModel?: string } = {}): FilmRegime {
  const Keff = effectiveAnisotropy(f);
  const anisotropy = Keff > 0 ? "perpendicular" : Keff < 0 ? "in-plane" : "isotropic";
  const Dc = (4 * Math.sqrt(f.A * Math.abs(Keff))) / Math.PI;
  const absD = Math.abs(f.D);
  const dmiRatio = absD === 0 ? 0 : Dc === 0 ? Infinity : absD / Dc;
  const groundState = dmiRatio > 1 ? "spiral" : "uniform";
  const parts: string[] = [];
  let wallCharacter: FilmRegime["wallCharacter"] = "none";
  let thinFilm: boolean;
  if (anisotropy === "perpendicular") {
    const Delta = Math.sqrt(f.A / Keff);
    thinFilm = f.t < Delta;
    parts.push(`Perpendicular film (K_eff = ${Keff.toPrecision(3)} J/m^3 > 0, quality factor ${qualityFactor(f).toPrecision(3)}).`);
    if (groundState === "uniform") {
      // the caller may pass the threshold of its own (full-kernel) wall model, so that one film gets one verdict
      const DN = options.neelThreshold ?? neelThresholdDmi(f);
      const DNname = options.neelThresholdModel ? `D_N (${options.neelThresholdModel})` : "D_N";
      wallCharacter = absD === 0 ? "Bloch" : absD >= DN ? "Neel" : "intermediate";
      parts.push(`|D| = ${(absD * 1e3).toPrecision(3)} mJ/m^2 is below D_c = ${(Dc * 1e3).toPrecision(3)} mJ/m^2: uniform domains with walls of positive energy are stable.`);
      if (f.dmi === "interfacial") {
        parts.push(
          wallCharacter === "Neel"
            ? `|D| >= ${DNname} = ${(DN * 1e3).toPrecision(3)} mJ/m^2: walls are chiral Neel walls.`
            : wallCharacter === "Bloch"
              ? "No DMI: walls are Bloch walls of either chirality."
              : `|D| < ${DNname} = ${(DN * 1e3).toPrecision(3)} mJ/m^2: walls are intermediate between Bloch and Neel (cos psi = D / D_N).`,
        );
      } else {
        wallCharacter = "Bloch";
        parts.push("Bulk DMI favours chiral Bloch walls, which have no volume charges: walls are Bloch walls.");
      }
    } else {
      parts.push(
        `|D| = ${(absD * 1e3).toPrecision(3)} mJ/m^2 exceeds D_c = ${(Dc * 1e3).toPrecision(3)} mJ/m^2: walls would have negative energy and a chiral spiral is the ground state (period ${(spiralPeriodWithAnisotropy(f) * 1e9).toPrecision(3)} nm).`,
      );
    }
    if (!thinFilm) parts.push(`Thickness t = ${(f.t * 1e9).toPrecision(3)} nm is not below Delta = ${(Delta * 1e9).toPrecision(3)} nm: thin-film results are rough estimates.`);
  } else {
    thinFilm = f.t < exchangeLength(f);
    parts.push(
      anisotropy === "in-plane"
        ? `In-plane film (K_eff = ${Keff.toPrecision(3)} J/m^3 < 0): perpendicular walls and skyrmions of this model do not apply.`
        : "K_eff = 0: no easy axis (isotropic); perpendicular walls do not apply.",
    );
    if (groundState === "spiral") {
      parts.push(
        `|D| exceeds 4 sqrt(A |K_eff|) / pi = ${(Dc * 1e3).toPrecision(3)} mJ/m^2: a chiral spiral is the ground state (period ${(spiralPeriodWithAnisotropy(f) * 1e9).toPrecision(3)} nm, local magnetostatics).`,
      );
    }
  }
  return { anisotropy, groundState, wallCharacter, dmiRatio, thinFilm, text: parts.join(" ") };
}
