import { describe, expect, it } from "vitest";
import { getCalculator, runCalculator, InputError, type CalculatorSpec } from "@helicoid/lib";
import { chainCalculators } from "../../../lib/src/calculators/chains.js";
import { runPython } from "../../helpers/python.js";

// Oracle: numpy builds H on all 2^N states, takes the ground vector (eigh) and measures its
// translation eigenvalue <T> (site j -> j + 1), reflection <R> (j -> N - 1 - j), flip <F> (all spins)
// and total S^z directly on the state (no symmetry used in building or solving).
const labelOracle = `
import sys, json, numpy as np
c = json.load(sys.stdin)
N, Jz, Jp, hx, hz = c["N"], c["Jz"], c["Jperp"], c["hx"], c["hz"]
D = 2**N
H = np.zeros((D, D))
for s in range(D):
    for i in range(N):
        j = (i + 1) % N
        si = 0.5 if s >> i & 1 else -0.5; sj = 0.5 if s >> j & 1 else -0.5
        H[s, s] += Jz * si * sj - hz * si
        if si != sj: H[s ^ (1 << i) ^ (1 << j), s] += Jp / 2
        if hx: H[s ^ (1 << i), s] -= hx / 2
# the S^z = 0 block only when S^z is conserved (ground state of the whole space otherwise)
idx = [s for s in range(D) if hx or bin(s).count("1") == N // 2]
E, V = np.linalg.eigh(H[np.ix_(idx, idx)])
v = np.zeros(D); v[idx] = V[:, 0]
perm = lambda f: np.array([f(s) for s in range(D)])
rot = perm(lambda s: ((s << 1) | (s >> (N - 1))) & (D - 1))
rev = perm(lambda s: int(format(s, "0%db" % N)[::-1], 2))
flp = perm(lambda s: s ^ (D - 1))
def expval(p):
    w = np.zeros(D); w[p] = v
    return float(v @ w)
print(json.dumps({"E0": float(E[0]), "gap": float(E[1] - E[0]), "T": expval(rot), "R": expval(rev), "F": expval(flp)}))
`;

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
    for (const c of corners(getCalculator("chain-dynamics"), { N: 4, points: 20, hz: 0.5 }))
      checkResult(getCalculator("chain-dynamics"), runCalculator(getCalculator("chain-dynamics"), c));
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

  it("chain-spectrum names the ground state's sector, and the labels agree with the symmetry eigenvalues numpy measures", () => {
    // Source: numpy oracle above; Marshall's sign rule (E. Lieb, D. Mattis, J. Math. Phys. 3, 749
    // (1962)) also puts the Heisenberg ring's ground state at k = 0 for N/2 even and k = pi for N/2 odd.
    for (const c of [
      { N: 10, Jz: 1, Jperp: 1, hx: 0, hz: 0 },
      { N: 12, Jz: 1.5, Jperp: 1, hx: 0, hz: 0 },
      { N: 8, Jz: 2, Jperp: 0.7, hx: 0.6, hz: 0 },
    ]) {
      const ref = runPython<{ E0: number; T: number; R: number; F: number }>(labelOracle, c);
      const r = runCalculator(getCalculator("chain-spectrum"), { ...c, levels: 1 });
      expect(r.outputs.groundEnergy!.value as number).toBeCloseTo(ref.E0, 8);
      const name = r.outputs.groundSector!.value as string;
      const k = ref.T > 0 ? "k = 0 (m = 0)" : `k = pi (m = ${c.N / 2})`;
      expect(Math.abs(Math.abs(ref.T) - 1)).toBeLessThan(1e-8);
      expect(name).toContain(k);
      expect(name).toContain(`R = ${ref.R > 0 ? "+1" : "-1"}`);
      expect(name).toContain(`F = ${ref.F > 0 ? "+1" : "-1"}`);
      if (c.hx === 0) expect(name).toContain((c.N / 2) % 2 === 0 ? "k = 0" : "k = pi");
      expect(r.outputs.sectors!.value as string).toMatch(/R = -1/);
    }
  });

  it("chain-spectrum reports progress up to 1 and refuses requests over the work budget before computing", () => {
    // Common practice, no source: progress fractions rise to 1; the refusal names N and the estimate.
    const seen: number[] = [];
    runCalculator(getCalculator("chain-spectrum"), { N: 12, levels: 1 }, { onProgress: (f) => seen.push(f) });
    expect(seen.length).toBeGreaterThan(3);
    for (let i = 1; i < seen.length; i++) expect(seen[i]!).toBeGreaterThanOrEqual(seen[i - 1]! - 1e-12);
    expect(seen[seen.length - 1]).toBeCloseTo(1, 12);
    let called = false;
    expect(() => runCalculator(getCalculator("chain-spectrum"), { N: 24, levels: 4 }, { onProgress: () => (called = true) })).toThrow(
      /budget[\s\S]*states in the symmetry sectors/,
    );
    expect(called).toBe(false);
  });

  it("chain-dynamics above N = 16 switches to the thermodynamic-limit wall model and says so", () => {
    // Derived in lib/src/chains/wallBand.ts (two-wall semicircle, Villain edge 2 Jperp |sin q|,
    // J. Villain, Physica B 79, 1 (1975)); checked against ED in test/lib/chains/wallBand.test.ts.
    const small = runCalculator(getCalculator("chain-dynamics"), { N: 16, Jz: 20, Jperp: 1, hx: 0, T: 0, points: 40 });
    expect(small.outputs.model!.value as string).toMatch(/^exact diagonalization/);
    const big = runCalculator(getCalculator("chain-dynamics"), { N: 24, Jz: 20, Jperp: 1, hx: 0, T: 0, points: 400, omegaMax: 40, eta: 0.1 });
    expect(big.outputs.model!.value as string).toMatch(/thermodynamic-limit/);
    expect(big.status).toBe("warning");
    expect(big.notes.join(" ")).toMatch(/N = 24 > 16: thermodynamic-limit domain-wall model/);
    const q = big.outputs.qValues!.value as number[];
    expect(q.length).toBe(13);
    const omega = big.outputs.omega!.value as number[];
    const xx = big.outputs.mapXX!.value as number[];
    // the xx line at q = 2 pi / 24 peaks inside the continuum [Jz - 2 Jperp cos q, Jz + 2 Jperp cos q]
    const row = xx.slice(omega.length, 2 * omega.length);
    const peak = omega[row.indexOf(Math.max(...row))]!;
    expect(Math.abs(peak - 20)).toBeLessThan(2 * Math.cos(q[1]!));
    // ED and the model on one ring size: the weight of S^xx at q = 2 pi/16 agrees to O(Jperp/Jz)^2
    const ed = runCalculator(getCalculator("chain-dynamics"), { N: 16, Jz: 20, Jperp: 1, hx: 0, T: 0, points: 400, omegaMax: 40, eta: 0.1 });
    const tl = runCalculator(getCalculator("chain-dynamics"), { N: 17, Jz: 20, Jperp: 1, hx: 0, T: 0, points: 400, omegaMax: 40, eta: 0.1 });
    const area = (r: typeof ed, iq: number) => {
      const om = r.outputs.omega!.value as number[];
      const m = (r.outputs.mapXX!.value as number[]).slice(iq * om.length, (iq + 1) * om.length);
      return m.reduce((a, x) => a + x, 0) * (om[1]! - om[0]!);
    };
    expect(Math.abs(area(ed, 1) - area(tl, 1))).toBeLessThan(0.01);
    // Villain scattering appears at T > 0 inside the edge
    const hot = runCalculator(getCalculator("chain-dynamics"), { N: 32, Jz: 20, Jperp: 1, hx: 0, T: 8, points: 201, omegaMax: 4, eta: 0.05 });
    expect(Math.max(...(hot.outputs.mapZZ!.value as number[]))).toBeGreaterThan(0);
    expect(() => runCalculator(getCalculator("chain-dynamics"), { N: 24, Jz: -5 })).toThrow(/antiferromagnetic Jz > 0 above N = 16/);
  });

  it("bad input names the parameter", () => {
    expect(() => runCalculator(getCalculator("chain-spectrum"), { N: 40 })).toThrow(InputError);
    expect(() => runCalculator(getCalculator("chain-dynamics"), { N: 14, T: 2 })).toThrow(/at most 12 sites/);
    // the full-spectrum sums at T > 0 grow as (2^N / N)^3: N = 12 is over the work budget, refused with the estimate
    expect(() => runCalculator(getCalculator("chain-dynamics"), { N: 12, T: 2 })).toThrow(/within the budget[\s\S]*every level of 12 momentum sectors/);
    expect(() => runCalculator(getCalculator("wall-band"), { Jz: 0 })).toThrow(/Jz/);
    expect(() => runCalculator(getCalculator("chain-spectrum"), { Jz: "1 m" })).toThrow(/Jz/);
  });
});
