/**
 * The table of the skyrmion ansatz (see ../skyrmionAnsatz.ts): Phi_s, Phi_v and the local integrals
 * I_* as universal functions of (a = R / w, tau = t / w), shared by all films and fields.
 *
 * One row per step 0.1 in ln a, built on first use, holds the row's exact I_* and its Hankel
 * transforms (lattice rule); ln(-Phi_s), ln(Phi_v) are computed from them per column of step 0.25 in
 * ln tau, again on first use, and interpolated by 6-point Lagrange (tensor product in ln a, ln tau;
 * outside the tau range Phi is computed from the row's transforms at the exact tau).
 *
 * All the table's state (its rows, the interpolation scratch, the cached slice at fixed a used by
 * the inner minimization over w) belongs to one `AnsatzTable` object; `ansatzTable` is the instance
 * every solve in this process shares (its rows do not depend on the film or the field).
 */
import { InputError } from "../../errors.js";
import { nonlocalFromTransforms, type RadialTransforms } from "../magnetostatics.js";
import { ANSATZ_A_MAX, ANSATZ_A_MIN, ansatzLocalIntegrals, type AnsatzIntegrals } from "./integrals.js";
import { ansatzTransformsLattice } from "./transforms.js";

const LNA0 = Math.log(ANSATZ_A_MIN) - 0.3;
const DLNA = 0.1;
const NA = Math.ceil((Math.log(ANSATZ_A_MAX) + 0.3 - LNA0) / DLNA) + 1;
const LNT0 = Math.log(1e-3);
const DLNT = 0.25;
const NT = 47;
/** Table range of tau = t / w (inside it Phi is interpolated; outside it is computed from the row's transforms). */
export const ANSATZ_TABLE_TAU_RANGE: readonly [number, number] = [Math.exp(LNT0 + 2 * DLNT), Math.exp(LNT0 + (NT - 3) * DLNT)];

interface Row {
  lnS: Float64Array;
  lnV: Float64Array;
  tr: RadialTransforms;
  /** ln I_ex, ln I_K, ln(-I_D), ln I_Z at the row's a (exact). */
  lnI: AnsatzIntegrals;
}

/** Make sure tau columns m0 .. m0 + 5 of row r are computed. */
function columns(r: Row, m0: number): void {
  for (let m = m0; m < m0 + 6; m++) {
    if (r.lnS[m] === r.lnS[m]) continue; // computed (not NaN)
    const d = nonlocalFromTransforms(r.tr, Math.exp(LNT0 + m * DLNT));
    r.lnS[m] = Math.log(-d.surface);
    r.lnV[m] = Math.log(d.volume);
  }
}

/** The six weights of 6-point Lagrange interpolation. */
type Weights6 = [number, number, number, number, number, number];

/**
 * Weights of 6-point Lagrange interpolation on the nodes -2, -1, 0, 1, 2, 3 at s in [0, 1)
 * (error O(h^6); measured below 1e-6 relative for Phi and 1e-7 for the local integrals with the
 * steps used here, test/lib/walls/magnetostatics.test.ts and skyrmionAnsatz.test.ts).
 */
function lagrange6(s: number, out: Weights6): void {
  const a = s + 2;
  const b = s + 1;
  const c = s;
  const d = s - 1;
  const e = s - 2;
  const f = s - 3;
  out[0] = (-b * c * d * e * f) / 120;
  out[1] = (a * c * d * e * f) / 24;
  out[2] = (-a * b * d * e * f) / 12;
  out[3] = (a * b * c * e * f) / 12;
  out[4] = (-a * b * c * d * f) / 24;
  out[5] = (a * b * c * d * e) / 120;
}

const weights6 = (): Weights6 => [0, 0, 0, 0, 0, 0];

/** Monomial coefficients of the 6-point interpolant on the nodes -2 .. 3: p(s) = Sum_k c_k s^k, c = M y. */
const POLY6: Float64Array = (() => {
  const M = new Float64Array(36); // M[k * 6 + i]
  for (let i = 0; i < 6; i++) {
    // coefficients of L_i(s) = Prod_{j != i} (s - x_j) / (x_i - x_j), x_j = j - 2
    let c = Float64Array.of(1);
    let den = 1;
    for (let j = 0; j < 6; j++) {
      if (j === i) continue;
      const xj = j - 2;
      // multiply by (s - x_j); a coefficient beyond the degree is 0
      const prev = c;
      c = Float64Array.from({ length: prev.length + 1 }, (_, k) => (prev[k - 1] ?? 0) - xj * (prev[k] ?? 0));
      den *= i - 2 - xj;
    }
    c.forEach((ck, k) => (M[k * 6 + i] = ck / den));
  }
  return M;
})();

/** Monomial coefficients c (p(s) = Sum_k c_k s^k) of the interpolant through y[base .. base + 5] (nodes -2 .. 3). */
function poly6Coefficients(y: Float64Array, base: number, c: Float64Array): void {
  for (let k = 0; k < 6; k++) {
    let ck = 0;
    for (let i = 0; i < 6; i++) ck += POLY6[k * 6 + i]! * y[base + i]!;
    c[k] = ck;
  }
}

