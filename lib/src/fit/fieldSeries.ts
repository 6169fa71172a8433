/**
 * Material parameters A, D (and Ku when the data allow it) from line profiles across isolated
 * skyrmions measured at several fields, with the ansatz energy model of walls/skyrmionAnsatz.ts:
 * R(B) and w(B) are the radius and wall width at the energy minimum for the film (Ms, t and the
 * DMI symmetry given, A, D, Ku varied).
 *
 * Approach (our choice, documented): two stages, with a global fit as the cross-check.
 * 1. Each profile is fitted alone with a profile model that has R and w among its parameters
 *    (default "wall360-mz": offset + contrast * m_z of the ansatz cut); its 2 x 2 covariance of
 *    (R_i, w_i), with the local centre, offset and contrast (and any other local parameter)
 *    marginalized, is kept in full (the R-w correlation is strong and must not be dropped).
 * 2. A, D (Ku) are fitted to the stacked {R_i, w_i} by weighted least squares with the full
 *    block-diagonal covariance (residuals whitened by the Cholesky factor of each block), the
 *    Jacobian of R, w with respect to A, D, Ku from implicit differentiation of the energy minimum
 *    (skyrmionSensitivity.ts); the stage-1 covariances count as known (sigmas known), so the stage-2
 *    chi-square is a test of the energy model itself.
 * Why: when each profile's chi-square is close to quadratic in (R_i, w_i) near its minimum (the
 * Gauss-Newton regime in which any Wald covariance is valid), the profiled global chi-square
 * equals the sum of the stage-1 minima plus sum_i (v_i - v_i(theta))^T C_i^-1 (v_i - v_i(theta)),
 * so stage 2 gives the same estimate and covariance as the global fit; it solves the energy model
 * N_fields times per evaluation instead of coupling it to every profile parameter, works with any
 * profile model (blur, stray field, tilted sensor), localizes a bad profile to its own fit, and
 * exposes a misfit of the energy model (the ansatz, the magnetostatics, the film's Ms and t) in its
 * own chi-square instead of hiding it among thousands of profile residuals. `method: "global"`
 * runs the global fit (shared A, D, Ku; local profile parameters; R_i, w_i tied to the energy
 * minimum) from the two-stage solution, as an independent check (test/lib/fit/fieldSeries.test.ts).
 *
 * Ku: fitted when asked (`fitKu: true`), never (`false`), or, by default ("auto"), when the data
 * determine it: at the A, D optimum with Ku held, the whitened stage-2 Jacobian with Ku included,
 * columns scaled by the parameter values (relative sensitivities), must have full rank with
 * condition number below `maxCondition` (default 1e4) and predict a relative standard error of Ku
 * below `maxKuRelativeError` (default 0.2). The decision, its numbers and the reason are in the
 * result (`kuDecision`).
 *
 * Assumptions: those of the ansatz solver (continuum, T = 0, magnetization uniform through the
 * thickness, the 360-degree-wall ansatz for the profile, non-local thin-film magnetostatics,
 * isolated axisymmetric skyrmions at equilibrium); Ms and t known exactly; the line cut passes
 * through the core; an m_z profile does not see the sign of D (the chirality), which is taken from
 * the start film (decide it from a stray-field or tilted-sensor scan).
 * Sources: F. Buettner, I. Lemesh, G. Beach, Sci. Rep. 8, 4464 (2018) (ansatz, energy);
 * S. Rohart, A. Thiaville, PRB 88, 184422 (2013) (energy functional); D. Bates, D. Watts,
 * Nonlinear Regression Analysis and Its Applications (Wiley 1988) (covariance, linearization).
 */
import { ConvergenceError, InputError } from "../errors.js";
import type { DocumentedResult } from "../result.js";
import type { Film } from "../material/film.js";
import { symmetricEigen } from "../numeric/denseLinalg.js";
import { at } from "../numeric/indexing.js";
import { fitProfile, configureParameters, type FitProfileOptions, type ProfileData, type ProfileFitResult } from "./fitProfile.js";
import { parameterOf, solveLeastSquares, type FitOptions, type FitParameter, type FitResult, type LeastSquaresProblem, type ParameterResult } from "./leastSquares.js";
import { getProfileModel, type BoundModel, type ProfileModel } from "./profileModels.js";
import { guessStart } from "./startGuess.js";
import { filmWith, skyrmionSensitivity, type SeriesParameter, type SkyrmionSensitivity } from "./skyrmionSensitivity.js";
import { wall360Sensitivity } from "./wall360Sensitivity.js";

type Sensitivity = (film: Film, B: number, names: SeriesParameter[], options: { nonlocal: boolean; startRadius?: number }) => SkyrmionSensitivity;
const skyrmionModel: Sensitivity = (f, B, names, o) => skyrmionSensitivity(f, B, names, o);
const wall360Model: Sensitivity = (f, B, names) => wall360Sensitivity(f, B, names);

export interface FieldSeriesProfile {
  /** Applied field mu0 H along +z (T). */
  B: number;
  data: ProfileData;
  /** Start values / fixed values of this profile's local parameters (SI). */
  start?: Record<string, number>;
  fixed?: Record<string, boolean | number>;
}

