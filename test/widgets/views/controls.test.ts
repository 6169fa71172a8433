/**
 * Explorer controls: slider scales, entry validation with units, "copy as code" and plot traces
 * (widgets/src/views/{sliderScale,quantityEntry,codeSnippet,explorerPlots}.ts).
 */
import { describe, it, expect } from "vitest";
import { toPosition, fromPosition, STEPS } from "../../../widgets/src/views/sliderScale";
import { validateEntry, entryText } from "../../../widgets/src/views/quantityEntry";
import { getCalculator } from "@helicoid/lib";
import { codeSnippet, quantityLiteral } from "../../../widgets/src/views/codeSnippet";
import { plotFigure } from "../../../widgets/src/views/explorerPlots";
import { runCalculator, defaultSweep } from "../../../lib/src/index";
import { testWallSpec } from "../fixtures/testSpecs";

const A = testWallSpec.inputs[1]!; // log scale 1e-12 .. 5e-11 J/m
const Ms = testWallSpec.inputs[0]!; // linear 1e5 .. 2e6 A/m

describe("slider scales", () => {
  it("log sliders put the geometric mean in the middle; linear ones the arithmetic mean", () => {
    // Common practice, no source: a log slider is linear in log(value).
    expect(fromPosition(STEPS / 2, A)).toBeCloseTo(Number(Math.sqrt(1e-12 * 5e-11).toPrecision(4)), 20);
    expect(fromPosition(STEPS / 2, Ms)).toBe(1.05e6);
    expect(fromPosition(0, A)).toBe(A.min);
    expect(fromPosition(STEPS, A)).toBe(A.max);
    expect(toPosition(A.max * 10, A)).toBe(STEPS);
    for (const v of [2e-12, 1e-11, 3.3e-11]) expect(fromPosition(toPosition(v, A), A)).toBeCloseTo(v, 15);
  });
});

describe("entries", () => {
  it("take SI numbers and values with units", () => {
    expect(validateEntry(A, "15 pJ/m")).toEqual({ ok: true, value: expect.closeTo(1.5e-11, 20) });
    expect(validateEntry(A, "2e-11")).toEqual({ ok: true, value: 2e-11 });
    expect(validateEntry(Ms, "1.2 MA/m")).toEqual({ ok: true, value: expect.closeTo(1.2e6, 6) });
  });

  it("refuse a wrong dimension, a non-number and a value out of range, saying why", () => {
    const wrong = validateEntry(A, "12 mT");
    expect(wrong.ok).toBe(false);
    if (!wrong.ok) expect(wrong.reason).toMatch(/A = "12 mT" is not valid.*J\/m.*dimension of T/);
    const junk = validateEntry(A, "twelve");
    expect(junk.ok).toBe(false);
    const far = validateEntry(Ms, "5 MA/m");
    expect(far.ok).toBe(false);
    if (!far.ok) expect(far.reason).toContain("outside this control's range");
    expect(validateEntry(Ms, "  ").ok).toBe(false);
  });

  it("show values in the trade's units", () => {
    expect(entryText(A, 1.5e-11)).toBe("15 pJ/m");
    expect(entryText(Ms, 1.1e6)).toBe("1.1 MA/m");
  });
});

describe("copy as code", () => {
  it("reproduces the explorer's inputs exactly enough to recompute the same result", () => {
    const values = { Ms: 987654.321, A: 1.23456789e-11, Ku: 1.5e6 };
    const sweep = defaultSweep(testWallSpec, values)!;
    const code = codeSnippet({ calculator: "test-wall-width", inputs: testWallSpec.inputs, values, sweep });
    expect(code).toContain('runCalculator(getCalculator("test-wall-width")');
    expect(code).toContain('Ms: "987.654321 kA/m",');
    expect(code).toContain("points: 50");
    const raw = Object.fromEntries(testWallSpec.inputs.map((i) => [i.name, JSON.parse(quantityLiteral(values[i.name as keyof typeof values], i.unit))]));
    const a = runCalculator(testWallSpec, raw).outputs.Delta!.value as number;
    const b = runCalculator(testWallSpec, values).outputs.Delta!.value as number;
    expect(Math.abs(a - b) / b).toBeLessThan(1e-11);
  });
});

