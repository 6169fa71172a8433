/**
 * `explore(calculator, overrides?)`: the explorer widget of a calculator (widgets/PROTOCOL.md).
 *
 * - A catalogue id ("skyrmion") or a catalogue spec: the page recomputes with its bundled
 *   @helicoid/lib (also in exported HTML) and writes `inputs` and `result` back, so kernel code
 *   reads them (`ex.inputs`, `ex.result`) and observes them (`ex.onResult(...)`).
 * - A spec of your own (a `CalculatorSpec` with `compute`), or a plain function with a description
 *   of its inputs: the kernel computes on every change; live only while the kernel runs.
 * Inputs given here or with `setInputs` may carry units ("3 mJ/m^2"); they are coerced by the
 * spec (errors name the input). Kernel-side changes move the page's controls.
 * Inputs with uncertainties ("15 ± 1 pJ/m", {value, uncertainty}, a film file from `loadFilm` with
 * its correlations): the table shows the headline outputs ± their standard uncertainty, propagated
 * to first order at the current point by the library (2n+1 single-point runs, not over the sweep),
 * in the kernel and in the page alike; a slider moves an input's value, its uncertainty stays.
 */
import {
  catalogue,
  coerceInputs,
  defaultSweep,
  getCalculator,
  runCalculator,
  InputError,
  type CalculatorResult,
  type CalculatorSpec,
  type ComputeOutput,
  type InputSpec,
  type InputValues,
  type OutputSpec,
  anyUncertainty,
  filmInputsFor,
  inUncertainForm,
  splitUncertainInput,
  withUncertainties,
} from "@helicoid/lib";
import type { Film, FilmRecord, InputCorrelation, InputWithUncertainty, QuantityInput, SweepRange } from "@helicoid/lib";
import { isFilmRecord } from "@helicoid/lib/internal";
import { KERNEL_VERSION } from "../version.js";
import { Widget, type WidgetState } from "./widget.js";
import { ourModel } from "./ourModel.js";

/** A sweep request: the library's one sweep shape. */
export type Sweep = SweepRange;
export type SpecData = Omit<CalculatorSpec, "compute">;

export interface ExplorerState extends WidgetState {
  calculator: string;
  spec: SpecData | null;
  inputs: Record<string, number>;
  sweep: Sweep | null;
  result: CalculatorResult | null;
  error: string;
  compute_in: "browser" | "kernel";
  kernel_version: string;
  function_name: string;
  /** SI standard uncertainties of inputs (propagated to the outputs at the current point). */
  uncertainties: Record<string, number>;
  /** Correlation coefficients between uncertain inputs. */
  correlations: InputCorrelation[];
}

/** A plain function explored with a description of its inputs (units, ranges, meanings). */
export interface FunctionDescription {
  title?: string;
  summary?: string;
  inputs: Array<Partial<InputSpec> & Pick<InputSpec, "name" | "default">>;
  outputs?: Array<Partial<OutputSpec> & Pick<OutputSpec, "name">>;
  plots?: CalculatorSpec["plots"];
  sweep?: CalculatorSpec["sweep"];
  assumptions?: string[];
  sources?: string[];
  method?: string;
}

export interface ExploreOptions {
  sweep?: Sweep | null;
  /** Force kernel-side computing even for a catalogue calculator. */
  computeIn?: "browser" | "kernel";
  /** For plain functions: how the inputs look. */
  describe?: FunctionDescription;
  /** Correlations between inputs given with uncertainties (a film file's are read from it). */
  correlations?: InputCorrelation[];
}

type PlainFunction = (inputs: InputValues) => Record<string, number | number[] | string> | ComputeOutput;

