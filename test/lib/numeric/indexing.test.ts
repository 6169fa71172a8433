// Checked element reads (lib/src/numeric/indexing.ts).
import { describe, expect, it } from "vitest";
import { at, gather, float64Arrays } from "../../../lib/src/numeric/indexing.js";

describe("at, gather, float64Arrays", () => {
  it("read in range and name the array, the index and the length out of range", () => {
    // Common practice, no source: an out-of-range read is an error, not undefined.
    const a = Float64Array.of(3, 1, 4);
    expect(at(a, 2, "a")).toBe(4);
    expect(gather(a, [2, 0], "a")).toEqual([4, 3]);
    expect(() => at(a, 3, "start")).toThrow(new RangeError("start[3] is out of range (length 3)"));
    expect(() => at(a, -1, "start")).toThrow(RangeError);
    expect(() => gather([1, 2], [0, 5], "bounds")).toThrow(/bounds\[5\].*length 2/);
  });

  it("float64Arrays gives distinct zero-filled arrays of the asked length", () => {
    // Common practice, no source.
    const [u, v] = float64Arrays(2, 4);
    u[0] = 1;
    expect(Array.from(u)).toEqual([1, 0, 0, 0]);
    expect(Array.from(v)).toEqual([0, 0, 0, 0]);
  });
});