export interface FieldSeriesOptions {
  /** Confidence level of the intervals (default 0.95). */
  confidence?: number;
  /** Stop flag, checked between evaluations. */
  signal?: { readonly aborted: boolean };
  /** The film: Ms, t, dmi are held; A, D (and Ku) are the start values of the fit. */
  film: Film;
  /** Profile model with parameters R and w (default "wall360-mz"). */
  model?: string | ProfileModel;
  /** Fit Ku: true, false, or "auto" (default: decided from the Jacobian, see the file header). */
  fitKu?: boolean | "auto";
  /** "two-stage" (default) or "global". */
  method?: "two-stage" | "global";
  /**
   * What the profiles cut through: "skyrmion" (default; R(B), w(B) from the 2D ansatz energy) or
   * "wall360" (a 1D 360-degree wall pair, local model, closed form: D does not enter R and w there,
   * so only A and Ku can be fitted; D is held and a note says so).
   */
  texture?: "skyrmion" | "wall360";
  /** Start values of A, D, Ku (SI) overriding the film's. */
  start?: Partial<Record<SeriesParameter, number>>;
  /** Options for every stage-1 profile fit (start / fixed / bounds of local parameters). */
  profileFit?: FitProfileOptions;
  /** Include non-local magnetostatics in the energy model (default true). */
  nonlocal?: boolean;
  /** "auto" Ku rule: largest condition number (default 1e4) and relative Ku error (default 0.2). */
  maxCondition?: number;
  maxKuRelativeError?: number;
  /** Points of the predicted R(B), w(B) curves (default 40). */
  curvePoints?: number;
  /**
   * Profile-likelihood intervals of the free series parameters: true for all of them, or a list
   * of names ("A", "D", "Ku"). Each is stepped with the others refitted until the chi-square rises
   * by the threshold of the least-squares engine (solveLeastSquares, options.profile): the chi^2_1
   * quantile when the errors are known (two-stage: always, the stage-1 covariances; global: when
   * the profiles carry sigmas), else the F-based rule scaled by the reduced chi-square. Two-stage:
   * over the stage-2 chi-square of {R_i, w_i} with their full covariance; global: over the
   * chi-square of all profiles with every local parameter refitted. An open side (a bound of the
   * parameter, the edge of the energy model's domain, or no crossing) is -Infinity / +Infinity
   * with a note. A requested "Ku" that the "auto" rule holds gets no interval and a note.
   */
  profile?: boolean | string[];
}

export interface SeriesProfileResult {
  B: number;
  /** Stage-1 estimates with standard errors (m) and their correlation. */
  R: number;
  w: number;
  stderrR: number;
  stderrW: number;
  correlationRw: number;
  /** R, w of the energy model at the fitted A, D, Ku (m). */
  modelR: number;
  modelW: number;
  /** (estimate - model) / stderr. */
  pullR: number;
  pullW: number;
  fit: ProfileFitResult;
}

export interface KuDecision {
  fitted: boolean;
  requested: boolean | "auto";
  /** Condition number of the relative-sensitivity Jacobian (A, D, Ku) at the Ku-held optimum. */
  conditionNumber: number;
  /** Predicted relative standard error of Ku if it were fitted (null when the Jacobian is singular). */
  kuRelativeStderr: number | null;
  reason: string;
}

export interface FieldSeriesResult extends DocumentedResult {
  status: FitResult["status"];
  message: string;
  approach: "two-stage" | "global";
  /** A (J/m), D (J/m^2), Ku (J/m^3): value, stderr, interval (Ku fixed unless kuDecision.fitted). */
  parameters: Record<SeriesParameter, ParameterResult>;
  freeNames: string[];
  covariance: number[][] | null;
  correlation: number[][] | null;
  /** Chi-square of the energy model against the stage-1 {R_i, w_i} (global: of the profiles). */
  chiSquare: number;
  dof: number;
  chiSquareReduced: number;
  kuDecision: KuDecision;
  profiles: SeriesProfileResult[];
  /** Predicted R(B), w(B) (m) at the fit with one-standard-error bands from the covariance. */
  curve: { B: number[]; R: number[]; w: number[]; stderrR: number[]; stderrW: number[] };
  /** For method "global": the two-stage estimates, for comparison. */
  twoStage?: { parameters: Record<SeriesParameter, ParameterResult>; covariance: number[][] | null };
  film: { Ms: number; t: number; dmi: string };
  confidence: number;
  evaluations: number;
  notes: string[];
  assumptions: string[];
  method: string;
  sources: string[];
}

