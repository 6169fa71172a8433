import { describe, expect, it } from "vitest";
import { makeFilm, criticalDmi, solveSkyrmionExact, solveSkyrmionAnsatz, skyrmionEnergy, ConvergenceError, InputError } from "@helicoid/lib";
import { runPython } from "../../helpers/python.js";

const base = { Ms: 1.1e6, A: 15e-12, Ku: 1.2e6, D: 2e-3, t: 1e-9 };

// The same dimensionless boundary-value problem for scipy: y = (theta, theta'), x in [x0, L],
// theta(x0) - pi - x0 theta'(x0) = 0 (regular expansion theta = pi + c x + O(x^3)), theta(L) = 0.
const SCIPY_BVP = `
import json, sys, numpy as np
from scipy.integrate import solve_bvp
from scipy.optimize import brentq
out = []
for c in json.load(sys.stdin):
    d, b, L = c["d"], c["b"], c["L"]
    x0 = 1e-3
    def f(x, y):
        s, co = np.sin(y[0]), np.cos(y[0])
        return np.vstack([y[1], -y[1] / x + s * co / x**2 + s * co - d * s**2 / x + b * s])
    def bc(ya, yb):
        return np.array([ya[0] - np.pi - x0 * ya[1], yb[0]])
    x = np.array(c["x"]); x[0] = x0
    th = np.array(c["theta"]); dth = np.gradient(th, x)
    sol = solve_bvp(f, bc, x, np.vstack([th, dth]), tol=c["tol"], max_nodes=100000)
    g = lambda z: sol.sol(z)[0] - np.pi / 2
    xs = sol.x
    i = np.where((sol.y[0][:-1] >= np.pi / 2) & (sol.y[0][1:] < np.pi / 2))[0][0]
    out.append({"status": int(sol.status), "radius": brentq(g, xs[i], xs[i + 1], xtol=1e-14)})
print(json.dumps(out))
`;

describe("exact radial skyrmion profile", () => {
  const cases = [
    { D: 2e-3, B: 0 },
    { D: 2e-3, B: 0.05 },
    { D: 2.8e-3, B: 0.02 },
    { D: 1.5e-3, B: 0.1 },
  ];
  const films = cases.map((c) => makeFilm({ ...base, D: c.D }));
  const sols = cases.map((c, i) => solveSkyrmionExact(films[i]!, c.B));
  it("agrees with scipy.integrate.solve_bvp on the same problem: radius to 1e-4 relative", () => {
    // Source: scipy.integrate.solve_bvp (Debian's scipy 1.10), collocation with tol 1e-8, as an oracle.
    const input = sols.map((s) => {
      const Delta = Math.sqrt(s.rho[1]! ** 2) / s.step; // rho step / x step
      const x: number[] = [];
      const theta: number[] = [];
      for (let i = 0; i < s.theta.length; i += 10) {
        x.push(s.rho[i]! / Delta);
        theta.push(s.theta[i]!);
      }
      return { d: s.d, b: s.b, L: s.length, x, theta, tol: 1e-8 };
    });
    const ref = runPython<Array<{ status: number; radius: number }>>(SCIPY_BVP, input);
    sols.forEach((s, i) => {
      const Delta = s.rho[1]! / s.step;
      expect(ref[i]!.status, `scipy status, case ${i}`).toBe(0);
      expect(Math.abs(s.radius / (ref[i]!.radius * Delta) - 1), `case ${i}`).toBeLessThan(1e-4);
    });
  });
  it("has an energy below the minimized ansatz energy (variational bound), and close to it", () => {
    // Common practice, no source: the exact minimizer of the functional lies below any trial family.
    sols.forEach((s, i) => {
      const an = solveSkyrmionAnsatz(films[i]!, cases[i]!.B, { nonlocal: false });
      expect(an.status).toBe("ok");
      expect(s.energy).toBeLessThan(an.energy.total);
      expect(s.energy / an.energy.total).toBeGreaterThan(0.98);
      // energy of the interpolated exact profile through the generic functional agrees
      const e = skyrmionEnergy(films[i]!, cases[i]!.B, s.profile, { nonlocal: false });
      expect(e.total / s.energy).toBeCloseTo(1, 4);
      expect(Math.abs(an.radius / s.radius - 1)).toBeLessThan(0.05);
    });
  });
  it("above D_c: solves the isolated skyrmion above B_sat (R = 5.35 nm at D = 1.10 D_c, 0.3 T, as scipy's solve_bvp), reports the spiral below", () => {
    // Source: A. Bogdanov, A. Hubert, JMMM 138, 255 (1994) (isolated skyrmions above the saturation
    // field for D > D_c); oracle: scipy.integrate.solve_bvp of the same radial equation (SCIPY_BVP above),
    // and the independent audit value R = 5.35 nm for this film (the demo film with D = 3.6 mJ/m^2).
    const f = makeFilm({ ...base, D: 3.6e-3 });
    expect(f.D / criticalDmi(f)).toBeCloseTo(1.1009, 4);
    const s = solveSkyrmionExact(f, 0.3);
    expect(s.status).toBe("ok");
    expect(s.radius * 1e9).toBeCloseTo(5.35, 2);
    expect(s.notes.join(" ")).toMatch(/B > B_sat/);
    const Delta = s.rho[1]! / s.step;
    const x: number[] = [];
    const theta: number[] = [];
    for (let i = 0; i < s.theta.length; i += 10) {
      x.push(s.rho[i]! / Delta);
      theta.push(s.theta[i]!);
    }
    const ref = runPython<Array<{ status: number; radius: number }>>(SCIPY_BVP, [{ d: s.d, b: s.b, L: s.length, x, theta, tol: 1e-8 }]);
    expect(ref[0]!.status).toBe(0);
    expect(Math.abs(s.radius / (ref[0]!.radius * Delta) - 1)).toBeLessThan(1e-4);
    const below = solveSkyrmionExact(f, 0.02);
    expect(below.status).toBe("spiral");
    expect(below.notes.join(" ")).toMatch(/B_sat = 28\.09 mT/);
  });
  it("reports the spiral at D >= D_c, a ConvergenceError with diagnostics on collapse, InputError for in-plane films", () => {
    // Source: S. Rohart, A. Thiaville, PRB 88, 184422 (2013) (D_c).
    const f = makeFilm({ ...base });
    const sp = solveSkyrmionExact(makeFilm({ ...base, D: 1.01 * criticalDmi(f) }), 0); // B = 0 < B_sat
    expect(sp.status).toBe("spiral");
    expect(sp.spiralPeriod!).toBeGreaterThan(0);
    const weak = makeFilm({ ...base, D: 0.5e-3 });
    let err: unknown;
    try {
      solveSkyrmionExact(weak, 0.2);
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(ConvergenceError);
    expect(Object.keys((err as ConvergenceError).diagnostics)).toContain("B");
    expect(() => solveSkyrmionExact(makeFilm({ ...base, Ku: 0.7e6 }), 0)).toThrow(InputError);
  });
});
