/**
 * `fitPanel(...)`: the fit panel widget (data, model curve, residuals, parameter table with
 * uncertainties, start/stop, progress). Three forms:
 *
 *   fitPanel(fit, { data })                                   // a profile fit's result, shown
 *   fitPanel({ data, model: "wall180-bz", fit: { start, fixed, bounds } })   // a fit run by the panel
 *   fitPanel({ title, x, y, modelY, parameters, ... })        // any state (camelCase; old snake_case read)
 *
 * A panel that knows its data and a catalogue model (the first form on fitProfile's result, or the
 * second) runs the fit on a worker thread when "Start fit" is pressed (the second form also at once):
 * the bar and the status follow the iterations, "Stop" ends it between evaluations (status
 * "stopped", the best point so far shown), and `panel.result` / `panel.done` give the result.
 * The state and its normaliser are shared with the page's view (lib/src/plot/fitPanelState.ts).
 */
import { existsSync } from "node:fs";
import { join } from "node:path";
import { Worker } from "node:worker_threads";
import {
  fitPanelFromResult,
  fitPanelState,
  FIT_PANEL_DEFAULTS,
  InputError,
  profileModels,
  type FitPanelOptions,
  type FitPanelParameter,
  type FitPanelState,
  type FitProfileOptions,
  type ProfileData,
  type ProfileFitResult,
} from "@helicoid/lib";
import { Widget, type WidgetState } from "./widget.js";
import { ourModel } from "./ourModel.js";
import type { FitWorkerMessage } from "../parallel/fitWorker.js";

/** A row of the parameter table. */
export type FitParameterRow = FitPanelParameter;

export type { FitPanelState } from "@helicoid/lib";

/** Profile data as `readProfileCsv` gives them (the signal's SI unit read from `yUnit`). */
export type FitPanelData = ProfileData & { yUnit?: string };

/** Labels of a panel made from a fit. */
export interface FitPanelLabels {
  title?: string;
  xLabel?: string;
  yLabel?: string;
}

/** A fit the panel runs: the data, a catalogue profile model, and fitProfile's options. */
export interface FitPanelRun extends FitPanelLabels {
  data: FitPanelData;
  model: string;
  fit?: FitProfileOptions;
}

function workerScript(): string {
  const here = join(__dirname, "..", "parallel", "fitWorker.js");
  return existsSync(here) ? here : join(__dirname, "..", "..", "dist", "parallel", "fitWorker.js");
}

/** fitProfile's options that go to a worker thread (functions stay behind: the panel brings its own). */
function portableOptions(o: FitProfileOptions): FitProfileOptions {
  const { onProgress: _p, signal: _s, ...rest } = o;
  return JSON.parse(JSON.stringify(rest)) as FitProfileOptions;
}

export class FitPanel extends Widget<FitPanelState & WidgetState> {
  private run: { data: FitPanelData; model: string; fit: FitProfileOptions } | null = null;
  private stopFlag: Int32Array | null = null;
  private worker: Worker | null = null;
  private latest: ProfileFitResult | null = null;
  private finished: Promise<ProfileFitResult | null> = Promise.resolve(null);

  constructor(first: FitPanelOptions | ProfileFitResult | FitPanelRun = {}, more: (FitPanelLabels & { data?: FitPanelData; fit?: FitProfileOptions }) | undefined = undefined) {
    let state: Partial<FitPanelState>;
    let run: FitPanel["run"] = null;
    let latest: ProfileFitResult | null = null;
    let startNow = false;
    const labels = (l: FitPanelLabels | undefined) => ({
      ...(l?.title !== undefined ? { title: l.title } : {}),
      ...(l?.xLabel !== undefined ? { xLabel: l.xLabel } : {}),
      ...(l?.yLabel !== undefined ? { yLabel: l.yLabel } : {}),
    });
    if (first && typeof first === "object" && "parameters" in first && "fitted" in first && "chiSquare" in first) {
      // a fit's result: shown; "Start fit" reruns it when its model is a catalogue one
      const result = first as ProfileFitResult;
      if (!more?.data) throw new InputError("data", "(none)", "the data the fit was made to: fitPanel(fit, { data })");
      state = { ...fitPanelFromResult(result, more.data), ...labels(more) };
      latest = result;
      if (typeof result.model === "string" && profileModels.some((m) => m.id === result.model)) run = { data: more.data, model: result.model, fit: more.fit ?? {} };
    } else if (first && typeof first === "object" && "data" in first && "model" in first) {
      const r = first as FitPanelRun;
      if (typeof r.model !== "string" || !profileModels.some((m) => m.id === r.model))
        throw new InputError("model", r.model, `a profile model of the catalogue: ${profileModels.map((m) => m.id).join(", ")}`);
      state = {
        title: r.title ?? r.model,
        x: Array.from(r.data.x),
        y: Array.from(r.data.y),
        yErr: r.data.sigma ? Array.from(r.data.sigma) : null,
        xUnit: "m",
        yUnit: r.data.yUnit ?? "",
        ...labels(r),
      };
      run = { data: r.data, model: r.model, fit: r.fit ?? {} };
      startNow = true;
    } else {
      state = fitPanelState(first as Record<string, unknown>);
    }
    super({ ...ourModel("FitPanel"), state: { ...FIT_PANEL_DEFAULTS, ...state } as FitPanelState & WidgetState });
    this.run = run;
    this.latest = latest;
    if (run) {
      this.onStart(() => void this.start());
      this.onStop(() => this.stop());
    }
    if (startNow) void this.start();
  }

