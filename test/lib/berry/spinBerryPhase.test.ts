import { describe, expect, it } from "vitest";
import { spinBerryPhase, wrapBerryPhase } from "../../../lib/src/berry/spinBerryPhase.js";
import { coneLoop } from "../../../lib/src/berry/loopOnSphere.js";
import { loopSolidAngle } from "../../../lib/src/berry/loopSolidAngle.js";
import { wignerSmallD, spinCoherentState } from "../../../lib/src/berry/spinCoherentState.js";
import { spinMatrices, checkSpin } from "../../../lib/src/berry/spinOperators.js";
import { InputError } from "../../../lib/src/errors.js";
import { getCalculator, runCalculator } from "../../../lib/src/calculators/index.js";
import { runPython } from "../../helpers/python.js";

describe("solid angle of a loop on the sphere", () => {
  it("octant triangle is pi/2; equator is 2 pi; cone is 2 pi (1 - cos theta) mod 4 pi", () => {
    // Source: A. Van Oosterom, J. Strackee, IEEE Trans. Biomed. Eng. 30, 125 (1983) (octant = 4 pi / 8).
    expect(
      loopSolidAngle([
        [1, 0, 0],
        [0, 1, 0],
        [0, 0, 1],
        [1, 0, 0],
      ]).value,
    ).toBeCloseTo(Math.PI / 2, 14);
    expect(
      loopSolidAngle([
        [1, 0, 0],
        [0, 0, 1],
        [0, 1, 0],
        [1, 0, 0],
      ]).value,
    ).toBeCloseTo(-Math.PI / 2, 14);
    expect(
      Math.abs(
        loopSolidAngle([
          [1, 0, 0],
          [0, 1, 0],
          [-1, 0, 0],
          [0, -1, 0],
          [1, 0, 0],
        ]).value,
      ),
    ).toBeCloseTo(2 * Math.PI, 13);
    // Source: area of a spherical cap 2 pi (1 - cos theta); polygon error ~ cot(t) (2 pi sin t)^3 / (12 N^2).
    for (const theta of [0.3, 1.2, 2.0, 3.0]) {
      const r = loopSolidAngle(coneLoop(theta, 400000));
      expect(Math.abs(r.left - 2 * Math.PI * (1 - Math.cos(theta)))).toBeLessThan(1e-9);
    }
  });

  it("stays accurate for loops through antipodal regions (apex chosen away from every antipode)", () => {
    // A thin band of the equator (nearly a great circle) and a loop through both poles.
    // Source: closed form of a spherical lune of dihedral angle a: area 2 a (here a = pi/2 -> pi).
    const lune = [
      [0, 0, 1],
      [1, 0, 1e-9],
      [0, 0, -1],
      [0, 1, 1e-9],
      [0, 0, 1],
    ].map((p, i) => (i === 2 ? [1e-12, 1e-12, -1] : p));
    const path: number[][] = [];
    for (let k = 0; k <= 200; k++) {
      const t = (Math.PI * k) / 200;
      path.push([Math.sin(t), 0, Math.cos(t)]);
    }
    for (let k = 1; k < 200; k++) {
      const t = Math.PI - (Math.PI * k) / 200;
      path.push([0, Math.sin(t), Math.cos(t)]);
    }
    path.push(path[0]!);
    expect(Math.abs(loopSolidAngle(path).value)).toBeCloseTo(Math.PI, 12);
    expect(Math.abs(loopSolidAngle(lune).value)).toBeCloseTo(Math.PI, 6);
  });

  it("rejects open loops and antipodal edges", () => {
    expect(() =>
      loopSolidAngle([
        [1, 0, 0],
        [0, 1, 0],
        [0, 0, 1],
      ]),
    ).toThrow(InputError);
    expect(() =>
      loopSolidAngle([
        [1, 0, 0],
        [0, 1, 0],
        [0, 0, 1],
      ]),
    ).toThrow(/closed loop/);
    expect(
      loopSolidAngle(
        [
          [1, 0, 0],
          [0, 1, 0],
          [0, 0, 1],
        ],
        { close: true },
      ).value,
    ).toBeCloseTo(Math.PI / 2, 14);
    expect(() =>
      loopSolidAngle([
        [1, 0, 0],
        [-1, 0, 0],
        [0, 0, 1],
        [1, 0, 0],
      ]),
    ).toThrow(/antipodal/);
  });
});

