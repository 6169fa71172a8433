import { describe, expect, it } from "vitest";
import { trig2, trig2Critical, trig2Derivative, trig2Extremes, type Trig2 } from "../../../lib/src/dynamics/trig2.js";
import { runPython } from "../../helpers/python.js";

describe("degree-two trigonometric polynomials", () => {
  const polys: Trig2[] = [
    [0.3, 1, -0.5, 0.2, 0.7],
    [0, 0, 1, 0, -0.25], // DMI-dominated restoring torque
    [0, 0, 0.1, 0, -1], // shape-dominated: four extrema
    [1e9, -2e9, 3e9, 1e8, -5e8], // rates in 1/s
    [2, 0, 0, 0, 0], // constant
  ];
  it("extremes agree with numpy on a grid of 2 million points, and critical points have p' = 0", () => {
    // Source: numpy (Debian) brute-force maximum on a fine grid, an independent route.
    const py = runPython<Array<[number, number]>>(
      `
import json, sys, numpy as np
ps = json.load(sys.stdin)
x = np.linspace(0, 2*np.pi, 2000001)
out = []
for p in ps:
    v = p[0] + p[1]*np.cos(x) + p[2]*np.sin(x) + p[3]*np.cos(2*x) + p[4]*np.sin(2*x)
    out.append([float(v.max()), float(v.min())])
print(json.dumps(out))
`,
      polys,
    );
    polys.forEach((p, i) => {
      const ex = trig2Extremes(p);
      const scale = Math.abs(p[0]) + Math.abs(p[1]) + Math.abs(p[2]) + Math.abs(p[3]) + Math.abs(p[4]);
      // the grid misses the true extremum by at most ~ p'' h^2 / 8 (h = 3e-6)
      expect(ex.max).toBeGreaterThanOrEqual(py[i]![0] - 1e-13 * scale);
      expect(ex.max - py[i]![0]).toBeLessThan(1e-10 * scale);
      expect(py[i]![1] - ex.min).toBeLessThan(1e-10 * scale);
      expect(ex.min).toBeLessThanOrEqual(py[i]![1] + 1e-13 * scale);
      expect(trig2(p, ex.argMax)).toBeCloseTo(ex.max, 12);
      for (const c of trig2Critical(p)) expect(Math.abs(trig2Derivative(p, c.phi))).toBeLessThan(1e-12 * scale);
    });
    expect(trig2Critical(polys[2]!).length).toBe(4);
    expect(trig2Critical(polys[4]!).length).toBe(0);
  });
});
