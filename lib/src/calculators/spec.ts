/**
 * The calculator: a pure function of typed, SI-valued inputs plus a declarative description.
 * One spec drives the kernel (`explore`, `table`), the browser widgets (controls, live plots) and
 * the command line (`helicoid calc`). Adding a calculator = one compute function + one spec.
 */
import { ComputationError, InputError } from "../errors.js";
import { formatQuantity, isPlainNumber, parseQuantity, type QuantityInput } from "../quantity/units.js";
import { inUncertainForm, runWithUncertainty, type InputWithUncertainty, type UncertaintyOptions, type UncertaintyReport } from "./uncertainty.js";
import type { DocumentedResult, Quantity } from "../result.js";
import type { CatalogueSpec } from "./catalogue.js";
import { filmInputsFor, isFilmRecord, type FilmRecord } from "../material/filmFile.js";

/** One input of a calculator. All numbers are SI in `unit`. */
export interface InputSpec<N extends string = string> {
  /** Name used in code, on the command line and in JSON ("Ms", "A", "B"). */
  name: N;
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
   * An output that is present only in some cases (a sweep output without a sweep, a spiral period
   * only above D_c): typed optional (`outputs.x?.value`), and reading it when absent gives
   * `undefined`. Reading an absent output that is not optional is an InputError that lists the
   * outputs the result has.
   */
  optional?: boolean;
  /** The output holding this output's standard uncertainty: tables show "value ± uncertainty". */
  uncertainty?: string;
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
  /**
   * The y values are defined modulo this period (SI, e.g. 2 pi for a phase in (-pi, pi]): a line is
   * broken where the curve wraps instead of being drawn across the axis.
   */
  yPeriod?: number;
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
  /**
   * Progress of a long computation, for calculators that report it: the fraction done (0..1) and
   * what is being done, in words. Called from inside the computation (keep it cheap).
   */
  onProgress?: (fraction: number, what: string) => void;
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
  /** The outputs a reader looks at first (result tables show them in their own group); default: the first four numbers. */
  headline?: string[];
  /** Estimated memory and work of a request (checked against COMPUTE_BUDGET before computing). */
  cost?(inputs: InputValues, options: ComputeOptions): ComputeCost;
  compute(inputs: InputValues, options?: ComputeOptions): ComputeOutput;
}

/** One output of a result: its value (SI) and unit. */
export type OutputEntry<V extends number | number[] | string = number | number[] | string> = Quantity<V>;

/**
 * A documented result: what `table()` and `helicoid calc --json` show. `I` (input names) and `O`
 * (the outputs, name -> {value, unit}) are known for a calculator of the catalogue, so
 * `runCalculator("skyrmion").outputs.radius.value` is a `number`; without them (a spec typed as
 * plain `CalculatorSpec`) any name is accepted by the type checker and checked at run time.
 */
export interface CalculatorResult<I extends string = string, O = Record<string, OutputEntry>> extends DocumentedResult {
  id: string;
  title: string;
  status: "ok" | "warning";
  inputs: Record<I, Quantity>;
  outputs: O;
  method: string;
  sources: string[];
  assumptions: string[];
  notes: string[];
  /** Present when a sweep was computed. */
  sweep?: SweepRange;
  /** Present when an input carried an uncertainty (uncertainty.ts): method, flags; entries of
   * `inputs` and numeric scalar `outputs` then carry `uncertainty` (SI, one standard deviation). */
  uncertainty?: UncertaintyReport;
}

// ---------------------------------------------------------------------------------------------
// The typed catalogue: a spec made by `defineCalculator` carries its id, input names and output
// shapes as types (compile time only; at run time it is the same plain spec object).

/** The value type of an output declaration: array -> number[], text -> string, else number. */
export type OutputValueOf<E> = E extends { kind: "array" } ? number[] : E extends { kind: "text" } ? string : number;

/**
 * The outputs object of a result, from the union of a spec's output declarations: one property per
 * name, optional when the declaration says `optional: true`. A name typed only as `string` (made
 * at run time) gives an index signature.
 */
export type OutputsOf<E extends { name: string }> = Flatten<
  {
    [K in E as K extends { optional: true } ? never : K["name"]]: OutputEntry<OutputValueOf<K>>;
  } & {
    [K in E as K extends { optional: true } ? K["name"] : never]?: OutputEntry<OutputValueOf<K>>;
  }
>;

/** One object type instead of an intersection (so a type error lists the names, not the alias). */
type Flatten<T> = T extends infer U ? { [K in keyof U]: U[K] } : never;

/** Compile-time key of a typed spec's shape (no such property exists at run time). */
export declare const calculatorTypes: unique symbol;

