// `helicoid fit` command: list, JSON output on an invented synthetic scan, and errors.
// Common practice, no source; the fitted numbers are checked against the known synthetic truth.
import { describe, it, expect } from "vitest";
import { mkdtempSync, writeFileSync, readFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { fitCommand } from "../../../kernel-ext/src/cli/fit.js";
import { seededRandom } from "../../../lib/src/numeric/prng.js";

function capture() {
  const out: string[] = [];
  const err: string[] = [];
  return { io: { stdout: (s: string) => out.push(s), stderr: (s: string) => err.push(s) }, out, err };
}

describe("helicoid fit", () => {
  it("--list names every model", async () => {
    const c = capture();
    expect(await fitCommand(["--list", "--json"], c.io)).toBe(0);
    const list = JSON.parse(c.out.join(""));
    expect(list.map((m: { id: string }) => m.id)).toEqual(expect.arrayContaining(["wall180-mz", "wall360-mz", "wall180-bz", "wall360-bx", "wall360-mz-blur"]));
  });
  it("fits an invented 360-degree wall scan and prints the JSON contract", async () => {
    const dir = mkdtempSync(join(tmpdir(), "helicoid-fit-"));
    const rng = seededRandom(12);
    const lines = ["# invented film, synthetic scan", "x (nm),signal,sigma"];
    for (let i = 0; i <= 300; i++) {
      const x = -150 + i;
      const t = Math.sinh(40 / 10) / Math.sinh(Math.abs(x - 7) / 10);
      const mz = Number.isFinite(t) ? (1 - t * t) / (1 + t * t) : -1;
      lines.push(`${x},${(0.1 + 0.6 * mz + 0.02 * rng.normal()).toFixed(5)},0.02`);
    }
    const file = join(dir, "scan.csv");
    const text = lines.join("\n") + "\n";
    writeFileSync(file, text);
    const c = capture();
    const code = await fitCommand([file, "--model", "wall360-mz", "--json"], c.io);
    expect(c.err.join("")).toBe("");
    expect(code).toBe(0);
    const j = JSON.parse(c.out.join(""));
    expect(Object.keys(j)).toEqual(expect.arrayContaining(["model", "status", "parameters", "chiSquareReduced", "aic", "bic", "correlation"]));
    expect(j.model).toBe("wall360-mz");
    expect(j.status).toBe("converged");
    expect(j.parameters.R.unit).toBe("m");
    expect(Math.abs(j.parameters.R.value - 40e-9)).toBeLessThan(4 * j.parameters.R.stderr);
    expect(Math.abs(j.parameters.x0.value - 7e-9)).toBeLessThan(4 * j.parameters.x0.stderr);
    expect(j.correlation.names).toEqual(["x0", "R", "w", "offset", "contrast"]);
    expect(j.chiSquareReduced).toBeGreaterThan(0.7);
    expect(j.chiSquareReduced).toBeLessThan(1.4);
    // the fitted curve and the residuals y - f, in SI, for a plot: f evaluated independently here from
    // the fitted parameters with the ansatz tan(theta/2) = sinh(R/w)/sinh(|x - x0|/w)
    // (Source: F. Buettner, I. Lemesh, G. Beach, Sci. Rep. 8, 4464 (2018)).
    expect(j.curve.x).toHaveLength(301);
    expect(j.curve.x[0]).toBeCloseTo(-150e-9, 20);
    const P = Object.fromEntries(Object.entries(j.parameters).map(([k, v]) => [k, (v as { value: number }).value])) as Record<string, number>;
    for (const i of [0, 100, 150, 157, 200, 300]) {
      const x = j.curve.x[i];
      const t = Math.sinh(P.R! / P.w!) / Math.sinh(Math.abs(x - P.x0!) / P.w!);
      const mz = Number.isFinite(t) ? (1 - t * t) / (1 + t * t) : -1;
      expect(j.curve.fitted[i]).toBeCloseTo(P.offset! + P.contrast! * mz, 6);
      expect(j.curve.residual[i]).toBeCloseTo(j.curve.y[i] - j.curve.fitted[i], 12);
    }
    expect(j.curve.sigma[0]).toBe(0.02);
    expect(j.residualRms).toBeCloseTo(Math.sqrt(j.curve.residual.reduce((a: number, v: number) => a + v * v, 0) / 301), 12);
    // the wording of the text output: the model, the skyrmion-cut assumption (not a straight wall), goodness of fit
    const c3 = capture();
    expect(await fitCommand([file, "--model", "wall360-mz"], c3.io)).toBe(0);
    const txt = c3.out.join("");
    expect(txt).toMatch(/^model wall360-mz: /);
    expect(txt).toMatch(/\n {2}R +\d+\.\d+ ± \d\.\d+ nm {2}\[\d+\.?\d* nm, \d+\.?\d* nm\]\n/);
    expect(txt).toMatch(/goodness of fit: reduced chi-square [\d.]+ \(about 1 when/);
    expect(txt).toContain("a cut through the centre of an axisymmetric skyrmion");
    expect(txt).not.toContain("straight wall (1D profile");
    expect(readFileSync(file, "utf8")).toBe(text); // the user's file is untouched
    // table output with a fixed parameter given with a unit
    const c2 = capture();
    expect(await fitCommand([file, "--model", "wall360-mz", "--fix", "w=10 nm"], c2.io)).toBe(0);
    expect(c2.out.join("")).toMatch(/\n {2}w\s+10 nm\s+fixed/);
  });
  it("a fit that fails (singular: a flat invented scan with no wall) exits 1 with the reason", async () => {
    const dir = mkdtempSync(join(tmpdir(), "helicoid-fit-"));
    const lines = ["# invented flat scan, no wall in it", "x (nm),signal,sigma"];
    for (let i = 0; i <= 100; i++) lines.push(`${i - 50},${(0.5 + 0.01 * Math.sin(1.7 * i)).toFixed(5)},0.02`);
    const file = join(dir, "flat.csv");
    writeFileSync(file, lines.join("\n") + "\n");
    const c = capture();
    expect(await fitCommand([file, "--model", "wall180-mz", "--json"], c.io)).toBe(1);
    expect(JSON.parse(c.out.join("")).status).toBe("singular");
    expect(c.err.join("")).toMatch(/the fit failed \(status singular\): the Jacobian is singular/);
  });
  it("bad input is named and exits 2 (as in helicoid fit --series)", async () => {
    const c = capture();
    expect(await fitCommand(["nofile.csv", "--model", "wall180-mz"], c.io)).toBe(2);
    expect(c.err.join("")).toMatch(/FILE = "nofile.csv" is not valid: expected a readable file/);
    const c2 = capture();
    expect(await fitCommand(["x.csv", "--model", "nope"], c2.io)).toBe(2);
    expect(c2.err.join("")).toMatch(/one of the profile model ids/);
  });

  it("text output: profile intervals with --profile, assumptions, and notes for unit and sigma assumptions", async () => {
    // Common practice, no source: the printed table reflects the fit result (checked against
    // fitProfile on the same data) and states what was assumed.
    const dir = mkdtempSync(join(tmpdir(), "helicoid-fit-text-"));
    const rng = seededRandom(31);
    const rows = (unit: string, sigma: boolean) => {
      const lines = ["# invented film, synthetic scan", `x${unit},signal${sigma ? ",sigma" : ""}`];
      for (let i = 0; i <= 200; i++) {
        const x = -100 + i;
        const t = Math.sinh(30 / 8) / Math.sinh(Math.abs(x - 4) / 8);
        const mz = Number.isFinite(t) ? (1 - t * t) / (1 + t * t) : -1;
        lines.push(`${unit ? x : x * 1e-9},${(0.05 + 0.9 * mz + 0.02 * rng.normal()).toFixed(5)}${sigma ? ",0.02" : ""}`);
      }
      return lines.join("\n") + "\n";
    };
    const withUnit = join(dir, "cut.csv"),
      plain = join(dir, "plain.csv"),
      noSigma = join(dir, "nosigma.csv");
    writeFileSync(withUnit, rows(" (nm)", true));
    writeFileSync(plain, rows("", true));
    writeFileSync(noSigma, rows(" (nm)", false));
    const before = readFileSync(withUnit, "utf8");
    let c = capture();
    expect(await fitCommand([withUnit, "--model", "wall360-mz", "--profile"], c.io)).toBe(0);
    const text = c.out.join("");
    expect(text).toMatch(/R\s+[\d.]+ ± [\d.]+ nm\s+\[[\d.]+ nm, [\d.]+ nm\]\s+95 % profile-likelihood interval \[[\d.]+ nm, [\d.]+ nm\]/);
    expect(text).toMatch(/^assumptions: continuum micromagnetics, T = 0/m);
    c = capture();
    expect(await fitCommand([withUnit, "--model", "wall360-mz", "--start", "w=8"], c.io)).toBe(1); // 8 m: absurd start, stated
    expect(c.out.join("")).toMatch(/note: w = 8 was given without a unit: read as 8 m/);
    c = capture();
    expect(await fitCommand([plain, "--model", "wall360-mz"], c.io)).toBe(0);
    expect(c.out.join("")).toMatch(/note: the position column "x" has no unit in its header: metres assumed/);
    c = capture();
    expect(await fitCommand([noSigma, "--model", "wall360-mz"], c.io)).toBe(0);
    expect(c.out.join("")).toMatch(/note: no sigma column: the standard errors are scaled by the reduced chi-square/);
    // a unit option that contradicts the header is refused; an unknown --start parameter names the option
    c = capture();
    expect(await fitCommand([withUnit, "--model", "wall360-mz", "--x-unit", "um"], c.io)).toBe(2);
    expect(c.err.join("")).toMatch(/xUnit = "um".*header's unit "nm"/);
    c = capture();
    expect(await fitCommand([withUnit, "--model", "wall360-mz", "--start", "Q=3"], c.io)).toBe(2);
    expect(c.err.join("")).toMatch(/--start = "Q" is not valid: expected a parameter of wall360-mz: x0, R, w, offset, contrast/);
    expect(readFileSync(withUnit, "utf8")).toBe(before);
  });
});
