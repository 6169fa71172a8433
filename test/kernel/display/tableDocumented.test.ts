/**
 * `table()` takes any documented result: a calculator result (inputs and outputs with symbols and
 * meanings from the spec), a fit (its parameters with standard errors), a record of {value, unit}.
 * Common practice, no source.
 */
import { describe, expect, it } from "vitest";
import { runCalculator, solveLeastSquares } from "@helicoid/lib/internal";
import { table } from "@helicoid/kernel";

describe("table()", () => {
  it("shows a calculator result with its spec's symbols, its story below", () => {
    const r = runCalculator("wall", {});
    const t = table(r);
    expect(t.rows.find((row) => row.name === "width")).toMatchObject({ section: "Results", symbol: "\\Delta" });
    expect(t.rows.find((row) => row.name === "Ms")).toMatchObject({ section: "Inputs" });
    expect(t.notes).toContain(`Method: ${r.method}`);
  });

  it("shows a fit: parameters with standard errors, fixed ones marked, status, assumptions, method and sources", () => {
    // y = a x + b, b held at 0.5: a from noisy-free-ish data
    const x = [0, 1, 2, 3, 4, 5];
    const y = Float64Array.from(x, (v) => 2 * v + 0.5 + 0.01 * Math.cos(5 * v));
    const fit = solveLeastSquares({
      parameters: [
        { name: "a", value: 1, unit: "m" },
        { name: "b", value: 0.5, unit: "m", fixed: true },
      ],
      m: x.length,
      model: (p, out) => x.forEach((v, i) => (out[i] = p[0]! * v + p[1]!)),
      y,
      sigma: null,
    });
    const t = table(fit);
    const a = t.rows.find((row) => row.name === "a")!;
    expect(a.section).toBe("Results");
    expect(a.value).toMatch(/±/);
    expect(t.rows.find((row) => row.name === "b")!.meaning).toBe("fixed");
    expect(t.notes.some((n) => n.startsWith("Assumption: independent"))).toBe(true);
    expect(t.notes).toContain(`Method: ${fit.method}`);
    expect(t.markdown()).toContain("`a`");
  });

  it("shows a record of {value, unit}", () => {
    const t = table({ "a length": { value: 2e-9, unit: "m" } });
    expect(t.rows).toEqual([{ section: "", name: "a length", symbol: "", meaning: "", value: "2 nm" }]);
  });
});
