import { describe, expect, it } from "vitest";
import { brentMinimize, InputError } from "@helicoid/lib/internal";
import { runPython } from "../../helpers/python.js";

describe("brentMinimize", () => {
  it("finds the same minima as scipy.optimize.minimize_scalar (bounded)", () => {
    // Source: scipy.optimize.minimize_scalar(method="bounded") in Debian's scipy 1.10, run as an oracle.
    const ref = runPython<number[]>(`
import json, numpy as np
from scipy.optimize import minimize_scalar
fs = [lambda x: (x - 1.3)**2 + 0.1*np.sin(5*x), lambda x: np.cosh(x - 0.2) + x**4, lambda x: -np.exp(-x**2) * (2 + np.cos(x))]
b = [(0, 3), (-2, 2), (-1, 1.5)]
print(json.dumps([minimize_scalar(f, bounds=bb, method="bounded", options={"xatol": 1e-12}).x for f, bb in zip(fs, b)]))
`);
    const fs = [(x: number) => (x - 1.3) ** 2 + 0.1 * Math.sin(5 * x), (x: number) => Math.cosh(x - 0.2) + x ** 4, (x: number) => -Math.exp(-x * x) * (2 + Math.cos(x))];
    const b: Array<[number, number]> = [
      [0, 3],
      [-2, 2],
      [-1, 1.5],
    ];
    fs.forEach((f, i) => {
      const r = brentMinimize(f, b[i]![0], b[i]![1], 1e-12);
      expect(r.converged).toBe(true);
      expect(Math.abs(r.x - ref[i]!)).toBeLessThan(1e-7);
    });
  });
  it("rejects an empty bracket", () => {
    expect(() => brentMinimize((x) => x * x, 1, 1)).toThrow(InputError);
  });
});
