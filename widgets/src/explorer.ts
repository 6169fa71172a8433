/**
 * The explorer: controls drawn from a calculator spec, a live outputs table and the spec's plots.
 *
 * - Catalogue calculators (`calculator` = catalogue id) recompute in the page with the bundled
 *   @helicoid/lib, in a Web Worker, coalescing updates while a slider moves; the view writes
 *   `inputs` and `result` back so kernel code sees them. This also works in exported pages.
 * - A user's kernel function (`calculator` = ""): the view sets `inputs`; the kernel computes
 *   and sets `result`. Without a kernel the view shows the last state and says so.
 * - Inputs with uncertainties (`uncertainties`, SI; a film file's): the table shows each numeric
 *   output ± its standard uncertainty, propagated to first order at the current point by the
 *   library (the same call in the kernel and in the worker); a slider moves an input's value, its
 *   uncertainty stays; an output whose linearization fails is marked (!) as in `helicoid calc`.
 * State and messages: see widgets/PROTOCOL.md.
 */
import { DOMWidgetModel, DOMWidgetView } from "@jupyter-widgets/base";
import {
  catalogue,
  defaultSweep,
  filmInputNames,
  formatQuantity,
  formatWithError,
  displayUnit,
  symbolHtml,
  type CalculatorResult,
  type CalculatorSpec,
  type InputCorrelation,
  type InputSpec,
  type UncertaintyReport,
} from "@helicoid/lib";
import { MODULE_NAME, MODULE_VERSION, versionMismatch } from "./version.js";
import { Coalescer } from "./compute/coalescer.js";
import type { ComputeOutcome, SweepRequest } from "./compute/job.js";
import { STEPS, toPosition, fromPosition, isLogScale } from "./views/sliderScale.js";
import { validateEntry, entryText } from "./views/quantityEntry.js";
import { codeSnippet } from "./views/codeSnippet.js";
import { plotFigure, currentMarkFor, type PlotFigure } from "./views/explorerPlots.js";
import { TimeScrubber } from "./views/timeScrubber.js";
import { dataExtent, stableRange, paddedRange } from "./views/plotRanges.js";
import { addExportButtons } from "./views/figureExport.js";
import { swapLineData } from "./views/linePath.js";
import { texturePanelFor, type TexturePanel } from "./views/texturePanel.js";
import { Plotly } from "./plotly.js";
import { isStaticPage, copyText, el } from "./views/dom.js";

/** A spec as JSON: everything but the compute function. */
export type SpecData = Omit<CalculatorSpec, "compute">;

export class ExplorerModel extends DOMWidgetModel {
  override defaults() {
    return {
      ...super.defaults(),
      _model_name: "ExplorerModel",
      _model_module: MODULE_NAME,
      _model_module_version: MODULE_VERSION,
      _view_name: "ExplorerView",
      _view_module: MODULE_NAME,
      _view_module_version: MODULE_VERSION,
      calculator: "",
      spec: null,
      inputs: {},
      sweep: null,
      result: null,
      error: "",
      compute_in: "browser",
      kernel_version: "",
      function_name: "",
      uncertainties: {},
      correlations: [],
    };
  }
}

interface ControlRow {
  input: InputSpec;
  row: HTMLElement;
  slider: HTMLInputElement | null;
  select: HTMLSelectElement | null;
  entry: HTMLInputElement | null;
  message: HTMLElement;
  /** "± u" beside an input that carries an uncertainty. */
  uncertainty: HTMLElement;
}

/** Find the spec for the model: the bundled catalogue for ids, else the state's `spec`. */
export function resolveSpec(calculator: string, stateSpec: SpecData | null): { spec: SpecData | null; local: boolean; note: string } {
  if (calculator) {
    const local = catalogue.find((s) => s.id === calculator);
    if (local) return { spec: local, local: true, note: "" };
    if (stateSpec) {
      return { spec: stateSpec, local: false, note: `'${calculator}' is not in this front end's catalogue (version ${MODULE_VERSION}); it is computed by the kernel.` };
    }
    return { spec: null, local: false, note: `Unknown calculator '${calculator}' and no spec given.` };
  }
  return { spec: stateSpec, local: false, note: "" };
}

/** The sweep selector's value for "no sweep" (arrays over a sweep are then not computed). */
const NO_SWEEP = "";

/** Quiet time after the last in-place curve swap before plotly redraws those plots exactly. */
const EXACT_REDRAW_DELAY_MS = 120;

interface PlotState {
  /** Layout and trace identity (names, modes, units) without the ranges. */
  shape: string;
  xaxis: [number, number] | null;
  yaxis: [number, number] | null;
  /** Same shape and ranges as the previous draw: the curves can be swapped in place. */
  swappable: boolean;
}

