import { describe, expect, it } from "vitest";
import { runCalculator, getCalculator, InputError, mu0 } from "@helicoid/lib";
import { runPython } from "../../helpers/python.js";
import { skyrmionCalculators } from "../../../lib/src/calculators/skyrmions.js";

describe("skyrmion calculators", () => {
  it("are in the catalogue", () => {
    expect(getCalculator("skyrmion").id).toBe("skyrmion");
    expect(getCalculator("skyrmion-profile").id).toBe("skyrmion-profile");
  });
  for (const spec of skyrmionCalculators) {
    it(`${spec.id} computes on its defaults and on every range corner`, () => {
      // Common practice, no source: every spec must compute on defaults and range corners.
      const d = runCalculator(spec);
      expect(["ok", "warning"]).toContain(d.status);
      for (const input of spec.inputs) {
        for (const v of [input.min, input.max]) {
          const r = runCalculator(spec, { [input.name]: v }, spec.sweep ? { sweep: { over: "B", from: -0.05, to: 0.3, points: 12 } } : {});
          expect(["ok", "warning"], `${spec.id} ${input.name}=${v}`).toContain(r.status);
          for (const o of Object.values(r.outputs)) {
            if (typeof o.value === "number") expect(Number.isFinite(o.value), `${spec.id} ${input.name}=${v}`).toBe(true);
            if (Array.isArray(o.value)) for (const x of o.value) expect(Number.isFinite(x)).toBe(true);
          }
          if (r.status === "warning") expect(r.notes.length).toBeGreaterThan(0);
        }
      }
    });
  }
  it("skyrmion: defaults give R, w, energy and a 200-point field sweep with a plot of R against B", () => {
    // Common practice, no source: the sweep arrays are aligned and R decreases with B.
    const spec = getCalculator("skyrmion");
    const r = runCalculator(spec, { B: "50 mT" });
    expect(r.outputs.radius.value).toBeGreaterThan(1e-9);
    expect(r.outputs.wallWidth.value).toBeGreaterThan(1e-9);
    const f = r.outputs.fieldSweep.value;
    const R = r.outputs.radiusSweep.value;
    expect(r.sweep!.points).toBe(200);
    expect(f.length).toBe(R.length);
    expect(f.length).toBeGreaterThan(50);
    for (let i = 1; i < R.length; i++) expect(R[i]!).toBeLessThan(R[i - 1]!);
    expect(spec.plots.some((p) => p.x === "fieldSweep" && p.y.includes("radiusSweep"))).toBe(true);
    // the small branch leaves the ansatz window (R < 0.3 w) at high field: said, not called a collapse
    expect(r.outputs.windowEndField.value).toBeGreaterThan(0.1);
    expect("collapseField" in r.outputs).toBe(false);
    expect(r.outputs.branches!.value as string).toMatch(/branch 1 \(compact skyrmion\)/);
    expect(r.outputs.branches!.value as string).toMatch(/not a continuum collapse/);
    expect(r.outputs.boundaryResolution.value).toBeLessThan(1e-5);
  });
  it("skyrmion: R(B) is insensitive to last-ulp changes of the inputs (the browser recomputes what Node computes)", () => {
    // Common practice, no source: a 1-ulp change of D changes R(B) by about 1e-16 in exact arithmetic;
    // the solver's result must not amplify it beyond 1e-9 (engines differ in last ulps of Math.exp etc.).
    const spec = getCalculator("skyrmion");
    for (const D of [1.5e-3, 2.6e-3]) {
      const a = runCalculator(spec, { D }).outputs.radiusSweep!.value as number[];
      const b = runCalculator(spec, { D: D * (1 + 2 ** -51) }).outputs.radiusSweep!.value as number[];
      expect(b.length).toBe(a.length);
      for (let i = 0; i < a.length; i++) expect(Math.abs(b[i]! / a[i]! - 1), `D=${D} point ${i}`).toBeLessThan(1e-9);
    }
  });
  it("skyrmion: above D_c, spiral or strips below B_sat (scipy), an isolated skyrmion as a metastable excitation above it", () => {
    // Source: A. Bogdanov, A. Hubert, JMMM 138, 255 (1994); oracle: scipy quad + brentq of the exact
    // 360-degree pair energy 2 Int_0^pi 2 sqrt(A (K_eff sin^2 + Ms B (1 - cos))) d theta - 2 pi |D| = 0.
    const film = { Ms: 1.1e6, A: 15e-12, Ku: 1.2e6, D: 3.9e-3, t: 1e-9 };
    const Bsat = runPython<number>(
      `
import json, sys, numpy as np
from scipy.integrate import quad
from scipy.optimize import brentq
f = json.load(sys.stdin)
K = f["Ku"] - 0.5 * f["mu0"] * f["Ms"]**2
E = lambda B: 2 * quad(lambda th: 2 * np.sqrt(f["A"] * (K * np.sin(th)**2 + f["Ms"] * B * (1 - np.cos(th)))), 0, np.pi, epsrel=1e-13)[0] - 2 * np.pi * f["D"]
print(json.dumps(brentq(E, 1e-9, 10, xtol=1e-15)))
`,
      { ...film, mu0 },
    );
    const below = runCalculator(getCalculator("skyrmion"), { D: "3.9 mJ/m^2", B: 0.5 * Bsat });
    expect(below.status).toBe("warning");
    expect(Math.abs(below.outputs.saturationField.value / Bsat - 1)).toBeLessThan(1e-8);
    expect(below.outputs.groundState!.value as string).toMatch(/spiral or strip-domain state is lower/);
    expect(below.outputs.spiralPeriod.value).toBeGreaterThan(0);
    const above = runCalculator(getCalculator("skyrmion"), { D: "3.9 mJ/m^2", B: "0.3 T" });
    expect(above.outputs.radius.value).toBeGreaterThan(1e-9);
    expect(above.outputs.energy.value).toBeGreaterThan(0);
    expect(above.outputs.groundState!.value as string).toMatch(/metastable excitation/);
  });
  it("skyrmion: finds the audit bubble at 9 mT and its expansion field does not depend on the sweep direction", () => {
    // Source: independent audit (R = 416.55 nm, w = 8.879 nm at 9 mT; checked against a numpy/scipy
    // quadrature of the ansatz energy in test/lib/walls/skyrmionAnsatz.test.ts).
    const p = { Ms: "1.3 MA/m", A: "15 pJ/m", Ku: "1.12 MJ/m^3", D: "0.2 mJ/m^2", t: "4 nm" };
    const spec = getCalculator("skyrmion");
    const r = runCalculator(spec, { ...p, B: "9 mT" });
    expect(r.outputs.radius.value * 1e9).toBeCloseTo(416.55, 1);
    expect(r.outputs.wallWidth.value * 1e9).toBeCloseTo(8.879, 2);
    expect(r.outputs.states!.value as string).toMatch(/verified minimum/);
    const up = runCalculator(spec, { ...p, B: "9 mT" }, { sweep: { over: "B", from: 0, to: 0.03, points: 16 } });
    const down = runCalculator(spec, { ...p, B: "9 mT" }, { sweep: { over: "B", from: 0.03, to: 0, points: 16 } });
    const eu = up.outputs.expansionField.value;
    const ed = down.outputs.expansionField.value;
    const res = up.outputs.boundaryResolution.value;
    expect(Math.abs(eu - ed)).toBeLessThanOrEqual(2 * res);
    expect(eu).toBeGreaterThan(0.004);
    expect(eu).toBeLessThan(0.009);
  });
  it("skyrmion-stability: stable with the translation zero mode; strip-out search above D_c ends at B_sat", () => {
    // Source: A. Bogdanov, A. Hubert, JMMM 138, 255 (1994); translation invariance gives the m = 1 zero
    // mode (common practice); B_sat against scipy in test/lib/walls/wall360.test.ts.
    const spec = getCalculator("skyrmion-stability");
    const d = runCalculator(spec, { D: "2.9 mJ/m^2", B: "20 mT" });
    expect(d.outputs.stability!.value as string).toMatch(/^Stable/);
    expect(Math.abs(d.outputs.translationEigenvalue.value)).toBeLessThan(1e-4);
    expect(d.outputs.modeEigenvalue.value.length).toBe(5);
    const s = runCalculator(spec, { D: "3.6 mJ/m^2", B: "0.1 T", search: "strip-out search", Bmin: 0 });
    expect(s.outputs.stripOutField.value * 1e3).toBeCloseTo(28.09, 1);
    expect(s.outputs.stripOutKind!.value as string).toMatch(/B_sat/);
  });
  it("skyrmion: a radius below 5 lattice constants carries a validity note with the approach to 8 pi A t", () => {
    // Common practice, no source: the continuum description needs several lattice spacings per core;
    // Source: A. Belavin, A. Polyakov, JETP Lett. 22, 245 (1975) for the 8 pi A t limit.
    const small = runCalculator(getCalculator("skyrmion"), {});
    const R = small.outputs.radius.value;
    expect(R).toBeLessThan(1.5e-9);
    expect(small.status).toBe("warning");
    expect(small.notes.join("\n")).toMatch(/R = .* is below 5 a = 1\.500 nm .*not trustworthy/);
    expect(small.outputs.continuumLimitField.value).toBeLessThan(0.05);
    expect(small.outputs.belavinPolyakovEnergy.value / (8 * Math.PI * 15e-12 * 1e-9)).toBeCloseTo(1, 12);
    expect(small.outputs.energyOverBelavinPolyakov.value).toBeGreaterThan(0.5);
    const fine = runCalculator(getCalculator("skyrmion"), { a: "0.2 nm" });
    expect(fine.notes.join("\n")).not.toMatch(/R = .* is below 5 a/);
    const large = runCalculator(getCalculator("skyrmion"), { D: "3 mJ/m^2", B: "20 mT" });
    expect(large.outputs.radius.value).toBeGreaterThan(10e-9);
    expect(large.notes.join("\n")).not.toMatch(/R = .* is below 5 a/);
    // every state says its kind, verification and validity; the stability of the exact local-model profile
    expect(large.outputs.states!.value as string).toMatch(/^1 \((compact skyrmion|bubble)\): R = .*verified minimum .*valid/);
    expect(large.outputs.stability!.value as string).toMatch(/^Stable against small deformations/);
  });
  it("skyrmion-profile: ansatz and exact side by side", () => {
    // Common practice, no source: variational bound and similar radii.
    const r = runCalculator(getCalculator("skyrmion-profile"), { D: "2 mJ/m^2", B: "20 mT" });
    expect(r.status).toBe("ok");
    const ea = r.outputs.energyAnsatz.value;
    const ee = r.outputs.energyExact.value;
    expect(ee).toBeLessThan(ea);
    const ra = r.outputs.radiusAnsatz.value;
    const re = r.outputs.radiusExact.value;
    expect(Math.abs(ra / re - 1)).toBeLessThan(0.05);
    expect(r.outputs.rho.value.length).toBe(r.outputs.thetaExact.value.length);
  });
  it("bad input names the parameter: in-plane film and wrong units", () => {
    const spec = getCalculator("skyrmion");
    expect(() => runCalculator(spec, { Ku: "0.5 MJ/m^3" })).toThrow(InputError);
    expect(() => runCalculator(spec, { A: "50 mT" })).toThrow(/A = "50 mT"/);
    expect(() => runCalculator(spec, { A: 0 })).toThrow(InputError);
    expect(() => runCalculator(spec, {}, { sweep: { over: "B", from: 0.01, to: 0.01, points: 5 } })).toThrow(/sweep of B over two different values/);
    expect(() => runCalculator(spec, {}, { sweep: { over: "B", from: 0, to: 0.1, points: 5000 } })).toThrow(/at most 2000/);
  });
});
