/**
 * The `wall-fit` calculator: computes on its defaults and on every corner of its input ranges, its
 * outputs are finite and JSON-able, and the reported standard errors describe the scatter over
 * seeds (pulls of unit spread). Common practice, no source (synthetic data).
 */
import { describe, it, expect } from "vitest";
import { runCalculator } from "../../../lib/src/calculators/spec.js";
import { getCalculator } from "../../../lib/src/calculators/catalogue.js";
import { wallFitCalculator } from "../../../lib/src/calculators/fit.js";

function corners() {
  const spec = wallFitCalculator;
  const out: Array<Record<string, number>> = [];
  const n = spec.inputs.length;
  for (let mask = 0; mask < 1 << n; mask++) {
    const v: Record<string, number> = {};
    spec.inputs.forEach((inp, i) => (v[inp.name] = mask & (1 << i) ? inp.max : inp.min));
    out.push(v);
  }
  return out;
}

describe("wall-fit calculator", () => {
  it("is in the catalogue and computes on its defaults", () => {
    expect(getCalculator("wall-fit")).toBe(wallFitCalculator);
    const r = runCalculator(wallFitCalculator, {});
    expect(r.status).toBe("ok");
    expect(r.outputs.status.value).toBe("converged");
    const R = r.outputs.Rfit.value as number;
    expect(Math.abs(R - 30e-9)).toBeLessThan(5 * (r.outputs.RStderr.value as number));
    expect((r.outputs.x.value as number[]).length).toBe(301);
    expect(JSON.stringify(r)).not.toMatch(/null/);
  });

  it("computes on every corner of its ranges", () => {
    for (const c of corners()) {
      const r = runCalculator(wallFitCalculator, c);
      expect(r.status, JSON.stringify(c) + " " + r.notes.join(";")).toBe("ok");
      for (const o of wallFitCalculator.outputs) {
        const v = o.name in r.outputs ? r.outputs[o.name]!.value : undefined;
        expect(v, o.name).toBeDefined();
        if (o.kind === "array") for (const x of v as number[]) expect(Number.isFinite(x)).toBe(true);
        else if (o.kind !== "text") expect(Number.isFinite(v as number)).toBe(true);
      }
    }
  });

  it("the reported errors describe the scatter over seeds (pulls of unit spread)", () => {
    // Common practice, no source: 60 seeds, sd of the pulls within 0.7 ... 1.3 (about +-3 sd of an sd)
    const pulls: number[] = [];
    for (let s = 1; s <= 60; s++) pulls.push(runCalculator(wallFitCalculator, { seed: s, noise: 0.05 }).outputs.Rpull.value as number);
    const mean = pulls.reduce((a, b) => a + b, 0) / pulls.length;
    const sd = Math.sqrt(pulls.reduce((a, b) => a + (b - mean) ** 2, 0) / (pulls.length - 1));
    expect(sd).toBeGreaterThan(0.7);
    expect(sd).toBeLessThan(1.3);
    expect(Math.abs(mean)).toBeLessThan(0.5);
  });
});