/** p(s), p'(s), p''(s) of p = Sum_k c_k s^k (c of length 6). */
function poly6At(c: Float64Array, s: number): [number, number, number] {
  let p = 0;
  let d1 = 0;
  let d2 = 0;
  for (let k = 5; k >= 0; k--) {
    d2 = d2 * s + 2 * d1;
    d1 = d1 * s + p;
    p = p * s + c[k]!;
  }
  return [p, d1, d2];
}

/** ln(-Phi_s), ln(Phi_v) and their first two derivatives in ln tau (see AnsatzTable.sliceDerivatives). */
export interface SliceDerivatives {
  s: number;
  s1: number;
  s2: number;
  v: number;
  v1: number;
  v2: number;
}

/** The lazily built table of Phi_s, Phi_v over (ln a, ln tau) and of the local integrals over ln a. */
export class AnsatzTable {
  private readonly rows: Array<Row | undefined> = new Array<Row | undefined>(NA);
  private built = 0;
  /** Interpolation weights in ln a and ln tau (scratch). */
  private readonly wa = weights6();
  private readonly wt = weights6();
  /** The object returned by nonlocal and nonlocalSlice (overwritten by the next call). */
  private readonly nlOut = { surface: 0, volume: 0 };
  // the slice at fixed a: the six rows around a, their a-weights, and the a-interpolated columns
  private readonly sliceS = new Float64Array(NT);
  private readonly sliceV = new Float64Array(NT);
  private readonly sliceW = weights6();
  private readonly sliceRows: Row[] = [];
  private sliceA = NaN;
  /** tau interval whose monomial coefficients (sliceCoefS, sliceCoefV) are cached; -1: none. */
  private sliceCoefJt = -1;
  private readonly sliceCoefS = new Float64Array(6);
  private readonly sliceCoefV = new Float64Array(6);
  /** The object written by sliceDerivatives (overwritten by the next call). */
  readonly sliceDer: SliceDerivatives = { s: 0, s1: 0, s2: 0, v: 0, v1: 0, v2: 0 };

  /** How many rows have been built (for diagnostics). */
  get rowsBuilt(): number {
    return this.built;
  }

  private row(j: number): Row {
    if (j < 0 || j >= NA) throw new InputError("a", Math.exp(LNA0 + j * DLNA), `a ratio R / w inside the table range ${ANSATZ_A_MIN} .. ${ANSATZ_A_MAX}`);
    let r = this.rows[j];
    if (r) return r;
    const aRow = Math.exp(LNA0 + j * DLNA);
    const tr = ansatzTransformsLattice(aRow);
    const I = ansatzLocalIntegrals(aRow);
    const lnI: AnsatzIntegrals = { ex: Math.log(I.ex), K: Math.log(I.K), D: Math.log(-I.D), Z: Math.log(I.Z) };
    // tau columns are computed on first use (a solve touches a few around t / w)
    const lnS = new Float64Array(NT).fill(NaN);
    const lnV = new Float64Array(NT).fill(NaN);
    r = { lnS, lnV, tr, lnI };
    this.rows[j] = r;
    this.built++;
    return r;
  }

  /**
   * Phi_s(a, tau), Phi_v(a, tau) (interpolated; rows built on first use).
   * Returns an object of the table (overwritten by the next call).
   */
  nonlocal(a: number, tau: number): { surface: number; volume: number } {
    const { wa, wt } = this;
    const ua = (Math.log(a) - LNA0) / DLNA;
    const ja = Math.floor(ua);
    lagrange6(ua - ja, wa);
    const ut = (Math.log(tau) - LNT0) / DLNT;
    let s = 0;
    let v = 0;
    if (ut >= 2 && ut < NT - 3) {
      const jt = Math.floor(ut);
      lagrange6(ut - jt, wt);
      for (let p = 0; p < 6; p++) {
        const r = this.row(ja - 2 + p);
        columns(r, jt - 2);
        const lS = r.lnS;
        const lV = r.lnV;
        let rs = 0;
        let rv = 0;
        for (let q = 0; q < 6; q++) {
          const k = jt - 2 + q;
          rs += wt[q]! * lS[k]!;
          rv += wt[q]! * lV[k]!;
        }
        s += wa[p]! * rs;
        v += wa[p]! * rv;
      }
    } else {
      for (let p = 0; p < 6; p++) {
        const d = nonlocalFromTransforms(this.row(ja - 2 + p).tr, tau);
        s += wa[p]! * Math.log(-d.surface);
        v += wa[p]! * Math.log(d.volume);
      }
    }
    this.nlOut.surface = -Math.exp(s);
    this.nlOut.volume = Math.exp(v);
    return this.nlOut;
  }

