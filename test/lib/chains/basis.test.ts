import { describe, expect, it } from "vitest";
import {
  chainModel,
  chainSectors,
  ChainSector,
  denseSpectrum,
  reverseBits,
  sectorGroupOrder,
  sectorName,
  sectorLevels,
  InputError,
  type ChainModel,
  type SectorLabel,
} from "@helicoid/lib/internal";
import { runPython } from "../../helpers/python.js";

// Oracle 1 (spectra): numpy builds the full Hamiltonian of each case itself (all 2^N states, or one
// S^z sector when hx = 0) from the Pauli algebra and diagonalizes it densely with numpy.linalg.eigvalsh.
// Oracle 2 (sector sizes): the number of times the one-dimensional representation chi occurs in the
// permutation representation of the group on the basis states, (1/|G|) sum_g chi(g)^* #fix(g)
// (Source: J.-P. Serre, Linear Representations of Finite Groups, section 2.3, Theorem 4), with the
// group elements T^l R^r F^f acting on bit patterns as written here in Python.
const oracle = `
import sys, json, numpy as np
cases = json.load(sys.stdin)
out = []
for c in cases:
    N, Jz, Jp, hx, hz, per = c["N"], c["Jz"], c["Jperp"], c["hx"], c["hz"], c["periodic"]
    ups = [c["nUp"]] if c.get("nUp") is not None else None
    states = [s for s in range(2**N) if ups is None or bin(s).count("1") in ups]
    index = {s: i for i, s in enumerate(states)}
    H = np.zeros((len(states), len(states)))
    bonds = [(i, (i+1) % N) for i in range(N if per else N-1)]
    for a, s in enumerate(states):
        for (i, j) in bonds:
            si = 0.5 if s >> i & 1 else -0.5
            sj = 0.5 if s >> j & 1 else -0.5
            H[a, a] += Jz * si * sj
            if si != sj:
                H[index[s ^ (1 << i) ^ (1 << j)], a] += Jp / 2
        for i in range(N):
            H[a, a] -= hz * (0.5 if s >> i & 1 else -0.5)
            if hx != 0:
                H[index[s ^ (1 << i)], a] -= hx / 2
    levels = np.linalg.eigvalsh(H).tolist()
    # group-theory sector sizes
    def act(s, l, r, f):
        if f: s = s ^ (2**N - 1)
        if r: s = int(format(s, "0%db" % N)[::-1], 2)
        for _ in range(l): s = ((s << 1) | (s >> (N - 1))) & (2**N - 1)
        return s
    sizes = []
    fixes = {}
    for lab in c["labels"]:
        nUp, m, fl, rf = lab["nUp"], lab["m"], lab["flip"], lab.get("reflection", 0)
        basis = [s for s in range(2**N) if nUp is None or bin(s).count("1") == nUp]
        L = N if m is not None else 1
        tot = 0j; order = 0
        for l in range(L):
            for r in ([0, 1] if rf else [0]):
                for f in ([0, 1] if fl else [0]):
                    order += 1
                    chi = np.exp(2j * np.pi * (m or 0) * l / N) * (rf if r else 1) * (fl if f else 1)
                    key = (nUp, l, r, f)
                    if key not in fixes: fixes[key] = sum(1 for s in basis if act(s, l, r, f) == s)
                    fix = fixes[key]
                    tot += np.conj(chi) * fix
        sizes.append(round((tot / order).real))
    out.append({"levels": levels, "sizes": sizes})
print(json.dumps(out))
`;

interface Case {
  N: number;
  Jz: number;
  Jperp: number;
  hx: number;
  hz: number;
  periodic: boolean;
  nUp?: number;
}

function modelOf(c: Case): ChainModel {
  return chainModel({ N: c.N, Jz: c.Jz, Jperp: c.Jperp, hx: c.hx, hz: c.hz, boundary: c.periodic ? "periodic" : "open" });
}

