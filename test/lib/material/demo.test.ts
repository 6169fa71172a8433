import { describe, expect, it } from "vitest";
import { demoFilms, demoFilmHX1, demoFilmHX2, demoFilmHX3, filmRegime } from "@helicoid/lib/internal";

describe("invented demo films", () => {
  it("are labelled invented and show the regimes they are meant to show", () => {
    // Common practice, no source: demo data must be labelled as invented.
    for (const d of demoFilms) {
      expect(d.name).toMatch(/\(invented\)$/);
      expect(Object.isFrozen(d.film)).toBe(true);
    }
    expect(filmRegime(demoFilmHX1.film).wallCharacter).toBe("Neel");
    expect(filmRegime(demoFilmHX2.film).wallCharacter).toBe("intermediate");
    expect(filmRegime(demoFilmHX3.film).groundState).toBe("spiral");
    for (const d of demoFilms) expect(filmRegime(d.film).anisotropy).toBe("perpendicular");
  });
});
