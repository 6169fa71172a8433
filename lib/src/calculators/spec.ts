/**
 * The calculator: a pure function of typed, SI-valued inputs plus a declarative description.
 * One spec drives the kernel (`explore`, `table`), the browser widgets (controls, live plots) and
 * the command line (`helicoid calc`). Adding a calculator = one compute function + one spec.
 */
import { ComputationError, InputError } from "../errors.js";
import { formatQuantity, isPlainNumber, parseQuantity, type QuantityInput } from "../quantity/units.js";

/** One input of a calculator. All numbers are SI in `unit`. */
export interface InputSpec {
  /** Name used in code, on the command line and in JSON ("Ms", "A", "B"). */
  name: string;
  /** Symbol as LaTeX ("M_s", "\\mu_0 H"). */
  symbol: string;
  /** SI unit string understood by mathjs ("A/m", "J/m", "T"); "" for dimensionless. */
  unit: string;
  /** Default value (SI). */
  default: number;
  /** Slider range (SI). Values outside are allowed from code if the physics allows. */
  min: number;
  max: number;
  /** Slider scale. */
  scale: "linear" | "log";
  /** "integer" inputs take whole numbers; "choice" inputs take one of `choices`. */
  kind?: "number" | "integer" | "choice";
  choices?: Array<{ value: number; label: string }>;
  /** One line saying what the input means (shown on hover). */
  meaning: string;
}

/** One output of a calculator. */
export interface OutputSpec {
  name: string;
  symbol: string;
  /** SI unit string; "" for dimensionless. */
  unit: string;
  meaning: string;
  /** "scalar" (default), "array" (e.g. a sweep or profile), or "text" (a statement). */
  kind?: "scalar" | "array" | "text";
  /**
   * An array output whose points may have no value (a sweep crossing a region where the state does
   * not exist): NaN marks such a point and is drawn as a gap. The result then says how many (status
   * "warning" with a note). Never Infinity; without this flag every entry must be finite.
   */
  gaps?: boolean;
  /**
   * An output produced only under some inputs (a spiral period only above D_c, a saturation field
   * only where there is one): absent otherwise. Every other output is produced on every request.
   */
  optional?: boolean;
}

/** A plot the widgets draw from outputs: y outputs against an x output (array outputs). */
export interface PlotSpec {
  id: string;
  title: string;
  /** Output name for the x axis (an array output). */
  x: string;
  /** Output names for the y axis (array outputs of the same length as x). */
  y: string[];
  xLog?: boolean;
  yLog?: boolean;
  /** "line" (default) or "markers". */
  mode?: "line" | "markers";
}

/** Which inputs a calculator can sweep, and over how many points by default. */
export interface SweepSpec {
  /** Input names that may be swept; the first is the default. */
  over: string[];
  points: number;
  /** At most this many points (when each point is costly); MAX_SWEEP_POINTS otherwise. */
  maxPoints?: number;
  /** Why the limit, for the refusal ("every field gets a global search of the minima"). */
  maxPointsWhy?: string;
}

export type InputValues = Record<string, number>;

/**
 * One sweep request, the one shape used by the library, the kernel, the widgets and the command:
 * the input `over` from `from` to `to` (SI) in `points` values (see sweepValues).
 */
export interface SweepRange {
  over: string;
  from: number;
  to: number;
  points: number;
}

export interface ComputeOptions {
  /** Sweep an input over [from, to] with `points` values (linear, or log if the input is log). */
  sweep?: SweepRange;
}

/** What a compute function returns: SI outputs plus its story. */
export interface ComputeOutput {
  values: Record<string, number | number[] | string>;
  /** "ok", or "warning" with notes (e.g. outside the model's validity). */
  status?: "ok" | "warning";
  notes?: string[];
}

/**
 * A physical limit of an input, refused outside (unlike the slider range, which only informs):
 * `{ above: 0, why: "a thickness" }` refuses t <= 0. `min`/`max` are inclusive, `above`/`below`
 * exclusive.
 */
export interface InputLimit {
  min?: number;
  max?: number;
  above?: number;
  below?: number;
  /** What the input is, in words, for the message ("a film thickness"). */
  why: string;
}

/** The physical limits of a film's inputs, shared by every calculator that takes a film. */
export const filmLimits: Record<string, InputLimit> = {
  Ms: { above: 0, why: "a saturation magnetization" },
  A: { above: 0, why: "an exchange stiffness" },
  t: { above: 0, why: "a film thickness" },
};

/**
 * The estimated cost of one request, before any of it is spent: `bytes` of memory at the peak and
 * `steps` of elementary work (a flop, a cell visit, a matrix entry), with a word on what dominates.
 */
