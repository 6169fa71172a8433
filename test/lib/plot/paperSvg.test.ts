import { describe, it, expect } from "vitest";
import { niceTicks, textSpans, figureSvg, COLUMN_WIDTH_PX } from "../../../lib/src/plot/paperSvg";

describe("paper SVG writer", () => {
  it("ticks at 1-2-5 steps", () => {
    // Common practice, no source.
    expect(niceTicks(0, 300, 5)).toEqual([0, 50, 100, 150, 200, 250, 300]);
    expect(niceTicks(-1.5, 1.5, 6)).toEqual([-1.5, -1, -0.5, 0, 0.5, 1, 1.5]);
  });
  it("plotly text as tspans, escaped", () => {
    expect(textSpans("μ<sub>0</sub>H (mT)", 12)).toBe('μ<tspan dy="0" baseline-shift="sub" font-size="8.4">0</tspan>H (mT)');
    expect(textSpans("a &lt; b", 12)).toBe("a &lt; b");
  });
  it("one journal column by default, and gaps split a curve", () => {
    // Common practice, no source: 8.5 cm / 2.54 cm per inch x 96 px per inch = 321 px.
    expect(COLUMN_WIDTH_PX).toBe(321);
    const svg = figureSvg({ data: [{ type: "scatter", x: [0, 1, 2, 3, 4], y: [1, 2, null, 4, 5] }] });
    const d = /class="curve"[^>]* d="([^"]+)"/.exec(svg)![1]!;
    expect(d.match(/M/g)!.length).toBe(2);
    expect(d.match(/L/g)!.length).toBe(2);
  });
});
