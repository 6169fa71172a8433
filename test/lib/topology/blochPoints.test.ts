import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { findBlochPoints } from "../../../lib/src/topology/blochPoints.js";
import { skyrmionNumberPerLayer } from "../../../lib/src/topology/skyrmionNumber.js";
import { blochPointTexture, hedgehogTexture } from "../../../lib/src/topology/textures3d.js";
import { vectorFieldFromInterleaved } from "../../../lib/src/topology/field.js";
import { mulberry32 } from "./randomFields.js";

const nm = 1e-9;

describe("Bloch points and hedgehogs (signed degree per cell)", () => {
  it("hedgehog +1, anti-hedgehog -1, in the cell holding the singularity", () => {
    // Source: degree of r/|r| is +1 and of (x, y, -z)/|r| is -1 (J. Milnor, Topology from the Differentiable Viewpoint, 1965).
    for (const sign of [1, -1] as const) {
      const f = hedgehogTexture({ nx: 10, ny: 9, nz: 8 }, { sign, x0: 3.4 * nm, y0: 5.7 * nm, z0: 2.2 * nm });
      const r = findBlochPoints(f);
      expect(r.points.length).toBe(1);
      expect(r.points[0]).toMatchObject({ i: 3, j: 5, k: 2, degree: sign });
      expect(r.totalDegree).toBe(sign);
    }
  });

  it("a skyrmion tube ending at a Bloch point: degree -1 = Q(above) - Q(below)", () => {
    // Source: sign det of the Jacobian diag(1, 1, -1) at the zero (Milnor 1965); Q of a core-down v = 1 skyrmion = -1.
    const f = blochPointTexture({ nx: 48, ny: 48, nz: 12 }, { lambda: 3 * nm });
    const r = findBlochPoints(f);
    expect(r.points.length).toBe(1);
    expect(r.points[0]!.degree).toBe(-1);
    expect(r.points[0]!.k).toBe(5);
    const q = skyrmionNumberPerLayer(f, { boundary: "open" });
    expect(Math.abs(q[0]!)).toBeLessThan(0.01);
    expect(Math.abs(q[11]! + 1)).toBeLessThan(0.01);
  });

  it("Gauss: degrees of each slab = Q(k+1) - Q(k) exactly for random fields periodic in x, y", () => {
    // Source: the cell faces tile the slab boundary (Berg, Luescher 1981 solid angles); common practice, no source.
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 1e6 }), (seed) => {
        const rnd = mulberry32(seed);
        const nx = 7,
          ny = 6,
          nz = 4;
        const m = Float64Array.from({ length: 3 * nx * ny * nz }, () => rnd() * 2 - 1);
        const f = vectorFieldFromInterleaved(m, { nx, ny, nz });
        const r = findBlochPoints(f, { boundary: "periodic" });
        const q = skyrmionNumberPerLayer(f, { boundary: "periodic" });
        for (let k = 0; k < nz - 1; k++) {
          const slab = r.points.filter((p) => p.k === k).reduce((s, p) => s + p.degree, 0);
          expect(Math.abs(slab - (Math.round(q[k + 1]!) - Math.round(q[k]!)))).toBe(0);
        }
      }),
      { numRuns: 40 },
    );
  });

  it("needs 2x2x2 sites", () => {
    const f = vectorFieldFromInterleaved([0, 0, 1, 0, 0, 1, 0, 0, 1, 0, 0, 1], { nx: 2, ny: 2, nz: 1 });
    expect(() => findBlochPoints(f)).toThrow(/at least 2x2x2 cells/);
  });
});
