/**
 * Analytic Jacobians of the m_z contrast models against central differences of the model, on a
 * grid that contains the core (x = x0 exactly) and far tails. Common practice, no source.
 */
import { describe, it, expect } from "vitest";
import { getProfileModel } from "../../../lib/src/fit/profileModels.js";

const nm = 1e-9;

function check(id: string, p: number[]) {
  const model = getProfileModel(id);
  const x = Float64Array.from({ length: 401 }, (_, i) => (-2000 + 10 * i) * nm + p[0]); // x0 on the grid
  const P = Float64Array.from(p);
  const bound = model.bind(x, P);
  const m = x.length;
  const J = new Float64Array(m * P.length);
  // evaluate the model elsewhere first, so a cache keyed on the last point is exercised
  const tmp = new Float64Array(m);
  bound.model(Float64Array.from(p.map((v, j) => (j === 0 ? v + 3 * nm : v))), tmp);
  bound.jacobian!(P, J);
  const a = new Float64Array(m);
  const b = new Float64Array(m);
  model.parameters.forEach((par, j) => {
    const h = 1e-6 * Math.max(Math.abs(P[j]), par.typical ?? 1);
    const q = Float64Array.from(P);
    q[j] = P[j] + h;
    bound.model(q, a);
    q[j] = P[j] - h;
    bound.model(q, b);
    let err = 0;
    let scale = 0;
    for (let i = 0; i < m; i++) {
      // the m_z cusp at x = x0 has no derivative in x0 (one-sided slopes +-): skip that point there
      if (j === 0 && x[i] === P[0]) continue;
      const fd = (a[i] - b[i]) / (2 * h);
      err = Math.max(err, Math.abs(J[j * m + i] - fd));
      scale = Math.max(scale, Math.abs(fd));
    }
    expect(err, `${id} d/d${par.name}`).toBeLessThanOrEqual(1e-6 * scale);
  });
}

describe("analytic Jacobians of the contrast models", () => {
  it("wall180-mz", () => check("wall180-mz", [5 * nm, 12 * nm, 0.1, 0.8]));
  it("wall360-mz, moderate and large R / w", () => {
    check("wall360-mz", [7 * nm, 35 * nm, 11 * nm, 0.05, 0.9]);
    check("wall360-mz", [-3 * nm, 400 * nm, 4 * nm, -0.1, 1.1]);
  });
});