export class ExplorerView extends DOMWidgetView {
  private spec: SpecData | null = null;
  private local = false;
  private rows = new Map<string, ControlRow>();
  private coalescer: Coalescer | null = null;
  private appliedSeq = 0;
  private plotEls: HTMLElement[] = [];
  /** A picture of the texture when the outputs carry a field preview (views/texturePanel.ts). */
  private texturePanel: TexturePanel | null = null;
  private outputsEl!: HTMLElement;
  private errorEl!: HTMLElement;
  private statusEl!: HTMLElement;
  private noticeEl!: HTMLElement;
  private sweepSelect: HTMLSelectElement | null = null;
  private snippetEl!: HTMLElement;
  private resizeObserver: ResizeObserver | null = null;
  /** Performance marks: set when a slider input starts a recompute. */
  private pendingMark: string | null = null;
  private drawingToken: object | null = null;
  private tableKey = "";
  private valueCells = new Map<string, { tr: HTMLElement; td: HTMLElement; unit: string }>();
  private plotState: Array<PlotState | undefined> = [];
  /** Time scrubbers of the plots whose x axis is time (index = plot index). */
  private scrubbers: Array<TimeScrubber | undefined> = [];
  /** Plots whose curves were swapped in place, with the figure plotly still has to draw. */
  private stalePlots = new Map<number, PlotFigure>();
  private exactTimer: ReturnType<typeof setTimeout> | null = null;

  /** The inputs and sweep the explorer was opened with (`explore(id, {...})`): what Reset returns to. */
  private openedWith: { inputs: Record<string, number>; sweep: SweepRequest | null } | null = null;

  override render(): void {
    this.el.classList.add("hx-explorer");
    if (!this.openedWith) {
      this.openedWith = { inputs: { ...((this.model.get("inputs") as Record<string, number> | null) ?? {}) }, sweep: (this.model.get("sweep") as SweepRequest | null) ?? null };
    }
    const calculator = this.model.get("calculator") as string;
    const resolved = resolveSpec(calculator, this.model.get("spec") as SpecData | null);
    this.spec = resolved.spec;
    this.local = resolved.local && this.model.get("compute_in") !== "kernel";
    this.el.replaceChildren();
    this.el.dataset.calculator = calculator || this.spec?.id || "";
    this.el.dataset.mode = this.local ? "browser" : "kernel";
    this.el.dataset.drawing = "";
    if (!this.spec) {
      this.el.append(el("div", { class: "hx-error", text: resolved.note || "No calculator spec in the widget state." }));
      return;
    }
    const spec = this.spec;
    const header = el("div", { class: "hx-header" });
    header.append(el("span", { class: "hx-title", text: spec.title, title: spec.summary }));
    this.statusEl = el("span", { class: "hx-badge" });
    header.append(this.statusEl);
    this.el.append(header);
    this.noticeEl = el("div", { class: "hx-notice" });
    this.el.append(this.noticeEl);

    const body = el("div", { class: "hx-body" });
    const controls = el("div", { class: "hx-controls" });
    for (const input of spec.inputs) controls.append(this.buildControl(input));
    controls.append(this.buildToolbar());
    body.append(controls);

    const results = el("div", { class: "hx-results" });
    this.errorEl = el("div", { class: "hx-error", role: "alert" });
    this.errorEl.hidden = true;
    results.append(this.errorEl);
    this.outputsEl = el("div", { class: "hx-outputs" });
    results.append(this.outputsEl);
    const plots = el("div", { class: "hx-plots" });
    this.scrubbers = [];
    this.plotEls = spec.plots.map((p, k) => {
      plots.append(el("div", { class: "hx-plot-title", text: p.title }));
      const d = el("div", { class: "hx-plot", "data-plot": p.id });
      plots.append(d);
      // a time trace (x in seconds) gets a scrubber: a time slider, Play, and the values at that time
      const xo = spec.outputs.find((o) => o.name === p.x);
      if (xo && xo.unit === "s") {
        const scrub = new TimeScrubber(
          p,
          spec.outputs,
          () => this.model.get("result") as CalculatorResult | null,
          () => {
            const r = this.model.get("result") as CalculatorResult | null;
            if (r) void this.drawPlot(k, r);
          },
        );
        this.scrubbers[k] = scrub;
        plots.append(scrub.el);
      }
      return d;
    });
    this.texturePanel = texturePanelFor(spec);
    if (this.texturePanel) results.append(this.texturePanel.el);
    results.append(plots);
    body.append(results);
    this.el.append(body);

    const about = el("details", { class: "hx-about" });
    about.append(el("summary", { text: "Method, assumptions and sources" }));
    about.append(el("p", { text: spec.summary }));
    about.append(el("p", { text: `Method: ${spec.method}` }));
    const ul = el("ul");
    for (const a of spec.assumptions) ul.append(el("li", { text: `Assumption: ${a}` }));
    for (const s of spec.sources) ul.append(el("li", { text: `Source: ${s}` }));
    about.append(ul);
    this.el.append(about);

    this.updateNotice(resolved.note);
    this.syncControls();
    if (this.local) {
      const c = (this.coalescer = new Coalescer((o) => this.applyOutcome(o)));
      // The worker starts when the person reaches for a control (or on the first recompute).
      const warm = (): void => c.prewarm();
      this.el.addEventListener("pointerover", warm, { once: true });
      this.el.addEventListener("focusin", warm, { once: true });
    }
    this.updateStatus();

    this.listenTo(this.model, "change:inputs", () => {
      this.syncControls();
      if (this.local) this.recompute();
    });
    // the kernel gave an input another uncertainty (setInputs("16 ± 2 pJ/m")) with the same value
    this.listenTo(this.model, "change:uncertainties change:correlations", () => {
      this.syncControls();
      if (this.local) this.recompute();
    });
    this.listenTo(this.model, "change:sweep", () => {
      this.syncControls();
      if (this.local) this.recompute();
    });
    this.listenTo(this.model, "change:result", () => this.renderResult());
    this.listenTo(this.model, "change:error", () => this.renderResult());
    this.listenTo(this.model, "change:kernel_version", () => this.updateNotice(resolved.note));

    // A catalogue explorer computes its own first result if the state carries none (or a stale one).
    if (this.local && !this.resultMatchesInputs()) this.recompute();
    else this.renderResult();

    if (typeof ResizeObserver !== "undefined") {
      this.resizeObserver = new ResizeObserver(() => {
        this.plotEls.forEach((p, k) => {
          if (!p.dataset.drawn || p.offsetParent === null) return;
          // A plot with swapped curves is redrawn by plotly first (its own data are older).
          const fig = this.stalePlots.get(k);
          if (fig) {
            this.stalePlots.delete(k);
            void this.plotlyDraw(k, fig).then(() => Plotly.Plots.resize(p));
          } else void Plotly.Plots.resize(p);
        });
      });
      this.resizeObserver.observe(this.el);
    }
  }

