/**
 * Fit crystal-field coefficients B_l^m to measured level energies with the library's weighted
 * least-squares engine (Levenberg-Marquardt, covariance, correlations, optional profile intervals),
 * from several starts because these fits have many minima; the distinct solutions found are listed.
 *
 * Model: the zero-field eigenvalues of H = sum B_l^m O_l^m (ionSpectrum), measured from the lowest;
 * each measured energy is assigned to an eigenvalue index (0-based, ascending). For a Kramers ion the
 * default assignment is the doublets in order (indices 2, 4, 6, ...); a non-Kramers ion needs the
 * assignment given (singlets and doublets are not known in advance).
 * Data: arrays, or CSV text of our own layout (readLevelCsv).
 * Sources: J. Jensen, A. Mackintosh, *Rare Earth Magnetism* (1991), ch. 1 (crystal-field analysis);
 * the engine's sources are listed in fit/leastSquares.ts.
 */
import { InputError } from "../errors.js";
import { solveLeastSquares, type FitResult, type FitOptions } from "../fit/leastSquares.js";
import { seededRandom } from "../numeric/prng.js";
import { ionSpectrum } from "./singleIon.js";
import { parseTermName, twiceJ } from "./stevens.js";

export interface CrystalFieldFitInput {
  J: number;
  gJ?: number;
  /** Coefficients to fit, by name ("B20", "B66", ...): start value and bounds in kelvin. */
  free: Record<string, { start: number; min: number; max: number }>;
  /** Coefficients held fixed (kelvin). */
  fixed?: Record<string, number>;
  /** Measured excitation energies above the ground level (kelvin) and their standard deviations. */
  energies: number[];
  sigmas: number[];
  /** Eigenvalue index (0-based, ascending) of each measured energy; default doublets for Kramers ions. */
  levelIndex?: number[];
  /** Number of starts (the given start plus seeded random ones within the bounds); default 6. */
  starts?: number;
  seed?: number;
  options?: FitOptions;
}

export interface CrystalFieldSolution {
  chiSquare: number;
  values: Record<string, number>;
  fit: FitResult;
}

export interface CrystalFieldFitResult {
  best: FitResult;
  /** Distinct solutions found, lowest chi-square first. */
  solutions: CrystalFieldSolution[];
  levelIndex: number[];
  notes: string[];
}

export function fitCrystalField(input: CrystalFieldFitInput): CrystalFieldFitResult {
  const t = twiceJ(input.J);
  const n = t + 1;
  const names = Object.keys(input.free);
  if (names.length === 0) throw new InputError("free", input.free, "at least one coefficient to fit");
  const all = [...names, ...Object.keys(input.fixed ?? {})];
  const lm = all.map((name) => parseTermName(name));
  const { energies, sigmas } = input;
  if (!Array.isArray(energies) || energies.length === 0 || !energies.every(Number.isFinite))
    throw new InputError("energies", energies, "a non-empty list of finite level energies in kelvin");
  if (!Array.isArray(sigmas) || sigmas.length !== energies.length || !sigmas.every((s) => s > 0))
    throw new InputError("sigmas", sigmas, `${energies.length} positive standard deviations`);
  const kramers = t % 2 === 1;
  let index = input.levelIndex;
  if (!index) {
    if (!kramers) throw new InputError("levelIndex", index, "the eigenvalue index of each measured energy (a non-Kramers ion has singlets and doublets)");
    index = energies.map((_, k) => 2 * (k + 1));
  }
  if (index.length !== energies.length || !index.every((i) => Number.isInteger(i) && i >= 1 && i < n))
    throw new InputError("levelIndex", index, `one eigenvalue index from 1 to ${n - 1} per measured energy`);
  if (names.length > energies.length) throw new InputError("free", names, `at most ${energies.length} coefficients for ${energies.length} measured energies`);
  const fixedVals = all.slice(names.length).map((name) => input.fixed![name]!);
  const m = energies.length;
  const model = (p: Float64Array, out: Float64Array) => {
    const terms = lm.map(({ l, m: mm }, k) => ({ l, m: mm, B: k < names.length ? p[k]! : fixedVals[k - names.length]! }));
    const sp = ionSpectrum({ J: input.J, gJ: input.gJ ?? 1, terms });
    for (let k = 0; k < m; k++) out[k] = sp.energies[index![k]!]! - sp.energies[0]!;
  };
  const runFrom = (start: number[]) =>
    solveLeastSquares(
      {
        parameters: names.map((name, k) => ({
          name,
          value: start[k]!,
          unit: "K",
          min: input.free[name]!.min,
          max: input.free[name]!.max,
          typical: Math.max(Math.abs(input.free[name]!.max), Math.abs(input.free[name]!.min)) / 10,
        })),
        m,
        model,
        y: Float64Array.from(energies),
        sigma: Float64Array.from(sigmas),
      },
      input.options ?? {},
    );
  const nStarts = input.starts ?? 6;
  if (!Number.isInteger(nStarts) || nStarts < 1 || nStarts > 200) throw new InputError("starts", nStarts, "a whole number of starts from 1 to 200");
  const rng = seededRandom(input.seed ?? 1);
  const starts: number[][] = [names.map((name) => input.free[name]!.start)];
  for (let s = 1; s < nStarts; s++) starts.push(names.map((name) => input.free[name]!.min + rng.uniform() * (input.free[name]!.max - input.free[name]!.min)));
  const solutions: CrystalFieldSolution[] = [];
  for (const st of starts) {
    const fit = runFrom(st);
    if (!Number.isFinite(fit.chiSquare)) continue;
    const values = Object.fromEntries(names.map((name) => [name, fit.parameters[name]!.value]));
    const same = solutions.find(
      (s) =>
        Math.abs(s.chiSquare - fit.chiSquare) < 1e-6 * Math.max(1, fit.chiSquare) &&
        names.every((name) => Math.abs(s.values[name]! - values[name]!) < 1e-4 * Math.max(1e-12, Math.abs(input.free[name]!.max - input.free[name]!.min))),
    );
    if (!same) solutions.push({ chiSquare: fit.chiSquare, values, fit });
  }
  if (solutions.length === 0) throw new InputError("free", input.free, "bounds and starts from which the fit can evaluate the model");
  solutions.sort((a, b) => a.chiSquare - b.chiSquare);
  const notes: string[] = [];
  if (solutions.length > 1) notes.push(`${solutions.length} distinct minima from ${nStarts} starts; the lowest chi-square is reported as best, the others are listed`);
  return { best: solutions[0]!.fit, solutions, levelIndex: index, notes };
}

