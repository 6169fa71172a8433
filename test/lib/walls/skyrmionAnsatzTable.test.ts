/**
 * The table of the skyrmion ansatz is one object (lib/src/walls/skyrmionAnsatz/table.ts): its rows,
 * interpolation scratch and cached slice belong to it, so a second table shares nothing with the
 * one the solver uses and gives the same numbers from its own rows. Its interpolated values are
 * checked against the direct quadrature (outside the table), as the solver's are in
 * magnetostatics.test.ts and skyrmionAnsatz.test.ts.
 */
import { describe, expect, it } from "vitest";
import { AnsatzTable, ansatzTable } from "../../../lib/src/walls/skyrmionAnsatz/table.js";
import { ansatzLocalIntegrals, ansatzNonlocalDirect, type AnsatzIntegrals } from "@helicoid/lib/internal";

describe("AnsatzTable: the ansatz table as an explicit object", () => {
  it("a fresh table builds its own rows and gives the shared table's numbers exactly", () => {
    // Common practice, no source: two instances of one deterministic table agree bit for bit.
    const fresh = new AnsatzTable();
    expect(fresh.rowsBuilt).toBe(0);
    const sharedBefore = ansatzTable.rowsBuilt;
    const points: Array<[number, number]> = [
      [0.5, 0.3],
      [2.2, 0.05],
      [9, 1.7],
      [40, 2e-4], // tau below the table: computed from the rows' transforms
    ];
    for (const [a, tau] of points) {
      const f = { ...fresh.nonlocal(a, tau) };
      const s = { ...ansatzTable.nonlocal(a, tau) };
      expect(f).toEqual(s);
      // the slice interpolates in a first, then in tau: the same interpolant summed in another order
      expect({ ...fresh.nonlocalSlice(a, tau) }).toEqual({ ...ansatzTable.nonlocalSlice(a, tau) });
      const If: AnsatzIntegrals = { ex: 0, K: 0, D: 0, Z: 0 };
      const Is: AnsatzIntegrals = { ex: 0, K: 0, D: 0, Z: 0 };
      fresh.localIntegrals(a, If);
      ansatzTable.localIntegrals(a, Is);
      expect(If).toEqual(Is);
    }
    // six rows per point in ln a, some shared between points; the shared table built none for the fresh one
    expect(fresh.rowsBuilt).toBeGreaterThanOrEqual(18);
    expect(fresh.rowsBuilt).toBeLessThanOrEqual(24);
    expect(ansatzTable.rowsBuilt - sharedBefore).toBeLessThanOrEqual(24);
  });

  it("its interpolated Phi and I_* agree with the direct quadrature", () => {
    // Source of the reference values: Gauss-Legendre quadrature of the Hankel transforms
    // (ansatzNonlocalDirect) and of the local integrands (ansatzLocalIntegrals), not the table.
    const t = new AnsatzTable();
    for (const [a, tau] of [
      [0.7, 0.4],
      [3.1, 0.08],
      [15, 1.2],
    ] as const) {
      const direct = ansatzNonlocalDirect(a, tau);
      const tab = t.nonlocal(a, tau);
      expect(Math.abs(tab.surface / direct.surface - 1)).toBeLessThan(1e-5);
      expect(Math.abs(tab.volume / direct.volume - 1)).toBeLessThan(1e-5);
      const I = ansatzLocalIntegrals(a);
      const It: AnsatzIntegrals = { ex: 0, K: 0, D: 0, Z: 0 };
      t.localIntegrals(a, It);
      for (const k of ["ex", "K", "D", "Z"] as const) expect(Math.abs(It[k] / I[k] - 1), k).toBeLessThan(1e-6);
    }
  });

  it("the slice derivatives in ln tau match central differences of the slice", () => {
    // Common practice, no source: a derivative agrees with a central difference of the same interpolant.
    const t = new AnsatzTable();
    const a = 4.3;
    const lnTau = Math.log(0.11);
    expect(t.sliceDerivatives(a, lnTau)).toBe(true);
    const { s, s1, v, v1 } = t.sliceDer;
    const h = 1e-4;
    const at = (x: number) => ({ ...t.nonlocalSlice(a, Math.exp(x)) });
    const p = at(lnTau + h);
    const m = at(lnTau - h);
    expect(Math.log(-at(lnTau).surface)).toBeCloseTo(s, 12);
    expect(Math.log(at(lnTau).volume)).toBeCloseTo(v, 12);
    expect((Math.log(-p.surface) - Math.log(-m.surface)) / (2 * h)).toBeCloseTo(s1, 6);
    expect((Math.log(p.volume) - Math.log(m.volume)) / (2 * h)).toBeCloseTo(v1, 6);
    expect(t.sliceDerivatives(a, Math.log(1e-4))).toBe(false);
  });
});
