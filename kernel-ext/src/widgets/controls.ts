/**
 * Standard controls, compatible with @jupyter-widgets/controls 5 and @jupyter-widgets/base 6
 * (widget model attribute spec 2.0.0, message protocol 2.1). Model and view names are the
 * protocol's; the factory functions (`slider`, `dropdown`, ...) are ours.
 */
import { Widget, type ModelRef, type WidgetState } from "./widget.js";

const CONTROLS = "@jupyter-widgets/controls";
const CONTROLS_VERSION = "2.0.0";
const BASE = "@jupyter-widgets/base";
const BASE_VERSION = "2.0.0";
const OUTPUT = "@jupyter-widgets/output";
const OUTPUT_VERSION = "1.0.0";

const model = (name: string, module = CONTROLS, version = CONTROLS_VERSION): ModelRef => ({ name: `${name}Model`, module, version });
const view = (name: string, module = CONTROLS, version = CONTROLS_VERSION): ModelRef => ({ name: `${name}View`, module, version });

/** Layout of a DOM widget (CSS properties such as width, height, margin). */
export class Layout extends Widget {
  constructor(state: Record<string, string | null> = {}) {
    super({ model: model("Layout", BASE, BASE_VERSION), view: view("Layout", BASE, BASE_VERSION), state });
  }
}

/** Attributes every DOM widget of the controls package has. */
export interface DomState extends WidgetState {
  _dom_classes?: string[];
  layout?: Layout | null;
  tabbable?: boolean | null;
  tooltip?: string | null;
}

export interface DescriptionState extends DomState {
  description?: string;
  description_allow_html?: boolean;
}

/** A DOM widget of the standard set. */
export class DomWidget<S extends DomState = DomState> extends Widget<S> {
  constructor(name: string, state: S, viewName = name, module = CONTROLS, version = CONTROLS_VERSION) {
    super({ model: model(name, module, version), view: view(viewName, module, version), state: { _dom_classes: [], tabbable: null, tooltip: null, ...state } });
  }

  /** The widget's layout (created on first use). */
  get layout(): Layout {
    let l = this.get("layout") as Layout | null | undefined;
    if (!l) {
      l = new Layout();
      this.set({ layout: l } as Partial<S>);
    }
    return l;
  }
}

/** A widget with a `value`. */
export class ValueWidget<V, S extends DescriptionState & { value: V } = DescriptionState & { value: V }> extends DomWidget<S> {
  get value(): V {
    return this.get("value");
  }
  set value(v: V) {
    this.set({ value: v } as Partial<S>);
  }
}

export interface SliderOptions {
  value?: number;
  min?: number;
  max?: number;
  step?: number;
  description?: string;
  continuous_update?: boolean;
  readout_format?: string;
  orientation?: "horizontal" | "vertical";
  disabled?: boolean;
  tooltip?: string;
}

type SliderState = DescriptionState & { value: number; min: number; max: number; step: number };

/** min <= max and, for a control that steps, step > 0: the checks of a front-end update. */
function checkBounds(next: WidgetState, steps: boolean): string | null {
  const { min, max, step } = next as { min: number; max: number; step: number };
  if (min > max) return `min = ${min} > max = ${max}: expected min <= max`;
  if (steps && !(step > 0)) return `step = ${step}: expected a number > 0`;
  return null;
}

abstract class BoundedNumber extends ValueWidget<number, SliderState> {
  protected override checkCombined(next: WidgetState): string | null {
    return checkBounds(next, this.get("step") > 0);
  }
  protected override coerce(key: string, value: unknown): unknown {
    if (key === "value" && typeof value === "number") {
      const min = this.get("min");
      const max = this.get("max");
      return Math.min(max, Math.max(min, value));
    }
    return value;
  }
  get min(): number {
    return this.get("min");
  }
  get max(): number {
    return this.get("max");
  }
}

/** The attributes every slider of the standard set has, from the options given. */
function sliderLook(o: SliderOptions, readoutFormat: string): Record<string, unknown> {
  return {
    description: o.description ?? "",
    description_allow_html: false,
    behavior: "drag-tap",
    continuous_update: o.continuous_update ?? true,
    orientation: o.orientation ?? "horizontal",
    readout: true,
    readout_format: o.readout_format ?? readoutFormat,
    disabled: o.disabled ?? false,
    tooltip: o.tooltip ?? null,
  };
}

function checkRange(kind: string, o: SliderOptions, dflt: { min: number; max: number }): { min: number; max: number } {
  const min = o.min ?? dflt.min;
  const max = o.max ?? dflt.max;
  if (!(Number.isFinite(min) && Number.isFinite(max) && min <= max)) {
    throw new RangeError(`${kind}: min = ${min}, max = ${max}: expected finite numbers with min <= max`);
  }
  return { min, max };
}

export class FloatSlider extends BoundedNumber {
  constructor(o: SliderOptions = {}) {
    const { min, max } = checkRange("slider", o, { min: 0, max: 10 });
    super("FloatSlider", {
      value: clamp(o.value ?? min, min, max),
      min,
      max,
      step: o.step ?? 0.1,
      ...sliderLook(o, ".2f"),
    });
  }
}