const UNITS: Record<SeriesParameter, string> = { A: "J/m", D: "J/m^2", Ku: "J/m^3" };
const ASSUMPTIONS = [
  "continuum micromagnetics, T = 0, magnetization uniform through the film thickness",
  "isolated axisymmetric skyrmions at their energy minimum, 360-degree-wall ansatz tan(theta/2) = sinh(R/w)/sinh(rho/w)",
  "energy: exchange, uniaxial anisotropy, interfacial or bulk DMI, Zeeman, local and non-local thin-film magnetostatics",
  "Ms, t and the DMI symmetry known exactly; the line cut passes through the skyrmion core",
  "the sign of D (chirality) is not seen by an m_z profile: it is the start film's",
];
const WALL360_ASSUMPTIONS = [
  "continuum micromagnetics, T = 0, magnetization uniform through the film thickness",
  "straight 360-degree wall pairs at equilibrium in the local 1D model (magnetostatics through K_eff = Ku - mu0 Ms^2 / 2), 2-pi-wall ansatz, exact pair w = Delta / sqrt(1 + h), sinh(R/w) = sqrt((1 + h)/h), h = Ms B / (2 K_eff)",
  "Ms known exactly; the line cut is perpendicular to the pair",
  "D does not enter the 1D pair's R and w (topological DMI energy): it is not determined",
];
const SOURCES = [
  "F. Buettner, I. Lemesh, G. Beach, Sci. Rep. 8, 4464 (2018): skyrmion ansatz and energy",
  "S. Rohart, A. Thiaville, PRB 88, 184422 (2013): energy functional with DMI",
  "D. Bates, D. Watts, Nonlinear Regression Analysis and Its Applications (Wiley 1988): covariance of nonlinear least squares",
];

interface Stage1 {
  B: number;
  fit: ProfileFitResult;
  R: number;
  w: number;
  cov: [number, number, number]; // var R, cov Rw, var w
}

function stage1(profiles: FieldSeriesProfile[], pm: ProfileModel, film: Film, options: FieldSeriesOptions, nonlocal: boolean, sens: Sensitivity): Stage1[] {
  let warm: number | undefined;
  return profiles.map((pr, i) => {
    const base = options.profileFit ?? {};
    const start: Record<string, number> = {};
    try {
      Object.assign(start, guessStart(pm, pr.data.x, pr.data.y));
    } catch {
      // no guess for this model: defaults are used
    }
    const sk = sens(film, pr.B, [], { nonlocal, startRadius: warm });
    if (sk.status === "ok") {
      start.R = sk.R;
      start.w = sk.w;
      warm = sk.R;
    }
    Object.assign(start, base.start ?? {}, pr.start ?? {});
    let fit: ProfileFitResult;
    try {
      fit = fitProfile(pr.data, pm, { ...base, signal: options.signal, start, fixed: { ...(base.fixed ?? {}), ...(pr.fixed ?? {}) } });
    } catch (err) {
      if (err instanceof InputError) throw new InputError(`profiles[${i}]`, `profile at B = ${pr.B} T`, "a profile the model can be fitted to", err.message);
      throw err;
    }
    const iR = fit.freeNames.indexOf("R");
    const iw = fit.freeNames.indexOf("w");
    const pR = parameterOf(fit, "R");
    if (pR.atBound || pR.value <= 0) {
      throw new InputError(`profiles[${i}]`, `profile at B = ${pr.B} T`, "a profile across a skyrmion (the fitted radius ran to 0: no skyrmion in this profile)");
    }
    if (fit.status !== "converged" || iR < 0 || iw < 0 || !fit.covariance) {
      throw new ConvergenceError("field series, stage 1 (profile fit)", `the fit of profile ${i} (B = ${pr.B} T) gave no covariance of R and w: ${fit.message}`, {
        profile: i,
        status: fit.status,
        reason: fit.reason,
        notes: fit.notes,
      });
    }
    const c = fit.covariance;
    const cell = (a: number, b: number) => at(at(c, a, "covariance"), b, "covariance row");
    return { B: pr.B, fit, R: pR.value, w: parameterOf(fit, "w").value, cov: [cell(iR, iR), cell(iR, iw), cell(iw, iw)] as [number, number, number] };
  });
}

/** Whitening factors of the 2 x 2 blocks: Linv such that Linv C Linv^T = 1 (lower triangular). */
function whiteners(s1: Stage1[]) {
  return s1.map((s) => {
    const [a, b, d] = s.cov;
    const l11 = Math.sqrt(a);
    const l21 = b / l11;
    const l22 = Math.sqrt(d - l21 * l21);
    if (!(l22 > 0)) throw new ConvergenceError("field series, stage 1", `the covariance of R and w at B = ${s.B} T is not positive definite`, { cov: s.cov });
    // inverse of [[l11, 0], [l21, l22]]
    return [1 / l11, -l21 / (l11 * l22), 1 / l22] as [number, number, number];
  });
}

/** The energy model at theta for every field, cached on the last theta. */
function energyModel(film: Film, fields: number[], names: SeriesParameter[], nonlocal: boolean, sens: Sensitivity) {
  let lastKey = "";
  let last: SkyrmionSensitivity[] = [];
  let warm: Array<number | undefined> = fields.map(() => undefined);
  return (theta: ArrayLike<number>): SkyrmionSensitivity[] | null => {
    const key = Array.from(theta).join(",");
    if (key === lastKey) return last;
    const values: Partial<Record<SeriesParameter, number>> = {};
    names.forEach((n, j) => (values[n] = theta[j]));
    let out: SkyrmionSensitivity[] | null;
    try {
      const f = filmWith(film, values);
      out = fields.map((B, i) => sens(f, B, names, { nonlocal, startRadius: warm[i] }));
      if (out.some((s) => s.status !== "ok")) out = null;
    } catch (err) {
      // a trial film outside the model's domain (A <= 0, Ku below the shape anisotropy, ...)
      if (err instanceof InputError || err instanceof ConvergenceError) out = null;
      else throw err;
    }
    if (out) {
      warm = out.map((s) => s.R);
      lastKey = key;
      last = out;
    }
    return out;
  };
}

