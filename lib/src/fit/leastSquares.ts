/**
 * Weighted nonlinear least squares with honest uncertainties: the problem-level driver behind
 * `fitProfile` (one data set) and `fitGlobal` (several data sets with shared parameters).
 *
 * chi^2 = sum_i ((y_i - f(x_i; p)) / sigma_i)^2, minimized by Levenberg-Marquardt with box bounds
 * (levenbergMarquardt.ts). Uncertainties:
 * - covariance C = (J^T W J)^-1 of the free parameters at the optimum (J the model Jacobian,
 *   W = diag(1/sigma^2)); with unknown sigmas (all 1) it is scaled by the reduced chi-square
 *   s^2 = chi^2 / (n - k); with known sigmas the unscaled C is used and the scaled one is reported
 *   too (a reduced chi-square far from 1 says the sigmas or the model are wrong);
 * - Wald intervals value +- q * stderr with q the Student t quantile (n - k degrees of freedom) for
 *   scaled errors, the normal quantile for known sigmas;
 * - profile-likelihood intervals on request: the parameter is stepped and every other one refitted
 *   until chi^2 rises by the threshold (known sigmas: the chi^2_1 quantile z^2; unknown: the
 *   F-based rule S <= S_min (1 + t^2 / (n - k))) (D. Bates, D. Watts, *Nonlinear Regression
 *   Analysis and Its Applications*, Wiley 1988, ch. 6; W. Venzon, S. Moolgavkar, Appl. Stat. 37,
 *   87 (1988));
 * - seeded case-resampling bootstrap on request (B. Efron, R. Tibshirani, *An Introduction to the
 *   Bootstrap*, 1993): percentile intervals and bootstrap standard deviations.
 * - AIC = -2 ln L + 2K and BIC = -2 ln L + K ln n with the full Gaussian log-likelihood (known
 *   sigmas: K = k; unknown: the ML variance RSS/n is one more parameter, K = k + 1)
 *   (H. Akaike, IEEE Trans. Autom. Control 19, 716 (1974); G. Schwarz, Ann. Stat. 6, 461 (1978)).
 *
 * This file is the driver (validation, the fit, the assembled result); the minimization is in
 * leastSquaresMinimize.ts, the covariance in fitCovariance.ts, the profile-likelihood intervals in
 * profileLikelihood.ts and the bootstrap in fitBootstrap.ts.
 */
import { InputError } from "../errors.js";
import type { DocumentedResult } from "../result.js";
import type { LmOptions, LmStatus } from "./levenbergMarquardt.js";
import { studentTQuantile, normalQuantile } from "../numeric/distributions.js";
import { at } from "../numeric/indexing.js";
import { minimize } from "./leastSquaresMinimize.js";
import { covarianceAtOptimum } from "./fitCovariance.js";
import { profileInterval } from "./profileLikelihood.js";
import { bootstrap } from "./fitBootstrap.js";

/** One parameter of a fit: start value, bounds, unit and whether it is held fixed. */
export interface FitParameter {
  name: string;
  /** Start value (SI). */
  value: number;
  /** SI unit ("m", "T", "" ...). */
  unit?: string;
  min?: number;
  max?: number;
  fixed?: boolean;
  /** Typical magnitude (finite-difference step scale); defaults to |value| or the bound span. */
  typical?: number;
  /** One line: what the parameter means. */
  meaning?: string;
  /**
   * The values the quantity can physically take (a length >= 0, a cosine in [-1, 1]), unlike
   * min/max, which bound the search: a confidence interval that crosses them is clipped there
   * and the result says so.
   */
  physical?: [number, number];
}

/** A least-squares problem over a full parameter vector (fixed parameters included). */
export interface LeastSquaresProblem {
  parameters: FitParameter[];
  /** Number of data points. */
  m: number;
  /** Model values at the data points for the full parameter vector p. */
  model(p: Float64Array, out: Float64Array): void;
  /** Optional analytic model Jacobian df/dp (column-major m x nAll). */
  modelJacobian?(p: Float64Array, out: Float64Array): void;
  y: Float64Array;
  /** Standard deviations (null: unknown, all 1 and uncertainties scaled). */
  sigma: Float64Array | null;
}

export interface FitOptions extends LmOptions {
  /** Confidence level of the reported intervals (default 0.95). */
  confidence?: number;
  /** Profile-likelihood intervals: true for every free parameter, or a list of names. */
  profile?: boolean | string[];
  /** Bootstrap: number of resamples and the seed. */
  bootstrap?: { samples: number; seed: number };
  /** Relative column-rank threshold for calling the Jacobian singular (default 1e-10). */
  singularThreshold?: number;
}