  override remove(): this {
    this.coalescer?.dispose();
    this.resizeObserver?.disconnect();
    if (this.exactTimer !== null) clearTimeout(this.exactTimer);
    this.stalePlots.clear();
    for (const p of this.plotEls) Plotly.purge(p);
    return super.remove();
  }

  // ----- state helpers -----

  private values(): Record<string, number> {
    const stored = (this.model.get("inputs") ?? {}) as Record<string, number>;
    const out: Record<string, number> = {};
    for (const i of this.spec!.inputs) out[i.name] = typeof stored[i.name] === "number" ? stored[i.name]! : i.default;
    return out;
  }

  /** SI standard uncertainties of inputs (> 0 only). */
  private uncertainties(): Record<string, number> {
    const u = (this.model.get("uncertainties") ?? {}) as Record<string, number>;
    return Object.fromEntries(Object.entries(u).filter(([, x]) => typeof x === "number" && x > 0));
  }

  private correlations(): InputCorrelation[] {
    return (this.model.get("correlations") as InputCorrelation[] | null) ?? [];
  }

  private sweepState(): SweepRequest | null {
    return (this.model.get("sweep") as SweepRequest | null) ?? null;
  }

  private resultMatchesInputs(): boolean {
    const result = this.model.get("result") as CalculatorResult | null;
    if (!result || !result.inputs) return false;
    const v = this.values();
    for (const [k, x] of Object.entries(v)) if (result.inputs[k]?.value !== x) return false;
    const u = this.uncertainties();
    for (const [k, x] of Object.entries(u)) if ((result.inputs[k] as { uncertainty?: number } | undefined)?.uncertainty !== x) return false;
    const s = this.sweepState();
    if (s && s.over !== NO_SWEEP && JSON.stringify(result.sweep ?? null) !== JSON.stringify(s)) return false;
    if (s && s.over === NO_SWEEP && result.sweep) return false;
    return true;
  }

  private setInput(name: string, value: number): void {
    const next = { ...this.values(), [name]: value };
    this.model.set("inputs", next);
    this.touch();
  }

  // ----- controls -----

