/**
 * Markdown fit reports: value +- error in one customary unit with the error's precision, the
 * interval, status, goodness of fit, Ku decision and assumptions present. Common practice, no source.
 */
import { describe, it, expect } from "vitest";
import { formatWithError, fitReport, fitParameterTable } from "../../../lib/src/fit/fitReport.js";
import { fitProfile } from "../../../lib/src/fit/fitProfile.js";
import { syntheticProfile } from "../../../lib/src/fit/syntheticProfiles.js";

describe("fit reports", () => {
  it("formats value ± error in one unit, two significant digits of the error", () => {
    expect(formatWithError(1.5097e-11, 8.9e-14, "J/m")).toBe("15.097 ± 0.089 pJ/m");
    expect(formatWithError(1.5538e-3, 1.25e-5, "J/m^2")).toBe("1.554 ± 0.013 mJ/m²");
    expect(formatWithError(0, null, "m")).toBe("0 m");
    expect(formatWithError(2.5e-8, null, "m")).toBe("25 nm");
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

