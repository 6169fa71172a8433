import { describe, expect, it } from "vitest";
import { runCalculator, getCalculator, InputError } from "@helicoid/lib";
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
    expect(r.outputs.radius!.value as number).toBeGreaterThan(1e-9);
    expect(r.outputs.wallWidth!.value as number).toBeGreaterThan(1e-9);
    const f = r.outputs.fieldSweep!.value as number[];
    const R = r.outputs.radiusSweep!.value as number[];
    expect(r.sweep!.points).toBe(200);
    expect(f.length).toBe(R.length);
    expect(f.length).toBeGreaterThan(50);
    for (let i = 1; i < R.length; i++) expect(R[i]!).toBeLessThan(R[i - 1]!);
    expect(spec.plots.some((p) => p.x === "fieldSweep" && p.y.includes("radiusSweep"))).toBe(true);
    expect(r.outputs.collapseField!.value as number).toBeGreaterThan(0);
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
  it("skyrmion: above D_c reports the spiral and its period instead of a radius", () => {
    // Source: S. Rohart, A. Thiaville, PRB 88, 184422 (2013).
    const r = runCalculator(getCalculator("skyrmion"), { D: "3.9 mJ/m^2" });
    expect(r.status).toBe("warning");
    expect(r.outputs.radius).toBeUndefined();
    expect(r.outputs.spiralPeriod!.value as number).toBeGreaterThan(0);
  });
  it("skyrmion: a radius of a few atomic spacings carries a continuum-limit caution", () => {
    // Common practice, no source: the continuum description needs many lattice spacings (~0.3 nm) per core.
    const small = runCalculator(getCalculator("skyrmion"), {});
    expect(small.outputs.radius!.value as number).toBeLessThan(3e-9);
    expect(small.status).toBe("warning");
    expect(small.notes.join("\n")).toMatch(/spans only a few atomic spacings: the continuum model is at its limit/);
    const large = runCalculator(getCalculator("skyrmion"), { D: "3 mJ/m^2", B: "20 mT" });
    expect(large.outputs.radius!.value as number).toBeGreaterThan(10e-9);
    expect(large.notes.join("\n")).not.toMatch(/atomic spacings/);
  });
  it("skyrmion-profile: ansatz and exact side by side", () => {
    // Common practice, no source: variational bound and similar radii.
    const r = runCalculator(getCalculator("skyrmion-profile"), { D: "2 mJ/m^2", B: "20 mT" });
    expect(r.status).toBe("ok");
    const ea = r.outputs.energyAnsatz!.value as number;
    const ee = r.outputs.energyExact!.value as number;
    expect(ee).toBeLessThan(ea);
    const ra = r.outputs.radiusAnsatz!.value as number;
    const re = r.outputs.radiusExact!.value as number;
    expect(Math.abs(ra / re - 1)).toBeLessThan(0.05);
    expect((r.outputs.rho!.value as number[]).length).toBe((r.outputs.thetaExact!.value as number[]).length);
  });
  it("bad input names the parameter: in-plane film and wrong units", () => {
    const spec = getCalculator("skyrmion");
    expect(() => runCalculator(spec, { Ku: "0.5 MJ/m^3" })).toThrow(InputError);
    expect(() => runCalculator(spec, { A: "50 mT" })).toThrow(/A = "50 mT"/);
    expect(() => runCalculator(spec, { A: 0 })).toThrow(InputError);
  });
});