  /**
   * As nonlocal, through the cached slice of the table at fixed a (the inner minimization over the
   * wall width keeps a fixed and varies tau only): the a-interpolation is done once per a.
   */
  nonlocalSlice(a: number, tau: number): { surface: number; volume: number } {
    const ut = (Math.log(tau) - LNT0) / DLNT;
    if (!(ut >= 2 && ut < NT - 3)) return this.nonlocal(a, tau);
    const jt = Math.floor(ut);
    this.ensureSlice(a, jt);
    const { wt, sliceS, sliceV } = this;
    lagrange6(ut - jt, wt);
    let s = 0;
    let v = 0;
    for (let q = 0; q < 6; q++) {
      s += wt[q]! * sliceS[jt - 2 + q]!;
      v += wt[q]! * sliceV[jt - 2 + q]!;
    }
    this.nlOut.surface = -Math.exp(s);
    this.nlOut.volume = Math.exp(v);
    return this.nlOut;
  }

  /** Make the slice at a hold the tau entries jt - 2 .. jt + 3 (a-interpolated once per a). */
  private ensureSlice(a: number, jt: number): void {
    const { sliceS, sliceV, sliceW, sliceRows } = this;
    if (a !== this.sliceA) {
      const ua = (Math.log(a) - LNA0) / DLNA;
      const ja = Math.floor(ua);
      lagrange6(ua - ja, sliceW);
      for (let p = 0; p < 6; p++) sliceRows[p] = this.row(ja - 2 + p);
      sliceS.fill(NaN);
      this.sliceA = a;
      this.sliceCoefJt = -1;
    }
    if (sliceS[jt - 2] === sliceS[jt - 2] && sliceS[jt + 3] === sliceS[jt + 3]) return;
    for (const r of sliceRows) columns(r, jt - 2);
    for (let m = jt - 2; m < jt + 4; m++) {
      if (sliceS[m] === sliceS[m]) continue;
      let ss = 0;
      let vv = 0;
      for (let p = 0; p < 6; p++) {
        const r = sliceRows[p]!;
        ss += sliceW[p]! * r.lnS[m]!;
        vv += sliceW[p]! * r.lnV[m]!;
      }
      sliceS[m] = ss;
      sliceV[m] = vv;
    }
  }

  /**
   * ln(-Phi_s), ln(Phi_v) and their first two derivatives in ln tau at (a, tau = exp(lnTau)) from
   * the slice at fixed a (the same interpolant as nonlocalSlice), written to `sliceDer`.
   * Returns false outside the tau table.
   */
  sliceDerivatives(a: number, lnTau: number): boolean {
    const ut = (lnTau - LNT0) / DLNT;
    if (!(ut >= 2 && ut < NT - 3)) return false;
    const jt = Math.floor(ut);
    this.ensureSlice(a, jt);
    if (jt !== this.sliceCoefJt) {
      poly6Coefficients(this.sliceS, jt - 2, this.sliceCoefS);
      poly6Coefficients(this.sliceV, jt - 2, this.sliceCoefV);
      this.sliceCoefJt = jt;
    }
    const st = ut - jt;
    const [s, s1, s2] = poly6At(this.sliceCoefS, st);
    const [v, v1, v2] = poly6At(this.sliceCoefV, st);
    const k1 = 1 / DLNT;
    const k2 = k1 * k1;
    const out = this.sliceDer;
    out.s = s;
    out.s1 = s1 * k1;
    out.s2 = s2 * k2;
    out.v = v;
    out.v1 = v1 * k1;
    out.v2 = v2 * k2;
    return true;
  }

  /**
   * I_ex, I_K, I_D, I_Z at a (6-point Lagrange in ln a of the logarithms; relative accuracy about
   * 1e-7, checked against ansatzLocalIntegrals in the tests). Writes into `out`.
   */
  localIntegrals(a: number, out: AnsatzIntegrals): void {
    const wa = this.wa;
    const ua = (Math.log(a) - LNA0) / DLNA;
    const ja = Math.floor(ua);
    lagrange6(ua - ja, wa);
    let e = 0;
    let k = 0;
    let d = 0;
    let z = 0;
    for (let p = 0; p < 6; p++) {
      const l = this.row(ja - 2 + p).lnI;
      const c = wa[p]!;
      e += c * l.ex;
      k += c * l.K;
      d += c * l.D;
      z += c * l.Z;
    }
    out.ex = Math.exp(e);
    out.K = Math.exp(k);
    out.D = -Math.exp(d);
    out.Z = Math.exp(z);
  }
}

/** The table shared by every ansatz solve in this process (its entries depend on a and tau only). */
export const ansatzTable = new AnsatzTable();

/**
 * Phi_s(a, tau), Phi_v(a, tau) from the shared table (interpolated; rows built on first use).
 * Returns a shared object (overwritten by the next call).
 */
export function ansatzNonlocal(a: number, tau: number): { surface: number; volume: number } {
  return ansatzTable.nonlocal(a, tau);
}

/** How many rows of the shared magnetostatics table have been built (for diagnostics). */
export function ansatzTableRowsBuilt(): number {
  return ansatzTable.rowsBuilt;
}

/**
 * I_ex, I_K, I_D, I_Z at a from the shared table (6-point Lagrange in ln a of the logarithms;
 * relative accuracy about 1e-7, checked against ansatzLocalIntegrals in the tests). Writes into `out`.
 */
export function ansatzLocalIntegralsTabulated(a: number, out: AnsatzIntegrals): void {
  ansatzTable.localIntegrals(a, out);
}