describe("Berry phase of a spin S in state m around a cone", () => {
  it("geometric -m Omega and the discrete product of overlaps agree with -m 2 pi (1 - cos theta) to 1e-10", () => {
    // Source: M. Berry, Proc. R. Soc. A 392, 45 (1984): gamma_m = -m Omega(C).
    for (const [S, m, theta] of [
      [0.5, 0.5, 1.0],
      [1, 1, 0.7],
      [2, 1, 2.2],
      [3, -2, 1.3],
      [2.5, 0.5, 0.4],
    ] as const) {
      const r = spinBerryPhase(coneLoop(theta, 600000), S, m);
      const exact = wrapBerryPhase(-m * 2 * Math.PI * (1 - Math.cos(theta)));
      expect(Math.abs(wrapBerryPhase(r.geometric - exact)), `geometric S=${S} m=${m}`).toBeLessThan(1e-10);
      expect(Math.abs(wrapBerryPhase(r.discrete - exact)), `discrete S=${S} m=${m}`).toBeLessThan(1e-10);
    }
  });

  it("for m = S the discrete phase equals -S Omega of the geodesic polygon exactly (Bargmann invariant)", () => {
    // Source: V. Bargmann, J. Math. Phys. 5, 862 (1964), from memory: the phase of the product of
    // spin-1/2 coherent-state overlaps around a geodesic polygon is Omega/2; spin S = its 2S-th power.
    const loop = [
      [1, 0, 0.2],
      [0.1, 1, 0.3],
      [-0.5, 0.2, 1],
      [0.3, -0.8, 0.4],
      [1, 0, 0.2],
    ];
    const om = loopSolidAngle(loop).value;
    // (S = 8.5: the half-integer start exp(-i S p) = sqrt(conj u) conj(u)^8 of the phase recurrence.)
    for (const S of [0.5, 1.5, 4, 8.5]) {
      const r = spinBerryPhase(loop, S, S);
      expect(Math.abs(wrapBerryPhase(r.discrete + S * om))).toBeLessThan(1e-13);
    }
  });

  it("coherent states are eigenstates of n . S with eigenvalue m; d^1 matches its closed form", () => {
    // Source: J. J. Sakurai, Modern Quantum Mechanics (1994), eq. (3.5.57): d^1 matrix.
    const b = 0.83;
    const d = wignerSmallD(1, b);
    const c = Math.cos(b),
      s = Math.sin(b);
    const exact = [(1 + c) / 2, -s / Math.SQRT2, (1 - c) / 2, s / Math.SQRT2, c, -s / Math.SQRT2, (1 - c) / 2, s / Math.SQRT2, (1 + c) / 2];
    exact.forEach((v, i) => expect(d[i]).toBeCloseTo(v, 14));
    // Independent check of the exponentiated d against the Wigner factorial sum for S = 5/2.
    const S = 2.5,
      dim = 6,
      beta = 1.9;
    const fact = (k: number) => {
      let f = 1;
      for (let i = 2; i <= k; i++) f *= i;
      return f;
    };
    const D = wignerSmallD(S, beta);
    for (let i = 0; i < dim; i++)
      for (let j = 0; j < dim; j++) {
        const mp = S - i,
          m = S - j;
        let sum = 0;
        for (let k = 0; k <= 2 * S; k++) {
          const a = S + m - k,
            bb = k,
            cc = S - k - mp,
            dd = k - m + mp;
          if (a < 0 || cc < 0 || dd < 0) continue;
          // Source: E. P. Wigner (1959), the small-d sum formula.
          sum +=
            (((-1) ** (k - m + mp) * Math.sqrt(fact(S + m) * fact(S - m) * fact(S + mp) * fact(S - mp))) / (fact(a) * fact(bb) * fact(cc) * fact(dd))) *
            Math.cos(beta / 2) ** (2 * S - 2 * k + m - mp) *
            Math.sin(beta / 2) ** (2 * k - m + mp);
        }
        expect(Math.abs(D[i * dim + j]! - sum), `d(${mp},${m})`).toBeLessThan(1e-13);
      }
    const { sxRe, syIm, szRe } = spinMatrices(S);
    const t = 1.1,
      p = -0.7;
    const st = spinCoherentState(S, 1.5, t, p);
    const n = [Math.sin(t) * Math.cos(p), Math.sin(t) * Math.sin(p), Math.cos(t)];
    for (let i = 0; i < dim; i++) {
      let r = 0,
        q = 0;
      for (let j = 0; j < dim; j++) {
        const hr = n[0]! * sxRe[i * dim + j]! + n[2]! * szRe[i * dim + j]!;
        const hi = n[1]! * syIm[i * dim + j]!;
        r += hr * st.re[j]! - hi * st.im[j]!;
        q += hr * st.im[j]! + hi * st.re[j]!;
      }
      expect(r).toBeCloseTo(1.5 * st.re[i]!, 13);
      expect(q).toBeCloseTo(1.5 * st.im[i]!, 13);
    }
  });

  it("rejects S not a multiple of 1/2 and m out of range", () => {
    expect(() => checkSpin(0.7)).toThrow(InputError);
    expect(() => checkSpin(0.7)).toThrow(/multiple of 1\/2/);
    expect(() => spinBerryPhase(coneLoop(1, 10), 1, 0.5)).toThrow(/m = 0.5/);
  });
});

