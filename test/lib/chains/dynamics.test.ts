import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { chainModel, dynamicStructureFactor, InputError } from "@helicoid/lib";
import { runPython } from "../../helpers/python.js";

// The oracle: numpy builds H and the spin operators as dense 2^N matrices, diagonalizes H (eigh) and
// sums the lines of S^{ab}(q, w) = sum p_m conj(<n|S^a_{-q}|m>) <n|S^b_{-q}|m> L_eta(w - E_n + E_m).
const oracle = `
import sys, json, numpy as np
c = json.load(sys.stdin)
N, Jz, Jp, hx, hz, T, eta = c["N"], c["Jz"], c["Jperp"], c["hx"], c["hz"], c["T"], c["eta"]
sx = np.array([[0, .5], [.5, 0]]); sy = np.array([[0, -.5j], [.5j, 0]]); sz = np.array([[.5, 0], [0, -.5]])
# basis: bit j of the index = spin j up; build site operators by kron with site N-1 leftmost
def site(op, j):
    m = np.array([[1.0]])
    for s in range(N - 1, -1, -1):
        # our bit convention: bit=1 up; numpy sz above has up first, so flip to [down, up] ordering
        o = op if s == j else np.eye(2)
        o = o[::-1, ::-1]
        m = np.kron(m, o)
    return m
S = {a: [site(op, j) for j in range(N)] for a, op in (("x", sx), ("y", sy), ("z", sz))}
H = np.zeros((2**N, 2**N), dtype=complex)
for j in range(N):
    l = (j + 1) % N
    H += Jz * S["z"][j] @ S["z"][l] + Jp * (S["x"][j] @ S["x"][l] + S["y"][j] @ S["y"][l])
    H -= hx * S["x"][j] + hz * S["z"][j]
E, V = np.linalg.eigh(H)
if T == 0:
    p = np.zeros(len(E)); deg = E < E[0] + 1e-9; p[deg] = 1.0 / deg.sum()
else:
    p = np.exp(-(E - E[0]) / T); p /= p.sum()
om = np.array(c["omega"])
out = {}
for n in c["q"]:
    q = 2 * np.pi * n / N
    B = {a: sum(np.exp(1j * q * j) * S[a][j] for j in range(N)) / np.sqrt(N) for a in "xyz"}
    M = {a: V.conj().T @ B[a] @ V for a in "xyz"}   # M[a][n, m] = <n|B_a|m>
    dw = E[:, None] - E[None, :]
    L = eta / np.pi / ((om[:, None, None] - dw[None]) ** 2 + eta ** 2)
    def chan(a, b):
        w = np.conj(M[a]) * M[b] * p[None, :]
        return (L * w[None]).sum(axis=(1, 2)), w.sum()
    zz, wzz = chan("z", "z"); xx, wxx = chan("x", "x"); yz, wyz = chan("y", "z")
    yy, wyy = chan("y", "y"); xy, wxy = chan("x", "y"); xz, wxz = chan("x", "z")
    out[str(n)] = dict(zz=zz.real.tolist(), xx=xx.real.tolist(), chiral=(-2 * yz.imag).tolist(), wzz=float(wzz.real), wchiral=float(-2 * wyz.imag),
                       yy=yy.real.tolist(), xyre=xy.real.tolist(), xyim=xy.imag.tolist(), xzre=xz.real.tolist(), xzim=xz.imag.tolist())
print(json.dumps(out))
`;

const omega = Array.from({ length: 61 }, (_, i) => -1 + (6 * i) / 60);

describe("S(q, w) against numpy (dense 2^N matrices built in Python)", () => {
  for (const T of [0, 0.7]) {
    it(`zz, xx and the chiral channel at T = ${T} with a transverse field`, () => {
      const c = { N: 8, Jz: 2, Jperp: 0.6, hx: 0.5, hz: 0.1, T, eta: 0.15, omega, q: [0, 1, 3, 4] };
      const ref = runPython<Record<string, { zz: number[]; xx: number[]; chiral: number[]; wzz: number; wchiral: number }>>(oracle, c);
      const r = dynamicStructureFactor(chainModel({ N: 8, Jz: 2, Jperp: 0.6, hx: 0.5, hz: 0.1 }), {
        T,
        eta: 0.15,
        omega,
        qIndices: [0, 1, 3, 4],
        components: ["zz", "xx", "chiral"],
      });
      c.q.forEach((n, i) => {
        const rf = ref[String(n)]!;
        for (let t = 0; t < omega.length; t++) {
          // T = 0: ground state to a Lanczos residual of 1e-11, continued fractions without
          // re-orthogonalization: agreement to ~1e-8 absolute (peaks are ~1)
          expect(r.channels.zz!.re[i]![t]).toBeCloseTo(rf.zz[t]!, 6);
          expect(r.channels.xx!.re[i]![t]).toBeCloseTo(rf.xx[t]!, 6);
          expect(r.channels.chiral!.re[i]![t]).toBeCloseTo(rf.chiral[t]!, 6);
        }
        expect(r.channels.zz!.weight[i]).toBeCloseTo(rf.wzz, 10);
        expect(r.channels.chiral!.weight[i]).toBeCloseTo(rf.wchiral, 10);
      });
    });
  }
});