/** A spec whose id, inputs and outputs are types: what `defineCalculator` returns. */
export interface TypedCalculatorSpec<Id extends string = string, I extends string = string, O = Record<string, OutputEntry>> extends CalculatorSpec {
  id: Id;
  /** Types only: never present at run time. */
  readonly [calculatorTypes]: { inputs: I; outputs: O };
}

/** Input names of a spec (`string` for a spec without types). */
export type InputNamesOf<S> = S extends { readonly [calculatorTypes]: { inputs: infer I extends string } } ? I : string;
/** The outputs object of a spec's result. */
export type OutputsOfSpec<S> = S extends { readonly [calculatorTypes]: { outputs: infer O } } ? O : Record<string, OutputEntry>;
/** The result of running a spec. */
export type ResultOf<S> = S extends { readonly [calculatorTypes]: { inputs: infer I extends string; outputs: infer O } } ? CalculatorResult<I, O> : CalculatorResult;

/**
 * Fields of a film (`makeFilm`, `Film`) accepted in the inputs of any calculator although they are
 * not inputs: `dmi` ("interfacial" agrees with every film calculator of the catalogue; "bulk" is
 * refused by a calculator that takes D), and `alpha`, `gamma` where they are not inputs (said in
 * the result's notes). See `runCalculator`.
 */
export interface FilmFieldsInInputs {
  dmi?: string;
  alpha?: QuantityInput;
  gamma?: QuantityInput;
}

/**
 * What `runCalculator` takes as inputs: each input by name (an SI number or a string with a unit),
 * any of them left out for its default. A `Film` (or any object with the fields of one) is accepted,
 * and so is a film file as `loadFilm` reads it (its uncertainties and correlations carried through).
 */
export type CalculatorInputs<S> = string extends InputNamesOf<S> ? object : ({ [K in InputNamesOf<S>]?: InputWithUncertainty } & FilmFieldsInInputs) | FilmRecord;

/** What `defineCalculator` takes: a spec whose inputs and outputs may be read-only literals. */
export interface CalculatorDefinition<Id extends string, N extends string, O extends OutputSpec> extends Omit<CalculatorSpec, "id" | "inputs" | "outputs"> {
  id: Id;
  inputs: ReadonlyArray<InputSpec<N>>;
  outputs: readonly O[];
}

/**
 * Define a calculator so that its id, input names and outputs are types: the spec object is
 * returned unchanged (run-time behaviour is that of the same spec typed `CalculatorSpec`).
 *
 *     const spec = defineCalculator({ id: "x", inputs: [{ name: "B", ... }], outputs: [{ name: "r", ... }], ... });
 *     runCalculator(spec, { B: "50 mT" }).outputs.r.value; // number
 */
export function defineCalculator<const Id extends string, N extends string, const O extends OutputSpec>(
  spec: CalculatorDefinition<Id, N, O>,
): TypedCalculatorSpec<Id, N, OutputsOf<O>> {
  return spec as unknown as TypedCalculatorSpec<Id, N, OutputsOf<O>>;
}

/** A list of input declarations whose names stay types (for inputs shared by several specs). */
export function inputList<N extends string>(inputs: Array<InputSpec<N>>): Array<InputSpec<N>> {
  return inputs;
}

/** One choice of a choice input: a label (its value is its place, 0, 1, ...), a [value, label] pair, or {value, label}. */
export type ChoiceEntry = string | readonly [number, string] | { value: number; label: string };

/**
 * A choice input, its name kept as a type (for `defineCalculator`): the values are the labels'
 * places (0, 1, ...) or the values given with them, the slider range from the smallest to the
 * largest, the default the first choice's value unless `options.default` says otherwise.
 *
 *     choiceInput("boundary", "\\text{bc}", ["periodic", "open"], "boundary of the grid")
 *     choiceInput("polarity", "p", [[1, "up-down"], [-1, "down-up"]], "wall polarity")
 */
export function choiceInput<const N extends string>(name: N, symbol: string, labels: readonly ChoiceEntry[], meaning: string, options: { default?: number } = {}): InputSpec<N> {
  const choices = labels.map((c, i) =>
    typeof c === "string" ? { value: i, label: c } : Array.isArray(c) ? { value: c[0] as number, label: c[1] as string } : { ...(c as { value: number; label: string }) },
  );
  if (choices.length === 0) throw new InputError(`${name}: choices`, "(none)", "at least one choice");
  const values = choices.map((c) => c.value);
  if (values.some((v) => !Number.isFinite(v)) || new Set(values).size !== values.length) throw new InputError(`${name}: choices`, values.join(", "), "distinct finite values");
  const dflt = options.default ?? values[0]!;
  if (!values.includes(dflt)) throw new InputError(`${name}: default`, dflt, `one of the choices' values (${values.join(", ")})`);
  return { name, symbol, unit: "", default: dflt, min: Math.min(...values), max: Math.max(...values), scale: "linear", kind: "choice", choices, meaning };
}

