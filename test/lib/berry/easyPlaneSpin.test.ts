import { describe, expect, it } from "vitest";
import { easyPlaneLevels, easyPlaneCrossings, easyPlaneGroundM, easyPlaneMagnetization, rotorMagnetization, rotorMagnetizationDirect, rotorTruncation } from "../../../lib/src/berry/easyPlaneSpin.js";
import { kB } from "../../../lib/src/quantity/constants.js";
import { InputError } from "../../../lib/src/errors.js";

const D = 1.2 * kB;

describe("easy-plane spin in a hard-axis field", () => {
  it("level crossings at b = D (2m + 1); ground m steps there; integer vs half-integer offset", () => {
    // Source: E_m = D m^2 - b m (textbook); crossings E_m = E_{m+1} at b = D (2m + 1).
    expect(easyPlaneCrossings(2, D).map((b) => b / D)).toEqual([-3, -1, 1, 3]);
    expect(easyPlaneCrossings(1.5, D).map((b) => b / D)).toEqual([-2, 0, 2]);
    for (const b of easyPlaneCrossings(3, D)) {
      const L = easyPlaneLevels(3, D, b);
      const sorted = Array.from(L).sort((x, y) => x - y);
      expect(Math.abs(sorted[0]! - sorted[1]!) / D).toBeLessThan(1e-12);
      expect(easyPlaneGroundM(3, D, b + 1e-9 * D) - easyPlaneGroundM(3, D, b - 1e-9 * D)).toBe(1);
    }
    // steps of <Sz> at low T: plateaus at the ground m, integer plateaus for S = 3, half-odd for S = 5/2
    const T = 0.01;
    expect(easyPlaneMagnetization(3, D, 1.5 * D, T)).toBeCloseTo(1, 12);
    expect(easyPlaneMagnetization(3, D, 2.5 * D, T)).toBeCloseTo(1, 12);
    expect(easyPlaneMagnetization(2.5, D, 0.5 * D, T)).toBeCloseTo(0.5, 12);
    expect(easyPlaneMagnetization(2.5, D, 2.5 * D, T)).toBeCloseTo(1.5, 12);
    // at a crossing the two levels are equally populated: <Sz> is the mid value
    expect(easyPlaneMagnetization(3, D, 3 * D, T)).toBeCloseTo(1.5, 12);
    expect(easyPlaneMagnetization(2.5, D, 0, T)).toBeCloseTo(0, 12);
    // saturation beyond the last crossing
    expect(easyPlaneMagnetization(3, D, 7 * D, T)).toBeCloseTo(3, 12);
  });

  it("rotor (theta-function) form equals the exact sum to 1e-12 in the rotor limit, integer and half-integer S", () => {
    // Source: Jacobi imaginary transformation (Whittaker & Watson 1927, ch. 21); derivation in easyPlaneSpin.ts.
    for (const [S, half] of [[40, false], [40.5, true]] as const) {
      for (const T of [0.2, 1, 3, 10]) {
        for (const bOverD of [0, 0.3, 1, 1.7, 4.2, -6.5]) {
          const b = bOverD * D;
          expect(rotorTruncation(S, D, b, T)).toBeLessThan(1e-14);
          const exact = easyPlaneMagnetization(S, D, b, T);
          const rotor = rotorMagnetization(D, b, T, half).value;
          expect(Math.abs(exact - rotor), `S=${S} T=${T} b/D=${bOverD}`).toBeLessThan(1e-12);
          expect(Math.abs(rotorMagnetizationDirect(D, b, T, half) - rotor)).toBeLessThan(1e-12);
        }
      }
    }
  });

  it("outside the rotor limit (small S, high T) the finite spin differs, and the truncation weight says so", () => {
    // Common practice, no source: the unrestricted rotor has no saturation.
    const S = 2, T = 10, b = 3 * D;
    expect(rotorTruncation(S, D, b, T)).toBeGreaterThan(1e-2);
    expect(Math.abs(easyPlaneMagnetization(S, D, b, T) - rotorMagnetization(D, b, T, false).value)).toBeGreaterThan(1e-3);
  });

  it("rejects bad S, D and T", () => {
    expect(() => easyPlaneLevels(1.25, D, 0)).toThrow(InputError);
    expect(() => easyPlaneMagnetization(2, -D, 0, 1)).toThrow(/positive easy-plane/);
    expect(() => rotorMagnetization(D, 0, 0, false)).toThrow(/positive temperature/);
  });
});
