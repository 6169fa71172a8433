/**
 * A scrubber for a time trace (a plot whose x output is a time in seconds): a slider over the
 * trace's time span, a Play button that runs through it in about four seconds, and a readout of
 * every curve's value at that time. The time is marked on the plot with the same vertical mark the
 * explorer uses for a swept input. Generic: any calculator with a time output gets it.
 */
import { formatQuantity, symbolText, type CalculatorResult, type OutputSpec, type PlotSpec, type CurrentMark } from "@helicoid/lib";
import { el } from "./dom.js";

const STEPS = 1000;
const PLAY_MS = 4000;

export class TimeScrubber {
  readonly el: HTMLElement;
  private range: HTMLInputElement;
  private readout: HTMLElement;
  private play: HTMLButtonElement;
  /** Position along the trace, 0..1, or null before the user touches it (no mark then). */
  private position: number | null = null;
  private raf = 0;

  constructor(
    private plot: PlotSpec,
    private outputs: OutputSpec[],
    private result: () => CalculatorResult | null,
    private redraw: () => void,
  ) {
    this.el = el("div", { class: "hx-scrub", "data-scrub": plot.id });
    this.play = el("button", { class: "hx-button hx-scrub-play", text: "Play", title: "Run through the trace in time" }) as HTMLButtonElement;
    this.range = el("input", {
      type: "range",
      class: "hx-scrub-range",
      min: "0",
      max: String(STEPS),
      step: "1",
      value: "0",
      "aria-label": `time along ${plot.title}`,
    }) as HTMLInputElement;
    this.readout = el("span", { class: "hx-scrub-readout" });
    this.el.append(el("span", { class: "hx-scrub-label", text: "t" }), this.range, this.play, this.readout);
    this.range.addEventListener("input", () => {
      this.stop();
      this.set(Number(this.range.value) / STEPS);
    });
    this.play.addEventListener("click", () => (this.raf ? this.stop() : this.start()));
  }

  private times(result: CalculatorResult | null): number[] | null {
    const v = result && this.plot.x in result.outputs ? result.outputs[this.plot.x]!.value : undefined;
    return Array.isArray(v) && v.length > 0 ? v : null;
  }

  /** The mark for the plot at the scrubbed time (null before the user touches the scrubber). */
  mark(result: CalculatorResult): CurrentMark | null {
    const ts = this.times(result);
    if (this.position === null || !ts) return null;
    return { value: ts[0]! + this.position * (ts[ts.length - 1]! - ts[0]!), symbol: "t" };
  }

  /** A new result: keep the position along the trace, refresh the readout. */
  update(result: CalculatorResult): void {
    this.write(result);
  }

  private set(position: number): void {
    this.position = Math.min(1, Math.max(0, position));
    this.range.value = String(Math.round(this.position * STEPS));
    this.write(this.result());
    this.redraw();
  }

  private write(result: CalculatorResult | null): void {
    const ts = this.times(result);
    if (!ts || !result || this.position === null) {
      this.readout.textContent = ts ? `drag to read the trace (0 to ${formatQuantity(ts[ts.length - 1]!, "s")})` : "";
      return;
    }
    const t = ts[0]! + this.position * (ts[ts.length - 1]! - ts[0]!);
    // the sample nearest to t (times ascend)
    let i = 0;
    while (i + 1 < ts.length && Math.abs(ts[i + 1]! - t) <= Math.abs(ts[i]! - t)) i++;
    const parts = [`t = ${formatQuantity(ts[i]!, "s")}`];
    for (const name of this.plot.y) {
      const o = this.outputs.find((x) => x.name === name);
      const v = name in result.outputs ? result.outputs[name]!.value : undefined;
      if (!o || !Array.isArray(v) || typeof v[i] !== "number") continue;
      parts.push(`${symbolText(o.symbol)} = ${formatQuantity(v[i]!, o.unit)}`);
    }
    this.readout.textContent = parts.join(", ");
    this.el.dataset.index = String(i);
  }

  private start(): void {
    const from = this.position !== null && this.position < 1 ? this.position : 0;
    const t0 = performance.now();
    this.play.textContent = "Pause";
    const step = (now: number) => {
      const p = from + ((now - t0) / PLAY_MS) * (1 - from);
      this.set(p);
      if (p >= 1) return this.stop();
      this.raf = requestAnimationFrame(step);
    };
    this.raf = requestAnimationFrame(step);
  }

  private stop(): void {
    if (this.raf) cancelAnimationFrame(this.raf);
    this.raf = 0;
    this.play.textContent = "Play";
  }
}
