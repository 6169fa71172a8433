/**
 * The ansatz skyrmion at one field (see ../skyrmionAnsatz.ts): the state reported among the verified
 * minima of the search, its status when there is none, and the ground state at that field.
 */
import { InputError } from "../../errors.js";
import { criticalDmi, requirePerpendicular, spiralState, wallWidthParameter, type Film } from "../../material/film.js";
import type { SkyrmionEnergyParts } from "../skyrmionEnergy.js";
import { saturationField } from "../wall360.js";
import type { AnsatzOptions } from "./energy.js";
import { findAnsatzMinima, fmtLen, type AnsatzStart, type AnsatzState, type AnsatzVerification } from "./search.js";

/** Result of an ansatz skyrmion solve. */
export interface AnsatzSkyrmion {
  /**
   * "ok": a verified local minimum (stationary, Hessian positive definite, inside the window);
   * "below-window": no minimum, the energy decreases towards R < 0.3 w (the continuum minimum, if
   * any, is smaller than the ansatz window; not a collapse of the continuum model);
   * "expanded": the energy decreases towards R > 100 w (run-away expansion, strip or domain);
   * "spiral": |D| > D_c at B <= B_sat and no minimum found (spiral or strips are lower);
   * "none": no verified minimum and no trend towards an edge.
   */
  status: "ok" | "below-window" | "expanded" | "spiral" | "none";
  /** Radius R (m), m_z = 0 at rho = R; NaN unless status is "ok" (check status). */
  radius: number;
  /** Wall width w (m). */
  wallWidth: number;
  /** Helicity psi (rad). */
  helicity: number;
  /** Energy relative to the uniform film (J), with parts. */
  energy: SkyrmionEnergyParts;
  /** Spiral period with anisotropy (m) when |D| > D_c. */
  spiralPeriod?: number;
  /** Number of energy evaluations. */
  evaluations: number;
  notes: string[];
  /** Every verified minimum at this field, sorted by radius. */
  minima: AnsatzState[];
  /** Verification of the reported state. */
  verification?: AnsatzVerification;
  /** E / (8 pi A t) of the reported state. */
  energyOverBelavinPolyakov?: number;
  /** Ground state at this field and the place of the skyrmion. */
  phase: FieldPhase;
}

/** Wang-Yuan-Wang zero-field estimate R = pi D Delta / sqrt(16 A K_eff - pi^2 D^2) (m); From memory (lib/src/walls/README.md). */
export function zeroFieldRadiusEstimate(film: Film): number {
  const K = requirePerpendicular(film, "the zero-field skyrmion radius estimate");
  const D = Math.abs(film.D);
  const q = 16 * film.A * K - Math.PI * Math.PI * D * D;
  if (!(q > 0)) return Infinity;
  return (Math.PI * D * Math.sqrt(film.A / K)) / Math.sqrt(q);
}

/**
 * Ground state and the place of an isolated skyrmion at field B, in words, from the sign of the
 * 360-degree pair energy (B_sat, local model) and of the skyrmion energy (when one is given).
 */
export interface FieldPhase {
  /** Lowest of the states compared: the uniform film, a spiral or strip domains, or a dense skyrmion array. */
  groundState: "uniform" | "spiral-or-strips" | "skyrmion-array" | "reversed-uniform";
  /** Saturation field B_sat (T) when |D| > D_c, else 0. */
  saturationField: number;
  text: string;
}

/** See FieldPhase. `skyrmionEnergy` (J) is the energy of an isolated skyrmion relative to the uniform film. */
export function fieldPhase(film: Film, B: number, skyrmionEnergy?: number): FieldPhase {
  const Dc = criticalDmi(film);
  const Bsat = Math.abs(film.D) > Dc ? saturationField(film) : 0;
  const mT = (x: number) => `${(x * 1e3).toPrecision(4)} mT`;
  if (B < 0) {
    return {
      groundState: "reversed-uniform",
      saturationField: Bsat,
      text: `B = ${mT(B)} < 0 points against the +z background: the reversed uniform state is lower; the +z background and any skyrmion in it are metastable.`,
    };
  }
  if (Math.abs(film.D) > Dc && B <= Bsat) {
    return {
      groundState: "spiral-or-strips",
      saturationField: Bsat,
      text: `|D| > D_c and B <= B_sat = ${mT(Bsat)}: a 360-degree wall has negative energy, so a spiral or strip-domain state is lower than the uniform film; the uniform film and isolated skyrmions in it are at best metastable.`,
    };
  }
  const above = Math.abs(film.D) > Dc ? `|D| > D_c but B > B_sat = ${mT(Bsat)}: ` : "";
  if (skyrmionEnergy !== undefined && skyrmionEnergy < 0) {
    return {
      groundState: "skyrmion-array",
      saturationField: Bsat,
      text: `${above}the isolated skyrmion has negative energy relative to the uniform film, so a dense array of skyrmions (not computed here) is lower than the uniform film; the isolated skyrmion is not an excitation of the ground state.`,
    };
  }
  return {
    groundState: "uniform",
    saturationField: Bsat,
    text: `${above}the uniform film is the ground state${skyrmionEnergy !== undefined ? "; the isolated skyrmion (positive energy) is a metastable excitation of it" : ""}.`,
  };
}

