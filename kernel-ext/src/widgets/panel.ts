/**
 * `controlPanel(fn, params)`: controls for a plain TypeScript function. Each parameter becomes a
 * control (a number -> slider around it, [min, max(, step)] -> slider, boolean -> checkbox,
 * string -> text box, string[] -> dropdown, or a control you made); the function runs once, and
 * again on every change, its output (prints, displays, its return value, its errors) shown in the
 * panel's output area. Changes that arrive while an async function runs are coalesced: it reruns
 * once with the latest values.
 */
import { displayUnit } from "@helicoid/lib";
import { display } from "../display/display.js";
import { currentContext, reportError, runInContext } from "../display/output.js";
import { Box, Checkbox, Dropdown, FloatSlider, IntSlider, Label, Output, Text } from "./controls.js";
import { Widget } from "./widget.js";

/**
 * A control of a panel: a number (a slider around it), [min, max] or [min, max, step] (a slider),
 * optionally with the SI unit last ([0.9e6, 1.6e6, "J/m^3"]: shown beside the name), a boolean (a
 * checkbox), a string (a text box), a list of strings (a drop-down) or a control.
 */
export type ParamSpec =
  number | [number, number] | [number, number, number] | [number, number, string] | [number, number, number, string] | boolean | string | readonly string[] | Widget;

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
    const unit = typeof spec[spec.length - 1] === "string" ? (spec[spec.length - 1] as string) : "";
    const [min, max, step] = (unit ? spec.slice(0, -1) : spec) as number[];
    if (!(Number.isFinite(min) && Number.isFinite(max) && min! < max!) || (step !== undefined && !(Number.isFinite(step) && step > 0))) {
      throw new RangeError(`controlPanel: parameter ${name} = [${spec.join(", ")}]: expected [min, max] or [min, max, step] with min < max, optionally the SI unit last`);
    }
    const description = unit ? `${name} (${displayUnit(unit)})` : name;
    const allInt = [min, max, step ?? 1].every((x) => Number.isInteger(x));
    // large or small magnitudes read with an SI prefix (1.25M) instead of 1250000.00
    const big = Math.max(Math.abs(min!), Math.abs(max!));
    const readout_format = big >= 1e4 || big < 1e-2 ? ".4~s" : ".4~g";
    // whole-number ends make a whole-number slider when the range is one of counts ([1, 10]), not
    // of magnitudes ([0.9e6, 1.6e6] J/m^3 would otherwise step by 1 J/m^3)
    return allInt && (step !== undefined || max! - min! <= 1000)
      ? new IntSlider({ min, max, step: step ?? 1, value: Math.round((min! + max!) / 2), description })
      : new FloatSlider({ min, max, step: step ?? (max! - min!) / 100, value: (min! + max!) / 2, description, readout_format });
  }
  if (typeof spec === "number" && Number.isFinite(spec)) {
    const span = spec === 0 ? 1 : Math.abs(spec) * 2;
    if (Number.isInteger(spec)) return new IntSlider({ min: spec - span, max: spec + span, value: spec, description: name });
    const big = Math.abs(spec) * 3;
    return new FloatSlider({ min: spec - span, max: spec + span, step: span / 100, value: spec, description: name, readout_format: big >= 1e4 || big < 1e-2 ? ".4~s" : ".4~g" });
  }
  throw new TypeError(`controlPanel: parameter ${name} = ${JSON.stringify(spec)}: expected a number, [min, max], a boolean, a string, a list of strings, or a control`);
}

export function controlPanel<T extends Record<string, ParamSpec>>(fn: (values: PanelValues<T>) => unknown, params: T, options?: { title?: string }): ControlPanel<T> {
  return new ControlPanel(fn, params, options);
}
