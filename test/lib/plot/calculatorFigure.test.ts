/**
 * Figures of calculator results (lib/src/plot/calculatorFigure.ts): a periodic quantity is drawn
 * with breaks where it wraps, never with a line across the axis.
 */
import { describe, expect, it } from "vitest";
import { getCalculator, runCalculator } from "../../../lib/src/index";
import { breakAtWraps, plotFigure } from "../../../lib/src/plot/calculatorFigure";

describe("a wrapped phase", () => {
  it("berry-loop's phase against the cone angle breaks where -S 2 pi (1 - cos theta) passes an odd multiple of pi", () => {
    const spec = getCalculator("berry-loop");
    const r = runCalculator(spec, { twoS: 5, theta: 1 }, { sweep: { over: "theta", from: 0.05, to: 3.09, points: 120 } });
    const plot = spec.plots.find((p) => p.id === "phase-vs-theta")!;
    const fig = plotFigure(plot, spec.outputs, r);
    const thetas = r.outputs.thetaSweep!.value as number[];
    // Source: M. V. Berry, Proc. R. Soc. Lond. A 392, 45 (1984): gamma_S = -S Omega, Omega = 2 pi (1 - cos theta).
    // The closed form, wrapped to (-pi, pi], jumps once each time S * 2 pi (1 - cos theta) passes an odd multiple of pi.
    const S = 2.5;
    const raw = thetas.map((t) => S * 2 * Math.PI * (1 - Math.cos(t)));
    let expectedWraps = 0;
    for (let k = 1; k < raw.length; k++) expectedWraps += Math.floor((raw[k]! + Math.PI) / (2 * Math.PI)) - Math.floor((raw[k - 1]! + Math.PI) / (2 * Math.PI));
    expect(expectedWraps).toBeGreaterThanOrEqual(4);
    for (const trace of fig.data) {
      const ys = trace.y as Array<number | null>;
      const gaps = ys.filter((v) => v === null).length;
      expect(gaps, String(trace.name)).toBe(expectedWraps);
      // no drawn segment spans more than half a period (pi, in the axis' unit: rad)
      for (let k = 1; k < ys.length; k++) {
        if (ys[k] !== null && ys[k - 1] !== null) expect(Math.abs(ys[k]! - ys[k - 1]!)).toBeLessThan(Math.PI);
      }
    }
  });

  it("breakAtWraps keeps every point and adds one gap per wrap", () => {
    const [x, y] = breakAtWraps([0, 1, 2, 3], [3, -3, -2, 3], 2 * Math.PI);
    expect(x).toEqual([0, 0.5, 1, 2, 2.5, 3]);
    expect(y.map((v) => (Number.isNaN(v) ? "gap" : v))).toEqual([3, "gap", -3, -2, "gap", 3]);
  });
});
