import { describe, expect, it } from "vitest";
import { minimize2d } from "@helicoid/lib/internal";
import { runPython } from "../../helpers/python.js";

describe("minimize2d", () => {
  it("finds the Rosenbrock minimum (1, 1)", () => {
    // Source: H. Rosenbrock, Comput. J. 3, 175 (1960): minimum at (1, 1), value 0.
    const r = minimize2d((x, y) => 100 * (y - x * x) ** 2 + (1 - x) ** 2, [-1.2, 1]);
    expect(r.success).toBe(true);
    expect(r.x[0]).toBeCloseTo(1, 6);
    expect(r.x[1]).toBeCloseTo(1, 6);
  });
  it("agrees with scipy.optimize.minimize on a skewed, badly scaled bowl", () => {
    const f = (x: number, y: number) => Math.exp(0.3 * x) + Math.exp(-0.5 * x) + 40 * (y - 0.2 * x) ** 2 + 1e-3 * Math.cosh(y - 3);
    const ours = minimize2d(f, [5, -4]);
    // Source: scipy.optimize.minimize (BFGS), run as an oracle.
    const ref = runPython<number[]>(
      "import json,numpy as np; from scipy.optimize import minimize; " +
        "f=lambda p: np.exp(0.3*p[0])+np.exp(-0.5*p[0])+40*(p[1]-0.2*p[0])**2+1e-3*np.cosh(p[1]-3); " +
        "r=minimize(f,[5,-4],method='BFGS',options=dict(gtol=1e-12)); print(json.dumps(list(r.x)))",
    );
    expect(ours.x[0]).toBeCloseTo(ref[0]!, 5);
    expect(ours.x[1]).toBeCloseTo(ref[1]!, 5);
  });
  it("treats non-finite values as a wall and reports when it runs out of evaluations", () => {
    const r = minimize2d((x, y) => (x <= 0 ? Number.NaN : (Math.log(x) - 1) ** 2 + y * y), [0.5, 1]);
    expect(r.x[0]).toBeCloseTo(Math.E, 5);
    const short = minimize2d((x, y) => 100 * (y - x * x) ** 2 + (1 - x) ** 2, [-1.2, 1], { maxEvaluations: 20 });
    expect(short.status).toBe("max-evaluations");
    expect(short.success).toBe(false);
  });
});
