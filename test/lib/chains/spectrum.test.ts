import { describe, expect, it } from "vitest";
import {
  chainModel,
  ChainSector,
  combinadicRank,
  combinadicUnrank,
  HalfRanker,
  nextSamePopcount,
  sectorLevels,
  sectorDense,
  denseSpectrum,
  thermalAverages,
  chainSectors,
  InputError,
  ComputationStopped,
  type ChainModel,
} from "@helicoid/lib/internal";
import { runPython } from "../../helpers/python.js";

// The oracle: Debian's numpy/scipy build the Hamiltonian themselves (plain basis of one S^z sector or
// all 2^N states) and diagonalize it with scipy.sparse.linalg.eigsh (lowest levels) or numpy eigh (all).
const oracle = `
import sys, json, numpy as np, scipy.sparse as sp, scipy.sparse.linalg as sla
cases = json.load(sys.stdin)
out = []
for c in cases:
    N, Jz, Jp, hx, hz, per = c["N"], c["Jz"], c["Jperp"], c["hx"], c["hz"], c["periodic"]
    nUp = c.get("nUp")
    states = [s for s in range(2**N) if nUp is None or bin(s).count("1") == nUp]
    index = {s: i for i, s in enumerate(states)}
    bonds = [(i, (i+1) % N) for i in range(N if per else N-1)]
    rows, cols, vals = [], [], []
    for a, s in enumerate(states):
        d = 0.0
        for (i, j) in bonds:
            si = 0.5 if s >> i & 1 else -0.5
            sj = 0.5 if s >> j & 1 else -0.5
            d += Jz * si * sj
            if si != sj and Jp != 0:
                rows.append(index[s ^ (1 << i) ^ (1 << j)]); cols.append(a); vals.append(Jp / 2)
        for i in range(N):
            d -= hz * (0.5 if s >> i & 1 else -0.5)
            if hx != 0:
                rows.append(index[s ^ (1 << i)]); cols.append(a); vals.append(-hx / 2)
        rows.append(a); cols.append(a); vals.append(d)
    H = sp.csr_matrix((vals, (rows, cols)), shape=(len(states), len(states)))
    if c.get("all"):
        out.append(sorted(np.linalg.eigvalsh(H.toarray()).tolist()))
    else:
        w = sla.eigsh(H, k=c["levels"], which="SA", tol=1e-12)[0]
        out.append(sorted(w.tolist()))
print(json.dumps(out))
`;

function model(m: Partial<ChainModel> & { N: number }): ChainModel {
  return chainModel(m);
}

describe("basis ranking", () => {
  // Source: D. E. Knuth, TAOCP 4A, 7.2.1.3 (combinatorial number system: colex rank of n-subsets).
  it("combinadic rank = position in increasing order = rank by halves, and unrank inverts it", () => {
    for (const [N, n] of [
      [10, 5],
      [11, 3],
      [16, 8],
      [7, 0],
      [9, 9],
    ] as const) {
      const halves = new HalfRanker(N, n);
      let s = 2 ** n - 1;
      const count = halves.size;
      for (let i = 0; i < count; i++) {
        expect(combinadicRank(s)).toBe(i);
        expect(halves.rank(s)).toBe(i);
        expect(combinadicUnrank(i, n, N)).toBe(s);
        if (i + 1 < count) s = nextSamePopcount(s);
      }
    }
  });
});

describe("exact diagonalization against scipy (eigsh on a matrix built in Python)", () => {
  it("lowest levels of S^z sectors and of the full space with fields, rings and open chains", () => {
    const cases = [
      { N: 12, Jz: 2, Jperp: 1, hx: 0, hz: 0, periodic: true, nUp: 6, levels: 4 },
      { N: 11, Jz: 5, Jperp: 1, hx: 0, hz: 0.3, periodic: true, nUp: 6, levels: 4 },
      { N: 12, Jz: -1.5, Jperp: 0.4, hx: 0, hz: 0.1, periodic: false, nUp: 5, levels: 3 },
      { N: 10, Jz: 3, Jperp: 0.5, hx: 0.4, hz: 0.2, periodic: true, nUp: null, levels: 4 },
      { N: 9, Jz: 1, Jperp: 1, hx: 0.7, hz: 0, periodic: false, nUp: null, levels: 3 },
    ];
    const ref = runPython<number[][]>(
      oracle,
      cases.map((c) => ({ ...c, levels: c.levels + 3 })),
    );
    cases.forEach((c, i) => {
      const m = model({ N: c.N, Jz: c.Jz, Jperp: c.Jperp, hx: c.hx, hz: c.hz, boundary: c.periodic ? "periodic" : "open" });
      const r = sectorLevels(m, { nUp: c.nUp, m: null, flip: 0 }, { levels: c.levels, tol: 1e-11 });
      // a single-vector Lanczos finds an exactly degenerate copy (here +-k pairs of a sector without
      // momentum label) only through rounding: every level found must be one of scipy's, the ground
      // state must be scipy's lowest
      expect(r.values[0]).toBeCloseTo(ref[i]![0]!, 9);
      for (const e of r.values) expect(Math.min(...ref[i]!.map((x) => Math.abs(x - e)))).toBeLessThan(1e-9);
      for (const res of r.residuals) expect(res).toBeLessThan(1e-9);
    });
  });

  it("the union of all momentum (and flip) sectors reproduces the full spectrum of an S^z sector", () => {
    const cases = [
      { N: 10, Jz: 2, Jperp: 1, hx: 0, hz: 0, periodic: true, nUp: 5, all: true },
      { N: 9, Jz: 3, Jperp: 0.7, hx: 0, hz: 0.2, periodic: true, nUp: 4, all: true },
      { N: 8, Jz: 2, Jperp: 0.6, hx: 0.5, hz: 0, periodic: true, nUp: null, all: true },
      { N: 7, Jz: 2, Jperp: 0.6, hx: 0.5, hz: 0.3, periodic: true, nUp: null, all: true },
    ];
    const ref = runPython<number[][]>(oracle, cases);
    cases.forEach((c, i) => {
      const m = model({ N: c.N, Jz: c.Jz, Jperp: c.Jperp, hx: c.hx, hz: c.hz });
      // momentum only
      const spec = denseSpectrum(m);
      const levels: number[] = [];
      for (const s of spec.sectors) if (s.label.nUp === c.nUp) levels.push(...s.values);
      levels.sort((a, b) => a - b);
      expect(levels.length).toBe(ref[i]!.length);
      levels.forEach((e, j) => expect(e).toBeCloseTo(ref[i]![j]!, 9));
      // momentum x flip parity, where the flip applies (hz = 0)
      if (c.hz === 0) {
        const withFlip: number[] = [];
        for (let mm = 0; mm < c.N; mm++) {
          for (const p of [1, -1] as const) {
            const sector = new ChainSector(c.N, { nUp: c.nUp, m: mm, flip: p });
            if (sector.dim === 0) continue;
            withFlip.push(...sectorDense(m, sector).values);
          }
        }
        withFlip.sort((a, b) => a - b);
        expect(withFlip.length).toBe(ref[i]!.length);
        withFlip.forEach((e, j) => expect(e).toBeCloseTo(ref[i]![j]!, 8));
      }
    });
  });
});

