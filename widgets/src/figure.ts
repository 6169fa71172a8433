/**
 * Figure: a plotly figure as a widget. State `figure` = {data, layout, config}; every change is
 * drawn in place with Plotly.react (no full redraw), and the plot follows the cell's width.
 */
import { DOMWidgetModel, DOMWidgetView } from "@jupyter-widgets/base";
import { MODULE_NAME, MODULE_VERSION } from "./version.js";
import { Plotly, unsupportedTraces } from "./plotly.js";
import { el } from "./views/dom.js";
import { addExportButtons } from "./views/figureExport.js";

export interface FigureState {
  data: Array<Record<string, unknown>>;
  layout?: Record<string, unknown>;
  config?: Record<string, unknown>;
}

export class FigureModel extends DOMWidgetModel {
  override defaults() {
    return {
      ...super.defaults(),
      _model_name: "FigureModel",
      _model_module: MODULE_NAME,
      _model_module_version: MODULE_VERSION,
      _view_name: "FigureView",
      _view_module: MODULE_NAME,
      _view_module_version: MODULE_VERSION,
      figure: { data: [], layout: {} },
    };
  }
}

export class FigureView extends DOMWidgetView {
  private plotEl!: HTMLElement;
  private messageEl!: HTMLElement;
  private observer: ResizeObserver | null = null;
  private draws = 0;

  override render(): void {
    this.el.classList.add("hx-figure");
    this.messageEl = el("div", { class: "hx-error" });
    this.messageEl.hidden = true;
    this.plotEl = el("div", { class: "hx-figure-plot" });
    this.el.append(this.messageEl, this.plotEl);
    this.listenTo(this.model, "change:figure", () => this.draw());
    this.draw();
    if (typeof ResizeObserver !== "undefined") {
      this.observer = new ResizeObserver(() => {
        if (this.draws > 0 && this.plotEl.offsetParent !== null) Plotly.Plots.resize(this.plotEl);
      });
      this.observer.observe(this.el);
    }
  }

  private draw(): void {
    const fig = (this.model.get("figure") ?? { data: [] }) as FigureState;
    const bad = unsupportedTraces(fig.data ?? []);
    this.messageEl.hidden = bad.length === 0;
    this.messageEl.textContent = bad.length ? `This page's plotly bundle cannot draw trace type(s): ${bad.join(", ")}` : "";
    const layout = { autosize: true, margin: { l: 60, r: 20, t: 40, b: 50 }, ...(fig.layout ?? {}) };
    void Plotly.react(this.plotEl, fig.data ?? [], layout, { displaylogo: false, responsive: true, ...(fig.config ?? {}) }).then(() => {
      if (this.draws === 0) addExportButtons(this.plotEl, "figure");
      this.draws++;
      this.el.dataset.draws = String(this.draws);
    });
  }

  override remove(): this {
    this.observer?.disconnect();
    Plotly.purge(this.plotEl);
    return super.remove();
  }
}
