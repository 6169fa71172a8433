/**
 * Fit line profiles: one data set against a catalogue model, a user TypeScript function or a
 * formula string (compiled by mathjs, never eval), and global fits of several data sets with shared
 * and local parameters. All of them build a LeastSquaresProblem and call solveLeastSquares.
 */
import type { EvalFunction, MathNode } from "mathjs";
import { mathExpressions } from "../quantity/mathjs.js";
import { InputError } from "../errors.js";
import { solveLeastSquares, type FitOptions, type FitParameter, type FitResult, type LeastSquaresProblem } from "./leastSquares.js";
import { at, gather } from "../numeric/indexing.js";
import { getProfileModel, profileModels, type ProfileModel } from "./profileModels.js";
import { guessStart } from "./startGuess.js";

export interface ProfileData {
  /** Positions (SI, m). */
  x: ArrayLike<number>;
  /** Measured signal. */
  y: ArrayLike<number>;
  /** Standard deviations of y (optional: then uncertainties are scaled by the reduced chi-square). */
  sigma?: ArrayLike<number> | null;
  /** Notes on how the data were read (a `ProfileCsv` carries them): repeated in the fit's notes. */
  notes?: readonly string[];
}

export interface FitProfileOptions extends FitOptions {
  /** Start values by parameter name (SI). */
  start?: Record<string, number>;
  /** Hold parameters fixed (true: at the start value; a number: at that value) or free (false). */
  fixed?: Record<string, boolean | number>;
  /** Bounds by name. */
  bounds?: Record<string, [number, number]>;
  /**
   * Guess the start values of a catalogue model's parameters from the data (`guessStart`: centre,
   * width, offset, contrast), for every parameter not in `start`; default true. The command
   * (`helicoid fit`) uses exactly this, so a call and the command give the same fit on the same file.
   * User and formula models keep their own start values.
   */
  guess?: boolean;
}

export interface ProfileFitResult extends FitResult {
  model: string;
  title: string;
  assumptions: string[];
  modelSources: string[];
}

/** Apply start / fixed / bounds overrides to a model's default parameters. */
export function configureParameters(defaults: FitParameter[], options: FitProfileOptions = {}): FitParameter[] {
  const names = new Set(defaults.map((p) => p.name));
  for (const group of ["start", "fixed", "bounds"] as const) {
    for (const k of Object.keys(options[group] ?? {})) {
      if (!names.has(k)) throw new InputError(`${group}.${k}`, (options[group] as Record<string, unknown>)[k], `a parameter of the model: ${[...names].join(", ")}`);
    }
  }
  return defaults.map((p) => {
    const q: FitParameter = { ...p };
    const s = options.start?.[p.name];
    if (s !== undefined) q.value = s;
    const f = options.fixed?.[p.name];
    if (typeof f === "number") {
      q.value = f;
      q.fixed = true;
    } else if (typeof f === "boolean") q.fixed = f;
    const b = options.bounds?.[p.name];
    if (b) {
      q.min = b[0];
      q.max = b[1];
    }
    return q;
  });
}

function toArrays(data: ProfileData, label = "data") {
  const m = data.x.length;
  if (data.y.length !== m) throw new InputError(`${label}.y`, `length ${data.y.length}`, `the same length as ${label}.x (${m})`);
  if (data.sigma && data.sigma.length !== m) throw new InputError(`${label}.sigma`, `length ${data.sigma.length}`, `the same length as ${label}.x (${m})`);
  const x = Float64Array.from(data.x);
  for (let i = 0; i < m; i++) if (!Number.isFinite(x[i])) throw new InputError(`${label}.x[${i}]`, x[i], "a finite position");
  return { x, y: Float64Array.from(data.y), sigma: data.sigma ? Float64Array.from(data.sigma) : null, m };
}

/** Fit one profile. `model` is a ProfileModel or a catalogue id. */
export function fitProfile(data: ProfileData, model: ProfileModel | string, options: FitProfileOptions = {}): ProfileFitResult {
  const pm = typeof model === "string" ? getProfileModel(model) : model;
  const { x, y, sigma, m } = toArrays(data);
  const guessed = options.guess === false || !profileModels.includes(pm) ? {} : guessFromData(pm, x, y, options.start ?? {});
  const params = configureParameters(pm.parameters, { ...options, start: { ...guessed, ...(options.start ?? {}) } });
  const bound = pm.bind(x, Float64Array.from(params.map((p) => p.value)));
  const problem: LeastSquaresProblem = { parameters: params, m, y, sigma, model: bound.model, modelJacobian: bound.jacobian };
  const r = solveLeastSquares(problem, options);
  const notes = [...(data.notes ?? []), ...r.notes];
  if (!r.sigmaKnown) notes.push("no sigma column: the standard errors are scaled by the reduced chi-square, which is then no test of the fit");
  return { ...r, notes, model: pm.id, title: pm.title, assumptions: pm.assumptions, modelSources: pm.sources };
}

