import { describe, expect, it } from "vitest";
import { stevensOperator, angularMomentum, legendreDerivativeCoefficients, parseTermName, InputError } from "@helicoid/lib/internal";
import { runPython } from "../../helpers/python.js";

const allJ = Array.from({ length: 16 }, (_, i) => (i + 1) / 2);
const lm: Array<[number, number]> = [];
for (const l of [2, 4, 6]) for (let m = -l; m <= l; m++) lm.push([l, m]);

describe("Stevens operators: structure", () => {
  it("every O_l^m is Hermitian and traceless for J = 1/2 ... 8", () => {
    // Source: M. Hutchings, Solid State Physics 16, 227 (1964): O_l^m are Hermitian rank-l tensor
    // operator combinations, hence traceless (l > 0).
    for (const J of allJ) {
      for (const [l, m] of lm) {
        const O = stevensOperator(J, l, m);
        const n = O.n;
        let big = 1,
          herm = 0,
          tr = 0;
        for (let i = 0; i < n; i++) {
          tr += O.re[i * n + i]!;
          for (let j = 0; j < n; j++) {
            big = Math.max(big, Math.abs(O.re[i * n + j]!), Math.abs(O.im[i * n + j]!));
            herm = Math.max(herm, Math.abs(O.re[i * n + j]! - O.re[j * n + i]!), Math.abs(O.im[i * n + j]! + O.im[j * n + i]!));
          }
        }
        expect(herm / big, `J=${J} l=${l} m=${m}`).toBeLessThan(1e-13);
        expect(Math.abs(tr) / big, `J=${J} l=${l} m=${m}`).toBeLessThan(1e-12);
      }
    }
  });

  it("vanish for l > 2J (no rank-l tensor in 2J + 1 states)", () => {
    // Source: Wigner-Eckart theorem (triangle rule |J - J| <= l <= 2J); common practice.
    for (const [J, l] of [
      [0.5, 2],
      [1.5, 4],
      [2.5, 6],
    ] as const) {
      const O = stevensOperator(J, l, 0);
      expect(Math.max(...O.re.map(Math.abs), ...O.im.map(Math.abs))).toBe(0);
    }
  });

  it("O_2^0 = 3 J_z^2 - J(J+1) and O_4^0 diagonal closed form", () => {
    // Source: M. Hutchings (1964), table of operator equivalents.
    for (const J of [1, 2.5, 4, 7.5, 8]) {
      const O2 = stevensOperator(J, 2, 0),
        O4 = stevensOperator(J, 4, 0);
      const X = J * (J + 1);
      const n = O2.n;
      for (let i = 0; i < n; i++) {
        const M = J - i;
        expect(O2.re[i * n + i]).toBeCloseTo(3 * M * M - X, 10);
        const o4 = 35 * M ** 4 - (30 * X - 25) * M * M + 3 * X * X - 6 * X;
        expect(Math.abs(O4.re[i * n + i]! - o4)).toBeLessThan(1e-11 * Math.max(1, 35 * J ** 4));
      }
    }
  });

  it("the z-parts are the Legendre derivatives of the tables", () => {
    // Source: M. Hutchings (1964): leading coefficients 3, 35, 231; 7z^2 - r^2 for O_4^2; 11z^2 - r^2 for O_6^4.
    expect(legendreDerivativeCoefficients(2, 0)).toEqual([3, -1]);
    expect(legendreDerivativeCoefficients(4, 0)).toEqual([35, -30, 3]);
    expect(legendreDerivativeCoefficients(6, 0)).toEqual([231, -315, 105, -5]);
    expect(legendreDerivativeCoefficients(4, 2)).toEqual([7, -1]);
    expect(legendreDerivativeCoefficients(6, 4)).toEqual([11, -1]);
    expect(legendreDerivativeCoefficients(6, 2)).toEqual([33, -18, 1]);
  });

  it("refuses bad J, l, m with the parameter named", () => {
    expect(() => stevensOperator(8.5, 2, 0)).toThrow(/J = 8.5/);
    expect(() => stevensOperator(0.3, 2, 0)).toThrow(InputError);
    expect(() => stevensOperator(2, 3, 0)).toThrow(/l = 3/);
    expect(() => stevensOperator(2, 4, 5)).toThrow(/m = 5/);
    expect(parseTermName("B6-3")).toEqual({ l: 6, m: -3 });
    expect(() => parseTermName("B33")).toThrow(InputError);
  });
});

