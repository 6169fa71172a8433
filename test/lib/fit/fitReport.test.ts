/**
 * Markdown fit reports: value +- error in one customary unit with the error's precision, the
 * interval, status, goodness of fit, Ku decision and assumptions present. Common practice, no source.
 */
import { describe, it, expect } from "vitest";
import { formatWithError, fitReport, fitParameterTable } from "../../../lib/src/fit/fitReport.js";
import { fitProfile } from "../../../lib/src/fit/fitProfile.js";
import { syntheticProfile } from "../../../lib/src/fit/syntheticProfiles.js";
import { solveLeastSquares } from "../../../lib/src/fit/leastSquares.js";

describe("fit reports", () => {
  it("formats value ± error in one unit, two significant digits of the error", () => {
    expect(formatWithError(1.5097e-11, 8.9e-14, "J/m")).toBe("15.097 ± 0.089 pJ/m");
    expect(formatWithError(1.5538e-3, 1.25e-5, "J/m^2")).toBe("1.554 ± 0.013 mJ/m²");
    expect(formatWithError(0, null, "m")).toBe("0 m");
    expect(formatWithError(2.5e-8, null, "m")).toBe("25 nm");
  });

  it("follows the GUM: the uncertainty to two significant digits, the value to the same place, one unit", () => {
    // Source: JCGM 100:2008 (GUM) §7.2.2 and §7.2.6; the cases worked by hand.
    expect(formatWithError(11.0223e-9, 0.03574e-9, "m")).toBe("11.022 ± 0.036 nm");
    // the uncertainty rounds up to a new decade: two digits, not three
    expect(formatWithError(0.5, 0.0995, "")).toBe("0.50 ± 0.10");
    // an uncertainty above 100: the value rounded to the tens
    expect(formatWithError(12344, 123, "")).toBe("12340 ± 120");
    // no "-0.000"
    expect(formatWithError(-0.0001, 0.02, "")).toBe("0.000 ± 0.020");
    expect(formatWithError(2.4e5, 3.1e3, "J/m^3")).toBe("240.0 ± 3.1 kJ/m³");
    // very small numbers without a unit prefix: one shared power of ten
    expect(formatWithError(1.234e-7, 5.6e-9, "")).toBe("(1.234 ± 0.056)e-7");
  });

  it("clips a linearized interval at the parameter's physical limit and says so", () => {
    // Common practice, no source: a cosine's interval ends at 1, a length's at 0. Data: a constant
    // 0.99 with noise of 0.02 (10 points), fitted by a constant c with physical limits [-1, 1]:
    // the Wald interval 0.99 +- 1.96 * 0.02 / sqrt(10) reaches 1.0024 and is clipped at 1.
    const y = Float64Array.from([0.97, 1.01, 0.99, 0.97, 1.01, 0.99, 0.97, 1.01, 0.99, 0.99]);
    const r = solveLeastSquares({
      parameters: [{ name: "c", value: 0.5, unit: "", min: -1.5, max: 1.5, physical: [-1, 1] }],
      m: y.length,
      y,
      sigma: new Float64Array(y.length).fill(0.02),
      model: (p, out) => out.fill(p[0]!),
    });
    const c = r.parameters.c!;
    expect(c.value).toBeCloseTo(0.99, 12);
    expect(c.stderr).toBeCloseTo(0.02 / Math.sqrt(10), 12);
    expect(c.interval![1]).toBe(1);
    expect(c.interval![0]).toBeCloseTo(0.99 - (1.959963984540054 * 0.02) / Math.sqrt(10), 9);
    expect(c.clipped).toEqual(["upper"]);
    expect(r.notes.join(" ")).toMatch(/95 % interval of c crosses its physical limit \[-1, 1\]: 1\.002 clipped at 1/);
    expect(fitParameterTable(r)).toMatch(/clipped at the physical limit: upper end/);
  });

  it("a profile fit report carries the parameters, interval, goodness of fit and sources", () => {
    const d = syntheticProfile("wall360-mz", { R: 30e-9, w: 8e-9, offset: 0.05, contrast: 0.9 }, { seed: 4, noise: 0.03 });
    const r = fitProfile({ x: d.x, y: d.y, sigma: d.sigma }, "wall360-mz", { start: { R: 25e-9, w: 10e-9 } });
    const md = fitReport(r, { title: "cut", meanings: { R: "radius" } });
    expect(md).toMatch(/^### cut/);
    expect(md).toMatch(/\| R \| radius \| \d+\.\d+ ± \d\.\d+ nm \| \[\d+\.?\d*, \d+\.?\d*\] nm \|/);
    expect(md).toMatch(/reduced chi² = /);
    expect(md).toMatch(/AIC = /);
    expect(md).toMatch(/Buettner/);
    expect(fitParameterTable(r).split("\n")).toHaveLength(2 + 5);
  });

  it("adds a profile-likelihood column when parameters were profiled, open sides shown as open", () => {
    // Common practice, no source: the table shows what the fit result holds (checked against the
    // result's own numbers, which test/lib/fit/leastSquares tests check against scipy).
    const d = syntheticProfile("wall360-mz", { R: 30e-9, w: 8e-9, offset: 0.05, contrast: 0.9 }, { seed: 4, noise: 0.03 });
    const r = fitProfile({ x: d.x, y: d.y, sigma: d.sigma }, "wall360-mz", { start: { R: 25e-9, w: 10e-9 }, profile: ["R"] });
    const iv = r.parameters.R!.profileInterval!;
    expect(iv[0]).toBeLessThan(r.parameters.R!.value);
    const md = fitParameterTable(r);
    expect(md.split("\n")[0]).toMatch(/interval \(linearized\) \| 95 % interval \(profile likelihood\) \|$/);
    const row = md.split("\n").find((l) => l.startsWith("| R |"))!;
    expect(row).toContain(`[${(iv[0] * 1e9).toPrecision(4)}, ${(iv[1] * 1e9).toPrecision(4)}] nm |`);
    expect(md.split("\n").find((l) => l.startsWith("| w |"))).toMatch(/\| — \|$/);
    const open = { ...r, parameters: { ...r.parameters, R: { ...r.parameters.R!, profileInterval: [iv[0], Infinity] as [number, number] } } };
    expect(fitParameterTable(open)).toMatch(/∞ \(open\)\] nm \|/);
  });
});