describe("S(q, w) with the pi rotation about x as a symmetry (hz = 0: parity sectors used)", () => {
  it("every channel (xx, yy, zz, xy, xz, chiral) at T = 0 against numpy", () => {
    // Source: the numpy oracle above (no symmetry used there); ours splits each operator into its
    // parts even (S^x) and odd (S^y, S^z) under the rotation and sums their continued fractions.
    const c = { N: 8, Jz: 2, Jperp: 0.6, hx: 0.5, hz: 0, T: 0, eta: 0.15, omega, q: [0, 1, 3, 4] };
    type Ref = Record<string, { zz: number[]; xx: number[]; yy: number[]; chiral: number[]; xyre: number[]; xyim: number[]; xzre: number[]; xzim: number[] }>;
    const ref = runPython<Ref>(oracle, c);
    const r = dynamicStructureFactor(chainModel({ N: 8, Jz: 2, Jperp: 0.6, hx: 0.5, hz: 0 }), {
      T: 0,
      eta: 0.15,
      omega,
      qIndices: c.q,
      components: ["xx", "yy", "zz", "xy", "xz", "chiral"],
    });
    expect(r.method).toMatch(/parity/);
    c.q.forEach((n, i) => {
      const rf = ref[String(n)]!;
      for (let t = 0; t < omega.length; t++) {
        expect(r.channels.xx!.re[i]![t]).toBeCloseTo(rf.xx[t]!, 6);
        expect(r.channels.yy!.re[i]![t]).toBeCloseTo(rf.yy[t]!, 6);
        expect(r.channels.zz!.re[i]![t]).toBeCloseTo(rf.zz[t]!, 6);
        expect(r.channels.chiral!.re[i]![t]).toBeCloseTo(rf.chiral[t]!, 6);
        expect(r.channels.xy!.re[i]![t]).toBeCloseTo(rf.xyre[t]!, 6);
        expect(r.channels.xy!.im![i]![t]).toBeCloseTo(rf.xyim[t]!, 6);
        expect(r.channels.xz!.re[i]![t]).toBeCloseTo(rf.xzre[t]!, 6);
        expect(r.channels.xz!.im![i]![t]).toBeCloseTo(rf.xzim[t]!, 6);
      }
    });
  });
});

describe("sum rules", () => {
  it("total weight 1/4 per channel, f-sum rule of zz, chiral weight = -<S^x>, detailed balance", () => {
    for (const T of [0, 0.5]) {
      const m = chainModel({ N: 8, Jz: 3, Jperp: 0.8, hx: 0.6, hz: 0 });
      const r = dynamicStructureFactor(m, { T, eta: 0.1, omega: [0, 1], components: ["xx", "yy", "zz", "chiral"] });
      // Common practice, no source: (1/N) sum_q int S^aa = <(S^a_j)^2> = 1/4 for spin 1/2.
      for (const c of ["xx", "yy", "zz"] as const) expect(r.sumRules.totalWeight[c]).toBeCloseTo(0.25, 10);
      // Source: P. Hohenberg, W. Brinkman, PRB 10, 128 (1974) (first-moment sum rule), derived in dynamics.ts.
      r.sumRules.firstMomentZZ!.exact.forEach((e, i) => expect(e).toBeCloseTo(r.sumRules.firstMomentZZ!.formula[i]!, 9));
      // Derived in dynamics.ts: int C dw = -<S^x> per site for every q.
      expect(Math.abs(r.mx)).toBeGreaterThan(0.01);
      for (const w of r.sumRules.chiralWeight!.exact) expect(w).toBeCloseTo(-r.mx, 9);
      if (T > 0) expect(r.sumRules.detailedBalance!).toBeLessThan(1e-10);
    }
  });

  it("property: on random small rings the chiral part vanishes at hx = 0, is odd in hx and integrates to -<S^x>", () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 4, max: 7 }),
        fc.double({ min: -3, max: 3, noNaN: true }),
        fc.double({ min: 0.1, max: 1.5, noNaN: true }),
        fc.double({ min: 0.05, max: 1.2, noNaN: true }),
        fc.constantFrom(0, 0.4),
        (N, Jz, Jperp, hx, T) => {
          const opts = { T, eta: 0.2, omega: [-0.5, 0, 0.5, 1.5], components: ["chiral" as const], steps: 120 };
          const zero = dynamicStructureFactor(chainModel({ N, Jz, Jperp, hx: 0 }), opts);
          const plus = dynamicStructureFactor(chainModel({ N, Jz, Jperp, hx }), opts);
          const minus = dynamicStructureFactor(chainModel({ N, Jz, Jperp, hx: -hx }), opts);
          const C0 = zero.channels.chiral!,
            Cp = plus.channels.chiral!,
            Cm = minus.channels.chiral!;
          Cp.re.forEach((row, i) =>
            row.forEach((v, t) => {
              expect(Math.abs(C0.re[i]![t]!)).toBeLessThan(1e-10);
              expect(v + Cm.re[i]![t]!).toBeCloseTo(0, 8);
            }),
          );
          for (const w of Cp.weight) expect(w).toBeCloseTo(-plus.mx, 8);
        },
      ),
      { numRuns: 8, seed: 15 },
    );
  });
});

describe("bad input", () => {
  it("names the parameter", () => {
    const m = chainModel({ N: 8 });
    expect(() => dynamicStructureFactor(m, { eta: 0, omega: [0] })).toThrow(/eta/);
    expect(() => dynamicStructureFactor(m, { eta: 0.1, omega: [0], T: -1 })).toThrow(InputError);
    expect(() => dynamicStructureFactor(chainModel({ N: 14 }), { eta: 0.1, omega: [0], T: 1 })).toThrow(/at most 12 sites/);
    expect(() => dynamicStructureFactor(chainModel({ N: 8, boundary: "open" }), { eta: 0.1, omega: [0] })).toThrow(/ring/);
  });
});
