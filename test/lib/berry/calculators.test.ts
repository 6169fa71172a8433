import { describe, expect, it } from "vitest";
import { getCalculator, runCalculator, InputError, type CalculatorSpec } from "@helicoid/lib";
import { berryCalculators } from "../../../lib/src/calculators/berry.js";

function corners(spec: CalculatorSpec): Array<Record<string, number>> {
  const out: Array<Record<string, number>> = [];
  const n = spec.inputs.length;
  for (let mask = 0; mask < 1 << n; mask++) {
    const v: Record<string, number> = {};
    spec.inputs.forEach((inp, i) => (v[inp.name] = mask & (1 << i) ? inp.max : inp.min));
    out.push(v);
  }
  return out;
}

function checkResult(spec: CalculatorSpec, r: ReturnType<typeof runCalculator>): void {
  for (const o of spec.outputs) {
    const v = o.name in r.outputs ? r.outputs[o.name]!.value : undefined;
    if (v === undefined) continue;
    if (o.kind === "text") expect(typeof v).toBe("string");
    else if (o.kind === "array") {
      expect(Array.isArray(v)).toBe(true);
      for (const x of v as number[]) expect(Number.isFinite(x)).toBe(true);
    } else expect(Number.isFinite(v as number), o.name).toBe(true);
  }
  expect(JSON.stringify(r)).not.toMatch(/null/);
}

describe("berry catalogue", () => {
  it("lists berry-loop, chern, magnon-hall, spin-tunnel, easy-plane", () => {
    expect(berryCalculators.map((s) => s.id)).toEqual(["berry-loop", "chern", "magnon-hall", "spin-tunnel", "easy-plane"]);
    for (const s of berryCalculators) expect(getCalculator(s.id)).toBe(s);
  });

  it("every spec computes on its defaults and every range corner", () => {
    // Common practice, no source: specs must compute wherever their sliders go.
    for (const spec of berryCalculators) {
      checkResult(spec, runCalculator(spec, {}));
      for (const c of corners(spec)) checkResult(spec, runCalculator(spec, c));
    }
  });

  it("defaults reproduce the closed forms", () => {
    // Source: Berry (1984) for the cone; Haldane (1988) for the phase diagram; Garg (1993) for the period.
    // These compare outputs with closed forms the calculators evaluate themselves (internal consistency);
    // the outside values (numpy, scipy, published closed forms evaluated in the test) are in
    // test/lib/calculators/outsideChecks.test.ts.
    const loop = runCalculator(getCalculator("berry-loop"), { segments: 2000 });
    expect(loop.outputs.maxDifference!.value as number).toBeLessThan(1e-4);
    expect(Math.abs((loop.outputs.gammaTop!.value as number) - (loop.outputs.gammaTopExact!.value as number))).toBeLessThan(1e-4);
    const ch = runCalculator(getCalculator("chern"), {});
    expect(ch.outputs.chernLower!.value).toBe(ch.outputs.chernClosedForm!.value);
    const cs = ch.outputs.chernSweep!.value as number[];
    const ms = ch.outputs.MResolved!.value as number[];
    const Mc = ch.outputs.criticalMass!.value as number;
    ms.forEach((M, i) => expect(cs[i]).toBe(Math.abs(M) < Mc ? -1 : 0));
    const tun = runCalculator(getCalculator("spin-tunnel"), {});
    expect(Math.abs(tun.outputs.deviation!.value as number)).toBeLessThan(0.05);
    const ep = runCalculator(getCalculator("easy-plane"), {});
    expect(Math.abs(ep.outputs.rotorDifference!.value as number)).toBeLessThan(1e-12);
    const mh = runCalculator(getCalculator("magnon-hall"), {});
    const mh2 = runCalculator(getCalculator("magnon-hall"), { D: -2.2 }); // the default D with its sign flipped
    expect(mh.outputs.kappaXY!.value as number).toBeCloseTo(-(mh2.outputs.kappaXY!.value as number), 25);
    expect(mh.outputs.chernLower!.value).toBe(-(mh2.outputs.chernLower!.value as number));
  });

  it("bad input: S not a multiple of 1/2 via a non-integer 2S, unknown names", () => {
    expect(() => runCalculator(getCalculator("berry-loop"), { twoS: 2.5 })).toThrow(InputError);
    expect(() => runCalculator(getCalculator("magnon-hall"), { S: 0.7 })).toThrow(/one of/);
    expect(() => runCalculator(getCalculator("chern"), { mass: 1 })).toThrow(InputError);
  });
});
