/**
 * Stevens factors alpha_J, beta_J, gamma_J of the Hund's-rule ground multiplet of 4f^n, computed
 * (not tabulated) from their definition: within the multiplet,
 *   sum_i f_k(theta_i) = theta_k O_k^0      (theta_2 = alpha_J, theta_4 = beta_J, theta_6 = gamma_J),
 * with f_2 = 3 cos^2 - 1, f_4 = 35 cos^4 - 30 cos^2 + 3, f_6 = 231 cos^6 - 315 cos^4 + 105 cos^2 - 5
 * (the polynomials of O_k^0 divided by r^k). Source: K. Stevens, Proc. Phys. Soc. A 65, 209 (1952).
 *
 * Method: Slater determinants of n electrons in the 14 f spin-orbitals with total M_L + M_S = J;
 * the Hund's-rule state |J, M = J> is the ground state of
 *   H_sel = -A S^2 - B L^2 + xi L.S    (A >> B >> |xi|; xi > 0 below half filling, < 0 above),
 * which selects maximal S, then maximal L, then J = |L - S| or L + S. Then
 *   theta_k = <J J| sum_i f_k(theta_i) |J J> / <J J| O_k^0 |J J>,
 * with the one-electron diagonal elements <3 m| f_k |3 m> = int |Y_3^m|^2 f_k dOmega evaluated
 * exactly (polynomial integrals). Operators act on determinants in second quantization.
 */
import { InputError } from "../errors.js";
import { HermitianEigenSolver } from "../numeric/eigenHermitian.js";
import { hundGroundTerm } from "./hund.js";
import { stevensOperator } from "./stevens.js";

const l = 3;
// spin-orbital k: m = 3 - (k >> 1), spin up for even k
const mOf = (k: number) => l - (k >> 1);
const upOf = (k: number) => (k & 1) === 0;
const orb = (m: number, up: boolean) => 2 * (l - m) + (up ? 0 : 1);

function popcount(x: number): number {
  let c = 0;
  while (x) {
    x &= x - 1;
    c++;
  }
  return c;
}

type Vec = Map<number, number>;
type Term = [number, number, number]; // c+_p c_q coefficient

function applyOneBody(v: Vec, terms: Term[]): Vec {
  const out: Vec = new Map();
  for (const [mask, amp] of v) {
    for (const [p, q, c] of terms) {
      if (!(mask & (1 << q))) continue;
      let s = popcount(mask & ((1 << q) - 1));
      const m1 = mask & ~(1 << q);
      if (m1 & (1 << p)) continue;
      s += popcount(m1 & ((1 << p) - 1));
      const m2 = m1 | (1 << p);
      out.set(m2, (out.get(m2) ?? 0) + (s % 2 ? -1 : 1) * c * amp);
    }
  }
  return out;
}

function add(a: Vec, b: Vec, s: number): Vec {
  const out = new Map(a);
  for (const [k, v] of b) out.set(k, (out.get(k) ?? 0) + s * v);
  return out;
}

const Lz: Term[] = Array.from({ length: 14 }, (_, k) => [k, k, mOf(k)] as Term);
const Sz: Term[] = Array.from({ length: 14 }, (_, k) => [k, k, upOf(k) ? 0.5 : -0.5] as Term);
const Lp: Term[] = [];
const Lm: Term[] = [];
for (let m = -l; m < l; m++)
  for (const up of [true, false]) {
    const c = Math.sqrt(l * (l + 1) - m * (m + 1));
    Lp.push([orb(m + 1, up), orb(m, up), c]);
    Lm.push([orb(m, up), orb(m + 1, up), c]);
  }
const Sp: Term[] = [];
const Sm: Term[] = [];
for (let m = -l; m <= l; m++) {
  Sp.push([orb(m, true), orb(m, false), 1]);
  Sm.push([orb(m, false), orb(m, true), 1]);
}

/** <3 m| f_k(cos theta) |3 m> with |Y_3^m|^2 = (7/4pi) (3-|m|)!/(3+|m|)! P_3^m(x)^2, exactly. */
function oneElectron(k: 2 | 4 | 6, m: number): number {
  const fact = (n: number): number => (n <= 1 ? 1 : n * fact(n - 1));
  const am = Math.abs(m);
  // P_3^m(x)^2 as polynomial coefficients (index = power)
  const mul = (a: number[], b: number[]) => {
    const o = new Array(a.length + b.length - 1).fill(0);
    a.forEach((x, i) => b.forEach((y, j) => (o[i + j] += x * y)));
    return o;
  };
  const oneMinus = [1, 0, -1];
  let p2: number[];
  if (am === 0) p2 = mul([0, -1.5, 0, 2.5], [0, -1.5, 0, 2.5]);
  else if (am === 1) p2 = mul(oneMinus, mul([-1.5, 0, 7.5], [-1.5, 0, 7.5]));
  else if (am === 2) p2 = mul(mul(oneMinus, oneMinus), [0, 0, 225]);
  else p2 = mul(mul(oneMinus, mul(oneMinus, oneMinus)), [225]);
  const f = k === 2 ? [-1, 0, 3] : k === 4 ? [3, 0, -30, 0, 35] : [-5, 0, 105, 0, -315, 0, 231];
  const prod = mul(p2, f);
  let integral = 0;
  prod.forEach((c, i) => {
    if (i % 2 === 0) integral += (2 * c) / (i + 1);
  });
  return 2 * Math.PI * (7 / (4 * Math.PI)) * (fact(3 - am) / fact(3 + am)) * integral;
}

