/**
 * Coverage of the reported 95 % intervals: 200 seeded synthetic 180-degree wall profiles with known
 * parameters and Gaussian noise; the true value must fall inside the reported interval in 92 to 98 %
 * of the trials (the binomial 95 % range for p = 0.95, n = 200 is about 92 to 98 %).
 * Source: the frequentist definition of a confidence interval; Common practice, no source for the
 * synthetic scenario (invented parameters).
 */
import { describe, it, expect } from "vitest";
import { fitProfile } from "../../../lib/src/fit/fitProfile.js";
import { seededRandom } from "../../../lib/src/numeric/prng.js";

const nm = 1e-9;
const truth = { x0: 5 * nm, Delta: 15 * nm, offset: 0.2, contrast: 0.7 };

function run(sigmaKnown: boolean) {
  const rng = seededRandom(sigmaKnown ? 777 : 2024);
  const inside: Record<string, number> = { x0: 0, Delta: 0, offset: 0, contrast: 0 };
  const trials = 200;
  const noise = 0.08;
  for (let t = 0; t < trials; t++) {
    const x: number[] = [];
    const y: number[] = [];
    for (let i = 0; i < 81; i++) {
      const xi = (-120 + 3 * i) * nm;
      x.push(xi);
      y.push(truth.offset + truth.contrast * -Math.tanh((xi - truth.x0) / truth.Delta) + noise * rng.normal());
    }
    const r = fitProfile({ x, y, sigma: sigmaKnown ? x.map(() => noise) : null }, "wall180-mz", { start: { x0: 0, Delta: 10 * nm, offset: 0, contrast: 1 } });
    expect(r.status).toBe("converged");
    for (const k of Object.keys(inside)) {
      const iv = r.parameters[k].interval!;
      if (iv[0] <= truth[k as keyof typeof truth] && truth[k as keyof typeof truth] <= iv[1]) inside[k]++;
    }
  }
  return Object.fromEntries(Object.entries(inside).map(([k, v]) => [k, v / trials]));
}

describe("95 % interval coverage over 200 seeded trials", () => {
  it("unknown sigma (errors scaled by the reduced chi-square, Student t quantile)", () => {
    const c = run(false);
    for (const v of Object.values(c)) {
      expect(v).toBeGreaterThanOrEqual(0.92);
      expect(v).toBeLessThanOrEqual(0.98);
    }
  });
  it("known sigma (unscaled errors, normal quantile)", () => {
    const c = run(true);
    for (const v of Object.values(c)) {
      expect(v).toBeGreaterThanOrEqual(0.92);
      expect(v).toBeLessThanOrEqual(0.98);
    }
  });
});