export class IntSlider extends BoundedNumber {
  constructor(o: SliderOptions = {}) {
    const { min, max } = checkRange("intSlider", o, { min: 0, max: 100 });
    super("IntSlider", {
      value: Math.round(clamp(o.value ?? min, min, max)),
      min: Math.ceil(min),
      max: Math.floor(max),
      step: Math.max(1, Math.round(o.step ?? 1)),
      ...sliderLook(o, "d"),
    });
  }
  protected override coerce(key: string, value: unknown): unknown {
    const v = super.coerce(key, value);
    return key === "value" && typeof v === "number" ? Math.round(v) : v;
  }
}

/** A slider on a log scale: `value` is the number itself; the track runs over base^min .. base^max. */
export class FloatLogSlider extends ValueWidget<number, SliderState & { base: number }> {
  constructor(o: SliderOptions & { base?: number } = {}) {
    const base = o.base ?? 10;
    const { min, max } = checkRange("logSlider", o, { min: 0, max: 4 });
    super("FloatLogSlider", {
      value: clamp(o.value ?? base ** min, base ** min, base ** max),
      min,
      max,
      step: o.step ?? 0.1,
      base,
      ...sliderLook(o, ".3g"),
    });
  }
  protected override checkCombined(next: WidgetState): string | null {
    const base = next.base as number;
    if (!(base > 0 && base !== 1)) return `base = ${base}: expected a number > 0 other than 1`;
    return checkBounds(next, true);
  }
  protected override coerce(key: string, value: unknown): unknown {
    if (key === "value" && typeof value === "number") {
      const b = this.get("base");
      return clamp(value, b ** this.get("min"), b ** this.get("max"));
    }
    return value;
  }
}

export class Text extends ValueWidget<string> {
  constructor(o: { value?: string; placeholder?: string; description?: string; continuous_update?: boolean; disabled?: boolean } = {}) {
    super("Text", {
      value: o.value ?? "",
      placeholder: o.placeholder ?? "",
      description: o.description ?? "",
      description_allow_html: false,
      continuous_update: o.continuous_update ?? true,
      disabled: o.disabled ?? false,
    });
  }
}

export class Checkbox extends ValueWidget<boolean> {
  constructor(o: { value?: boolean; description?: string; indent?: boolean; disabled?: boolean } = {}) {
    super("Checkbox", {
      value: o.value ?? false,
      description: o.description ?? "",
      description_allow_html: false,
      indent: o.indent ?? true,
      disabled: o.disabled ?? false,
    });
  }
}

/** A dropdown: the front end sees labels and an index; kernel code reads `value` (the chosen option). */
export class Dropdown<T = string> extends DomWidget<DescriptionState & { _options_labels: string[]; index: number | null }> {
  readonly options: ReadonlyArray<{ label: string; value: T }>;
  constructor(o: { options: ReadonlyArray<T | { label: string; value: T }>; value?: T; description?: string; disabled?: boolean }) {
    const opts = o.options.map((x) =>
      x && typeof x === "object" && "label" in (x as object) && "value" in (x as object) ? (x as { label: string; value: T }) : { label: String(x), value: x as T },
    );
    if (opts.length === 0) throw new RangeError("dropdown: options is empty; expected at least one option");
    const index = o.value === undefined ? 0 : opts.findIndex((x) => x.value === o.value);
    if (index < 0) throw new RangeError(`dropdown: value ${JSON.stringify(o.value)} is not one of the options`);
    super("Dropdown", {
      _options_labels: opts.map((x) => x.label),
      index,
      description: o.description ?? "",
      description_allow_html: false,
      disabled: o.disabled ?? false,
    });
    this.options = opts;
  }
  get value(): T | undefined {
    const i = this.get("index");
    return i === null ? undefined : this.options[i]?.value;
  }
  set value(v: T | undefined) {
    const i = this.options.findIndex((x) => x.value === v);
    if (i < 0) throw new RangeError(`dropdown: value ${JSON.stringify(v)} is not one of the options`);
    this.set({ index: i });
  }
  protected override checkIncoming(key: string, value: unknown): string | null {
    if (key === "index" && value !== null && !(Number.isInteger(value) && (value as number) >= 0 && (value as number) < this.options.length)) {
      return `index = ${JSON.stringify(value) ?? String(value)}: expected a whole number from 0 to ${this.options.length - 1}`;
    }
    if (key === "index" && value === null) return null;
    if (key === "_options_labels") return "'_options_labels' is fixed by the kernel";
    return super.checkIncoming(key, value);
  }
  protected override coerce(key: string, value: unknown): unknown {
    if (key === "index" && typeof value === "number") return Math.max(0, Math.min(this.options.length - 1, Math.round(value)));
    return value;
  }
}

