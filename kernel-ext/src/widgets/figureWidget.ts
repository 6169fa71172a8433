/**
 * `figureWidget(spec)`: a plotly figure as a live widget. `update(spec)` redraws it in place in
 * the page (Plotly.react); the view follows the cell's width. For a static figure use `figure()`.
 */
import { InputError } from "@helicoid/lib";
import type { FigureSpec } from "../display/figure.js";
import { Widget, type WidgetState } from "./widget.js";
import { ourModel } from "./ourModel.js";

export interface FigureWidgetState extends WidgetState {
  figure: FigureSpec;
}

function checked(spec: FigureSpec): FigureSpec {
  if (!spec || !Array.isArray(spec.data)) throw new InputError("figure.data", spec?.data, "an array of plotly traces");
  return { data: spec.data, layout: spec.layout ?? {}, config: spec.config ?? {} };
}

export class FigureWidget extends Widget<FigureWidgetState> {
  constructor(spec: FigureSpec) {
    super({ ...ourModel("Figure"), state: { figure: checked(spec) } });
  }

  /** Replace the figure (drawn in place). */
  update(spec: FigureSpec): this {
    return this.set({ figure: checked(spec) });
  }

  /** Change some traces' data or the layout, keeping the rest. */
  restyle(changes: { data?: Array<Record<string, unknown> | null>; layout?: Record<string, unknown> }): this {
    const fig = this.get("figure");
    const data = fig.data.map((t, i) => (changes.data?.[i] ? { ...t, ...changes.data[i] } : t));
    return this.set({ figure: { ...fig, data, layout: { ...(fig.layout ?? {}), ...(changes.layout ?? {}) } } });
  }

  get figure(): FigureSpec {
    return this.get("figure");
  }

  override describe(): string {
    return `FigureWidget(${this.get("figure").data.length} traces)`;
  }
}

export function figureWidget(spec: FigureSpec): FigureWidget {
  return new FigureWidget(spec);
}