function seriesParameters(film: Film, names: SeriesParameter[], start: Partial<Record<SeriesParameter, number>>): FitParameter[] {
  const v = { A: start.A ?? film.A, D: start.D ?? film.D, Ku: start.Ku ?? film.Ku };
  const all: Record<SeriesParameter, FitParameter> = {
    A: { name: "A", value: v.A, unit: UNITS.A, min: 0, typical: Math.abs(v.A), meaning: "exchange stiffness" },
    D: { name: "D", value: v.D, unit: UNITS.D, ...(v.D >= 0 ? { min: 0 } : { max: 0 }), typical: Math.abs(v.D) || 1e-3, meaning: "DMI constant (sign from the start film)" },
    Ku: { name: "Ku", value: v.Ku, unit: UNITS.Ku, min: 0, typical: Math.abs(v.Ku), meaning: "uniaxial anisotropy" },
  };
  return names.map((n) => all[n]);
}

interface Stage2 {
  fit: FitResult;
  names: SeriesParameter[];
  problem: LeastSquaresProblem;
}

function stage2(
  s1: Stage1[],
  film: Film,
  names: SeriesParameter[],
  start: Partial<Record<SeriesParameter, number>>,
  nonlocal: boolean,
  options: FitOptions,
  sens: Sensitivity,
): Stage2 {
  const L = whiteners(s1);
  const fields = s1.map((s) => s.B);
  const em = energyModel(film, fields, names, nonlocal, sens);
  const n = names.length;
  const N = s1.length;
  const y = new Float64Array(2 * N);
  s1.forEach((s, i) => {
    const [a, b, d] = L[i]!;
    y[2 * i] = a * s.R;
    y[2 * i + 1] = b * s.R + d * s.w;
  });
  const params = seriesParameters(film, names, start);
  const problem: LeastSquaresProblem = {
    parameters: params,
    m: 2 * N,
    y,
    sigma: new Float64Array(2 * N).fill(1),
    model(p, out) {
      const sk = em(p);
      for (const [i, [a, b, d]] of L.entries()) {
        if (!sk) {
          out[2 * i] = NaN;
          out[2 * i + 1] = NaN;
          continue;
        }
        const { R, w } = at(sk, i, "sensitivities");
        out[2 * i] = a * R;
        out[2 * i + 1] = b * R + d * w;
      }
    },
    modelJacobian(p, out) {
      const sk = em(p);
      for (let j = 0; j < n; j++)
        for (const [i, [a, b, d]] of L.entries()) {
          const si = sk ? at(sk, i, "sensitivities") : null;
          const dR = si ? at(si.dR, j, "dR") : NaN;
          const dw = si ? at(si.dw, j, "dw") : NaN;
          out[j * 2 * N + 2 * i] = a * dR;
          out[j * 2 * N + 2 * i + 1] = b * dR + d * dw;
        }
    },
  };
  const f0 = new Float64Array(2 * N);
  problem.model(Float64Array.from(params.map((p) => p.value)), f0);
  if (!Number.isFinite(f0[0])) {
    const f = filmWith(film, Object.fromEntries(params.map((p) => [p.name, p.value])));
    const bad = fields.map((B) => ({ B, s: sens(f, B, [], { nonlocal }).status })).filter((r) => r.s !== "ok");
    throw new InputError(
      "fields",
      bad.map((r) => `${r.B} T (${r.s})`).join(", "),
      "fields at which the start film (A, D, Ku) has a metastable skyrmion",
      "the energy model has no metastable skyrmion there for the start values: give start values of A, D (Ku) closer to the film, or drop those profiles",
    );
  }
  const fit = solveLeastSquares(problem, { ftol: 1e-10, xtol: 1e-10, gtol: 1e-10, ...options });
  return { fit, names, problem };
}

