import { describe, it, expect } from "vitest";
import { dataExtent, paddedRange, stableRange } from "../../../widgets/src/views/plotRanges";

describe("explorer axis ranges", () => {
  it("extent skips gaps, and non-positive values on a log axis", () => {
    // Common practice, no source: gaps (null, NaN) are not data; log10 of 10 and 1000 are 1 and 3.
    expect(dataExtent([3, null, NaN, -1, 5], false)).toEqual([-1, 5]);
    expect(dataExtent([10, 0, -2, 1000], true)).toEqual([1, 3]);
    expect(dataExtent([null, NaN], false)).toBeNull();
  });
  it("pads 5 % each side, and a single value by 5 % of itself", () => {
    // Common practice, no source (about plotly's own autorange padding).
    expect(paddedRange([0, 10])).toEqual([-0.5, 10.5]);
    expect(paddedRange([2, 2])).toEqual([1.9, 2.1]);
  });
  it("keeps the range while data fit and fill a quarter of it; refits with headroom on the outgrown side", () => {
    // Common practice, no source.
    expect(stableRange([0, 10], [1, 9])).toEqual([0, 10]);
    expect(stableRange([0, 10], [3, 6])).toEqual([0, 10]);
    expect(stableRange([0, 10], [4, 5])).toEqual([3.95, 5.05]);
    const grown = stableRange([0, 10], [1, 12])!;
    expect(grown[0]).toBeCloseTo(0.45, 12);
    expect(grown[1]).toBeCloseTo(12.55 + 0.5 * 12.1, 12);
    expect(stableRange(null, [0, 10])).toEqual([-0.5, 10.5]);
  });
});
