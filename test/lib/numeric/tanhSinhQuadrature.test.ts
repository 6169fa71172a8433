import { describe, expect, it } from "vitest";
import { integrateInterval, integrateHalfLine, ConvergenceError } from "@helicoid/lib/internal";
import { runPython } from "../../helpers/python.js";

describe("double-exponential quadrature", () => {
  it("integrates closed forms to near machine precision", () => {
    // Source: elementary calculus (closed forms).
    expect(integrateInterval(Math.sin, 0, Math.PI).value).toBeCloseTo(2, 13);
    expect(integrateInterval((x) => 1 / Math.sqrt(x), 0, 1).value).toBeCloseTo(2, 10); // endpoint singularity
    expect(integrateHalfLine((x) => Math.exp(-x), 0).value).toBeCloseTo(1, 13);
    // Integral_0^inf x sech^2 x dx = ln 2 (Gradshteyn-Ryzhik 3.527)
    expect(integrateHalfLine((x) => x / Math.cosh(x) ** 2, 0).value).toBeCloseTo(Math.LN2, 13);
  });
  it("agrees with scipy.integrate.quad on a wall-like integrand", () => {
    const ours = integrateHalfLine((x) => (1 - (1 - Math.exp(-0.3 * x)) / (0.3 * x)) / Math.cosh(x) ** 2, 0).value;
    // Source: scipy.integrate.quad (QUADPACK), run as an oracle.
    const ref = runPython<number>(
      "import json,sys,numpy as np; from scipy.integrate import quad; " +
        "print(json.dumps(quad(lambda x: (1-(1-np.exp(-0.3*x))/(0.3*x))/np.cosh(x)**2, 0, np.inf, epsabs=0, epsrel=1e-13)[0]))",
    );
    expect(Math.abs(ours / ref - 1)).toBeLessThan(1e-11);
  });
  it("says so when the integrand is not finite", () => {
    expect(() => integrateInterval(() => Number.NaN, 0, 1)).toThrow(ConvergenceError);
  });
});
