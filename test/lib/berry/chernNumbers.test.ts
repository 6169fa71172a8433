import { describe, expect, it } from "vitest";
import { chernNumbers, blochModelFromFunction } from "../../../lib/src/berry/chernNumbers.js";
import { haldaneModel, haldaneSpec, supercellModel, haldaneCriticalMass } from "../../../lib/src/berry/blochModel.js";
import { solidAngle } from "../../../lib/src/topology/solidAngle.js";
import { InputError } from "../../../lib/src/errors.js";

describe("Chern numbers by link variables", () => {
  const t2 = 0.1, phi = Math.PI / 2;
  const Mc = haldaneCriticalMass(t2, phi);

  it("Haldane model: C = -+1 inside |M| < 3 sqrt3 |t2 sin phi|, 0 outside; exact integers; sign flips with phi", () => {
    // Source: F. D. M. Haldane, PRL 61, 2015 (1988): phase boundary |M| = 3 sqrt(3) |t2 sin(phi)|.
    for (const M of [0, 0.3 * Mc, -0.7 * Mc, 1.3 * Mc, -2 * Mc]) {
      const r = chernNumbers(haldaneModel({ t2, phi, M }), { n1: 48 });
      const inside = Math.abs(M) < Mc;
      expect(r.chern).toEqual(inside ? [-1, 1] : [0, 0]);
      for (const c of r.chernSum) expect(Math.abs(c - Math.round(c))).toBeLessThan(1e-10);
      const flipped = chernNumbers(haldaneModel({ t2, phi: -phi, M }), { n1: 48 });
      expect(flipped.chern).toEqual(inside ? [1, -1] : [0, 0]);
    }
    // Other phi: boundary scales with |sin phi|.
    const phi2 = 0.6, Mc2 = haldaneCriticalMass(t2, phi2);
    expect(chernNumbers(haldaneModel({ t2, phi: phi2, M: 0.8 * Mc2 }), { n1: 120 }).chern[0]).toBe(-1);
    expect(chernNumbers(haldaneModel({ t2, phi: phi2, M: 1.2 * Mc2 }), { n1: 120 }).chern[0]).toBe(0);
  });

  it("locates the phase boundary to the grid resolution and never returns a wrong integer near it", () => {
    // Source: Haldane (1988) boundary. Resolution: a gap 2|M - Mc| below ~ v_F dk (v_F = 3 t1 / 2) is flagged.
    const n1 = 120;
    const dk = (4 * Math.PI) / 3 / n1; // |b| / n1 for nearest-neighbour distance 1
    const res = 3 * 1.5 * dk; // generous bound on the flagged window
    let lastResolvedInside = -Infinity, firstResolvedOutside = Infinity;
    for (let k = -20; k <= 20; k++) {
      const M = Mc * (1 + k * 0.01);
      const r = chernNumbers(haldaneModel({ t2, phi, M }), { n1, onUnresolved: "report" });
      if (r.status === "ok") {
        expect(r.chern[0], `M = ${M}`).toBe(M < Mc ? -1 : 0);
        if (M < Mc) lastResolvedInside = Math.max(lastResolvedInside, M);
        else firstResolvedOutside = Math.min(firstResolvedOutside, M);
      } else {
        expect(Math.abs(M - Mc)).toBeLessThan(res);
      }
    }
    expect(Mc - lastResolvedInside).toBeLessThan(res);
    expect(firstResolvedOutside - Mc).toBeLessThan(res);
  });

  it("too coarse a grid is an InputError, not a wrong integer", () => {
    const M = Mc * 0.995;
    expect(() => chernNumbers(haldaneModel({ t2, phi, M }), { n1: 30 })).toThrow(InputError);
    expect(() => chernNumbers(haldaneModel({ t2, phi, M }), { n1: 30 })).toThrow(/grid fine enough/);
  });

  it("lower-band flux of a two-band model equals half the solid angle of d(k) (independent geometric check)", () => {
    // Source: for H = d . sigma the lower band is spin-1/2 antiparallel to d; its Berry phase around
    // a plaquette is +Omega_d / 2 (Berry 1984), Omega_d by the Van Oosterom-Strackee formula.
    const model = haldaneModel({ t2, phi: 0.9, M: 0.2 });
    const n1 = 24;
    const r = chernNumbers(model, { n1, map: true, usePositions: false });
    const re = new Float64Array(4), im = new Float64Array(4);
    const d = (k1: number, k2: number) => {
      model.fill(k1, k2, re, im);
      return [re[1]!, -im[1]!, (re[0]! - re[3]!) / 2]; // H01 = dx - i dy
    };
    let maxDiff = 0;
    for (let j = 0; j < n1; j++) for (let i = 0; i < n1; i++) {
      const a = d(i / n1, j / n1), b = d((i + 1) / n1, j / n1), c = d((i + 1) / n1, (j + 1) / n1), e = d(i / n1, (j + 1) / n1);
      const nrm = (v: number[]) => { const l = Math.hypot(v[0]!, v[1]!, v[2]!); return v.map((x) => x / l); };
      const om = solidAngle(nrm(a), nrm(b), nrm(c)) + solidAngle(nrm(a), nrm(c), nrm(e));
      maxDiff = Math.max(maxDiff, Math.abs(r.flux![0]![j * n1 + i]! - om / 2));
    }
    expect(maxDiff).toBeLessThan(1e-12);
  });

  it("6-band supercell: the three lower bands carry the Haldane Chern number (determinant links)", () => {
    // Source: Haldane (1988); folding into a supercell leaves the total Chern number of filled bands.
    const model = supercellModel(haldaneSpec({ t2, phi, M: 0.1 }), 3, 1);
    const r = chernNumbers(model, { n1: 36, groups: [[0, 1, 2], [3, 4, 5]] });
    expect(r.chern).toEqual([-1, 1]);
    // per band: folded bands touch, so single-band numbers are not all resolved; say so
    const per = chernNumbers(model, { n1: 36, onUnresolved: "report" });
    expect(per.status).toBe("unresolved");
    expect(per.notes.join(" ")).toMatch(/not resolved/);
  });

  it("models from a mathjs formula; positions do not change the Chern number; non-periodic H is rejected", () => {
    // Source: the massive Dirac lattice model of X.-L. Qi, Y.-S. Wu, S.-C. Zhang, PRB 74, 085308 (2006), from memory:
    // H = sin k1 sx + sin k2 sy + (m + cos k1 + cos k2) sz has |C| = 1 for 0 < |m| < 2, 0 for |m| > 2.
    const f = "[[m + cos(2 pi k1) + cos(2 pi k2), sin(2 pi k1) - i sin(2 pi k2)], [sin(2 pi k1) + i sin(2 pi k2), -(m + cos(2 pi k1) + cos(2 pi k2))]]";
    expect(Math.abs(chernNumbers(blochModelFromFunction(f, { m: 1 }), { n1: 24 }).chern[0]!)).toBe(1);
    expect(chernNumbers(blochModelFromFunction(f, { m: 3 }), { n1: 24 }).chern[0]).toBe(0);
    const a = chernNumbers(haldaneModel({ t2, phi, M: 0.2 }), { n1: 30 });
    const b = chernNumbers(haldaneModel({ t2, phi, M: 0.2 }), { n1: 30, usePositions: false });
    expect(a.chern).toEqual(b.chern);
    const open = blochModelFromFunction((k1: number) => [[Math.cos(Math.PI * k1), 1], [1, -Math.cos(Math.PI * k1)]]);
    expect(() => chernNumbers(open, { n1: 10 })).toThrow(/periodic/);
    const nonHerm = blochModelFromFunction(() => [[1, 2], [0, 1]]);
    expect(() => chernNumbers(nonHerm, { n1: 10 })).toThrow(/Hermitian/);
  });
});
