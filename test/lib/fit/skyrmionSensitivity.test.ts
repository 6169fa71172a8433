/**
 * Derivatives of the ansatz skyrmion radius R(B) and wall width w(B) with respect to A, D and Ku
 * (implicit differentiation of the energy minimum) against central differences of the full solver
 * (re-minimization at A +- h etc.): two independent routes to the same Jacobian.
 * Common practice, no source (the film is invented).
 */
import { describe, it, expect } from "vitest";
import { makeFilm } from "../../../lib/src/material/film.js";
import { solveSkyrmionAnsatz } from "../../../lib/src/walls/skyrmionAnsatz.js";
import { ansatzEnergyAt, filmWith, skyrmionSensitivity, type SeriesParameter } from "../../../lib/src/fit/skyrmionSensitivity.js";

// invented film: large enough skyrmions (R 12-33 nm) at 5-60 mT
const film = makeFilm({ Ms: 0.6e6, A: 15e-12, Ku: 0.35e6, D: 1.55e-3, dmi: "interfacial", t: 1.5e-9 });

describe("skyrmionSensitivity", () => {
  it("R and w are the solver's, and the solver's point is stationary in the energy used", () => {
    const s = skyrmionSensitivity(film, 0.02);
    const sol = solveSkyrmionAnsatz(film, 0.02);
    expect(s.status).toBe("ok");
    expect(s.R).toBe(sol.radius);
    expect(s.w).toBe(sol.wallWidth);
    // Common practice, no source: the gradient of the energy in (ln a, ln w) vanishes at the minimum
    const a = s.R / s.w;
    const e = 1e-4;
    const E0 = ansatzEnergyAt(film, 0.02, a, s.w).E;
    const g1 = (ansatzEnergyAt(film, 0.02, a * Math.exp(e), s.w).E - ansatzEnergyAt(film, 0.02, a * Math.exp(-e), s.w).E) / (2 * e);
    const g2 = (ansatzEnergyAt(film, 0.02, a, s.w * Math.exp(e)).E - ansatzEnergyAt(film, 0.02, a, s.w * Math.exp(-e)).E) / (2 * e);
    // scale: the exchange energy of a Belavin-Polyakov skyrmion 8 pi A t (Source: A. Belavin,
    // A. Polyakov, JETP Lett. 22, 245 (1975)); the total itself can be close to zero
    const scale = 8 * Math.PI * film.A * film.t;
    expect(Math.abs(g1)).toBeLessThan(2e-5 * scale);
    expect(Math.abs(g2)).toBeLessThan(2e-5 * scale);
    expect(Math.abs(E0 - sol.energy.total)).toBeLessThan(1e-5 * 8 * Math.PI * film.A * film.t);
  });

  for (const B of [0.005, 0.02, 0.06]) {
    it(`dR/dtheta and dw/dtheta at B = ${B * 1e3} mT agree with central differences of the solver`, () => {
      const names: SeriesParameter[] = ["A", "D", "Ku"];
      const s = skyrmionSensitivity(film, B, names);
      names.forEach((k, j) => {
        // small relative step: near the low-field end R(D) is strongly curved
        const h = film[k] * 1e-4;
        const p = solveSkyrmionAnsatz(filmWith(film, { [k]: film[k] + h }), B);
        const m = solveSkyrmionAnsatz(filmWith(film, { [k]: film[k] - h }), B);
        const dR = (p.radius - m.radius) / (2 * h);
        const dw = (p.wallWidth - m.wallWidth) / (2 * h);
        // Common practice, no source: tolerance from the solver's own accuracy (~1e-7 relative in R)
        expect(Math.abs(s.dR[j] - dR)).toBeLessThan(2e-3 * Math.abs(dR));
        expect(Math.abs(s.dw[j] - dw)).toBeLessThan(2e-3 * Math.abs(dw) + 1e-3 * Math.abs(s.dR[j]) * (s.w / s.R));
      });
    });
  }

  it("signs: more exchange shrinks the skyrmion, more DMI and less anisotropy grow it", () => {
    // Source: S. Rohart, A. Thiaville, PRB 88, 184422 (2013): R grows with D, shrinks with A and K_eff
    const s = skyrmionSensitivity(film, 0.02, ["A", "D", "Ku"]);
    expect(s.dR[0]).toBeLessThan(0);
    expect(s.dR[1]).toBeGreaterThan(0);
    expect(s.dR[2]).toBeLessThan(0);
  });

  it("no skyrmion: a status and NaN derivatives, never a silent number", () => {
    // (at 1 T the global search finds a verified minimum at R = 1.13 nm, R / w = 0.318; at 2 T none is left
    // inside the ansatz window)
    const s = skyrmionSensitivity(film, 2, ["A", "D"]);
    expect(s.status).toBe("below-window");
    expect(s.dR.every(Number.isNaN)).toBe(true);
    expect(() => skyrmionSensitivity(film, 0.02, ["Ms" as SeriesParameter])).toThrow(/"A", "D" or "Ku"/);
  });
});
