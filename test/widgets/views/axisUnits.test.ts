/**
 * One unit per axis (lib/src/plot/calculatorFigure.ts via widgets/src/views/explorerPlots.ts): all
 * curves on an axis share the unit picked by the largest of them; titles are symbols and the unit.
 */
import { describe, it, expect } from "vitest";
import { axisUnit, axisTitle, plotFigure, currentMarkFor } from "../../../widgets/src/views/explorerPlots";
import { catalogue, getCalculator, runCalculator } from "../../../lib/src/index";

describe("axis units", () => {
  it("one customary unit for every curve on the axis, chosen by the largest value", () => {
    // Common practice, no source: R = 0.76 nm and w = 2.4 nm both in nm (not 760 pm beside 2.4 nm).
    expect(axisUnit([[0.76e-9], [2.4e-9]], "m")).toEqual(["nm", 1e-9]);
    expect(axisUnit([[0.3e-3, 0.1], [0.05]], "T")).toEqual(["mT", 1e-3]);
    expect(
      axisUnit(
        [
          [0.3, 2.2],
          [null, NaN],
        ],
        "T",
      ),
    ).toEqual(["T", 1]);
    expect(axisUnit([[NaN]], "m")[1]).toBe(1);
  });
  it("titles are symbols with one unit", () => {
    expect(axisTitle(["R", "w"], "nm")).toBe("R, w (nm)");
    expect(axisTitle(["μ<sub>0</sub>H"], "mT")).toBe("μ<sub>0</sub>H (mT)");
    expect(axisTitle(["m<sub>z</sub>"], "")).toBe("m<sub>z</sub>");
  });
  it("the skyrmion's R and w share nm; legends are symbols, never output ids; the swept axis spans the sweep", () => {
    const spec = getCalculator("skyrmion");
    const plot = spec.plots.find((p) => p.y.length > 1 && spec.outputs.find((o) => o.name === p.y[0])?.unit === "m")!;
    const r = runCalculator(spec, { B: "50 mT" }, { sweep: { over: "B", from: 0.01, to: 0.3, points: 30 } });
    const values = Object.fromEntries(Object.entries(r.inputs).map(([k, e]) => [k, e.value]));
    const fig = plotFigure(plot, spec.outputs, r, currentMarkFor(plot, spec, r, values));
    const units = new Set(fig.data.map((t) => (t.meta as { yUnit: string }).yUnit));
    expect(units.size).toBe(1);
    for (const t of fig.data) expect(plot.y).not.toContain(t.name);
    const layout = fig.layout as { xaxis: { title: { text: string } }; yaxis: { title: { text: string } }; shapes: Array<{ x0: number }> };
    expect(layout.yaxis.title.text).toMatch(/\((nm|µm)\)$/);
    expect(layout.xaxis.title.text).toMatch(/\(mT\)$/);
    expect(fig.sweptRange).toEqual([10, 300]);
    expect(layout.shapes[0]!.x0).toBeCloseTo(50, 9);
  });
  it("no plot of the catalogue (on its defaults) shows an output id or markup in its titles", () => {
    // Common practice, no source.
    for (const spec of catalogue) {
      const cheap = ["spin-tunnel", "skyrmion", "wall", "wall360", "easy-plane", "berry-loop", "chern"];
      if (!cheap.includes(spec.id)) continue;
      const r = runCalculator(spec, {});
      for (const plot of spec.plots) {
        const fig = plotFigure(plot, spec.outputs, r);
        if (fig.data.length === 0) continue;
        const l = fig.layout as { xaxis: { title: { text: string } }; yaxis: { title: { text: string } } };
        for (const text of [l.xaxis.title.text, l.yaxis.title.text, ...fig.data.map((t) => String(t.name))]) {
          expect(text, `${spec.id}/${plot.id}`).not.toMatch(/[\\{}]/);
          for (const id of [plot.x, ...plot.y]) if (id.length > 3) expect(text, `${spec.id}/${plot.id}`).not.toContain(id);
        }
      }
    }
  });
  it("says so when no state exists anywhere on a curve", () => {
    const spec = getCalculator("easy-plane");
    const r = runCalculator(spec, {});
    const broken = {
      ...r,
      outputs: {
        ...r.outputs,
        szSweep: { ...r.outputs.szSweep!, value: (r.outputs.szSweep!.value as number[]).map(() => NaN) },
        szRotorSweep: { ...r.outputs.szRotorSweep!, value: [NaN] },
        groundMSweep: { ...r.outputs.groundMSweep!, value: [NaN] },
      },
    };
    const fig = plotFigure(spec.plots[0]!, spec.outputs, broken);
    expect(fig.data).toHaveLength(0);
    expect(fig.problem).toMatch(/no state exists/);
  });
});

describe("axis units without a customary table", () => {
  it("take an SI prefix on the unit (W/K in pW/K), never plotly's tick letters", () => {
    // Common practice, no source: SI prefixes in steps of 10^3.
    expect(axisUnit([[5.98e-13, 1.6e-11]], "W/K")).toEqual(["pW/K", 1e-12]);
    expect(axisUnit([[0.5, 3]], "W/K")).toEqual(["W/K", 1]);
  });
});