export interface ComputeCost {
  bytes: number;
  steps: number;
  /** The input that drives the cost most (named in the refusal). */
  parameter: string;
  /** What dominates, in words ("n^2 = 1e18 cells of 3 components"). */
  what: string;
}

/**
 * The budget of one calculator request: about 2 GB of memory and about a minute of work on a
 * 2-core laptop-class machine (1e10 elementary steps at a few ns each). Requests estimated above it
 * are refused with the estimate, before any allocation.
 */
export const COMPUTE_BUDGET = { bytes: 2e9, steps: 1e10 } as const;

/**
 * Inputs further than this factor outside their usual (slider) range are refused as physically
 * meaningless (A = 1e300 J/m, T = 1e-300 K); within it they are accepted, and beyond 100x noted.
 */
export const PLAUSIBLE_FACTOR = 1e6;

export interface CalculatorSpec {
  id: string;
  title: string;
  /** One paragraph: what this calculates. */
  summary: string;
  inputs: InputSpec[];
  outputs: OutputSpec[];
  plots: PlotSpec[];
  sweep?: SweepSpec;
  /** Model assumptions shown next to the numbers. */
  assumptions: string[];
  /** Published sources of the formulas and methods. */
  sources: string[];
  /** Method in a few words. */
  method: string;
  /** Physical limits of inputs, by input name: refused outside (see InputLimit). */
  limits?: Record<string, InputLimit>;
  /** Estimated memory and work of a request (checked against COMPUTE_BUDGET before computing). */
  cost?(inputs: InputValues, options: ComputeOptions): ComputeCost;
  compute(inputs: InputValues, options?: ComputeOptions): ComputeOutput;
}

/** A documented result: what `table()` and `helicoid calc --json` show. */
export interface CalculatorResult {
  id: string;
  title: string;
  status: "ok" | "warning";
  inputs: Record<string, { value: number; unit: string }>;
  outputs: Record<string, { value: number | number[] | string; unit: string }>;
  method: string;
  sources: string[];
  assumptions: string[];
  notes: string[];
  /** Present when a sweep was computed. */
  sweep?: SweepRange;
}

/**
 * Coerce raw inputs (SI numbers or strings with units) against a spec, filling defaults.
 * Unknown names are an error (a typo must not be silently ignored).
 */
export function coerceInputs(spec: CalculatorSpec, raw: Record<string, QuantityInput | undefined> = {}): InputValues {
  const known = new Set(spec.inputs.map((i) => i.name));
  for (const key of Object.keys(raw)) {
    if (!known.has(key)) {
      throw new InputError(key, raw[key], `one of the inputs of '${spec.id}': ${[...known].join(", ")}`);
    }
  }
  const out: InputValues = {};
  for (const input of spec.inputs) {
    const given = raw[input.name];
    const label = input.kind === "choice" && typeof given === "string" ? choiceByLabel(input, given) : undefined;
    const v = given === undefined ? input.default : label !== undefined ? label : parseQuantity(input.name, given, input.unit);
    if (input.kind === "integer" && !Number.isInteger(v)) {
      throw new InputError(input.name, given, "a whole number");
    }
    if (input.kind === "choice" && input.choices && !input.choices.some((c) => c.value === v)) {
      throw new InputError(input.name, given, choiceList(input));
    }
    checkPhysical(spec, input, given, v);
    out[input.name] = v;
  }
  return out;
}

/**
 * Refuse an input that no physics can mean: non-finite (a typed "1e309"), outside a declared
 * physical limit (a negative thickness), or more than PLAUSIBLE_FACTOR outside its usual range
 * (A = 1e300 J/m: a unit slip or nonsense; the computation would be meaningless or not finite).
 */