function specOfFunction(fn: PlainFunction, d: FunctionDescription | undefined): CalculatorSpec {
  if (!d || !Array.isArray(d.inputs) || d.inputs.length === 0) {
    throw new InputError("describe.inputs", d?.inputs, "a list of inputs ({name, default, unit?, min?, max?, meaning?}) for the explored function");
  }
  const inputs: InputSpec[] = d.inputs.map((i) => {
    const dflt = i.default;
    const span = Math.abs(dflt) || 1;
    return {
      name: i.name,
      symbol: i.symbol ?? i.name,
      unit: i.unit ?? "",
      default: dflt,
      min: i.min ?? (dflt > 0 ? 0 : dflt - span),
      max: i.max ?? (dflt > 0 ? 2 * dflt : dflt + span),
      scale: i.scale ?? "linear",
      meaning: i.meaning ?? i.name,
      ...(i.kind ? { kind: i.kind } : {}),
      ...(i.choices ? { choices: i.choices } : {}),
    };
  });
  let outputs: OutputSpec[] | null =
    d.outputs?.map((o) => ({ name: o.name, symbol: o.symbol ?? o.name, unit: o.unit ?? "", meaning: o.meaning ?? o.name, ...(o.kind ? { kind: o.kind } : {}) })) ?? null;
  const spec: CalculatorSpec = {
    id: fn.name || "function",
    title: d.title ?? (fn.name ? `${fn.name}(…)` : "Explored function"),
    summary: d.summary ?? "A function defined in the notebook, computed by the kernel.",
    inputs,
    get outputs() {
      return outputs ?? [];
    },
    plots: d.plots ?? [],
    ...(d.sweep ? { sweep: d.sweep } : {}),
    assumptions: d.assumptions ?? [],
    sources: d.sources ?? [],
    method: d.method ?? "user function",
    compute(values) {
      const r = fn(values);
      const out = (r && typeof r === "object" && "values" in r && typeof (r as ComputeOutput).values === "object" ? r : { values: r }) as ComputeOutput;
      if (!outputs) {
        outputs = Object.entries(out.values).map(([name, v]) => ({
          name,
          symbol: name,
          unit: "",
          meaning: name,
          kind: Array.isArray(v) ? "array" : typeof v === "string" ? "text" : "scalar",
        }));
      }
      return out;
    },
  } as CalculatorSpec;
  return spec;
}

function specData(spec: CalculatorSpec): SpecData {
  const { compute: _compute, ...rest } = spec;
  return JSON.parse(JSON.stringify({ ...rest, outputs: spec.outputs }));
}

export class Explorer extends Widget<ExplorerState> {
  readonly spec: CalculatorSpec;
  private readonly catalogueId: string;

  constructor(calculator: string | CalculatorSpec | PlainFunction, overrides: ExploreInputs = {}, options: ExploreOptions = {}) {
    let spec: CalculatorSpec;
    let catalogueId = "";
    let functionName = "";
    if (typeof calculator === "string") {
      spec = getCalculator(calculator);
      catalogueId = spec.id;
    } else if (typeof calculator === "function") {
      spec = specOfFunction(calculator, options.describe);
      functionName = calculator.name;
    } else if (calculator && typeof calculator === "object" && typeof calculator.compute === "function") {
      spec = calculator;
      if (catalogue.includes(calculator)) catalogueId = calculator.id;
    } else {
      throw new InputError("calculator", calculator, "a catalogue id, a CalculatorSpec, or a function with options.describe");
    }
    // A film file (loadFilm): the values the calculator takes, with their uncertainties and correlations.
    let given = overrides as Record<string, unknown>;
    let correlations = options.correlations ?? [];
    let filmNotes: string[] = [];
    if (isFilmRecord(overrides)) {
      const f = filmInputsFor(spec, overrides);
      given = f.inputs;
      correlations = [...(f.uncertainty.correlations ?? []), ...correlations];
      filmNotes = f.notes;
    }
    // Values with an uncertainty ("15 ± 1 pJ/m", {value, uncertainty}): the value is the control's,
    // the uncertainty is kept in the state and propagated at every point the explorer computes.
    const nominal: Record<string, QuantityInput | undefined> = {};
    const uncertainties: Record<string, number> = {};
    for (const [k, v] of Object.entries(given)) {
      if (inUncertainForm(v)) {
        const input = spec.inputs.find((i) => i.name === k);
        const s = splitUncertainInput(k, v, input?.unit ?? "");
        nominal[k] = s.value;
        if (input && s.uncertainty !== null && s.uncertainty > 0) uncertainties[k] = s.uncertainty;
      } else nominal[k] = v as QuantityInput | undefined;
    }
    const inputs = coerceInputs(spec, nominal);
    const sweep = options.sweep === undefined ? (defaultSweep(spec, inputs) ?? null) : options.sweep;
    const computeIn = catalogueId ? (options.computeIn ?? "browser") : "kernel";
    let result: CalculatorResult | null = null;
    let error = "";
    try {
      result = computeAt(spec, inputs, sweep, uncertainties, correlations);
      result.notes.unshift(...filmNotes);
    } catch (err) {
      error = (err as Error).message;
    }
    super({
      ...ourModel("Explorer"),
      state: {
        calculator: catalogueId,
        spec: specData(spec),
        inputs,
        sweep,
        result,
        error,
        compute_in: computeIn,
        // the inputs the notebook gave: film inputs not among them show the demo film's values, marked so in the page
        given: spec.inputs.map((i) => i.name).filter((n) => nominal[n] !== undefined),
        kernel_version: KERNEL_VERSION,
        function_name: functionName,
        uncertainties,
        correlations,
      },
    });
    this.spec = spec;
    this.catalogueId = catalogueId;
    // The page changed inputs or the sweep: a kernel-computed explorer answers with a result.
    // (one computation when several of these keys change together, as setInputs changes two)
    this.onChange(["inputs", "sweep", "uncertainties", "correlations"], () => {
      if (this.get("compute_in") === "kernel" && this.computedKey !== this.stateKey()) this.recompute();
    });
  }

