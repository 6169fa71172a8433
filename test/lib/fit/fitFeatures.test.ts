/**
 * Global fits with shared parameters, user models (TypeScript function and mathjs formula),
 * profile-likelihood intervals, bootstrap, stop flag and progress, AIC/BIC model choice, and the
 * quantiles, against scipy where a reference exists.
 */
import { describe, it, expect } from "vitest";
import { fitProfile, fitGlobal, formulaModel, userModel } from "../../../lib/src/fit/fitProfile.js";
import { seededRandom } from "../../../lib/src/numeric/prng.js";
import { studentTQuantile, normalQuantile } from "../../../lib/src/numeric/distributions.js";
import { runPython } from "../../helpers/python.js";

const nm = 1e-9;
function wall(x0: number, Delta: number, off: number, c: number, seed: number, noise = 0.03) {
  const rng = seededRandom(seed);
  const x = Array.from({ length: 121 }, (_, i) => (-90 + 1.5 * i) * nm);
  return { x, y: x.map((v) => off + c * -Math.tanh((v - x0) / Delta) + noise * rng.normal()) };
}

describe("fit features", () => {
  it("quantiles agree with scipy.stats", () => {
    // Source: scipy.stats.t.ppf / norm.ppf (Debian scipy 1.10)
    const ref = runPython<{ t: number[]; z: number[] }>(
      "import json,sys\nfrom scipy import stats\nprint(json.dumps({'t':[float(stats.t.ppf(0.975,n)) for n in [1,2,3,5,10,30,117]],'z':[float(stats.norm.ppf(p)) for p in [0.001,0.025,0.5,0.84,0.975]]}))",
    );
    [1, 2, 3, 5, 10, 30, 117].forEach((n, i) => expect(Math.abs(studentTQuantile(0.975, n) - ref.t[i]) / ref.t[i]).toBeLessThan(1e-9));
    [0.001, 0.025, 0.5, 0.84, 0.975].forEach((p, i) => expect(Math.abs(normalQuantile(p) - ref.z[i])).toBeLessThan(1e-9));
  });
  it("global fit: a shared width across three data sets with local centers and contrasts", () => {
    const sets = [wall(-10 * nm, 12 * nm, 0, 1, 1), wall(5 * nm, 12 * nm, 0.1, 0.8, 2), wall(20 * nm, 12 * nm, -0.1, 1.2, 3)];
    const start = { x0: 0, Delta: 8 * nm, offset: 0, contrast: 1 };
    const g = fitGlobal(
      sets.map((d) => ({ data: d, model: "wall180-mz" })),
      { shared: ["Delta"], start },
    );
    expect(g.status).toBe("converged");
    expect(g.freeNames).toContain("Delta");
    expect(g.freeNames).toContain("x0[2]");
    expect(g.freeNames.length).toBe(1 + 3 * 3);
    // Common practice, no source: the shared estimate is the precision-weighted combination, so its
    // error is below each single-set error and it is consistent with the truth
    const singles = sets.map((d) => fitProfile(d, "wall180-mz", { start }));
    for (const s of singles) expect(g.parameters.Delta.stderr!).toBeLessThan(s.parameters.Delta.stderr!);
    expect(Math.abs(g.parameters.Delta.value - 12 * nm)).toBeLessThan(4 * g.parameters.Delta.stderr!);
    expect(g.parameters["x0[0]"].value).toBeCloseTo(-10 * nm, 9);
  });
  it("user models: TypeScript function and formula give the same fit as the catalogue model", () => {
    const d = wall(3 * nm, 10 * nm, 0.2, 0.7, 9);
    const cat = fitProfile(d, "wall180-mz", { start: { x0: 0, Delta: 8 * nm, offset: 0, contrast: 1 } });
    const fn = userModel({
      parameters: [
        { name: "x0", value: 0, typical: 1e-8 },
        { name: "Delta", value: 8 * nm, min: 0 },
        { name: "offset", value: 0 },
        { name: "contrast", value: 1 },
      ],
      evaluate: (x, p) => p.offset + p.contrast * -Math.tanh((x - p.x0) / p.Delta),
    });
    const f1 = fitProfile(d, fn);
    const fm = formulaModel("offset - contrast * tanh((x - x0) / Delta)", [
      { name: "x0", value: 0, typical: 1e-8 },
      { name: "Delta", value: 8 * nm },
      { name: "offset", value: 0 },
      { name: "contrast", value: 1 },
    ]);
    const f2 = fitProfile(d, fm);
    for (const k of ["x0", "Delta", "offset", "contrast"]) {
      expect(f1.parameters[k].value).toBeCloseTo(cat.parameters[k].value, 12);
      expect(Math.abs(f2.parameters[k].value - cat.parameters[k].value)).toBeLessThan(1e-7 * Math.abs(cat.parameters[k].value) + 1e-18);
      expect(Math.abs(f2.parameters[k].stderr! / cat.parameters[k].stderr! - 1)).toBeLessThan(1e-5);
    }
  });
  it("profile-likelihood interval matches the Wald interval for a linear parameter and is asymmetric for a nonlinear one", () => {
    const d = wall(0, 6 * nm, 0, 1, 4, 0.15);
    const r = fitProfile(d, "wall180-mz", { start: { x0: 0, Delta: 8 * nm, offset: 0, contrast: 1 }, profile: true });
    // Source: for a parameter entering linearly with the others refitted, the profile of S is an
    // exact quadratic, and the F-based profile interval equals the t-based Wald interval (Bates &
    // Watts 1988, ch. 6)
    const off = r.parameters.offset;
    expect(Math.abs(off.profileInterval![0] - off.interval![0]) / off.stderr!).toBeLessThan(0.05);
    expect(Math.abs(off.profileInterval![1] - off.interval![1]) / off.stderr!).toBeLessThan(0.05);
    const w = r.parameters.Delta;
    const left = w.value - w.profileInterval![0];
    const right = w.profileInterval![1] - w.value;
    expect(left).toBeGreaterThan(0);
    expect(right).toBeGreaterThan(0);
    expect(Math.abs(left - right) / (left + right)).toBeGreaterThan(0.01);
  });
  it("seeded bootstrap is reproducible and its standard deviation is close to the asymptotic error", () => {
    const d = wall(0, 10 * nm, 0, 1, 6, 0.05);
    const opts = { start: { x0: 0, Delta: 8 * nm, offset: 0, contrast: 1 }, bootstrap: { samples: 150, seed: 42 } };
    const a = fitProfile(d, "wall180-mz", opts);
    const b = fitProfile(d, "wall180-mz", opts);
    expect(a.parameters.Delta.bootstrapStderr).toBe(b.parameters.Delta.bootstrapStderr);
    // Common practice, no source: for a well-determined fit the bootstrap and asymptotic errors agree within ~25 %
    expect(Math.abs(a.parameters.Delta.bootstrapStderr! / a.parameters.Delta.stderr! - 1)).toBeLessThan(0.25);
  });
  it("progress callback and stop flag", () => {
    const d = wall(0, 10 * nm, 0, 1, 7);
    const seen: number[] = [];
    const flag = { aborted: false };
    const r = fitProfile(d, "wall180-mz", {
      start: { x0: 30 * nm, Delta: 3 * nm, offset: 0.5, contrast: 0.2 },
      onProgress: (p) => {
        seen.push(p.iteration);
        if (p.iteration === 2) flag.aborted = true;
      },
      signal: flag,
    });
    expect(r.status).toBe("stopped");
    expect(seen).toEqual([1, 2]);
    expect(r.message).toMatch(/stopped on request/);
  });
  it("AIC and BIC prefer the 360-degree model for a 360-degree wall and the 180-degree model for a 180-degree wall", () => {
    const rng = seededRandom(3);
    const x = Array.from({ length: 201 }, (_, i) => (-100 + i) * nm);
    const y360 = x.map((v) => {
      const t = Math.sinh(30 / 8) / Math.sinh(Math.abs(v / nm) / 8);
      const mz = Number.isFinite(t) ? (1 - t * t) / (1 + t * t) : -1;
      return mz + 0.05 * rng.normal();
    });
    const a = fitProfile({ x, y: y360 }, "wall360-mz", { start: { x0: 0, R: 25 * nm, w: 10 * nm, offset: 0, contrast: 1 } });
    const b = fitProfile({ x, y: y360 }, "wall180-mz", { start: { x0: 0, Delta: 10 * nm, offset: 0, contrast: 1 } });
    expect(a.aic).toBeLessThan(b.aic);
    expect(a.bic).toBeLessThan(b.bic);
    // Source: definitions AIC = -2 ln L + 2K, BIC = -2 ln L + K ln n (Akaike 1974; Schwarz 1978),
    // ML variance counted as a parameter
    const n = x.length;
    const rss = a.chiSquare;
    expect(a.aic).toBeCloseTo(n * Math.log((2 * Math.PI * rss) / n) + n + 2 * 6, 8);
    expect(a.bic).toBeCloseTo(n * Math.log((2 * Math.PI * rss) / n) + n + 6 * Math.log(n), 8);
  });
  it("bounds: a parameter ending on its bound has no standard error and is reported", () => {
    const d = wall(0, 10 * nm, 0, 1, 8);
    const r = fitProfile(d, "wall180-mz", { start: { x0: 0, Delta: 20 * nm, offset: 0, contrast: 1 }, bounds: { Delta: [15 * nm, 40 * nm] } });
    expect(r.status).toBe("converged");
    expect(r.parameters.Delta.atBound).toBe(true);
    expect(r.parameters.Delta.value).toBe(15 * nm);
    expect(r.parameters.Delta.stderr).toBeNull();
    expect(r.notes.join()).toMatch(/Delta ended on its bound/);
    expect(r.freeNames).toEqual(["x0", "offset", "contrast"]);
  });
});
