/**
 * fitProfile in a notebook and `helicoid fit` on the same file give the same fit: the library
 * guesses the start values (as the command does, by calling it), and the command is run as a real
 * process on files written here. Profiles are invented (seeded synthetic data): clean, noisy and
 * blurred 360-degree walls and a noisy 180-degree wall. Each fit also recovers the parameters the
 * data were generated with, within its stated uncertainties.
 * Common practice, no source: a least-squares fit of data generated from the model at known
 * parameters returns them within a few standard errors.
 */
import { describe, expect, it } from "vitest";
import { spawnSync } from "node:child_process";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { fitProfile } from "../../../lib/src/fit/fitProfile.js";
import { getProfileModel } from "../../../lib/src/fit/profileModels.js";
import { readProfileCsv, profileField } from "../../../lib/src/fit/profileCsv.js";
import { syntheticProfile } from "../../../lib/src/fit/syntheticProfiles.js";
import { helicoidBin } from "../../helpers/paths.js";

const nm = 1e-9;

interface Case {
  name: string;
  model: string;
  truth: Record<string, number>;
  noise: number;
  sigmaColumn: boolean;
  seed: number;
}

const cases: Case[] = [
  // the profile of the issue: R = 40 nm, w = 12 nm, almost no noise, no sigma column
  { name: "clean", model: "wall360-mz", truth: { x0: 3 * nm, R: 40 * nm, w: 12 * nm, offset: 0, contrast: 1 }, noise: 0.002, sigmaColumn: false, seed: 3 },
  { name: "noisy", model: "wall360-mz", truth: { x0: -5 * nm, R: 40 * nm, w: 12 * nm, offset: 0.1, contrast: 0.6 }, noise: 0.05, sigmaColumn: true, seed: 7 },
  { name: "blurred", model: "wall360-mz-blur", truth: { x0: 0, R: 40 * nm, w: 12 * nm, offset: 0, contrast: 0.8, blur: 8 * nm }, noise: 0.01, sigmaColumn: true, seed: 11 },
  { name: "wall180 noisy", model: "wall180-mz", truth: { x0: 10 * nm, Delta: 9 * nm, offset: 0, contrast: 0.9 }, noise: 0.03, sigmaColumn: true, seed: 5 },
];

function writeProfile(dir: string, c: Case): { file: string; text: string } {
  const p = syntheticProfile(c.model, c.truth, { noise: c.noise, seed: c.seed, points: 241, span: 300 * nm });
  const lines = [`# invented synthetic profile (${c.name}), seeded noise ${c.noise}; field: 12.5 mT`, c.sigmaColumn ? "x (nm), mz, sigma" : "x (nm), mz"];
  for (let i = 0; i < p.x.length; i++) lines.push([(p.x[i]! / nm).toPrecision(12), p.y[i]!.toPrecision(12), ...(c.sigmaColumn ? [String(c.noise)] : [])].join(", "));
  const file = join(dir, `${c.name.replace(/\s+/g, "-")}.csv`);
  const text = lines.join("\n") + "\n";
  writeFileSync(file, text);
  return { file, text };
}