export interface StevensFactors {
  electrons: number;
  J: number;
  alpha: number;
  beta: number;
  gamma: number;
}

/** alpha_J, beta_J, gamma_J of 4f^n (n = 1 ... 13; not for J = 0). */
export function stevensFactors(electrons: number): StevensFactors {
  const t = hundGroundTerm(electrons);
  if (t.J === 0) throw new InputError("electrons", electrons, "a configuration with J > 0 (4f^6 has J = 0)");
  const J = t.J;
  // determinants with M_L + M_S = J
  const basis: number[] = [];
  for (let mask = 0; mask < 1 << 14; mask++) {
    if (popcount(mask) !== electrons) continue;
    let M2 = 0;
    for (let k = 0; k < 14; k++) if (mask & (1 << k)) M2 += 2 * mOf(k) + (upOf(k) ? 1 : -1);
    if (M2 === 2 * J) basis.push(mask);
  }
  const index = new Map(basis.map((m, i) => [m, i]));
  const dim = basis.length;
  const xi = electrons < 7 ? 0.01 : -0.01;
  const H = new Float64Array(dim * dim);
  basis.forEach((mask, col) => {
    const v: Vec = new Map([[mask, 1]]);
    const lz = applyOneBody(v, Lz),
      sz = applyOneBody(v, Sz);
    const L2 = add(add(applyOneBody(applyOneBody(v, Lp), Lm), applyOneBody(lz, Lz), 1), lz, 1);
    const S2 = add(add(applyOneBody(applyOneBody(v, Sp), Sm), applyOneBody(sz, Sz), 1), sz, 1);
    // L.S = Lz Sz + (L+ S- + L- S+)/2
    const ladder = add(applyOneBody(applyOneBody(v, Sm), Lp), applyOneBody(applyOneBody(v, Sp), Lm), 1);
    const ls = add(applyOneBody(sz, Lz), ladder, 0.5);
    const hv = add(add(new Map([...S2].map(([k, x]) => [k, -100 * x])), new Map([...L2].map(([k, x]) => [k, -1 * x])), 1), ls, xi);
    for (const [k, x] of hv) {
      const row = index.get(k);
      if (row === undefined) {
        if (Math.abs(x) > 1e-9) throw new Error("operator left the M_J sector");
        continue;
      }
      H[row * dim + col]! += x;
    }
  });
  const solver = new HermitianEigenSolver(dim);
  solver.solve(H, new Float64Array(dim * dim), true);
  if (dim > 1 && solver.values[1]! - solver.values[0]! < 1e-6) throw new Error("Hund ground state not unique in the M_J = J sector");
  const psi = Array.from({ length: dim }, (_, i) => solver.vectorsRe[i * dim]!);
  const factor = (k: 2 | 4 | 6) => {
    let num = 0;
    basis.forEach((mask, i) => {
      let d = 0;
      for (let q = 0; q < 14; q++) if (mask & (1 << q)) d += oneElectron(k, mOf(q));
      num += psi[i]! ** 2 * d;
    });
    const O = stevensOperator(J, k, 0);
    const den = O.re[0]!; // <J, M = J| O_k^0 |J, M = J>
    return Math.abs(den) < 1e-12 ? 0 : num / den;
  };
  return { electrons, J, alpha: factor(2), beta: factor(4), gamma: factor(6) };
}

/** alpha_J, beta_J, gamma_J for Ce3+ ... Yb3+ (Eu3+, J = 0, left out). */
export function rareEarthStevensFactors(): Array<StevensFactors & { ion: string }> {
  const names = ["Ce", "Pr", "Nd", "Pm", "Sm", "Eu", "Gd", "Tb", "Dy", "Ho", "Er", "Tm", "Yb"];
  const out: Array<StevensFactors & { ion: string }> = [];
  names.forEach((name, i) => {
    if (i + 1 === 6) return;
    out.push({ ion: `${name}3+`, ...stevensFactors(i + 1) });
  });
  return out;
}