function checkPhysical(spec: CalculatorSpec, input: InputSpec, given: unknown, v: number): void {
  const shown = given === undefined ? v : given;
  const inUnit = (x: number) => (input.unit ? formatQuantity(x, input.unit) : String(x));
  if (!Number.isFinite(v)) throw new InputError(input.name, shown, `a finite number${input.unit ? ` in ${input.unit}` : ""}`);
  const lim = spec.limits?.[input.name];
  if (lim) {
    const bad =
      (lim.min !== undefined && v < lim.min) || (lim.max !== undefined && v > lim.max) ||
      (lim.above !== undefined && !(v > lim.above)) || (lim.below !== undefined && !(v < lim.below));
    if (bad) {
      const parts: string[] = [];
      if (lim.above !== undefined) parts.push(`> ${inUnit(lim.above)}`);
      if (lim.min !== undefined) parts.push(`>= ${inUnit(lim.min)}`);
      if (lim.below !== undefined) parts.push(`< ${inUnit(lim.below)}`);
      if (lim.max !== undefined) parts.push(`<= ${inUnit(lim.max)}`);
      throw new InputError(input.name, shown, `${lim.why}: a value ${parts.join(" and ")}`);
    }
  }
  if (input.kind === "choice") return;
  const f = PLAUSIBLE_FACTOR;
  const span = Math.max(Math.abs(input.min), Math.abs(input.max));
  let far = false;
  const positive = lim !== undefined && (lim.above === 0 || lim.min === 0);
  if ((input.scale === "log" || positive) && input.min > 0) far = (v > 0 && v < input.min / f) || Math.abs(v) > f * input.max;
  else far = span > 0 && Math.abs(v) > f * span;
  if (far) {
    throw new InputError(
      input.name, shown,
      `a value within a factor ${f.toExponential(0)} of the usual range ${inUnit(input.min)} to ${inUnit(input.max)} (outside it the model has no meaning: check the value${input.unit ? " and its unit" : ""})`,
    );
  }
}

/**
 * Refuse a request whose estimated memory or work exceeds COMPUTE_BUDGET, naming the estimate and
 * what dominates it, before anything is allocated.
 */
export function checkCost(spec: CalculatorSpec, inputs: InputValues, options: ComputeOptions): void {
  if (!spec.cost) return;
  const c = spec.cost(inputs, options);
  const over: string[] = [];
  if (!(c.bytes <= COMPUTE_BUDGET.bytes)) over.push(`about ${fmtBytes(c.bytes)} of memory (budget ${fmtBytes(COMPUTE_BUDGET.bytes)})`);
  if (!(c.steps <= COMPUTE_BUDGET.steps)) over.push(`about ${c.steps.toExponential(1)} elementary steps (budget ${COMPUTE_BUDGET.steps.toExponential(0)}, about a minute)`);
  if (over.length === 0) return;
  throw new InputError(
    c.parameter, inputs[c.parameter],
    `a request within the budget: this one needs ${over.join(" and ")}`,
    `Estimate: ${c.what}`,
  );
}

function fmtBytes(b: number): string {
  if (!Number.isFinite(b)) return "unbounded";
  if (b >= 1e12) return `${(b / 1e12).toPrecision(3)} TB`;
  if (b >= 1e9) return `${(b / 1e9).toPrecision(3)} GB`;
  return `${(b / 1e6).toPrecision(3)} MB`;
}

/**
 * A result must be finite to leave as "ok" or "warning": every scalar output a finite number,
 * every array output finite numbers. Anything else is a computation that failed.
 */
function checkFinite(spec: CalculatorSpec, values: ComputeOutput["values"]): string[] {
  const gapNotes: string[] = [];
  for (const o of spec.outputs) {
    const v = values[o.name];
    if (v === undefined || typeof v === "string") continue;
    if (typeof v === "number") {
      if (!Number.isFinite(v)) throw new ComputationError(spec.id, `output ${o.name} (${o.meaning}) came out ${v}, not a finite number: the inputs are outside what the method can handle`);
      continue;
    }
    if (!Array.isArray(v)) throw new ComputationError(spec.id, `output ${o.name} is neither a number, an array nor a text`);
    let gaps = 0;
    for (let i = 0; i < v.length; i++) {
      const x = v[i];
      if (o.gaps && typeof x === "number" && Number.isNaN(x)) {
        gaps++;
        continue;
      }
      if (typeof x !== "number" || !Number.isFinite(x)) {
        throw new ComputationError(spec.id, `output ${o.name}[${i}] (${o.meaning}) came out ${x}, not a finite number: the inputs are outside what the method can handle`);
      }
    }
    if (gaps > 0) gapNotes.push(`${o.name}: ${gaps} of ${v.length} points have no value (no state there; drawn as gaps)`);
  }
  return gapNotes;
}

/**
 * A choice given by its label: the whole label (any case, "skyrmion lattice"), or a word the
 * label starts with when only one label does ("lattice" does not; "antisk" does). Numbers are
 * left to parseQuantity.
 */
function choiceByLabel(input: InputSpec, given: string): number | undefined {
  const g = given.trim().toLowerCase();
  if (g === "" || /^[-+.\d]/.test(g) || !input.choices) return undefined;
  const exact = input.choices.find((c) => c.label.toLowerCase() === g);
  if (exact) return exact.value;
  const starts = input.choices.filter((c) => c.label.toLowerCase().startsWith(g));
  if (starts.length === 1) return starts[0]!.value;
  throw new InputError(input.name, given, `${choiceList(input)}${starts.length > 1 ? ` ("${given}" starts ${starts.length} of the labels)` : ""}`);
}

