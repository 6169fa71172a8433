import { describe, expect, it } from "vitest";
import { skyrmionLatticeTexture, skyrmionTexture, textureOfObjects, wallProfileTheta } from "../../../lib/src/topology/textures.js";
import { InputError } from "../../../lib/src/errors.js";

describe("demo texture generators", () => {
  it("the wall profile has theta(0) = pi, theta(R) = pi/2 and decays like exp(-rho/w)", () => {
    // Source: tan(theta/2) = sinh(R/w)/sinh(rho/w), F. Buettner, I. Lemesh, G. Beach, Sci. Rep. 8, 4464 (2018).
    expect(wallProfileTheta(0, 10, 2)).toBeCloseTo(Math.PI, 14);
    expect(wallProfileTheta(10, 10, 2)).toBeCloseTo(Math.PI / 2, 14);
    const r = wallProfileTheta(40, 10, 2) / wallProfileTheta(42, 10, 2);
    expect(r).toBeCloseTo(Math.E, 6);
  });
  it("vectors are unit length and the lattice generator tiles the box", () => {
    // Common practice, no source.
    const f = skyrmionTexture({ nx: 20, ny: 20 }, { R: 4e-9, w: 1e-9 });
    for (let c = 0; c < f.m.length; c += 3) expect(Math.hypot(f.m[c]!, f.m[c + 1]!, f.m[c + 2]!)).toBeCloseTo(1, 14);
    const l = skyrmionLatticeTexture({ nx: 100, ny: 87 }, { a: 25e-9, R: 5e-9, w: 1e-9 });
    expect(l.centres.length).toBe(4 * 4);
  });
  it("bad parameters are InputErrors", () => {
    expect(() => skyrmionTexture({ nx: 8, ny: 8 }, { R: -1, w: 1 })).toThrow(InputError);
    expect(() => skyrmionTexture({ nx: 8, ny: 8 }, { R: 1, w: 0 })).toThrow(/wall width/);
    expect(() => textureOfObjects({ nx: 8, ny: 8 }, [{ x: 0, y: 0, R: 1, w: 1, vorticity: 0 }])).toThrow(/vorticity/);
    expect(() => textureOfObjects({ nx: 8, ny: 8 }, [{ x: 0, y: 0, R: 1, w: 1, kind: "skyrmionium", Rinner: 2 }])).toThrow(/Rinner/);
  });
});
