/**
 * Uncertainties of calculator inputs carried to their numeric scalar outputs.
 *
 * An input may carry a standard uncertainty: `"15 ± 1 pJ/m"` (also `"15 +- 1 pJ/m"`, `"(15 ± 1) pJ/m"`,
 * `"15 pJ/m ± 1 pJ/m"`) or `{ value: "15 pJ/m", uncertainty: "1 pJ/m" }`, and pairs of inputs a
 * correlation coefficient. Two methods:
 *
 * - First order (default; GUM, JCGM 100:2008, section 5, eq. (13)): u_c^2(y) = g^T V g with
 *   V_ij = r_ij u_i u_j and the sensitivities g_i = dy/dx_i taken by central differences with the step
 *   x_i +- u_i (the step equal to the uncertainty, as in J. Kragten, Analyst 119, 2161 (1994), from
 *   memory), so the derivative is the secant over the range the uncertainty covers. The same three
 *   points give the curvature term c_i = (y(x_i + u_i) + y(x_i - u_i) - 2 y(x)) / 2 = y'' u_i^2 / 2;
 *   for independent Gaussian inputs its variance contribution is sum_i (y'' u_i^2)^2 / 2 = sum 2 c_i^2
 *   (the diagonal second-order term of JCGM 100:2008, 5.1.2 Note; cross terms are not evaluated).
 * - Monte Carlo on request (JCGM 101:2008, GUM Supplement 1): N draws of the inputs from a
 *   multivariate normal distribution (mean the given values, covariance V; Cholesky factor; seeded
 *   Box-Muller deviates), the calculator run at each, the standard deviation of each output reported.
 *   N is bounded before the draws: at most MC_MAX_SAMPLES, the calculator's cost estimate times N
 *   within the compute budget, and N times the mean time of the first-order runs (made first)
 *   within MC_TIME_BUDGET_MS.
 *
 * An output is flagged (result status "warning", a note naming it) when linearization fails:
 * a run at x_i +- u_i has no state (an input refused, no output, no solution); the curvature term
 * exceeds NONLINEAR_FRACTION of the first-order u; or, with Monte Carlo, a draw has no state, the
 * Monte Carlo standard deviation and the first-order u differ by more than the factor
 * DISAGREEMENT_FACTOR, or the Monte Carlo mean lies more than NONLINEAR_FRACTION u from the value.
 * Array (sweep) and text outputs carry no uncertainty; a text output that changes within the
 * uncertainty is said. Values are those at the given inputs, not the Monte Carlo means.
 */
import { ComputationError, ConvergenceError, InputError } from "../errors.js";
import { isPlainNumber, parseQuantity, formatQuantity, type QuantityInput } from "../quantity/units.js";
import { seededRandom } from "../numeric/prng.js";
import { COMPUTE_BUDGET, coerceInputs, runCalculator, type CalculatorResult, type CalculatorSpec, type ComputeOptions, type InputValues } from "./spec.js";

/** An output of a result, or undefined when the result does not have it (reading a missing output of a result throws). */
function outOf(r: { outputs: object }, name: string): { value: number | number[] | string; unit: string; uncertainty?: number } | undefined {
  return name in r.outputs ? (r.outputs as Record<string, { value: number | number[] | string; unit: string; uncertainty?: number }>)[name] : undefined;
}

/** An input with a standard uncertainty (both numbers SI in the input's unit, or strings with units). */
export interface UncertainInput {
  value: QuantityInput;
  /** Standard uncertainty (one standard deviation), >= 0. */
  uncertainty?: QuantityInput | null;
}

/** A raw input as `runCalculator` accepts it: a value, a value with uncertainty, or nothing. */
export type InputWithUncertainty = QuantityInput | UncertainInput | undefined;

/** A correlation coefficient between two uncertain inputs. */
export interface InputCorrelation {
  between: [string, string];
  /** Correlation coefficient r, -1 <= r <= 1. */
  coefficient: number;
}

export interface UncertaintyOptions {
  /** "first-order" (default) or "monte-carlo". */
  method?: "first-order" | "monte-carlo";
  /** Monte Carlo draws (default 200, at most MC_MAX_SAMPLES). */
  samples?: number;
  /** Seed of the Monte Carlo draws (default 1). */
  seed?: number;
  /** Correlation coefficients between uncertain inputs (others are independent). */
  correlations?: InputCorrelation[];
}

