/**
 * Bad input gives clear errors or statuses with diagnostics: too few points, start outside bounds,
 * a singular Jacobian (naming the parameters that cannot be told apart), a model returning NaN, a
 * file with missing columns. Common practice, no source (behaviour required by the project).
 */
import { describe, it, expect } from "vitest";
import { fitProfile, formulaModel } from "../../../lib/src/fit/fitProfile.js";
import { readProfileCsv } from "../../../lib/src/fit/profileCsv.js";
import { InputError } from "../../../lib/src/errors.js";

const xs = Array.from({ length: 30 }, (_, i) => i - 15);
const ys = xs.map((x) => 1 + 2 * x + 0.1 * Math.sin(x));

describe("bad input", () => {
  it("too few points for the parameters", () => {
    expect(() => fitProfile({ x: [0, 1, 2], y: [1, 2, 3] }, "wall180-mz")).toThrow(InputError);
    expect(() => fitProfile({ x: [0, 1, 2], y: [1, 2, 3] }, "wall180-mz")).toThrow(/more data points than the 4 free parameters/);
  });
  it("start value outside its bounds names the parameter", () => {
    try {
      fitProfile({ x: xs, y: ys }, "wall180-mz", { start: { Delta: -1e-9 } });
      expect.unreachable();
    } catch (e) {
      expect(e).toBeInstanceOf(InputError);
      expect((e as InputError).parameter).toBe("Delta");
      expect((e as Error).message).toMatch(/inside its bounds/);
    }
  });
  it("singular Jacobian: names the parameters that cannot be told apart", () => {
    const m = formulaModel("a * b * x + c", [
      { name: "a", value: 1 },
      { name: "b", value: 1 },
      { name: "c", value: 0 },
    ]);
    const r = fitProfile({ x: xs, y: ys }, m);
    expect(r.status).toBe("singular");
    expect(r.degenerate).toEqual([["a", "b"]]);
    expect(r.message).toMatch(/a, b cannot be told apart/);
    expect(r.parameters.a.stderr).toBeNull();
    // the product is still determined
    expect(r.parameters.a.value * r.parameters.b.value).toBeCloseTo(2, 2);
  });
  it("a parameter the data do not depend on is named", () => {
    const m = formulaModel("p + q * x + 0 * z", [{ name: "z", value: 1 }]);
    const r = fitProfile({ x: xs, y: ys }, m);
    expect(r.status).toBe("singular");
    expect(r.message).toMatch(/do not depend on z/);
  });
  it("a model that returns NaN at the start is an error naming the rows", () => {
    const m = formulaModel("sqrt(x - s)", [{ name: "s", value: 0 }]);
    expect(() => fitProfile({ x: xs, y: ys }, m)).toThrow(/returned NaN or infinity at 15 of 30 points/);
  });
  it("NaN during the iterations is rejected as a step, never returned", () => {
    // log(x - s) is finite at the start but NaN for s beyond the smallest x
    const x = Array.from({ length: 20 }, (_, i) => 1 + i);
    const y = x.map((v) => Math.log(v - 0.5) + 0.01 * Math.cos(v));
    const m = formulaModel("log(x - s) + c", [
      { name: "s", value: 0, max: 0.99 },
      { name: "c", value: 0 },
    ]);
    const r = fitProfile({ x, y }, m);
    expect(r.status).toBe("converged");
    expect(Number.isFinite(r.chiSquare)).toBe(true);
    expect(r.parameters.s.value).toBeCloseTo(0.5, 1);
  });
  it("a file with missing columns", () => {
    expect(() => readProfileCsv("x (nm),signal\n1,2\n3\n", { source: "scan.csv" })).toThrow(/scan.csv line 3.*2 columns.*the row has 1/);
    expect(() => readProfileCsv("x (nm)\n1\n2\n", { source: "one.csv" })).toThrow(/at least two columns/);
    expect(() => readProfileCsv("x (nm),signal\n1,2\n", { yColumn: "sigma" })).toThrow(/one of the columns: x \(nm\), signal/);
  });
  it("mismatched lengths", () => {
    expect(() => fitProfile({ x: [1, 2, 3, 4, 5, 6], y: [1, 2, 3] }, "wall180-mz")).toThrow(/the same length/);
  });
  it("unknown model id and unknown parameter", () => {
    expect(() => fitProfile({ x: xs, y: ys }, "no-such-model")).toThrow(/one of the profile model ids/);
    expect(() => fitProfile({ x: xs, y: ys }, "wall180-mz", { start: { width: 1 } })).toThrow(/a parameter of the model/);
  });
});
