/**
 * `helicoid calc ID --film FILE` as a real process: inputs from an invented film file with
 * uncertainties, explicit name=value overriding the file, value ± uncertainty in the table (the
 * uncertainty to two significant digits, the value to the same decimal place: common practice, as
 * in JCGM 100:2008, 7.2.6), `uncertainty` in --json equal to the library's, Monte Carlo on request,
 * and bad files refused with exit 2 and the field named.
 */
import { describe, expect, it } from "vitest";
import { spawnSync } from "node:child_process";
import { createHash } from "node:crypto";
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { filmInputsFor, getCalculator, loadFilm, runCalculator } from "@helicoid/lib";
import { helicoidBin } from "../../helpers/paths.js";

const film = {
  format: "helicoid-film",
  version: 1,
  name: "Film ZX-3 (invented)",
  notes: ["invented values for the tests"],
  values: { Ms: "1.1 MA/m", A: "15 ± 1 pJ/m", Ku: { value: "1.2 MJ/m^3", uncertainty: "0.05 MJ/m^3" }, D: "1.5 +- 0.1 mJ/m^2", t: "1 nm", dmi: "interfacial" },
  correlations: [{ between: ["A", "Ku"], coefficient: 0.3 }],
};

const helicoid = (...args: string[]) => spawnSync(process.execPath, [helicoidBin, ...args], { encoding: "utf8", timeout: 120_000 });

describe("helicoid calc --film", () => {
  const dir = mkdtempSync(join(tmpdir(), "helicoid-calc-film-"));
  const path = join(dir, "zx3.json");
  writeFileSync(path, JSON.stringify(film, null, 2));

  it("prints value ± uncertainty and gives the library's numbers in --json; name=value overrides the file", () => {
    try {
      const sha = createHash("sha256").update(readFileSync(path)).digest("hex");
      const text = helicoid("calc", "wall", "--film", path);
      expect(text.stderr).toBe("");
      expect(text.status).toBe(0);
      // Delta = 5.8405 nm, u = 0.3x nm: "5.84 ± 0.3x nm"
      expect(text.stdout).toMatch(/Δ +5\.84 ± 0\.\d\d nm +wall width parameter/);
      expect(text.stdout).toMatch(/ {2}A +15\.0 ± 1\.0 pJ\/m +exchange stiffness/);
      expect(text.stdout).toMatch(/note: inputs from the film file "Film ZX-3 \(invented\)"/);
      expect(text.stdout).toMatch(/note: Uncertainties to first order \(JCGM 100:2008/);
      const json = helicoid("calc", "wall", "--film", path, "--json");
      expect(json.status).toBe(0);
      const j = JSON.parse(json.stdout);
      const lib = filmInputsFor(getCalculator("wall"), loadFilm(path));
      const r = runCalculator(getCalculator("wall"), lib.inputs, { uncertainty: lib.uncertainty });
      expect(j.outputs.width.uncertainty).toBe(r.outputs.width!.uncertainty);
      expect(j.uncertainty.method).toBe("first-order");
      expect(j.uncertainty.correlations).toEqual([{ between: ["A", "Ku"], coefficient: 0.3 }]);
      // the file's A replaced by an explicit value: no uncertainty on A, its correlation dropped
      const o = JSON.parse(helicoid("calc", "wall", "--film", path, "A=16pJ/m", "--json").stdout);
      expect(o.inputs.A.value).toBeCloseTo(16e-12, 24);
      expect(o.inputs.A.uncertainty).toBeUndefined();
      expect(o.uncertainty.correlations).toEqual([]);
      expect(o.notes.join(" ")).toMatch(/given explicitly instead of the file's: A/);
      // Monte Carlo on request, with its seed (repeatability: test/lib/calculators/uncertainty.test.ts)
      const mc1 = JSON.parse(helicoid("calc", "wall", "--film", path, "--monte-carlo", "200", "--seed", "4", "--json").stdout);
      expect(mc1.uncertainty.method).toBe("monte-carlo");
      expect(mc1.uncertainty.monteCarlo.samples).toBe(200);
      expect(mc1.uncertainty.monteCarlo.seed).toBe(4);
      expect(Math.abs(mc1.outputs.width.uncertainty / j.outputs.width.uncertainty - 1)).toBeLessThan(0.2);
      // an uncertainty typed on the command line
      const typed = JSON.parse(helicoid("calc", "wall", "Ms=1.1MA/m", "A=15+-1pJ/m", "Ku=1.2MJ/m^3", "D=1.5mJ/m^2", "t=1nm", "--json").stdout);
      expect(typed.inputs.A.uncertainty).toBeCloseTo(1e-12, 24);
      expect(createHash("sha256").update(readFileSync(path)).digest("hex")).toBe(sha); // the file is never changed
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  }, 240_000);

  it("refuses a bad film file or option with exit 2, naming the field", () => {
    const d = mkdtempSync(join(tmpdir(), "helicoid-calc-film-bad-"));
    try {
      const bad = join(d, "bad.json");
      writeFileSync(bad, JSON.stringify({ ...film, values: { ...film.values, A: "15" } }));
      const r = helicoid("calc", "wall", "--film", bad);
      expect(r.status).toBe(2);
      expect(r.stderr).toMatch(/values\.A/);
      expect(r.stderr).toMatch(/with its unit/);
      const missing = helicoid("calc", "wall", "--film", join(d, "none.json"));
      expect(missing.status).toBe(2);
      expect(missing.stderr).toMatch(/no such file/);
      const n = helicoid("calc", "wall", "A=15+-1pJ/m", "--monte-carlo", "5");
      expect(n.status).toBe(2);
      expect(n.stderr).toMatch(/--monte-carlo/);
      const s = helicoid("calc", "wall", "--seed", "3");
      expect(s.status).toBe(2);
      expect(s.stderr).toMatch(/--seed/);
    } finally {
      rmSync(d, { recursive: true, force: true });
    }
  }, 120_000);
});
