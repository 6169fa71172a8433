/**
 * Film files (lib/src/material/filmFile.ts, filmFileSystem.ts): reading, refusing bad files with the
 * field named, writing and reading back unchanged, and a film file with uncertainties giving a
 * skyrmion radius with its uncertainty. The film is invented (names and values of our own).
 */
import { describe, expect, it } from "vitest";
import { createHash } from "node:crypto";
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { filmFileText, filmInputsFor, getCalculator, InputError, loadFilm, makeFilm, parseFilmFile, runCalculator, saveFilm } from "@helicoid/lib/internal";

const zx3 = {
  format: "helicoid-film",
  version: 1,
  name: "Film ZX-3 (invented)",
  notes: ["invented values for the tests"],
  values: {
    Ms: "1.1 MA/m",
    A: "15 ± 1 pJ/m",
    Ku: { value: "1.2 MJ/m^3", uncertainty: "0.05 MJ/m^3" },
    D: "1.5 +- 0.1 mJ/m^2",
    t: "1 nm",
    B: "40 mT",
    dmi: "interfacial",
  },
  correlations: [{ between: ["A", "Ku"], coefficient: 0.3 }],
};

function inputError(fn: () => unknown): InputError {
  try {
    fn();
  } catch (e) {
    if (e instanceof InputError) return e;
    throw e;
  }
  throw new Error("expected an InputError");
}

