/**
 * Input uncertainties carried through calculators (lib/src/calculators/uncertainty.ts): reading
 * "15 ± 1 pJ/m" and {value, uncertainty}; first order against the analytic propagation formula and
 * against Monte Carlo (ours and numpy's) on a nearly linear output, the wall width parameter
 * Delta = sqrt(A / K_eff); the flag on a nonlinear output, the skyrmion radius close to the critical DMI.
 */
import { describe, expect, it } from "vitest";
import { getCalculator, runCalculator, splitUncertainInput, InputError, mu0 } from "@helicoid/lib";
import { runPython } from "../../helpers/python.js";

const wall = getCalculator("wall");
const skyrmion = getCalculator("skyrmion");

function inputError(fn: () => unknown): InputError {
  try {
    fn();
  } catch (e) {
    if (e instanceof InputError) return e;
    throw e;
  }
  throw new Error("expected an InputError");
}

describe("reading a value with its uncertainty", () => {
  it("accepts ±, +-, +/-, parentheses, a unit on either side and {value, uncertainty}", () => {
    // Common practice, no source: "x ± u unit" means value x and standard uncertainty u in that unit.
    const pJ = 1e-12;
    for (const text of ["15 ± 1 pJ/m", "15 +- 1 pJ/m", "15+/-1pJ/m", "(15 ± 1) pJ/m", "15 pJ/m ± 1 pJ/m", "15 pJ/m +- 1", "15 pJ/m ± 1000 fJ/m"]) {
      const s = splitUncertainInput("A", text, "J/m");
      expect(s.uncertainty! / pJ, text).toBeCloseTo(1, 12);
      const r = runCalculator(wall, { A: text }, { uncertainty: {} });
      expect(r.inputs.A!.value / pJ, text).toBeCloseTo(15, 12);
      expect(r.inputs.A!.uncertainty! / pJ, text).toBeCloseTo(1, 12);
    }
    const o = runCalculator(wall, { A: { value: "15 pJ/m", uncertainty: "1 pJ/m" } });
    expect(o.inputs.A!.uncertainty).toBeCloseTo(1e-12, 24);
    expect(runCalculator(wall, { A: { value: 15e-12, uncertainty: 1e-12 } }).inputs.A!.uncertainty).toBeCloseTo(1e-12, 24);
    // a bare-number uncertainty next to a value with a unit takes that unit
    expect(runCalculator(wall, { A: { value: "15 pJ/m", uncertainty: 1 } }).inputs.A!.uncertainty).toBeCloseTo(1e-12, 24);
    // zero uncertainty: the ordinary result, no propagation
    const zero = runCalculator(wall, { A: "15 ± 0 pJ/m" });
    expect(zero.uncertainty).toBeUndefined();
    expect(zero.outputs.width!.uncertainty).toBeUndefined();
  });

  it("refuses a malformed or negative uncertainty, one on a choice or whole-number input, and bad correlations", () => {
    expect(inputError(() => runCalculator(wall, { A: "15 ± pJ/m" })).parameter).toMatch(/^A/);
    expect(inputError(() => runCalculator(wall, { A: "15 ± 1 ± 2 pJ/m" })).parameter).toBe("A");
    expect(inputError(() => runCalculator(wall, { A: { value: "15 pJ/m", uncertainty: "-1 pJ/m" } })).expected).toMatch(/>= 0/);
    expect(inputError(() => runCalculator(wall, { A: "15 ± 1 T" })).parameter).toMatch(/A/);
    const motion = getCalculator("wall-motion"); // polarity: a choice input
    expect(inputError(() => runCalculator(motion, { polarity: { value: 1, uncertainty: 1 } })).expected).toMatch(/a choice cannot be uncertain/);
    const loop = getCalculator("berry-loop"); // twoS: a whole-number input
    expect(inputError(() => runCalculator(loop, { twoS: "2 ± 1" })).expected).toMatch(/a whole number cannot be uncertain/);
    const both = { A: "15 ± 1 pJ/m", Ku: "1.2 ± 0.05 MJ/m^3", Ms: "1.1 ± 0.02 MA/m" };
    expect(inputError(() => runCalculator(wall, both, { uncertainty: { correlations: [{ between: ["A", "Ku"], coefficient: 1.5 }] } })).expected).toMatch(/-1 to 1/);
    expect(inputError(() => runCalculator(wall, both, { uncertainty: { correlations: [{ between: ["A", "D"], coefficient: 0.5 }] } })).value).toBe("D");
    // pairwise -0.9 among three inputs: no covariance matrix has these (not positive semidefinite)
    const bad = [
      ["A", "Ku"],
      ["A", "Ms"],
      ["Ku", "Ms"],
    ].map(([a, b]) => ({ between: [a!, b!] as [string, string], coefficient: -0.9 }));
    expect(inputError(() => runCalculator(wall, both, { uncertainty: { correlations: bad } })).expected).toMatch(/positive semidefinite/);
    expect(inputError(() => runCalculator(wall, both, { uncertainty: { method: "monte-carlo", samples: 1e6 } })).parameter).toBe("uncertainty.samples");
  });
});

