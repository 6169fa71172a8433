import { describe, expect, it } from "vitest";
import { getCalculator, runCalculator, InputError, muB, kB, type CalculatorSpec } from "@helicoid/lib";
import { runPython } from "../../helpers/python.js";

function checkResult(spec: CalculatorSpec, r: ReturnType<typeof runCalculator>): void {
  for (const o of spec.outputs) {
    const v = o.name in r.outputs ? r.outputs[o.name]!.value : undefined;
    if (v === undefined) continue;
    if (o.kind === "text") expect(typeof v).toBe("string");
    else if (o.kind === "array") for (const x of v as number[]) expect(Number.isFinite(x), o.name).toBe(true);
    else expect(Number.isFinite(v as number), o.name).toBe(true);
  }
  expect(JSON.stringify(r)).not.toMatch(/null|NaN/);
}

describe("dipolar-lattice", () => {
  const spec = getCalculator("dipolar-lattice");
  it("computes on defaults and on each lattice at the range corners of moment and d", () => {
    // Common practice, no source.
    checkResult(spec, runCalculator(spec, {}));
    for (const lattice of [0, 1, 2]) for (const moment of [0.1, 12]) checkResult(spec, runCalculator(spec, { lattice, moment, d: moment > 1 ? 2e-10 : 2e-9, grid: 4 }));
  });

  it("square lattice: the zz band at Gamma is sum' 1/r^3 = 4 zeta(3/2) beta(3/2); honeycomb LT at K", () => {
    // Source: closed-form square-lattice sum (issue 17; zeta and beta from mpmath); K point of the
    // honeycomb at |q| = 4 pi / (3 sqrt 3) d^-1 (issue 17, background notes).
    const ref = runPython<number>("import json, mpmath as m\nprint(json.dumps(float(4*m.zeta(1.5)*m.dirichlet(1.5, [0, 1, 0, -1]))))");
    const sq = runCalculator(spec, { lattice: 0, grid: 8 });
    expect((sq.outputs.band3!.value as number[])[0]).toBeCloseTo(ref, 10);
    const hc = runCalculator(spec, { lattice: 2, grid: 12 });
    const f = hc.outputs.qMinFractional!.value as number[];
    const isK = (a: number, b: number) => Math.abs(f[0]! - a) < 1e-6 && Math.abs(f[1]! - b) < 1e-6;
    expect(isK(2 / 3, 1 / 3) || isK(1 / 3, 2 / 3)).toBe(true);
    expect(hc.outputs.spinLengthSpread!.value as number).toBeLessThan(1e-9);
    expect(hc.status).toBe("ok");
    // unit: D / k_B = mu0 (7 muB)^2 / (4 pi (0.4 nm)^3 k_B)
    // (mu0 / 4 pi = 1e-7 to 5e-10 relative in CODATA 2018)
    expect((hc.outputs.dipolarUnitK!.value as number) / ((1e-7 * (7 * muB) ** 2) / 4e-10 ** 3 / kB)).toBeCloseTo(1, 8);
  });

  it("refuses a bad lattice choice", () => {
    expect(() => runCalculator(spec, { lattice: 3 })).toThrow(InputError);
  });
});

describe("field-tuned-order", () => {
  const spec = getCalculator("field-tuned-order");
  it("computes on defaults and at range corners", () => {
    // Common practice, no source.
    checkResult(spec, runCalculator(spec, {}));
    for (const [S, D, zJ] of [
      [0.5, 0, 10],
      [5, 30, 0],
      [5, 0, 10],
      [1, 30, 10],
    ] as const)
      checkResult(spec, runCalculator(spec, { S, D, zJ, Delta: 2, g: 0.5, Bmax: 60 }));
  });

  it("spin 1: the ordered window of the solver matches the closed-form critical fields; lobe tip (sqrt2 - 1)^2", () => {
    // Source: closed forms derived in lib/src/lattices/meanField.ts; lobe tip of the decoupling
    // approximation (issue 17: zt/U = (sqrt(n+1) - sqrt(n))^2).
    const r = runCalculator(spec, { S: 1, D: 10, zJ: 2, Delta: 1, g: 2, Bmax: 15 });
    const zeemanK = (2 * muB) / kB;
    expect(r.outputs.Bc1!.value as number).toBeCloseTo(Math.sqrt(60) / zeemanK, 10);
    expect(r.outputs.Bc2!.value as number).toBeCloseTo(14 / zeemanK, 10);
    const B = r.outputs.fieldGrid!.value as number[],
      m = r.outputs.mPerp!.value as number[];
    const ordered = B.filter((_, i) => m[i]! > 1e-6);
    const step = B[1]! - B[0]!;
    expect(Math.abs(Math.min(...ordered) - (r.outputs.Bc1!.value as number))).toBeLessThan(step);
    expect(Math.abs(Math.max(...ordered) - (r.outputs.Bc2!.value as number))).toBeLessThan(step);
    expect(r.outputs.lobeTip1!.value as number).toBeCloseTo((Math.SQRT2 - 1) ** 2, 14);
    expect(r.notes.join(" ")).toMatch(/Kosterlitz/);
  });
});

describe("field-tuned-order domes", () => {
  it("T_c(B) is positive only inside the T = 0 ordered window and vanishes at its edges", () => {
    // Two routes of the same mean field: T = 0 solver (window) and the paramagnetic instability (domes).
    // Common practice, no source.
    const spec = getCalculator("field-tuned-order");
    const r = runCalculator(spec, { S: 1, D: 10, zJ: 2, Delta: 1, g: 2, Bmax: 15 });
    const B = r.outputs.fieldGrid!.value as number[],
      Tc = r.outputs.orderingTemperature!.value as number[],
      m = r.outputs.mPerp!.value as number[];
    B.forEach((_, i) => expect(Tc[i]! > 0).toBe(m[i]! > 1e-6));
    expect(r.outputs.maxOrderingTemperature!.value as number).toBeGreaterThan(0.5);
  });
});
