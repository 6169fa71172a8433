/**
 * R(B), w(B) of the 1D 360-degree wall pair in closed form against the numerical minimization of
 * its ansatz energy (walls/wall360.ts), and their closed-form derivatives against central
 * differences. Source: the exact pair of the double sine-Gordon equation, after H.-B. Braun,
 * PRB 50, 16501 (1994) (derived in walls/wall360.ts); Common practice, no source for the
 * derivative check.
 */
import { describe, it, expect } from "vitest";
import { makeFilm } from "../../../lib/src/material/film.js";
import { wall360Equilibrium } from "../../../lib/src/walls/wall360.js";
import { wall360Sensitivity } from "../../../lib/src/fit/wall360Sensitivity.js";
import { filmWith } from "../../../lib/src/fit/skyrmionSensitivity.js";

const film = makeFilm({ Ms: 0.6e6, A: 15e-12, Ku: 0.35e6, D: 1.55e-3, dmi: "interfacial", t: 1.5e-9 });

describe("wall360Sensitivity", () => {
  for (const B of [0.005, 0.05, 0.3]) {
    it(`B = ${B * 1e3} mT: R, w equal the minimized pair; derivatives equal central differences; D does not enter`, () => {
      const s = wall360Sensitivity(film, B, ["A", "D", "Ku"]);
      const e = wall360Equilibrium(film, B);
      expect(s.status).toBe("ok");
      expect(Math.abs(s.R - e.radius)).toBeLessThan(1e-6 * e.radius);
      expect(Math.abs(s.w - e.width)).toBeLessThan(1e-6 * e.width);
      (["A", "D", "Ku"] as const).forEach((k, j) => {
        const h = film[k] * 1e-5;
        const p = wall360Sensitivity(filmWith(film, { [k]: film[k] + h }), B);
        const m = wall360Sensitivity(filmWith(film, { [k]: film[k] - h }), B);
        const dR = (p.R - m.R) / (2 * h);
        const dw = (p.w - m.w) / (2 * h);
        if (k === "D") {
          expect(s.dR[j]).toBe(0);
          expect(dR).toBe(0);
        } else {
          expect(Math.abs(s.dR[j] - dR)).toBeLessThan(1e-6 * Math.abs(dR));
          expect(Math.abs(s.dw[j] - dw)).toBeLessThan(1e-6 * Math.abs(dw));
        }
      });
    });
  }
  it("no bound pair at B <= 0: a status, NaN values", () => {
    const s = wall360Sensitivity(film, 0);
    expect(s.status).toBe("expanded");
    expect(Number.isNaN(s.R)).toBe(true);
  });
});
