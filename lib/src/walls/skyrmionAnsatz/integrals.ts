/**
 * Local part of the 360-degree-wall skyrmion ansatz tan(theta/2) = sinh(R/w) / sinh(rho/w) (see
 * ../skyrmionAnsatz.ts for the model): the profile itself and the dimensionless local integrals
 * I_ex, I_K, I_D, I_Z of a = R / w by exact (panelled Gauss-Legendre) quadrature.
 */
import { InputError } from "../../errors.js";
import { gaussLegendre } from "../../numeric/gaussLegendre.js";
import type { RadialProfile } from "../skyrmionEnergy.js";

/** Smallest and largest a = R / w covered by the ansatz solver. */
export const ANSATZ_A_MIN = 0.3;
export const ANSATZ_A_MAX = 100;

/** theta(rho) of the ansatz, with derivative, as a RadialProfile (R, w in m). */
export function ansatzProfile(R: number, w: number): RadialProfile {
  if (!(R > 0)) throw new InputError("R", R, "a positive radius in m");
  if (!(w > 0)) throw new InputError("w", w, "a positive wall width in m");
  const a = R / w;
  const sa = Math.sinh(a);
  const S = sa * sa;
  return {
    theta: (rho: number) => 2 * Math.atan2(sa, Math.sinh(rho / w)),
    dtheta: (rho: number) => {
      const x = rho / w;
      const sx = Math.sinh(x);
      return (-2 * sa * Math.cosh(x)) / (sx * sx + S) / w;
    },
    rhoMax: R + 40 * w,
    scale: Math.min(R, w),
    saturatedCore: a > 32 ? (a - 30) * w : 0,
  };
}

/** Dimensionless local integrals of the ansatz at a = R / w (see the file header). */
export interface AnsatzIntegrals {
  ex: number;
  K: number;
  D: number;
  Z: number;
}

const GL10 = gaussLegendre(10);

/** I_ex, I_K, I_D, I_Z of the ansatz at a = R / w (exact quadrature; no allocation besides the result). */
export function ansatzLocalIntegrals(a: number): AnsatzIntegrals {
  const out = { ex: 0, K: 0, D: 0, Z: 0 };
  ansatzLocalIntegralsInto(a, out);
  return out;
}

/** Add the 10-point Gauss-Legendre panel [lo, hi] of the four local integrands at sinh a = sa to `sums` (the result being built). */
function localPanel(sums: AnsatzIntegrals, sa: number, S: number, lo: number, hi: number): void {
  const gx = GL10.x;
  const gw = GL10.w;
  const c = 0.5 * (lo + hi);
  const h = 0.5 * (hi - lo);
  let ex = 0;
  let K = 0;
  let D = 0;
  let Z = 0;
  for (let i = 0; i < gx.length; i++) {
    const x = c + h * gx[i]!;
    const wt = h * gw[i]!;
    let sx: number;
    let cx: number;
    if (x > 0.1) {
      const ep = Math.exp(x);
      const em = 1 / ep;
      sx = 0.5 * (ep - em);
      cx = 0.5 * (ep + em);
    } else {
      sx = Math.sinh(x);
      cx = Math.cosh(x);
    }
    const d = sx * sx + S;
    const omc = (2 * S) / d;
    const sn = (2 * sa * sx) / d;
    const cs = (sx * sx - S) / d;
    const thx = (-2 * sa * cx) / d;
    ex += wt * (thx * thx * x + (sn * sn) / x);
    K += wt * sn * sn * x;
    D += wt * (thx * x + sn * cs);
    Z += wt * omc * x;
  }
  sums.ex += ex;
  sums.K += K;
  sums.D += D;
  sums.Z += Z;
}

function ansatzLocalIntegralsInto(a: number, out: AnsatzIntegrals): void {
  const sa = Math.sinh(a);
  const S = sa * sa;
  // sin(theta) cos(theta) in I_D decays only as exp(-|x - a|): integrate over a +- 36 (1e-15)
  const xc = a > 38 ? a - 36 : 0;
  const xEnd = a + 36;
  // `out` holds the running sums
  out.ex = 0;
  out.K = 0;
  out.D = 0;
  out.Z = 0;
  let x0 = xc;
  if (xc === 0) {
    const s = Math.min(a, 1);
    let lo = 0;
    for (let b = s / 64; b < s; b *= 2) {
      localPanel(out, sa, S, lo, b);
      lo = b;
    }
    localPanel(out, sa, S, lo, s);
    x0 = s;
  }
  // panels of width 0.8 over the wall (a +- 6), widths doubling (up to 8) towards the saturated core
  // and the tail, where the integrands are 2 x, 0, 0, 2 x plus terms decaying like exp(-|x - a|)
  // (10-point Gauss-Legendre on a width-8 panel of exp(-x): relative error below 1e-11)
  const wLo = Math.max(x0, a - 6);
  const wHi = a + 6;
  let hi = wLo;
  let width = 0.8;
  while (hi > x0 + 1e-12) {
    const lo = Math.max(x0, hi - width);
    localPanel(out, sa, S, lo, hi);
    hi = lo;
    width = Math.min(8, 2 * width);
  }
  // (from a small core, widths double from the core radius: the profile's poles sit at x = +-i a)
  let b = wLo;
  width = Math.min(0.8, Math.max(b, 1e-3));
  while (b < wHi - 1e-12) {
    const h2 = Math.min(wHi, b + width);
    localPanel(out, sa, S, b, h2);
    b = h2;
    width = Math.min(0.8, 2 * width);
  }
  let lo = wHi;
  width = 0.8;
  while (lo < xEnd - 1e-12) {
    const h2 = Math.min(xEnd, lo + width);
    localPanel(out, sa, S, lo, h2);
    lo = h2;
    width = Math.min(8, 2 * width);
  }
  out.Z += xc * xc; // saturated core: Int_0^xc 2 x dx
}