/** What a result says about its uncertainties (present when an input carried one). */
export interface UncertaintyReport {
  method: "first-order" | "monte-carlo";
  /** Inputs that carried an uncertainty (SI). */
  inputs: Record<string, number>;
  correlations: InputCorrelation[];
  /** First-order standard uncertainty of each numeric scalar output (SI; null where it failed). */
  firstOrder: Record<string, number | null>;
  /** Monte Carlo statistics (method "monte-carlo"). */
  monteCarlo?: { samples: number; seed: number; failed: number; mean: Record<string, number | null>; standardDeviation: Record<string, number | null> };
  /** Outputs whose linearization fails, with the reason. */
  flagged: Record<string, string>;
  /** Calculator runs made for the propagation. */
  evaluations: number;
}

export const MC_MAX_SAMPLES = 20000;
export const MC_DEFAULT_SAMPLES = 200;
/** First-order u and Monte Carlo standard deviation differing by more than this factor are flagged. */
export const DISAGREEMENT_FACTOR = 1.25;
/** Curvature term or Monte Carlo mean shift above this fraction of the first-order u is flagged. */
export const NONLINEAR_FRACTION = 0.25;
/**
 * Monte Carlo draws are refused when the first-order runs (made first) say they would take longer
 * than this (ms): the draws cost about N times the mean time of one run.
 */
export const MC_TIME_BUDGET_MS = 120_000;