  private buildControl(input: InputSpec): HTMLElement {
    const row = el("div", { class: "hx-control", "data-input": input.name, title: input.meaning });
    const unit = input.unit && input.unit !== "1" ? input.unit : "";
    const label = el("label", { class: "hx-label", text: input.name, title: `${input.meaning}${unit ? ` [SI unit: ${displayUnit(unit)}]` : ""}` });
    row.append(label);
    let slider: HTMLInputElement | null = null;
    let select: HTMLSelectElement | null = null;
    let entry: HTMLInputElement | null = null;
    const message = el("div", { class: "hx-entry-error", role: "status" });
    message.hidden = true;
    if (input.kind === "choice" && input.choices) {
      select = el("select", { class: "hx-choice", "aria-label": input.name }) as HTMLSelectElement;
      for (const c of input.choices) select.append(el("option", { value: String(c.value), text: c.label }));
      select.addEventListener("change", () => this.setInput(input.name, Number(select!.value)));
      row.append(select);
    } else {
      slider = el("input", { type: "range", class: "hx-slider", min: "0", max: String(STEPS), step: "any", "aria-label": input.name }) as HTMLInputElement;
      if (isLogScale(input)) slider.classList.add("hx-log");
      slider.addEventListener("input", () => {
        const v = fromPosition(Number(slider!.value), input);
        this.pendingMark = `hx-input-${Date.now()}-${Math.random()}`;
        performance.mark(this.pendingMark);
        message.hidden = true;
        this.setInput(input.name, v);
      });
      entry = el("input", { type: "text", class: "hx-entry", spellcheck: "false", "aria-label": `${input.name} value` }) as HTMLInputElement;
      const commit = () => {
        const outcome = validateEntry(input as InputSpec, entry!.value);
        if (!outcome.ok) {
          message.textContent = outcome.reason;
          message.hidden = false;
          row.classList.add("hx-refused");
          return;
        }
        message.hidden = true;
        row.classList.remove("hx-refused");
        this.setInput(input.name, outcome.value);
        this.syncControls();
      };
      entry.addEventListener("change", commit);
      entry.addEventListener("keydown", (e) => {
        if (e.key === "Enter") commit();
        if (e.key === "Escape") {
          message.hidden = true;
          row.classList.remove("hx-refused");
          this.syncControls();
        }
      });
      row.append(slider, entry);
    }
    // an input's standard uncertainty (a film file's): it stays while the slider moves the value
    const uncertainty = el("span", { class: "hx-input-uncertainty", title: "standard uncertainty of this input, propagated to the results (first order)" });
    uncertainty.hidden = true;
    row.append(uncertainty);
    row.append(message);
    if (this.spec && filmInputNames(this.spec).includes(input.name)) {
      // a film input the notebook did not give: the invented demo film's value, said beside it until changed
      label.append(el("span", { class: "hx-demo", text: "demo", title: "the calculator's invented demo film's value (not a real material): set your film's" }));
    }
    this.rows.set(input.name, { input, row, slider, select, entry, message, uncertainty });
    return row;
  }

  private buildToolbar(): HTMLElement {
    const bar = el("div", { class: "hx-toolbar" });
    const spec = this.spec!;
    if (spec.sweep && spec.sweep.over.length > 0) {
      const label = el("label", { class: "hx-sweep-label", text: "Sweep " });
      this.sweepSelect = el("select", { class: "hx-sweep", "aria-label": "swept input" }) as HTMLSelectElement;
      for (const name of spec.sweep.over) this.sweepSelect.append(el("option", { value: name, text: name }));
      this.sweepSelect.append(el("option", { value: NO_SWEEP, text: "no sweep" }));
      this.sweepSelect.addEventListener("change", () => {
        const over = this.sweepSelect!.value;
        if (over === NO_SWEEP) {
          this.model.set("sweep", { over: NO_SWEEP, from: 0, to: 0, points: 0 });
          this.touch();
          return;
        }
        const input = spec.inputs.find((i) => i.name === over)!;
        const points = this.sweepState()?.points ?? spec.sweep!.points;
        this.model.set("sweep", { over, from: input.min, to: input.max, points });
        this.touch();
      });
      label.append(this.sweepSelect);
      bar.append(label);
    }
    const reset = el("button", {
      class: "hx-button hx-reset",
      text: "Reset",
      title: "Reset every input to the value the explorer was opened with (the calculator's default where none was given)",
    });
    reset.addEventListener("click", () => {
      const defaults = Object.fromEntries(spec.inputs.map((i) => [i.name, i.default]));
      for (const r of this.rows.values()) {
        r.message.hidden = true;
        r.row.classList.remove("hx-refused");
      }
      this.model.set("inputs", { ...defaults, ...(this.openedWith?.inputs ?? {}) });
      // Reset also forgets the kept axis ranges: every plot is refitted to its new data.
      this.plotState = [];
      if (this.openedWith?.sweep) {
        this.model.set("sweep", { ...this.openedWith.sweep });
      } else {
        const sweep = defaultSweep(spec);
        if (sweep) this.model.set("sweep", sweep);
      }
      this.touch();
    });
    const copy = el("button", { class: "hx-button hx-copy", text: "Copy as code", title: "Copy a TypeScript cell with the current inputs" });
    this.snippetEl = el("pre", { class: "hx-snippet" });
    this.snippetEl.hidden = true;
    copy.addEventListener("click", async () => {
      const text = codeSnippet({
        calculator: this.model.get("calculator") as string,
        functionName: this.model.get("function_name") as string,
        inputs: spec.inputs,
        values: this.values(),
        sweep: this.effectiveSweep(),
        noSweep: this.sweepState()?.over === NO_SWEEP,
        uncertainties: this.uncertainties(),
        correlations: this.correlations(),
      });
      this.snippetEl.textContent = text;
      this.snippetEl.hidden = false;
      const copied = await copyText(text);
      copy.textContent = copied ? "Copied" : "Select and copy below";
      setTimeout(() => (copy.textContent = "Copy as code"), 1500);
    });
    bar.append(reset, copy);
    const wrap = el("div");
    wrap.append(bar, this.snippetEl);
    return wrap;
  }

