/**
 * The spin-1/2 XXZ chain in a transverse and a longitudinal field:
 *
 *   H = sum_i [ Jz S^z_i S^z_{i+1} + Jperp (S^x_i S^x_{i+1} + S^y_i S^y_{i+1}) ] - hx sum_i S^x_i - hz sum_i S^z_i
 *
 * on N sites, periodic (a ring, bond N-1 -> 0 included) or open (N - 1 bonds). Jz > 0 is the
 * antiferromagnet, Jz < 0 the ferromagnet; Delta = Jz / Jperp is the anisotropy (|Delta| > 1:
 * Ising-like). The fields are Zeeman energies (g muB B) in the same energy unit as the exchanges.
 *
 * Energy unit: the functions of this folder take plain numbers in one common energy unit (any).
 * The calculators use E / k_B in kelvin; `energyInKelvin` reads "1.2 meV", "30 GHz" (E = h f) or
 * "14 K" (E = k_B T) with the project's quantity parser.
 *
 * An odd ring with Jz > 0 cannot be Neel ordered: every Ising configuration has at least one
 * ferromagnetic bond, i.e. one domain wall, so its low-lying states form the one-wall band
 * (`ringLabel` says so).
 */
import { InputError } from "../errors.js";
import { parseQuantity, isPlainNumber, type QuantityInput } from "../quantity/units.js";
import { h as planck, kB, e as eCharge } from "../quantity/constants.js";

export type ChainBoundary = "periodic" | "open";

export interface ChainModel {
  /** Number of sites. */
  N: number;
  Jz: number;
  Jperp: number;
  hx: number;
  hz: number;
  boundary: ChainBoundary;
}

/** Largest N handled by the bit-pattern basis (states are 32-bit words; the budget bites earlier). */
export const maxSites = 30;

/** Check a model and return it with defaults; InputErrors name the parameter. */
export function chainModel(m: Partial<ChainModel> & { N: number }): ChainModel {
  const model: ChainModel = {
    N: m.N,
    Jz: m.Jz ?? 1,
    Jperp: m.Jperp ?? 1,
    hx: m.hx ?? 0,
    hz: m.hz ?? 0,
    boundary: m.boundary ?? "periodic",
  };
  if (!Number.isInteger(model.N) || model.N < 2 || model.N > maxSites) {
    throw new InputError("N", m.N, `a whole number of sites from 2 to ${maxSites}`);
  }
  if (model.boundary === "periodic" && model.N < 3) {
    throw new InputError("N", m.N, "at least 3 sites on a ring (N = 2 would count the one bond twice)");
  }
  for (const key of ["Jz", "Jperp", "hx", "hz"] as const) {
    if (!Number.isFinite(model[key])) throw new InputError(key, m[key], "a finite energy");
  }
  if (model.boundary !== "periodic" && model.boundary !== "open") {
    throw new InputError("boundary", m.boundary, '"periodic" or "open"');
  }
  return model;
}

/** Number of bonds: N on a ring, N - 1 on an open chain. */
export function bondCount(model: ChainModel): number {
  return model.boundary === "periodic" ? model.N : model.N - 1;
}

/** A short label: ring or chain, N, and for odd antiferromagnetic rings the forced domain wall. */
export function ringLabel(model: ChainModel): string {
  const kind = model.boundary === "periodic" ? "ring" : "open chain";
  let s = `${kind} of ${model.N} sites`;
  if (model.boundary === "periodic" && model.N % 2 === 1 && model.Jz > 0) {
    s += " (odd antiferromagnetic ring: every state carries at least one domain wall)";
  }
  return s;
}

/**
 * An energy given as "1.2 meV", "30 GHz" (E = h f), "14 K" (E = k_B T), "2e-23 J" or a bare number
 * (read as kelvin): returned as E / k_B in kelvin.
 */
export function energyInKelvin(name: string, raw: QuantityInput): number {
  if (typeof raw === "number" || isPlainNumber(String(raw))) return parseQuantity(name, raw, "K");
  const text = String(raw);
  for (const [unit, toKelvin] of [
    ["K", 1],
    // energies go through eV so that the CODATA 2018 elementary charge is used (mathjs's own eV
    // constant is an older value, 3e-8 relative off)
    ["eV", eCharge / kB],
    ["Hz", planck / kB],
  ] as const) {
    try {
      return parseQuantity(name, text, unit) * toKelvin;
    } catch {
      /* try the next dimension */
    }
  }
  throw new InputError(name, raw, 'an energy with a unit: "1.2 meV", "30 GHz" or "14 K"');
}

/** Energy conversions from kelvin (E / k_B) to meV and GHz (E / h), for output. */
export const kelvinToMeV = (kB / eCharge) * 1e3;
export const kelvinToGHz = (kB / planck) * 1e-9;
