/**
 * Bloch or Neel: the character of the 180-degree wall of a perpendicular film against its DMI D and
 * thickness t. The phase boundary is the Neel threshold D_N(t) = 2 C(t) / pi, C being the extra
 * magnetostatic energy of the Neel wall's volume charges (walls/wall180.ts): thin-film limit
 * D_N = 2 ln2 mu0 Ms^2 t / pi^2, or the full thin-film kernel (lower for t comparable to Delta).
 * Below D_N the wall is intermediate, cos(gamma) = D / D_N; bulk DMI always gives Bloch walls.
 * Collective-coordinate model after A. Thiaville et al., EPL 100, 57002 (2012); rigid profile of
 * width Delta = sqrt(A / K_eff); magnetization uniform through the thickness.
 */
import { InputError } from "../errors.js";
import { type Film, makeFilm, neelThresholdDmi } from "../material/film.js";
import { equilibriumWall, neelWallChargeEnergy, type NeelChargeModel, type EquilibriumWall } from "./wall180.js";

export interface WallTypeResult {
  wall: EquilibriumWall;
  /** Neel threshold of the thin-film limit (J/m^2). */
  neelThresholdThinFilm: number;
  /** Neel threshold with the full thin-film kernel (J/m^2). */
  neelThresholdFullKernel: number;
  /** A sentence. */
  text: string;
}

function withFilm(f: Film, changes: { D?: number; t?: number }): Film {
  return makeFilm({ ...f, ...changes });
}

/** The wall character of a film, with both thresholds. */
export function wallType(f: Film, model: Exclude<NeelChargeModel, "none"> = "full-kernel"): WallTypeResult {
  const wall = equilibriumWall(f, model);
  const thin = neelThresholdDmi(f);
  const full = (2 * neelWallChargeEnergy(f, "full-kernel")) / Math.PI;
  const mJ = (v: number) => `${(v * 1e3).toPrecision(3)} mJ/m^2`;
  let text: string;
  if (f.dmi === "bulk") text = "Bulk DMI favours Bloch walls, which carry no volume charges: Bloch wall.";
  else if (wall.character === "Neel")
    text = `|D| = ${mJ(Math.abs(f.D))} >= D_N = ${mJ(wall.neelThreshold)}: chiral Neel wall (helicity ${f.D > 0 ? "0, moment toward the up domain" : "pi, moment toward the down domain"}).`;
  else if (wall.character === "Bloch") text = "No DMI: Bloch wall (either sense of rotation).";
  else text = `|D| = ${mJ(Math.abs(f.D))} < D_N = ${mJ(wall.neelThreshold)}: intermediate wall, cos(helicity) = D / D_N = ${wall.cosHelicity.toPrecision(3)}.`;
  return { wall, neelThresholdThinFilm: thin, neelThresholdFullKernel: full, text };
}

function checkPositiveArray(name: string, v: readonly number[]): void {
  if (!Array.isArray(v) || v.length === 0 || v.some((x) => !(x > 0) || !Number.isFinite(x))) {
    throw new InputError(name, v, "a non-empty array of positive finite numbers");
  }
}

/** D_N(t) for each thickness, thin-film limit and full kernel (J/m^2). */
export function neelThresholdCurve(f: Film, thicknesses: readonly number[]): { t: number[]; thinFilm: number[]; fullKernel: number[] } {
  checkPositiveArray("t", thicknesses);
  const t = [...thicknesses];
  const thinFilm = t.map((ti) => neelThresholdDmi(withFilm(f, { t: ti })));
  const fullKernel = t.map((ti) => (2 * neelWallChargeEnergy(withFilm(f, { t: ti }), "full-kernel")) / Math.PI);
  return { t, thinFilm, fullKernel };
}

/** Character codes of the map: 0 Bloch, 1 intermediate, 2 Neel. */
export const wallCharacterCode = { Bloch: 0, intermediate: 1, Neel: 2 } as const;

/**
 * Map of the wall over a grid of D (columns) and t (rows): cos(helicity) (the signed Neel fraction)
 * and the character code. Rows follow `thicknesses`, columns follow `dmis`.
 */
export function wallTypeMap(
  f: Film,
  dmis: readonly number[],
  thicknesses: readonly number[],
  model: Exclude<NeelChargeModel, "none"> = "full-kernel",
): { D: number[]; t: number[]; cosHelicity: number[][]; character: number[][] } {
  if (!Array.isArray(dmis) || dmis.length === 0 || dmis.some((d) => !Number.isFinite(d))) {
    throw new InputError("D", dmis, "a non-empty array of finite DMI values in J/m^2");
  }
  checkPositiveArray("t", thicknesses);
  const cosHelicity: number[][] = [];
  const character: number[][] = [];
  for (const t of thicknesses) {
    // C depends on t (and Delta) only, so one quadrature per row.
    const C = neelWallChargeEnergy(withFilm(f, { t }), model);
    const DN = (2 * C) / Math.PI;
    const cosRow: number[] = [];
    const charRow: number[] = [];
    for (const D of dmis) {
      const c = f.dmi === "bulk" ? 0 : Math.max(-1, Math.min(1, D / DN));
      cosRow.push(c);
      charRow.push(Math.abs(c) === 1 ? 2 : c === 0 ? 0 : 1);
    }
    cosHelicity.push(cosRow);
    character.push(charRow);
  }
  return { D: [...dmis], t: [...thicknesses], cosHelicity, character };
}