describe("film files", () => {
  it("read values with units and uncertainties, the correlations and the central film", () => {
    // Common practice, no source: 1 pJ/m = 1e-12 J/m, 1 MJ/m^3 = 1e6 J/m^3, 1 mJ/m^2 = 1e-3 J/m^2.
    const f = parseFilmFile(JSON.stringify(zx3), "zx3.json");
    expect(f.name).toBe("Film ZX-3 (invented)");
    expect(f.notes).toEqual(["invented values for the tests"]);
    expect(f.values.A!.value).toBeCloseTo(15e-12, 24);
    expect(f.values.A!.uncertainty).toBeCloseTo(1e-12, 24);
    expect(f.values.Ku!.uncertainty).toBeCloseTo(0.05e6, 6);
    expect(f.values.D!.uncertainty).toBeCloseTo(0.1e-3, 15);
    expect(f.values.t!.uncertainty).toBeNull();
    expect(f.values.B!.value).toBeNull(); // not a film parameter: kept as written for the calculators
    expect(f.inputs.B).toBe("40 mT");
    expect(f.correlations).toEqual([{ between: ["A", "Ku"], coefficient: 0.3 }]);
    expect(f.film).toEqual(makeFilm({ Ms: "1.1 MA/m", A: "15 pJ/m", Ku: "1.2 MJ/m^3", D: "1.5 mJ/m^2", t: "1 nm" }));
    // without all five film parameters there is no central Film, the values are still read
    expect(parseFilmFile(JSON.stringify({ format: "helicoid-film", name: "part", values: { A: "15 pJ/m" } })).film).toBeNull();
  });

  it("refuse a bad file with the field, the value and what is expected", () => {
    const bad = (patch: Record<string, unknown>, values?: Record<string, unknown>) =>
      inputError(() => parseFilmFile(JSON.stringify({ ...zx3, ...patch, ...(values ? { values: { ...zx3.values, ...values } } : {}) }), "f.json"));
    expect(inputError(() => parseFilmFile("{ not json", "f.json")).expected).toMatch(/JSON film file/);
    expect(bad({ format: "other" }).parameter).toBe("f.json: format");
    expect(bad({ version: 2 }).parameter).toBe("f.json: version");
    expect(bad({ name: "" }).parameter).toBe("f.json: name");
    expect(bad({ colour: "red" }).parameter).toBe("f.json: colour");
    const bare = bad({}, { A: "15" });
    expect(bare.parameter).toBe("f.json: values.A");
    expect(bare.expected).toMatch(/with its unit/);
    expect(bad({}, { A: "15 ± 1 T" }).parameter).toMatch(/values\.A/);
    expect(bad({}, { A: { value: "15 pJ/m", sigma: "1 pJ/m" } }).parameter).toBe("f.json: values.A.sigma");
    expect(bad({}, { dmi: "sideways" }).parameter).toBe("f.json: values.dmi");
    expect(bad({ correlations: [] }, { A: "-15 pJ/m" }).parameter).toBe("f.json: values.A"); // makeFilm's check, restated
    expect(bad({ correlations: [{ between: ["A", "t"], coefficient: 0.2 }] }).value).toBe("t"); // t carries no uncertainty
    expect(bad({ correlations: [{ between: ["A", "Ku"], coefficient: 2 }] }).parameter).toBe("f.json: correlations[0].coefficient");
  });

  it("save and load: the same film back, the file written whole, a Film from makeFilm saved with its name", () => {
    const dir = mkdtempSync(join(tmpdir(), "helicoid-film-"));
    try {
      const path = join(dir, "zx3.json");
      writeFileSync(path, JSON.stringify(zx3, null, 2));
      const sha = () => createHash("sha256").update(readFileSync(path)).digest("hex");
      const before = sha();
      const f = loadFilm(path);
      expect(sha()).toBe(before); // reading never changes the file
      expect(f.source).toBe(path);
      const copy = join(dir, "copy.json");
      saveFilm(f, copy);
      const g = loadFilm(copy);
      expect(g.inputs).toEqual(f.inputs);
      expect(g.correlations).toEqual(f.correlations);
      expect(g.name).toBe(f.name);
      expect(g.notes).toEqual(f.notes);
      const made = makeFilm({ Ms: "0.9 MA/m", A: "12 pJ/m", Ku: "0.8 MJ/m^3", D: "-1.2 mJ/m^2", t: "1.2 nm", dmi: "bulk", alpha: 0.05 });
      const madePath = join(dir, "made.json");
      saveFilm(made, madePath, { name: "Film QP-1 (invented)", notes: "saved from a notebook" });
      const back = loadFilm(madePath);
      expect(back.name).toBe("Film QP-1 (invented)");
      expect(back.film).toEqual(made); // full precision: the same numbers
      // a film that does not read back is refused before any file is written
      expect(() => saveFilm({ name: "x", values: { A: "15" } }, join(dir, "never.json"))).toThrow(InputError);
      expect(() => readFileSync(join(dir, "never.json"))).toThrow();
      expect(inputError(() => loadFilm(join(dir, "missing.json"))).detail).toMatch(/no such file/);
      expect(filmFileText(f)).toBe(readFileSync(copy, "utf8"));
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });

  it("a film file with uncertainties gives a skyrmion radius with its uncertainty", () => {
    const skyrmion = getCalculator("skyrmion");
    const f = parseFilmFile(JSON.stringify(zx3), "zx3.json");
    const { inputs, uncertainty, notes } = filmInputsFor(skyrmion, f, { B: "50 mT" });
    expect(inputs.B).toBe("50 mT");
    expect(notes[0]).toMatch(/given explicitly instead of the file's: B/);
    expect(uncertainty.correlations).toEqual([{ between: ["A", "Ku"], coefficient: 0.3 }]);
    const r = runCalculator(skyrmion, inputs, { noSweep: true, uncertainty });
    const R = r.outputs.radius!;
    expect(R.value as number).toBeGreaterThan(0);
    expect(R.uncertainty).toBeGreaterThan(0);
    expect(r.uncertainty!.inputs).toEqual({ A: 1e-12, Ku: 50000, D: 1e-4 });
    // the same numbers as the inputs typed by hand
    const byHand = runCalculator(
      skyrmion,
      { Ms: "1.1 MA/m", A: "15 ± 1 pJ/m", Ku: "1.2 ± 0.05 MJ/m^3", D: "1.5 ± 0.1 mJ/m^2", t: "1 nm", B: "50 mT" },
      { noSweep: true, uncertainty },
    );
    expect(byHand.outputs.radius!.uncertainty).toBe(R.uncertainty);
    // the wall calculator takes no B: said in a note
    expect(filmInputsFor(getCalculator("wall"), f).notes.join(" ")).toMatch(/does not take: B/);
  }, 120_000);
});

describe("runCalculator with a film file as its inputs", () => {
  it("runs the same computation as filmInputsFor + runCalculator, uncertainties and correlations included, with the file's notes first", () => {
    const zx3 = loadFilm(join(__dirname, "../../../notebooks/data/zx3-film.json"));
    const direct = runCalculator("wall", zx3);
    const spec = getCalculator("wall");
    const viaInputs = filmInputsFor(spec, zx3);
    const explicit = runCalculator(spec, viaInputs.inputs, { uncertainty: viaInputs.uncertainty });
    expect(direct.outputs.width.value).toBe(explicit.outputs.width.value);
    expect(direct.outputs.width.uncertainty).toBe(explicit.outputs.width.uncertainty);
    expect(direct.uncertainty?.correlations.length).toBeGreaterThan(0);
    expect(direct.notes[0]).toMatch(/inputs from the film file "Film ZX-3/);
    // first order for Delta = sqrt(A / K_eff) by hand (JCGM 100:2008 eq. 13, with r(A, Ku)), as in the tests above
    const A = 15e-12,
      uA = 1e-12,
      Ku = 1.2e6,
      uKu = 0.04e6,
      Ms = direct.inputs.Ms.value,
      r = zx3.correlations[0]!.coefficient;
    const Keff = Ku - (4e-7 * Math.PI * Ms * Ms) / 2;
    const d = Math.sqrt(A / Keff);
    const dA = d / (2 * A),
      dK = -d / (2 * Keff);
    const u = Math.sqrt((dA * uA) ** 2 + (dK * uKu) ** 2 + 2 * r * dA * dK * uA * uKu);
    expect(Math.abs(direct.outputs.width.uncertainty! / u - 1)).toBeLessThan(0.02);
    // Monte Carlo on request keeps the file's correlations
    const mc = runCalculator("wall", zx3, { uncertainty: { method: "monte-carlo", samples: 2000, seed: 3 } });
    expect(mc.uncertainty?.method).toBe("monte-carlo");
    expect(Math.abs(mc.outputs.width.uncertainty! / u - 1)).toBeLessThan(0.1);
  });
});
