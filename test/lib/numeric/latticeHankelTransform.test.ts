import { describe, expect, it } from "vitest";
import { latticeHankel0, InputError } from "@helicoid/lib/internal";
import { runPython } from "../../helpers/python.js";

describe("lattice (2D trapezoid) order-0 Hankel transform", () => {
  it("reproduces closed-form transforms: Gaussian and exp(-c sqrt(r^2 + b^2)) / sqrt(r^2 + b^2)", () => {
    // Source: I. Gradshteyn, I. Ryzhik, Table of Integrals, 6.631.4 (Int exp(-r^2/2) J0(q r) r dr = exp(-q^2/2))
    // and 6.637.1 (Int J0(q r) r exp(-c sqrt(r^2 + b^2)) / sqrt(r^2 + b^2) dr = exp(-b sqrt(q^2 + c^2)) / sqrt(q^2 + c^2)).
    const q = Float64Array.from([0.01, 0.3, 1, 2.5, 4, 6]);
    const b = 0.5;
    const c = 1;
    const sampler = {
      count: 2,
      sample(r: number, out: Float64Array) {
        out[0] = Math.exp(-0.5 * r * r);
        const s = Math.sqrt(r * r + b * b);
        out[1] = Math.exp(-c * s) / s;
      },
      // branch points at r = +-i b: h = 2 pi b / 40; along y the strip is sqrt(x^2 + b^2)
      yStep: (x: number) => Math.min(2, (2 * Math.PI * Math.sqrt(x * x + b * b)) / 36),
    };
    const g = latticeHankel0(sampler, (2 * Math.PI * b) / 40, 40, q);
    q.forEach((qq, i) => {
      expect(Math.abs(g[0]![i]! - Math.exp(-0.5 * qq * qq)), `gauss q=${qq}`).toBeLessThan(1e-12);
      const k = Math.sqrt(qq * qq + c * c);
      expect(Math.abs(g[1]![i]! - Math.exp(-b * k) / k), `exp-sqrt q=${qq}`).toBeLessThan(1e-12);
    });
  });

  it("agrees with scipy.integrate.quad of f(r) J0(q r) r for the ansatz profile 2 S / (sinh^2 r + S)", () => {
    // Source: scipy.integrate.quad with scipy.special.j0 (Debian's scipy 1.10) as an independent oracle.
    const a = 0.6;
    const S = Math.sinh(a) ** 2;
    const qs = [0.05, 0.5, 2, 5, 9];
    const d = Math.asin(Math.sinh(a));
    const sampler = {
      count: 1,
      sample(x: number, out: Float64Array) {
        out[0] = (2 * S) / (Math.sinh(x) ** 2 + S);
      },
      yStep: (x: number) => Math.min(1.5, (2 * Math.PI * Math.sqrt(x * x + d * d)) / 30),
    };
    const r = latticeHankel0(sampler, (2 * Math.PI * d) / 34, 30, qs)[0]!;
    const ref = runPython<number[]>(
      `
import json, sys, numpy as np
from scipy.integrate import quad
from scipy.special import j0
c = json.load(sys.stdin)
S = c["S"]
f = lambda x, q: 2 * S / (np.sinh(x) ** 2 + S) * j0(q * x) * x
out = []
for q in c["q"]:
    edges = np.linspace(0.0, 40.0, 401)
    out.append(sum(quad(f, lo, hi, args=(q,), epsabs=1e-15, epsrel=1e-13)[0] for lo, hi in zip(edges[:-1], edges[1:])))
print(json.dumps(out))
`,
      { S, q: qs },
    );
    qs.forEach((q, i) => expect(Math.abs(r[i]! - ref[i]!), `q = ${q}`).toBeLessThan(1e-11));
  });

  it("rejects bad spacing, radius and count", () => {
    const s = {
      count: 1,
      sample(_r: number, out: Float64Array) {
        out[0] = 0;
      },
    };
    expect(() => latticeHankel0(s, 0, 10, [1])).toThrow(InputError);
    expect(() => latticeHankel0(s, 0.1, 0.05, [1])).toThrow(InputError);
    expect(() => latticeHankel0({ ...s, count: 0 }, 0.1, 10, [1])).toThrow(InputError);
    expect(() => latticeHankel0({ ...s, yStep: () => -1 }, 0.1, 10, [1])).toThrow(InputError);
  });
});
