import { describe, expect, it } from "vitest";
import { besselJ0, besselJ1 } from "@helicoid/lib/internal";
import { runPython } from "../../helpers/python.js";

describe("Bessel J0, J1", () => {
  it("agree with mpmath (50 digits) to 6e-14 absolute on [-10, 150], the measured worst being about 4e-14", () => {
    const xs: number[] = [];
    for (let i = 0; i < 500; i++) xs.push(-10 + i * 0.3203 + 1e-3 * (i % 11));
    xs.push(63.9999, 64, 64.0001);
    // Source: mpmath.besselj (arbitrary precision), Debian's python3-mpmath.
    const ref = runPython<{ j0: number[]; j1: number[] }>(
      `
import json, sys, mpmath as mp
mp.mp.dps = 50
x = json.load(sys.stdin)
print(json.dumps({"j0": [float(mp.besselj(0, mp.mpf(v))) for v in x], "j1": [float(mp.besselj(1, mp.mpf(v))) for v in x]}))
`,
      xs,
    );
    let worst = 0;
    xs.forEach((x, i) => {
      worst = Math.max(worst, Math.abs(besselJ0(x) - ref.j0[i]!), Math.abs(besselJ1(x) - ref.j1[i]!));
    });
    expect(worst).toBeLessThan(6e-14);
  });
  it("agree with scipy.special.j0 / j1 from 0 to 500", () => {
    const xs: number[] = [];
    for (let i = 0; i < 400; i++) xs.push(i * 0.173 + 1e-3 * (i % 7));
    xs.push(63.999, 64, 64.001, 150, 499.5, -3.2, -70.1);
    // Source: scipy.special.j0, j1 (Cephes) in Debian's scipy 1.10, run as an oracle.
    const ref = runPython<{ j0: number[]; j1: number[] }>(
      `
import json, sys, scipy.special as s
x = json.load(sys.stdin)
print(json.dumps({"j0": [float(s.j0(v)) for v in x], "j1": [float(s.j1(v)) for v in x]}))
`,
      xs,
    );
    xs.forEach((x, i) => {
      expect(Math.abs(besselJ0(x) - ref.j0[i]!), `J0(${x})`).toBeLessThan(1e-13);
      expect(Math.abs(besselJ1(x) - ref.j1[i]!), `J1(${x})`).toBeLessThan(1e-13);
    });
  });
  it("satisfy J0(0) = 1 and the Wronskian-type identity J0'(x) = -J1(x)", () => {
    // Source: A&S 9.1.28 (J0' = -J1).
    expect(besselJ0(0)).toBeCloseTo(1, 14);
    for (const x of [0.7, 5.3, 40.2, 80.5]) {
      const h = 1e-5;
      const d = (besselJ0(x + h) - besselJ0(x - h)) / (2 * h);
      expect(Math.abs(d + besselJ1(x))).toBeLessThan(1e-9);
    }
  });
});