/**
 * Minimize the ansatz energy for a film at field B (T, along +z, the background direction): all
 * verified minima (findAnsatzMinima); the one reported is the one nearest in ln R to
 * options.startRadius when given, else the lowest in energy; the others are in `minima`.
 * Throws InputError for a non-perpendicular film; ConvergenceError if a search fails.
 */
export function solveSkyrmionAnsatz(film: Film, B: number, options: AnsatzOptions & { starts?: readonly AnsatzStart[] } = {}): AnsatzSkyrmion {
  if (!Number.isFinite(B)) throw new InputError("B", B, "a finite field in T");
  requirePerpendicular(film, "an isolated skyrmion");
  const Delta = wallWidthParameter(film);
  const notes: string[] = [];
  const emptyParts = (): SkyrmionEnergyParts => ({ exchange: 0, anisotropy: 0, dmi: 0, zeeman: 0, magnetostaticSurface: 0, magnetostaticVolume: 0, total: 0 });
  const starts: AnsatzStart[] = [...(options.starts ?? [])];
  if (options.startRadius !== undefined && options.startRadius > 0) {
    starts.push({ radius: options.startRadius, wallWidth: options.startWidth ?? Delta });
  }
  const search = findAnsatzMinima(film, B, { ...options, starts });
  const mT = (x: number) => `${(x * 1e3).toPrecision(4)} mT`;
  notes.push(...search.rejected);
  const Dc = criticalDmi(film);
  const spiral = Math.abs(film.D) > Dc;
  let chosen: AnsatzState | undefined;
  if (search.minima.length > 0) {
    if (options.startRadius !== undefined && options.startRadius > 0) {
      const l = Math.log(options.startRadius);
      chosen = search.minima.reduce((p, q) => (Math.abs(Math.log(q.radius) - l) < Math.abs(Math.log(p.radius) - l) ? q : p));
    } else chosen = search.minima.reduce((p, q) => (q.energy.total < p.energy.total ? q : p));
  }
  const phase = fieldPhase(film, B, chosen?.energy.total);
  if (spiral) notes.push(phase.text);
  if (!chosen) {
    const edgeNotes: string[] = [];
    if (search.decreasesToSmallEdge)
      edgeNotes.push(
        "the energy decreases as R shrinks below 0.3 w, the edge of the ansatz window: the continuum minimum (if any) lies at smaller radius, where the energy approaches the Belavin-Polyakov value 8 pi A t; such a radius is below what a continuum model describes for lattice constants of a few tenths of a nm",
      );
    if (search.decreasesToLargeEdge)
      edgeNotes.push(
        "the energy decreases as R grows towards 100 w, the edge of the ansatz window: run-away expansion towards a strip or reversed domain, or a larger bubble than the window holds",
      );
    const toLarge = search.decreasesToLargeEdge && (!search.decreasesToSmallEdge || search.largeEdgeEnergy < search.smallEdgeEnergy);
    const status: AnsatzSkyrmion["status"] = spiral && B <= phase.saturationField ? "spiral" : toLarge ? "expanded" : search.decreasesToSmallEdge ? "below-window" : "none";
    notes.push(`No verified local minimum of the ansatz energy at B = ${mT(B)} inside the window${edgeNotes.length ? ": " + edgeNotes.join("; ") : ""}.`);
    const out: AnsatzSkyrmion = { status, radius: NaN, wallWidth: NaN, helicity: NaN, energy: emptyParts(), evaluations: search.evaluations, notes, minima: [], phase };
    if (spiral) out.spiralPeriod = spiralState(film).period;
    return out;
  }
  if (search.minima.length > 1) {
    notes.push(
      `${search.minima.length} local minima at this field (R = ${search.minima.map((m) => fmtLen(m.radius)).join(", ")}); the one reported is ${options.startRadius ? "the one continued from the start radius" : "the lowest in energy"}.`,
    );
  }
  const okOut: AnsatzSkyrmion = {
    status: "ok",
    radius: chosen.radius,
    wallWidth: chosen.wallWidth,
    helicity: chosen.helicity,
    energy: chosen.energy,
    evaluations: search.evaluations,
    notes,
    minima: search.minima,
    verification: chosen.verification,
    energyOverBelavinPolyakov: chosen.energyOverBelavinPolyakov,
    phase,
  };
  if (spiral) okOut.spiralPeriod = spiralState(film).period;
  return okOut;
}