describe("discrete phase of |m| < S: exact or off by exactly pi", () => {
  // Source: the identity prod <u_i|u_i+1> = exp(i m Omega) prod d^S_mm(alpha_i) derived in
  // spinBerryPhase.ts, checked against an independent construction: scipy.linalg.expm of the spin
  // matrices (Debian python3-scipy) for the states and the product, and the polygon's solid angle from
  // the spherical excess of its fan triangles (l'Huilier's theorem).
  const cases: [number, number, number][] = [];
  for (const N of [3, 4, 5, 7, 12]) cases.push([3.5, 1.4, N]);
  cases.push([2, 2.2, 5], [1.5, 0.9, 3], [3, 2.9, 7]);
  const ref = runPython<{ phases: number[]; dmm: number[]; omega: number }[]>(
    `
import json, sys
import numpy as np
from scipy.linalg import expm
out = []
for S, th, N in json.load(sys.stdin):
    dim = int(round(2 * S + 1)); ks = S - np.arange(dim)
    sp = np.zeros((dim, dim))
    for i in range(1, dim):
        sp[i - 1, i] = np.sqrt(S * (S + 1) - ks[i] * (ks[i] + 1))
    Sx = (sp + sp.T) / 2; Sy = (sp - sp.T) / 2j; Sz = np.diag(ks)
    ph = 2 * np.pi * np.arange(N) / N
    phases = []; dmm = []
    a = 2 * np.arcsin(np.sin(th) * np.sin(np.pi / N))
    for j, m in enumerate(ks):
        # |m; n> = exp(-i phi Sz) exp(-i theta Sy) exp(+i phi Sz) |m> (a smooth gauge; the product is gauge free)
        U = [expm(-1j * p * Sz) @ expm(-1j * th * Sy) @ expm(1j * p * Sz) for p in ph]
        e = np.zeros(dim); e[j] = 1
        u = [Ui @ e for Ui in U]
        prod = np.prod([np.vdot(u[i], u[(i + 1) % N]) for i in range(N)])
        phases.append(float(-np.angle(prod)))
        dmm.append(float(expm(-1j * a * Sy)[j, j].real))
    v = np.stack([np.sin(th) * np.cos(ph), np.sin(th) * np.sin(ph), np.cos(th) * np.ones(N)], 1)
    def excess(A, B, C):
        a_ = np.arccos(np.clip(B @ C, -1, 1)); b_ = np.arccos(np.clip(A @ C, -1, 1)); c_ = np.arccos(np.clip(A @ B, -1, 1))
        s_ = (a_ + b_ + c_) / 2
        return 4 * np.arctan(np.sqrt(max(0.0, np.tan(s_ / 2) * np.tan((s_ - a_) / 2) * np.tan((s_ - b_) / 2) * np.tan((s_ - c_) / 2))))
    c = np.array([0, 0, 1.0]) if th < np.pi / 2 else np.array([0, 0, -1.0])
    om = sum(excess(c, v[i], v[(i + 1) % N]) for i in range(N))
    if th >= np.pi / 2: om = 4 * np.pi - om
    out.append({"phases": phases, "dmm": dmm, "omega": float(om)})
print(json.dumps(out))
`,
    cases,
  );

  it("matches scipy, and the pi shift is predicted by the sign of prod d^S_mm(alpha) (S = 7/2, theta = 1.4, N = 3 and 5 among them)", () => {
    let flips = 0;
    cases.forEach(([S, theta, N], c) => {
      const loop = coneLoop(theta, N);
      for (let k = 0; k <= 2 * S; k++) {
        const m = S - k;
        const r = spinBerryPhase(loop, S, m);
        const o = ref[c]!;
        expect(Math.abs(wrapBerryPhase(r.discrete - o.phases[k]!)), `S=${S} N=${N} m=${m}`).toBeLessThan(1e-10);
        expect(Math.abs(wrapBerryPhase(r.geometric + m * o.omega))).toBeLessThan(1e-10);
        const predicted = Math.sign(o.dmm[k]!) ** N;
        expect(r.edgeSign).toBe(predicted);
        expect(Math.abs(wrapBerryPhase(o.phases[k]! + m * o.omega - (predicted < 0 ? Math.PI : 0)))).toBeLessThan(1e-10);
        if (predicted < 0) flips++;
        if (Math.abs(m) === S) expect(r.edgeSign).toBe(1);
      }
    });
    expect(flips).toBeGreaterThan(4);
  });

  it("berry-loop flags the pi shift (warning, not ok) and its identity residual is rounding", () => {
    for (const N of [3, 5]) {
      const r = runCalculator(getCalculator("berry-loop"), { twoS: 7, theta: 1.4, segments: N });
      expect(r.outputs.maxDifference!.value as number).toBeCloseTo(Math.PI, 10);
      expect(r.outputs.piShiftedCount!.value as number).toBeGreaterThan(0);
      expect(r.outputs.identityResidual!.value as number).toBeLessThan(1e-10);
      expect(r.status).toBe("warning");
      expect(r.notes.join(" ")).toMatch(/off by exactly pi/);
    }
    const fine = runCalculator(getCalculator("berry-loop"), { twoS: 7, theta: 1.4, segments: 200 });
    expect(fine.status).toBe("ok");
    expect(fine.outputs.maxDifference!.value as number).toBeLessThan(1e-10);
  });
});
