/**
 * The spin-tunnel splitting curve is sampled where it needs it: its dips reach down to the zeros
 * (not the shallow notches of even sampling), and the dips of the drawn curve are spaced by Garg's
 * quenching period.
 */
import { describe, it, expect } from "vitest";
import { getCalculator, runCalculator } from "@helicoid/lib";

describe("spin-tunnel splitting curve", () => {
  it("dips of the drawn curve are deep and spaced by Garg's period", () => {
    const r = runCalculator(getCalculator("spin-tunnel"), {});
    const B = r.outputs.BSweep!.value as number[];
    const L = r.outputs.log10Splitting!.value as number[];
    expect(B.length).toBe(L.length);
    expect(B.length).toBeLessThanOrEqual(640);
    for (let i = 1; i < B.length; i++) expect(B[i]!).toBeGreaterThan(B[i - 1]!);
    expect(B[0]).toBe(0);
    expect(B.at(-1)).toBe(1.5);
    // local minima of the drawn curve
    const dips: number[] = [];
    for (let i = 1; i < L.length - 1; i++) if (L[i]! < L[i - 1]! && L[i]! < L[i + 1]!) dips.push(i);
    const top = Math.max(...L);
    expect(dips.length).toBe((r.outputs.zeros!.value as number[]).length);
    // Each dip goes at least 8 decades below the curve's maxima (even sampling: about 1-2 decades).
    for (const i of dips) expect(L[i]!).toBeLessThan(top - 8);
    // Source: A. Garg, EPL 22, 205 (1993): quenching period (2 k_B / g muB) sqrt(2 E (E + D)),
    // exact for C = 0 (Kececioglu and Garg, PRB 63, 064422 (2001)). k_B/muB = 1.4887 T/K (CODATA 2018).
    const D = 0.42,
      E = 0.04;
    const garg = ((2 * 1.380649e-23) / (2 * 9.2740100783e-24)) * Math.sqrt(2 * E * (E + D));
    for (let k = 1; k < dips.length; k++) expect(Math.abs(B[dips[k]!]! - B[dips[k - 1]!]! - garg) / garg).toBeLessThan(1e-3);
  });
});
