import { describe, expect, it } from "vitest";
import { ellipticK, ellipticE, completeEllipticIntegrals, InputError } from "@helicoid/lib/internal";
import { runPython } from "../../helpers/python.js";

describe("complete elliptic integrals", () => {
  it("agree with scipy.special.ellipkm1 / ellipe (parameters 1 - k^2 and k^2)", () => {
    const ks = [0, 1e-6, 0.1, 0.3, 0.5, 0.7, 0.9, 0.99, 0.999999];
    // Source: scipy.special (Cephes), run as an oracle.
    const ref = runPython<{ K: number[]; E: number[] }>(
      "import json,sys; from scipy.special import ellipkm1, ellipe; k=json.load(sys.stdin); " +
        "print(json.dumps({'K':[float(ellipkm1((1-x)*(1+x))) for x in k],'E':[float(ellipe(x*x)) for x in k]}))",
      ks,
    );
    ks.forEach((k, i) => {
      expect(Math.abs(ellipticK(k) / ref.K[i]! - 1)).toBeLessThan(1e-13);
      expect(Math.abs(ellipticE(k) / ref.E[i]! - 1)).toBeLessThan(1e-13);
    });
  });
  it("has the exact end values and refuses |k| > 1", () => {
    // Source: Abramowitz and Stegun 17.3: K(0) = E(0) = pi/2, E(1) = 1, K(1) diverges.
    expect(ellipticK(0)).toBe(Math.PI / 2);
    expect(ellipticE(0)).toBe(Math.PI / 2);
    expect(completeEllipticIntegrals(1)).toEqual({ K: Infinity, E: 1 });
    expect(() => ellipticK(1.5)).toThrow(InputError);
  });
});
