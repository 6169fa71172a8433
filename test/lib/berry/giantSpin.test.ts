import { describe, expect, it } from "vitest";
import {
  hardAxisParityBlocks,
  hardAxisTunnelSplitting,
  hardAxisQuenchingFields,
  giantSpinLevels,
  giantSpinMatrix,
  gargQuenchingPeriod,
  tunnelSplittingAnyField,
} from "../../../lib/src/berry/giantSpin.js";
import { kB } from "../../../lib/src/quantity/constants.js";
import { InputError } from "../../../lib/src/errors.js";
import { runPython } from "../../helpers/python.js";
import { symmetricEigenvaluesDD, ddSub, ddToNumber } from "../../../lib/src/numeric/doubleDouble.js";
import { getCalculator, runCalculator } from "../../../lib/src/calculators/index.js";

// Test values, not a demo: S = 10, D = 0.29 K, E = 0.047 K, g = 2. From memory: the giant-spin parameters
// usually quoted for the Fe8 molecular cluster (a realistic, well-resolved test case; the demos use invented values).
const mol = { S: 10, D: 0.29 * kB, E: 0.047 * kB, g: 2 };

describe("single large spin: levels and tunnel splitting", () => {
  it("levels for an oblique field agree with numpy.linalg.eigvalsh of the same Hamiltonian built in numpy", () => {
    // Source: numpy (Debian) as oracle; the spin matrices are rebuilt there independently.
    const B: [number, number, number] = [0.3, 0.4, 0.2];
    const r = Math.hypot(...B);
    const ours = giantSpinLevels(mol, [r], [B[0] / r, B[1] / r, B[2] / r])[0]!;
    const ref = runPython<number[]>(
      `
import json, sys, numpy as np
d = json.load(sys.stdin); S = d["S"]; m = np.arange(S, -S - 1, -1)
sp = np.diag(np.sqrt(S * (S + 1) - m[1:] * (m[1:] + 1)), 1)
sx = (sp + sp.T) / 2; sy = (sp - sp.T) / 2j; sz = np.diag(m)
muB = 9.2740100783e-24
H = -d["D"] * sz @ sz + d["E"] * (sx @ sx - sy @ sy) - d["g"] * muB * (d["B"][0] * sx + d["B"][1] * sy + d["B"][2] * sz)
print(json.dumps(np.linalg.eigvalsh(H).tolist()))`,
      { ...mol, B },
    );
    const scale = mol.D * mol.S * mol.S;
    ours.forEach((v, i) => expect(Math.abs(v - ref[i]!) / scale).toBeLessThan(1e-13));
  });

  it("double-double splitting agrees with a 40-digit mpmath diagonalization", () => {
    // Source: mpmath (Debian python3-mpmath) eigsy at 40 significant digits as oracle.
    const Bx = 0.05;
    const ours = hardAxisTunnelSplitting(mol, Bx);
    const H = giantSpinMatrix(mol, [Bx, 0, 0]);
    const ref = runPython<{ split: string }>(
      `
import json, sys, mpmath as mp
mp.mp.dps = 40
d = json.load(sys.stdin); n = d["n"]
A = mp.matrix(n, n)
for i in range(n):
    for j in range(n):
        A[i, j] = mp.mpf(d["re"][i * n + j])
E = sorted(mp.eigsy(A, eigvals_only=True))
print(json.dumps({"split": mp.nstr(E[1] - E[0], 25)}))`,
      { n: H.dim, re: Array.from(H.re) },
    );
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
    expect(gargQuenchingPeriod(mol)).toBeCloseTo(((2 * kB) / (2 * 9.2740100783e-24)) * Math.sqrt(2 * 0.047 * (0.047 + 0.29)), 12);
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

describe("spin-tunnel: fourth-order term, misaligned field, Kramers, exact Garg zeros (numpy eigh oracle)", () => {
  // Source: E. Kececioglu, A. Garg, PRB 63, 064422 (2001): for C = 0 the hard-axis zeros are exact and
  // equally spaced with Garg's period (2 k_B / g muB) sqrt(2E(E + D)) (A. Garg, EPL 22, 205 (1993)).
  // Oracle: numpy.linalg.eigh of the parity blocks (symmetric/antisymmetric combinations of |m>, |-m>),
  // refined by 34-digit mpmath Rayleigh quotients of the blocks built from the exact matrix elements (the
  // splitting is ~1e-9 of the levels), and numpy eigh of the full complex Hermitian matrix for a misaligned
  // field; scipy brentq / minimize_scalar for zeros and minima.
  const oracle = `
import json, sys
import numpy as np
import mpmath as mp
from scipy.optimize import brentq, minimize_scalar
kB = 1.380649e-23; muB = 9.2740100783e-24
out = []
for c in json.load(sys.stdin):
    S, D, E, C, phi, Bmax = c["S"], c["D"] * kB, c["E"] * kB, c["C"] * kB, c["phi"], c["Bmax"]
    dim = int(round(2 * S + 1)); m = S - np.arange(dim)
    Sp = np.zeros((dim, dim))
    for i in range(1, dim):
        Sp[i - 1, i] = np.sqrt(S * (S + 1) - m[i] * (m[i] + 1))
    Sm = Sp.T; Sx = (Sp + Sm) / 2; Sy = (Sp - Sm) / 2j; Sz = np.diag(m)
    H0 = -D * Sz @ Sz + E * (Sx @ Sx - Sy @ Sy).real + C * (np.linalg.matrix_power(Sp, 4) + np.linalg.matrix_power(Sm, 4))
    H = lambda b: H0 - 2 * muB * b * (np.cos(phi) * Sx + np.sin(phi) * Sy)
    res = {}
    if phi == 0:
        # parity blocks: |m> +- |-m> for m > 0 (and |0> in the symmetric block for integer S)
        P = dim // 2
        Us = []; Ua = []
        for i in range(P):
            v = np.zeros(dim); v[i] = 1; w = np.zeros(dim); w[dim - 1 - i] = 1
            Us.append((v + w) / np.sqrt(2)); Ua.append((v - w) / np.sqrt(2))
        if dim % 2 == 1:
            v = np.zeros(dim); v[P] = 1; Us.append(v)
        Us = np.array(Us).T; Ua = np.array(Ua).T
        def f(b):
            Hb = H(b).real
            return np.linalg.eigvalsh(Ua.T @ Hb @ Ua)[0] - np.linalg.eigvalsh(Us.T @ Hb @ Us)[0]
        # the same blocks in mpmath at 34 digits, entries from the exact formulas (energies in units of kB)
        mp.mp.dps = 34
        mS = mp.mpf(S); mm = [mS - i for i in range(dim)]
        MP = mp.zeros(dim, dim)
        for i in range(1, dim):
            MP[i - 1, i] = mp.sqrt(mS * (mS + 1) - mm[i] * (mm[i] + 1))
        MM = MP.T; MX = (MP + MM) / 2
        MP2 = MP * MP; MM2 = MM * MM
        MH0 = -mp.mpf(c["D"]) * mp.diag([x * x for x in mm]) + mp.mpf(c["E"]) * (MP2 + MM2) / 2 + mp.mpf(c["C"]) * (MP2 * MP2 + MM2 * MM2)
        mUs = mp.matrix(Us.tolist()); mUa = mp.matrix(Ua.tolist())
        for j in range(mUs.cols):
            for i in range(dim):
                if abs(mUs[i, j]) > 0.1 and abs(mUs[i, j]) < 0.9: mUs[i, j] = mp.sign(mUs[i, j]) / mp.sqrt(2)
        for j in range(mUa.cols):
            for i in range(dim):
                if abs(mUa[i, j]) > 0.1: mUa[i, j] = mp.sign(mUa[i, j]) / mp.sqrt(2)
        A0s, A0a = mUs.T * MH0 * mUs, mUa.T * MH0 * mUa
        Xs, Xa = mUs.T * MX * mUs, mUa.T * MX * mUa
        zb = 2 * mp.mpf(muB) / mp.mpf(kB)
        def low(A0, X, b):
            A = A0 - zb * mp.mpf(b) * X
            w, V = np.linalg.eigh(np.array(A.tolist(), dtype=float))
            x = mp.matrix(V[:, 0].tolist())
            return (x.T * A * x)[0] / (x.T * x)[0]   # Rayleigh quotient at 34 digits: error ~ residual^2 / gap
        fm = lambda b: float(low(A0a, Xa, b) - low(A0s, Xs, b))
        bs = np.linspace(Bmax * 1e-9, Bmax, 400); fs = [f(b) for b in bs]
        res["zeros"] = [brentq(fm, bs[i], bs[i + 1], xtol=1e-15) for i in range(len(bs) - 1) if fs[i] * fs[i + 1] < 0]
        e = np.linalg.eigvalsh(H(0.0)); res["split0"] = float((e[1] - e[0]) / kB)
    else:
        g = lambda b: np.log(np.diff(np.linalg.eigvalsh(H(b))[:2])[0])
        bs = np.linspace(Bmax / 400, Bmax, 400); gs = [g(b) for b in bs]
        mins = []
        for i in range(1, len(bs) - 1):
            if gs[i] <= gs[i - 1] and gs[i] < gs[i + 1]:
                r = minimize_scalar(g, bounds=(bs[i - 1], bs[i + 1]), method="bounded", options={"xatol": 1e-10})
                mins.append([float(r.x), float(np.exp(r.fun) / kB)])
        res["minima"] = mins
    out.append(res)
print(json.dumps(out))
`;
  const base = { S: 10, D: 0.29, E: 0.047, Bmax: 1.5 };
  const cases = [
    { ...base, C: 0, phi: 0 },
    { ...base, C: 1e-5, phi: 0 },
    { ...base, C: -1e-5, phi: 0 },
    { ...base, C: 0, phi: 0.05 },
    { ...base, S: 9.5, C: 1e-5, phi: 0 },
  ];
  const ref = runPython<{ zeros?: number[]; split0?: number; minima?: [number, number][] }[]>(oracle, cases);
  const spec = getCalculator("spin-tunnel");
  const run = (c: (typeof cases)[number]) => runCalculator(spec, { S: c.S, D: c.D, E: c.E, Bmax: c.Bmax, C: c.C, misalignment: c.phi });

  it("C = 0: zeros exact and equally spaced with Garg's period (the oracle agrees to 1e-9); deviation is rounding and is said to be", () => {
    const r = run(cases[0]!);
    const z = r.outputs.zeros!.value as number[];
    const zn = ref[0]!.zeros!;
    expect(z.length).toBe(zn.length);
    z.forEach((x, i) => expect(Math.abs(x - zn[i]!)).toBeLessThan(1e-9));
    const garg = r.outputs.gargPeriod!.value as number;
    // the oracle's zeros (34-digit Rayleigh quotients) and ours on Garg's lattice, (k + 1/2) period for integer S
    zn.forEach((x, i) => expect(Math.abs(x / garg - (i + 0.5))).toBeLessThan(1e-9));
    z.forEach((x, i) => expect(Math.abs(x / garg - (i + 0.5))).toBeLessThan(1e-9));
    expect(Math.abs(r.outputs.deviation!.value as number)).toBeLessThan(1e-9);
    expect(r.notes.join(" ")).toMatch(/exact/);
  });

  it("C != 0 changes the period: zeros match the oracle's to 1e-9 T and their spacing is not Garg's", () => {
    for (const k of [1, 2, 4]) {
      const r = run(cases[k]!);
      const z = r.outputs.zeros!.value as number[];
      const zn = ref[k]!.zeros!;
      expect(z.length, `case ${k}`).toBe(zn.length);
      expect(z.length).toBeGreaterThan(2);
      z.forEach((x, i) => expect(Math.abs(x - zn[i]!)).toBeLessThan(1e-9));
      expect(Math.abs(r.outputs.deviation!.value as number)).toBeGreaterThan(1e-3);
    }
  });

  it("a misaligned field gives minima of finite depth (numpy agrees) and no zeros", () => {
    const r = run(cases[3]!);
    expect(r.outputs.zeroCount!.value).toBe(0);
    const f = r.outputs.minimumFields!.value as number[],
      d = r.outputs.minimumSplittings!.value as number[];
    const mn = ref[3]!.minima!;
    expect(f.length).toBe(mn.length);
    expect(f.length).toBeGreaterThan(1);
    f.forEach((x, i) => {
      expect(Math.abs(x - mn[i]![0])).toBeLessThan(1e-3); // a minimum is flat: its position is known to ~sqrt(eps)
      expect(Math.abs(d[i]! / mn[i]![1] - 1)).toBeLessThan(1e-3);
      expect(d[i]!).toBeGreaterThan(0);
    });
  });

  it("half-integer S: the zero-field splitting is exactly 0 (Kramers)", () => {
    // Source: Kramers' theorem (time reversal, half-integer spin): every level is at least doubly degenerate at B = 0.
    const r = run(cases[4]!);
    expect(r.outputs.splittingZeroField!.value).toBe(0);
    expect(r.notes.join(" ")).toMatch(/Kramers/);
    expect(Math.abs(ref[0]!.split0!)).toBeGreaterThan(0); // integer S: a real splitting
  });
});
