import { describe, expect, it } from "vitest";
import { continuumSkyrmionNumber } from "../../../lib/src/topology/continuumCharge.js";
import { skyrmionNumber } from "../../../lib/src/topology/skyrmionNumber.js";
import { skyrmionTexture } from "../../../lib/src/topology/textures.js";
import { vectorFieldFromInterleaved } from "../../../lib/src/topology/field.js";

describe("continuum finite-difference estimate of Q", () => {
  it("converges to the lattice integer at second order as the grid is refined", () => {
    // Source: central differences have O(h^2) truncation error (common practice, no source); the limit is Q = -1
    // (sign convention of lib/src/README.md).
    const err: number[] = [];
    for (const n of [32, 64, 128]) {
      const h = 64 / n; // same physical texture, finer cells
      const f = skyrmionTexture({ nx: n, ny: n, dx: h * 1e-9 }, { R: 12e-9, w: 4e-9 });
      expect(Math.abs(skyrmionNumber(f).Q + 1)).toBeLessThan(1e-9);
      err.push(Math.abs(continuumSkyrmionNumber(f).Q + 1));
    }
    expect(err[0]!).toBeGreaterThan(err[1]!);
    expect(err[1]!).toBeGreaterThan(err[2]!);
    expect(err[0]! / err[1]!).toBeGreaterThan(3);
    expect(err[1]! / err[2]!).toBeGreaterThan(3);
    expect(err[2]!).toBeLessThan(0.01);
  });
  it("serves triangular lattices (lattice coordinates) and masks", () => {
    const f = skyrmionTexture({ nx: 96, ny: 96, lattice: "triangular" }, { R: 14e-9, w: 4e-9 });
    expect(Math.abs(continuumSkyrmionNumber(f).Q + 1)).toBeLessThan(0.02);
    const d = continuumSkyrmionNumber(f, { density: true });
    expect(d.density!.reduce((s, v) => s + v, 0)).toBeCloseTo(d.Q, 12);
  });
  it("needs a 3x3 stencil", () => {
    const f = vectorFieldFromInterleaved([0, 0, 1, 0, 0, 1, 0, 0, 1, 0, 0, 1], { nx: 2, ny: 2, source: "small.csv" });
    expect(() => continuumSkyrmionNumber(f)).toThrow(/small\.csv = "2x2x1 cells".*at least 3x3x1 cells for the central-difference stencil/);
  });
});