/** Relative-sensitivity condition number and predicted relative Ku error at theta (Ku last). */
function kuDiagnostics(
  s1: Stage1[],
  film: Film,
  base: SeriesParameter[],
  theta: Record<SeriesParameter, number>,
  nonlocal: boolean,
  sens: Sensitivity,
): { condition: number; kuRel: number | null } {
  const L = whiteners(s1);
  const names: SeriesParameter[] = [...base, "Ku"];
  const np = names.length;
  const em = energyModel(
    film,
    s1.map((s) => s.B),
    names,
    nonlocal,
    sens,
  );
  const sk = em(names.map((n) => theta[n]));
  if (!sk) return { condition: Infinity, kuRel: null };
  const N = s1.length;
  const J = new Float64Array(2 * N * np);
  names.forEach((name, j) => {
    const sc = theta[name];
    for (const [i, [a, b, d]] of L.entries()) {
      const si = at(sk, i, "sensitivities");
      const dR = at(si.dR, j, "dR");
      J[j * 2 * N + 2 * i] = a * dR * sc;
      J[j * 2 * N + 2 * i + 1] = (b * dR + d * at(si.dw, j, "dw")) * sc;
    }
  });
  const G = new Float64Array(np * np);
  for (let p = 0; p < np; p++)
    for (let q = 0; q < np; q++) {
      let s = 0;
      for (let i = 0; i < 2 * N; i++) s += J[p * 2 * N + i]! * J[q * 2 * N + i]!;
      G[p + np * q] = s;
    }
  // condition number of J with unit-norm columns (scale-free)
  const dn = names.map((_, p) => Math.sqrt(G[p + np * p]!));
  const Gn = G.map((v, k) => v / (dn[k % np]! * dn[Math.floor(k / np)]!));
  const eig = symmetricEigen(Gn, np);
  const lmin = eig.values[0]!;
  const lmax = eig.values[np - 1]!;
  const condition = lmin > 0 ? Math.sqrt(lmax / lmin) : Infinity;
  if (!(lmin > 1e-14 * lmax)) return { condition, kuRel: null };
  // (G^-1)_{Ku,Ku} from the eigen decomposition of Gn
  const k = np - 1;
  let inv = 0;
  for (let e = 0; e < np; e++) inv += eig.vectors[k + np * e]! ** 2 / eig.values[e]!;
  return { condition, kuRel: Math.sqrt(inv) / dn[k]! };
}

function pick(
  fit: FitResult,
  names: SeriesParameter[],
  film: Film,
  start: Partial<Record<SeriesParameter, number>>,
  confidence: number,
  mapName: (n: SeriesParameter) => string = (n) => n,
): Record<SeriesParameter, ParameterResult> {
  const out = {} as Record<SeriesParameter, ParameterResult>;
  for (const n of ["A", "D", "Ku"] as SeriesParameter[]) {
    if (names.includes(n)) out[n] = { ...parameterOf(fit, mapName(n)), unit: UNITS[n] };
    else {
      const v = start[n] ?? film[n];
      out[n] = { value: v, stderr: null, stderrScaled: null, stderrUnscaled: null, unit: UNITS[n], fixed: true, atBound: false, interval: null };
    }
  }
  void confidence;
  return out;
}

/**
 * The series parameters whose profile intervals are asked for, checked before any fitting:
 * true means every free one; a name must be a series parameter that can be free.
 */
function profileRequest(profile: FieldSeriesOptions["profile"], base: SeriesParameter[], fitKu: boolean | "auto", texture: string): string[] {
  if (profile === undefined || profile === false) return [];
  const allowed: string[] = fitKu === false ? [...base] : [...base, "Ku"];
  if (profile === true) return allowed;
  if (!Array.isArray(profile)) throw new InputError("profile", profile, `true, false or a list of free series parameters (${allowed.join(", ")})`);
  for (const n of profile) {
    if (allowed.includes(n)) continue;
    const why =
      n === "Ku"
        ? "Ku is held (fitKu: false)"
        : n === "D"
          ? `D is held (texture "${texture}": it does not enter R and w)`
          : "Ms, t and the DMI symmetry are held, and local profile parameters (x0, offset, contrast ...) are not series parameters";
    throw new InputError("profile", n, `names of free series parameters: ${allowed.join(", ")}`, why);
  }
  return [...new Set(profile)];
}

/**
 * Open sides of an engine profile interval made explicit: the engine returns the parameter's bound
 * (with a note) when the profile stays below the threshold up to it; that side is -Infinity /
 * +Infinity here, like the engine's other open sides (no crossing, the model's domain ends).
 */
function openSides(problem: LeastSquaresProblem, name: string, iv: [number, number]): [number, number] {
  const p = problem.parameters.find((q) => q.name === name)!;
  return [p.min !== undefined && iv[0] === p.min ? -Infinity : iv[0], p.max !== undefined && iv[1] === p.max ? Infinity : iv[1]];
}

/**
 * Fit A, D (and Ku when the data allow or when asked) to skyrmion line profiles at several fields.
 * Never changes the inputs.
 */
