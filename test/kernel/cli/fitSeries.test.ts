/**
 * `helicoid fit --series`: the built command on the invented QF-7 demo profiles (five skyrmion
 * cuts at 5-60 mT, synthetic, seeded). Checks: the JSON contract; A, D (Ku) equal to calling
 * fitFieldSeries in process on the same files; the invented true values from the file headers
 * within 3 standard errors; the table; bad input exits 2 naming the problem.
 * The fit itself is tested against scipy and by coverage in test/lib/fit/fieldSeries*.test.ts.
 */
import { describe, expect, it } from "vitest";
import { spawnSync } from "node:child_process";
import { readFileSync, readdirSync, writeFileSync, mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll } from "vitest";
import { helicoidBin, repoRoot } from "../../helpers/paths.js";
import { fitFieldSeries } from "../../../lib/src/fit/fieldSeries.js";
import { readProfileCsv } from "../../../lib/src/fit/profileCsv.js";
import { makeFilm } from "../../../lib/src/material/film.js";
import { parseQuantity } from "../../../lib/src/quantity/units.js";

const dataDir = join(repoRoot, "notebooks", "data");
const files = readdirSync(dataDir)
  .filter((f) => /^qf7-skyrmion-cut-\d+mT\.csv$/.test(f))
  .sort()
  .map((f) => join(dataDir, f));
const tmp = mkdtempSync(join(tmpdir(), "helicoid-fit-series-"));
afterAll(() => rmSync(tmp, { recursive: true, force: true }));

function helicoid(...args: string[]) {
  const r = spawnSync(process.execPath, [helicoidBin, "fit", ...args], { encoding: "utf8", timeout: 120_000 });
  return { status: r.status, stdout: r.stdout, stderr: r.stderr };
}

/** The invented true film of the demo files, from their header ("Scenario (invented): ..."). */
function headerTruth(text: string) {
  const line = text.split("\n").find((l) => /Scenario \(invented\)/.test(l))!;
  const get = (name: string, unit: string) => {
    const m = new RegExp(`\\b${name} = \\+?([-\\d.]+ [^,(]+)`).exec(line);
    if (!m) throw new Error(`no ${name} in the header`);
    return parseQuantity(name, m[1].trim().replace(/\.$/, ""), unit);
  };
  return { Ms: get("Ms", "A/m"), A: get("A", "J/m"), Ku: get("Ku", "J/m^3"), D: get("D", "J/m^2"), t: get("t", "m") };
}

const truth = headerTruth(readFileSync(files[0], "utf8"));
const filmArg = `Ms=${truth.Ms}A/m,t=${truth.t * 1e9}nm,A=12pJ/m,D=1.45mJ/m^2,Ku=0.35MJ/m^3`;