/** 1 meV and 1 cm^-1 in kelvin (CODATA 2018: e, h, c, k_B). */
const unitToKelvin: Record<string, number> = {
  K: 1,
  meV: (1.602176634e-19 * 1e-3) / 1.380649e-23,
  "cm-1": (6.62607015e-34 * 299792458 * 100) / 1.380649e-23,
};

/**
 * Measured levels from CSV text of this library's layout: a header line with `energy_<unit>` and
 * `sigma_<unit>` (unit K, meV or cm-1; both the same) and optionally `index` (eigenvalue index,
 * 0-based), then one level per line; `#` starts a comment. Energies and sigmas are returned in kelvin.
 * Example:
 *   # invented data
 *   energy_meV,sigma_meV,index
 *   2.35,0.05,2
 */
export function readLevelCsv(text: string, source = "levels.csv"): { energies: number[]; sigmas: number[]; levelIndex?: number[] } {
  const lines = text
    .split(/\r?\n/)
    .map((l, i) => ({ l: l.replace(/#.*$/, "").trim(), n: i + 1 }))
    .filter((x) => x.l !== "");
  if (lines.length < 2) throw new InputError(source, text.slice(0, 80), "a header line (energy_<unit>,sigma_<unit>[,index]) and at least one level");
  const header = lines[0]!.l.split(",").map((h) => h.trim());
  const eCol = header.findIndex((h) => h.startsWith("energy_"));
  const sCol = header.findIndex((h) => h.startsWith("sigma_"));
  const iCol = header.indexOf("index");
  if (eCol < 0 || sCol < 0) throw new InputError(`${source} line ${lines[0]!.n}`, lines[0]!.l, "columns energy_<unit> and sigma_<unit> (unit K, meV or cm-1)");
  const unit = header[eCol]!.slice("energy_".length);
  if (!(unit in unitToKelvin) || header[sCol]!.slice("sigma_".length) !== unit)
    throw new InputError(`${source} line ${lines[0]!.n}`, lines[0]!.l, "energy and sigma in the same unit: K, meV or cm-1");
  const f = unitToKelvin[unit]!;
  const energies: number[] = [],
    sigmas: number[] = [],
    index: number[] = [];
  for (const { l, n } of lines.slice(1)) {
    const cells = l.split(",").map((c) => c.trim());
    if (cells.length !== header.length) throw new InputError(`${source} line ${n}`, l, `${header.length} comma-separated values`);
    const e = Number(cells[eCol]),
      s = Number(cells[sCol]);
    if (cells[eCol] === "" || !Number.isFinite(e)) throw new InputError(`${source} line ${n}, ${header[eCol]}`, cells[eCol], "a finite number");
    if (cells[sCol] === "" || !(s > 0) || !Number.isFinite(s)) throw new InputError(`${source} line ${n}, ${header[sCol]}`, cells[sCol], "a positive number");
    energies.push(e * f);
    sigmas.push(s * f);
    if (iCol >= 0) {
      const k = Number(cells[iCol]);
      if (!Number.isInteger(k) || k < 1) throw new InputError(`${source} line ${n}, index`, cells[iCol], "a whole eigenvalue index >= 1");
      index.push(k);
    }
  }
  return iCol >= 0 ? { energies, sigmas, levelIndex: index } : { energies, sigmas };
}
