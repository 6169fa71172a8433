/**
 * The calculator: a pure function of typed, SI-valued inputs plus a declarative description.
 * One spec drives the kernel (`explore`, `table`), the browser widgets (controls, live plots) and
 * the command line (`helicoid calc`). Adding a calculator = one compute function + one spec.
 */
import { InputError } from "../errors.js";
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
}

export type InputValues = Record<string, number>;

export interface ComputeOptions {
  /** Sweep an input over [from, to] with `points` values (linear, or log if the input is log). */
  sweep?: { over: string; from: number; to: number; points: number };
}

/** What a compute function returns: SI outputs plus its story. */
export interface ComputeOutput {
  values: Record<string, number | number[] | string>;
  /** "ok", or "warning" with notes (e.g. outside the model's validity). */
  status?: "ok" | "warning";
  notes?: string[];
}

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
  sweep?: { over: string; from: number; to: number; points: number };
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
    out[input.name] = v;
  }
  return out;
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

/** Values of a sweep: linear, or logarithmic when the swept input has a log scale. */
export function sweepValues(spec: CalculatorSpec, sweep: NonNullable<ComputeOptions["sweep"]>): number[] {
  const input = spec.inputs.find((i) => i.name === sweep.over);
  if (!input || !(spec.sweep?.over ?? []).includes(sweep.over)) {
    throw new InputError("sweep", sweep.over, `one of the sweepable inputs of '${spec.id}': ${(spec.sweep?.over ?? []).join(", ") || "(none)"}`);
  }
  if (!Number.isInteger(sweep.points) || sweep.points < 2 || sweep.points > 100000) {
    throw new InputError("sweep.points", sweep.points, "a whole number from 2 to 100000");
  }
  const n = sweep.points;
  const values = new Array<number>(n);
  const log = input.scale === "log" && sweep.from > 0 && sweep.to > 0;
  for (let i = 0; i < n; i++) {
    const s = i / (n - 1);
    values[i] = log ? Math.exp(Math.log(sweep.from) + s * (Math.log(sweep.to) - Math.log(sweep.from))) : sweep.from + s * (sweep.to - sweep.from);
  }
  return values;
}

/** Run a calculator: coerce inputs, compute, and attach units, method, sources and assumptions. */
export function runCalculator(
  spec: CalculatorSpec,
  raw: Record<string, QuantityInput | undefined> = {},
  options: ComputeOptions = {},
): CalculatorResult {
  const inputs = coerceInputs(spec, raw);
  const sweep = options.sweep ?? defaultSweep(spec, inputs);
  let computed: ComputeOutput;
  try {
    computed = spec.compute(inputs, sweep ? { sweep } : {});
  } catch (err) {
    if (!(err instanceof InputError)) throw err;
    throw explainComputeError(spec, raw, inputs, err);
  }
  const outputs: CalculatorResult["outputs"] = {};
  for (const o of spec.outputs) {
    const v = computed.values[o.name];
    if (v === undefined) continue;
    outputs[o.name] = { value: v, unit: o.unit };
  }
  const result: CalculatorResult = {
    id: spec.id,
    title: spec.title,
    status: computed.status ?? "ok",
    inputs: Object.fromEntries(spec.inputs.map((i) => [i.name, { value: inputs[i.name]!, unit: i.unit }])),
    outputs,
    method: spec.method,
    sources: spec.sources,
    assumptions: spec.assumptions,
    notes: [...inputNotes(spec, raw, inputs), ...(computed.notes ?? [])],
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
  } else {
    extra.push(`(a quantity computed by '${spec.id}' from its inputs${givenList.length ? `; given: ${givenList.join(", ")}` : ""})`);
  }
  if (err.detail) extra.push(err.detail);
  return new InputError(name, value, err.expected, extra.join(" ") || undefined);
}

/** The default sweep of a spec: its first sweepable input over its slider range. */
export function defaultSweep(spec: CalculatorSpec, _inputs: InputValues): ComputeOptions["sweep"] | undefined {
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
