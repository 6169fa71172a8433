import { describe, expect, it } from "vitest";
import { stevensFactors, InputError } from "@helicoid/lib";

describe("Stevens factors computed from the 4f^n Hund's-rule states", () => {
  it("agree with the published fractions", () => {
    // From memory: M. Hutchings, Solid State Physics 16, 227 (1964), table of alpha_J, beta_J,
    // gamma_J (also J. Jensen, A. Mackintosh, Rare Earth Magnetism (1991), table 1.x). The library
    // computes them from Slater determinants, independently of any table.
    const table: Record<number, [number, number, number]> = {
      1: [-2 / 35, 2 / 315, 0],
      2: [-52 / 2475, -4 / 5445, 272 / 4459455],
      3: [-7 / 1089, -136 / 467181, -1615 / 42513471],
      5: [13 / 315, 26 / 10395, 0],
      8: [-1 / 99, 2 / 16335, -1 / 891891],
      9: [-2 / 315, -8 / 135135, 4 / 3864861],
      10: [-1 / 450, -1 / 30030, -5 / 3864861],
      11: [4 / 1575, 2 / 45045, 8 / 3864861],
      12: [1 / 99, 8 / 49005, -5 / 891891],
      13: [2 / 63, -2 / 1155, 4 / 27027],
    };
    for (const [n, [a, b, g]] of Object.entries(table)) {
      const f = stevensFactors(Number(n));
      expect(f.alpha, `4f^${n} alpha`).toBeCloseTo(a, 9);
      expect(f.beta / (b || 1), `4f^${n} beta`).toBeCloseTo(b ? 1 : 0, 8);
      if (g === 0) expect(Math.abs(f.gamma)).toBeLessThan(1e-12);
      else expect(f.gamma / g, `4f^${n} gamma`).toBeCloseTo(1, 8);
    }
  });

  it("vanish for the half-filled shell (an S state) and refuse J = 0", () => {
    // Source: an L = 0 multiplet has no orbital asphericity (common practice).
    const gd = stevensFactors(7);
    for (const v of [gd.alpha, gd.beta, gd.gamma]) expect(Math.abs(v)).toBeLessThan(1e-12);
    expect(() => stevensFactors(6)).toThrow(InputError);
  });
});