describe("reflection and spin-inversion sectors", () => {
  it("bit reversal maps site j to N - 1 - j", () => {
    // Common practice, no source: checked bit by bit.
    for (const N of [3, 7, 12, 20]) {
      for (const s of [1, 5, 0b1011, (1 << N) - 2]) {
        const r = reverseBits((s >>> 0) & ((1 << N) - 1), N);
        for (let j = 0; j < N; j++) expect((r >>> (N - 1 - j)) & 1).toBe((s >>> j) & 1);
      }
    }
  });

  it("the union of all sector spectra (momentum, reflection at k = 0, pi, flip) is the full spectrum, and sector sizes follow the character formula", () => {
    const cases: Case[] = [
      // Heisenberg-like even ring, hx = 0, hz = 0: S^z x k x R (k = 0, pi) x F (S^z = 0)
      { N: 12, Jz: 2, Jperp: 1, hx: 0, hz: 0, periodic: true, nUp: 6 },
      { N: 12, Jz: 1.5, Jperp: 1, hx: 0, hz: 0, periodic: true, nUp: 5 },
      // transverse field: no S^z, k x R x (pi rotation about x)
      { N: 10, Jz: 3, Jperp: 0.6, hx: 0.7, hz: 0, periodic: true },
      // odd ring with both fields: k x R only
      { N: 9, Jz: 2, Jperp: 0.8, hx: 0.4, hz: 0.3, periodic: true },
      // open chains: reflection (and flip)
      { N: 12, Jz: -1.5, Jperp: 0.4, hx: 0, hz: 0, periodic: false, nUp: 6 },
      { N: 9, Jz: 2, Jperp: 1, hx: 0.5, hz: 0, periodic: false },
    ];
    const labelsOf = (c: Case): SectorLabel[] => chainSectors(modelOf(c), { reflection: true, flip: true }).filter((l) => c.nUp === undefined || l.nUp === c.nUp);
    const ref = runPython<Array<{ levels: number[]; sizes: number[] }>>(
      oracle,
      cases.map((c) => ({ ...c, nUp: c.nUp ?? null, labels: labelsOf(c) })),
    );
    cases.forEach((c, i) => {
      const m = modelOf(c);
      const labels = labelsOf(c);
      // every symmetry the model has was used
      if (c.periodic) expect(labels.some((l) => l.reflection)).toBe(true);
      else expect(labels.every((l) => l.reflection)).toBe(true);
      if (c.hz === 0 && (c.hx !== 0 || 2 * c.nUp! === c.N)) expect(labels.every((l) => l.flip !== 0)).toBe(true);
      const spec = denseSpectrum(m, { reflection: true, flip: true });
      const levels: number[] = [];
      for (const s of spec.sectors) if (c.nUp === undefined || s.label.nUp === c.nUp) levels.push(...s.values);
      levels.sort((a, b) => a - b);
      expect(levels.length).toBe(ref[i]!.levels.length);
      let worst = 0;
      levels.forEach((e, j) => (worst = Math.max(worst, Math.abs(e - ref[i]!.levels[j]!))));
      expect(worst).toBeLessThan(1e-9);
      // sizes: ours (orbits compatible with the character) against the character formula
      labels.forEach((label, j) => expect(new ChainSector(c.N, label).dim, sectorName(c.N, label)).toBe(ref[i]!.sizes[j]));
      expect(ref[i]!.sizes.reduce((a, b) => a + b, 0)).toBe(ref[i]!.levels.length);
    });
  });

  it("Lanczos in a reflection sector of a larger ring agrees with the k = 0 sector it splits", () => {
    // Common practice, no source: the k = 0 spectrum is the union of its R = +-1 parts.
    const m = chainModel({ N: 16, Jz: 1.3, Jperp: 1 });
    const whole = sectorLevels(m, { nUp: 8, m: 0, flip: 1 }, { levels: 3, tol: 1e-11 });
    const parts = [1, -1].flatMap((r) => sectorLevels(m, { nUp: 8, m: 0, flip: 1, reflection: r as 1 | -1 }, { levels: 3, tol: 1e-11 }).values);
    parts.sort((a, b) => a - b);
    for (let i = 0; i < 3; i++) expect(parts[i]).toBeCloseTo(whole.values[i]!, 9);
    const r = sectorLevels(m, { nUp: 8, m: 0, flip: 1, reflection: 1 });
    expect(r.name).toBe("S^z = 0, k = 0 (m = 0), R = +1, F = +1");
    expect(r.dimension).toBeLessThan(whole.dimension);
    expect(sectorGroupOrder(16, r.label)).toBe(64);
  });

  it("refuses a reflection label where the reflection does not commute", () => {
    const m = chainModel({ N: 8, Jz: 1, Jperp: 1 });
    expect(() => sectorLevels(m, { nUp: 4, m: 1, flip: 0, reflection: 1 })).toThrow(InputError);
    expect(() => new ChainSector(8, { nUp: 4, m: 3, flip: 0, reflection: -1 })).toThrow(/k = 0 and k = pi/);
  });
});