describe("fitProfile and helicoid fit agree", () => {
  const dir = mkdtempSync(join(tmpdir(), "helicoid-fitprofile-"));
  for (const c of cases) {
    it(`${c.name} (${c.model}): same values and errors from the library and the command, near the truth`, () => {
      try {
        const { file, text } = writeProfile(dir, c);
        // the notebook's call: the parsed file and the model id, nothing else
        const lib = fitProfile(readProfileCsv(text, { source: file }), c.model);
        const run = spawnSync(process.execPath, [helicoidBin, "fit", file, "--model", c.model, "--json"], { encoding: "utf8", timeout: 120_000 });
        expect(run.stderr).toBe("");
        expect(run.status).toBe(0);
        const cli = JSON.parse(run.stdout) as {
          status: string;
          parameters: Record<string, { value: number; stderr: number | null }>;
          chiSquareReduced: number | null;
          residualRms?: number;
        };
        expect(lib.status).toBe("converged");
        expect(cli.status).toBe(lib.status);
        expect(Object.keys(cli.parameters).sort()).toEqual(Object.keys(lib.parameters).sort());
        for (const [name, p] of Object.entries(lib.parameters)) {
          const q = cli.parameters[name]!;
          // the same computation: equal to the last digits (JSON round trip of doubles is exact)
          expect(Math.abs(q.value - p.value)).toBeLessThanOrEqual(1e-12 * Math.max(Math.abs(p.value), 1e-30));
          expect(Math.abs((q.stderr ?? 0) - (p.stderr ?? 0))).toBeLessThanOrEqual(1e-9 * Math.max(Math.abs(p.stderr ?? 0), 1e-30));
          // near the generating values: within 5 standard errors
          const truth = c.truth[name];
          if (truth !== undefined && p.stderr !== null) expect(Math.abs(p.value - truth), `${name}: ${p.value} ± ${p.stderr} against ${truth}`).toBeLessThan(5 * p.stderr + 1e-15);
        }
        if (c.sigmaColumn) expect(cli.chiSquareReduced).toBeCloseTo(lib.chiSquareReduced, 10);
        else {
          // without sigmas the command gives no reduced chi-square, the residual RMS instead
          expect(cli.chiSquareReduced).toBeNull();
          const rms = Math.sqrt(lib.residuals.reduce((a, v) => a + v * v, 0) / lib.residuals.length);
          expect(Math.abs(cli.residualRms! - rms)).toBeLessThanOrEqual(1e-12 * rms);
        }
        if (!c.sigmaColumn) expect(lib.notes.join(" ")).toMatch(/no sigma column/);
      } finally {
        if (c === cases[cases.length - 1]) rmSync(dir, { recursive: true, force: true });
      }
    }, 120_000);
  }

  it("the clean profile of the issue: R and w within a few tenths of a nanometre of 40 nm and 12 nm", () => {
    const c = cases[0]!;
    const p = syntheticProfile(c.model, c.truth, { noise: c.noise, seed: c.seed, points: 241, span: 300 * nm });
    const r = fitProfile(p, c.model);
    expect(r.status).toBe("converged");
    expect(Math.abs(r.parameters.R!.value - 40 * nm)).toBeLessThan(0.3 * nm);
    expect(Math.abs(r.parameters.w!.value - 12 * nm)).toBeLessThan(0.3 * nm);
    // unsorted positions: the guess is taken in position order, the data are not changed
    const order = p.x.map((_, i) => i).reverse();
    const shuffled = { x: order.map((i) => p.x[i]!), y: order.map((i) => p.y[i]!) };
    const copy = JSON.stringify(shuffled);
    const r2 = fitProfile(shuffled, c.model);
    expect(JSON.stringify(shuffled)).toBe(copy);
    expect(r2.parameters.R!.value / nm).toBeCloseTo(r.parameters.R!.value / nm, 6);
  });

  it("given start values win over the guess; guess: false keeps the model's own start values", () => {
    const c = cases[0]!;
    const p = syntheticProfile(c.model, c.truth, { noise: c.noise, seed: c.seed, points: 241, span: 300 * nm });
    // a parameter held "at its start value" shows which start was used
    expect(fitProfile(p, c.model, { start: { R: 38 * nm }, fixed: { R: true } }).parameters.R!.value).toBe(38 * nm);
    const guessedR = fitProfile(p, c.model, { fixed: { R: true } }).parameters.R!.value;
    expect(Math.abs(guessedR - 40 * nm)).toBeLessThan(5 * nm); // half width at half depth of the dip
    const modelDefault = getProfileModel(c.model).parameters.find((q) => q.name === "R")!.value;
    expect(fitProfile(p, c.model, { guess: false, fixed: { R: true } }).parameters.R!.value).toBe(modelDefault);
  });
});

describe("profileField", () => {
  it("reads the field from a header comment or from FILE@FIELD, and refuses a file with neither", () => {
    // Common practice, no source: 1 mT = 1e-3 T, 10 Oe = 1 mT in vacuum (B = mu0 H).
    expect(profileField("# invented; field: 12.5 mT; noise 0.01\nx (nm), mz\n0, 1\n", { source: "a.csv" })).toBeCloseTo(12.5e-3, 15);
    expect(profileField("# Field : 0.02 T.\n", {})).toBeCloseTo(0.02, 15);
    expect(profileField("x, y\n", { source: "b.csv", field: "100 Oe" }) / 0.01).toBeCloseTo(1, 8); // CODATA mu0 is 4 pi 1e-7 to 1e-10
    expect(() => profileField("x (nm), mz\n0, 1\n", { source: "c.csv" })).toThrow(/field of c\.csv.*c\.csv@5mT/);
    expect(() => profileField("# field: 5 apples\n", { source: "d.csv" })).toThrow(/field of d\.csv/);
  });
});