describe("Lanczos without re-orthogonalization (lowest level)", () => {
  it("agrees with the thick-restart result and gives an eigenvector with a small residual", () => {
    // Common practice, no source: both solvers on one operator; the residual is computed here.
    const m = model({ N: 14, Jz: 1.5, Jperp: 1, hz: 0.1 });
    const label = { nUp: 7, m: null, flip: 0 as const };
    const full = sectorLevels(m, label, { tol: 1e-11 });
    const plain = sectorLevels(m, label, { tol: 1e-11, reorthogonalization: "none" });
    expect(plain.values[0]).toBeCloseTo(full.values[0]!, 11);
    const y = plain.vectors[0]!;
    const w = new Float64Array(y.length);
    plain.hamiltonian.apply(y, w);
    let r = 0,
      n = 0;
    for (let i = 0; i < y.length; i++) {
      r += (w[i]! - plain.values[0]! * y[i]!) ** 2;
      n += y[i]! ** 2;
    }
    expect(Math.sqrt(n)).toBeCloseTo(1, 12);
    expect(Math.sqrt(r)).toBeLessThan(1e-8);
  });
});

describe("memory budget, bad input, stopping", () => {
  it("refuses a sector over the budget before allocating, with the estimate", () => {
    const m = model({ N: 30, Jz: 1, Jperp: 1 });
    let err: unknown;
    try {
      sectorLevels(m, { nUp: 15, m: null, flip: 0 }, { memoryBudget: 1e9 });
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(InputError);
    expect((err as InputError).parameter).toBe("N");
    expect((err as Error).message).toMatch(/about 155117520 states/);
  });
  it("names bad labels and models", () => {
    expect(() => chainModel({ N: 1 })).toThrow(InputError);
    expect(() => chainModel({ N: 8, Jz: NaN })).toThrow(/Jz/);
    const m = model({ N: 8, hx: 0.2 });
    expect(() => sectorLevels(m, { nUp: 4, m: null, flip: 0 })).toThrow(/S\^z is not conserved/);
    expect(() => sectorLevels(model({ N: 8, hz: 0.2 }), { nUp: 4, m: 0, flip: 1 })).toThrow(InputError);
  });
  it("reports progress and stops on request", () => {
    const m = model({ N: 16, Jz: 1, Jperp: 1 });
    const seen: number[] = [];
    expect(() => sectorLevels(m, { nUp: 8, m: null, flip: 0 }, { krylov: 20, onProgress: (p) => seen.push(p.matvecs), shouldStop: () => seen.length >= 2 })).toThrow(
      ComputationStopped,
    );
    expect(seen.length).toBe(2);
  });
});

describe("thermal averages from the dense spectrum", () => {
  it("energy, specific heat and entropy agree with numpy on the full 2^N spectrum", () => {
    const c = { N: 8, Jz: 2, Jperp: 0.5, hx: 0.3, hz: 0.1, periodic: true, nUp: null, all: true };
    const [levels] = runPython<number[][]>(oracle, [c]);
    const m = model({ N: 8, Jz: 2, Jperp: 0.5, hx: 0.3, hz: 0.1 });
    const th = thermalAverages(denseSpectrum(m), [0.3, 1, 5]);
    // Common practice, no source: canonical averages from the levels.
    [0.3, 1, 5].forEach((T, i) => {
      const e0 = levels![0]!;
      const w = levels!.map((e) => Math.exp(-(e - e0) / T));
      const Z = w.reduce((a, b) => a + b, 0);
      const U = levels!.reduce((a, e, j) => a + e * w[j]!, 0) / Z;
      const U2 = levels!.reduce((a, e, j) => a + e * e * w[j]!, 0) / Z;
      expect(th.energy[i]).toBeCloseTo(U / 8, 10);
      expect(th.specificHeat[i]).toBeCloseTo((U2 - U * U) / T / T / 8, 10);
      expect(th.entropy[i]).toBeCloseTo(((U - e0) / T + Math.log(Z)) / 8, 10);
    });
    expect(chainSectors(m).length).toBe(8);
  });
});
