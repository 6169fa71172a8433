/**
 * The 180-degree wall in the stray-field models (strayBound.ts): its magnetization on the FFT grid,
 * with a sum of reference steps removed so the remainder decays fast, and the closed-form field of
 * those reference steps, added back at the data points (or on the grid when blurred).
 * Wall profile m_z = -tanh(u), m_x = -neel / cosh(u), u = (x - x0) / Delta (L. Landau, E. Lifshitz
 * (1935); A. Hubert, R. Schaefer, Magnetic Domains (Springer 1998)).
 */
import { mu0 } from "../quantity/constants.js";

/**
 * Weights c_i of the reference steps -(2/pi) atan(u / i), i = 1, 2, 3 (u = (x - x0) / Delta), removed from
 * the 180-degree wall before the FFT: sum c_i = 1 (the unit step), sum c_i i = sum c_i i^3 = 0, so the
 * remainder -tanh(u) + (2/pi) sum c_i atan(u / i) has no u^-1 and no u^-3 tail (it falls as u^-5). A
 * single atan reference leaves a -2 / (pi u) tail, which the periodic FFT box cuts off with a jump at its
 * edge: that jump's field was the 1e-4 error of the model against a real-space quadrature.
 */
export const REF_C = [2.5, -2, 0.5];

/**
 * Local m_z (the reference steps removed) and m_x / neel of the wall on the grid gx, and, when dmz and
 * dmx1 are given, their derivatives in x0 (index 0) and Delta (index 1).
 */
export function wall180GridFields(
  gx: Float64Array,
  x0: number,
  Delta: number,
  mzL: Float64Array,
  mx1: Float64Array,
  dmz: readonly [Float64Array, Float64Array, ...Float64Array[]] | null,
  dmx1: readonly [Float64Array, Float64Array, ...Float64Array[]] | null,
): void {
  const n = gx.length;
  for (let g = 0; g < n; g++) {
    const u = (gx[g]! - x0) / Delta;
    const th = Math.tanh(u);
    const sech = 1 / Math.cosh(u);
    // remove the reference sum_i c_i (-(2/pi) atan(u / i)) (see REF_C): the remainder decays as u^-5
    let ref = 0,
      dref = 0;
    for (let r = 0; r < REF_C.length; r++) {
      const a = r + 1;
      ref += REF_C[r]! * Math.atan(u / a);
      dref += (REF_C[r]! * a) / (a * a + u * u);
    }
    mzL[g] = -th + (2 / Math.PI) * ref;
    mx1[g] = -sech;
    if (dmz && dmx1) {
      // d/du of mzL and mx1, then du/dx0 = -1/Delta, du/dDelta = -u/Delta
      const dzu = -sech * sech + (2 / Math.PI) * dref;
      const dxu = sech * th;
      dmz[0][g] = -dzu / Delta;
      dmx1[0][g] = -dxu / Delta;
      dmz[1][g] = (-u * dzu) / Delta;
      dmx1[1][g] = (-u * dxu) / Delta;
    }
  }
}

/**
 * Closed-form field (B_z or B_x) of the reference magnetization sum_i c_i (-(2/pi) atan((x - x0) / (i Delta)))
 * of a film of thickness t and magnetization Ms seen from height h, at the points xs, and its
 * derivatives in u = x - x0, H (the height), t and Delta: each term is the ideal step seen from
 * h + i Delta (Poisson semigroup, strayField.ts).
 */
export function wall180StepField(
  component: "bz" | "bx",
  xs: ArrayLike<number>,
  x0: number,
  Delta: number,
  h: number,
  t: number,
  Ms: number,
  val: Float64Array,
  du: Float64Array | null,
  dH: Float64Array | null,
  dt: Float64Array | null,
  dD: Float64Array | null,
): void {
  for (let i = 0; i < xs.length; i++) {
    const u = xs[i]! - x0;
    let v = 0,
      vu = 0,
      vH = 0,
      vt = 0,
      vD = 0;
    for (let r = 0; r < REF_C.length; r++) {
      const cr = REF_C[r]!;
      const H = h + (r + 1) * Delta;
      const Ht = H + t;
      const a2 = Ht * Ht + u * u;
      const b2 = H * H + u * u;
      let fv: number, fu: number, fH: number, ft: number;
      if (component === "bz") {
        fv = Math.atan(u / Ht) - Math.atan(u / H);
        fu = Ht / a2 - H / b2;
        fH = -u / a2 + u / b2;
        ft = -u / a2;
      } else {
        fv = Math.log(a2 / b2);
        fu = (2 * u) / a2 - (2 * u) / b2;
        fH = (2 * Ht) / a2 - (2 * H) / b2;
        ft = (2 * Ht) / a2;
      }
      v += cr * fv;
      vu += cr * fu;
      vH += cr * fH;
      vt += cr * ft;
      vD += cr * (r + 1) * fH;
    }
    const c = component === "bz" ? (mu0 * Ms) / Math.PI : (mu0 * Ms) / (2 * Math.PI);
    val[i] = c * v;
    if (du) du[i] = c * vu;
    if (dH) dH[i] = c * vH;
    if (dt) dt[i] = c * vt;
    if (dD) dD[i] = c * vD;
  }
}