describe("first order and Monte Carlo on the wall width parameter Delta = sqrt(A / K_eff)", () => {
  const Ms = 1.1e6;
  const A = 15e-12;
  const Ku = 1.2e6;
  const uA = 0.6e-12;
  const uKu = 0.02e6;
  const uMs = 0.01e6;
  const r = 0.4; // correlation of A and Ku
  const inputs = { Ms: { value: Ms, uncertainty: uMs }, A: { value: A, uncertainty: uA }, Ku: { value: Ku, uncertainty: uKu } };
  const correlations = [{ between: ["A", "Ku"] as [string, string], coefficient: r }];

  it("first order equals the analytic propagation formula", () => {
    // Source: JCGM 100:2008 (GUM), eq. (13): u_c^2 = sum_ij c_i c_j r_ij u_i u_j with the sensitivity
    // coefficients of Delta = sqrt(A / K), K = Ku - mu0 Ms^2 / 2: c_A = Delta / (2A),
    // c_Ku = -Delta / (2K), c_Ms = Delta mu0 Ms / (2K) (derived by hand from the formula).
    const res = runCalculator(wall, inputs, { uncertainty: { correlations } });
    const K = Ku - (mu0 * Ms * Ms) / 2;
    const delta = Math.sqrt(A / K);
    const cA = delta / (2 * A);
    const cKu = -delta / (2 * K);
    const cMs = (delta * mu0 * Ms) / (2 * K);
    const u = Math.sqrt((cA * uA) ** 2 + (cKu * uKu) ** 2 + (cMs * uMs) ** 2 + 2 * r * cA * cKu * uA * uKu);
    expect(res.outputs.width!.value / delta).toBeCloseTo(1, 12);
    // the secant over +-u differs from the derivative by O((u/x)^2): well under 1 % here
    expect(Math.abs(res.outputs.width!.uncertainty! / u - 1)).toBeLessThan(0.005);
    expect(res.uncertainty!.method).toBe("first-order");
    expect(res.uncertainty!.flagged.width).toBeUndefined();
    expect(res.notes.join(" ")).toMatch(/first order \(JCGM 100:2008/);
    expect(res.notes.join(" ")).toMatch(/r\(A, Ku\) = 0.4/);
    // and without the correlation the cross term goes away
    const indep = runCalculator(wall, inputs);
    const u0 = Math.sqrt((cA * uA) ** 2 + (cKu * uKu) ** 2 + (cMs * uMs) ** 2);
    expect(Math.abs(indep.outputs.width!.uncertainty! / u0 - 1)).toBeLessThan(0.005);
    // the result survives a JSON round trip with its uncertainties
    const back = JSON.parse(JSON.stringify(res));
    expect(JSON.stringify(back)).toBe(JSON.stringify(res));
    expect(back.outputs.width.uncertainty).toBe(res.outputs.width!.uncertainty);
    expect(back.uncertainty.firstOrder.width).toBe(res.uncertainty!.firstOrder.width);
  });

  it("Monte Carlo agrees with first order and with numpy's Monte Carlo of the same formula; seeded runs repeat", () => {
    const samples = 2000;
    const mc = runCalculator(wall, inputs, { uncertainty: { correlations, method: "monte-carlo", samples, seed: 5 } });
    const sd = mc.outputs.width!.uncertainty!;
    const first = mc.uncertainty!.firstOrder.width!;
    expect(mc.uncertainty!.method).toBe("monte-carlo");
    expect(mc.uncertainty!.monteCarlo!.failed).toBe(0);
    // statistical error of a standard deviation from N draws: 1 / sqrt(2N) = 1.6 %
    expect(Math.abs(sd / first - 1)).toBeLessThan(0.06);
    expect(mc.uncertainty!.flagged.width).toBeUndefined();
    expect(mc.status).toBe("ok");
    // Reference library: numpy, 10^6 correlated normal draws of sqrt(A / (Ku - mu0 Ms^2 / 2)).
    const ref = runPython<{ sd: number; mean: number }>(
      `
import json, sys, numpy as np
d = json.load(sys.stdin)
rng = np.random.default_rng(1)
cov = np.array([[d["uA"]**2, d["r"]*d["uA"]*d["uKu"], 0], [d["r"]*d["uA"]*d["uKu"], d["uKu"]**2, 0], [0, 0, d["uMs"]**2]])
x = rng.multivariate_normal([d["A"], d["Ku"], d["Ms"]], cov, size=1000000)
delta = np.sqrt(x[:, 0] / (x[:, 1] - d["mu0"] * x[:, 2]**2 / 2))
print(json.dumps({"sd": float(delta.std(ddof=1)), "mean": float(delta.mean())}))
`,
      { A, Ku, Ms, uA, uKu, uMs, r, mu0 },
    );
    expect(Math.abs(sd / ref.sd - 1)).toBeLessThan(0.06);
    expect(Math.abs(mc.uncertainty!.monteCarlo!.mean.width! - ref.mean)).toBeLessThan((4 * ref.sd) / Math.sqrt(samples));
    const again = runCalculator(wall, inputs, { uncertainty: { correlations, method: "monte-carlo", samples, seed: 5 } });
    expect(again.outputs.width!.uncertainty).toBe(sd);
    expect(mc.notes.join(" ")).toMatch(/Monte Carlo \(JCGM 101:2008\): 2000 draws.*seed 5/);
  }, 60_000);

  it("an input whose uncertainty reaches a physical limit: no state at A - u, flagged, no uncertainty given", () => {
    const res = runCalculator(wall, { A: "1 ± 2 pJ/m" });
    expect(res.status).toBe("warning");
    expect(res.outputs.width!.uncertainty).toBeUndefined();
    expect(res.uncertainty!.firstOrder.width).toBeNull();
    expect(res.uncertainty!.flagged.width).toMatch(/no value at A - u = -1 pJ\/m/);
    expect(res.notes.join(" ")).toMatch(/width: uncertainty not trustworthy/);
  });
});

describe("a nonlinear case: the skyrmion radius close to the critical DMI", () => {
  it("first order flags the radius, Monte Carlo disagrees with it, the status is a warning", () => {
    // D_c = 4 sqrt(A K_eff) / pi for the calculator's default film (the wall calculator's criticalDmi;
    // Source: A. Thiaville et al., EPL 100, 57002 (2012)). At B = 5 mT and D = 0.9 D_c the radius grows
    // steeply with D (to the expansion of the skyrmion just above), so a 2 % uncertainty of D is not
    // small: the curvature term is a large fraction of the first-order u, and the Monte Carlo mean lies
    // well above the value at the central D (R(D) is convex there).
    const Dc = runCalculator(wall, {}).outputs.criticalDmi!.value as number;
    const film = { D: { value: 0.9 * Dc, uncertainty: 0.02 * Dc }, B: "5 mT" };
    const first = runCalculator(skyrmion, film, { noSweep: true });
    expect(first.status).toBe("warning");
    const R = first.outputs.radius!.value as number;
    const u1 = first.outputs.radius!.uncertainty!;
    expect(R).toBeGreaterThan(20e-9);
    expect(u1).toBeGreaterThan(0.3 * R); // a 2 % input uncertainty gives tens of percent
    expect(first.uncertainty!.flagged.radius).toMatch(/nonlinear within the uncertainty/);
    expect(first.notes.join(" ")).toMatch(/radius: uncertainty not trustworthy/);
    const mc = runCalculator(skyrmion, film, { noSweep: true, uncertainty: { method: "monte-carlo", samples: 30, seed: 2 } });
    const mean = mc.uncertainty!.monteCarlo!.mean.radius;
    expect(mc.uncertainty!.flagged.radius).toMatch(/nonlinear/);
    // the Monte Carlo part of the flag: a shifted mean, a different spread, or draws with no state
    expect(mc.uncertainty!.flagged.radius).toMatch(/Monte Carlo/);
    if (mean !== null) expect(mean - R).toBeGreaterThan(0.25 * u1);
    // far from D_c (D = 0.5 D_c, B = 50 mT) the same relative uncertainty is linear: no flag on the radius
    const calm = runCalculator(skyrmion, { D: { value: 0.5 * Dc, uncertainty: 0.005 * Dc } }, { noSweep: true });
    expect(calm.uncertainty!.flagged.radius).toBeUndefined();
    expect(calm.outputs.radius!.uncertainty).toBeGreaterThan(0);
  }, 240_000);
});

describe("bounded work", () => {
  it("refuses more Monte Carlo draws than about two minutes of runs, before drawing", () => {
    // the skyrmion calculator takes a large fraction of a second per run: 20000 draws are hours
    const e = inputError(() => runCalculator(skyrmion, { D: "1.5 ± 0.05 mJ/m^2" }, { noSweep: true, uncertainty: { method: "monte-carlo", samples: 20000 } }));
    expect(e.parameter).toBe("uncertainty.samples");
    expect(e.expected).toMatch(/at most about \d+ Monte Carlo draws for 'skyrmion'/);
  }, 120_000);
});