const pm = /\s*(?:±|\+\/-|\+-)\s*/;
const leadingNumber = /^\s*[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?\s*/;

function isUncertainObject(v: unknown): v is UncertainInput {
  return typeof v === "object" && v !== null && !Array.isArray(v) && "value" in v;
}

/** Does a raw input carry an uncertainty ("15 ± 1 pJ/m" or {value, uncertainty})? */
export function carriesUncertainty(v: unknown): boolean {
  if (isUncertainObject(v)) return v.uncertainty !== undefined && v.uncertainty !== null;
  return typeof v === "string" && pm.test(v);
}

/** Is a raw input written in an uncertain form ({value, ...} or with ±), even with a zero uncertainty? */
export function inUncertainForm(v: unknown): boolean {
  return isUncertainObject(v) || (typeof v === "string" && pm.test(v));
}

/**
 * Split "15 ± 1 pJ/m" (also "+-", "+/-", "(15 ± 1) pJ/m", "15 pJ/m ± 1 pJ/m") or {value, uncertainty}
 * into the value as typed (for reading like any input) and the SI uncertainty (null when none).
 */
export function splitUncertainInput(name: string, given: InputWithUncertainty | unknown, unit: string): { value: QuantityInput | undefined; uncertainty: number | null } {
  if (given === undefined) return { value: undefined, uncertainty: null };
  if (isUncertainObject(given)) {
    const u = given.uncertainty;
    if (u === undefined || u === null) return { value: given.value, uncertainty: null };
    const valueText = typeof given.value === "string" ? given.value : String(given.value);
    // a bare-number uncertainty takes the value's unit ("15 pJ/m" with uncertainty 1 -> 1 pJ/m)
    const uText = typeof u === "number" ? (typeof given.value === "string" && !isPlainNumber(given.value) ? `${u} ${valueText.replace(leadingNumber, "")}` : u) : u;
    return { value: given.value, uncertainty: checkUncertainty(name, given, parseQuantity(`${name} uncertainty`, uText, unit)) };
  }
  if (typeof given !== "string" || !pm.test(given)) return { value: given as QuantityInput, uncertainty: null };
  let text = given.trim();
  let outerUnit = "";
  const paren = /^\((.*)\)\s*(.*)$/.exec(text);
  if (paren) {
    text = paren[1]!;
    outerUnit = paren[2]!.trim();
  }
  const parts = text.split(pm);
  if (parts.length !== 2 || parts[0]!.trim() === "" || parts[1]!.trim() === "") {
    throw new InputError(name, given, `a value with one uncertainty, such as "15 ± 1 pJ/m" or "15 +- 1 pJ/m"`);
  }
  let [left, right] = [parts[0]!.trim(), parts[1]!.trim()];
  if (outerUnit) {
    left = `${left} ${outerUnit}`;
    right = `${right} ${outerUnit}`;
  } else if (isPlainNumber(left) && !isPlainNumber(right)) {
    left = `${left} ${right.replace(leadingNumber, "")}`; // "15 ± 1 pJ/m": the unit is shared
  } else if (!isPlainNumber(left) && isPlainNumber(right)) {
    right = `${right} ${left.replace(leadingNumber, "")}`; // "15 pJ/m ± 1"
  }
  const u = parseQuantity(`${name} uncertainty`, right, unit);
  return { value: left, uncertainty: checkUncertainty(name, given, u) };
}

function checkUncertainty(name: string, given: unknown, u: number): number {
  if (!(u >= 0) || !Number.isFinite(u)) throw new InputError(name, given, "a standard uncertainty that is a finite number >= 0");
  return u;
}

/**
 * SI inputs with SI standard uncertainties, as `runCalculator` reads them: each input that has an
 * uncertainty > 0 in `uncertainties` becomes `{ value, uncertainty }`, the others stay numbers. The
 * explorers compute with it: a slider moves an input's value, its uncertainty stays.
 */
export function withUncertainties(values: Record<string, number>, uncertainties: Record<string, number> | null | undefined): Record<string, InputWithUncertainty> {
  const out: Record<string, InputWithUncertainty> = { ...values };
  for (const [name, u] of Object.entries(uncertainties ?? {})) {
    if (!(name in values)) throw new InputError(`uncertainty of ${name}`, u, `an uncertainty of an input that has a value (${Object.keys(values).join(", ")})`);
    if (typeof u !== "number" || !(u >= 0) || !Number.isFinite(u)) throw new InputError(`uncertainty of ${name}`, u, "a standard uncertainty that is a finite number >= 0 (SI)");
    if (u > 0) out[name] = { value: values[name]!, uncertainty: u };
  }
  return out;
}

/** Does a state of SI uncertainties carry any (> 0)? */
export function anyUncertainty(uncertainties: Record<string, number> | null | undefined): boolean {
  return Object.values(uncertainties ?? {}).some((u) => u > 0);
}

/** Runs of a calculator allowed for one propagation, from its cost estimate (at least the first-order runs). */
function affordableRuns(spec: CalculatorSpec, inputs: InputValues): number {
  if (!spec.cost) return Infinity;
  const c = spec.cost(inputs, {});
  if (!(c.steps > 0)) return Infinity;
  return Math.floor(COMPUTE_BUDGET.steps / c.steps);
}

/** Cholesky factor of a symmetric positive semidefinite matrix (zero columns allowed), or null. */
function cholesky(v: number[][]): number[][] | null {
  const n = v.length;
  const L = v.map(() => new Array<number>(n).fill(0));
  for (let j = 0; j < n; j++) {
    let s = v[j]![j]!;
    for (let k = 0; k < j; k++) s -= L[j]![k]! ** 2;
    const scale = Math.max(v[j]![j]!, 1e-300);
    if (s < -1e-10 * scale) return null;
    const d = s > 0 ? Math.sqrt(s) : 0;
    L[j]![j] = d;
    for (let i = j + 1; i < n; i++) {
      let t = v[i]![j]!;
      for (let k = 0; k < j; k++) t -= L[i]![k]! * L[j]![k]!;
      if (d === 0) {
        if (Math.abs(t) > 1e-10 * Math.sqrt(Math.max(v[i]![i]! * v[j]![j]!, 1e-300))) return null;
        L[i]![j] = 0;
      } else L[i]![j] = t / d;
    }
  }
  return L;
}

type RunOutcome = { ok: true; scalars: Record<string, number>; texts: Record<string, string> } | { ok: false; why: string };

/**
 * Run a calculator with inputs that may carry uncertainties and attach the propagated uncertainties
 * (see the module comment). Called by `runCalculator` when an input carries an uncertainty.
 */
export function runWithUncertainty(
  spec: CalculatorSpec,
  raw: Record<string, InputWithUncertainty>,
  options: ComputeOptions & { noSweep?: boolean; uncertainty?: UncertaintyOptions } = {},
): CalculatorResult {
  const u = options.uncertainty ?? {};
  const method = u.method ?? "first-order";
  if (method !== "first-order" && method !== "monte-carlo") throw new InputError("uncertainty.method", method, '"first-order" or "monte-carlo"');
  const known = new Map(spec.inputs.map((i) => [i.name, i]));
  const central: Record<string, QuantityInput | undefined> = {};
  const sigma: Record<string, number> = {};
  for (const [name, given] of Object.entries(raw)) {
    const input = known.get(name);
    if (!input) {
      central[name] = given as QuantityInput; // coerceInputs names the unknown input
      continue;
    }
    const s = splitUncertainInput(name, given, input.unit);
    central[name] = s.value;
    if (s.uncertainty !== null && s.uncertainty > 0) {
      if (input.kind === "choice" || input.kind === "integer")
        throw new InputError(name, given, `a value without uncertainty (${input.kind === "choice" ? "a choice" : "a whole number"} cannot be uncertain)`);
      sigma[name] = s.uncertainty;
    }
  }
  const { noSweep, sweep, uncertainty: _u, ...rest } = options;
  const nominal = runCalculator(spec, central, { ...rest, ...(sweep ? { sweep } : {}), ...(noSweep ? { noSweep } : {}) });
  const names = Object.keys(sigma);
  const correlations = checkCorrelations(u.correlations ?? [], names);
  if (names.length === 0) {
    if (correlations.length > 0) nominal.notes.push("correlations were given but no input carries an uncertainty: nothing to propagate");
    return nominal;
  }
  const x0 = coerceInputs(spec, central);
  // The propagation runs compute without a sweep. A scalar output that exists only with the sweep
  // (the end of a branch in a field sweep) gets no uncertainty, and is said to, rather than flagged.
  const plain = nominal.sweep ? runCalculator(spec, x0, { noSweep: true }) : nominal;
  const sweepOnly = spec.outputs
    .filter((o) => (o.kind ?? "scalar") === "scalar" && typeof outOf(nominal, o.name)?.value === "number" && typeof outOf(plain, o.name)?.value !== "number")
    .map((o) => o.name);
  const scalarNames = spec.outputs
    .filter((o) => (o.kind ?? "scalar") === "scalar" && typeof outOf(nominal, o.name)?.value === "number" && typeof outOf(plain, o.name)?.value === "number")
    .map((o) => o.name);
  const textNames = spec.outputs.filter((o) => o.kind === "text" && typeof outOf(nominal, o.name)?.value === "string").map((o) => o.name);

  const n = names.length;
  const V = names.map((a, i) => names.map((b, j) => (i === j ? 1 : correlationOf(correlations, a, b)) * sigma[a]! * sigma[b]!));

  const L = cholesky(V);
  if (!L) throw new InputError("correlations", JSON.stringify(correlations), "correlation coefficients that make a positive semidefinite covariance matrix");

  // bounded work: the runs needed against the calculator's cost estimate
  const samples = method === "monte-carlo" ? (u.samples ?? MC_DEFAULT_SAMPLES) : 0;
  if (method === "monte-carlo" && (!Number.isInteger(samples) || samples < 10 || samples > MC_MAX_SAMPLES)) {
    throw new InputError("uncertainty.samples", u.samples, `a whole number of Monte Carlo draws from 10 to ${MC_MAX_SAMPLES}`);
  }
  const seed = u.seed ?? 1;
  if (!Number.isFinite(seed)) throw new InputError("uncertainty.seed", u.seed, "a finite number");
  const runs = 2 * n + samples;
  const affordable = affordableRuns(spec, x0);
  if (runs > affordable) {
    throw new InputError(
      method === "monte-carlo" ? "uncertainty.samples" : names[0]!,
      method === "monte-carlo" ? samples : raw[names[0]!],
      `at most ${affordable} calculator runs for the propagation within the compute budget (this needs ${runs})`,
    );
  }

  const textChanges = new Set<string>();
  const run = (x: InputValues): RunOutcome => {
    let r: CalculatorResult;
    try {
      r = runCalculator(spec, x, { noSweep: true });
    } catch (err) {
      // no state there: an input refused, a solver that found none, a result that is not finite
      if (err instanceof InputError || err instanceof ConvergenceError || err instanceof ComputationError) return { ok: false, why: err.message.split("\n")[0]!.slice(0, 200) };
      throw err;
    }
    const scalars: Record<string, number> = {};
    const texts: Record<string, string> = {};
    for (const k of scalarNames) {
      const v = outOf(r, k)?.value;
      if (typeof v === "number") scalars[k] = v;
    }
    for (const k of textNames) {
      const v = outOf(r, k)?.value;
      if (typeof v === "string") texts[k] = v;
    }
    return { ok: true, scalars, texts };
  };
  const noteText = (o: RunOutcome) => {
    if (!o.ok) return;
    // the words, not the numbers quoted in them, must stay the same
    for (const k of textNames) if (wordsOf(o.texts[k]) !== wordsOf(outOf(plain, k)?.value as string | undefined)) textChanges.add(k);
  };
  const y0: Record<string, number> = Object.fromEntries(scalarNames.map((k) => [k, plain.outputs[k]!.value as number]));
  const fmtIn = (name: string, v: number) => formatQuantity(v, known.get(name)!.unit);

  // first order: central differences with the step u_i, and the curvature term
  const flagged: Record<string, string> = {};
  const grad: Record<string, number[]> = Object.fromEntries(scalarNames.map((k) => [k, new Array<number>(n).fill(0)]));
  const curv: Record<string, number[]> = Object.fromEntries(scalarNames.map((k) => [k, new Array<number>(n).fill(0)]));
  const failedFirst: Record<string, string> = {};
  const flag = (k: string, why: string) => {
    flagged[k] = flagged[k] ? `${flagged[k]}; ${why}` : why;
  };
  let evaluations = plain === nominal ? 1 : 2;
  const startedFirst = Date.now();
  names.forEach((name, i) => {
    const h = sigma[name]!;
    const plus = run({ ...x0, [name]: x0[name]! + h });
    const minus = run({ ...x0, [name]: x0[name]! - h });
    evaluations += 2;
    noteText(plus);
    noteText(minus);
    for (const k of scalarNames) {
      const fp = plus.ok ? plus.scalars[k] : undefined;
      const fm = minus.ok ? minus.scalars[k] : undefined;
      if (fp === undefined || fm === undefined) {
        const side = fp === undefined ? `${name} + u = ${fmtIn(name, x0[name]! + h)}` : `${name} - u = ${fmtIn(name, x0[name]! - h)}`;
        const o = fp === undefined ? plus : minus;
        failedFirst[k] ??= `no value at ${side}${!o.ok ? ` (${o.why})` : ""}`;
        continue;
      }
      grad[k]![i] = (fp - fm) / (2 * h);
      curv[k]![i] = (fp + fm - 2 * y0[k]!) / 2;
    }
  });
  const firstOrder: Record<string, number | null> = {};
  for (const k of scalarNames) {
    if (failedFirst[k]) {
      firstOrder[k] = null;
      flagged[k] = `linearization fails: ${failedFirst[k]}`;
      continue;
    }
    const g = grad[k]!;
    let var1 = 0;
    for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) var1 += g[i]! * V[i]![j]! * g[j]!;
    if (var1 < 0) var1 = 0;
    const u1 = Math.sqrt(var1);
    firstOrder[k] = u1;
    const second = Math.sqrt(curv[k]!.reduce((s, c) => s + 2 * c * c, 0));
    const tiny = 1e-12 * Math.abs(y0[k]!);
    if (second > NONLINEAR_FRACTION * u1 && second > tiny) {
      flagged[k] = `nonlinear within the uncertainty: the second-order term ${fmtOut(k, second)} exceeds ${NONLINEAR_FRACTION} of the first-order u = ${fmtOut(k, u1)}`;
    }
  }

  // Monte Carlo
  let monteCarlo: UncertaintyReport["monteCarlo"];
  if (method === "monte-carlo") {
    // bounded work: the first-order runs timed the calculator at these inputs
    const perRun = (Date.now() - startedFirst) / Math.max(1, 2 * n);
    if (samples * perRun > MC_TIME_BUDGET_MS) {
      const most = Math.max(0, Math.floor(MC_TIME_BUDGET_MS / Math.max(perRun, 1e-3)));
      throw new InputError(
        "uncertainty.samples",
        samples,
        `at most about ${most} Monte Carlo draws for '${spec.id}' at these inputs (one run takes about ${(perRun / 1000).toPrecision(2)} s; the draws are limited to ${MC_TIME_BUDGET_MS / 1000} s)`,
        most < 10 ? "Use the first-order propagation (the default)" : undefined,
      );
    }
    const rng = seededRandom(seed);
    const sums: Record<string, { s: number; s2: number; count: number }> = Object.fromEntries(scalarNames.map((k) => [k, { s: 0, s2: 0, count: 0 }]));
    let failed = 0;
    let firstFailure = "";
    const z = new Array<number>(n);
    for (let draw = 0; draw < samples; draw++) {
      for (let i = 0; i < n; i++) z[i] = rng.normal();
      const x = { ...x0 };
      for (let i = 0; i < n; i++) {
        let d = 0;
        for (let j = 0; j <= i; j++) d += L[i]![j]! * z[j]!;
        x[names[i]!] = x0[names[i]!]! + d;
      }
      const o = run(x);
      evaluations++;
      if (!o.ok) {
        failed++;
        firstFailure ||= o.why;
        continue;
      }
      noteText(o);
      for (const k of scalarNames) {
        const v = o.scalars[k];
        if (v === undefined) continue;
        // shifted sums (about the nominal value) keep the variance accurate
        const d = v - y0[k]!;
        sums[k]!.s += d;
        sums[k]!.s2 += d * d;
        sums[k]!.count++;
      }
    }
    const mean: Record<string, number | null> = {};
    const sd: Record<string, number | null> = {};
    for (const k of scalarNames) {
      const { s, s2, count } = sums[k]!;
      if (count < 2) {
        mean[k] = null;
        sd[k] = null;
        flag(k, `no value in ${samples - count} of ${samples} Monte Carlo draws`);
        continue;
      }
      const m = s / count;
      mean[k] = y0[k]! + m;
      sd[k] = Math.sqrt(Math.max(0, (s2 - count * m * m) / (count - 1)));
      const missing = samples - count;
      const u1 = firstOrder[k];
      if (missing > 0) flag(k, `no value in ${missing} of ${samples} Monte Carlo draws${firstFailure ? ` (e.g. ${firstFailure})` : ""}`);
      else if (u1 !== null && u1 !== undefined) {
        const tiny = 1e-12 * Math.abs(y0[k]!);
        const ratio = u1 > tiny ? sd[k]! / u1 : sd[k]! > tiny ? Infinity : 1;
        if (ratio > DISAGREEMENT_FACTOR || ratio < 1 / DISAGREEMENT_FACTOR) {
          flag(
            k,
            `first order and Monte Carlo disagree: u = ${fmtOut(k, u1)} against a Monte Carlo standard deviation ${fmtOut(k, sd[k]!)} (more than a factor ${DISAGREEMENT_FACTOR})`,
          );
        } else if (Math.abs(m) > NONLINEAR_FRACTION * u1 && Math.abs(m) > tiny) {
          flag(k, `the Monte Carlo mean ${fmtOut(k, mean[k]!)} lies ${(Math.abs(m) / u1).toFixed(2)} u from the value (more than ${NONLINEAR_FRACTION} u)`);
        }
      }
    }
    monteCarlo = { samples, seed, failed, mean, standardDeviation: sd };
  }

  // the result: the nominal one with uncertainties, the method and the flags
  const result: CalculatorResult & { uncertainty?: UncertaintyReport } = nominal;
  for (const name of names) (result.inputs[name] as { uncertainty?: number }).uncertainty = sigma[name]!;
  for (const k of scalarNames) {
    const value = method === "monte-carlo" ? monteCarlo!.standardDeviation[k] : firstOrder[k];
    if (value !== null && value !== undefined && Number.isFinite(value)) (result.outputs[k] as { uncertainty?: number }).uncertainty = value;
  }
  const inputList = names.map((nm) => `${nm} = ${fmtIn(nm, x0[nm]!)} ± ${fmtIn(nm, sigma[nm]!)}`).join(", ");
  const corrText = correlations.length ? `; correlations ${correlations.map((c) => `r(${c.between[0]}, ${c.between[1]}) = ${c.coefficient}`).join(", ")}` : "; inputs independent";
  result.notes.push(
    method === "monte-carlo"
      ? `Uncertainties by Monte Carlo (JCGM 101:2008): ${samples} draws from a normal distribution of ${inputList}${corrText}, seed ${seed}; the value is the one at the given inputs, the uncertainty the standard deviation of the draws (first-order values in uncertainty.firstOrder); with ${samples} draws that standard deviation is itself uncertain by about ${Math.round(100 / Math.sqrt(2 * (samples - 1)))} % and a mean by ${(1 / Math.sqrt(samples)).toFixed(2)} of it, so a flag from few draws may be chance: repeat with more.`
      : `Uncertainties to first order (JCGM 100:2008 eq. 13) from ${inputList}${corrText}; sensitivities by central differences with the step ±u (${evaluations} runs). Monte Carlo on request.`,
  );
  for (const [k, why] of Object.entries(flagged)) result.notes.push(`${k}: uncertainty not trustworthy, ${why}.`);
  if (sweepOnly.length) result.notes.push(`No uncertainty for ${sweepOnly.join(", ")}: computed from the sweep, which the propagation runs do not repeat.`);
  for (const k of textChanges) result.notes.push(`${k} changes within the uncertainty of the inputs (a different answer at some input within ±u).`);
  result.assumptions = [
    ...result.assumptions,
    "Input uncertainties are standard uncertainties of normally distributed inputs; output uncertainties are propagated through this model only (its own error is not included).",
  ];
  if (Object.keys(flagged).length > 0 || textChanges.size > 0) result.status = "warning";
  result.uncertainty = { method, inputs: { ...sigma }, correlations, firstOrder, ...(monteCarlo ? { monteCarlo } : {}), flagged, evaluations };
  return result;

  function fmtOut(k: string, v: number): string {
    const unit = spec.outputs.find((o) => o.name === k)!.unit;
    return unit ? formatQuantity(v, unit) : v.toPrecision(3);
  }
}

