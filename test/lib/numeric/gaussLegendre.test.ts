import { describe, expect, it } from "vitest";
import { gaussLegendre, compositeGaussLegendre, InputError } from "@helicoid/lib/internal";
import { runPython } from "../../helpers/python.js";

describe("Gauss-Legendre rules", () => {
  it("match numpy.polynomial.legendre.leggauss", () => {
    const ns = [1, 2, 5, 8, 10, 21, 40];
    // Source: numpy.polynomial.legendre.leggauss (Debian's numpy 1.24), run as an oracle.
    const ref = runPython<Array<[number[], number[]]>>(
      `
import json, sys, numpy as np
print(json.dumps([[a.tolist() for a in np.polynomial.legendre.leggauss(n)] for n in json.load(sys.stdin)]))
`,
      ns,
    );
    ns.forEach((n, k) => {
      const { x, w } = gaussLegendre(n);
      for (let i = 0; i < n; i++) {
        expect(Math.abs(x[i]! - ref[k]![0][i]!)).toBeLessThan(1e-14);
        expect(Math.abs(w[i]! - ref[k]![1][i]!)).toBeLessThan(1e-14);
      }
    });
  });
  it("integrate on panels: Int_0^pi sin = 2", () => {
    // Common practice, no source: closed-form integral.
    const { x, w } = compositeGaussLegendre([0, 1, 2, Math.PI], 8);
    let s = 0;
    for (let i = 0; i < x.length; i++) s += w[i]! * Math.sin(x[i]!);
    expect(s).toBeCloseTo(2, 14);
    expect(() => compositeGaussLegendre([0, 0], 4)).toThrow(InputError);
  });
});
