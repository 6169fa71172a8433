import { describe, expect, it } from "vitest";
import {
  makeFilm,
  effectiveAnisotropy,
  exchangeLength,
  wallWidthParameter,
  qualityFactor,
  wallEnergy,
  criticalDmi,
  neelThresholdDmi,
  spiralPeriod,
  filmRegime,
  InputError,
  mu0,
} from "@helicoid/lib";

// An invented film (numbers only; not a real material).
const raw = { Ms: "1.1 MA/m", A: "15 pJ/m", Ku: "1.2 MJ/m^3", D: "1.5 mJ/m^2", t: "1 nm" };

function inputError(fn: () => unknown): InputError {
  try {
    fn();
  } catch (e) {
    if (e instanceof InputError) return e;
    throw e;
  }
  throw new Error("expected an InputError");
}

describe("makeFilm", () => {
  it("parses units, freezes, and leaves the raw object alone", () => {
    const copy = { ...raw };
    const f = makeFilm(raw);
    expect(raw).toEqual(copy);
    expect(Object.isFrozen(f)).toBe(true);
    // Common practice, no source: SI prefixes M = 1e6, p = 1e-12, m = 1e-3, n = 1e-9.
    expect(f.Ms).toBeCloseTo(1.1e6, 6);
    expect(f.A).toBeCloseTo(15e-12, 24);
    expect(f.Ku).toBeCloseTo(1.2e6, 6);
    expect(f.D).toBeCloseTo(1.5e-3, 15);
    expect(f.t).toBeCloseTo(1e-9, 21);
    expect(f.dmi).toBe("interfacial");
    expect(f.alpha).toBeUndefined();
  });
  it("takes alpha and gamma, refusing Hz/T for gamma", () => {
    const f = makeFilm({ ...raw, alpha: 0.3, gamma: "1.76e11 rad/(s T)" });
    expect(f.alpha).toBe(0.3);
    expect(f.gamma).toBeCloseTo(1.76e11, 0);
    expect(inputError(() => makeFilm({ ...raw, gamma: "28 GHz/T" })).parameter).toBe("gamma");
  });
  it("refuses bad values, naming parameter, value and expectation", () => {
    const cases: Array<[string, unknown]> = [
      ["Ms", 0],
      ["Ms", -1e6],
      ["A", 0],
      ["A", "-15 pJ/m"],
      ["t", 0],
      ["Ku", -1],
      ["D", Number.NaN],
      ["alpha", -0.1],
      ["gamma", 0],
      ["A", "50 mT"],
      ["dmi", "helical"],
    ];
    for (const [name, value] of cases) {
      const err = inputError(() => makeFilm({ ...raw, [name]: value } as never));
      expect(err.parameter).toBe(name);
      expect(err.value).toBe(value);
      expect(err.expected.length).toBeGreaterThan(5);
    }
    for (const name of ["Ms", "A", "Ku", "D", "t"]) {
      const partial: Record<string, unknown> = { ...raw };
      delete partial[name];
      const err = inputError(() => makeFilm(partial as never));
      expect(err.parameter).toBe(name);
      expect(err.message).toContain("(missing)");
    }
  });
});

describe("derived quantities", () => {
  const f = makeFilm(raw);
  it("match their closed forms", () => {
    // Source: PHYSICS.md "Walls and skyrmions" (Hubert and Schaefer 1998; Thiaville et al. 2012).
    const Kd = (mu0 * 1.1e6 ** 2) / 2;
    const Keff = 1.2e6 - Kd;
    expect(effectiveAnisotropy(f)).toBeCloseTo(Keff, 6);
    expect(exchangeLength(f)).toBeCloseTo(Math.sqrt((2 * 15e-12) / (mu0 * 1.1e6 ** 2)), 18);
    expect(wallWidthParameter(f)).toBeCloseTo(Math.sqrt(15e-12 / Keff), 18);
    expect(qualityFactor(f)).toBeCloseTo(1.2e6 / Kd, 12);
    expect(wallEnergy(f)).toBeCloseTo(4 * Math.sqrt(15e-12 * Keff), 12);
    expect(criticalDmi(f)).toBeCloseTo((4 * Math.sqrt(15e-12 * Keff)) / Math.PI, 12);
    // From memory (PHYSICS.md, after Tarasenko et al. 1998): D_N = 2 ln2 mu0 Ms^2 t / pi^2.
    expect(neelThresholdDmi(f)).toBeCloseTo((2 * Math.LN2 * mu0 * 1.1e6 ** 2 * 1e-9) / Math.PI ** 2, 15);
    // Source: Thiaville et al. (2012): zero-anisotropy spiral period 4 pi A / D.
    expect(spiralPeriod(f)).toBeCloseTo((4 * Math.PI * 15e-12) / 1.5e-3, 18);
  });
  it("refuses perpendicular-only quantities for an in-plane film", () => {
    const inPlane = makeFilm({ ...raw, Ku: "0.5 MJ/m^3" });
    expect(effectiveAnisotropy(inPlane)).toBeLessThan(0);
    for (const fn of [wallWidthParameter, wallEnergy, criticalDmi]) {
      const err = inputError(() => fn(inPlane));
      expect(err.parameter).toBe("Ku");
      expect(err.message).toMatch(/K_eff/);
    }
    expect(filmRegime(inPlane).anisotropy).toBe("in-plane");
  });
  it("states the regime", () => {
    const r = filmRegime(f);
    expect(r.anisotropy).toBe("perpendicular");
    expect(r.groundState).toBe("uniform");
    expect(r.wallCharacter).toBe("Neel");
    const spiral = filmRegime(makeFilm({ ...raw, D: 2 * criticalDmi(f) }));
    expect(spiral.groundState).toBe("spiral");
    expect(spiral.text).toMatch(/spiral/);
  });
});
