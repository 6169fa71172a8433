/**
 * Seeded synthetic line profiles for demos, tests and benchmarks: any catalogue profile model at
 * given parameters plus Gaussian noise, and skyrmion cuts at several fields whose R and w come from
 * the ansatz energy minimum of a film. Synthetic data are invented: label them so wherever shown.
 * Common practice, no source.
 */
import { InputError } from "../errors.js";
import type { Film } from "../material/film.js";
import { solveSkyrmionAnsatz } from "../walls/skyrmionAnsatz.js";
import { wall360Equilibrium } from "../walls/wall360.js";
import { getProfileModel, type ProfileModel } from "./profileModels.js";
import { seededRandom } from "../numeric/prng.js";

export interface SyntheticProfile {
  x: number[];
  y: number[];
  sigma: number[];
  /** Noise-free model values. */
  clean: number[];
  /** Parameters used (SI). */
  truth: Record<string, number>;
}

export interface SyntheticOptions {
  /** Number of points (default 201). */
  points?: number;
  /** Positions from -span/2 to +span/2 around 0 (m; default 300 nm). */
  span?: number;
  /** Standard deviation of the Gaussian noise, in the signal's unit (default 0.02). */
  noise?: number;
  /** Seed of the noise. */
  seed?: number;
}

/** A profile of `model` at `parameters` (missing ones take the model's defaults) with seeded noise. */
export function syntheticProfile(model: ProfileModel | string, parameters: Record<string, number>, options: SyntheticOptions = {}): SyntheticProfile {
  const pm = typeof model === "string" ? getProfileModel(model) : model;
  const n = options.points ?? 201;
  if (!Number.isInteger(n) || n < 2) throw new InputError("points", n, "a whole number >= 2");
  const span = options.span ?? 300e-9;
  if (!(span > 0)) throw new InputError("span", span, "a positive length in m");
  const noise = options.noise ?? 0.02;
  if (!(noise >= 0)) throw new InputError("noise", noise, "a non-negative standard deviation");
  for (const k of Object.keys(parameters))
    if (!pm.parameters.some((p) => p.name === k)) throw new InputError(`parameters.${k}`, parameters[k], `a parameter of ${pm.id}: ${pm.parameters.map((p) => p.name).join(", ")}`);
  const p = Float64Array.from(pm.parameters.map((q) => parameters[q.name] ?? q.value));
  const x = Float64Array.from({ length: n }, (_, i) => -span / 2 + (span * i) / (n - 1));
  const clean = new Float64Array(n);
  pm.bind(x, p).model(p, clean);
  const rng = seededRandom(options.seed ?? 1);
  const y = Array.from(clean, (v) => v + noise * rng.normal());
  const truth: Record<string, number> = {};
  pm.parameters.forEach((q, j) => (truth[q.name] = p[j]!));
  return { x: Array.from(x), y, sigma: new Array(n).fill(noise), clean: Array.from(clean), truth };
}

export interface SyntheticSeriesProfile extends SyntheticProfile {
  B: number;
}

/**
 * m_z cuts ("wall360-mz" unless another model with R and w is given) through isolated skyrmions of
 * `film` at each field, R and w from the ansatz energy minimum; local parameters (x0, offset,
 * contrast ...) from `local`. Throws InputError at a field with no metastable skyrmion.
 */
export function syntheticFieldSeries(
  film: Film,
  fields: number[],
  options: SyntheticOptions & { model?: string; local?: Record<string, number>; nonlocal?: boolean; texture?: "skyrmion" | "wall360" } = {},
): SyntheticSeriesProfile[] {
  let warm: number | undefined;
  return fields.map((B, i) => {
    let R: number;
    let w: number;
    if (options.texture === "wall360") {
      // the 1D pair by numerical minimization of its energy (walls/wall360.ts)
      const e = wall360Equilibrium(film, B);
      if (e.status !== "bound") throw new InputError(`fields[${i}]`, B, "a positive field (a bound 360-degree wall pair)");
      R = e.radius;
      w = e.width;
    } else {
      const s = solveSkyrmionAnsatz(film, B, { nonlocal: options.nonlocal ?? true, startRadius: warm });
      if (s.status !== "ok") throw new InputError(`fields[${i}]`, B, "a field at which the film has a metastable skyrmion", `status ${s.status}: ${s.notes.join(" ")}`);
      warm = s.radius;
      R = s.radius;
      w = s.wallWidth;
    }
    const prof = syntheticProfile(
      options.model ?? "wall360-mz",
      { x0: 0, offset: 0, contrast: 1, ...(options.local ?? {}), R, w },
      { ...options, seed: (options.seed ?? 1) * 1000 + i },
    );
    return { ...prof, B };
  });
}