  /** The latest fit result the panel shows (null before its first fit ends). */
  get result(): ProfileFitResult | null {
    return this.latest;
  }

  /** Resolves with the result of the fit now running (or the last one). */
  get done(): Promise<ProfileFitResult | null> {
    return this.finished;
  }

  /**
   * Run the panel's fit on a worker thread (as "Start fit" does): progress after every iteration,
   * `stop()` ends it. Resolves with the result (null when the fit could not start: said in the panel).
   */
  start(): Promise<ProfileFitResult | null> {
    if (!this.run) throw new InputError("fitPanel", "(no fit)", "a panel made from a fit of a catalogue model, or with { data, model }");
    if (this.worker) return this.finished;
    const { data, model, fit } = this.run;
    const maxEvaluations = fit.maxEvaluations ?? 200 * (profileModels.find((m) => m.id === model)!.parameters.length + 1);
    const stop = new SharedArrayBuffer(4);
    this.stopFlag = new Int32Array(stop);
    const worker = (this.worker = new Worker(workerScript()));
    this.set({ status: "running", progress: 0, message: "fitting", iterations: 0 });
    this.finished = new Promise<ProfileFitResult | null>((resolve) => {
      const end = (fn: () => void) => {
        if (this.worker !== worker) return;
        this.worker = null;
        this.stopFlag = null;
        void worker.terminate();
        fn();
      };
      worker.on("message", (m: FitWorkerMessage) => {
        if ("progress" in m) {
          const p = m.progress;
          // the bar: evaluations against the most the solver is allowed (a bound: a fit usually ends sooner)
          this.set({
            progress: Math.min(0.99, p.evaluations / maxEvaluations),
            iterations: p.iteration,
            message: `iteration ${p.iteration}, sum of squares ${p.sumOfSquares.toPrecision(4)}`,
          });
        } else if ("result" in m) {
          end(() => {
            this.latest = m.result;
            const { title: _title, ...shown } = fitPanelFromResult(m.result, data); // the panel keeps its own title
            this.set(shown);
            resolve(m.result);
          });
        } else {
          end(() => {
            this.set({ status: "failed", progress: 1, message: m.error.message });
            resolve(null);
          });
        }
      });
      worker.on("error", (err) => end(() => (this.set({ status: "failed", progress: 1, message: err.message }), resolve(null))));
      worker.on("exit", (code) => end(() => (this.set({ status: "failed", progress: 1, message: `the fit's worker thread ended (exit code ${code})` }), resolve(null))));
    });
    worker.postMessage({
      data: { x: Array.from(data.x), y: Array.from(data.y), sigma: data.sigma ? Array.from(data.sigma) : null, notes: data.notes ? [...data.notes] : [] },
      model,
      options: portableOptions(fit),
      stop,
    });
    return this.finished;
  }

  /** Stop the running fit between evaluations (the panel then shows the best point so far, status "stopped"). */
  stop(): void {
    if (this.stopFlag) Atomics.store(this.stopFlag, 0, 1);
  }

  /** Update any part of the panel (camelCase fields; arrays may be typed arrays). */
  update(changes: FitPanelOptions | Record<string, unknown>): this {
    return this.set(fitPanelState(changes as Record<string, unknown>));
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

/**
 * A fit panel: `fitPanel(fit, { data })` shows a profile fit's result (and reruns it on "Start fit"),
 * `fitPanel({ data, model, fit })` runs a fit with progress and Stop, `fitPanel({ title, x, y, ... })`
 * shows any state.
 */
export function fitPanel(result: ProfileFitResult, options: FitPanelLabels & { data: FitPanelData; fit?: FitProfileOptions }): FitPanel;
export function fitPanel(run: FitPanelRun): FitPanel;
export function fitPanel(state?: FitPanelOptions): FitPanel;
export function fitPanel(first: FitPanelOptions | ProfileFitResult | FitPanelRun = {}, more?: FitPanelLabels & { data?: FitPanelData; fit?: FitProfileOptions }): FitPanel {
  return new FitPanel(first, more);
}
