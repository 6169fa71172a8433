import { describe, expect, it } from "vitest";
import { parseQuantity, formatQuantity, InputError } from "@helicoid/lib";

describe("parseQuantity", () => {
  it("takes SI numbers, numeric strings and strings with units", () => {
    // Common practice, no source: SI prefixes p = 1e-12, M = 1e6, m = 1e-3.
    expect(parseQuantity("A", 1.5e-11, "J/m")).toBe(1.5e-11);
    expect(parseQuantity("A", "1.5e-11", "J/m")).toBe(1.5e-11);
    expect(parseQuantity("A", "15 pJ/m", "J/m")).toBeCloseTo(1.5e-11, 24);
    expect(parseQuantity("A", "15pJ/m", "J/m")).toBeCloseTo(1.5e-11, 24);
    expect(parseQuantity("Ms", "1.1 MA/m", "A/m")).toBeCloseTo(1.1e6, 6);
    expect(parseQuantity("B", "50 mT", "T")).toBeCloseTo(0.05, 15);
    expect(parseQuantity("D", "3 mJ/m^2", "J/m^2")).toBeCloseTo(3e-3, 15);
    expect(parseQuantity("t", "1 nm", "m")).toBeCloseTo(1e-9, 20);
  });
  it("refuses a unit of the wrong dimension, naming parameter, value and expectation", () => {
    const err = (() => {
      try {
        parseQuantity("A", "50 mT", "J/m");
      } catch (e) {
        return e as InputError;
      }
      throw new Error("no error");
    })();
    expect(err).toBeInstanceOf(InputError);
    expect(err.parameter).toBe("A");
    expect(err.value).toBe("50 mT");
    expect(err.message).toMatch(/A = "50 mT".*J\/m.*dimension of T/);
  });
  it("refuses garbage and non-finite numbers", () => {
    expect(() => parseQuantity("Ms", "lots", "A/m")).toThrow(/Ms = "lots"/);
    expect(() => parseQuantity("Ms", Number.NaN, "A/m")).toThrow(/Ms = NaN/);
  });
});

describe("formatQuantity", () => {
  it("uses the trade's customary units", () => {
    // Common practice, no source: nm, MA/m, pJ/m, mJ/m^2, mT are the customary display units.
    expect(formatQuantity(12.34e-9, "m")).toBe("12.34 nm");
    expect(formatQuantity(1.1e6, "A/m")).toBe("1.1 MA/m");
    expect(formatQuantity(1.5e-11, "J/m")).toBe("15 pJ/m");
    expect(formatQuantity(3e-3, "J/m^2")).toBe("3 mJ/m²");
    expect(formatQuantity(0.05, "T")).toBe("50 mT");
  });
});
