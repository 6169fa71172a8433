/**
 * Units at the edges: parse user input (SI number or string with units) into an SI number,
 * checked for dimension with mathjs (loaded only when a string with a unit arrives); format SI
 * numbers in the trade's customary units.
 */
import type { Unit } from "mathjs";
import { InputError } from "../errors.js";
import { mu0, h, kB, e } from "./constants.js";
import { mathUnits } from "./mathjs.js";

/** Speed of light in vacuum (exact in the SI), for wavenumbers as energies. */
const c0 = 299792458;

/**
 * mathjs parses units; it is loaded on the first string with a unit (`./mathjs.ts`, which also adds
 * the customary CGS units: Oe, kOe, gauss, emu). Plain SI numbers never load it.
 */
function mathUnit(text: string): Unit {
  return mathUnits().unit(text);
}

/** A value as a user may give it: an SI number, or a string such as "15 pJ/m" or "1.1e6". */
export type QuantityInput = number | string;

const plainNumber = /^\s*[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?\s*$/;

/** True when a typed value is a bare number without a unit ("15", " 1.2e-3 "): read in SI units. */
export function isPlainNumber(raw: string): boolean {
  return plainNumber.test(raw);
}

const dimensionCache = new Map<string, Unit>();
function referenceUnit(siUnit: string): Unit {
  let u = dimensionCache.get(siUnit);
  if (!u) {
    u = mathUnit(`1 ${siUnit}`);
    dimensionCache.set(siUnit, u);
  }
  return u;
}

/**
 * Parse `raw` as a quantity with the dimension of `siUnit` and return its value in `siUnit`.
 * Numbers (and numeric strings) are taken as already in `siUnit`. `name` is the parameter name used
 * in error messages. An empty `siUnit` ("" or "1") means dimensionless.
 * A field asked for in tesla (B = mu0 H) may be given as H ("500 Oe", "40 kA/m"): it is converted
 * with B = mu0 H, the usual convention of the trade.
 */
export function parseQuantity(name: string, raw: QuantityInput, siUnit: string): number {
  if (typeof raw === "number") {
    if (!Number.isFinite(raw)) throw new InputError(name, raw, `a finite number in ${siUnit || "no unit"}`);
    return raw;
  }
  if (typeof raw !== "string") {
    throw new InputError(name, raw, `a number in ${siUnit || "no unit"} or a string with a unit`);
  }
  raw = asTyped(raw);
  if (plainNumber.test(raw)) {
    const v = Number(raw);
    if (!Number.isFinite(v)) throw new InputError(name, raw, `a finite number in ${siUnit || "no unit"}`);
    return v;
  }
  const key = `${siUnit}\u0000${raw.trim()}`;
  const known = knownQuantities.get(key);
  if (known !== undefined) return known;
  const v = parseWithUnit(name, raw, siUnit);
  if (knownQuantities.size >= KNOWN_QUANTITIES_MAX) knownQuantities.clear();
  knownQuantities.set(key, v);
  return v;
}

/**
 * Conversions already made in this thread, by SI unit and text ("15 pJ/m" in J/m): the units are
 * fixed once mathjs is set up, so a text always converts to the same number. A worker thread is
 * handed its caller's (`learnQuantities`) and then never builds mathjs for the same inputs.
 */
const knownQuantities = new Map<string, number>();
const KNOWN_QUANTITIES_MAX = 4096;

/** The conversions this thread has made (for a worker thread: see `learnQuantities`). */
export function knownQuantityConversions(): Array<[string, number]> {
  return [...knownQuantities];
}

/** Adopt conversions made by another thread of this library (finite numbers only). */
export function learnQuantities(entries: ReadonlyArray<readonly [string, number]>): void {
  for (const [k, v] of entries.slice(0, KNOWN_QUANTITIES_MAX)) if (typeof k === "string" && Number.isFinite(v)) knownQuantities.set(k, v);
}

function parseWithUnit(name: string, raw: string, siUnit: string): number {
  const dimensionless = siUnit === "" || siUnit === "1";
  let parsed: Unit;
  try {
    parsed = mathUnit(raw.trim());
  } catch (err) {
    throw new InputError(
      name,
      raw,
      dimensionless ? "a plain number" : `a number with a unit of the dimension of ${siUnit}, such as "${exampleFor(siUnit)}"`,
      (err as Error).message,
    );
  }
  if (dimensionless) {
    throw new InputError(name, raw, "a plain number (this parameter has no unit)");
  }
  const ref = referenceUnit(siUnit);
  if (siUnit === "T" && !parsed.equalBase(ref) && parsed.equalBase(referenceUnit("A/m")) && parsed.value !== null) {
    const B = mu0 * parsed.toNumber("A/m");
    if (!Number.isFinite(B)) throw new InputError(name, raw, "a finite field");
    return B;
  }
  const asEnergy = energyScale(siUnit);
  if (asEnergy !== undefined && parsed.value !== null) {
    const v = energyInJoules(parsed);
    if (v !== undefined) {
      const si = v / asEnergy;
      if (!Number.isFinite(si)) throw new InputError(name, raw, `a finite quantity in ${siUnit}`);
      return si;
    }
  }
  if (!parsed.equalBase(ref)) {
    throw new InputError(name, raw, `a quantity of the dimension of ${siUnit}, such as "${exampleFor(siUnit)}"`, `"${raw}" has the dimension of ${dimensionName(parsed)}`);
  }
  if (parsed.value === null) {
    throw new InputError(name, raw, `a number with its unit, such as "${exampleFor(siUnit)}"`);
  }
  const v = parsed.toNumber(siUnit);
  if (!Number.isFinite(v)) throw new InputError(name, raw, `a finite quantity in ${siUnit}`);
  return v;
}

/**
 * What we print, typed back: superscripts ("mJ/m²", "cm⁻¹"), the micro sign and the Greek mu
 * ("µT", "μm"), the middle dot and the multiplication sign as products ("J·m", "kA/m·T"). mathjs
 * reads the ASCII forms.
 */
function asTyped(raw: string): string {
  return raw
    .replace(/⁻/g, "^-")
    .replace(/¹/g, "1")
    .replace(/²/g, "^2")
    .replace(/³/g, "^3")
    .replace(/\^-\^?/g, "^-")
    .replace(/\^\^/g, "^")
    .replace(/[µμ]/g, "u")
    .replace(/[·×]/g, " ");
}

/**
 * Energies as researchers give them for spins and magnons: an input asked for in kelvin (E / k_B)
 * or in joules accepts any energy (meV, ueV, J), a frequency (GHz: E = h f), a wavenumber
 * (cm^-1: E = h c / lambda) or a temperature (K: E = k_B T). Returns joules per unit of `siUnit`.
 */
function energyScale(siUnit: string): number | undefined {
  if (siUnit === "K") return kB;
  if (siUnit === "J") return 1;
  return undefined;
}

function energyInJoules(u: Unit): number | undefined {
  if (u.equalBase(referenceUnit("J"))) {
    // mathjs defines eV with a 2010 value; the 2019 SI fixes e exactly
    const only = u.units.length === 1 && u.units[0]!.power === 1 ? u.units[0]!.unit.name : "";
    return only === "eV" ? u.toNumber("eV") * e : u.toNumber("J");
  }
  if (u.equalBase(referenceUnit("K"))) return u.toNumber("K") * kB;
  if (u.equalBase(referenceUnit("Hz"))) return u.toNumber("Hz") * h;
  if (u.equalBase(referenceUnit("m^-1"))) return u.toNumber("m^-1") * h * c0;
  return undefined;
}

/** Customary display units of the trade for each SI unit, largest first. */
const customary: Record<string, Array<[string, number]>> = {
  m: [
    ["m", 1],
    ["mm", 1e-3],
    ["um", 1e-6],
    ["nm", 1e-9],
    ["pm", 1e-12],
  ],
  "A/m": [
    ["MA/m", 1e6],
    ["kA/m", 1e3],
    ["A/m", 1],
  ],
  "J/m": [["pJ/m", 1e-12]],
  "J/m^2": [["mJ/m^2", 1e-3]],
  "J/m^3": [
    ["MJ/m^3", 1e6],
    ["kJ/m^3", 1e3],
    ["J/m^3", 1],
  ],
  T: [
    ["T", 1],
    ["mT", 1e-3],
    ["uT", 1e-6],
    ["nT", 1e-9],
  ],
  J: [
    ["aJ", 1e-18],
    ["zJ", 1e-21],
  ],
  s: [
    ["s", 1],
    ["ms", 1e-3],
    ["us", 1e-6],
    ["ns", 1e-9],
    ["ps", 1e-12],
  ],
  "m/s": [["m/s", 1]],
  K: [
    ["K", 1],
    ["mK", 1e-3],
  ],
  Hz: [
    ["THz", 1e12],
    ["GHz", 1e9],
    ["MHz", 1e6],
    ["kHz", 1e3],
    ["Hz", 1],
  ],
  "W/(K m)": [["W/(K m)", 1]],
};

/** The customary unit and its factor for a value in `siUnit` (e.g. 3e-9 m -> ["nm", 1e-9]). */
export function customaryUnit(value: number, siUnit: string): [string, number] {
  const options = customary[siUnit];
  if (!options) return [siUnit, 1];
  const a = Math.abs(value);
  // zero (and a non-number) has no size to choose a prefix by: the SI unit
  if (a === 0 || !Number.isFinite(a)) return options.find(([, f]) => f === 1) ?? [siUnit, 1];
  if (options.length === 1) return options[0]!;
  // lengths of the trade: 0.1 nm and more in nm (an atomic spacing is 0.3 nm, not 300 pm)
  if (siUnit === "m" && a >= 1e-10 * 0.9995 && a < 1e-9) return ["nm", 1e-9];
  for (const opt of options) if (a >= opt[1] * 0.9995) return opt;
  return options[options.length - 1]!;
}

/** Format an SI value in a customary unit with `digits` significant digits: "12.3 nm". */
export function formatQuantity(value: number, siUnit: string, digits = 4): string {
  if (!Number.isFinite(value)) return `${value} ${siUnit}`.trim();
  const [u, f] = customaryUnit(value, siUnit);
  const v = value / f;
  return `${formatNumber(v, digits)}${u && u !== "1" ? " " + displayUnit(u) : ""}`;
}

/** A unit string as shown to people: "um" as "µm", "m^2" as "m²". */
export function displayUnit(u: string): string {
  return u
    .replace(/\bu(?=[mTsJ])/g, "µ")
    .replace(/\^2/g, "²")
    .replace(/\^3/g, "³")
    .replace(/\^-1/g, "⁻¹");
}

/** A number with `digits` significant digits, switching to exponent form for very large or small. */
export function formatNumber(v: number, digits = 4): string {
  if (!Number.isFinite(v)) return String(v);
  if (v === 0) return "0";
  const a = Math.abs(v);
  if (a >= 1e-3 && a < 1e6) return String(Number(v.toPrecision(digits)));
  const [mant, exp] = v.toExponential(digits - 1).split("e");
  return `${Number(mant)}e${exp!.replace("+", "")}`;
}

/** Named dimensions, so an error says "T" rather than "kg / (s^2 A)". */
const namedDimensions = ["T", "A/m", "J/m", "J/m^2", "J/m^3", "J", "m", "s", "K", "Hz", "m/s", "A"];
function dimensionName(u: Unit): string {
  for (const name of namedDimensions) if (u.equalBase(referenceUnit(name))) return name;
  return u.toSI().formatUnits() || "a pure number";
}

function exampleFor(siUnit: string): string {
  const c = customary[siUnit];
  if (!c) return `1 ${siUnit}`;
  return `1 ${c[Math.min(1, c.length - 1)]![0]}`;
}
