import { describe, expect, it } from "vitest";
import {
  chainModel,
  sectorLevels,
  xxzGroundEnergyPerSite,
  xxzGap,
  xxzSpinonEnergy,
  xxzEllipticData,
  transverseIsingRing,
  InputError,
  type SectorLabel,
} from "@helicoid/lib/internal";
import { runPython } from "../../helpers/python.js";

describe("Bethe-ansatz closed forms, Delta > 1", () => {
  it("reach the stated values of e0 and the gap", () => {
    // Source: issue 15 (values computed by the authors with the closed forms), cross-checked
    // below with mpmath; formulas: R. Orbach, Phys. Rev. 112, 309 (1958); J. des Cloizeaux,
    // M. Gaudin, J. Math. Phys. 7, 1384 (1966).
    const e0 = { 2: -0.617222045976, 5: -1.29950005101, 10: -2.524937500393 };
    const gap = { 2: 0.38980227142, 5: 3.120997628327, 10: 8.055124966151 };
    for (const D of [2, 5, 10] as const) {
      expect(xxzGroundEnergyPerSite(D)).toBeCloseTo(e0[D], 11);
      expect(xxzGap(D)).toBeCloseTo(gap[D], 10);
    }
    // Source: L. Hulthen, Ark. Mat. Astron. Fys. 26A, 1 (1938): 1/4 - ln 2.
    expect(xxzGroundEnergyPerSite(1)).toBeCloseTo(0.25 - Math.log(2), 15);
    expect(() => xxzGap(0.5)).toThrow(InputError);
  });

  it("agree with mpmath: series for e0, elliptic modulus from K'/K = gamma/pi, gap and spinon band", () => {
    // Source: the same formulas evaluated independently with mpmath (ellipk, findroot on the modulus,
    // the modulus found by bisection rather than from theta functions).
    const Ds = [1.2, 2, 3.5, 7];
    const ref = runPython<Array<{ e0: number; gap: number; k: number; eps: number[] }>>(
      `
import sys, json, mpmath as mp
mp.mp.dps = 30
out = []
for D in json.load(sys.stdin):
    g = mp.acosh(D)
    e0 = D/mp.mpf(4) - mp.sinh(g)*(mp.mpf(1)/2 + 2*mp.nsum(lambda n: 1/(mp.e**(2*n*g)+1), [1, mp.inf]))
    m = mp.findroot(lambda mm: mp.ellipk(1-mm)/mp.ellipk(mm) - g/mp.pi, (mp.mpf('1e-12'), mp.mpf(1)-mp.mpf('1e-12')), solver='bisect')
    K = mp.ellipk(m)
    gap = 2*mp.sinh(g)*K/mp.pi*mp.sqrt(1-m)
    q = mp.e**(-g)
    eps = [float(mp.sinh(g)*K/mp.pi*mp.sqrt(1 - m*mp.sin(x)**2)) for x in [0, 0.3, 0.9, mp.pi/2]]
    out.append(dict(e0=float(e0), gap=float(gap), k=float(mp.sqrt(m)), eps=eps))
print(json.dumps(out))
`,
      Ds,
    );
    Ds.forEach((D, i) => {
      expect(xxzGroundEnergyPerSite(D)).toBeCloseTo(ref[i]!.e0, 12);
      expect(xxzGap(D)).toBeCloseTo(ref[i]!.gap, 11);
      expect(xxzEllipticData(D).k).toBeCloseTo(ref[i]!.k, 11);
      [0, 0.3, 0.9, Math.PI / 2].forEach((K, j) => expect(xxzSpinonEnergy(D, K)).toBeCloseTo(ref[i]!.eps[j]!, 11));
    });
  });

  it("match exact diagonalization of rings: e0 per site (N = 16) and the one-spinon band (odd N = 15)", () => {
    // Common practice, no source: in the gapped regime finite-ring corrections fall off
    // exponentially with N (measured: a factor ~3.2 per two sites at Delta = 5, 1.6e-5 per site at N = 16).
    const D = 5;
    const diffs: number[] = [];
    for (const N of [12, 14, 16]) {
      const even = chainModel({ N, Jz: D, Jperp: 1 });
      let e0 = Infinity;
      for (const label of [
        { nUp: N / 2, m: 0, flip: 1 },
        { nUp: N / 2, m: N / 2, flip: 1 },
        { nUp: N / 2, m: 0, flip: -1 },
        { nUp: N / 2, m: N / 2, flip: -1 },
      ] as SectorLabel[]) {
        e0 = Math.min(e0, sectorLevels(even, label).values[0]!);
      }
      diffs.push(Math.abs(e0 / N - xxzGroundEnergyPerSite(D)));
    }
    expect(diffs[2]).toBeLessThan(2e-5);
    expect(diffs[0]! / diffs[1]!).toBeGreaterThan(2.5);
    expect(diffs[1]! / diffs[2]!).toBeGreaterThan(2.5);
    // one spinon on the odd ring: E(k) - N e0 = eps(k) (k = 2 pi m / N the ring momentum)
    const N = 15;
    const odd = chainModel({ N, Jz: D, Jperp: 1 });
    for (const mm of [0, 2, 4, 7]) {
      const E = sectorLevels(odd, { nUp: 8, m: mm, flip: 0 }).values[0]!;
      const k = (2 * Math.PI * mm) / N;
      expect(Math.abs(E - N * xxzGroundEnergyPerSite(D) - xxzSpinonEnergy(D, k))).toBeLessThan(3e-4);
    }
  });
});