/** guessStart on the data in position order (a copy; the data are left as given). */
function guessFromData(pm: ProfileModel, x: Float64Array, y: Float64Array, given: Record<string, number>): Record<string, number> {
  if (pm.parameters.every((p) => given[p.name] !== undefined) || x.length < 2) return {};
  let sorted = true;
  for (let i = 1; i < x.length && sorted; i++) if (x[i]! < x[i - 1]!) sorted = false;
  if (sorted) return guessStart(pm, x, y);
  const points = Array.from(x, (xi, i) => ({ x: xi, y: at(y, i, "y") })).sort((a, b) => a.x - b.x);
  return guessStart(
    pm,
    points.map((q) => q.x),
    points.map((q) => q.y),
  );
}

/** A model from a plain TypeScript function of one position and named parameters. */
export function userModel(spec: {
  id?: string;
  title?: string;
  parameters: FitParameter[];
  signalUnit?: string;
  evaluate: (x: number, p: Record<string, number>) => number;
}): ProfileModel {
  if (!spec.parameters?.length) throw new InputError("parameters", spec.parameters, "at least one parameter");
  const names = spec.parameters.map((p) => p.name);
  return {
    id: spec.id ?? "user",
    title: spec.title ?? "user model",
    summary: "a TypeScript function supplied by the user",
    parameters: spec.parameters,
    signalUnit: spec.signalUnit ?? "",
    assumptions: ["as stated by the user"],
    sources: [],
    bind(x) {
      const scope: Record<string, number> = {};
      return {
        model(p, out) {
          names.forEach((n, j) => (scope[n] = p[j]!));
          for (let i = 0; i < x.length; i++) out[i] = spec.evaluate(x[i]!, scope);
        },
      };
    },
  };
}

/**
 * A model from a formula string in the position `x`, e.g. "a + b * tanh((x - x0) / w)", compiled
 * by mathjs (no JavaScript eval). Parameters are the free symbols other than x, pi and e; start
 * values and bounds come from `parameters` (missing ones start at 1).
 */
export function formulaModel(formula: string, parameters: Array<Partial<FitParameter> & { name: string }> = []): ProfileModel {
  let node: MathNode;
  let code: EvalFunction;
  try {
    node = mathExpressions().parse(formula);
    code = mathExpressions().compile(formula);
  } catch (err) {
    throw new InputError("formula", formula, "a mathjs expression in x and the parameters", (err as Error).message);
  }
  const symbols = new Set<string>();
  node.traverse((n: MathNode, _path: string, parent: MathNode | null) => {
    if ((n as unknown as { isSymbolNode?: boolean }).isSymbolNode) {
      const name = (n as unknown as { name: string }).name;
      const isFunctionName = parent && (parent as unknown as { isFunctionNode?: boolean }).isFunctionNode && (parent as unknown as { fn: MathNode }).fn === n;
      if (!isFunctionName && !["x", "pi", "e", "PI", "E", "Infinity"].includes(name)) symbols.add(name);
    }
  });
  if (!/\bx\b/.test(formula)) throw new InputError("formula", formula, "an expression that depends on the position x");
  const given = new Map(parameters.map((p) => [p.name, p]));
  for (const n of given.keys()) if (!symbols.has(n)) throw new InputError(`parameters.${n}`, n, `a symbol of the formula: ${[...symbols].join(", ")}`);
  const params: FitParameter[] = [...symbols].map((name) => ({ value: 1, ...given.get(name), name }));
  return {
    id: "formula",
    title: `formula: ${formula}`,
    summary: "a formula string compiled with mathjs",
    parameters: params,
    signalUnit: "",
    assumptions: ["as stated by the user"],
    sources: [],
    bind(x) {
      const scope: Record<string, number> = {};
      return {
        model(p, out) {
          params.forEach((q, j) => (scope[q.name] = p[j]!));
          for (let i = 0; i < x.length; i++) {
            scope.x = x[i]!;
            const v = code.evaluate(scope);
            out[i] = typeof v === "number" ? v : Number.NaN;
          }
        },
      };
    },
  };
}