/** A text with its numbers replaced by "#" (a statement that quotes a value changes with it). */
function wordsOf(text: string | undefined): string {
  return text === undefined ? "(none)" : text.replace(/[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?/g, "#");
}

function correlationOf(list: InputCorrelation[], a: string, b: string): number {
  for (const c of list) if ((c.between[0] === a && c.between[1] === b) || (c.between[0] === b && c.between[1] === a)) return c.coefficient;
  return 0;
}

/** Correlations checked: pairs of distinct uncertain inputs, |r| <= 1, each pair once. */
function checkCorrelations(list: InputCorrelation[], names: string[]): InputCorrelation[] {
  if (!Array.isArray(list)) throw new InputError("correlations", list, "a list of { between: [name, name], coefficient }");
  const seen = new Set<string>();
  const out: InputCorrelation[] = [];
  for (const c of list) {
    const pair = c?.between;
    if (!Array.isArray(pair) || pair.length !== 2 || typeof pair[0] !== "string" || typeof pair[1] !== "string" || pair[0] === pair[1]) {
      throw new InputError("correlations", JSON.stringify(c), "{ between: [name, name], coefficient } with two different input names");
    }
    for (const p of pair) {
      if (!names.includes(p)) throw new InputError(`correlations ${pair.join(", ")}`, p, `an input that carries an uncertainty: ${names.join(", ") || "(none)"}`);
    }
    if (typeof c.coefficient !== "number" || !(Math.abs(c.coefficient) <= 1))
      throw new InputError(`correlation of ${pair.join(" and ")}`, c.coefficient, "a correlation coefficient from -1 to 1");
    const key = [...pair].sort().join(" ");
    if (seen.has(key)) throw new InputError(`correlation of ${pair.join(" and ")}`, c.coefficient, "each pair once");
    seen.add(key);
    out.push({ between: [pair[0], pair[1]], coefficient: c.coefficient });
  }
  return out;
}
