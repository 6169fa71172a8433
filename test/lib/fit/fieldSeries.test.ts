/**
 * A and D (and Ku) from skyrmion line profiles at several fields: synthetic profiles generated from
 * known parameters of an invented film with seeded noise are fitted back. Checks: recovery within
 * the reported uncertainties; the two-stage and the global fit (two independent ways) agree; the
 * Ku decision follows the Jacobian; bad input gives clear errors.
 * Common practice, no source (synthetic data, invented film); the estimator theory is that of
 * D. Bates, D. Watts, Nonlinear Regression Analysis and Its Applications (Wiley 1988).
 */
import { describe, it, expect } from "vitest";
import { makeFilm } from "../../../lib/src/material/film.js";
import { fitFieldSeries, type FieldSeriesProfile } from "../../../lib/src/fit/fieldSeries.js";
import { syntheticFieldSeries } from "../../../lib/src/fit/syntheticProfiles.js";
import { filmWith } from "../../../lib/src/fit/skyrmionSensitivity.js";
import { InputError } from "../../../lib/src/errors.js";

const truth = { A: 15e-12, D: 1.55e-3, Ku: 0.35e6 };
const film = makeFilm({ Ms: 0.6e6, ...truth, dmi: "interfacial", t: 1.5e-9 });
const fields = [0.005, 0.01, 0.02, 0.04, 0.06];

function series(seed: number, noise = 0.04, withSigma = false): FieldSeriesProfile[] {
  return syntheticFieldSeries(film, fields, { noise, seed, points: 161, span: 260e-9, local: { x0: 3e-9, offset: 0.05, contrast: 0.9 } }).map((p) => ({
    B: p.B,
    data: { x: p.x, y: p.y, sigma: withSigma ? p.sigma : null },
  }));
}

