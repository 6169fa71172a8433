// The real dilogarithm (lib/src/numeric/dilogarithm.ts) against scipy and mpmath.
import { describe, expect, it } from "vitest";
import { dilogarithm } from "../../../lib/src/numeric/dilogarithm.js";
import { InputError } from "../../../lib/src/errors.js";
import { runPython } from "../../helpers/python.js";

describe("dilogarithm Li2(x), x <= 1", () => {
  it("agrees with scipy.special.spence and mpmath.polylog on every branch of the method", () => {
    // Source: scipy.special.spence (Debian scipy 1.10): Li2(x) = spence(1 - x); mpmath.polylog(2, x) at
    // 30 digits. Points on the series branch (-1 <= x <= 1/2), both reflections and the joins.
    const xs = [-7.5, -1e3, -1.0000001, -1, -0.9999999, -0.4, -1e-3, -1e-12, 0, 0.2, 0.5, 0.5000001, 0.9, 0.999999, 1];
    const ref = runPython<{ sp: number[]; mp: number[] }>(
      `
import json, sys, mpmath as mp
from scipy.special import spence
mp.mp.dps = 30
xs = json.load(sys.stdin)
print(json.dumps({"sp": [float(spence(1 - x)) for x in xs], "mp": [float(mp.polylog(2, mp.mpf(x))) for x in xs]}))`,
      xs,
    );
    xs.forEach((x, i) => {
      const v = dilogarithm(x);
      const tol = 1e-14 * Math.max(1, Math.abs(ref.mp[i]!));
      expect(Math.abs(v - ref.sp[i]!)).toBeLessThan(tol);
      expect(Math.abs(v - ref.mp[i]!)).toBeLessThan(tol);
    });
  });

  it("rejects x > 1 and non-finite x, naming the parameter", () => {
    // Common practice, no source: the real dilogarithm is defined for x <= 1 only.
    for (const x of [1.5, Number.NaN, Infinity]) {
      expect(() => dilogarithm(x)).toThrow(InputError);
      expect(() => dilogarithm(x)).toThrow(/x/);
    }
  });
});
