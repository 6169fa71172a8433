/**
 * The state of the fit panel widget, shared by its kernel-side model (kernel-ext/src/widgets/fitPanel.ts)
 * and its page-side view (widgets/src/fitPanel.ts): one shape, one default, one normaliser, and the
 * state of a profile fit's result. camelCase; the snake_case names of earlier versions (`y_err`,
 * `model_x`, `model_y`, `x_label`, `y_label`, `x_unit`, `y_unit`, `reduced_chi2`) are still read.
 */
import { InputError } from "../errors.js";
import type { FitResult } from "../fit/leastSquares.js";
import type { ProfileData } from "../fit/fitProfile.js";

export type FitPanelStatus = "idle" | "running" | "done" | "failed" | "stopped";

/** One row of the parameter table. */
export interface FitPanelParameter {
  name: string;
  unit?: string;
  value: number;
  uncertainty?: number | null;
  fixed?: boolean;
}

export interface FitPanelState {
  title: string;
  x: number[];
  y: number[];
  /** Standard deviations of y (error bars), or null. */
  yErr: number[] | null;
  /** Positions of the model curve (null: x). */
  modelX: number[] | null;
  modelY: number[] | null;
  residuals: number[] | null;
  xLabel: string;
  yLabel: string;
  /** SI units of x and y ("" for none): the axes show the trade's units (nm, mT). */
  xUnit: string;
  yUnit: string;
  parameters: FitPanelParameter[];
  status: FitPanelStatus;
  /** Fraction done, 0..1. */
  progress: number;
  message: string;
  iterations: number;
  chi2: number | null;
  reducedChi2: number | null;
}

export const FIT_PANEL_DEFAULTS: Readonly<FitPanelState> = Object.freeze({
  title: "Fit",
  x: [],
  y: [],
  yErr: null,
  modelX: null,
  modelY: null,
  residuals: null,
  xLabel: "x",
  yLabel: "y",
  xUnit: "",
  yUnit: "",
  parameters: [],
  status: "idle",
  progress: 0,
  message: "",
  iterations: 0,
  chi2: null,
  reducedChi2: null,
});

/** What `fitPanelState` reads: the state's fields, arrays as any array-like (typed arrays too). */
export type FitPanelOptions = {
  [K in keyof FitPanelState]?: FitPanelState[K] extends number[] ? ArrayLike<number> : FitPanelState[K] extends number[] | null ? ArrayLike<number> | null : FitPanelState[K];
};

const ALIASES: Record<string, keyof FitPanelState> = {
  y_err: "yErr",
  model_x: "modelX",
  model_y: "modelY",
  x_label: "xLabel",
  y_label: "yLabel",
  x_unit: "xUnit",
  y_unit: "yUnit",
  reduced_chi2: "reducedChi2",
};
const ARRAYS = new Set<keyof FitPanelState>(["x", "y", "yErr", "modelX", "modelY", "residuals"]);
const TEXTS = new Set<keyof FitPanelState>(["title", "xLabel", "yLabel", "xUnit", "yUnit", "message"]);
const NUMBERS = new Set<keyof FitPanelState>(["progress", "iterations", "chi2", "reducedChi2"]);
const STATUSES: FitPanelStatus[] = ["idle", "running", "done", "failed", "stopped"];

function toNumbers(name: string, v: unknown): number[] {
  if (Array.isArray(v) || ArrayBuffer.isView(v)) return Array.from(v as ArrayLike<number>, Number);
  // a typed array sent over a comm arrives as a plain object of indices in some front ends
  if (v && typeof v === "object" && "length" in v) return Array.from(v as ArrayLike<number>, Number);
  throw new InputError(name, v, "an array of numbers");
}

/**
 * The fit panel's state from options or from a model's attributes: known fields only (an unknown
 * field is refused, naming it), the old snake_case names read as their camelCase ones, arrays as
 * plain number arrays. `partial` (default true): only the given fields; false: the defaults filled in.
 */