export function fitFieldSeries(profiles: FieldSeriesProfile[], options: FieldSeriesOptions): FieldSeriesResult {
  if (!options || !options.film) throw new InputError("film", options?.film, "a film (makeFilm) with Ms, t, dmi and start values of A, D, Ku");
  const film = options.film;
  if (!Array.isArray(profiles)) throw new InputError("profiles", profiles, "a list of {B, data} profiles");
  profiles.forEach((p, i) => {
    if (!p || !p.data) throw new InputError(`profiles[${i}]`, p, "{B, data: {x, y}}");
    if (!Number.isFinite(p.B)) throw new InputError(`profiles[${i}].B`, p.B, "a finite field in T");
  });
  const distinct = new Set(profiles.map((p) => p.B));
  if (distinct.size < 2) {
    throw new InputError(
      "profiles",
      `${profiles.length} profile(s) at ${distinct.size} field(s)`,
      "profiles at two or more different fields (one field gives R and w only: A and D cannot be separated from the field dependence)",
    );
  }
  const pm = typeof options.model === "string" || options.model === undefined ? getProfileModel(options.model ?? "wall360-mz") : options.model;
  for (const n of ["R", "w"])
    if (!pm.parameters.some((p) => p.name === n)) throw new InputError("model", pm.id, "a profile model with parameters R and w (e.g. wall360-mz, wall360-mz-blur, wall360-bz)");
  const nonlocal = options.nonlocal ?? true;
  const confidence = options.confidence ?? 0.95;
  const start = options.start ?? {};
  const notes: string[] = [];
  const texture = options.texture ?? "skyrmion";
  if (texture !== "skyrmion" && texture !== "wall360") throw new InputError("texture", texture, `"skyrmion" or "wall360"`);
  const sens = texture === "skyrmion" ? skyrmionModel : wall360Model;
  const base: SeriesParameter[] = texture === "skyrmion" ? ["A", "D"] : ["A"];
  if (texture === "wall360")
    notes.push(
      "360-degree walls: the DMI energy of the 1D pair is topological (independent of R and w), so D does not enter R(B), w(B) and is held at the given value; only A (and Ku) are determined",
    );
  const request = profileRequest(options.profile, base, options.fitKu ?? "auto", texture);
  const s1 = stage1(profiles, pm, film, options, nonlocal, sens);
  const lmOptions: FitOptions = { confidence, signal: options.signal };
  // stage 2 with Ku held
  const held = stage2(s1, film, base, start, nonlocal, lmOptions, sens);
  const requested = options.fitKu ?? "auto";
  const thetaHeld = { A: parameterOf(held.fit, "A").value, D: held.fit.parameters.D?.value ?? start.D ?? film.D, Ku: start.Ku ?? film.Ku };
  const diag = kuDiagnostics(s1, film, base, thetaHeld, nonlocal, sens);
  const maxCond = options.maxCondition ?? 1e4;
  const maxRel = options.maxKuRelativeError ?? 0.2;
  const allows = 2 * s1.length > base.length + 1 && diag.kuRel !== null && diag.condition < maxCond && diag.kuRel < maxRel;
  const fitKu = requested === true || (requested === "auto" && allows);
  const cond = Number.isFinite(diag.condition) ? diag.condition.toPrecision(3) : "infinite";
  const relText = diag.kuRel === null ? "undefined (singular Jacobian)" : `${(100 * diag.kuRel).toPrecision(2)} %`;
  let reason: string;
  if (requested === true) reason = `Ku fitted on request; relative-sensitivity condition number ${cond}, predicted relative error of Ku ${relText}`;
  else if (requested === false) reason = `Ku held at the given value on request (the data would give: condition number ${cond}, relative error of Ku ${relText})`;
  else if (fitKu) reason = `Ku fitted: the data determine it (condition number ${cond} < ${maxCond}, predicted relative error of Ku ${relText} < ${100 * maxRel} %)`;
  else if (2 * s1.length <= base.length + 1)
    reason = `Ku held at the given value: ${2 * s1.length} observables (R, w at ${s1.length} fields) cannot fix ${base.length + 1} parameters`;
  else
    reason = `Ku held at the given value: the data do not determine it (condition number ${cond}${diag.condition >= maxCond ? ` >= ${maxCond}` : ""}, predicted relative error of Ku ${relText}${diag.kuRel !== null && diag.kuRel >= maxRel ? ` >= ${100 * maxRel} %` : ""})`;
  const kuDecision: KuDecision = { fitted: fitKu, requested, conditionNumber: diag.condition, kuRelativeStderr: diag.kuRel, reason };
  const names: SeriesParameter[] = fitKu ? [...base, "Ku"] : base;
  const final = fitKu ? stage2(s1, film, names, { ...start, A: thetaHeld.A, D: thetaHeld.D }, nonlocal, lmOptions, sens) : held;
  const two = final.fit;
  let parameters = pick(two, names, film, start, confidence);
  let status = two.status;
  let message = two.message;
  let covariance = two.covariance;
  let correlation = two.correlation;
  let chiSquare = two.chiSquare;
  let dof = two.dof;
  let evaluations = held.fit.evaluations + (fitKu ? two.evaluations : 0);
  let finalFree = two.freeNames;
  let twoStage: FieldSeriesResult["twoStage"];
  let approach: "two-stage" | "global" = "two-stage";
  notes.push(...two.notes);
  // profile-likelihood intervals of the requested free series parameters
  const profiled = request.filter((n) => names.includes(n as SeriesParameter));
  for (const n of request) if (!names.includes(n as SeriesParameter)) notes.push(`no profile interval of ${n}: ${kuDecision.reason}`);
  let profiledFit: { fit: FitResult; problem: LeastSquaresProblem } | null = null;
  if (profiled.length > 0 && options.method !== "global") {
    // the same stage-2 problem, restarted at its optimum, with the engine's profile intervals
    profiledFit = stage2(s1, film, names, { ...start, ...Object.fromEntries(names.map((n) => [n, parameters[n].value])) }, nonlocal, { ...lmOptions, profile: profiled }, sens);
  }
  if (two.chiSquareReduced > 3 && dof > 0) {
    notes.push(
      `stage-2 reduced chi-square ${two.chiSquareReduced.toPrecision(3)}: the energy model does not describe the measured R(B), w(B) within their errors (check Ms, t, the field calibration, or the ansatz)`,
    );
  }
  if (options.method === "global") {
    const gp = globalFit(
      profiles,
      s1,
      pm,
      film,
      names,
      { ...start, ...Object.fromEntries(names.map((n) => [n, parameters[n].value])) },
      nonlocal,
      options,
      profiled.length > 0 ? { ...lmOptions, profile: profiled } : lmOptions,
      sens,
    );
    const g = gp.fit;
    profiledFit = gp;
    twoStage = { parameters, covariance };
    approach = "global";
    parameters = pick(g, names, film, start, confidence);
    status = g.status;
    message = g.message;
    covariance = g.covariance;
    correlation = g.correlation;
    chiSquare = g.chiSquare;
    dof = g.dof;
    finalFree = g.freeNames;
    evaluations += g.evaluations;
    notes.push(...g.notes);
  }
  if (profiledFit) {
    const seen = new Set(notes);
    for (const nt of profiledFit.fit.notes) if (!seen.has(nt)) notes.push(nt);
    for (const n of profiled) {
      const iv = profiledFit.fit.parameters[n]?.profileInterval;
      parameters[n as SeriesParameter] = { ...parameters[n as SeriesParameter], profileInterval: iv ? openSides(profiledFit.problem, n, iv) : null };
      if (!iv) notes.push(`no profile interval of ${n}: the fit status is ${profiledFit.fit.status}`);
    }
  }
  // model curves and pulls
  const fitted = { A: parameters.A.value, D: parameters.D.value, Ku: parameters.Ku.value };
  const ff = filmWith(film, fitted);
  const covIdx = names.map((n) => (covariance ? finalFree.indexOf(n) : -1));
  const band = (g: number[]) => {
    if (!covariance) return NaN;
    let s = 0;
    for (let a = 0; a < names.length; a++) for (let b = 0; b < names.length; b++) if (covIdx[a]! >= 0 && covIdx[b]! >= 0) s += g[a]! * g[b]! * covariance[covIdx[a]!]![covIdx[b]!]!;
    return Math.sqrt(s);
  };
  const profilesOut: SeriesProfileResult[] = s1.map((s) => {
    const sk = sens(ff, s.B, [], { nonlocal });
    const sR = Math.sqrt(s.cov[0]);
    const sW = Math.sqrt(s.cov[2]);
    return {
      B: s.B,
      R: s.R,
      w: s.w,
      stderrR: sR,
      stderrW: sW,
      correlationRw: s.cov[1] / (sR * sW),
      modelR: sk.R,
      modelW: sk.w,
      pullR: (s.R - sk.R) / sR,
      pullW: (s.w - sk.w) / sW,
      fit: s.fit,
    };
  });
  const Bs = s1.map((s) => s.B);
  const bmin = Math.min(...Bs);
  const bmax = Math.max(...Bs);
  const np = options.curvePoints ?? 40;
  const curve = { B: [] as number[], R: [] as number[], w: [] as number[], stderrR: [] as number[], stderrW: [] as number[] };
  let warm: number | undefined;
  for (let k = 0; k < np; k++) {
    const B = bmin + ((bmax - bmin) * k) / Math.max(1, np - 1);
    const sk = sens(ff, B, names, { nonlocal, startRadius: warm });
    if (sk.status !== "ok") continue;
    warm = sk.R;
    curve.B.push(B);
    curve.R.push(sk.R);
    curve.w.push(sk.w);
    curve.stderrR.push(band(sk.dR));
    curve.stderrW.push(band(sk.dw));
  }
  return {
    status,
    message,
    approach,
    parameters,
    freeNames: names.slice(),
    covariance,
    correlation,
    chiSquare,
    dof,
    chiSquareReduced: dof > 0 ? chiSquare / dof : NaN,
    kuDecision,
    profiles: profilesOut,
    curve,
    twoStage,
    film: { Ms: film.Ms, t: film.t, dmi: film.dmi },
    confidence,
    evaluations,
    notes,
    assumptions: texture === "skyrmion" ? ASSUMPTIONS : WALL360_ASSUMPTIONS,
    method:
      (approach === "two-stage"
        ? "two-stage: (1) each profile fitted alone (Levenberg-Marquardt), keeping the full covariance of (R, w); (2) A, D (Ku) fitted to {R_i, w_i} with that covariance, R(B), w(B) at the ansatz energy minimum, Jacobian by implicit differentiation of the minimum"
        : "global: all profiles at once with shared A, D (Ku) and local profile parameters, R_i, w_i at the ansatz energy minimum (chain rule through the implicit derivatives), started from the two-stage solution") +
      (profiled.length > 0
        ? `; profile-likelihood intervals of ${profiled.join(", ")}: each stepped with the others refitted until the ${approach === "two-stage" ? "stage-2" : "global"} chi-square rises by the chi^2_1 quantile (known errors) or by the F-based rule scaled by the reduced chi-square (unknown errors)`
        : ""),
    sources: SOURCES,
  };
}

