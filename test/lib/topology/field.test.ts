import { describe, expect, it } from "vitest";
import { vectorFieldFromInterleaved, vectorFieldFromPlanar, requireSomeMatter } from "../../../lib/src/topology/field.js";
import { InputError } from "../../../lib/src/errors.js";

describe("VectorField construction", () => {
  it("normalizes a copy, masks zero/tiny/NaN vectors and counts them, leaving the input unchanged", () => {
    // Common practice, no source: |m| = 1 after normalization; vacuum marked and counted.
    const input = [3, 0, 4, 0, 0, 0, NaN, 1, 0, 1e-12, 0, 0, 0, 2, 0, 0, 0, -5];
    const copy = input.slice();
    const f = vectorFieldFromInterleaved(input, { nx: 3, ny: 2 });
    expect(input).toEqual(copy);
    expect(f.vacuumCells).toBe(3);
    expect(Array.from(f.vacuum!)).toEqual([0, 1, 1, 1, 0, 0]);
    f.m.subarray(0, 3).forEach((v, k) => expect(v).toBeCloseTo([0.6, 0, 0.8][k]!, 15));
    expect(Array.from(f.m.subarray(12, 15))).toEqual([0, 1, 0]);
    expect(Array.from(f.m.subarray(3, 6))).toEqual([0, 0, 0]);
  });

  it("planar and interleaved inputs give the same field", () => {
    // Common practice, no source.
    const mx = [1, 0, 0, 1],
      my = [0, 1, 0, 1],
      mz = [0, 0, 1, 1];
    const a = vectorFieldFromPlanar(mx, my, mz, { nx: 2, ny: 2 });
    const b = vectorFieldFromInterleaved([1, 0, 0, 0, 1, 0, 0, 0, 1, 1, 1, 1], { nx: 2, ny: 2 });
    expect(Array.from(a.m)).toEqual(Array.from(b.m));
    expect(a.vacuum).toBeNull();
  });

  it("reports shape mismatches and all-vacuum fields", () => {
    // Common practice, no source.
    expect(() => vectorFieldFromInterleaved([1, 0, 0], { nx: 2, ny: 1 })).toThrow(/6 numbers.*found 3/);
    expect(() => vectorFieldFromInterleaved([1, 0, 0], { nx: 0, ny: 1 })).toThrow(InputError);
    const empty = vectorFieldFromInterleaved(new Array(12).fill(0), { nx: 2, ny: 2, source: "empty.csv" });
    expect(empty.vacuumCells).toBe(4);
    expect(() => requireSomeMatter(empty, "the skyrmion number")).toThrow(/empty\.csv.*all vacuum.*at least one non-vacuum cell/);
  });
});
