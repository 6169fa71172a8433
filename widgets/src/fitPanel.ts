/**
 * Fit panel: measured data with the model curve, residuals, the parameter table with
 * uncertainties, start/stop buttons (custom messages to the kernel) and progress. The view draws
 * whatever state the kernel gives (the fitting engine lives in @helicoid/lib's fit domain).
 *
 * State: `FitPanelState` of @helicoid/lib (lib/src/plot/fitPanelState.ts), read through the same
 * normaliser as the kernel's model uses (`fitPanelState`): title, x, y, yErr, modelX (null: x),
 * modelY, residuals, xLabel, yLabel, xUnit, yUnit, parameters [{name, unit, value, uncertainty,
 * fixed}], status, progress (0..1), message, iterations, chi2, reducedChi2 (the snake_case names of
 * earlier versions are read too). Messages to the kernel: {event: "start"}, {event: "stop"}.
 */
import { DOMWidgetModel, DOMWidgetView } from "@jupyter-widgets/base";
import { formatQuantity, customaryUnit, displayUnit, fitPanelState, FIT_PANEL_DEFAULTS, type FitPanelState } from "@helicoid/lib";
import { MODULE_NAME, MODULE_VERSION } from "./version.js";
import { Plotly } from "./plotly.js";
import { el, isStaticPage } from "./views/dom.js";

export type { FitPanelParameter as FitParameter } from "@helicoid/lib";

export class FitPanelModel extends DOMWidgetModel {
  override defaults() {
    return {
      ...super.defaults(),
      _model_name: "FitPanelModel",
      _model_module: MODULE_NAME,
      _model_module_version: MODULE_VERSION,
      _view_name: "FitPanelView",
      _view_module: MODULE_NAME,
      _view_module_version: MODULE_VERSION,
      ...FIT_PANEL_DEFAULTS,
    };
  }
}

export class FitPanelView extends DOMWidgetView {
  private plotEl!: HTMLElement;
  private tableEl!: HTMLElement;
  private statusEl!: HTMLElement;
  private bar!: HTMLProgressElement;
  private startBtn!: HTMLButtonElement;
  private stopBtn!: HTMLButtonElement;
  private observer: ResizeObserver | null = null;

  /** The model's state through the shared normaliser (defaults filled in; old snake_case names read). */
  private state(): FitPanelState {
    return fitPanelState(this.model.attributes as Record<string, unknown>, false) as FitPanelState;
  }

  override render(): void {
    this.el.classList.add("hx-fit");
    const header = el("div", { class: "hx-header" });
    const title = el("span", { class: "hx-title" });
    header.append(title);
    this.startBtn = el("button", { class: "hx-button hx-fit-start", text: "Start fit" }) as HTMLButtonElement;
    this.stopBtn = el("button", { class: "hx-button hx-fit-stop", text: "Stop" }) as HTMLButtonElement;
    this.startBtn.addEventListener("click", () => this.send({ event: "start" }));
    this.stopBtn.addEventListener("click", () => this.send({ event: "stop" }));
    header.append(this.startBtn, this.stopBtn);
    this.el.append(header);
    this.bar = el("progress", { class: "hx-progress", max: "1" }) as HTMLProgressElement;
    this.statusEl = el("div", { class: "hx-fit-status" });
    this.plotEl = el("div", { class: "hx-fit-plot" });
    this.tableEl = el("div", { class: "hx-fit-table" });
    this.el.append(this.bar, this.statusEl, this.plotEl, this.tableEl);
    const sync = () => {
      title.textContent = this.state().title;
    };
    this.listenTo(this.model, "change:title", sync);
    this.listenTo(this.model, "change:status change:progress change:message change:iterations change:chi2 change:reducedChi2", () => this.renderStatus());
    this.listenTo(this.model, "change:x change:y change:yErr change:modelX change:modelY change:residuals change:xLabel change:yLabel change:xUnit change:yUnit", () =>
      this.renderPlot(),
    );
    this.listenTo(this.model, "change:parameters", () => this.renderTable());
    sync();
    this.renderStatus();
    this.renderPlot();
    this.renderTable();
    // Follow the cell's width (the first drawing may happen before the view is attached).
    if (typeof ResizeObserver !== "undefined") {
      this.observer = new ResizeObserver(() => {
        if (this.plotEl.offsetParent !== null && this.plotEl.querySelector(".main-svg")) Plotly.Plots.resize(this.plotEl);
      });
      this.observer.observe(this.el);
    }
  }

