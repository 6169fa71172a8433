/**
 * The calculator: a pure function of typed, SI-valued inputs plus a declarative description.
 * One spec drives the kernel (`explore`, `table`), the browser widgets (controls, live plots) and
 * the command line (`helicoid calc`). Adding a calculator = one compute function + one spec.
 */
import { InputError } from "../errors.js";
import { parseQuantity, type QuantityInput } from "../quantity/units.js";

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
    const v = given === undefined ? input.default : parseQuantity(input.name, given, input.unit);
    if (input.kind === "integer" && !Number.isInteger(v)) {
      throw new InputError(input.name, given, "a whole number");
    }
    if (input.kind === "choice" && input.choices && !input.choices.some((c) => c.value === v)) {
      throw new InputError(input.name, given, `one of ${input.choices.map((c) => `${c.value} (${c.label})`).join(", ")}`);
    }
    out[input.name] = v;
  }
  return out;
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
    // The compute function sees SI numbers; name the value as the user gave it ("-15 pJ/m").
    const given = err instanceof InputError ? raw[err.parameter] : undefined;
    if (err instanceof InputError && given !== undefined && given !== err.value) {
      throw new InputError(err.parameter, given, err.expected, [`(${err.parameter} = ${err.value} in SI)`, err.detail].filter(Boolean).join(" "));
    }
    throw err;
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
    notes: computed.notes ?? [],
  };
  if (sweep) result.sweep = sweep;
  return result;
}

/** The default sweep of a spec: its first sweepable input over its slider range. */
export function defaultSweep(spec: CalculatorSpec, _inputs: InputValues): ComputeOptions["sweep"] | undefined {
  if (!spec.sweep || spec.sweep.over.length === 0) return undefined;
  const name = spec.sweep.over[0]!;
  const input = spec.inputs.find((i) => i.name === name)!;
  return { over: name, from: input.min, to: input.max, points: spec.sweep.points };
}
