import { describe, expect, it } from "vitest";
import { hardAxisParityBlocks, hardAxisTunnelSplitting, hardAxisQuenchingFields, giantSpinLevels, giantSpinMatrix, gargQuenchingPeriod, tunnelSplittingAnyField } from "../../../lib/src/berry/giantSpin.js";
import { kB } from "../../../lib/src/quantity/constants.js";
import { InputError } from "../../../lib/src/errors.js";
import { runPython } from "../../helpers/python.js";
import { symmetricEigenvaluesDD, ddSub, ddToNumber } from "../../../lib/src/numeric/doubleDouble.js";

// Invented molecular magnet "Ferrowheel-10" (S = 10, D = 0.29 K, E = 0.047 K, g = 2): demo values.
const mol = { S: 10, D: 0.29 * kB, E: 0.047 * kB, g: 2 };

describe("single large spin: levels and tunnel splitting", () => {
  it("levels for an oblique field agree with numpy.linalg.eigvalsh of the same Hamiltonian built in numpy", () => {
    // Source: numpy (Debian) as oracle; the spin matrices are rebuilt there independently.
    const B: [number, number, number] = [0.3, 0.4, 0.2];
    const r = Math.hypot(...B);
    const ours = giantSpinLevels(mol, [r], [B[0] / r, B[1] / r, B[2] / r])[0]!;
    const ref = runPython<number[]>(`
import json, sys, numpy as np
d = json.load(sys.stdin); S = d["S"]; m = np.arange(S, -S - 1, -1)
sp = np.diag(np.sqrt(S * (S + 1) - m[1:] * (m[1:] + 1)), 1)
sx = (sp + sp.T) / 2; sy = (sp - sp.T) / 2j; sz = np.diag(m)
muB = 9.2740100783e-24
H = -d["D"] * sz @ sz + d["E"] * (sx @ sx - sy @ sy) - d["g"] * muB * (d["B"][0] * sx + d["B"][1] * sy + d["B"][2] * sz)
print(json.dumps(np.linalg.eigvalsh(H).tolist()))`, { ...mol, B });
    const scale = mol.D * mol.S * mol.S;
    ours.forEach((v, i) => expect(Math.abs(v - ref[i]!) / scale).toBeLessThan(1e-13));
  });

  it("double-double splitting agrees with a 40-digit mpmath diagonalization", () => {
    // Source: mpmath (Debian python3-mpmath) eigsy at 40 significant digits as oracle.
    const Bx = 0.05;
    const ours = hardAxisTunnelSplitting(mol, Bx);
    const H = giantSpinMatrix(mol, [Bx, 0, 0]);
    const ref = runPython<{ split: string }>(`
import json, sys, mpmath as mp
mp.mp.dps = 40
d = json.load(sys.stdin); n = d["n"]
A = mp.matrix(n, n)
for i in range(n):
    for j in range(n):
        A[i, j] = mp.mpf(d["re"][i * n + j])
E = sorted(mp.eigsy(A, eigvals_only=True))
print(json.dumps({"split": mp.nstr(E[1] - E[0], 25)}))`, { n: H.dim, re: Array.from(H.re) });
    expect(Math.abs(ours.splitting / Number(ref.split) - 1)).toBeLessThan(1e-9);
    expect(ours.isolatedDoublet).toBe(true);
    // double precision alone is off at this level (why double-double is used)
    const dbl = tunnelSplittingAnyField(mol, [Bx, 0, 0]);
    expect(Math.abs(dbl.splitting / Number(ref.split) - 1)).toBeGreaterThan(1e-9);
  });

  it("quenching fields along the hard axis are equally spaced with Garg's period (within 5 percent)", () => {
    // Source: A. Garg, EPL 22, 205 (1993): Delta B = (2 k_B / g muB) sqrt(2 E (E + D)).
    const q = hardAxisQuenchingFields(mol, 1.6);
    expect(q.zeros.length).toBeGreaterThanOrEqual(5);
    for (const s of q.spacings) expect(Math.abs(s / q.meanPeriod - 1)).toBeLessThan(1e-6);
    expect(Math.abs(q.deviation)).toBeLessThan(0.05);
    // integer S: first zero at half a period (no zero at B = 0)
    expect(q.zeros[0]! / q.gargPeriod).toBeCloseTo(0.5, 6);
    // the splitting at a zero is below resolution and grows between zeros
    const mid = hardAxisTunnelSplitting(mol, q.zeros[0]! + q.meanPeriod / 2).splitting;
    expect(hardAxisTunnelSplitting(mol, q.zeros[0]!).splitting).toBeLessThan(1e-6 * mid);
    expect(gargQuenchingPeriod(mol)).toBeCloseTo((2 * kB / (2 * 9.2740100783e-24)) * Math.sqrt(2 * 0.047 * (0.047 + 0.29)), 12);
  });

  it("half-integer S: Kramers degeneracy at B = 0 and zeros at whole periods", () => {
    // Source: H. A. Kramers (1930) degeneracy; Garg (1993) for the half-integer zeros (shifted by half a period).
    const p = { S: 9.5, D: 0.3 * kB, E: 0.05 * kB, g: 2 };
    const s0 = hardAxisTunnelSplitting(p, 0);
    expect(s0.splitting).toBeLessThan(1e3 * s0.resolution);
    const q = hardAxisQuenchingFields(p, 1.2);
    q.zeros.forEach((z, i) => expect(z / q.gargPeriod).toBeCloseTo(i + 1, 5));
  });

  it("rejects S not a multiple of 1/2 and negative E", () => {
    expect(() => hardAxisTunnelSplitting({ S: 10.3, D: 1, E: 0.1 }, 0)).toThrow(InputError);
    expect(() => hardAxisTunnelSplitting({ S: 10.3, D: 1, E: 0.1 }, 0)).toThrow(/S = 10.3/);
    expect(() => giantSpinMatrix({ S: 2, D: 1, E: -1 }, [0, 0, 0])).toThrow(/E >= 0/);
  });

  it("Rayleigh-quotient splitting (double vector, double-double quotient) equals the all-double-double route", () => {
    // Common practice, no source: two independent double-double routes (Householder + Sturm bisection
    // in double-double, symmetricEigenvaluesDD) must agree to the stated resolution (1e-29 D S^2).
    for (const p of [mol, { S: 12, D: 0.05 * kB, E: 0.005 * kB, g: 2 }, { S: 9.5, D: 0.3 * kB, E: 0.05 * kB, g: 2 }]) {
      for (const Bx of [0, 0.05, 0.77, 3]) {
        const b = hardAxisParityBlocks(p, Bx);
        const ls = symmetricEigenvaluesDD(b.nSym, b.sym, [0])[0]!;
        const la = symmetricEigenvaluesDD(b.nAnti, b.anti, [0])[0]!;
        const slow = ddToNumber(ddSub(la, ls));
        const fast = hardAxisTunnelSplitting(p, Bx);
        expect(Math.abs(fast.signed - slow), `S = ${p.S}, Bx = ${Bx}`).toBeLessThan(1e-29 * p.D * p.S * p.S);
        expect(fast.resolution).toBeLessThan(1e-28 * p.D * p.S * p.S);
      }
    }
  });
});
