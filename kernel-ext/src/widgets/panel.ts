/**
 * `controlPanel(fn, params)`: controls for a plain TypeScript function. Each parameter becomes a
 * control (a number -> slider around it, [min, max(, step)] -> slider, boolean -> checkbox,
 * string -> text box, string[] -> dropdown, or a control you made); the function runs once, and
 * again on every change, its output (prints, displays, its return value, its errors) shown in the
 * panel's output area. Changes that arrive while an async function runs are coalesced: it reruns
 * once with the latest values.
 */
import { display } from "../display/display.js";
import { currentContext, reportError, runInContext } from "../display/output.js";
import { Box, Checkbox, Dropdown, FloatSlider, IntSlider, Label, Output, Text } from "./controls.js";
import { Widget } from "./widget.js";

export type ParamSpec = number | [number, number] | [number, number, number] | boolean | string | readonly string[] | Widget;

type ValueOf<P> = P extends boolean ? boolean : P extends string ? string : P extends readonly string[] ? string : P extends Widget ? unknown : number;
export type PanelValues<T extends Record<string, ParamSpec>> = { [K in keyof T]: ValueOf<T[K]> };

export class ControlPanel<T extends Record<string, ParamSpec>> extends Box {
  readonly controls: Record<keyof T, Widget>;
  readonly output: Output;
  private running: Promise<void> | null = null;
  private again = false;

  constructor(
    private readonly fn: (values: PanelValues<T>) => unknown,
    params: T,
    options: { title?: string } = {},
  ) {
    const controls = {} as Record<keyof T, Widget>;
    for (const [name, spec] of Object.entries(params)) controls[name as keyof T] = makeControl(name, spec);
    const output = new Output();
    const children: Widget[] = [...(options.title ? [new Label({ value: options.title })] : []), ...Object.values<Widget>(controls), output];
    super("VBox", children);
    this.controls = controls;
    this.output = output;
    for (const c of Object.values<Widget>(controls)) c.onChange(c instanceof Dropdown ? "index" : "value", () => void this.rerun());
    void this.rerun();
  }

  /** The current value of every control. */
  values(): PanelValues<T> {
    const out: Record<string, unknown> = {};
    for (const [name, c] of Object.entries<Widget>(this.controls)) out[name] = c instanceof Dropdown ? c.value : c.get("value");
    return out as PanelValues<T>;
  }

  /** Run the function again with the current values (resolves when it has finished). */
  rerun(): Promise<void> {
    if (this.running) {
      this.again = true;
      return this.running;
    }
    const ctx = currentContext();
    const runOnce = async (): Promise<void> => {
      do {
        this.again = false;
        this.output.clear(true);
        await runInContext({ ...(ctx ?? {}), sink: this.output.sink }, async () => {
          try {
            const r = await this.fn(this.values());
            if (r !== undefined) display(r);
          } catch (err) {
            reportError(err, this.output.sink);
          }
        });
        this.output.finishClear();
      } while (this.again);
    };
    this.running = runOnce().finally(() => {
      this.running = null;
    });
    return this.running;
  }
}

function makeControl(name: string, spec: ParamSpec): Widget {
  if (spec instanceof Widget) return spec;
  if (typeof spec === "boolean") return new Checkbox({ value: spec, description: name });
  if (typeof spec === "string") return new Text({ value: spec, description: name, continuous_update: false });
  if (Array.isArray(spec) && spec.every((x: unknown) => typeof x === "string")) return new Dropdown({ options: spec as unknown as string[], description: name });
  if (Array.isArray(spec)) {
    const [min, max, step] = spec as number[];
    if (!(Number.isFinite(min) && Number.isFinite(max) && min! < max!)) {
      throw new RangeError(`controlPanel: parameter ${name} = [${spec.join(", ")}]: expected [min, max] or [min, max, step] with min < max`);
    }
    const allInt = [min, max, step ?? 1].every((x) => Number.isInteger(x));
    return allInt
      ? new IntSlider({ min, max, step: step ?? 1, value: Math.round((min! + max!) / 2), description: name })
      : new FloatSlider({ min, max, step: step ?? (max! - min!) / 100, value: (min! + max!) / 2, description: name });
  }
  if (typeof spec === "number" && Number.isFinite(spec)) {
    const span = spec === 0 ? 1 : Math.abs(spec) * 2;
    if (Number.isInteger(spec)) return new IntSlider({ min: spec - span, max: spec + span, value: spec, description: name });
    return new FloatSlider({ min: spec - span, max: spec + span, step: span / 100, value: spec, description: name });
  }
  throw new TypeError(`controlPanel: parameter ${name} = ${JSON.stringify(spec)}: expected a number, [min, max], a boolean, a string, a list of strings, or a control`);
}

export function controlPanel<T extends Record<string, ParamSpec>>(fn: (values: PanelValues<T>) => unknown, params: T, options?: { title?: string }): ControlPanel<T> {
  return new ControlPanel(fn, params, options);
}
