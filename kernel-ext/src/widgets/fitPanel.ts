/**
 * `fitPanel(options)`: the fit panel widget (data, model curve, residuals, parameter table with
 * uncertainties, start/stop, progress). The kernel side only holds state and relays the page's
 * start/stop buttons (custom messages {event: "start" | "stop"}) to callbacks; the fitting code
 * (lib/src/fit) updates the panel with `update({...})` as it goes.
 */
import { Widget, type WidgetState } from "./widget.js";
import { ourModel } from "./ourModel.js";

export interface FitParameterRow {
  name: string;
  unit?: string;
  value: number;
  uncertainty?: number | null;
  fixed?: boolean;
}

export interface FitPanelState extends WidgetState {
  title: string;
  x: number[];
  y: number[];
  y_err: number[] | null;
  model_x: number[] | null;
  model_y: number[] | null;
  residuals: number[] | null;
  x_label: string;
  y_label: string;
  x_unit: string;
  y_unit: string;
  parameters: FitParameterRow[];
  status: "idle" | "running" | "done" | "failed" | "stopped";
  progress: number;
  message: string;
  iterations: number;
  chi2: number | null;
  reduced_chi2: number | null;
}

const defaults: FitPanelState = {
  title: "Fit",
  x: [],
  y: [],
  y_err: null,
  model_x: null,
  model_y: null,
  residuals: null,
  x_label: "x",
  y_label: "y",
  x_unit: "",
  y_unit: "",
  parameters: [],
  status: "idle",
  progress: 0,
  message: "",
  iterations: 0,
  chi2: null,
  reduced_chi2: null,
};

const arr = (v: ArrayLike<number> | null | undefined): number[] | null => (v == null ? null : Array.from(v));

export class FitPanel extends Widget<FitPanelState> {
  constructor(o: Partial<Omit<FitPanelState, "x" | "y">> & { x?: ArrayLike<number>; y?: ArrayLike<number> } = {}) {
    super({ ...ourModel("FitPanel"), state: { ...defaults, ...FitPanel.clean(o) } as FitPanelState });
  }

  private static clean(o: Record<string, unknown>): Partial<FitPanelState> {
    const out: Record<string, unknown> = { ...o };
    for (const k of ["x", "y", "y_err", "model_x", "model_y", "residuals"]) if (k in o) out[k] = arr(o[k] as ArrayLike<number> | null) ?? (k === "x" || k === "y" ? [] : null);
    return out as Partial<FitPanelState>;
  }

  /** Update any part of the panel (arrays may be typed arrays). */
  update(changes: Partial<Omit<FitPanelState, "x" | "y" | "model_y" | "residuals">> & Record<string, unknown>): this {
    return this.set(FitPanel.clean(changes));
  }

  /** The page's "Start fit" button. */
  onStart(cb: (panel: FitPanel) => void): () => void {
    return this.onCustom((content) => {
      if ((content as { event?: string })?.event === "start") cb(this);
    });
  }

  /** The page's "Stop" button. */
  onStop(cb: (panel: FitPanel) => void): () => void {
    return this.onCustom((content) => {
      if ((content as { event?: string })?.event === "stop") cb(this);
    });
  }

  override describe(): string {
    return `FitPanel(${this.get("title")}, ${this.get("status")})`;
  }
}

export function fitPanel(options: ConstructorParameters<typeof FitPanel>[0] = {}): FitPanel {
  return new FitPanel(options);
}