describe("helicoid fit --series", () => {
  it("finds the five invented QF-7 profiles with a field in each header", () => {
    expect(files).toHaveLength(5);
    // the same scenario in every file
    for (const f of files) expect(headerTruth(readFileSync(f, "utf8"))).toEqual(truth);
  });

  it("JSON: A, D equal the in-process fitFieldSeries on the same files; the invented truth within 3 standard errors", () => {
    const before = files.map((f) => readFileSync(f, "utf8"));
    // the first file's field given on the command line (the same as its header), the others from the headers
    const args = [files[0] + "@5mT", ...files.slice(1)];
    const r = helicoid("--series", ...args, "--film", filmArg, "--profile", "--json");
    expect(r.stderr).toBe("");
    expect(r.status).toBe(0);
    const j = JSON.parse(r.stdout);
    expect(Object.keys(j)).toEqual(expect.arrayContaining(["mode", "status", "parameters", "kuDecision", "chiSquareReduced", "profiles", "assumptions", "notes"]));
    expect(j.mode).toBe("series");
    expect(j.status).toBe("converged");
    expect(j.profiles.map((p: { file: string }) => p.file)).toEqual(files);
    expect(j.profiles.map((p: { B: number }) => p.B)).toEqual([0.005, 0.01, 0.02, 0.04, 0.06]);
    for (const p of j.profiles) for (const k of ["R", "w", "pullR", "pullW"]) expect(Number.isFinite(p[k]), k).toBe(true);
    expect(j.parameters.A.unit).toBe("J/m");
    expect(j.parameters.D.unit).toBe("J/m^2");
    // the same fit in process (Common practice, no source: the command is a thin layer)
    const film = makeFilm({ Ms: `${truth.Ms}A/m`, t: `${truth.t * 1e9}nm`, A: "12pJ/m", D: "1.45mJ/m^2", Ku: "0.35MJ/m^3", dmi: "interfacial" });
    const direct = fitFieldSeries(
      files.map((f, i) => {
        const csv = readProfileCsv(readFileSync(f, "utf8"), { source: f });
        return { B: [0.005, 0.01, 0.02, 0.04, 0.06][i], data: { x: csv.x, y: csv.y, sigma: csv.sigma } };
      }),
      { film, profile: true },
    );
    expect(j.kuDecision.fitted).toBe(direct.kuDecision.fitted);
    const names = direct.kuDecision.fitted ? (["A", "D", "Ku"] as const) : (["A", "D"] as const);
    for (const k of names) {
      const p = direct.parameters[k];
      expect(Math.abs(j.parameters[k].value / p.value - 1), k).toBeLessThan(1e-10);
      expect(Math.abs(j.parameters[k].stderr / p.stderr! - 1), k).toBeLessThan(1e-8);
      expect(Math.abs(j.parameters[k].profileInterval[0] / p.profileInterval![0] - 1), k).toBeLessThan(1e-8);
      expect(Math.abs(j.parameters[k].profileInterval[1] / p.profileInterval![1] - 1), k).toBeLessThan(1e-8);
      // Common practice, no source: the invented truth of the synthetic files lies within 3 standard errors
      expect(Math.abs(j.parameters[k].value - truth[k]), k).toBeLessThan(3 * j.parameters[k].stderr);
      expect(j.parameters[k].profileInterval[0]).toBeLessThan(j.parameters[k].value);
      expect(j.parameters[k].profileInterval[1]).toBeGreaterThan(j.parameters[k].value);
    }
    expect(j.assumptions.join(" ")).toMatch(/T = 0/);
    expect(files.map((f) => readFileSync(f, "utf8"))).toEqual(before); // the user's files are untouched
  }, 120_000);

  it("table: values with units, the Ku decision, chi-square, per-profile pulls and assumptions", () => {
    const r = helicoid("--series", ...files.slice(0, 3), "--film", filmArg, "--fit-ku", "no");
    expect(r.stderr).toBe("");
    expect(r.status).toBe(0);
    expect(r.stdout).toMatch(/\n {2}A +[\d.]+ ± [\d.]+ pJ\/m/);
    expect(r.stdout).toMatch(/\n {2}Ku +350 kJ\/m³ \(held\)/);
    expect(r.stdout).toMatch(/\nKu: Ku held at the given value on request/);
    expect(r.stdout).toMatch(/\nchi-square [\d.]+ for 4 degrees of freedom/);
    expect(r.stdout).toMatch(/qf7-skyrmion-cut-020mT\.csv +20 mT/);
    expect(r.stdout).toMatch(/\nassumption: continuum micromagnetics/);
  }, 120_000);

  describe("bad input exits 2 and names the problem", () => {
    it("a profile with no field", () => {
      const f = join(tmp, "no-field.csv");
      writeFileSync(
        f,
        "# invented profile without a field\n" +
          readFileSync(files[0], "utf8")
            .split("\n")
            .filter((l) => !l.startsWith("#"))
            .join("\n"),
      );
      const r = helicoid("--series", f, files[1], "--film", filmArg);
      expect(r.status).toBe(2);
      expect(r.stderr).toContain(`field of ${f} = "(missing)" is not valid`);
      expect(r.stderr).toContain(`${f}@<field>`);
    });
    it("a quantity of the wrong dimension in --film", () => {
      const r = helicoid("--series", ...files.slice(0, 2), "--film", "Ms=0.6MA/m,t=1.5nm,A=50mT,D=1.45mJ/m^2,Ku=0.35MJ/m^3");
      expect(r.status).toBe(2);
      expect(r.stderr).toMatch(/--film A = "50mT" is not valid: expected a quantity of the dimension of J\/m/);
    });
    it("a file that does not exist", () => {
      const missing = join(tmp, "nope.csv");
      const r = helicoid("--series", `${missing}@5mT`, files[1], "--film", filmArg);
      expect(r.status).toBe(2);
      expect(r.stderr).toContain(`FILE = "${missing}" is not valid: expected a readable file`);
    });
    it("a choice outside the allowed ones, and a missing --film", () => {
      const r = helicoid("--series", ...files.slice(0, 2), "--film", filmArg, "--method", "fast");
      expect(r.status).toBe(2);
      expect(r.stderr).toMatch(/--method = "fast" is not valid: expected one of two-stage, global/);
      const r2 = helicoid("--series", ...files.slice(0, 2));
      expect(r2.status).toBe(2);
      expect(r2.stderr).toMatch(/--film = "\(missing\)"/);
    });
  });
});
