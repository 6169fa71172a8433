/**
 * Units round-trip: what the library prints is accepted when typed back (superscripts, the micro
 * sign and the Greek mu, the middle dot), and an energy asked for in kelvin (E / k_B) or joules
 * accepts meV, µeV, GHz and cm⁻¹ through the exact SI constants.
 */
import { describe, expect, it } from "vitest";
import { formatQuantity, parseQuantity } from "@helicoid/lib";

describe("units typed back as printed", () => {
  it("every customary unit printed by formatQuantity parses back to the same SI value", () => {
    const cases: Array<[number, string]> = [
      [1.5e-3, "J/m^2"],
      [2.4e5, "J/m^3"],
      [1.2e6, "J/m^3"],
      [1.5e-11, "J/m"],
      [2e-5, "T"],
      [3.5e-9, "m"],
      [2.5e-6, "m"],
      [3e-10, "m"],
      [8e5, "A/m"],
      [4e-12, "s"],
      [2.5e9, "Hz"],
      [0.02, "K"],
      [0, "J/m^2"],
      [0, "m"],
    ];
    for (const [v, u] of cases) {
      const shown = formatQuantity(v, u, 6);
      expect(shown, `${v} ${u}`).not.toMatch(/\^/); // printed with superscripts
      const back = parseQuantity("x", shown, u);
      expect(Math.abs(back - v) <= 1e-6 * Math.abs(v), `${shown} -> ${back}`).toBe(true);
    }
  });

  it("µ and μ, ², ³, ⁻¹ and the middle dot", () => {
    expect(parseQuantity("B", "20 µT", "T")).toBeCloseTo(2e-5, 18);
    expect(parseQuantity("B", "20 μT", "T")).toBeCloseTo(2e-5, 18);
    expect(parseQuantity("D", "1.5 mJ/m²", "J/m^2")).toBeCloseTo(1.5e-3, 15);
    expect(parseQuantity("Ku", "1.2 MJ/m³", "J/m^3")).toBeCloseTo(1.2e6, 6);
    expect(parseQuantity("x", "3 J·m⁻¹", "J/m")).toBeCloseTo(3, 12);
  });

  it("zero is printed without a prefix, lengths from 0.1 nm in nm", () => {
    // Common practice, no source: a prefix on zero says nothing; atomic spacings are quoted in nm.
    expect(formatQuantity(0, "J/m^2")).toBe("0 J/m²");
    expect(formatQuantity(-0, "T")).toBe("0 T");
    expect(formatQuantity(3e-10, "m")).toBe("0.3 nm");
    expect(formatQuantity(5e-11, "m")).toBe("50 pm");
  });

  it("energies in K or J accept meV, µeV, GHz and cm⁻¹", () => {
    // Source: 2019 SI exact constants: k_B = 1.380649e-23 J/K, h = 6.62607015e-34 J s,
    // e = 1.602176634e-19 C, c = 299792458 m/s (BIPM SI Brochure, 9th edition, 2019).
    const kB = 1.380649e-23,
      h = 6.62607015e-34,
      e = 1.602176634e-19,
      c = 299792458;
    expect(parseQuantity("D", "1 meV", "K")).toBeCloseTo((1e-3 * e) / kB, 12); // 11.604518 K
    expect(parseQuantity("D", "2 µeV", "K")).toBeCloseTo((2e-6 * e) / kB, 14);
    expect(parseQuantity("D", "10 GHz", "K")).toBeCloseTo((10e9 * h) / kB, 14); // 0.479924 K
    expect(parseQuantity("D", "1 cm⁻¹", "K")).toBeCloseTo((100 * h * c) / kB, 12); // 1.438777 K
    expect(parseQuantity("E", "1 meV", "J")).toBe(1e-3 * e);
    expect(parseQuantity("E", "2 K", "J")).toBeCloseTo(2 * kB, 35);
    expect(() => parseQuantity("D", "1 mT", "K")).toThrow(/D = "1 mT" is not valid/);
  });
});
