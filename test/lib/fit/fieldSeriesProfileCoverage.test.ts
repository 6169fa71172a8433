/**
 * Coverage of the field-series profile-likelihood interval of A: 200 seeded synthetic field
 * series (4 fields, skyrmion m_z cuts of an invented film with known A, D, Ku; Gaussian noise of
 * known sigma; two-stage fit, Ku held at its true value); the true A must fall inside the 95 %
 * profile interval in 92 % to 98 % of the trials.
 * Tolerance: for n = 200 and p = 0.95 the binomial standard deviation is sqrt(p (1 - p) / n) =
 * 1.54 %, so 92-98 % is +-1.95 sd (a correct interval passes with probability about 95 %; the
 * seeds are fixed, so the outcome is reproducible). About 20 s on one core.
 * Source: the frequentist definition of a confidence interval; Common practice, no source for the
 * synthetic scenario (invented film).
 */
import { describe, it, expect } from "vitest";
import { makeFilm } from "../../../lib/src/material/film.js";
import { fitFieldSeries } from "../../../lib/src/fit/fieldSeries.js";
import { syntheticFieldSeries } from "../../../lib/src/fit/syntheticProfiles.js";

const truth = { A: 15e-12, D: 1.55e-3, Ku: 0.35e6 };
const film = makeFilm({ Ms: 0.6e6, ...truth, dmi: "interfacial", t: 1.5e-9 });
const fields = [0.005, 0.015, 0.03, 0.06];

describe("field-series profile-interval coverage", () => {
  it("the 95 % profile interval of A covers the truth in 92-98 % of 200 seeded trials", () => {
    const trials = 200;
    let inside = 0;
    let wald = 0;
    for (let t = 0; t < trials; t++) {
      const data = syntheticFieldSeries(film, fields, { noise: 0.05, seed: 7000 + t, points: 101, span: 240e-9, local: { x0: 2e-9, offset: 0.02, contrast: 0.95 } });
      const r = fitFieldSeries(
        data.map((p) => ({ B: p.B, data: { x: p.x, y: p.y, sigma: p.sigma } })),
        { film, fitKu: false, curvePoints: 0, profile: ["A"] },
      );
      expect(r.status).toBe("converged");
      const iv = r.parameters.A.profileInterval!;
      expect(iv[0]).toBeLessThan(r.parameters.A.value);
      expect(iv[1]).toBeGreaterThan(r.parameters.A.value);
      if (iv[0] <= truth.A && truth.A <= iv[1]) inside++;
      const w = r.parameters.A.interval!;
      if (w[0] <= truth.A && truth.A <= w[1]) wald++;
    }
    console.log(`field-series profile coverage of A: ${inside}/${trials} (Wald: ${wald}/${trials})`);
    expect(inside / trials).toBeGreaterThanOrEqual(0.92);
    expect(inside / trials).toBeLessThanOrEqual(0.98);
  }, 900_000); // 200 fits with profile likelihood, each solving skyrmions with the global scan: minutes
});