  /** Current inputs (SI). */
  get inputs(): Record<string, number> {
    return { ...this.get("inputs") };
  }

  /** Latest result (computed in the page for catalogue calculators, else by the kernel). */
  get result(): CalculatorResult | null {
    return this.get("result");
  }

  get error(): string {
    return this.get("error");
  }

  /** SI standard uncertainties of the inputs that carry one. */
  get uncertainties(): Record<string, number> {
    return { ...this.get("uncertainties") };
  }

  /**
   * Change inputs from code (units allowed); the page's controls move and the result follows. A
   * plain value moves the input and keeps its uncertainty; a value with one ("16 ± 1 pJ/m",
   * {value, uncertainty}) sets both (± 0 removes it).
   */
  setInputs(changes: Record<string, InputWithUncertainty>): this {
    const plain: Record<string, QuantityInput | undefined> = {};
    const uncertainties = { ...this.get("uncertainties") };
    for (const [k, v] of Object.entries(changes)) {
      if (!inUncertainForm(v)) {
        plain[k] = v as QuantityInput | undefined;
        continue;
      }
      const input = this.spec.inputs.find((i) => i.name === k);
      const s = splitUncertainInput(k, v, input?.unit ?? "");
      plain[k] = s.value;
      if (input && s.uncertainty !== null && s.uncertainty > 0) uncertainties[k] = s.uncertainty;
      else delete uncertainties[k];
    }
    const next = coerceInputs(this.spec, { ...this.get("inputs"), ...plain });
    withUncertainties(next, uncertainties); // refuses a bad uncertainty before the state changes
    this.set({ inputs: next, uncertainties });
    if (this.get("compute_in") !== "kernel") this.recompute();
    return this;
  }

  setSweep(sweep: Sweep | null): this {
    this.set({ sweep });
    if (this.get("compute_in") !== "kernel") this.recompute();
    return this;
  }

  /** Observe results (from the page or the kernel). Returns a function that stops observing. */
  onResult(cb: (result: CalculatorResult | null, explorer: Explorer) => void): () => void {
    return this.onChange("result", (v) => cb(v, this));
  }

  /** Observe input changes (from the page or from code). */
  onInputs(cb: (inputs: Record<string, number>, explorer: Explorer) => void): () => void {
    return this.onChange("inputs", (v) => cb(v, this));
  }

  /** What a result is computed from: inputs, sweep, uncertainties, correlations. */
  private stateKey(): string {
    return JSON.stringify([this.get("inputs"), this.get("sweep"), this.get("uncertainties"), this.get("correlations")]);
  }

  private computedKey = "";

  /** Compute in the kernel now with the current state. */
  recompute(): CalculatorResult | null {
    this.computedKey = this.stateKey();
    const sweep = this.get("sweep");
    try {
      // The page's "no sweep" is a sweep over "" (no input): compute without the default sweep.
      const result = computeAt(this.spec, this.get("inputs"), sweep, this.get("uncertainties"), this.get("correlations"));
      this.set({ result, error: "" });
      return result;
    } catch (err) {
      this.set({ result: null, error: (err as Error).message });
      return null;
    }
  }

  override describe(): string {
    return `Explorer(${this.catalogueId || this.spec.id})`;
  }
}

/**
 * One point of an explorer, as the page's compute job does it (widgets/src/compute/runJob.ts): the
 * sweep (the page's "no sweep" is a sweep over ""), and with uncertainties the library's first-order
 * propagation at this point.
 */
function computeAt(
  spec: CalculatorSpec,
  inputs: Record<string, number>,
  sweep: Sweep | null,
  uncertainties: Record<string, number>,
  correlations: InputCorrelation[],
): CalculatorResult {
  const sweepOption = sweep && sweep.over === "" ? { noSweep: true } : sweep ? { sweep } : {};
  if (!anyUncertainty(uncertainties)) return runCalculator(spec, inputs, sweepOption);
  return runCalculator(spec, withUncertainties(inputs, uncertainties), { ...sweepOption, uncertainty: { correlations } });
}

/**
 * Inputs of an explorer: values with units, a film (`makeFilm`), or a film file (`loadFilm`).
 * Values with an uncertainty carry it to the outputs (first order, at the current point).
 */
export type ExploreInputs = Record<string, InputWithUncertainty> | Film | FilmRecord;

/** Open an explorer: `explore("skyrmion", { D: "3.5 mJ/m^2" })`, or a spec / function of your own. */
export function explore(calculator: string | CalculatorSpec | PlainFunction, overrides: ExploreInputs = {}, options: ExploreOptions = {}): Explorer {
  return new Explorer(calculator, overrides, options);
}