/** "one of 0 (skyrmion), 1 (antiskyrmion), ..." for error messages. */
function choiceList(input: InputSpec): string {
  return `one of ${(input.choices ?? []).map((c) => `${c.value} (${c.label})`).join(", ")}`;
}

/** The largest number of points of any sweep (a calculator may allow fewer: see its `sweep.maxPoints`). */
export const MAX_SWEEP_POINTS = 100000;

/**
 * A sweep request checked before any work: `over` one of the spec's sweepable inputs, `points` a
 * whole number from 2 to the spec's limit, the ends finite, within the input's physical limits and
 * plausible, and two different values. Errors name `sweep`, `sweep.points`, `sweep from` or `sweep to`.
 */
export function checkSweep(spec: CalculatorSpec, sweep: SweepRange): void {
  const sweepable = spec.sweep?.over ?? [];
  const input = spec.inputs.find((i) => i.name === sweep.over);
  if (!input || !sweepable.includes(sweep.over)) {
    throw new InputError("sweep", sweep.over, `one of the sweepable inputs of '${spec.id}': ${sweepable.join(", ") || "(none)"}`);
  }
  const most = Math.min(spec.sweep?.maxPoints ?? MAX_SWEEP_POINTS, MAX_SWEEP_POINTS);
  if (typeof sweep.points !== "number" || !Number.isInteger(sweep.points) || sweep.points < 2 || sweep.points > most) {
    const why = most < MAX_SWEEP_POINTS ? ` (at most ${most} points for '${spec.id}'${spec.sweep?.maxPointsWhy ? `: ${spec.sweep.maxPointsWhy}` : ""})` : "";
    throw new InputError("sweep.points", sweep.points, `a whole number of points from 2 to ${most}${why}`);
  }
  for (const [end, v] of [["from", sweep.from], ["to", sweep.to]] as const) {
    if (typeof v !== "number") throw new InputError(`sweep ${end}`, v, `a number for ${input.name} in ${input.unit || "(no unit)"} (SI)`);
    try {
      checkPhysical(spec, input, v, v);
    } catch (err) {
      if (err instanceof InputError) throw new InputError(`sweep ${end}`, v, `for ${input.name}, ${err.expected}`);
      throw err;
    }
  }
  if (sweep.from === sweep.to) throw new InputError("sweep", `${sweep.from} .. ${sweep.to}${input.unit ? ` ${input.unit}` : ""}`, `a sweep of ${input.name} over two different values`);
}

/**
 * Values of a sweep (checked first, see checkSweep): linear, or logarithmic when the swept input
 * has a log scale and both ends are positive. The one place a sweep's points are made.
 */
export function sweepValues(spec: CalculatorSpec, sweep: SweepRange): number[] {
  checkSweep(spec, sweep);
  const input = spec.inputs.find((i) => i.name === sweep.over)!;
  const n = sweep.points;
  const values = new Array<number>(n);
  const log = input.scale === "log" && sweep.from > 0 && sweep.to > 0;
  for (let i = 0; i < n; i++) {
    const s = i / (n - 1);
    values[i] = log ? Math.exp(Math.log(sweep.from) + s * (Math.log(sweep.to) - Math.log(sweep.from))) : sweep.from + s * (sweep.to - sweep.from);
  }
  // the ends exactly as requested (no rounding past them)
  values[0] = sweep.from;
  values[n - 1] = sweep.to;
  return values;
}

/** Run a calculator: coerce inputs, compute, and attach units, method, sources and assumptions. */
export function runCalculator(
  spec: CalculatorSpec,
  raw: Record<string, QuantityInput | undefined> = {},
  options: ComputeOptions & { /** compute without the spec's default sweep */ noSweep?: boolean } = {},
): CalculatorResult {
  const inputs = coerceInputs(spec, raw);
  const sweep = options.sweep ?? (options.noSweep ? undefined : defaultSweep(spec, inputs));
  if (sweep) checkSweep(spec, sweep);
  let computed: ComputeOutput;
  try {
    checkCost(spec, inputs, sweep ? { sweep } : {});
    computed = spec.compute(inputs, sweep ? { sweep } : {});
  } catch (err) {
    if (!(err instanceof InputError)) throw err;
    throw explainComputeError(spec, raw, inputs, err);
  }
  const gapNotes = checkFinite(spec, computed.values);
  const outputs: CalculatorResult["outputs"] = {};
  for (const o of spec.outputs) {
    const v = computed.values[o.name];
    if (v === undefined) continue;
    outputs[o.name] = { value: v, unit: o.unit };
  }
  const result: CalculatorResult = {
    id: spec.id,
    title: spec.title,
    status: gapNotes.length ? "warning" : computed.status ?? "ok",
    inputs: Object.fromEntries(spec.inputs.map((i) => [i.name, { value: inputs[i.name]!, unit: i.unit }])),
    outputs,
    method: spec.method,
    sources: spec.sources,
    assumptions: spec.assumptions,
    notes: [...inputNotes(spec, raw, inputs), ...(computed.notes ?? []), ...gapNotes],
  };
  if (sweep) result.sweep = sweep;
  return result;
}

