import { describe, expect, it } from "vitest";
import { energyInKelvin, kelvinToMeV, kelvinToGHz, chainModel, ringLabel, bondCount, InputError } from "@helicoid/lib/internal";

describe("energies with units", () => {
  it("reads K, meV and GHz into kelvin", () => {
    // Source: CODATA 2018 exact constants: k_B = 1.380649e-23 J/K, e = 1.602176634e-19 C, h = 6.62607015e-34 J s,
    // so 1 meV / k_B = 11.604518 K and 1 K k_B / h = 20.836619 GHz.
    expect(energyInKelvin("J", "1 meV")).toBeCloseTo(11.604518121, 8);
    expect(energyInKelvin("J", "20.836619123 GHz")).toBeCloseTo(1, 8);
    expect(energyInKelvin("J", "14 K")).toBe(14);
    expect(energyInKelvin("J", 3)).toBe(3);
    expect(1 / kelvinToMeV).toBeCloseTo(11.604518121, 8);
    expect(kelvinToGHz).toBeCloseTo(20.836619123, 8);
    expect(() => energyInKelvin("Jz", "3 m")).toThrow(InputError);
    expect(() => energyInKelvin("Jz", "3 m")).toThrow(/Jz/);
  });
  it("labels odd antiferromagnetic rings and counts bonds", () => {
    expect(ringLabel(chainModel({ N: 9, Jz: 1 }))).toMatch(/domain wall/);
    expect(ringLabel(chainModel({ N: 10, Jz: 1 }))).not.toMatch(/domain wall/);
    expect(ringLabel(chainModel({ N: 9, Jz: -1 }))).not.toMatch(/domain wall/);
    expect(bondCount(chainModel({ N: 9, boundary: "open" }))).toBe(8);
    expect(() => chainModel({ N: 2 })).toThrow(/at least 3 sites on a ring/);
  });
});
