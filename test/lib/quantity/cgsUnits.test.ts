import { describe, expect, it } from "vitest";
import { parseQuantity, InputError, mu0 } from "@helicoid/lib";

describe("customary CGS units", () => {
  it("converts Oe, kOe, gauss, emu/cm^3 and erg/cm^3 to SI", () => {
    // Source: NIST SP 811 (2008), appendix B.9: 1 Oe = (1000 / 4 pi) A/m, 1 G = 1e-4 T,
    // 1 emu/cm^3 = 1000 A/m, 1 erg/cm^3 = 0.1 J/m^3.
    expect(parseQuantity("H", "500 Oe", "A/m")).toBeCloseTo((500 * 1000) / (4 * Math.PI), 9);
    expect(parseQuantity("H", "1 kOe", "A/m")).toBeCloseTo(1e6 / (4 * Math.PI), 6);
    expect(parseQuantity("B", "2 kilogauss", "T")).toBeCloseTo(0.2, 15);
    expect(parseQuantity("Ms", "800 emu/cm^3", "A/m")).toBeCloseTo(8e5, 6);
    expect(parseQuantity("Ku", "1e7 erg/cm^3", "J/m^3")).toBeCloseTo(1e6, 6);
  });
  it("accepts H for a field asked in tesla, via B = mu0 H (1 Oe <-> 0.1 mT)", () => {
    // Source: NIST SP 811 (2008): mu0 * 1 Oe = 1e-4 T (to the accuracy of mu0 = 4 pi 1e-7 N/A^2).
    expect(parseQuantity("B", "500 Oe", "T")).toBeCloseTo((mu0 * 500 * 1000) / (4 * Math.PI), 15);
    expect(Math.abs(parseQuantity("B", "500 Oe", "T") / 0.05 - 1)).toBeLessThan(1e-9);
    expect(parseQuantity("B", "40 kA/m", "T")).toBeCloseTo(mu0 * 4e4, 15);
  });
  it("still refuses wrong dimensions", () => {
    expect(() => parseQuantity("A", "50 Oe", "J/m")).toThrow(InputError);
    expect(() => parseQuantity("H", "50 mT", "A/m")).toThrow(/dimension/);
    expect(() => parseQuantity("B", "5 J/m", "T")).toThrow(/dimension/);
  });
});
