import { describe, expect, it } from "vitest";
import { makeFilm, wallType, neelThresholdCurve, wallTypeMap, equilibriumWall, neelThresholdDmi, mu0, InputError } from "@helicoid/lib";

// Invented film (numbers only).
const film = makeFilm({ Ms: 1.1e6, A: 15e-12, Ku: 1.2e6, D: 1.5e-3, t: 1e-9 });

describe("wall type", () => {
  it("D_N(t): thin-film limit linear in t, full kernel below it and equal for t -> 0", () => {
    const ts = [0.01e-9, 0.1e-9, 1e-9, 3e-9, 10e-9];
    const c = neelThresholdCurve(film, ts);
    ts.forEach((t, i) => {
      // From memory (lib/src/material/README.md, after Tarasenko et al. 1998): D_N = 2 ln2 mu0 Ms^2 t / pi^2.
      expect(c.thinFilm[i]).toBeCloseTo((2 * Math.LN2 * mu0 * film.Ms ** 2 * t) / Math.PI ** 2, 15);
      expect(c.fullKernel[i]!).toBeLessThan(c.thinFilm[i]!);
      if (i > 0) expect(c.fullKernel[i]!).toBeGreaterThan(c.fullKernel[i - 1]!);
    });
    // Our first-order correction (wall180.test.ts): ratio = 1 - pi t / (18 ln2 Delta).
    const Delta = Math.sqrt(film.A / (film.Ku - (mu0 * film.Ms ** 2) / 2));
    expect(c.fullKernel[0]! / c.thinFilm[0]!).toBeCloseTo(1 - (Math.PI * ts[0]!) / (18 * Math.LN2 * Delta), 6);
  });

  it("the map switches from intermediate to Neel exactly at D_N(t)", () => {
    const ts = [0.5e-9, 2e-9];
    const curve = neelThresholdCurve(film, ts);
    const Ds: number[] = [];
    for (const DN of curve.fullKernel) Ds.push(0.999 * DN, 1.001 * DN, -1.001 * DN);
    Ds.push(0);
    const map = wallTypeMap(film, Ds, ts);
    ts.forEach((_, row) => {
      expect(map.character[row]![3 * row]).toBe(1);
      expect(map.character[row]![3 * row + 1]).toBe(2);
      expect(map.character[row]![3 * row + 2]).toBe(2);
      expect(map.cosHelicity[row]![3 * row + 2]).toBe(-1);
      expect(map.character[row]![Ds.length - 1]).toBe(0);
      // consistent with the single-film minimization of sigma(helicity). Common practice, no source.
      Ds.forEach((D, col) => {
        const w = equilibriumWall(makeFilm({ ...film, D, t: ts[row]! }), "full-kernel");
        expect(map.cosHelicity[row]![col]).toBeCloseTo(w.cosHelicity, 12);
      });
    });
  });

  it("states the type in words; bulk DMI gives Bloch walls; bad grids are refused", () => {
    const r = wallType(film);
    expect(r.wall.character).toBe("Neel");
    expect(r.text).toMatch(/Neel/);
    expect(r.neelThresholdThinFilm).toBeCloseTo(neelThresholdDmi(film), 15);
    const weak = wallType(makeFilm({ ...film, D: 0.1 * r.neelThresholdFullKernel }));
    expect(weak.wall.character).toBe("intermediate");
    expect(weak.wall.cosHelicity).toBeCloseTo(0.1, 12);
    expect(wallType(makeFilm({ ...film, dmi: "bulk" })).wall.character).toBe("Bloch");
    expect(() => wallTypeMap(film, [], [1e-9])).toThrow(InputError);
    expect(() => neelThresholdCurve(film, [0])).toThrow(InputError);
  });
});
