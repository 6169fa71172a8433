import { describe, expect, it } from "vitest";
import { getCalculator, runCalculator, InputError, muBOverKB, type CalculatorSpec } from "@helicoid/lib/internal";

function checkResult(spec: CalculatorSpec, r: ReturnType<typeof runCalculator>): void {
  for (const o of spec.outputs) {
    const v = o.name in r.outputs ? r.outputs[o.name]!.value : undefined;
    if (v === undefined) continue;
    if (o.kind === "text") expect(typeof v).toBe("string");
    else if (o.kind === "array") {
      expect(Array.isArray(v)).toBe(true);
      for (const x of v as number[]) expect(Number.isFinite(x), o.name).toBe(true);
    } else expect(Number.isFinite(v as number), o.name).toBe(true);
  }
  expect(JSON.stringify(r)).not.toMatch(/null|NaN/);
}

describe("ion-levels", () => {
  const spec = getCalculator("ion-levels");

  it("computes on its defaults, on all-min and all-max, and with each input at its min and max", () => {
    // Common practice, no source: a spec must compute wherever its sliders go.
    checkResult(spec, runCalculator(spec, {}));
    const lo: Record<string, number> = {},
      hi: Record<string, number> = {};
    for (const i of spec.inputs) {
      lo[i.name] = i.min;
      hi[i.name] = i.max;
      checkResult(spec, runCalculator(spec, { [i.name]: i.min }));
      checkResult(spec, runCalculator(spec, { [i.name]: i.max }));
    }
    checkResult(spec, runCalculator(spec, lo));
    checkResult(spec, runCalculator(spec, hi));
  });

  it("B20 alone: levels 3 B20 (M^2 - 1/4), g = (g_J (J + 1/2), g_J (J + 1/2), g_J), field in meV units", () => {
    // Source: M. Hutchings, Solid State Physics 16, 227 (1964) (O_2^0 = 3 J_z^2 - J(J+1)); the
    // |+-1/2> g-values as stated in issue 17 (g_J and g_J (J + 1/2)).
    const zero = { B22: 0, B40: 0, B43: 0, B44: 0, B60: 0, B63: 0, B64: 0, B66: 0 };
    const r = runCalculator(spec, { ...zero, J: 4.5, gJ: 8 / 11, B20: "0.1 meV", B: 0, T: 1 });
    const B20 = 0.1 / ((1.380649e-23 / 1.602176634e-19) * 1e3);
    const levels = r.outputs.levels!.value as number[];
    const Ms = [0.5, 0.5, 1.5, 1.5, 2.5, 2.5, 3.5, 3.5, 4.5, 4.5];
    levels.forEach((e, i) => expect(e).toBeCloseTo(3 * B20 * (Ms[i]! ** 2 - 0.25), 9));
    expect(r.outputs.gPrincipal1!.value as number).toBeCloseTo((8 / 11) * 5, 9);
    expect(r.outputs.gPrincipal2!.value as number).toBeCloseTo((8 / 11) * 5, 9);
    expect(r.outputs.gPrincipal3!.value as number).toBeCloseTo(8 / 11, 9);
    expect((r.outputs.levelsMeV!.value as number[])[2]).toBeCloseTo(0.6, 9);
    expect(r.outputs.summary!.value as string).toMatch(/cm\^-1/);
  });

  it("low-T magnetization of the ground doublet saturates at g/2 muB along the axis of g", () => {
    // Source: effective spin-1/2, M = (g/2) tanh(g muB B / 2 k_B T) (Brillouin for S = 1/2), plus the
    // Van Vleck term of second-order perturbation theory, 2 g_J^2 muB^2 B |<3/2|J_x|1/2>|^2 / Delta
    // with |<3/2|J_x|1/2>|^2 = (J(J+1) - 3/4) / 4 and Delta = 3 B20 (9/4 - 1/4) = 60 K (J. H. Van Vleck,
    // The Theory of Electric and Magnetic Susceptibilities (1932)); the excited doublet is not populated at 0.5 K.
    const zero = { B22: 0, B40: 0, B43: 0, B44: 0, B60: 0, B63: 0, B64: 0, B66: 0 };
    const r = runCalculator(spec, { ...zero, J: 7.5, gJ: 1.2, B20: 10, B: 0.05, theta: Math.PI / 2, T: 0.5 });
    const g = r.outputs.gPrincipal1!.value as number;
    expect(g).toBeCloseTo(1.2 * 8, 9);
    const vanVleck = (2 * 1.2 ** 2 * muBOverKB * 0.05 * ((7.5 * 8.5 - 0.75) / 4)) / 60;
    expect(vanVleck).toBeGreaterThan(0.02);
    expect(r.outputs.magnetization!.value as number).toBeCloseTo((g / 2) * Math.tanh((g * muBOverKB * 0.05) / (2 * 0.5)) + vanVleck, 4);
  });

  it("refuses bad input with the parameter named", () => {
    expect(() => runCalculator(spec, { J: 3.3 })).toThrow(InputError);
    expect(() => runCalculator(spec, { Bmax: 0 })).toThrow(/Bmax/);
    expect(() => runCalculator(spec, { T: -1 })).toThrow(/T/);
  });
});