export interface ParameterResult {
  value: number;
  /** Standard error used for the intervals (scaled unless sigmas are known); null if undefined. */
  stderr: number | null;
  /** Standard error scaled by sqrt(reduced chi-square). */
  stderrScaled: number | null;
  /** Standard error from the given sigmas without scaling (null when sigmas are unknown). */
  stderrUnscaled: number | null;
  unit: string;
  fixed: boolean;
  atBound: boolean;
  /** Wald interval at the confidence level (clipped at the parameter's physical limits, see `clipped`). */
  interval: [number, number] | null;
  /** Which ends of `interval` were clipped at a physical limit (absent when none). */
  clipped?: Array<"lower" | "upper">;
  /** Profile-likelihood interval (when requested); an open side is +-Infinity with a note. */
  profileInterval?: [number, number] | null;
  /** Bootstrap percentile interval and standard deviation (when requested). */
  bootstrapInterval?: [number, number];
  bootstrapStderr?: number;
}

export type FitStatus = LmStatus | "singular";

export interface FitResult extends DocumentedResult {
  status: FitStatus;
  reason: string;
  message: string;
  parameters: Record<string, ParameterResult>;
  /** Names of the free parameters, the order of covariance and correlation. */
  freeNames: string[];
  covariance: number[][] | null;
  correlation: number[][] | null;
  chiSquare: number;
  dof: number;
  chiSquareReduced: number;
  logLikelihood: number;
  aic: number;
  bic: number;
  points: number;
  sigmaKnown: boolean;
  confidence: number;
  evaluations: number;
  jacobianEvaluations: number;
  iterations: number;
  /** Model values at the data points and residuals y - f. */
  fitted: number[];
  residuals: number[];
  notes: string[];
  /** For a singular Jacobian: groups of parameters that cannot be told apart. */
  degenerate?: string[][];
  method: string;
  sources: string[];
  /** What the intervals rest on (independent errors, a model that describes the data, ...). */
  assumptions: string[];
}

/** The result of parameter `name` of a fit, or an InputError listing the parameters it has. */
export function parameterOf(fit: Pick<FitResult, "parameters">, name: string): ParameterResult {
  const r = fit.parameters[name];
  if (!r) throw new InputError("parameter", name, `one of the fit's parameters: ${Object.keys(fit.parameters).join(", ")}`);
  return r;
}

const METHOD = "weighted nonlinear least squares, Levenberg-Marquardt (More 1978) with scaling, trust region and projected box bounds";
const ASSUMPTIONS = [
  "independent, normally distributed errors of y (unknown sigmas: one common sigma, estimated from the residuals)",
  "the model describes the data; Wald intervals from the linearized model at the optimum (profile-likelihood intervals when requested)",
];
const SOURCES = [
  "K. Levenberg, Q. Appl. Math. 2, 164 (1944); D. Marquardt, J. SIAM 11, 431 (1963)",
  "J. More, Lecture Notes in Mathematics 630, 105 (1978) (MINPACK design)",
  "D. Bates, D. Watts, Nonlinear Regression Analysis and Its Applications (Wiley 1988)",
];

/** Validate parameters and return start vector, bounds and the free index list. */
function prepare(params: FitParameter[]) {
  const names = new Set<string>();
  const n = params.length;
  const start = new Float64Array(n);
  const lo = new Float64Array(n);
  const hi = new Float64Array(n);
  const free: number[] = [];
  params.forEach((p, j) => {
    if (names.has(p.name)) throw new InputError("parameters", p.name, "unique parameter names");
    names.add(p.name);
    if (!Number.isFinite(p.value)) throw new InputError(p.name, p.value, "a finite start value");
    const l = p.min ?? -Infinity;
    const u = p.max ?? Infinity;
    if (!(l <= u)) throw new InputError(`${p.name}.min/max`, [p.min, p.max], "min <= max");
    if (!p.fixed && (p.value < l || p.value > u)) {
      throw new InputError(p.name, p.value, `a start value inside its bounds [${l}, ${u}]`);
    }
    start[j] = p.value;
    lo[j] = l;
    hi[j] = u;
    if (!p.fixed) free.push(j);
  });
  return { start, lo, hi, free };
}