describe("transverse-field Ising ring in closed form", () => {
  it("reaches E0 = -2.730828642305 for N = 10, |Jz| = 1, hx = 0.3", () => {
    // Source: issue 15 (value from numpy ED by the authors); Pfeuty, Ann. Phys. 57, 79 (1970).
    expect(transverseIsingRing(10, 1, 0.3).E0).toBeCloseTo(-2.730828642305, 11);
    expect(transverseIsingRing(10, -1, 0.3).E0).toBeCloseTo(-2.730828642305, 11);
  });
  it("gives the lowest levels of both parity sectors exactly, for even and odd rings of either sign", () => {
    // The oracle: ED in the two sectors of the parity P = prod sigma^x (pi rotation about x), our
    // flip sectors, which are the fermion-parity sectors of the closed form.
    for (const [N, Jz, hx] of [
      [10, 1, 0.3],
      [9, 1, 0.3],
      [9, -1, 0.8],
      [8, 1, 1.7],
      [7, 2, 0.25],
      [12, -1, 0.5],
    ] as const) {
      const m = chainModel({ N, Jz, Jperp: 0, hx });
      const even = sectorLevels(m, { nUp: null, m: null, flip: 1 }, { tol: 1e-12 }).values[0]!;
      const odd = sectorLevels(m, { nUp: null, m: null, flip: -1 }, { tol: 1e-12 }).values[0]!;
      const cf = transverseIsingRing(N, Jz, hx);
      expect(cf.evenSector).toBeCloseTo(even, 10);
      expect(cf.oddSector).toBeCloseTo(odd, 10);
      expect(cf.E0).toBeCloseTo(Math.min(even, odd), 10);
    }
  });
});

describe("Heisenberg ring", () => {
  it("N = 20, S^z = 0: E0 / N = -0.4452193265", () => {
    // Source: issue 15 (numpy ED by the authors); cross-checked in the benchmark with eigsh.
    const m = chainModel({ N: 20, Jz: 1, Jperp: 1 });
    let e0 = Infinity;
    for (const mm of [0, 10]) for (const p of [1, -1] as const) e0 = Math.min(e0, sectorLevels(m, { nUp: 10, m: mm, flip: p }).values[0]!);
    expect(e0 / 20).toBeCloseTo(-0.4452193265, 9);
  });
});