/** A button: `onClick` runs kernel code (the front end sends a custom "click" event). */
export class Button extends DomWidget<DescriptionState & { button_style: string; icon: string; disabled: boolean }> {
  constructor(o: { description?: string; button_style?: "" | "primary" | "success" | "info" | "warning" | "danger"; icon?: string; tooltip?: string; disabled?: boolean } = {}) {
    super("Button", {
      description: o.description ?? "",
      button_style: o.button_style ?? "",
      icon: o.icon ?? "",
      tooltip: o.tooltip ?? null,
      disabled: o.disabled ?? false,
    });
  }
  onClick(callback: (button: Button) => void): () => void {
    return this.onCustom((content) => {
      if (content && typeof content === "object" && (content as Record<string, unknown>).event === "click") callback(this);
    });
  }
}

export class HTML extends ValueWidget<string> {
  constructor(o: { value?: string; description?: string; placeholder?: string } = {}) {
    super("HTML", { value: o.value ?? "", description: o.description ?? "", description_allow_html: false, placeholder: o.placeholder ?? "" });
  }
}

export class Label extends ValueWidget<string> {
  constructor(o: { value?: string; description?: string } = {}) {
    super("Label", { value: o.value ?? "", description: o.description ?? "", description_allow_html: false, placeholder: "" });
  }
}

export class FloatProgress extends BoundedNumber {
  constructor(o: { value?: number; min?: number; max?: number; description?: string; bar_style?: "" | "success" | "info" | "warning" | "danger" } = {}) {
    const { min, max } = checkRange("progress", o, { min: 0, max: 1 });
    super(
      "FloatProgress",
      {
        value: clamp(o.value ?? min, min, max),
        min,
        max,
        step: 0,
        description: o.description ?? "",
        description_allow_html: false,
        bar_style: o.bar_style ?? "",
        orientation: "horizontal",
      },
      "Progress",
    );
  }
}

export class IntProgress extends BoundedNumber {
  constructor(o: { value?: number; min?: number; max?: number; description?: string; bar_style?: "" | "success" | "info" | "warning" | "danger" } = {}) {
    const { min, max } = checkRange("intProgress", o, { min: 0, max: 100 });
    super(
      "IntProgress",
      {
        value: Math.round(clamp(o.value ?? min, min, max)),
        min,
        max,
        step: 1,
        description: o.description ?? "",
        description_allow_html: false,
        bar_style: o.bar_style ?? "",
        orientation: "horizontal",
      },
      "Progress",
    );
  }
}

export class Box extends DomWidget<DomState & { children: Widget[]; box_style: string }> {
  constructor(kind: "Box" | "VBox" | "HBox", children: Widget[]) {
    super(kind, { children: [...children], box_style: "" });
  }
  get children(): Widget[] {
    return [...this.get("children")];
  }
  set children(c: Widget[]) {
    this.set({ children: [...c] });
  }
}

/**
 * An output area as a widget. Kernel code writes into it with `capture(fn)` (everything `fn`
 * prints or displays, also after an await, goes into the widget) or `append*`; the outputs live in
 * the `outputs` state, so they sync to the page and are saved with the notebook.
 */
export class Output extends DomWidget<DomState & { outputs: Array<Record<string, unknown>>; msg_id: string }> {
  private clearPending = false;
  constructor() {
    super("Output", { outputs: [], msg_id: "" }, "Output", OUTPUT, OUTPUT_VERSION);
  }

  /** The sink that appends here (used by capture and by the kernel's callback outputs). */
  readonly sink = {
    stream: (name: "stdout" | "stderr", text: string) => {
      const outs = this.takeOutputs();
      const last = outs[outs.length - 1];
      if (last && last.output_type === "stream" && last.name === name) outs[outs.length - 1] = { ...last, text: String(last.text) + text };
      else outs.push({ output_type: "stream", name, text });
      this.set({ outputs: outs });
    },
    display: (data: Record<string, unknown>, metadata: Record<string, unknown> = {}) => {
      const outs = this.takeOutputs();
      outs.push({ output_type: "display_data", data, metadata });
      this.set({ outputs: outs });
    },
    result: (data: Record<string, unknown>, metadata: Record<string, unknown> = {}) => this.sink.display(data, metadata),
    error: (ename: string, evalue: string, traceback: string[]) => {
      const outs = this.takeOutputs();
      outs.push({ output_type: "error", ename, evalue, traceback });
      this.set({ outputs: outs });
    },
    clear: (wait: boolean) => {
      if (wait) this.clearPending = true;
      else this.set({ outputs: [] });
    },
  };

  private takeOutputs(): Array<Record<string, unknown>> {
    if (this.clearPending) {
      this.clearPending = false;
      return [];
    }
    return [...this.get("outputs")];
  }

  clear(wait = false): void {
    this.sink.clear(wait);
  }

  /** Complete a pending `clear(true)` that no new output replaced. */
  finishClear(): void {
    if (this.clearPending) {
      this.clearPending = false;
      this.set({ outputs: [] });
    }
  }
}

function clamp(v: number, lo: number, hi: number): number {
  return Math.min(hi, Math.max(lo, v));
}
