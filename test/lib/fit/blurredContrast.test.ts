/**
 * The blurred contrast models (wall180-mz-blur, wall360-mz-blur): the model against a direct
 * numerical convolution done by numpy, blur = 0 against the unblurred model, and fits from the
 * default start on blurred data.
 */
import { describe, expect, it } from "vitest";
import { getProfileModel } from "../../../lib/src/fit/profileModels.js";
import { fitProfile } from "../../../lib/src/fit/fitProfile.js";
import { syntheticProfile } from "../../../lib/src/fit/syntheticProfiles.js";
import { guessStart } from "../../../lib/src/fit/startGuess.js";
import { runPython } from "../../helpers/python.js";

const nm = 1e-9;
const evalModel = (id: string, x: number[], p: number[]) => {
  const m = getProfileModel(id);
  const pv = Float64Array.from(p);
  const out = new Float64Array(x.length);
  m.bind(Float64Array.from(x), pv).model(pv, out);
  return Array.from(out);
};

describe("blurred m_z contrast models", () => {
  it("equal a direct numerical convolution of the wall profile with a Gaussian (numpy)", () => {
    // Source: the models are offset + contrast * (m_z * G_blur); oracle: numpy trapezoid quadrature
    // of m_z(x - s) G(s) on a 0.005 nm grid over +-8 blur, with the closed-form m_z of each wall:
    // 180: m_z = -tanh((x - x0)/Delta); 360 (ansatz): tan(theta/2) = sinh(R/w)/sinh(|x - x0|/w).
    const x = Array.from({ length: 97 }, (_, i) => (-60 + 1.25 * i + 0.37) * nm); // off any grid
    const cases = [
      { id: "wall180-mz-blur", p: [3.3 * nm, 7.5 * nm, 0.1, -0.8, 4 * nm] },
      { id: "wall180-mz-blur", p: [-2.1 * nm, 3 * nm, 0, 1, 9 * nm] },
      { id: "wall360-mz-blur", p: [1.7 * nm, 20 * nm, 8 * nm, 0.05, 0.9, 6 * nm] },
    ];
    const ref = runPython(
      `
import json, sys, numpy as np
d = json.load(sys.stdin); out = []
for c in d["cases"]:
    p = c["p"]; x = np.array(d["x"]); blur = p[-1]
    s = np.arange(-8 * blur, 8 * blur + 1e-21, 0.005e-9)
    g = np.exp(-0.5 * (s / blur) ** 2); g /= np.trapz(g, s)
    u = x[:, None] - s[None, :] - p[0]
    if c["id"].startswith("wall180"):
        mz = -np.tanh(u / p[1]); off, con = p[2], p[3]
    else:
        R, w = p[1], p[2]
        t = np.sinh(R / w) / np.sinh(np.maximum(np.abs(u), 1e-30) / w)
        mz = (1 - t * t) / (1 + t * t); off, con = p[3], p[4]
    out.append((off + con * np.trapz(mz * g[None, :], s, axis=1)).tolist())
print(json.dumps(out))`,
      { x, cases },
    ) as number[][];
    cases.forEach((c, k) => {
      const ours = evalModel(c.id, x, c.p);
      const err = Math.max(...ours.map((v, i) => Math.abs(v - ref[k]![i]!)));
      expect(err, c.id).toBeLessThan(2e-4);
    });
  });

  it("blur = 0 reproduces the unblurred wall fit (the centre is not pinned to the model's grid)", () => {
    // Common practice, no source: a zero-width blur is the identity; oracle: the unblurred model's fit
    // (itself checked against scipy least_squares in scipyOracle.test.ts).
    for (const x0 of [3.4 * nm, -1.15 * nm]) {
      const d = syntheticProfile("wall180-mz", { x0, Delta: 7.5 * nm, offset: 0.1, contrast: -0.8 }, { seed: 21, noise: 0.02, points: 121, span: 120 * nm });
      const data = { x: d.x, y: d.y, sigma: d.sigma };
      // the same start for both (the guess for a blurred model narrows the wall to leave room for a blur)
      const start = guessStart(getProfileModel("wall180-mz"), d.x, d.y);
      const plain = fitProfile(data, "wall180-mz", { start });
      const blurred = fitProfile(data, "wall180-mz-blur", { start, fixed: { blur: 0 } });
      expect(blurred.status).toBe("converged");
      for (const name of ["x0", "Delta", "offset", "contrast"]) {
        const a = plain.parameters[name]!,
          b = blurred.parameters[name]!;
        expect(Math.abs(b.value - a.value), name).toBeLessThan(2e-3 * a.stderr!);
        expect(Math.abs(b.stderr! / a.stderr! - 1), name).toBeLessThan(2e-3);
      }
      expect(Math.abs(blurred.chiSquare / plain.chiSquare - 1)).toBeLessThan(1e-4);
    }
  });

  it("fits blurred data from the default start: converged, the truth within 3 standard errors when the blur is known", () => {
    // Common practice, no source: recovery of the parameters used to make the data (model checked
    // against numpy above).
    const truth = { x0: 3.1 * nm, Delta: 7.5 * nm, offset: 0.1, contrast: -0.8, blur: 5 * nm };
    const d = syntheticProfile("wall180-mz-blur", truth, { seed: 5, noise: 0.02, points: 161, span: 160 * nm });
    const data = { x: d.x, y: d.y, sigma: d.sigma };
    const start = guessStart(getProfileModel("wall180-mz-blur"), d.x, d.y);
    expect(start.blur).toBeGreaterThan(0);
    const free = fitProfile(data, "wall180-mz-blur", { start });
    expect(free.status).toBe("converged");
    expect(free.chiSquareReduced).toBeLessThan(1.5);
    const known = fitProfile(data, "wall180-mz-blur", { start, fixed: { blur: truth.blur } });
    expect(known.status).toBe("converged");
    for (const name of ["x0", "Delta", "contrast"] as const) {
      const p = known.parameters[name]!;
      expect(Math.abs(p.value - truth[name]), name).toBeLessThan(3 * p.stderr!);
    }
    // the wall width and the blur trade off: with both free (neither on a bound) their strong
    // anticorrelation is reported, and the truth still lies within 3 (large) standard errors
    expect(free.freeNames).toEqual(["x0", "Delta", "offset", "contrast", "blur"]);
    const iD = free.freeNames.indexOf("Delta"),
      iB = free.freeNames.indexOf("blur");
    expect(free.correlation![iD]![iB]!).toBeLessThan(-0.9);
    for (const name of ["Delta", "blur"] as const) {
      const p = free.parameters[name]!;
      expect(p.atBound).toBe(false);
      expect(Math.abs(p.value - truth[name]), name).toBeLessThan(3 * p.stderr!);
    }
  });
});
