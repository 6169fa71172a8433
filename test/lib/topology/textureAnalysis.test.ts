/**
 * analyseTexture (lib/src/topology/textureAnalysis.ts): the analysis `helicoid charge` prints, as a
 * documented result a notebook can use.
 */
import { describe, expect, it } from "vitest";
import { analyseTexture, antiskyrmionTexture, isDocumentedResult, skyrmionTexture } from "../../../lib/src/index";

const nm = 1e-9;

describe("analyseTexture", () => {
  it("a Bloch skyrmion and an antiskyrmion: charge, kind, radius, vorticity and helicity of the one object", () => {
    // Source: A. Belavin, A. Polyakov, JETP Lett. 22, 245 (1975): Q = -1 for a core-down skyrmion of
    // vorticity +1 in a +z background (the sign convention of the result's assumptions), +1 for vorticity -1.
    const grid = { nx: 96, ny: 96, dx: 1 * nm, periodic: true };
    const sk = analyseTexture(skyrmionTexture(grid, { R: 15 * nm, w: 4 * nm, helicity: Math.PI / 2 }), { boundary: "periodic" });
    expect(isDocumentedResult(sk)).toBe(true);
    expect(sk.status).toBe("ok");
    expect(sk.closed).toBe(true);
    expect(Math.abs(sk.skyrmionNumber + 1)).toBeLessThan(1e-9);
    expect(sk.objects).toHaveLength(1);
    const o = sk.objects[0]!;
    expect(o.kind).toBe("skyrmion");
    expect(o.vorticity).toBe(1);
    expect(Math.abs(o.helicity! - Math.PI / 2)).toBeLessThan(0.05);
    // the m_z = 0 contour of the profile tan(theta/2) = sinh(R/w)/sinh(r/w) lies at r = R
    expect(Math.abs(o.radius / (15 * nm) - 1)).toBeLessThan(0.05);
    expect(sk.sources.join(" ")).toMatch(/Berg/);
    const anti = analyseTexture(antiskyrmionTexture(grid, { R: 15 * nm, w: 4 * nm }), { boundary: "periodic" });
    expect(Math.abs(anti.skyrmionNumber - 1)).toBeLessThan(1e-9);
    expect(anti.objects[0]!.kind).toBe("antiskyrmion");
    expect(anti.objects[0]!.vorticity).toBe(-1);
  });
});
