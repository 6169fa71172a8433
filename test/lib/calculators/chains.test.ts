import { describe, expect, it } from "vitest";
import { getCalculator, runCalculator, InputError, type CalculatorSpec } from "@helicoid/lib";
import { chainCalculators } from "../../../lib/src/calculators/chains.js";

/** Range corners over the inputs not in `fixed` (those keep the given value). */
function corners(spec: CalculatorSpec, fixed: Record<string, number>): Array<Record<string, number>> {
  const free = spec.inputs.filter((i) => !(i.name in fixed));
  const out: Array<Record<string, number>> = [];
  for (let mask = 0; mask < 1 << free.length; mask++) {
    const v: Record<string, number> = { ...fixed };
    free.forEach((inp, i) => (v[inp.name] = mask & (1 << i) ? inp.max : inp.min));
    out.push(v);
  }
  return out;
}

function checkResult(spec: CalculatorSpec, r: ReturnType<typeof runCalculator>): void {
  for (const o of spec.outputs) {
    const v = r.outputs[o.name]?.value;
    if (v === undefined) continue;
    if (o.kind === "text") expect(typeof v).toBe("string");
    else if (o.kind === "array") {
      expect(Array.isArray(v)).toBe(true);
      for (const x of v as number[]) expect(Number.isFinite(x)).toBe(true);
    } else expect(Number.isFinite(v as number), o.name).toBe(true);
  }
  expect(JSON.stringify(r)).not.toMatch(/null/);
}

describe("chains catalogue", () => {
  it("lists chain-spectrum, chain-dynamics, wall-band", () => {
    expect(chainCalculators.map((s) => s.id)).toEqual(["chain-spectrum", "chain-dynamics", "wall-band"]);
    for (const s of chainCalculators) expect(getCalculator(s.id)).toBe(s);
  });

  it("every spec computes on its defaults and on range corners (ED sizes at their smallest)", () => {
    // Common practice, no source: specs must compute wherever their sliders go. The ED sizes are
    // held at the bottom of their ranges to keep this fast; N's top is exercised in the other tests.
    for (const spec of chainCalculators) checkResult(spec, runCalculator(spec, {}));
    for (const c of corners(getCalculator("chain-spectrum"), { N: 4, levels: 2 })) checkResult(getCalculator("chain-spectrum"), runCalculator(getCalculator("chain-spectrum"), c));
    for (const c of corners(getCalculator("chain-dynamics"), { N: 4, points: 20, hz: 0.5 })) checkResult(getCalculator("chain-dynamics"), runCalculator(getCalculator("chain-dynamics"), c));
    for (const c of corners(getCalculator("wall-band"), { q: 1.2, hz: 0.3 })) {
      if (c.Jz === 0) continue;
      checkResult(getCalculator("wall-band"), runCalculator(getCalculator("wall-band"), c));
    }
    const sw = runCalculator(getCalculator("wall-band"), {}, { sweep: { over: "T", from: 0.5, to: 10, points: 8 } });
    expect((sw.outputs.sweepWallDensity!.value as number[]).length).toBe(8);
  });

  it("chain-spectrum reaches the Bethe-ansatz e0 and the transverse-Ising closed form", () => {
    // Source: R. Orbach, Phys. Rev. 112, 309 (1958) via issue 15's value e0/Jperp = -1.299500051010 at Delta = 5.
    const r = runCalculator(getCalculator("chain-spectrum"), { N: 14, Jz: 5, Jperp: 1, hx: 0, hz: 0, levels: 1 });
    expect(r.outputs.e0BethePerSite!.value as number).toBeCloseTo(-1.29950005101, 10);
    expect(Math.abs((r.outputs.groundEnergyPerSite!.value as number) + 1.29950005101)).toBeLessThan(1e-4);
    // Source: P. Pfeuty, Ann. Phys. 57, 79 (1970); value E0 = -2.730828642305 from issue 15.
    const t = runCalculator(getCalculator("chain-spectrum"), { N: 10, Jz: 1, Jperp: 0, hx: 0.3, hz: 0, levels: 1 });
    expect(t.outputs.e0TransverseIsing!.value as number).toBeCloseTo(-2.730828642305, 10);
    expect(t.outputs.groundEnergy!.value as number).toBeCloseTo(-2.730828642305, 8);
    // units: "1 meV" read through energyInKelvin is 11.6 K; the summary repeats meV and GHz
    expect(r.outputs.summary!.value as string).toMatch(/meV.*GHz/);
  });

  it("chain-dynamics obeys its sum rules; wall-band's first-order chiral weight matches it", () => {
    // Derived in lib/src/chains/dynamics.ts: (1/N) sum_q int S^zz = 1/4, int C = -<S^x>.
    const d = runCalculator(getCalculator("chain-dynamics"), { N: 10, Jz: 20, Jperp: 1, hx: 1, hz: 0, T: 0 });
    expect(d.outputs.totalWeightZZ!.value as number).toBeCloseTo(0.25, 10);
    expect(d.outputs.chiralWeight!.value as number).toBeCloseTo(-(d.outputs.magnetizationX!.value as number), 10);
    expect(d.outputs.fSumDeviation!.value as number).toBeLessThan(1e-9);
    const w = runCalculator(getCalculator("wall-band"), { Jz: 20, Jperp: 1, hx: 1, hz: 0, T: 0 });
    // first order: -hx / (2 Jz); ED differs at order hx Jperp / Jz^2
    expect(Math.abs((w.outputs.chiralWeight!.value as number) - (d.outputs.chiralWeight!.value as number))).toBeLessThan((2 * 1 * 1) / 400);
    // Source: J. Villain, Physica B 79, 1 (1975): the edge of the two-wall continuum, 2 Jperp |sin q|.
    const w0 = runCalculator(getCalculator("wall-band"), { Jz: 20, Jperp: 1, hx: 0, hz: 0, T: 0 });
    const q = w0.outputs.q!.value as number[];
    const e = w0.outputs.villainEdge!.value as number[];
    q.forEach((x, i) => expect(e[i]).toBeCloseTo(2 * Math.abs(Math.sin(x)), 12));
  });

  it("bad input names the parameter", () => {
    expect(() => runCalculator(getCalculator("chain-spectrum"), { N: 40 })).toThrow(InputError);
    expect(() => runCalculator(getCalculator("chain-dynamics"), { N: 14, T: 2 })).toThrow(/at most 12 sites/);
    expect(() => runCalculator(getCalculator("wall-band"), { Jz: 0 })).toThrow(/Jz/);
    expect(() => runCalculator(getCalculator("chain-spectrum"), { Jz: "1 m" })).toThrow(/Jz/);
  });
});