  private effectiveSweep(): SweepRequest | null {
    const s = this.sweepState();
    if (s && s.over === NO_SWEEP) return null;
    if (s) return s;
    return defaultSweep(this.spec!) ?? null;
  }

  private syncControls(): void {
    const values = this.values();
    const sweep = this.effectiveSweep();
    const uncertainties = this.uncertainties();
    for (const r of this.rows.values()) {
      const v = values[r.input.name]!;
      r.row.dataset.value = String(v);
      const u = uncertainties[r.input.name];
      r.uncertainty.hidden = u === undefined;
      r.uncertainty.textContent = u === undefined ? "" : `± ${formatQuantity(u, r.input.unit)}`;
      if (u === undefined) delete r.row.dataset.uncertainty;
      else r.row.dataset.uncertainty = String(u);
      const demoTag = r.row.querySelector<HTMLElement>(".hx-demo");
      if (demoTag) {
        const given = (this.model.get("given") as string[] | null | undefined) ?? null;
        // pages exported before `given` existed: no mark (nothing is known of what the notebook gave)
        demoTag.hidden = given === null || given.includes(r.input.name) || v !== r.input.default;
        r.row.classList.toggle("hx-demo-value", !demoTag.hidden);
      }
      const swept = sweep?.over === r.input.name;
      r.row.classList.toggle("hx-swept", swept);
      if (r.slider) {
        r.slider.value = String(toPosition(v, r.input));
        // The swept input stays editable: its value is the point the table shows, marked on the curves.
      }
      if (r.select) r.select.value = String(v);
      if (r.entry && !r.row.classList.contains("hx-refused") && document.activeElement !== r.entry) {
        r.entry.value = entryText(r.input, v);
        r.entry.title = swept
          ? `swept from ${entryText(r.input, sweep!.from)} to ${entryText(r.input, sweep!.to)} in the plots; this value is the marked point and the table's`
          : "";
      }
      if (r.entry && document.activeElement === r.entry && !r.row.classList.contains("hx-refused")) {
        // keep what the person is typing
      }
    }
    if (this.sweepSelect) this.sweepSelect.value = sweep ? sweep.over : NO_SWEEP;
    this.el.dataset.sweep = sweep ? JSON.stringify(sweep) : "";
  }

  // ----- compute -----

  private recompute(): void {
    if (!this.coalescer) return;
    const sweep = this.effectiveSweep();
    const uncertainties = this.uncertainties();
    this.coalescer.submit({
      calculator: this.model.get("calculator") as string,
      inputs: this.values(),
      sweep,
      noSweep: !sweep && this.sweepState()?.over === NO_SWEEP,
      ...(Object.keys(uncertainties).length ? { uncertainties, correlations: this.correlations() } : {}),
    });
    this.updateStatus(true);
  }

  private applyOutcome(o: ComputeOutcome): void {
    if (o.seq <= this.appliedSeq) return;
    this.appliedSeq = o.seq;
    this.el.dataset.computeMs = String(o.ms);
    performance.mark("hx-result-arrived");
    if (o.ok) {
      this.model.set({ result: o.result, error: "" });
    } else {
      this.model.set({ result: null, error: o.error });
    }
    this.touch();
    this.updateStatus(this.coalescer?.busy ?? false);
  }

