import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { findVortices } from "../../../lib/src/topology/vortices.js";
import { vortexPairTexture } from "../../../lib/src/topology/textures.js";
import { vectorFieldFromFunction, vectorFieldFromInterleaved } from "../../../lib/src/topology/field.js";
import { mulberry32 } from "./randomFields.js";

const nm = 1e-9;

describe("vortices and antivortices by plaquette winding", () => {
  it("a vortex-antivortex pair: signs and positions (to half a cell)", () => {
    // Source: winding +1 of Phi = atan2(y, x) around its centre and -1 of -atan2 (N. D. Mermin, Rev. Mod. Phys. 51, 591 (1979)).
    const f = vortexPairTexture({ nx: 60, ny: 40 }, { vortex: [15.3 * nm, 20.6 * nm], antivortex: [44.2 * nm, 18.1 * nm], angle: 0.4 });
    const r = findVortices(f, { boundary: "open" });
    expect(r.vortices).toBe(1);
    expect(r.antivortices).toBe(1);
    const v = r.sites.find((s) => s.winding === 1)!, a = r.sites.find((s) => s.winding === -1)!;
    expect(Math.abs(v.x - 15.3 * nm)).toBeLessThan(0.5 * nm);
    expect(Math.abs(v.y - 20.6 * nm)).toBeLessThan(0.5 * nm);
    expect(Math.abs(a.x - 44.2 * nm)).toBeLessThan(0.5 * nm);
    expect(Math.abs(a.y - 18.1 * nm)).toBeLessThan(0.5 * nm);
  });

  it("core polarities are reported and meron charges follow Q = v p / 2", async () => {
    // Source: meron charge v p / 2 from Q = (v/2)[cos T(0) - cos T(inf)] with T(inf) = pi/2 (derivation in objects.ts).
    const { skyrmionNumber } = await import("../../../lib/src/topology/skyrmionNumber.js");
    const f = vortexPairTexture({ nx: 160, ny: 100 }, { vortex: [50.3 * nm, 50.4 * nm], antivortex: [110.2 * nm, 50.1 * nm], coreRadius: 4 * nm, vortexPolarity: 1, antivortexPolarity: -1 });
    const r = findVortices(f, { boundary: "open" });
    expect(r.sites.find((s) => s.winding === 1)!.mz).toBeGreaterThan(0.5);
    expect(r.sites.find((s) => s.winding === -1)!.mz).toBeLessThan(-0.5);
    // (1 * 1 + (-1) * (-1)) / 2 = 1, up to the in-plane far field cut by the open box
    expect(Math.abs(skyrmionNumber(f, { boundary: "open" }).Q - 1)).toBeLessThan(0.02);
    const same = vortexPairTexture({ nx: 160, ny: 100 }, { vortex: [50.3 * nm, 50.4 * nm], antivortex: [110.2 * nm, 50.1 * nm], coreRadius: 4 * nm, vortexPolarity: 1, antivortexPolarity: 1 });
    expect(Math.abs(skyrmionNumber(same, { boundary: "open" }).Q)).toBeLessThan(0.02);
  });

  it("windings add up to 0 on a closed lattice (random in-plane fields, both lattice kinds)", () => {
    // Source: on a torus every edge difference enters two plaquettes with opposite signs (common practice, no source).
    fc.assert(fc.property(fc.integer({ min: 1, max: 1e6 }), fc.boolean(), (seed, tri) => {
      const rnd = mulberry32(seed);
      const m = Float64Array.from({ length: 3 * 12 * 10 }, (_, k) => (k % 3 === 2 ? 0 : rnd() * 2 - 1));
      const r = findVortices(vectorFieldFromInterleaved(m, { nx: 12, ny: 10, lattice: tri ? "triangular" : "square" }));
      expect(r.totalWinding).toBe(0);
      expect(r.vortices + r.antivortices).toBe(r.sites.length);
    }), { numRuns: 40 });
  });

  it("a vortex of winding 2 (seen as two unit windings in neighbouring plaquettes) and a vortex on a triangular lattice", () => {
    // Source: Phi = 2 atan2(y, x) winds twice (Mermin 1979). Four wrapped steps, each < pi, sum to less than 4 pi,
    // so one square plaquette holds |w| <= 1 and the winding-2 defect spreads over neighbouring plaquettes.
    const g = { nx: 30, ny: 30, dx: nm };
    const f = vectorFieldFromFunction(g, (x, y) => { const p = 2 * Math.atan2(y - 15.4 * nm, x - 14.7 * nm); return [Math.cos(p), Math.sin(p), 0]; });
    const r = findVortices(f, { boundary: "open" });
    expect(r.sites.reduce((s, x) => s + x.winding, 0)).toBe(2);
    for (const x of r.sites) expect(Math.hypot(x.x - 14.7 * nm, x.y - 15.4 * nm)).toBeLessThan(1.5 * nm);
    const t = vectorFieldFromFunction({ ...g, lattice: "triangular" }, (x, y) => { const p = Math.atan2(y - 12.2 * nm, x - 20.1 * nm); return [Math.cos(p), Math.sin(p), 0]; });
    const rt = findVortices(t, { boundary: "open" });
    expect(rt.sites.length).toBe(1);
    expect(Math.hypot(rt.sites[0]!.x - 20.1 * nm, rt.sites[0]!.y - 12.2 * nm)).toBeLessThan(0.6 * nm);
  });

  it("plaquettes without an in-plane direction are skipped and counted", () => {
    const f = vectorFieldFromInterleaved([0, 0, 1, 1, 0, 0, 0, 1, 0, -1, 0, 0], { nx: 2, ny: 2 });
    expect(findVortices(f, { boundary: "open" }).skipped).toBe(1);
  });
});
