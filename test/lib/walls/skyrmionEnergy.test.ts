import { describe, expect, it } from "vitest";
import { makeFilm, skyrmionEnergy, ansatzProfile, ansatzLocalIntegrals, dmiHelicity, InputError, type RadialProfile } from "@helicoid/lib/internal";

const film = makeFilm({ Ms: 1.1e6, A: 15e-12, Ku: 1.2e6, D: 1.5e-3, t: 1e-9 });

function belavinPolyakov(R: number): RadialProfile {
  return {
    theta: (r) => 2 * Math.atan2(R, r),
    dtheta: (r) => (-2 * R) / (R * R + r * r),
    rhoMax: 2e5 * R,
    scale: R,
  };
}

describe("skyrmion energy functional", () => {
  it("gives the Belavin-Polyakov exchange energy 8 pi A t for every R", () => {
    // Source: A. Belavin, A. Polyakov, JETP Lett. 22, 245 (1975): E_ex = 8 pi A t for theta = 2 arctan(R / rho).
    for (const R of [1e-9, 5e-9, 37e-9]) {
      const p = belavinPolyakov(R);
      // graded log panels: integrate exchange on [0, rhoMax]; the tail beyond contributes 8 pi A t * O(R^2 / rhoMax^2)
      const e = skyrmionEnergy(film, 0, { ...p, scale: R, rhoMax: 400 * R }, { nonlocal: false });
      const tail = (8 * Math.PI * film.A * film.t * (R * R)) / (R * R + (400 * R) ** 2);
      expect(Math.abs((e.exchange + tail) / (8 * Math.PI * film.A * film.t) - 1)).toBeLessThan(1e-6);
    }
  });
  it("selects the helicity by the sign of D: interfacial D > 0 -> gamma = 0, bulk D > 0 -> gamma = +pi/2", () => {
    // Common practice, no source: sign conventions derived in skyrmionEnergy.ts, checked by evaluating both helicities.
    const p = ansatzProfile(6e-9, 3e-9);
    const e0 = skyrmionEnergy(film, 0, p, { helicity: 0, nonlocal: false });
    const ePi = skyrmionEnergy(film, 0, p, { helicity: Math.PI, nonlocal: false });
    expect(e0.dmi).toBeLessThan(0);
    expect(ePi.dmi).toBeCloseTo(-e0.dmi, 30);
    expect(dmiHelicity(film)).toBe(0);
    const neg = makeFilm({ ...film, D: -film.D });
    expect(dmiHelicity(neg)).toBe(Math.PI);
    const bulk = makeFilm({ ...film, dmi: "bulk" });
    expect(dmiHelicity(bulk)).toBe(Math.PI / 2);
    const eB = skyrmionEnergy(bulk, 0, p, { helicity: Math.PI / 2 });
    const eBm = skyrmionEnergy(bulk, 0, p, { helicity: -Math.PI / 2 });
    expect(eB.dmi).toBeLessThan(0);
    expect(eBm.dmi).toBeCloseTo(-eB.dmi, 30);
    expect(eB.magnetostaticVolume).toBeLessThan(1e-12 * Math.abs(eB.magnetostaticSurface)); // Bloch: no volume charges
  });
  it("has DMI integral -pi R per wall for a large skyrmion", () => {
    // Source: S. Rohart, A. Thiaville, PRB 88, 184422 (2013): a wall of radius R >> w has DMI energy -pi D 2 pi R t.
    const R = 200e-9;
    const w = 3e-9;
    const e = skyrmionEnergy(film, 0, ansatzProfile(R, w), { nonlocal: false });
    expect(e.dmi / (-Math.PI * film.D * 2 * Math.PI * R * film.t)).toBeCloseTo(1, 3);
  });
  it("agrees with the ansatz's scaled integrals (two quadratures of the same functional)", () => {
    // Common practice, no source: the generic functional and the closed-form ansatz integrals.
    const R = 7e-9;
    const w = 2.5e-9;
    const I = ansatzLocalIntegrals(R / w);
    const e = skyrmionEnergy(film, 0.1, ansatzProfile(R, w), { nonlocal: false });
    const twoPiT = 2 * Math.PI * film.t;
    expect(e.exchange / (twoPiT * film.A * I.ex)).toBeCloseTo(1, 9);
    expect(e.zeeman / (twoPiT * film.Ms * 0.1 * w * w * I.Z)).toBeCloseTo(1, 9);
    expect(e.dmi / (twoPiT * film.D * w * I.D)).toBeCloseTo(1, 9);
  });
  it("rejects bad input", () => {
    expect(() => skyrmionEnergy(film, NaN, ansatzProfile(5e-9, 2e-9))).toThrow(InputError);
    expect(() => ansatzProfile(-1, 1e-9)).toThrow(InputError);
    expect(() => makeFilm({ ...film, A: 0 })).toThrow(InputError);
  });
});
