import { describe, expect, it } from "vitest";
import { getCalculator, runCalculator, InputError, mu0, type CalculatorSpec } from "@helicoid/lib";
import { wallCalculators } from "../../../lib/src/calculators/walls.js";
import { runPython } from "../../helpers/python.js";

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

function inputError(fn: () => unknown): InputError {
  try {
    fn();
  } catch (e) {
    if (e instanceof InputError) return e;
    throw e;
  }
  throw new Error("expected an InputError");
}

function checkResult(spec: CalculatorSpec, r: ReturnType<typeof runCalculator>): void {
  for (const o of spec.outputs) {
    const v = o.name in r.outputs ? r.outputs[o.name]!.value : undefined;
    if (v === undefined) continue;
    if (o.kind === "text") expect(typeof v).toBe("string");
    else if (o.kind === "array") {
      expect(Array.isArray(v)).toBe(true);
      for (const x of v as number[]) expect(Number.isFinite(x)).toBe(true);
    } else expect(Number.isFinite(v as number)).toBe(true);
  }
  // JSON-able without loss (no Infinity or NaN turning into null).
  expect(JSON.stringify(r)).not.toMatch(/null/);
}

describe("walls catalogue", () => {
  it("lists wall, wall360 and wall-type with the film inputs", () => {
    expect(wallCalculators.map((s) => s.id)).toEqual(["wall", "wall360", "wall-type"]);
    for (const s of wallCalculators) {
      expect(s.inputs.slice(0, 5).map((i) => i.name)).toEqual(["Ms", "A", "Ku", "D", "t"]);
      expect(getCalculator(s.id)).toBe(s);
    }
    expect(getCalculator("wall360").inputs.map((i) => i.name)).toContain("B");
  });

  it("every spec computes on its defaults and every range corner", () => {
    for (const spec of wallCalculators) {
      checkResult(spec, runCalculator(spec));
      for (const c of corners(spec)) checkResult(spec, runCalculator(spec, c));
    }
  });

  it("wall: outputs match the closed forms on the defaults", () => {
    const spec = getCalculator("wall");
    const r = runCalculator(spec, { Ms: "1.1 MA/m", A: "15 pJ/m", Ku: "1.2 MJ/m^3", D: "1.5 mJ/m^2", t: "1 nm" });
    const Keff = 1.2e6 - (mu0 * 1.1e6 ** 2) / 2;
    const val = (n: string) => r.outputs[n]!.value as number;
    // Source: lib/src/walls/README.md (Hubert and Schaefer 1998; Thiaville et al. 2012).
    expect(val("width")).toBeCloseTo(Math.sqrt(15e-12 / Keff), 18);
    expect(val("energy")).toBeCloseTo(4 * Math.sqrt(15e-12 * Keff) - Math.PI * 1.5e-3, 12);
    expect(val("criticalDmi")).toBeCloseTo((4 * Math.sqrt(15e-12 * Keff)) / Math.PI, 12);
    expect(val("lilleyWidth")).toBeCloseTo(Math.PI * val("width"), 18);
    expect(val("qualityFactor")).toBeCloseTo((2 * 1.2e6) / (mu0 * 1.1e6 ** 2), 12);
    expect(r.outputs.wallType!.value).toMatch(/Neel/);
    expect(r.outputs.x.value.length).toBe(r.outputs.mz.value.length);
    expect(r.outputs.width!.unit).toBe("m");
    expect(r.status).toBe("ok");
    // above D_c: a warning, and the equilibrium spiral period appears
    const s = runCalculator(spec, { D: "3 mJ/m^2", A: "5 pJ/m" });
    expect(s.status).toBe("warning");
    expect(s.outputs.spiralPeriod!.value).toBeGreaterThan(s.outputs.dmiSpiralPeriod.value);
  });

  it("wall: a thick film gets one Neel threshold and one verdict (wallType and regime agree), checked by scipy quadrature", () => {
    // Source: C = mu0 Ms^2 Delta int_0^inf sech^2(u) (1 - (1 - e^-z)/z) du, z = 2 t u / (pi Delta) (Neel volume
    // charges with the thin-film kernel, Beardsley 1989 form), D_N = 2 C / pi (Thiaville et al., EPL 100, 57002
    // (2012)); integrated independently by scipy.integrate.quad.
    const film = { Ms: "0.6 MA/m", A: "20 pJ/m", Ku: "1.5 MJ/m^3", D: "0.5 mJ/m^2", t: "15 nm" };
    const ref = runPython<{ DN: number; DNthin: number }>(`
import json, numpy as np
from scipy.integrate import quad
mu0 = 1.25663706212e-6; Ms = 0.6e6; A = 20e-12; Ku = 1.5e6; t = 15e-9
Keff = Ku - mu0 * Ms**2 / 2; Delta = np.sqrt(A / Keff)
def f(u):
    z = 2 * t * u / (np.pi * Delta)
    return (1 / np.cosh(u))**2 * (1 - (-np.expm1(-z)) / z if z > 1e-12 else z / 2)
C = mu0 * Ms**2 * Delta * quad(f, 0, np.inf, epsabs=0, epsrel=1e-13, limit=400)[0]
print(json.dumps({"DN": 2 * C / np.pi, "DNthin": 2 * np.log(2) * mu0 * Ms**2 * t / np.pi**2}))
`);
    const r = runCalculator(getCalculator("wall"), film);
    const val = (n: string) => r.outputs[n]!.value as number;
    expect(Math.abs(val("neelThreshold") / ref.DN - 1)).toBeLessThan(1e-9);
    expect(Math.abs(val("neelThresholdThinFilm") / ref.DNthin - 1)).toBeLessThan(1e-12);
    const shown = (ref.DN * 1e3).toPrecision(3);
    expect(shown).toBe("0.494");
    const wt = r.outputs.wallType!.value as string,
      rg = r.outputs.regime!.value as string;
    for (const text of [wt, rg]) {
      expect(text).toContain(`${shown} mJ/m^2`);
      expect(text).not.toContain("0.953");
    }
    // D = 0.5 > D_N = 0.494: Neel in both texts, never "intermediate"
    expect(wt).toMatch(/Neel wall/);
    expect(rg).toMatch(/chiral Neel walls/);
    expect(rg).not.toMatch(/intermediate/);
    expect(r.notes.join(" ")).toMatch(/not below Delta/);
  });

  it("wall360: exact pair beside the minimization; a B sweep gives R(B), w(B)", () => {
    // Internal consistency (minimized ansatz against the exact pair); the outside value (scipy quad of the
    // first integral) is in test/lib/calculators/outsideChecks.test.ts.
    const spec = getCalculator("wall360");
    const r = runCalculator(spec, { B: "50 mT" });
    const val = (n: string) => r.outputs[n]!.value as number;
    expect(Math.abs(val("radius") / val("exactRadius") - 1)).toBeLessThan(1e-6);
    expect(Math.abs(val("wallWidth") / val("exactWidth") - 1)).toBeLessThan(1e-6);
    const R = r.outputs.radiusSweep!.value;
    expect(R.length).toBe(60);
    for (let i = 1; i < R.length; i++) expect(R[i]!).toBeLessThan(R[i - 1]!);
    const z = spec.compute({ ...Object.fromEntries(spec.inputs.map((i) => [i.name, i.default])), B: 0 });
    expect(z.values.pairState).toMatch(/no bound pair/);
    expect(z.status).toBe("warning");
  });

  it("wall-type: threshold curve and type", () => {
    const spec = getCalculator("wall-type");
    const r = runCalculator(spec, { D: "0.05 mJ/m^2" });
    expect(r.outputs.character!.value).toBe("intermediate");
    const th = r.outputs.neelThreshold.value;
    expect(r.outputs.cosHelicity.value).toBeCloseTo(0.05e-3 / th, 12);
    expect(r.outputs.curveT.value.length).toBe(60);
  });

  it("bad input: each error names the parameter, the value and the expectation", () => {
    for (const spec of wallCalculators) {
      const cases: Array<[string, unknown, RegExp]> = [
        ["A", 0, /exchange stiffness: a value > 0/],
        ["A", -15e-12, /exchange stiffness: a value > 0/],
        ["Ms", 0, /saturation magnetization: a value > 0/],
        ["t", 0, /film thickness: a value > 0/],
        ["A", "50 mT", /dimension of J\/m/],
        ["Ku", 0.3e6, /K_eff/],
      ];
      for (const [name, value, expected] of cases) {
        const e = inputError(() => runCalculator(spec, { [name]: value as never }));
        expect(e.parameter).toBe(name);
        // runCalculator hands SI numbers to compute, so a range error shows the SI value; a unit error the raw string.
        expect(e.value).toBe(value);
        expect(e.message).toMatch(expected);
      }
      // A missing parameter when calling compute directly.
      const inputs = Object.fromEntries(spec.inputs.map((i) => [i.name, i.default]));
      delete inputs.A;
      const e = inputError(() => spec.compute(inputs));
      expect(e.parameter).toBe("A");
      expect(e.message).toMatch(/\(missing\)/);
      // An unknown name is refused too.
      expect(inputError(() => runCalculator(spec, { Aex: 1e-11 } as never)).parameter).toBe("Aex");
    }
  });
  it("wall360 and wall-type say so when |D| > D_c (no bound pair with negative energy and status ok)", () => {
    // Source: A. Bogdanov, A. Hubert, JMMM 138, 255 (1994): below B_sat a 360-degree wall has negative
    // energy and a spiral or strips are lower than the uniform film; S. Rohart, A. Thiaville, PRB 88,
    // 184422 (2013) for D_c = 4 sqrt(A K_eff) / pi.
    const p = { Ms: "1.1 MA/m", A: "15 pJ/m", Ku: "1.2 MJ/m^3", D: "3.6 mJ/m^2", t: "1 nm" };
    const lo = runCalculator(getCalculator("wall360"), { ...p, B: "20 mT" });
    expect(lo.status).toBe("warning");
    expect(lo.outputs.energy.value).toBeLessThan(0);
    expect(lo.outputs.pairState!.value as string).toMatch(/negative energy/);
    expect(lo.outputs.saturationField.value * 1e3).toBeCloseTo(28.09, 2);
    const hi = runCalculator(getCalculator("wall360"), { ...p, B: "50 mT" });
    expect(hi.outputs.pairState!.value as string).toMatch(/B > B_sat/);
    const wt = runCalculator(getCalculator("wall-type"), p);
    expect(wt.status).toBe("warning");
    expect(wt.notes.join(" ")).toMatch(/negative energy/);
    expect(wt.outputs.saturationField.value).toBeGreaterThan(0);
    const sub = runCalculator(getCalculator("wall-type"), { ...p, D: "1.5 mJ/m^2" });
    expect("saturationField" in sub.outputs).toBe(false);
  });
});