describe("fitFieldSeries", () => {
  const start = filmWith(film, { A: 12e-12, D: 1.45e-3 });

  it("recovers A and D within their reported 3-sigma uncertainties (Ku held)", () => {
    const r = fitFieldSeries(series(11), { film: start, fitKu: false });
    expect(r.status).toBe("converged");
    expect(r.kuDecision.fitted).toBe(false);
    expect(r.parameters.Ku.value).toBe(truth.Ku);
    for (const k of ["A", "D"] as const) {
      const p = r.parameters[k];
      expect(p.stderr).toBeGreaterThan(0);
      expect(Math.abs(p.value - truth[k])).toBeLessThan(3 * p.stderr!);
      // and the error is a useful one (a few percent here)
      expect(p.stderr! / truth[k]).toBeLessThan(0.05);
    }
    expect(r.freeNames).toEqual(["A", "D"]);
    expect(r.profiles).toHaveLength(5);
    // stage-1 R decreases with field (Source: S. Rohart, A. Thiaville, PRB 88, 184422 (2013))
    for (let i = 1; i < 5; i++) expect(r.profiles[i].R).toBeLessThan(r.profiles[i - 1].R);
    expect(r.curve.B.length).toBeGreaterThan(10);
    expect(r.curve.stderrR.every((v) => v > 0)).toBe(true);
    expect(r.assumptions.join(" ")).toMatch(/T = 0/);
  });

  it("Ku 'auto': fitted when the Jacobian allows it, with the decision and its numbers in the result", () => {
    const r = fitFieldSeries(series(12, 0.02), { film: filmWith(film, { A: 13e-12, D: 1.5e-3, Ku: 0.36e6 }) });
    expect(r.kuDecision.requested).toBe("auto");
    expect(r.kuDecision.conditionNumber).toBeGreaterThan(1);
    expect(r.kuDecision.reason).toMatch(/condition number/);
    expect(r.kuDecision.fitted).toBe(true);
    for (const k of ["A", "D", "Ku"] as const) expect(Math.abs(r.parameters[k].value - truth[k])).toBeLessThan(3 * r.parameters[k].stderr!);
    // a strict rule holds Ku and says why
    const strict = fitFieldSeries(series(12, 0.02), { film: filmWith(film, { A: 13e-12, D: 1.5e-3, Ku: 0.36e6 }), maxKuRelativeError: 1e-4 });
    expect(strict.kuDecision.fitted).toBe(false);
    expect(strict.kuDecision.reason).toMatch(/do not determine it/);
    expect(strict.parameters.Ku.stderr).toBeNull();
  });

  it("two fields only: four observables, enough for A and D (Ku as the rule decides)", () => {
    const two = series(13).filter((p) => p.B === 0.005 || p.B === 0.06);
    const r = fitFieldSeries(two, { film: start });
    expect(r.dof).toBe(4 - r.freeNames.length);
    expect(r.kuDecision.reason).toMatch(/condition number/);
    const held = fitFieldSeries(two, { film: start, fitKu: false });
    expect(held.dof).toBe(2);
    expect(r.status).toBe("converged");
    expect(Math.abs(held.parameters.A.value - truth.A)).toBeLessThan(4 * held.parameters.A.stderr!);
  });

  it("the global fit (shared A, D, local profile parameters) agrees with the two-stage fit", () => {
    const data = series(14, 0.04, true);
    const two = fitFieldSeries(data, { film: start, fitKu: false });
    const glob = fitFieldSeries(data, { film: start, fitKu: false, method: "global" });
    expect(glob.approach).toBe("global");
    expect(glob.status).toBe("converged");
    for (const k of ["A", "D"] as const) {
      // Common practice, no source: equal to second order in the noise; a tenth of an error here
      expect(Math.abs(glob.parameters[k].value - two.parameters[k].value)).toBeLessThan(0.15 * two.parameters[k].stderr!);
      expect(glob.parameters[k].stderr! / two.parameters[k].stderr!).toBeGreaterThan(0.9);
      expect(glob.parameters[k].stderr! / two.parameters[k].stderr!).toBeLessThan(1.1);
    }
    expect(glob.twoStage?.parameters.A.value).toBe(two.parameters.A.value);
  });

  it("does not change its inputs", () => {
    const data = series(15);
    const copy = JSON.stringify(data);
    fitFieldSeries(data, { film: start, fitKu: false, curvePoints: 0 });
    expect(JSON.stringify(data)).toBe(copy);
  });

  it("360-degree walls: A and Ku from the 1D pair; D held with a note (it does not enter R and w)", () => {
    const data = syntheticFieldSeries(film, [0.005, 0.02, 0.06, 0.15], { texture: "wall360", noise: 0.02, seed: 21 }).map((p) => ({
      B: p.B,
      data: { x: p.x, y: p.y, sigma: p.sigma },
    }));
    const r = fitFieldSeries(data, { film: filmWith(film, { A: 12e-12, Ku: 0.37e6 }), texture: "wall360" });
    expect(r.status).toBe("converged");
    expect(r.kuDecision.fitted).toBe(true);
    expect(r.parameters.D.stderr).toBeNull();
    expect(r.notes.join(" ")).toMatch(/D does not enter/);
    for (const k of ["A", "Ku"] as const) expect(Math.abs(r.parameters[k].value - truth[k])).toBeLessThan(3 * r.parameters[k].stderr!);
    const g = fitFieldSeries(data, { film: filmWith(film, { A: 12e-12, Ku: 0.37e6 }), texture: "wall360", method: "global" });
    expect(Math.abs(g.parameters.A.value - r.parameters.A.value)).toBeLessThan(0.2 * r.parameters.A.stderr!);
  });

  describe("bad input", () => {
    it("a single field", () => {
      const one = series(16).filter((p) => p.B === 0.02);
      expect(() => fitFieldSeries(one, { film: start })).toThrow(InputError);
      expect(() => fitFieldSeries([...one, ...one], { film: start })).toThrow(/two or more different fields/);
    });
    it("start values with no skyrmion at the fields", () => {
      // (D = 1.9 mJ/m^2 is above D_c for this film: the global search finds skyrmions there, with the
      // ground state said; a weak D leaves none inside the ansatz window at these fields)
      expect(() => fitFieldSeries(series(17), { film: filmWith(film, { D: 0.3e-3 }) })).toThrow(/metastable skyrmion/);
    });
    it("too few points in a profile", () => {
      const data = series(18);
      data[2] = { B: data[2].B, data: { x: data[2].data.x.slice(0, 4), y: data[2].data.y.slice(0, 4) } };
      expect(() => fitFieldSeries(data, { film: start })).toThrow(/profiles\[2\]/);
    });
    it("a profile with no skyrmion in it", () => {
      const data = series(19);
      data[1] = { B: data[1].B, data: { x: data[1].data.x, y: data[1].data.x.map((_, i) => 0.95 + 0.01 * Math.sin(i)) } };
      // an InputError (radius ran to 0) or a ConvergenceError naming the profile (R, w undetermined)
      expect(() => fitFieldSeries(data, { film: start })).toThrow(/profiles\[1\]|profile 1 /);
    });
    it("a profile model without R and w, a missing film, a non-finite field", () => {
      expect(() => fitFieldSeries(series(20), { film: start, model: "wall180-mz" })).toThrow(/parameters R and w/);
      expect(() => fitFieldSeries(series(20), {} as never)).toThrow(/film/);
      const data = series(20);
      data[0] = { ...data[0], B: NaN };
      expect(() => fitFieldSeries(data, { film: start })).toThrow(/finite field/);
    });
  });
});
