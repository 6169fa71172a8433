import { describe, expect, it } from "vitest";
import { ConvergenceError, InputError } from "@helicoid/lib";
import { integrateDormandPrince } from "../../../lib/src/dynamics/dormandPrince.js";
import { runPython } from "../../helpers/python.js";

describe("Dormand-Prince 5(4) integrator", () => {
  it("integrates the harmonic oscillator to its tolerance, with dense output and events at the zero crossings", () => {
    // Source: exact solution y = cos t, y' = -sin t; zeros of cos t at pi/2 + k pi (textbook).
    const sol = integrateDormandPrince(
      (_t, y, d) => {
        d[0] = y[1]!;
        d[1] = -y[0]!;
      },
      0,
      [1, 0],
      20,
      { rtol: 1e-11, atol: 1e-13, tEval: Array.from({ length: 41 }, (_, i) => i * 0.5), events: [{ g: (_t, y) => y[0]! }] },
    );
    for (let i = 0; i < sol.t.length; i++) {
      expect(Math.abs(sol.y[i]![0]! - Math.cos(sol.t[i]!))).toBeLessThan(1e-9);
      expect(Math.abs(sol.y[i]![1]! + Math.sin(sol.t[i]!))).toBeLessThan(1e-9);
    }
    expect(sol.tEvents[0]!.length).toBe(6);
    sol.tEvents[0]!.forEach((te, k) => expect(Math.abs(te - (Math.PI / 2 + k * Math.PI))).toBeLessThan(1e-9));
  });

  it("the error scales like the tolerance (fifth-order pair, fourth-order dense output)", () => {
    // Source: E. Hairer, S. Norsett, G. Wanner, Solving ODEs I (1993), sec. II.4: the global error follows rtol.
    const errs = [1e-6, 1e-9].map((rtol) => {
      const s = integrateDormandPrince(
        (t, y, d) => {
          d[0] = -2 * t * y[0]!;
        },
        0,
        [1],
        3,
        { rtol, atol: rtol * 1e-3 },
      );
      return Math.abs(s.yEnd[0]! - Math.exp(-9));
    });
    expect(errs[1]!).toBeLessThan(errs[0]! / 50);
    expect(errs[1]!).toBeLessThan(1e-10);
  });

  it("agrees with scipy solve_ivp (RK45, the same pair) on the Lotka-Volterra system, events included", () => {
    // Source: scipy.integrate.solve_ivp (Debian python3-scipy) as the reference implementation.
    const f = (_t: number, y: Float64Array, d: Float64Array): void => {
      d[0] = 1.5 * y[0]! - y[0]! * y[1]!;
      d[1] = -3 * y[1]! + y[0]! * y[1]!;
    };
    const tEval = Array.from({ length: 21 }, (_, i) => i * 0.5);
    const ours = integrateDormandPrince(f, 0, [10, 5], 10, { rtol: 1e-10, atol: 1e-10, tEval, events: [{ g: (_t, y) => y[0]! - 3, direction: 1 }] });
    const py = runPython<{ y: number[][]; te: number[] }>(
      `
import json, sys
from scipy.integrate import solve_ivp
ev = lambda t, y: y[0] - 3
ev.direction = 1
s = solve_ivp(lambda t, y: [1.5*y[0] - y[0]*y[1], -3*y[1] + y[0]*y[1]], [0, 10], [10, 5], method="RK45", rtol=1e-10, atol=1e-10,
              t_eval=[i*0.5 for i in range(21)], events=ev)
print(json.dumps({"y": s.y.T.tolist(), "te": s.t_events[0].tolist()}))
`,
    );
    for (let i = 0; i < tEval.length; i++) {
      for (let k = 0; k < 2; k++) expect(Math.abs(ours.y[i]![k]! - py.y[i]![k]!) / Math.abs(py.y[i]![k]!)).toBeLessThan(2e-7);
    }
    expect(ours.tEvents[0]!.length).toBe(py.te.length);
    ours.tEvents[0]!.forEach((t, i) => expect(Math.abs(t - py.te[i]!)).toBeLessThan(1e-7));
  });

  it("stops at a terminal event and bounds its work", () => {
    // Common practice, no source.
    const s = integrateDormandPrince(
      (_t, _y, d) => {
        d[0] = 1;
      },
      0,
      [0],
      10,
      { events: [{ g: (_t, y) => y[0]! - 2.5, terminal: true }] },
    );
    expect(s.status).toBe("event");
    expect(s.tEnd).toBeCloseTo(2.5, 12);
    expect(() =>
      integrateDormandPrince(
        (_t, y, d) => {
          d[0] = Math.cos(1000 * _t) * 1000;
        },
        0,
        [0],
        100,
        { rtol: 1e-12, maxSteps: 50 },
      ),
    ).toThrow(ConvergenceError);
    expect(() => integrateDormandPrince((_t, _y, d) => (d[0] = 0), 1, [0], 0)).toThrow(InputError);
    expect(() => integrateDormandPrince((_t, _y, d) => (d[0] = 0), 0, [NaN], 1)).toThrow(/y0/);
  });
});