  private updateStatus(busy = false): void {
    const where = this.local
      ? `computed in this page (${this.coalescer?.where === "worker" ? "Web Worker" : "main thread"})`
      : isStaticPage(this)
        ? "kernel function: needs the running kernel; showing its last state"
        : "computed by the kernel";
    this.statusEl.textContent = busy ? `${where} · computing…` : where;
    this.statusEl.classList.toggle("hx-needs-kernel", !this.local);
    this.el.dataset.busy = busy ? "1" : "";
    if (!this.local && isStaticPage(this)) {
      for (const r of this.rows.values()) {
        if (r.slider) r.slider.disabled = true;
        if (r.entry) r.entry.disabled = true;
        if (r.select) r.select.disabled = true;
      }
    }
  }

  private updateNotice(extra: string): void {
    const parts = [versionMismatch(this.model.get("kernel_version")), extra || null].filter(Boolean) as string[];
    this.noticeEl.textContent = parts.join(" ");
    this.noticeEl.hidden = parts.length === 0;
  }

  // ----- results -----

  private renderResult(): void {
    const spec = this.spec!;
    const error = this.model.get("error") as string;
    const result = this.model.get("result") as CalculatorResult | null;
    this.errorEl.hidden = !error;
    this.errorEl.textContent = error ? `Calculator error: ${error}` : "";
    this.el.classList.toggle("hx-has-error", !!error);
    this.texturePanel?.show(result);
    if (!result) {
      this.tableKey = "";
      this.outputsEl.replaceChildren();
      if (!error) this.outputsEl.append(el("div", { class: "hx-muted", text: this.local ? "computing…" : "no result yet" }));
      for (const p of this.plotEls) {
        p.hidden = !!error;
        (p.previousElementSibling as HTMLElement | null)?.toggleAttribute("hidden", !!error);
      }
      this.markDone();
      return;
    }
    this.renderTable(result);
    for (const sc of this.scrubbers) sc?.update(result);
    // The first (main) plot is drawn at once; the others just after, so it shows sooner. A plot
    // whose axes and labels stay as they are gets its curves swapped in place (views/linePath.ts)
    // and a full Plotly.react once the slider rests (hover labels and gd.data exact again).
    const drawing = (this.drawingToken = {});
    this.el.dataset.drawing = "1";
    const draws: Promise<unknown>[] = [];
    if (spec.plots.length > 0) {
      const first = this.drawPlot(0, result);
      draws.push(first);
      for (let k = 1; k < spec.plots.length; k++) {
        const kk = k;
        draws.push(first.then((swapped) => (swapped ? this.drawPlot(kk, result) : new Promise((r) => setTimeout(r, 0)).then(() => this.drawPlot(kk, result)))));
      }
    }
    void Promise.all(draws).then(() => {
      this.markDone();
      if (drawing !== this.drawingToken) return;
      if (this.stalePlots.size) this.scheduleExactRedraw();
      else this.el.dataset.drawing = "";
    });
  }

  /** Plot figures with the explorer's own (stable) axis ranges: see views/plotRanges.ts. */
  private figureFor(k: number, result: CalculatorResult): PlotFigure {
    const spec = this.spec!;
    const plot = spec.plots[k]!;
    const scrubbed = this.scrubbers[k]?.mark(result) ?? null;
    const fig = plotFigure(plot, spec.outputs, result, scrubbed ?? currentMarkFor(plot, spec, result, this.values()));
    if (fig.data.length === 0) return fig;
    const shape = JSON.stringify([fig.layout, fig.data.map((t) => [t.name, t.mode, t.meta])]);
    const prev = this.plotState[k];
    const same = prev?.shape === shape;
    const axis = (name: "xaxis" | "yaxis", values: Array<ArrayLike<number | null>>, log: boolean): [number, number] | null => {
      let ext: [number, number] | null = null;
      for (const v of values) {
        const e = dataExtent(v, log);
        if (e) ext = ext ? [Math.min(ext[0], e[0]), Math.max(ext[1], e[1])] : e;
      }
      return stableRange(same ? prev![name] : null, ext);
    };
    // The x axis spans exactly the sweep when it is the swept input, else exactly the data of a
    // line plot (a curve's ends are its ends); markers get the padded, stable range.
    const toAxis = (r: [number, number]): [number, number] => (plot.xLog ? [Math.log10(r[0]), Math.log10(r[1])] : r);
    let xr: [number, number] | null;
    if (fig.sweptRange && (!plot.xLog || fig.sweptRange[0] > 0)) xr = toAxis(fig.sweptRange);
    else if (plot.mode !== "markers") {
      let ext: [number, number] | null = null;
      for (const t of fig.data) {
        const e = dataExtent(t.x as number[], !!plot.xLog);
        if (e) ext = ext ? [Math.min(ext[0], e[0]), Math.max(ext[1], e[1])] : e;
      }
      xr = ext && ext[1] > ext[0] ? ext : ext ? paddedRange(ext) : null;
    } else
      xr = axis(
        "xaxis",
        fig.data.map((t) => t.x as number[]),
        !!plot.xLog,
      );
    const yr = axis(
      "yaxis",
      fig.data.map((t) => t.y as Array<number | null>),
      !!plot.yLog,
    );
    const layout = fig.layout as { xaxis: Record<string, unknown>; yaxis: Record<string, unknown> };
    if (xr) {
      layout.xaxis.range = xr;
      layout.xaxis.autorange = false;
    }
    if (yr) {
      layout.yaxis.range = yr;
      layout.yaxis.autorange = false;
    }
    const sameX = !!prev && !!xr && !!prev.xaxis && prev.xaxis[0] === xr[0] && prev.xaxis[1] === xr[1];
    this.plotState[k] = { shape, xaxis: sameX ? prev!.xaxis : xr, yaxis: yr, swappable: same && sameX && prev!.yaxis === yr };
    return fig;
  }