/**
 * Notes on how the given inputs were read: a dimensional input typed as a bare number is read in
 * SI units (said, since "A=15" meant as pJ/m is a common slip), and a value more than 100 times
 * outside its slider range is flagged (the calculators accept it, the result may be meaningless).
 */
function inputNotes(spec: CalculatorSpec, raw: Record<string, QuantityInput | undefined>, inputs: InputValues): string[] {
  const notes: string[] = [];
  for (const input of spec.inputs) {
    const given = raw[input.name];
    if (given === undefined || input.kind === "choice" || input.kind === "integer") continue;
    const v = inputs[input.name]!;
    // (angles are commonly typed as bare radians: no note for "rad")
    if (input.unit && input.unit !== "rad" && typeof given === "string" && isPlainNumber(given)) {
      notes.push(`${input.name} = ${given.trim()} was given without a unit: read as ${v} ${input.unit} (SI)`);
    }
    const span = Math.max(Math.abs(input.min), Math.abs(input.max));
    const far = input.scale === "log" && input.min > 0 && v > 0 ? v > 100 * input.max || v < input.min / 100 : span > 0 && Math.abs(v) > 100 * span;
    if (far) notes.push(`${input.name} = ${formatQuantity(v, input.unit)} is far outside the usual range ${formatQuantity(input.min, input.unit)} to ${formatQuantity(input.max, input.unit)}: check the value and its unit`);
  }
  return notes;
}

/**
 * An InputError from a compute function, restated for the user: the value as typed ("-15 pJ/m"),
 * and, when the rejected input was not given, that its default was used together with what was
 * given; a quantity that is not an input is said to be computed from the inputs.
 */
function explainComputeError(spec: CalculatorSpec, raw: Record<string, QuantityInput | undefined>, inputs: InputValues, err: InputError): InputError {
  const name = err.parameter;
  const input = spec.inputs.find((i) => i.name === name);
  const givenList = Object.entries(raw).filter(([, v]) => v !== undefined).map(([k, v]) => `${k} = ${v}`);
  const extra: string[] = [];
  let value: unknown = err.value;
  if (input) {
    const given = raw[name];
    if (given !== undefined) {
      value = given;
      if (input.unit && String(given).trim() !== String(inputs[name])) extra.push(`(${name} = ${inputs[name]} ${input.unit} in SI)`);
    } else {
      value = input.unit ? formatQuantity(inputs[name]!, input.unit) : inputs[name];
      extra.push(`(${name} was not given: its default was used${givenList.length ? `; given: ${givenList.join(", ")}` : ""})`);
    }
  } else if (!name.startsWith("sweep")) {
    extra.push(`(a quantity computed by '${spec.id}' from its inputs${givenList.length ? `; given: ${givenList.join(", ")}` : ""})`);
  }
  if (err.detail) extra.push(err.detail);
  return new InputError(name, value, err.expected, extra.join(" ") || undefined);
}

/**
 * The default sweep of a spec: its first sweepable input over its slider range, with the spec's
 * number of points (the one builder used by runCalculator, the kernel's explorer and the widgets).
 */
export function defaultSweep(spec: Pick<CalculatorSpec, "inputs" | "sweep">, _inputs?: InputValues): SweepRange | undefined {
  if (!spec.sweep || spec.sweep.over.length === 0) return undefined;
  const name = spec.sweep.over[0]!;
  const input = spec.inputs.find((i) => i.name === name)!;
  return { over: name, from: input.min, to: input.max, points: spec.sweep.points };
}

/**
 * For compute functions: an integer input that the physics needs at least `min` of (a spin 2S >= 1,
 * a grid of >= 3 points), refused under the input's own name (slider ranges are not enforced).
 */
export function requireWholeAtLeast(v: InputValues, name: string, min: number, meaning: string): number {
  const x = v[name];
  if (x === undefined || !Number.isInteger(x) || x < min) throw new InputError(name, x, `a whole number >= ${min} (${meaning})`);
  return x;
}