export interface GlobalDataset {
  data: ProfileData;
  model: ProfileModel | string;
  /** Per-data-set start values / fixed values of its local parameters. */
  start?: Record<string, number>;
  fixed?: Record<string, boolean | number>;
}

export interface GlobalFitResult extends FitResult {
  /** Parameter name in the result for (data set i, model parameter name). */
  names: Array<Record<string, string>>;
}

/**
 * Fit several data sets at once. Parameters listed in `shared` take one value for all data sets
 * (named as in the model); every other parameter is local and appears as `name[i]`.
 */
export function fitGlobal(datasets: GlobalDataset[], options: FitProfileOptions & { shared: string[] }): GlobalFitResult {
  if (!Array.isArray(datasets) || datasets.length === 0) throw new InputError("datasets", datasets, "a non-empty list of data sets");
  const shared = new Set(options.shared ?? []);
  const params: FitParameter[] = [];
  const index = new Map<string, number>();
  const names: Array<Record<string, string>> = [];
  const parts: Array<{ bound: ReturnType<ProfileModel["bind"]>; map: number[]; off: number; m: number; nModel: number }> = [];
  let off = 0;
  const ys: number[] = [];
  const sigmas: number[] = [];
  let anySigma = false;
  let allSigma = true;
  const pending: Array<{ pm: ProfileModel; arr: ReturnType<typeof toArrays>; map: number[]; local: FitParameter[] }> = [];
  datasets.forEach((ds, i) => {
    const pm = typeof ds.model === "string" ? getProfileModel(ds.model) : ds.model;
    for (const s of shared) if (!pm.parameters.some((p) => p.name === s)) throw new InputError("shared", s, `a parameter of model ${pm.id} (data set ${i})`);
    const local = configureParameters(pm.parameters, {
      start: { ...(options.start ?? {}), ...(ds.start ?? {}) },
      fixed: { ...(options.fixed ?? {}), ...(ds.fixed ?? {}) },
      bounds: options.bounds,
    });
    const arr = toArrays(ds.data, `datasets[${i}]`);
    const map: number[] = [];
    const rec: Record<string, string> = {};
    local.forEach((p) => {
      const key = shared.has(p.name) ? p.name : `${p.name}[${i}]`;
      let j = index.get(key);
      if (j === undefined) {
        j = params.length;
        index.set(key, j);
        params.push({ ...p, name: key });
      }
      map.push(j);
      rec[p.name] = key;
    });
    names.push(rec);
    pending.push({ pm, arr, map, local });
    if (arr.sigma) anySigma = true;
    else allSigma = false;
  });
  if (anySigma && !allSigma) throw new InputError("datasets.sigma", "some data sets without sigma", "sigma for every data set or for none");
  for (const { pm, arr, map, local } of pending) {
    const bound = pm.bind(arr.x, Float64Array.from(local.map((p) => p.value)));
    parts.push({ bound, map, off, m: arr.m, nModel: local.length });
    off += arr.m;
    ys.push(...arr.y);
    if (arr.sigma) sigmas.push(...arr.sigma);
  }
  const m = off;
  const problem: LeastSquaresProblem = {
    parameters: params,
    m,
    y: Float64Array.from(ys),
    sigma: anySigma ? Float64Array.from(sigmas) : null,
    model(p, out) {
      for (const part of parts) {
        const q = Float64Array.from(gather(p, part.map, "parameters"));
        part.bound.model(q, out.subarray(part.off, part.off + part.m));
      }
    },
  };
  if (parts.every((pt) => pt.bound.jacobian)) {
    problem.modelJacobian = (p, out) => {
      out.fill(0);
      for (const part of parts) {
        const q = Float64Array.from(gather(p, part.map, "parameters"));
        const jl = new Float64Array(part.m * part.nModel);
        part.bound.jacobian!(q, jl);
        part.map.forEach((j, c) => {
          for (let i = 0; i < part.m; i++) out[j * m + part.off + i]! += jl[c * part.m + i]!;
        });
      }
    };
  }
  const r = solveLeastSquares(problem, options);
  return { ...r, names };
}