/** Solve a least-squares problem and analyse the uncertainties. */
export function solveLeastSquares(problem: LeastSquaresProblem, options: FitOptions = {}): FitResult {
  const { m } = problem;
  const params = problem.parameters;
  const { start, lo, hi, free } = prepare(params);
  const nameOf = (j: number) => at(params, j, "parameters").name;
  const k = free.length;
  if (k === 0) throw new InputError("parameters", params.map((p) => p.name).join(", "), "at least one free (not fixed) parameter");
  if (m <= k) {
    throw new InputError("data", `${m} points`, `more data points than the ${k} free parameters (${free.map(nameOf).join(", ")})`);
  }
  if (problem.sigma) {
    for (let i = 0; i < m; i++) {
      if (!(problem.sigma[i]! > 0) || !Number.isFinite(problem.sigma[i])) throw new InputError(`sigma[${i}]`, problem.sigma[i], "a positive finite standard deviation");
    }
  }
  for (let i = 0; i < m; i++)
    if (!Number.isFinite(problem.y[i])) throw new InputError(`y[${i}]`, problem.y[i], "a finite data value (drop NaN rows first, see readProfileCsv dropNaN)");
  // the model must be finite at the start
  const f0 = new Float64Array(m);
  problem.model(start, f0);
  const bad: number[] = [];
  for (let i = 0; i < m; i++) if (!Number.isFinite(f0[i])) bad.push(i);
  if (bad.length > 0) {
    throw new InputError(
      "model",
      `${bad.length} non-finite values`,
      "a model that returns finite values at the start parameters",
      `the model returned NaN or infinity at ${bad.length} of ${m} points (first at row ${bad[0]}) for ${params.map((p, j) => `${p.name} = ${start[j]}`).join(", ")}`,
    );
  }
  const confidence = options.confidence ?? 0.95;
  const notes: string[] = [];
  const core = minimize(problem, start, free, lo, hi, options);
  const x = core.x;
  const sigmaKnown = problem.sigma !== null;
  const chi2 = core.chiSquare;
  const dof = m - k;
  const red = chi2 / dof;
  // model values from the minimizer's last residuals (no extra evaluation): f = y + sigma r
  const fitted = new Float64Array(m);
  {
    const r = core.residuals;
    const sg = problem.sigma;
    if (sg) for (let i = 0; i < m; i++) fitted[i] = problem.y[i]! + sg[i]! * r[i]!;
    else for (let i = 0; i < m; i++) fitted[i] = problem.y[i]! + r[i]!;
  }
  // log-likelihood
  let logL: number;
  let K: number;
  if (sigmaKnown) {
    let s = 0;
    for (let i = 0; i < m; i++) s += Math.log(2 * Math.PI * problem.sigma![i]! ** 2);
    logL = -0.5 * (chi2 + s);
    K = k;
  } else {
    logL = -0.5 * m * (Math.log((2 * Math.PI * chi2) / m) + 1);
    K = k + 1;
  }
  const aic = -2 * logL + 2 * K;
  const bic = -2 * logL + K * Math.log(m);
  // covariance of the parameters not on a bound
  const onBound = free.filter((j) => x[j]! <= lo[j]! || x[j]! >= hi[j]!);
  const inner = free.filter((j) => !onBound.includes(j));
  for (const j of onBound) notes.push(`${nameOf(j)} ended on its bound ${x[j]}: no standard error; the covariance of the others is conditional on it`);
  let status: FitStatus = core.status;
  let reason = core.reason;
  let message = core.message;
  let cov: Float64Array | null = null;
  let degenerate: string[][] | undefined;
  if (inner.length > 0) {
    const c = covarianceAtOptimum(problem, x, inner, lo, hi, options.singularThreshold ?? 1e-10);
    cov = c.cov;
    if (c.degenerate) {
      degenerate = c.degenerate;
      status = "singular";
      reason = "singular-jacobian";
      message = c.message;
    }
  }
  // assemble
  const nn = inner.length;
  const scale = sigmaKnown ? 1 : red;
  const q = sigmaKnown ? normalQuantile(0.5 + confidence / 2) : studentTQuantile(0.5 + confidence / 2, dof);
  const parameters: Record<string, ParameterResult> = {};
  params.forEach((p, j) => {
    const c = inner.indexOf(j);
    const varU = cov && c >= 0 ? cov[c + c * nn]! : null;
    const seU = varU !== null ? Math.sqrt(varU) : null;
    const seS = seU !== null ? seU * Math.sqrt(red) : null;
    const se = seU !== null ? seU * Math.sqrt(scale) : null;
    const value = at(x, j, "fitted values");
    const r: ParameterResult = {
      value,
      stderr: se,
      stderrScaled: seS,
      stderrUnscaled: sigmaKnown ? seU : null,
      unit: p.unit ?? "",
      fixed: !!p.fixed,
      atBound: onBound.includes(j),
      interval: se !== null ? [value - q * se, value + q * se] : null,
    };
    parameters[p.name] = r;
    clipInterval(p, r, confidence, notes);
  });
  let covariance: number[][] | null = null;
  let correlation: number[][] | null = null;
  if (cov) {
    covariance = [];
    correlation = [];
    for (let a = 0; a < nn; a++) {
      const row: number[] = [];
      const crow: number[] = [];
      for (let b = 0; b < nn; b++) {
        row.push(cov[a + b * nn]! * scale);
        crow.push(cov[a + b * nn]! / Math.sqrt(cov[a + a * nn]! * cov[b + b * nn]!));
      }
      covariance.push(row);
      correlation.push(crow);
    }
  }
  if (correlation) {
    // Nearly degenerate pairs: the data hardly tell them apart (their errors are large and
    // anticorrelated or correlated); fixing one from other knowledge is the usual cure.
    const innerNames = inner.map(nameOf);
    correlation.forEach((row, a) =>
      row.forEach((r, b) => {
        if (b > a && Math.abs(r) > 0.99)
          notes.push(
            `${at(innerNames, a, "freeNames")} and ${at(innerNames, b, "freeNames")} are almost degenerate (correlation ${r.toFixed(4)}): the data hardly tell them apart; fix one if it is known from elsewhere`,
          );
      }),
    );
  }
  if (sigmaKnown && (red > 2 || red < 0.5)) {
    notes.push(`reduced chi-square ${red.toPrecision(3)} is far from 1: the given sigmas or the model are doubtful (scaled errors are reported as stderrScaled)`);
  }
  const res = new Float64Array(m);
  for (let i = 0; i < m; i++) res[i] = problem.y[i]! - fitted[i]!;
  const residuals = Array.from(res); // typed -> plain array: V8's fast path (no map callback)
  const result: FitResult = {
    status,
    reason,
    message,
    parameters,
    freeNames: inner.map(nameOf),
    covariance,
    correlation,
    chiSquare: chi2,
    dof,
    chiSquareReduced: red,
    logLikelihood: logL,
    aic,
    bic,
    points: m,
    sigmaKnown,
    confidence,
    evaluations: core.evaluations,
    jacobianEvaluations: core.jacobianEvaluations + 1,
    iterations: core.iterations,
    fitted: Array.from(fitted),
    residuals,
    notes,
    degenerate,
    method: METHOD,
    sources: SOURCES,
    assumptions: ASSUMPTIONS,
  };
  if (options.profile && (status === "converged" || status === "singular")) {
    const names = options.profile === true ? inner.map(nameOf) : options.profile;
    for (const name of names) {
      const j = params.findIndex((p) => p.name === name);
      if (j < 0 || !free.includes(j)) throw new InputError("profile", name, `a free parameter: ${free.map(nameOf).join(", ")}`);
      const pr = parameterOf({ parameters }, name);
      pr.profileInterval = profileInterval(problem, x, j, free, lo, hi, chi2, sigmaKnown, dof, q, pr.stderr, options, notes);
    }
  }
  if (options.bootstrap && status === "converged") bootstrap(problem, x, free, lo, hi, options, parameters, confidence, notes);
  return result;
}

/**
 * A linearized (Wald) interval may cross what the quantity can be (a cosine above 1, a negative
 * length): clipped there, with a note giving the unclipped end. Common practice, no source (the
 * interval of a bounded quantity is reported within its range; JCGM 100:2008 keeps the standard
 * uncertainty itself unchanged).
 */
function clipInterval(p: FitParameter, r: ParameterResult, confidence: number, notes: string[]): void {
  if (!p.physical || !r.interval) return;
  const [lo, hi] = p.physical;
  const [a, b] = r.interval;
  const clipped: Array<"lower" | "upper"> = [];
  if (a < lo) clipped.push("lower");
  if (b > hi) clipped.push("upper");
  if (!clipped.length) return;
  r.interval = [Math.max(a, lo), Math.min(b, hi)];
  r.clipped = clipped;
  const ends = clipped.map((c) => (c === "lower" ? `${a.toPrecision(4)} clipped at ${lo}` : `${b.toPrecision(4)} clipped at ${hi}`));
  notes.push(
    `the ${Math.round(confidence * 100)} % interval of ${p.name} crosses its physical limit [${lo}, ${hi}]: ${ends.join(", ")} (linearized interval; a profile-likelihood interval respects the limit by itself)`,
  );
}
