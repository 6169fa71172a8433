/**
 * Invented demo films for examples, defaults and notebooks. These are NOT real materials: names
 * and numbers are made up for a scenario of our own (a fictional thin-film lab), with magnitudes
 * typical of perpendicular ultrathin ferromagnets on a heavy-metal underlayer.
 */
import { makeFilm, type Film } from "./film.js";

export interface DemoFilm {
  /** Invented name, always ending in "(invented)". */
  name: string;
  /** What the film is meant to show. */
  description: string;
  film: Film;
}

/** Perpendicular film with moderate interfacial DMI: Neel walls, isolated skyrmions metastable. */
export const demoFilmHX1: DemoFilm = {
  name: "Film HX-1 (invented)",
  description: "Invented perpendicular film, 1 nm: chiral Neel walls, D below D_c.",
  film: makeFilm({ Ms: 1.1e6, A: 15e-12, Ku: 1.2e6, D: 1.5e-3, dmi: "interfacial", t: 1e-9, alpha: 0.3 }),
};

/** Thicker, weaker-DMI film: the DMI is below the Neel threshold, walls are intermediate. */
export const demoFilmHX2: DemoFilm = {
  name: "Film HX-2 (invented)",
  description: "Invented perpendicular film, 3 nm, weak DMI: intermediate Bloch-Neel walls.",
  film: makeFilm({ Ms: 0.8e6, A: 12e-12, Ku: 0.6e6, D: 0.1e-3, dmi: "interfacial", t: 3e-9, alpha: 0.1 }),
};

/** Strong-DMI film: D above D_c, a spin spiral is the ground state. */
export const demoFilmHX3: DemoFilm = {
  name: "Film HX-3 (invented)",
  description: "Invented perpendicular film with DMI above D_c: spin-spiral ground state.",
  film: makeFilm({ Ms: 1.0e6, A: 10e-12, Ku: 0.9e6, D: 3.5e-3, dmi: "interfacial", t: 0.8e-9, alpha: 0.2 }),
};

/** All invented demo films. */
export const demoFilms: readonly DemoFilm[] = [demoFilmHX1, demoFilmHX2, demoFilmHX3];