/** A list of output declarations whose names and kinds stay types (for outputs shared by several specs). */
export function outputList<const O extends OutputSpec>(outputs: readonly O[]): O[] {
  return outputs as O[];
}

/** Names of the calculators of the catalogue. */
export type CalculatorId = CatalogueSpec["id"];
/** The typed spec of a calculator of the catalogue, by id. */
export type SpecById<Id extends string> = Extract<CatalogueSpec, { id: Id }>;

/**
 * Coerce raw inputs (SI numbers or strings with units) against a spec, filling defaults.
 * Unknown names are an error (a typo must not be silently ignored).
 */
export function coerceInputs(spec: CalculatorSpec, raw: Record<string, QuantityInput | undefined> = {}): InputValues {
  const known = new Set(spec.inputs.map((i) => i.name));
  const film = filmFieldsOf(spec, raw);
  for (const key of Object.keys(raw)) {
    if (!known.has(key) && !film.ignored.includes(key)) {
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
      (lim.min !== undefined && v < lim.min) ||
      (lim.max !== undefined && v > lim.max) ||
      (lim.above !== undefined && !(v > lim.above)) ||
      (lim.below !== undefined && !(v < lim.below));
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
      input.name,
      shown,
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
  throw new InputError(c.parameter, inputs[c.parameter], `a request within the budget: this one needs ${over.join(" and ")}`, `Estimate: ${c.what}`);
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
      if (!Number.isFinite(v))
        throw new ComputationError(spec.id, `output ${o.name} (${o.meaning}) came out ${v}, not a finite number: the inputs are outside what the method can handle`);
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
 * label starts with when only one label does ("lattice" does not; "antisk" does). A label that
 * looks like a number ("-z", "3/2") is read as the label; other numbers are left to parseQuantity.
 */
function choiceByLabel(input: InputSpec, given: string): number | undefined {
  const g = given.trim().toLowerCase();
  if (g === "" || !input.choices) return undefined;
  // a whole label first: labels may start like a number ("+z", "-z", "1/2")
  const exact = input.choices.find((c) => c.label.toLowerCase() === g);
  if (exact) return exact.value;
  if (/^[-+.\d]/.test(g)) return undefined;
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
  for (const [end, v] of [
    ["from", sweep.from],
    ["to", sweep.to],
  ] as const) {
    if (typeof v !== "number") throw new InputError(`sweep ${end}`, v, `a number for ${input.name} in ${input.unit || "(no unit)"} (SI)`);
    try {
      checkPhysical(spec, input, v, v);
    } catch (err) {
      if (err instanceof InputError) throw new InputError(`sweep ${end}`, v, `for ${input.name}, ${err.expected}`);
      throw err;
    }
  }
  if (sweep.from === sweep.to)
    throw new InputError("sweep", `${sweep.from} .. ${sweep.to}${input.unit ? ` ${input.unit}` : ""}`, `a sweep of ${input.name} over two different values`);
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

/** The fields of a film that are not inputs of the spec (makeFilm's `dmi`, `alpha`, `gamma`). */
const FILM_FIELDS = ["Ms", "A", "Ku", "D", "t", "dmi", "alpha", "gamma"] as const;

/**
 * Film fields in a calculator's inputs that are not inputs of it. Only an object that carries a
 * film's `dmi` ("interfacial" or "bulk", as every `makeFilm` film does) is read as a film; then
 * its other film fields that the calculator does not take are left out with a note. Every film
 * calculator of the catalogue models interfacial DMI: `dmi: "bulk"` is refused by a calculator that
 * takes D (its numbers would describe another film), and noted by one that does not.
 */
function filmFieldsOf(spec: CalculatorSpec, raw: Record<string, unknown>): { ignored: string[]; notes: string[] } {
  const dmi = raw.dmi;
  const known = new Set(spec.inputs.map((i) => i.name));
  if (known.has("dmi") || (dmi !== "interfacial" && dmi !== "bulk")) return { ignored: [], notes: [] };
  if (dmi === "bulk" && known.has("D")) {
    throw new InputError("dmi", dmi, `"interfacial": '${spec.id}' models interfacial DMI only (see its assumptions), so a film with bulk DMI is outside it`);
  }
  const ignored = FILM_FIELDS.filter((k) => !known.has(k) && raw[k] !== undefined);
  const unused = ignored.filter((k) => k !== "dmi" || dmi === "bulk");
  const notes = unused.length ? [`Film fields that are not inputs of '${spec.id}' were not used: ${unused.map((k) => `${k} = ${String(raw[k])}`).join(", ")}`] : [];
  return { ignored: [...ignored], notes };
}

/** Options of `runCalculator`. */
export type RunOptions = ComputeOptions & {
  /** compute without the spec's default sweep */ noSweep?: boolean;
  /** how input uncertainties are propagated ("15 ± 1 pJ/m", {value, uncertainty}: uncertainty.ts) */ uncertainty?: UncertaintyOptions;
};

let catalogueLookup: ((id: string) => CalculatorSpec) | undefined;
/** Set by catalogue.ts so that `runCalculator` takes ids (spec.ts cannot import the catalogue: a cycle). */
export function setCatalogueLookup(lookup: (id: string) => CalculatorSpec): void {
  catalogueLookup = lookup;
}

/**
 * Run a calculator: coerce inputs, compute, and attach units, method, sources and assumptions.
 * The calculator is given by id ("skyrmion") or by its spec. For a calculator of the catalogue the
 * inputs and outputs are typed: a misspelt id, input or output does not compile, and
 * `outputs.radius.value` is a `number`. At run time reading an output the result does not have is
 * an InputError listing the outputs it has (an output declared `optional` reads as undefined).
 *
 * Inputs: SI numbers or strings with units. A `Film` from `makeFilm` (or any object with a film's
 * fields, `dmi` among them) is accepted: its fields that are inputs are used, `dmi`, `alpha`,
 * `gamma` where they are not inputs are left out with a note, and `dmi: "bulk"` is refused by a
 * calculator that takes D (every film calculator here models interfacial DMI).
 */
export function runCalculator<Id extends CalculatorId>(id: Id, raw?: CalculatorInputs<SpecById<Id>>, options?: RunOptions): ResultOf<SpecById<Id>>;
export function runCalculator<S extends CalculatorSpec>(spec: S, raw?: CalculatorInputs<S>, options?: RunOptions): ResultOf<S>;
/** An id held in a `string` variable (a literal id must be one of the catalogue's). */
export function runCalculator<T extends string>(id: string extends T ? T : never, raw?: Record<string, InputWithUncertainty>, options?: RunOptions): CalculatorResult;
export function runCalculator(specOrId: CalculatorSpec | string, rawGiven: object = {}, options: RunOptions = {}): CalculatorResult {
  let spec: CalculatorSpec;
  if (typeof specOrId === "string") {
    if (!catalogueLookup) throw new InputError("calculator", specOrId, "a spec object (ids need the catalogue: import runCalculator from @helicoid/lib)");
    spec = catalogueLookup(specOrId);
  } else spec = specOrId;
  if (rawGiven === null || typeof rawGiven !== "object" || Array.isArray(rawGiven)) {
    throw new InputError("inputs", rawGiven, `an object of inputs of '${spec.id}' by name (${spec.inputs.map((i) => i.name).join(", ")}) or a film`);
  }
  if (isFilmRecord(rawGiven)) {
    // a film file: the inputs this calculator takes, with the file's uncertainties and correlations
    // (options.uncertainty may ask for Monte Carlo or add its own); the file's notes come first
    const fromFile = filmInputsFor(spec, rawGiven);
    const uncertain = Object.values(fromFile.inputs).some(inUncertainForm);
    const uncertainty = uncertain || options.uncertainty ? { ...fromFile.uncertainty, ...(options.uncertainty ?? {}) } : undefined;
    const result = runCalculator(spec, fromFile.inputs, { ...options, ...(uncertainty ? { uncertainty } : {}) });
    result.notes.unshift(...fromFile.notes);
    return result;
  }
  if (options.uncertainty !== undefined || Object.values(rawGiven).some(inUncertainForm))
    return runWithUncertainty(spec, rawGiven as Record<string, InputWithUncertainty>, options);
  const raw = rawGiven as Record<string, QuantityInput | undefined>;
  const film = filmFieldsOf(spec, raw);
  const inputs = coerceInputs(spec, raw);
  const sweep = options.sweep ?? (options.noSweep ? undefined : defaultSweep(spec, inputs));
  if (sweep) checkSweep(spec, sweep);
  let computed: ComputeOutput;
  try {
    checkCost(spec, inputs, sweep ? { sweep } : {});
    computed = spec.compute(inputs, { ...(sweep ? { sweep } : {}), ...(options.onProgress ? { onProgress: options.onProgress } : {}) });
  } catch (err) {
    if (!(err instanceof InputError)) throw err;
    throw explainComputeError(spec, raw, inputs, err);
  }
  const gapNotes = checkFinite(spec, computed.values);
  const outputs: Record<string, OutputEntry> = guardedOutputs(spec);
  for (const o of spec.outputs) {
    const v = computed.values[o.name];
    if (v === undefined) continue;
    outputs[o.name] = { value: v, unit: o.unit };
  }
  const result: CalculatorResult = {
    id: spec.id,
    title: spec.title,
    status: gapNotes.length ? "warning" : (computed.status ?? "ok"),
    inputs: Object.fromEntries(spec.inputs.map((i) => [i.name, { value: inputs[i.name]!, unit: i.unit }])),
    outputs,
    method: spec.method,
    sources: spec.sources,
    assumptions: spec.assumptions,
    notes: [...demoFilmNote(spec, raw, inputs), ...inputNotes(spec, raw, inputs), ...film.notes, ...(computed.notes ?? []), ...gapNotes],
  };
  if (sweep) result.sweep = sweep;
  return result;
}

/** The inputs that describe a film; a calculator that takes Ms, A and t is a film calculator. */
export const FILM_INPUT_NAMES = ["Ms", "A", "Ku", "D", "t"] as const;

/** The film inputs of a film calculator (none for other calculators). */
export function filmInputNames(spec: { inputs: ReadonlyArray<{ name: string }> }): string[] {
  const names = spec.inputs.map((i) => i.name);
  if (!["Ms", "A", "t"].every((n) => names.includes(n))) return [];
  return FILM_INPUT_NAMES.filter((n) => names.includes(n));
}

/** Film inputs not given take the calculator's invented demo film's values: said first in the notes. */
function demoFilmNote(spec: CalculatorSpec, raw: Record<string, unknown>, inputs: InputValues): string[] {
  const missing = filmInputNames(spec).filter((n) => raw[n] === undefined);
  if (missing.length === 0) return [];
  const show = (n: string) => {
    const unit = spec.inputs.find((i) => i.name === n)?.unit ?? "";
    return `${n} = ${unit ? formatQuantity(inputs[n]!, unit) : String(inputs[n])}`;
  };
  return [`demo values: ${missing.map(show).join(", ")} were not given and are the invented demo film's, not a real material's`];
}

/**
 * Names that code outside the user's reach probes on any object (serializers, test matchers,
 * promise resolution, inspectors): reading them never throws.
 */
const PROBED = new Set(["toJSON", "then", "asymmetricMatch", "nodeType", "tagName", "length", "inspect", "constructor", "toString", "valueOf", "toLocaleString"]);

/**
 * The outputs object of a result: a plain object (own properties, JSON, structured clone, spread
 * and Object.keys as before) whose prototype answers a read of an output it does not have with an
 * InputError listing the outputs it has, instead of `undefined` and a later TypeError. An output
 * declared `optional` reads as undefined; names starting with "_", "$" or "@" and a few probed by
 * libraries (toJSON, then, asymmetricMatch ...) are left to Object.prototype.
 */
function guardedOutputs(spec: CalculatorSpec): Record<string, OutputEntry> {
  const declared = new Map(spec.outputs.map((o) => [o.name, o]));
  const proto = new Proxy(Object.prototype, {
    get(target, key, receiver) {
      if (typeof key === "symbol" || key in target || PROBED.has(key) || /^[_$@]/.test(key)) return Reflect.get(target, key, receiver);
      const decl = declared.get(key);
      if (decl?.optional) return undefined;
      const have = Object.keys(receiver as object);
      const absent = [...declared.keys()].filter((n) => !have.includes(n));
      const why = decl
        ? `'${key}' is an output of '${spec.id}' that was not computed for these inputs (see the result's status and notes)`
        : absent.length
          ? `Outputs of '${spec.id}' not computed for these inputs: ${absent.join(", ")}`
          : undefined;
      throw new InputError("output", key, `one of the outputs of this '${spec.id}' result: ${have.join(", ") || "(none)"}`, why);
    },
  });
  return Object.create(proto) as Record<string, OutputEntry>;
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
    if (far)
      notes.push(
        `${input.name} = ${formatQuantity(v, input.unit)} is far outside the usual range ${formatQuantity(input.min, input.unit)} to ${formatQuantity(input.max, input.unit)}: check the value and its unit`,
      );
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
  const givenList = Object.entries(raw)
    .filter(([, v]) => v !== undefined)
    .map(([k, v]) => `${k} = ${v}`);
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