/** Local Jacobian of a bound profile model: analytic when the model has one, else central differences. */
function localJacobian(bound: BoundModel, q: Float64Array, m: number, typical: number[], out: Float64Array): void {
  if (bound.jacobian) {
    bound.jacobian(q, out);
    return;
  }
  const a = new Float64Array(m);
  const b = new Float64Array(m);
  const qq = Float64Array.from(q);
  for (let j = 0; j < q.length; j++) {
    const h = Math.cbrt(2.2e-16) * Math.max(Math.abs(q[j]!), typical[j]!);
    qq[j] = q[j]! + h;
    bound.model(qq, a);
    qq[j] = q[j]! - h;
    bound.model(qq, b);
    qq[j] = q[j]!;
    for (let i = 0; i < m; i++) out[j * m + i] = (a[i]! - b[i]!) / (2 * h);
  }
}

function globalFit(
  profiles: FieldSeriesProfile[],
  s1: Stage1[],
  pm: ProfileModel,
  film: Film,
  names: SeriesParameter[],
  start: Partial<Record<SeriesParameter, number>>,
  nonlocal: boolean,
  options: FieldSeriesOptions,
  lmOptions: FitOptions,
  sens: Sensitivity,
): { fit: FitResult; problem: LeastSquaresProblem } {
  const shared = seriesParameters(film, names, start);
  const params: FitParameter[] = [...shared];
  const iR = pm.parameters.findIndex((p) => p.name === "R");
  const iw = pm.parameters.findIndex((p) => p.name === "w");
  const parts = profiles.map((pr, i) => {
    const local = configureParameters(pm.parameters, {
      start: Object.fromEntries(Object.entries(s1[i]!.fit.parameters).map(([k, v]) => [k, v.value])),
      fixed: { ...(options.profileFit?.fixed ?? {}), ...(pr.fixed ?? {}) },
      bounds: options.profileFit?.bounds,
    });
    const map = local.map((p, j) => {
      if (j === iR || j === iw) return -1;
      if (p.fixed) return -2;
      params.push({ ...p, name: `${p.name}[${i}]` });
      return params.length - 1;
    });
    const x = Float64Array.from(pr.data.x);
    const bound = pm.bind(x, Float64Array.from(local.map((p) => p.value)));
    return { local, map, bound, m: x.length, typical: local.map((p) => p.typical ?? (Math.abs(p.value) || 1)) };
  });
  const m = parts.reduce((s, p) => s + p.m, 0);
  const y = new Float64Array(m);
  const anySigma = profiles.some((p) => p.data.sigma);
  if (anySigma && !profiles.every((p) => p.data.sigma)) throw new InputError("profiles.data.sigma", "some profiles without sigma", "sigma for every profile or for none");
  const sigma = anySigma ? new Float64Array(m) : null;
  let off = 0;
  for (const [i, pr] of profiles.entries()) {
    y.set(Float64Array.from(pr.data.y), off);
    if (sigma) sigma.set(Float64Array.from(pr.data.sigma!), off);
    off += at(parts, i, "parts").m;
  }
  const em = energyModel(
    film,
    profiles.map((p) => p.B),
    names,
    nonlocal,
    sens,
  );
  const ns = names.length;
  /** The local parameters of one profile: R and w from the energy model, the rest from p or held. */
  const qOf = (p: Float64Array, part: (typeof parts)[number], s: SkyrmionSensitivity) =>
    Float64Array.from(
      part.local.map((lp, j) => {
        const c = at(part.map, j, "parameter map");
        return j === iR ? s.R : j === iw ? s.w : c >= 0 ? at(p, c, "parameters") : lp.value;
      }),
    );
  const problem: LeastSquaresProblem = {
    parameters: params,
    m,
    y,
    sigma,
    model(p, out) {
      const sk = em(p.subarray(0, ns));
      let o = 0;
      for (const [i, part] of parts.entries()) {
        const seg = out.subarray(o, o + part.m);
        if (!sk) seg.fill(NaN);
        else part.bound.model(qOf(p, part, at(sk, i, "sensitivities")), seg);
        o += part.m;
      }
    },
    modelJacobian(p, out) {
      out.fill(0);
      const sk = em(p.subarray(0, ns));
      let o = 0;
      for (const [i, part] of parts.entries()) {
        const mi = part.m;
        if (!sk) {
          for (let j = 0; j < params.length; j++) out.fill(NaN, j * m + o, j * m + o + mi);
          o += mi;
          continue;
        }
        const nq = part.local.length;
        const jl = new Float64Array(mi * nq);
        const si = at(sk, i, "sensitivities");
        localJacobian(part.bound, qOf(p, part, si), mi, part.typical, jl);
        for (let j = 0; j < nq; j++) {
          const c = part.map[j]!;
          if (c >= 0) out.set(jl.subarray(j * mi, (j + 1) * mi), c * m + o);
        }
        for (let s = 0; s < ns; s++) {
          const dR = at(si.dR, s, "dR");
          const dw = at(si.dw, s, "dw");
          for (let k = 0; k < mi; k++) out[s * m + o + k] = jl[iR * mi + k]! * dR + jl[iw * mi + k]! * dw;
        }
        o += mi;
      }
    },
  };
  return { fit: solveLeastSquares(problem, { ftol: 1e-10, xtol: 1e-10, gtol: 1e-10, ...lmOptions }), problem };
}