describe("Stevens operators against Hutchings' table (independent numpy construction)", () => {
  it("all O_l^m (m >= 0) and three sine operators agree for J = 5/2, 4, 15/2, 8", () => {
    // Source: M. Hutchings, Solid State Physics 16, 227 (1964), table of O_l^m in J_z, J_+, J_-
    // (written out here from memory and evaluated with Debian's numpy; the library builds the
    // operators by a different route: symmetrized harmonic polynomials).
    const Js = [2.5, 4, 7.5, 8];
    const script = String.raw`
import json, sys
import numpy as np
Js = json.load(sys.stdin)
out = {}
for J in Js:
    n = int(round(2*J)) + 1
    M = np.array([J - i for i in range(n)])
    Jz = np.diag(M).astype(complex)
    Jp = np.zeros((n, n), complex)
    for i in range(1, n):
        m = M[i]
        Jp[i-1, i] = np.sqrt(J*(J+1) - m*(m+1))
    Jm = Jp.conj().T
    X = J*(J+1)
    I = np.eye(n)
    mp = np.linalg.matrix_power
    def ac(f, g):
        return 0.25*(f @ g + g @ f)
    def c(m): return mp(Jp, m) + mp(Jm, m)
    def s(m): return (mp(Jp, m) - mp(Jm, m)) / 1j
    z = Jz
    ops = {
      "2,0": 3*z@z - X*I,
      "2,1": ac(z, c(1)),
      "2,2": 0.5*c(2),
      "4,0": 35*mp(z,4) - (30*X - 25)*mp(z,2) + (3*X*X - 6*X)*I,
      "4,1": ac(7*mp(z,3) - (3*X + 1)*z, c(1)),
      "4,2": ac(7*mp(z,2) - (X + 5)*I, c(2)),
      "4,3": ac(z, c(3)),
      "4,4": 0.5*c(4),
      "6,0": 231*mp(z,6) - (315*X - 735)*mp(z,4) + (105*X*X - 525*X + 294)*mp(z,2) + (-5*X**3 + 40*X*X - 60*X)*I,
      "6,1": ac(33*mp(z,5) - (30*X - 15)*mp(z,3) + (5*X*X - 10*X + 12)*z, c(1)),
      "6,2": ac(33*mp(z,4) - (18*X + 123)*mp(z,2) + (X*X + 10*X + 102)*I, c(2)),
      "6,3": ac(11*mp(z,3) - (3*X + 59)*z, c(3)),
      "6,4": ac(11*mp(z,2) - (X + 38)*I, c(4)),
      "6,5": ac(z, c(5)),
      "6,6": 0.5*c(6),
      "2,-2": 0.5*s(2),
      "4,-4": 0.5*s(4),
      "6,-3": ac(11*mp(z,3) - (3*X + 59)*z, s(3)),
    }
    out[str(J)] = {k: [v.real.tolist(), v.imag.tolist()] for k, v in ops.items()}
print(json.dumps(out))
`;
    const ref = runPython<Record<string, Record<string, [number[][], number[][]]>>>(script, Js);
    let checked = 0;
    for (const J of Js) {
      for (const [k, [re, im]] of Object.entries(ref[String(J)]!)) {
        const [l, m] = k.split(",").map(Number) as [number, number];
        const O = stevensOperator(J, l, m);
        const n = O.n;
        let big = 1,
          diff = 0;
        for (let i = 0; i < n; i++)
          for (let j = 0; j < n; j++) {
            big = Math.max(big, Math.abs(re[i]![j]!), Math.abs(im[i]![j]!));
            diff = Math.max(diff, Math.abs(O.re[i * n + j]! - re[i]![j]!), Math.abs(O.im[i * n + j]! - im[i]![j]!));
          }
        expect(diff / big, `J=${J} O_${l}^${m}`).toBeLessThan(1e-11);
        checked++;
      }
    }
    expect(checked).toBe(72);
  });

  it("J_x, J_y, J_z obey [J_x, J_y] = i J_z", () => {
    // Source: angular-momentum algebra; common practice.
    const { x, y, z } = angularMomentum(3.5);
    const n = x.n;
    for (let i = 0; i < n; i++)
      for (let j = 0; j < n; j++) {
        let re = 0,
          im = 0;
        for (let k = 0; k < n; k++) {
          // (xy - yx)_ij, x real, y imaginary
          im += x.re[i * n + k]! * y.im[k * n + j]! - y.im[i * n + k]! * x.re[k * n + j]!;
          re += 0;
        }
        expect(re).toBeCloseTo(0, 12);
        expect(im).toBeCloseTo(z.re[i * n + j]!, 12);
      }
  });
});
