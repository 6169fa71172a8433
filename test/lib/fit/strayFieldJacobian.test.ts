/**
 * The analytic Jacobian of the Fourier-space stray-field models (derivatives taken through the FFT:
 * the spectrum is linear in the transformed magnetization) against central differences of the
 * model itself, for every parameter, B_z and B_x, 180- and 360-degree walls, with and without blur.
 * Common practice, no source (a derivative check; the model values are checked against a direct
 * dipole sum in strayField.test.ts).
 */
import { describe, it, expect } from "vitest";
import { getProfileModel } from "../../../lib/src/fit/profileModels.js";

const nm = 1e-9;

function check(id: string, p: Float64Array) {
  const model = getProfileModel(id);
  const x = Float64Array.from({ length: 301 }, (_, i) => (-300 + 2 * i + 0.37) * nm);
  const bound = model.bind(x, p);
  const m = x.length;
  const n = p.length;
  const J = new Float64Array(m * n);
  bound.jacobian!(p, J);
  const a = new Float64Array(m);
  const b = new Float64Array(m);
  const f0 = new Float64Array(m);
  bound.model(p, f0);
  const peak = Math.max(...f0.map(Math.abs));
  model.parameters.forEach((par, j) => {
    if (par.name === "blur" && p[j] === 0) {
      // d/ds exp(-k^2 s^2 / 2) = 0 at s = 0: the column is exactly zero. (No difference check
      // here: at s = 0 the 180-degree model adds the step field exactly at the data points, for
      // s > 0 through the grid, so a one-sided difference sees the discretization, not a slope.)
      // (zero up to the round-off of the column it shares an inverse FFT with, ~1e-19 T/m here)
      for (let i = 0; i < m; i++) expect(Math.abs(J[j * m + i])).toBeLessThan(1e-12);
      return;
    }
    const h = 1e-5 * Math.max(Math.abs(p[j]), par.typical ?? 1);
    const q = Float64Array.from(p);
    // on a lower bound (blur = 0): one-sided second-order difference (-3 f0 + 4 f1 - f2) / (2 h)
    const oneSided = par.min !== undefined && p[j] - h < par.min;
    q[j] = p[j] + h;
    bound.model(q, a);
    q[j] = oneSided ? p[j] + 2 * h : p[j] - h;
    bound.model(q, b);
    let err = 0;
    let scale = 0;
    for (let i = 0; i < m; i++) {
      const fd = oneSided ? (-3 * f0[i] + 4 * a[i] - b[i]) / (2 * h) : (a[i] - b[i]) / (2 * h);
      err = Math.max(err, Math.abs(J[j * m + i] - fd));
      scale = Math.max(scale, Math.abs(fd));
    }
    // relative to the column's largest entry; a column that is zero (blur at 0) must be zero
    const tol = 1e-5 * Math.max(scale, (1e-9 * peak) / Math.max(Math.abs(p[j]), par.typical ?? 1));
    expect(err, `${id}: d/d${par.name} (max |FD| ${scale.toExponential(2)})`).toBeLessThanOrEqual(tol);
  });
}

describe("stray-field models: analytic Jacobian = central differences", () => {
  for (const component of ["bz", "bx"]) {
    for (const blur of [0, 20 * nm]) {
      it(`180-degree wall, ${component}, blur ${blur / nm} nm`, () => {
        // x0, Delta, neel, h, t, Ms, blur, offset
        check(`wall180-${component}`, Float64Array.from([7 * nm, 15 * nm, 0.6, 40 * nm, 1.5 * nm, 8e5, blur, 1e-4]));
      });
      it(`360-degree wall, ${component}, blur ${blur / nm} nm`, () => {
        // x0, R, w, neel, h, t, Ms, blur, offset
        check(`wall360-${component}`, Float64Array.from([-5 * nm, 40 * nm, 12 * nm, -0.7, 35 * nm, 1.2 * nm, 9e5, blur, -2e-4]));
      });
    }
  }
});
