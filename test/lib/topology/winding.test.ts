import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { s1Winding, s1WindingOfVectors, wrapAngle } from "../../../lib/src/topology/winding.js";
import { InputError } from "../../../lib/src/errors.js";

describe("S1 winding", () => {
  it("wrapAngle maps into [-pi, pi)", () => {
    // Common practice, no source: wrapping keeps the angle modulo 2 pi.
    fc.assert(
      fc.property(fc.double({ min: -1e3, max: 1e3, noNaN: true }), (d) => {
        const w = wrapAngle(d);
        expect(w).toBeGreaterThanOrEqual(-Math.PI);
        expect(w).toBeLessThan(Math.PI);
        const k = (d - w) / (2 * Math.PI);
        expect(Math.abs(k - Math.round(k))).toBeLessThan(1e-9);
      }),
    );
  });

  it("counts the turns of phi_k = n * 2 pi k / N + offset + noise", () => {
    // Source: degree of the map S1 -> S1, t -> n t (N. D. Mermin, Rev. Mod. Phys. 51, 591 (1979)).
    fc.assert(
      fc.property(fc.integer({ min: -6, max: 6 }), fc.double({ min: -10, max: 10, noNaN: true }), fc.integer({ min: 0, max: 1000 }), (n, off, seed) => {
        const N = 64;
        const a = Array.from({ length: N }, (_, k) => (n * 2 * Math.PI * k) / N + off + 0.3 * Math.sin(seed + 3 * k) + 2 * Math.PI * ((k * seed) % 3));
        expect(s1Winding(a)).toBe(n);
      }),
    );
  });

  it("winding of vectors around a vortex and an antivortex", () => {
    // Source: a vortex (vx, vy) = (cos t, sin t) winds +1, an antivortex (cos t, -sin t) winds -1 (Mermin 1979).
    const t = Array.from({ length: 12 }, (_, k) => (2 * Math.PI * k) / 12);
    expect(s1WindingOfVectors(t.map(Math.cos), t.map(Math.sin))).toBe(1);
    expect(
      s1WindingOfVectors(
        t.map(Math.cos),
        t.map((x) => -Math.sin(x)),
      ),
    ).toBe(-1);
  });

  it("rejects short, non-finite and directionless input", () => {
    // Common practice, no source: bad input is an InputError naming what was expected.
    expect(() => s1Winding([1])).toThrow(InputError);
    expect(() => s1Winding([0, NaN, 1])).toThrow(/angles\[1\]/);
    expect(() => s1WindingOfVectors([1, 0], [0, 0])).toThrow(/non-zero planar vector/);
  });
});