  /** Draw plot k; resolves true when the curves were swapped in place (no plotly redraw). */
  private drawPlot(k: number, result: CalculatorResult): Promise<boolean> {
    const plot = this.spec!.plots[k]!;
    const target = this.plotEls[k]!;
    target.hidden = false;
    (target.previousElementSibling as HTMLElement | null)?.removeAttribute("hidden");
    const fig = this.figureFor(k, result);
    if (fig.data.length === 0) {
      Plotly.purge(target);
      delete target.dataset.drawn;
      this.stalePlots.delete(k);
      const why = !this.effectiveSweep() && this.spec!.sweep?.over.length ? "no sweep chosen: pick an input under Sweep to draw this plot" : fig.problem;
      target.replaceChildren(el("div", { class: "hx-error hx-plot-message", text: `Plot '${plot.title}': ${why}` }));
      return Promise.resolve(false);
    }
    if (target.dataset.drawn && this.plotState[k]!.swappable && swapLineData(target, fig.data as Array<{ x: number[]; y: Array<number | null>; mode: unknown }>)) {
      this.stalePlots.set(k, fig);
      target.dataset.swaps = String(Number(target.dataset.swaps ?? 0) + 1);
      if (k === 0) this.markFirstPlot();
      return Promise.resolve(true);
    }
    this.stalePlots.delete(k);
    return this.plotlyDraw(k, fig).then(() => false);
  }

  private plotlyDraw(k: number, fig: PlotFigure): Promise<void> {
    const target = this.plotEls[k]!;
    if (!target.dataset.drawn) target.replaceChildren();
    return Plotly.react(target, fig.data, fig.layout, { displaylogo: false, responsive: true }).then(() => {
      if (!target.dataset.drawn) addExportButtons(target, this.spec!.plots[k]!.id);
      target.dataset.drawn = "1";
      if (k === 0) this.markFirstPlot();
    });
  }

  /** After in-place swaps: a full plotly redraw of those plots once no update came for a while. */
  private scheduleExactRedraw(): void {
    if (this.exactTimer !== null) clearTimeout(this.exactTimer);
    this.exactTimer = setTimeout(() => this.exactRedraw(), EXACT_REDRAW_DELAY_MS);
  }

  private exactRedraw(): void {
    this.exactTimer = null;
    if (this.coalescer?.busy || this.pendingMark) {
      this.scheduleExactRedraw();
      return;
    }
    const token = this.drawingToken;
    const jobs = [...this.stalePlots].map(([k, fig]) => this.plotlyDraw(k, fig));
    this.stalePlots.clear();
    void Promise.all(jobs).then(() => {
      if (token === this.drawingToken && this.stalePlots.size === 0) this.el.dataset.drawing = "";
    });
  }