  override remove(): this {
    this.observer?.disconnect();
    Plotly.purge(this.plotEl);
    return super.remove();
  }

  private renderStatus(): void {
    const st = this.state();
    const status = st.status;
    const progress = st.progress;
    this.bar.value = Math.max(0, Math.min(1, progress));
    const running = status === "running";
    const live = !isStaticPage(this);
    this.startBtn.disabled = running || !live;
    this.stopBtn.disabled = !running || !live;
    const chi2 = st.reducedChi2;
    const parts = [
      `status: ${status}`,
      `iterations: ${st.iterations}`,
      typeof chi2 === "number" ? `reduced χ² = ${chi2.toPrecision(4)}` : "",
      st.message,
      live ? "" : "(needs the running kernel; showing its last state)",
    ].filter(Boolean);
    this.statusEl.textContent = parts.join(" · ");
    this.statusEl.classList.toggle("hx-error", status === "failed");
    this.el.dataset.status = status;
  }

  private renderPlot(): void {
    const st = this.state();
    const { x, y } = st;
    const err = st.yErr ?? [];
    const mx = st.modelX ?? x;
    const my = st.modelY ?? [];
    const res = st.residuals ?? [];
    // Axes in the trade's units (nm, mT ...) when the state gives SI units.
    const scale = (values: number[], unit: string): [string, number] => {
      let peak = 0;
      for (const v of values) if (Number.isFinite(v)) peak = Math.max(peak, Math.abs(v));
      return unit ? customaryUnit(peak, unit) : ["", 1];
    };
    const [xu, xf] = scale(x, st.xUnit);
    const [yu, yf] = scale(y, st.yUnit);
    const [ru, rf] = scale(res, st.yUnit);
    const sx = (a: number[]) => a.map((v) => v / xf);
    const data: Array<Record<string, unknown>> = [
      {
        type: "scatter",
        mode: "markers",
        name: "data",
        x: sx(x),
        y: y.map((v) => v / yf),
        marker: { size: 5 },
        ...(err.length === y.length && err.length ? { error_y: { type: "data", array: err.map((v) => v / yf), visible: true } } : {}),
      },
    ];
    if (my.length) data.push({ type: "scatter", mode: "lines", name: "model", x: sx(mx.length === my.length ? mx : x), y: my.map((v) => v / yf) });
    if (res.length) data.push({ type: "scatter", mode: "markers", name: "residuals", x: sx(x), y: res.map((v) => v / rf), xaxis: "x", yaxis: "y2", marker: { size: 4 } });
    const label = (name: string, unit: string) => `${name}${unit && unit !== "1" ? ` (${displayUnit(unit)})` : ""}`;
    const layout = {
      height: 380,
      autosize: true,
      margin: { l: 60, r: 20, t: 20, b: 50 },
      // One x axis at the bottom (under the residuals), shared by both panels.
      xaxis: { title: { text: label(st.xLabel, xu) }, anchor: "y2" },
      yaxis: { title: { text: label(st.yLabel, yu) }, domain: [0.34, 1], anchor: "x" },
      yaxis2: { title: { text: label("residual", ru) }, domain: [0, 0.26], zeroline: true, anchor: "x" },
      legend: { orientation: "h" },
    };
    void Plotly.react(this.plotEl, data, layout, { displaylogo: false, responsive: true });
  }

  private renderTable(): void {
    const params = this.state().parameters;
    const table = el("table", { class: "hx-table" });
    const head = el("tr");
    for (const h of ["parameter", "value", "± uncertainty", ""]) head.append(el("th", { text: h }));
    table.append(head);
    for (const p of params) {
      const tr = el("tr", { "data-parameter": p.name });
      const unit = p.unit ?? "";
      tr.append(el("td", { text: p.name }));
      tr.append(el("td", { text: formatQuantity(p.value, unit) }));
      tr.append(el("td", { text: p.uncertainty == null ? "—" : formatQuantity(p.uncertainty, unit) }));
      tr.append(el("td", { text: p.fixed ? "fixed" : "" }));
      table.append(tr);
    }
    this.tableEl.replaceChildren(table);
  }
}