export function fitPanelState(options: Record<string, unknown>, partial = true): Partial<FitPanelState> {
  const out: Record<string, unknown> = partial ? {} : { ...FIT_PANEL_DEFAULTS };
  for (const [given, v] of Object.entries(options ?? {})) {
    const key = (ALIASES[given] ?? given) as keyof FitPanelState;
    if (!(key in FIT_PANEL_DEFAULTS)) {
      if (given.startsWith("_") || !partial) continue; // widget bookkeeping (_model_name ...) of a model's attributes
      throw new InputError(`fitPanel option ${given}`, typeof v === "object" ? "(an object)" : v, `one of ${Object.keys(FIT_PANEL_DEFAULTS).join(", ")}`);
    }
    if (v === undefined) continue;
    if (ARRAYS.has(key)) out[key] = v === null ? (key === "x" || key === "y" ? [] : null) : toNumbers(given, v);
    else if (TEXTS.has(key)) out[key] = String(v);
    else if (NUMBERS.has(key)) {
      if (v !== null && typeof v !== "number") throw new InputError(given, v, "a number");
      out[key] = v;
    } else if (key === "status") {
      if (!STATUSES.includes(v as FitPanelStatus)) throw new InputError("status", v, STATUSES.join(", "));
      out[key] = v;
    } else if (key === "parameters") {
      if (!Array.isArray(v)) throw new InputError("parameters", v, "a list of {name, value, unit?, uncertainty?, fixed?}");
      out[key] = v.map((p, i) => {
        if (!p || typeof p.name !== "string" || typeof p.value !== "number")
          throw new InputError(`parameters[${i}]`, JSON.stringify(p), "{name, value, unit?, uncertainty?, fixed?}");
        return { name: p.name, value: p.value, unit: p.unit ?? "", uncertainty: p.uncertainty ?? null, fixed: !!p.fixed } satisfies FitPanelParameter;
      });
    }
  }
  return out as Partial<FitPanelState>;
}

/** The panel's status for a fit's status. */
export function fitPanelStatus(status: FitResult["status"]): FitPanelStatus {
  return status === "converged" ? "done" : status === "stopped" ? "stopped" : "failed";
}

/**
 * The fit panel's state for a fit result and the data it was fitted to: data with error bars, the
 * model at the data, residuals, the parameters with their standard errors, status and chi-square.
 */
export function fitPanelFromResult(result: FitResult & { title?: string; model?: string }, data: ProfileData & { yUnit?: string }): Partial<FitPanelState> {
  if (!result || typeof result !== "object" || !result.parameters || !Array.isArray(result.fitted))
    throw new InputError("result", typeof result, "a fit result (fitProfile's ProfileFitResult or a FitResult)");
  if (!data || data.x === undefined || data.y === undefined)
    throw new InputError("data", data === undefined ? "(none)" : typeof data, "the data the fit was made to: {x, y, sigma?}");
  if (data.x.length !== result.fitted.length)
    throw new InputError("data.x", `length ${data.x.length}`, `the positions of the fitted data (${result.fitted.length} points, as the result's fitted values)`);
  return {
    ...(result.title ? { title: result.title } : {}),
    x: Array.from(data.x),
    y: Array.from(data.y),
    yErr: data.sigma ? Array.from(data.sigma) : null,
    modelX: null,
    modelY: [...result.fitted],
    residuals: [...result.residuals],
    xUnit: "m", // positions of profile data are SI
    yUnit: data.yUnit ?? "",
    parameters: Object.entries(result.parameters).map(([name, p]) => ({ name, unit: p.unit, value: p.value, uncertainty: p.stderr, fixed: p.fixed })),
    status: fitPanelStatus(result.status),
    progress: 1,
    message: result.message,
    iterations: result.iterations,
    chi2: result.chiSquare,
    reducedChi2: result.chiSquareReduced,
  };
}