  /**
   * The outputs table and notes. Rebuilt only when the set of outputs or the notes change;
   * otherwise the value cells are updated in place (cheaper while a slider moves).
   */
  private renderTable(result: CalculatorResult): void {
    const spec = this.spec!;
    const shown = spec.outputs.filter((o) => (o.kind ?? "scalar") !== "array" && o.name in result.outputs);
    const notes = result.notes ?? [];
    const report = (result as CalculatorResult & { uncertainty?: UncertaintyReport }).uncertainty;
    const flagged = report?.flagged ?? {};
    const key = JSON.stringify([shown.map((o) => o.name), result.status, notes, Object.keys(flagged), !!report]);
    if (key !== this.tableKey) {
      this.tableKey = key;
      this.valueCells = new Map();
      const table = el("table", { class: "hx-table" });
      const head = el("tr");
      head.append(el("th", { text: "quantity" }), el("th", { text: report ? "value ± u" : "value" }));
      table.append(head);
      if (report) {
        // the method, stated where the numbers are (the notes say it in full)
        const m = el("tr", { class: "hx-uncertainty-method" });
        const inputs = Object.keys(report.inputs).join(", ");
        m.append(
          el("td", {
            colspan: "2",
            text: `± u: standard uncertainty from ${inputs}, ${report.method === "monte-carlo" ? "Monte Carlo (JCGM 101:2008)" : "first order (JCGM 100:2008), at this point"}${report.correlations.length ? ", with correlations" : ""}; values without ± do not depend on those inputs; (!) not trustworthy, see the notes`,
          }),
        );
        table.append(m);
      }
      // groups a reader can follow: the headline numbers, the other numbers, the statements in words;
      // each row by its symbol and meaning (the output id stays in data-output and the tooltip)
      const numeric = shown.filter((o) => typeof result.outputs[o.name]!.value === "number");
      const headline = spec.headline?.length ? spec.headline : numeric.slice(0, 4).map((o) => o.name);
      const groups: Array<[string, typeof shown]> = [
        ["Results", numeric.filter((o) => headline.includes(o.name)).sort((a, b) => headline.indexOf(a.name) - headline.indexOf(b.name))],
        ["More results", numeric.filter((o) => !headline.includes(o.name))],
        ["In words", shown.filter((o) => typeof result.outputs[o.name]!.value !== "number")],
      ];
      for (const [title, list] of groups) {
        if (list.length === 0) continue;
        const gr = el("tr", { class: "hx-group" });
        gr.append(el("th", { text: title, colspan: "2" }));
        table.append(gr);
        for (const o of list) {
          const tr = el("tr", { title: `${o.meaning} (${o.name})`, "data-output": o.name });
          const td = el("td", { class: "hx-value" });
          const q = el("td", { class: "hx-quantity" });
          if (o.symbol) {
            const sym = el("span", { class: "hx-symbol" });
            sym.innerHTML = symbolHtml(o.symbol); // escaped by symbolHtml
            q.append(sym, document.createTextNode(" "));
          }
          q.append(el("span", { class: "hx-meaning", text: o.meaning }));
          tr.append(q, td);
          table.append(tr);
          this.valueCells.set(o.name, { tr, td, unit: o.unit });
        }
      }
      for (const [name, why] of Object.entries(flagged)) {
        const cell = this.valueCells.get(name);
        if (!cell) continue;
        cell.tr.classList.add("hx-flagged");
        cell.tr.title = `${cell.tr.title}: uncertainty not trustworthy, ${why}`;
      }
      const parts: HTMLElement[] = [table];
      if (result.status === "warning" || notes.length) {
        const list = el("ul", { class: result.status === "warning" ? "hx-warning" : "hx-notes" });
        for (const n of notes) list.append(el("li", { text: n }));
        parts.push(list);
      }
      this.outputsEl.replaceChildren(...parts);
    }
    for (const [name, cell] of this.valueCells) {
      const out = result.outputs[name]! as { value: number | number[] | string; uncertainty?: number };
      const value = out.value;
      // an output that does not move with any uncertain input (a count, a lattice edge) has u = 0 exactly: shown bare
      const u = typeof value === "number" && typeof out.uncertainty === "number" && out.uncertainty !== 0 ? out.uncertainty : null;
      let text = typeof value === "number" ? (u !== null ? formatWithError(value, u, cell.unit) : formatQuantity(value, cell.unit)) : String(value);
      if (flagged[name]) text += " (!)";
      if (cell.td.textContent !== text) cell.td.textContent = text;
      if (typeof value === "number") cell.tr.dataset.value = String(value);
      else delete cell.tr.dataset.value;
      if (u !== null) cell.tr.dataset.uncertainty = String(u);
      else delete cell.tr.dataset.uncertainty;
    }
  }

  /** The first (main) plot shows the new result: "hx-slider-to-plot". */
  private markFirstPlot(): void {
    if (!this.pendingMark || this.coalescer?.busy) return;
    performance.mark(`${this.pendingMark}-first`);
    try {
      performance.measure("hx-slider-to-plot", this.pendingMark, `${this.pendingMark}-first`);
      performance.measure("hx-result-to-plot", "hx-result-arrived", `${this.pendingMark}-first`);
    } catch {
      /* marks cleared */
    }
  }

  /** Every plot and the table show it: "hx-slider-to-all-plots". */
  private markDone(): void {
    if (!this.pendingMark) return;
    const start = this.pendingMark;
    this.pendingMark = null;
    if (this.coalescer?.busy) {
      this.pendingMark = start;
      return;
    }
    performance.mark(`${start}-done`);
    try {
      performance.measure("hx-slider-to-all-plots", start, `${start}-done`);
    } catch {
      /* marks cleared */
    }
  }
}