describe("copy as code: choices", () => {
  it("writes a choice by its label, which runCalculator reads back to the same value", () => {
    const texture = getCalculator("texture");
    const values = Object.fromEntries(texture.inputs.map((i) => [i.name, i.default]));
    values.kind = 3;
    const code = codeSnippet({ calculator: "texture", inputs: texture.inputs, values, sweep: null });
    expect(code).toContain('kind: "skyrmion lattice",');
    expect(code).not.toMatch(/kind: 3/);
    expect(runCalculator(texture, { kind: "skyrmion lattice", n: 32 }).inputs.kind!.value).toBe(3);
  });
});

describe("copy as code: no sweep", () => {
  it("writes noSweep, so the cell computes no swept arrays, as the explorer shows", () => {
    const sk = getCalculator("skyrmion");
    const values = Object.fromEntries(sk.inputs.map((i) => [i.name, i.default]));
    const code = codeSnippet({ calculator: "skyrmion", inputs: sk.inputs, values, sweep: null, noSweep: true });
    expect(code).toMatch(/\}, \{ noSweep: true \}\);/);
    const withDefault = codeSnippet({ calculator: "skyrmion", inputs: sk.inputs, values, sweep: null });
    expect(withDefault).not.toContain("noSweep");
  });
});

describe("copy as code: inputs with uncertainties", () => {
  it("writes each uncertain input as {value, uncertainty} and the correlations: the cell gives the explorer's ±", () => {
    const wall = getCalculator("wall");
    const values = { ...Object.fromEntries(wall.inputs.map((i) => [i.name, i.default])), Ms: 1.1e6, A: 15e-12, Ku: 1.2e6, D: 2.9e-3, t: 1e-9 };
    const uncertainties = { A: 1e-12, Ku: 4e4 };
    const correlations = [{ between: ["A", "Ku"] as [string, string], coefficient: 0.3 }];
    const code = codeSnippet({ calculator: "wall", inputs: wall.inputs, values, sweep: null, uncertainties, correlations });
    expect(code).toContain('A: { value: "15 pJ/m", uncertainty: "1 pJ/m" },');
    expect(code).toContain('uncertainty: { correlations: [{"between":["A","Ku"],"coefficient":0.3}] }');
    const call = code.slice(code.indexOf("runCalculator("), code.lastIndexOf(");") + 1);
    const fromCode = new Function("runCalculator", "getCalculator", `return ${call}`)(runCalculator, getCalculator) as ReturnType<typeof runCalculator>;
    const explorer = runCalculator(wall, { ...values, A: { value: 15e-12, uncertainty: 1e-12 }, Ku: { value: 1.2e6, uncertainty: 4e4 } }, { uncertainty: { correlations } });
    const u = (r: typeof explorer) => (r.outputs.width as { uncertainty?: number }).uncertainty!;
    expect(u(fromCode) / u(explorer)).toBeCloseTo(1, 9);
  });
});

describe("plot traces", () => {
  it("are scaled to customary units and carry the factors back to SI", () => {
    const r = runCalculator(testWallSpec, {});
    const fig = plotFigure(testWallSpec.plots[0]!, testWallSpec.outputs, r);
    expect(fig.problem).toBeNull();
    const t = fig.data[0]! as { x: number[]; y: Array<number | null>; meta: { xFactor: number; yFactor: number; yUnit: string } };
    expect(t.meta.yUnit).toBe("nm");
    const ys = r.outputs.DeltaSweep!.value as number[];
    t.y.forEach((v, i) => (v === null ? expect(Number.isNaN(ys[i]!)).toBe(true) : expect(Math.abs(v * t.meta.yFactor - ys[i]!) / ys[i]!).toBeLessThan(1e-15)));
    const missing = plotFigure({ id: "p", title: "P", x: "nothing", y: ["DeltaSweep"] }, testWallSpec.outputs, r);
    expect(missing.problem).toContain("nothing");
  });
});
