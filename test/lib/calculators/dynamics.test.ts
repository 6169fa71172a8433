import { describe, expect, it } from "vitest";
import { runCalculator, getCalculator, InputError } from "@helicoid/lib";
import { dynamicsCalculators } from "../../../lib/src/calculators/dynamics.js";
import { runPython } from "../../helpers/python.js";

describe("dynamics calculators", () => {
  it("are in the catalogue", () => {
    for (const id of ["wall-motion", "wall-current", "wall-trace", "skyrmion-drift", "precessing-skyrmion"]) expect(getCalculator(id).id).toBe(id);
  });
  for (const spec of dynamicsCalculators) {
    it(`${spec.id} computes on its defaults and on every range corner`, () => {
      // Common practice, no source: every spec must compute on defaults and range corners, with finite outputs.
      const d = runCalculator(spec);
      expect(["ok", "warning"]).toContain(d.status);
      for (const input of spec.inputs) {
        for (const v of [input.min, input.max]) {
          const sweep = spec.sweep
            ? {
                sweep: {
                  over: spec.sweep.over[0]!,
                  from: spec.inputs.find((i) => i.name === spec.sweep!.over[0])!.min,
                  to: spec.inputs.find((i) => i.name === spec.sweep!.over[0])!.max,
                  points: 12,
                },
              }
            : {};
          const r = runCalculator(spec, { [input.name]: v }, sweep);
          expect(["ok", "warning"], `${spec.id} ${input.name}=${v}`).toContain(r.status);
          for (const [k, o] of Object.entries(r.outputs)) {
            if (typeof o.value === "number") expect(Number.isFinite(o.value), `${spec.id} ${input.name}=${v} ${k}`).toBe(true);
            if (Array.isArray(o.value)) for (const x of o.value) expect(Number.isFinite(x), `${spec.id} ${input.name}=${v} ${k}`).toBe(true);
          }
          if (r.status === "warning") expect(r.notes.length).toBeGreaterThan(0);
        }
      }
      // every plot names array outputs of equal length
      for (const p of spec.plots) {
        const x = (p.x in d.outputs ? d.outputs[p.x]!.value : undefined) as number[] | undefined;
        if (!x) continue;
        for (const y of p.y) expect((d.outputs[y]!.value as number[]).length).toBe(x.length);
      }
    }, 120_000);
  }

  it("wall-motion: the Walker field and velocity of the default film against the closed forms evaluated in Python", () => {
    // Source: A. Thiaville et al., EPL 100, 57002 (2012) (wall energy with DMI and the Neel shape term);
    // Schryer and Walker (1974). Python maximizes the restoring torque on a fine grid (numpy), independently.
    const r = runCalculator(getCalculator("wall-motion"), { Bz: "20 mT" });
    const i = r.inputs;
    const py = runPython<{ BW: number; v: number }>(
      `
import json, sys, math
import numpy as np
p = json.load(sys.stdin)
mu0 = 1.25663706212e-6; g = 1.76085963023e11
Ms, A, Ku, D, t, al, Bz = p["Ms"], p["A"], p["Ku"], p["D"], p["t"], p["alpha"], p["Bz"]
Keff = Ku - mu0*Ms*Ms/2; De = math.sqrt(A/Keff)
C = math.log(2)/math.pi*mu0*Ms*Ms*t
psi = np.linspace(0, 2*math.pi, 2000001)
f = math.pi*D*np.sin(psi) - C*np.sin(2*psi)
BW = al*f.max()/(2*Ms*De)
print(json.dumps({"BW": BW, "v": g*De*Bz/al}))
`,
      Object.fromEntries(Object.entries(i).map(([k, x]) => [k, x.value])),
    );
    expect(Math.abs((r.outputs.walkerField!.value as number) / py.BW - 1)).toBeLessThan(1e-9);
    expect(Math.abs((r.outputs.velocity!.value as number) / py.v - 1)).toBeLessThan(1e-12);
    const f = r.outputs.sweepFrequency!.value as number[];
    const B = r.outputs.sweepValues!.value as number[];
    f.forEach((x, k) => expect(x > 0).toBe(B[k]! > py.BW));
  });

  it("wall-trace: the velocity read from the first turn equals the closed form", () => {
    // Common practice, no source: integration against the period integral.
    const r = runCalculator(getCalculator("wall-trace"), { Bz: "150 mT", duration: "2 ns" });
    expect(r.outputs.regime!.value).toMatch(/precessing/);
    expect(Math.abs((r.outputs.traceVelocity!.value as number) / (r.outputs.velocity!.value as number) - 1)).toBeLessThan(1e-6);
  });

  it("skyrmion-drift: Hall angle of a force is atan(4 / alpha I) for Q = -1, and beta = alpha gives v = u", () => {
    // Source: A. Thiele, PRL 30, 230 (1973) (G / alpha D = 4 pi Q / (alpha pi I)).
    const r = runCalculator(getCalculator("skyrmion-drift"), { beta: 0.3, alpha: 0.3, thetaSH: 0, j: 1e11, P: 0.5 });
    const I = r.outputs.dissipationIntegral!.value as number;
    expect(Math.abs(Math.tan(r.outputs.forceHallAngle!.value as number) - 4 / (0.3 * I))).toBeLessThan(1e-9);
    const u = (2.00231930436256 * 9.2740100783e-24 * 0.5 * 1e11) / (2 * 1.602176634e-19 * (r.inputs.Ms!.value as number));
    expect(Math.abs((r.outputs.vx!.value as number) / u - 1)).toBeLessThan(1e-12);
    expect(Math.abs(r.outputs.hallAngleStt!.value as number)).toBeLessThan(1e-12);
  });

  it("precessing-skyrmion: the stable frequency approaches the thin-wall value and the threshold current is below the default current", () => {
    // Source: our thin-wall limit omega = gamma B + gamma sigma_w / (2 Ms R) (precessingSkyrmion.ts header).
    const r = runCalculator(getCalculator("precessing-skyrmion"));
    const Ith = r.outputs.thresholdCurrent!.value as number;
    expect(Ith).toBeGreaterThan(0);
    expect(Ith).toBeLessThan(2e-3);
    const R = r.outputs.stableRadius!.value as number;
    const mu0 = 1.25663706212e-6;
    const Keff = 0.65e6 - (mu0 * 0.8e6 ** 2) / 2;
    const thin = (1.76085963023e11 * (0.1 + (4 * Math.sqrt(13e-12 * Keff)) / (2 * 0.8e6 * R))) / (2 * Math.PI);
    expect(Math.abs((r.outputs.frequency!.value as number) / thin - 1)).toBeLessThan(0.1);
    const below = runCalculator(getCalculator("precessing-skyrmion"), { current: Ith * 0.9 });
    expect("stableRadius" in below.outputs).toBe(false);
    expect(below.outputs.traceStatus!.value).toMatch(/collapsed/);
  });

  it("bad input is refused by name", () => {
    // Common practice, no source.
    expect(() => runCalculator(getCalculator("wall-motion"), { alpha: 0 })).toThrow(InputError);
    expect(() => runCalculator(getCalculator("wall-motion"), { polarity: 3 })).toThrow(/polarity/);
    expect(() => runCalculator(getCalculator("precessing-skyrmion"), { P: 0 })).toThrow(/P/);
    expect(() => runCalculator(getCalculator("wall-trace"), { duration: "-1 ns" })).toThrow(/duration/);
  });
});
