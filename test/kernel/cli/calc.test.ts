/**
 * `helicoid calc`: any catalogue calculator from the shell, values with units, JSON in SI.
 * The physics of each calculator is tested in test/lib; here the command's contract is checked,
 * and its numbers against the closed forms they print (Delta = sqrt(A/K_eff), sigma = 4 sqrt(A K_eff) - pi |D|).
 */
import { describe, expect, it } from "vitest";
import { spawnSync } from "node:child_process";
import { helicoidBin } from "../../helpers/paths.js";
import { ConvergenceError, getCalculator } from "@helicoid/lib";
import { calcCommand } from "../../../kernel-ext/src/cli/calc.js";

function calc(...args: string[]) {
  const r = spawnSync(process.execPath, [helicoidBin, "calc", ...args], { encoding: "utf8", timeout: 60_000 });
  return { status: r.status, stdout: r.stdout, stderr: r.stderr };
}

describe("helicoid calc", () => {
  it("runs the wall calculator with units and prints SI JSON", () => {
    const r = calc("wall", "Ms=1.1MA/m", "A=15pJ/m", "Ku=1.2MJ/m^3", "D=1.5mJ/m^2", "t=1nm", "--json");
    expect(r.status, r.stderr).toBe(0);
    const j = JSON.parse(r.stdout);
    expect(j).toMatchObject({ id: "wall", status: "ok" });
    expect(j.inputs.A).toEqual({ value: 1.5e-11, unit: "J/m" });
    expect(j.inputs.Ms.value).toBeCloseTo(1.1e6, 3);
    for (const k of ["width", "energy", "criticalDmi", "exchangeLength", "effectiveAnisotropy", "qualityFactor"]) expect(j.outputs[k], k).toBeDefined();
    // Source: Landau-Lifshitz wall (Hubert & Schaefer, Magnetic Domains, 1998); Thiaville et al., EPL 100, 57002 (2012).
    const mu0 = 1.25663706212e-6; // CODATA 2018
    const Keff = 1.2e6 - (mu0 * 1.1e6 ** 2) / 2;
    expect(j.outputs.effectiveAnisotropy).toEqual({ value: expect.closeTo(Keff, 6), unit: "J/m^3" });
    expect(j.outputs.width.value / Math.sqrt(1.5e-11 / Keff) - 1).toBeLessThan(1e-12);
    expect(Math.abs(j.outputs.energy.value / (4 * Math.sqrt(1.5e-11 * Keff) - Math.PI * 1.5e-3) - 1)).toBeLessThan(1e-12);
    expect(j.outputs.width.unit).toBe("m");
  });

  it("gives sweep outputs as arrays, and a sweep of our choosing", () => {
    const r = calc("skyrmion", "B=50mT", "--demo", "--sweep", "B=0mT:100mT:11", "--json");
    expect(r.status, r.stderr).toBe(0);
    const j = JSON.parse(r.stdout);
    for (const k of ["radius", "wallWidth", "energy"]) expect(typeof j.outputs[k].value, k).toBe("number");
    expect(Array.isArray(j.outputs.fieldSweep.value)).toBe(true);
    expect(j.outputs.fieldSweep.value.length).toBeLessThanOrEqual(11);
    expect(j.outputs.radiusSweep.value.length).toBe(j.outputs.fieldSweep.value.length);
    expect(j.sweep).toEqual({ over: "B", from: 0, to: 0.1, points: 11 });
  });

  it("lists the catalogue with inputs and outputs", () => {
    const r = calc("--list", "--json");
    expect(r.status).toBe(0);
    const list = JSON.parse(r.stdout) as Array<{ id: string; inputs: Array<{ name: string }>; outputs: Array<{ name: string }> }>;
    const ids = list.map((s) => s.id);
    for (const id of ["wall", "wall360", "skyrmion", "skyrmion-profile", "wall-type"]) expect(ids).toContain(id);
    expect(list.find((s) => s.id === "wall")!.inputs.map((i) => i.name)).toEqual(["Ms", "A", "Ku", "D", "t"]);
  });

  it("refuses bad input naming the parameter, the value and what was expected", () => {
    let r = calc("wall", "A=50mT");
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/A = "50mT" is not valid: expected a quantity of the dimension of J\/m/);
    r = calc("wall", "A=-15pJ/m", "--json");
    expect(r.status).toBe(2);
    const j = JSON.parse(r.stdout);
    expect(j.status).toBe("error");
    expect(j.error).toMatchObject({ type: "InputError", parameter: "A", value: "-15pJ/m" });
    r = calc("wall", "Aex=15pJ/m");
    expect(r.stderr).toMatch(/Aex = "15pJ\/m" is not valid: expected one of the inputs of 'wall'/);
    r = calc("nosuch");
    expect(r.stderr).toMatch(/calculator = "nosuch" is not valid: expected one of the catalogue ids/);
  });

  it("refuses a sweep of a calculator without one, and a sweep of an input that is not sweepable", () => {
    // Common practice, no source: an option the command cannot honour is an error (exit 2), not ignored.
    let r = calc("wall", "--sweep", "D=0:4mJ/m^2:5");
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/--sweep = "D=0:4mJ\/m\^2:5" is not valid: expected no --sweep: 'wall' has no sweepable input/);
    expect(r.stdout).toBe("");
    r = calc("skyrmion", "--sweep", "D=0:4mJ/m^2:5", "--json");
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/--sweep = "D=0:4mJ\/m\^2:5" is not valid: expected a sweepable input of 'skyrmion': B/);
    expect(JSON.parse(r.stdout)).toMatchObject({ id: "skyrmion", status: "error", error: { type: "InputError", parameter: "--sweep", value: "D=0:4mJ/m^2:5" } });
  });

  it("refuses an unknown option (listing the valid ones), a repeated input and an option without its value", () => {
    // Common practice, no source: a typo or a doubled argument must not be silently ignored or last-wins.
    let r = calc("wall", "--bogus");
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/unknown option --bogus; the options are --json, --list, --help, -h, --progress, --si, --demo, --sweep/);
    // The usage shown on an error names every option.
    for (const o of ["--sweep NAME=FROM:TO:POINTS", "--json", "--list"]) expect(r.stderr).toContain(o);
    expect(r.stdout).toBe("");
    r = calc("wall", "A=15pJ/m", "A=20pJ/m", "--json");
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/A given twice: A=15pJ\/m and A=20pJ\/m/);
    expect(JSON.parse(r.stdout)).toMatchObject({ id: "wall", status: "error", error: { type: "InputError", parameter: "A", value: "20pJ/m" } });
    r = calc("skyrmion", "--sweep");
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/--sweep needs a value \(NAME=FROM:TO:POINTS/);
    expect(r.stderr).not.toMatch(/\n\s+at /); // no stack trace
  });

  it("a computation that failed exits 1 (not 2), with its reason and, with --json, its diagnostics", async () => {
    // Common practice, no source: 2 is for bad input only. The solver failure is provoked in process.
    const spec = getCalculator("wall");
    const compute = spec.compute;
    spec.compute = () => {
      throw new ConvergenceError("test solver", "no bracket", { evaluations: 7 });
    };
    let out = "",
      err = "";
    try {
      const code = await calcCommand(["wall", "--demo", "--json"], {
        stdout: (s) => {
          out += s;
        },
        stderr: (s) => {
          err += s;
        },
      });
      expect(code).toBe(1);
    } finally {
      spec.compute = compute;
    }
    expect(err).toBe("helicoid calc: test solver did not converge: no bracket (evaluations: 7)\n");
    expect(JSON.parse(out)).toEqual({
      id: "wall",
      status: "error",
      error: { type: "ConvergenceError", message: expect.stringMatching(/no bracket/), diagnostics: { evaluations: 7 } },
    });
  });

  it("a film calculator requires its film: the missing inputs are named, with --demo and a film file as the ways out", () => {
    // Common practice, no source: no silent invented values in a number a researcher may quote.
    let r = calc("skyrmion");
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/^helicoid calc: film = "not given: Ms, A, Ku, D, t" is not valid: expected every film input of 'skyrmion' \(Ms, A, Ku, D, t\)/);
    expect(r.stderr).toMatch(/--demo/);
    expect(r.stderr).toMatch(/--film FILE/);
    expect(r.stdout).toBe("");
    r = calc("wall-type", "D=0.3mJ/m^2", "--json");
    expect(r.status).toBe(2);
    expect(JSON.parse(r.stdout)).toMatchObject({ id: "wall-type", status: "error", error: { type: "InputError", parameter: "film", value: "not given: Ms, A, Ku, t" } });
    // precessing-skyrmion takes no D: only the film inputs it has are required
    r = calc("precessing-skyrmion", "Ms=0.8MA/m");
    expect(r.stderr).toMatch(/not given: A, Ku, t"/);
    // --demo fills them in, and the result says which and that they are invented
    r = calc("wall-type", "D=0.3mJ/m^2", "--demo", "--json");
    expect(r.status, r.stderr).toBe(0);
    const j = JSON.parse(r.stdout);
    expect(j.status).toBe("warning");
    expect(j.demo).toEqual(["Ms", "A", "Ku", "t"]);
    expect(j.notes[0]).toMatch(/^demo values \(--demo\): Ms = 1\.1 MA\/m, A = 15 pJ\/m, Ku = 1\.2 MJ\/m³, t = 1 nm are the invented demo film's/);
    expect(j.inputs.D.value).toBeCloseTo(0.3e-3, 12);
    r = calc("wall", "Ms=1.1MA/m", "A=15pJ/m", "Ku=1.2MJ/m^3", "D=1.5mJ/m^2", "t=1nm", "--json");
    expect(JSON.parse(r.stdout)).toMatchObject({ status: "ok", demo: [], defaults: [] });
  });

  it("refuses a bare number for a quantity with a unit (suggesting the unit) unless --si", () => {
    // Common practice, no source: "A=10" meant as pJ/m must not run as 10 J/m.
    let r = calc("wall", "Ms=1.1MA/m", "A=10", "Ku=1.2MJ/m^3", "D=1.5mJ/m^2", "t=1nm");
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/^helicoid calc: A = "10" is not valid: expected a value with its unit \(such as A=10pJ\/m\)\. .*add --si to read bare numbers in SI \(10 J\/m\)/);
    r = calc("berry-loop", "theta=1");
    expect(r.stderr).toMatch(/theta = "1" is not valid: expected a value with its unit \(such as theta=1deg or 1rad\)/);
    r = calc("skyrmion", "--demo", "--sweep", "B=0:100:5");
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/--sweep = "B: 100" is not valid: expected a value with its unit \(such as B=100mT\)/);
    // whole numbers, choices and zero take no unit; --si reads bare numbers as SI
    r = calc("easy-plane", "twoS=3", "B=0", "--json");
    expect(r.status, r.stderr).toBe(0);
    r = calc("wall", "Ms=1.1e6", "A=1.5e-11", "Ku=1.2e6", "D=1.5e-3", "t=1e-9", "--si", "--json");
    expect(r.status, r.stderr).toBe(0);
    const j = JSON.parse(r.stdout);
    expect(j.inputs.A.value).toBe(1.5e-11);
    expect(j.inputs.t.value).toBe(1e-9);
    // the same film with units gives the same numbers
    const u = JSON.parse(calc("wall", "Ms=1.1MA/m", "A=15pJ/m", "Ku=1.2MJ/m^3", "D=1.5mJ/m^2", "t=1nm", "--json").stdout);
    expect(j.outputs.width.value).toBeCloseTo(u.outputs.width.value, 20);
  });

  it("calc ID --help explains a calculator from its spec without running it", async () => {
    // Common practice, no source: help text comes from the spec (the same meanings as the explorer).
    const wallSpec = getCalculator("wall");
    const r = spawnSync(process.execPath, [helicoidBin, "calc", "wall", "--help"], { encoding: "utf8" });
    expect(r.status).toBe(0);
    expect(r.stdout).toMatch(/^wall: 180-degree domain wall/);
    for (const i of wallSpec.inputs) expect(r.stdout).toContain(`  ${i.name.padEnd(12)} [`);
    expect(r.stdout).toMatch(/required: the film's Ms, A, Ku, D, t \(or --demo/);
    for (const o of wallSpec.outputs) expect(r.stdout).toContain(o.meaning);
    expect(r.stdout).toMatch(/usual range 5 pJ\/m to 30 pJ\/m/);
    expect(r.stdout).toMatch(/^assumptions:/m);
    expect(r.stdout).not.toMatch(/^ {2}out /m); // nothing was computed
    const bad = spawnSync(process.execPath, [helicoidBin, "calc", "nosuch", "--help"], { encoding: "utf8" });
    expect(bad.status).toBe(2);
    expect(bad.stderr).toMatch(/one of the catalogue ids: wall/);
    const plain = spawnSync(process.execPath, [helicoidBin, "calc", "--help"], { encoding: "utf8" });
    expect(plain.status).toBe(0);
    expect(plain.stdout).toMatch(/helicoid calc ID --help/);
  });

  it("long exact diagonalizations show progress on stderr with --progress (lines) or on a terminal (in place), never in --json stdout", async () => {
    // Common practice, no source: progress goes to stderr only; stdout stays one JSON document.
    // Progress starts after HELICOID_PROGRESS_DELAY_MS (0 here: a fast machine must show it too).
    process.env.HELICOID_PROGRESS_DELAY_MS = "0";
    const r = calc("chain-spectrum", "N=18", "levels=1", "--progress", "--json");
    expect(r.status, r.stderr).toBe(0);
    const j = JSON.parse(r.stdout);
    expect(j.outputs.groundSector.value).toMatch(/^S\^z = 0, k = (0 \(m = 0\)|pi \(m = 9\)), R = [+-]1, F = [+-]1$/);
    expect(r.stderr).toMatch(/^helicoid calc chain-spectrum: +\d+% S\^z = .*\(\d+\.\d s\)$/m);
    expect(r.stderr).toMatch(/helicoid calc chain-spectrum: done in \d+\.\d s\n$/);
    // not a terminal and no --progress: nothing on stderr
    const quiet = calc("chain-spectrum", "N=18", "levels=1", "--json");
    expect(quiet.status).toBe(0);
    expect(quiet.stderr).toBe("");
    // a terminal: one line redrawn with carriage returns and cleared at the end
    let out = "",
      err = "";
    const code = await calcCommand(["chain-spectrum", "N=18", "levels=1"], {
      stdout: (s) => {
        out += s;
      },
      stderr: (s) => {
        err += s;
      },
      stderrIsTTY: true,
    });
    expect(code).toBe(0);
    expect(err).toMatch(/^\rhelicoid calc chain-spectrum: /);
    expect(err).not.toContain("\n");
    expect(err).toMatch(/\r +\r$/);
    expect(out).toMatch(/S\^z = 0, k = /);
    delete process.env.HELICOID_PROGRESS_DELAY_MS;
  });

  it("refuses an exact diagonalization over the work budget before starting, with the estimate", () => {
    const r = calc("chain-spectrum", "N=24", "levels=4", "--progress", "--json");
    expect(r.status).toBe(2);
    expect(JSON.parse(r.stdout)).toMatchObject({ id: "chain-spectrum", status: "error", error: { type: "InputError", parameter: "N" } });
    expect(r.stderr).toMatch(
      /N = "24" is not valid: expected a request within the budget: this one needs about [0-9.e+]+ elementary steps .* states in the symmetry sectors of a ring of 24 sites/,
    );
    expect(r.stderr).not.toMatch(/%/);
  });
});
