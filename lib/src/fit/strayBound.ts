/**
 * The bound stray-field models of profileModels.ts (B_z or B_x above a film, 180-degree wall or
 * 360-degree wall / skyrmion cut) and their analytic Jacobian, on an FFT grid. What depends on the
 * wall model is in strayWall180.ts (magnetization with reference steps removed, their closed-form
 * field) and strayWall360.ts (magnetization of the ansatz); this file holds what they share: the net
 * charges carried in closed form, the Fourier kernels, the spectra of the Jacobian columns and their
 * interpolation to the data points.
 */
import type { BoundModel } from "./profileModels.js";
import { spectrumToPoints, type UniformGrid } from "./strayField.js";
import { wall180GridFields, wall180StepField } from "./strayWall180.js";
import { wall360GridFields } from "./strayWall360.js";
import { fft } from "../numeric/fft.js";
import { float64Arrays } from "../numeric/indexing.js";
import { mu0 } from "../quantity/constants.js";

export type Kind = "180" | "360";

/** Band-limited upsampling of the FFT fields before the cubic interpolation to the data points. */
const UPSAMPLE = 4;

/**
 * The bound stray-field model with its analytic Jacobian. The field is linear in the transformed
 * magnetization: with L(k) = FFT(m_z,local) - i sgn(k) FFT(m_x), the kernel
 * K(k) = (mu0 Ms / 2) e^{-|k| h} (1 - e^{-|k| t}) G(k), G = exp(-k^2 s^2 / 2), and the component
 * factor C(k) = 1 (B_z) or -i sgn(k) (B_x), the output spectrum is C K L (+ G S_c, the transform of
 * the closed-form step field of a 180-degree wall when blurred). So d/dp of the spectrum is
 * C K dL/dp (transform of d m / dp) for the shape parameters and neel, C (dK/dp) L for h and t
 * (dK/dh = -|k| K, dK/dt = (mu0 Ms / 2) e^{-|k| (h + t)} |k| G), -k^2 s (spectrum) for the blur,
 * (spectrum) / Ms for Ms; the step field's derivatives are in closed form. Two real derivative
 * fields share one complex FFT (forward and inverse). Checked against central differences in
 * test/lib/fit/strayFieldJacobian.test.ts.
 */
export function strayBound(kind: Kind, component: "bz" | "bx", grid: UniformGrid, x: Float64Array, ix: (name: string) => number, refCenter: number, refWidth: number): BoundModel {
  const n = grid.n;
  const m = x.length;
  // Zero-mode reference ell = 2 P_a - P_2a (P_a the Lorentzian (a/pi)/(u^2 + a^2)), normalized to unit
  // grid sum; its u^-2 tails cancel (u^-4 left). The net charges Qz = sum m_z,local dx and
  // Qx = sum m_x dx are carried by Q ell and their fields added in closed form at the data points
  // (Poisson semigroup: P_a seen from height H is a line seen from H + a). Reason: the kernel's |k| at
  // k = 0 is not smooth, so a periodic box with a net charge errs by ~Q h / L^2 (1e-4 of the peak for
  // the Neel wall's m_x and the 360-degree wall's m_z); without net charge the box error vanishes.
  const ell = new Float64Array(n);
  {
    const a = refWidth;
    let sum = 0;
    for (let g = 0; g < n; g++) {
      const u = grid.x0 + g * grid.dx - refCenter;
      ell[g] = (2 * a) / (Math.PI * (u * u + a * a)) - (2 * a) / (Math.PI * (u * u + 4 * a * a));
      sum += ell[g]! * grid.dx;
    }
    for (let g = 0; g < n; g++) ell[g] = ell[g]! / sum;
  }
  /**
   * Field component per unit net charge of m_z (kind "z") or m_x ("x") spread as ell, at points xs, and
   * its derivatives in h and t; scaled by mu0 Ms / (2 pi).
   */
  function zeroModeField(xs: ArrayLike<number>, p: Float64Array, which: "z" | "x", val: Float64Array, dh: Float64Array | null, dt: Float64Array | null) {
    const h = p[iH]!,
      t = p[iT]!,
      c = (mu0 * p[iMs]!) / (2 * Math.PI);
    // P(u, H) = H / (u^2 + H^2), Qk(u, H) = u / (u^2 + H^2) and their H-derivatives
    const P = (u: number, H: number) => H / (u * u + H * H);
    const Qk = (u: number, H: number) => u / (u * u + H * H);
    const dP = (u: number, H: number) => (u * u - H * H) / (u * u + H * H) ** 2;
    const dQ = (u: number, H: number) => (-2 * u * H) / (u * u + H * H) ** 2;
    // kz1 = P(H1) - P(H2), kz2 = Qk(H1) - Qk(H2), H1 = h + b, H2 = h + t + b, for b = a (weight 2) and 2a (weight -1)
    // bz: from m_z +kz1, from m_x +kz2; bx: from m_z +kz2, from m_x -kz1
    const useP = (component === "bz") === (which === "z");
    const sgn = component === "bx" && which === "x" ? -1 : 1;
    const F = useP ? P : Qk,
      dF = useP ? dP : dQ;
    for (let i = 0; i < xs.length; i++) {
      const u = xs[i]! - refCenter;
      let v = 0,
        vh = 0,
        vt = 0;
      for (const [w, b] of [
        [2, refWidth],
        [-1, 2 * refWidth],
      ] as const) {
        const H1 = h + b,
          H2 = h + t + b;
        v += w * (F(u, H1) - F(u, H2));
        vh += w * (dF(u, H1) - dF(u, H2));
        vt += w * -dF(u, H2);
      }
      val[i] = sgn * c * v;
      if (dh) dh[i] = sgn * c * vh;
      if (dt) dt[i] = sgn * c * vt;
    }
  }
  const is180 = kind === "180";
  const nShape = is180 ? 2 : 3; // x0 + (Delta | R, w)
  const iNeel = ix("neel");
  const iH = ix("h");
  const iT = ix("t");
  const iMs = ix("Ms");
  const iBlur = ix("blur");
  const iOff = ix("offset");
  const nPar = iOff + 1;
  const ak = new Float64Array(n);
  const kk = new Float64Array(n);
  const sg = new Float64Array(n);
  for (let j = 0; j < n; j++) {
    const f = j < n / 2 ? j : j - n;
    const k = (2 * Math.PI * f) / (n * grid.dx);
    kk[j] = k;
    ak[j] = Math.abs(k);
    sg[j] = 2 * j === n ? 0 : Math.sign(k);
  }
  const gx = new Float64Array(n);
  for (let g = 0; g < n; g++) gx[g] = grid.x0 + g * grid.dx;
  // work arrays
  const mzL = new Float64Array(n);
  const mx1 = new Float64Array(n); // m_x / neel
  const dmz = float64Arrays(3, n); // first nShape used
  const dmx1 = float64Arrays(3, n);
  const re = new Float64Array(n);
  const im = new Float64Array(n);
  const K = new Float64Array(n);
  const G = new Float64Array(n);
  const Kt = new Float64Array(n);
  const gridOut = new Float64Array(m);
  // spectra kept per evaluation: local base (A: mz, B: mx1) and step (Sc) as separate re/im
  const Ar = new Float64Array(n),
    Ai = new Float64Array(n),
    Br = new Float64Array(n),
    Bi = new Float64Array(n);
  const Sr = new Float64Array(n),
    Si = new Float64Array(n);
  const stepAt = new Float64Array(m);
  const scratch = new Float64Array(m);
  // scratch grid (W) and data-point (Wm) arrays, allocated once per bind
  const W = float64Arrays(14, n);
  const WD = new Float64Array(n),
    SDr = new Float64Array(n),
    SDi = new Float64Array(n);
  const fineRe = new Float64Array(UPSAMPLE * n),
    fineIm = new Float64Array(UPSAMPLE * n);
  const Wm = float64Arrays(4, m);
  const [Zz, Zzh, Zzt, Zx, Zxh, Zxt] = float64Arrays(6, m);
  const [ZG, ZGh, ZGt, Fr, Fi, Fhr, Fhi, Ftr, Fti] = float64Arrays(9, n);

  /** Fill the grid fields (and their shape derivatives when d is true). */
  function gridFields(p: Float64Array, d: boolean) {
    if (is180) wall180GridFields(gx, p[0]!, p[1]!, mzL, mx1, d ? dmz : null, d ? dmx1 : null);
    else wall360GridFields(gx, p[0]!, p[1]!, p[2]!, mzL, mx1, d ? dmz : null, d ? dmx1 : null);
  }

  /** Net charges of the grid fields (and of their shape derivatives), moved onto ell (blur 0 only). */
  const dQz = new Float64Array(3),
    dQx = new Float64Array(3);
  let Qz = 0,
    Qx = 0;
  function removeZeroModes(d: boolean) {
    const sumOf = (f: Float64Array) => {
      let v = 0;
      for (let g = 0; g < n; g++) v += f[g]!;
      return v * grid.dx;
    };
    const take = (f: Float64Array, q: number) => {
      for (let g = 0; g < n; g++) f[g] = f[g]! - q * ell[g]!;
    };
    // Only the charge whose kernel has the |k| kink needs it: m_z for B_z (kernel K), m_x for B_x
    // (kernel -K); the cross terms carry -i sgn(k) K ~ -i k t, smooth at k = 0.
    const bz = component === "bz";
    Qz = bz ? sumOf(mzL) : 0;
    Qx = bz ? 0 : sumOf(mx1);
    if (bz) take(mzL, Qz);
    else take(mx1, Qx);
    if (d) {
      for (let s2 = 0; s2 < nShape; s2++) {
        dQz[s2] = bz ? sumOf(dmz[s2]!) : 0;
        dQx[s2] = bz ? 0 : sumOf(dmx1[s2]!);
        if (bz) take(dmz[s2]!, dQz[s2]!);
        else take(dmx1[s2]!, dQx[s2]!);
      }
    }
  }

  /** Kernels K, G and dK/dt / K-free factor for the current p. */
  function kernels(p: Float64Array) {
    const pref = (mu0 * p[iMs]!) / 2;
    const h = p[iH]!;
    const t = p[iT]!;
    const s = p[iBlur]!;
    for (let j = 0; j < n; j++) {
      const a = ak[j]!;
      const g = s > 0 ? Math.exp(-0.5 * kk[j]! * kk[j]! * s * s) : 1;
      const eh = Math.exp(-a * h);
      G[j] = g;
      K[j] = pref * eh * -Math.expm1(-a * t) * g;
      Kt[j] = pref * eh * Math.exp(-a * t) * a * g;
    }
  }

  /** FFT of two real fields u + i v, unpacked into the spectra of u (ur, ui) and v (vr, vi). */
  function fftPair(u: Float64Array, v: Float64Array | null, ur: Float64Array, ui: Float64Array, vr: Float64Array | null, vi: Float64Array | null) {
    re.set(u);
    if (v) im.set(v);
    else im.fill(0);
    fft(re, im);
    for (let j = 0; j < n; j++) {
      const jm = j === 0 ? 0 : n - j;
      const a = re[j]!,
        b = im[j]!,
        c = re[jm]!,
        e = im[jm]!;
      ur[j] = 0.5 * (a + c);
      ui[j] = 0.5 * (b - e);
      if (vr && vi) {
        vr[j] = 0.5 * (b + e);
        vi[j] = -0.5 * (a - c);
      }
    }
  }

  /** The closed-form step field of the 180-degree wall's reference magnetization (strayWall180.ts) for p. */
  function stepValues(
    xs: ArrayLike<number>,
    p: Float64Array,
    val: Float64Array,
    du: Float64Array | null,
    dH: Float64Array | null,
    dt: Float64Array | null,
    dD: Float64Array | null = null,
  ) {
    wall180StepField(component, xs, p[0]!, p[1]!, p[iH]!, p[iT]!, p[iMs]!, val, du, dH, dt, dD);
  }

  /** Component factor C(k): 1 (B_z) or -i sgn(k) (B_x). */
  const comp = component === "bx";

  // spectra of the output columns to invert: list of [re, im] arrays
  const colR = Array.from({ length: nPar }, () => new Float64Array(n));
  const colI = Array.from({ length: nPar }, () => new Float64Array(n));

  function evaluate(p: Float64Array, out: Float64Array, jac: Float64Array | null) {
    const blur = p[iBlur]!;
    const cg = p[iNeel]!;
    const stepInFft = is180 && blur > 0;
    gridFields(p, jac !== null);
    const zeroModes = true;
    const blurred = blur > 0;
    const zWhich = component === "bz" ? "z" : "x";
    if (zeroModes) removeZeroModes(jac !== null);
    kernels(p);
    fftPair(mzL, mx1, Ar, Ai, Br, Bi);
    if (stepInFft) {
      stepValues(gx, p, W[0], jac ? W[1] : null, jac ? W[2] : null, jac ? W[3] : null, jac ? WD : null);
      fftPair(W[0], null, Sr, Si, null, null);
    }
    // base output spectrum O = C (K L + G S), L = A - i sg cg B
    const Or = colR[iOff]!,
      Oi = colI[iOff]!; // reuse the offset slot for the base
    for (let j = 0; j < n; j++) {
      const lr = Ar[j]! + sg[j]! * cg * Bi[j]!;
      const li = Ai[j]! - sg[j]! * cg * Br[j]!;
      let r = K[j]! * lr;
      let i = K[j]! * li;
      if (comp) {
        const t = r;
        r = sg[j]! * i;
        i = -sg[j]! * t;
      }
      if (stepInFft) {
        r += G[j]! * Sr[j]!;
        i += G[j]! * Si[j]!;
      }
      Or[j] = r;
      Oi[j] = i;
    }
    // Blurred: the closed-form field Q F of the net charge is added at the points unblurred, and its
    // blur as the spectrum Q (G - 1) F: G - 1 ~ -k^2 s^2 / 2 removes the |k| kink of F at k = 0, so the
    // periodic box errs only at third order there.
    const Qeff = component === "bz" ? Qz : cg * Qx;
    if (blurred) {
      zeroModeField(gx, p, zWhich, ZG, jac ? ZGh : null, jac ? ZGt : null);
      fftPair(ZG, jac ? ZGh : null, Fr, Fi, jac ? Fhr : null, jac ? Fhi : null);
      if (jac) fftPair(ZGt, null, Ftr, Fti, null, null);
      for (let j = 0; j < n; j++) {
        const g1 = G[j]! - 1;
        Or[j]! += Qeff * g1 * Fr[j]!;
        Oi[j]! += Qeff * g1 * Fi[j]!;
      }
    }
    // base values
    spectrumToPoints(grid, Or, Oi, x, gridOut, null, UPSAMPLE, fineRe, fineIm);
    const off = p[iOff]!;
    if (is180 && !stepInFft) stepValues(x, p, stepAt, null, null, null);
    for (let i = 0; i < m; i++) out[i] = gridOut[i]! + off + (is180 && !stepInFft ? stepAt[i]! : 0);
    if (zeroModes) {
      zeroModeField(x, p, "z", Zz, jac ? Zzh : null, jac ? Zzt : null);
      zeroModeField(x, p, "x", Zx, jac ? Zxh : null, jac ? Zxt : null);
      for (let i = 0; i < m; i++) out[i]! += Qz * Zz[i]! + cg * Qx * Zx[i]!;
    }
    if (!jac) return;

    // ---- Jacobian columns (spectra) ----
    const cols: number[] = [];
    const setLocal = (c: number, dr: Float64Array, di: Float64Array, er: Float64Array, ei: Float64Array, scale: number) => {
      // column spectrum C K (dA - i sg cg dB) * scale, dA = (dr, di), dB = (er, ei)
      const R = colR[c]!,
        I = colI[c]!;
      for (let j = 0; j < n; j++) {
        const lr = dr[j]! + sg[j]! * cg * ei[j]!;
        const li = di[j]! - sg[j]! * cg * er[j]!;
        let r = K[j]! * lr * scale;
        let i = K[j]! * li * scale;
        if (comp) {
          const t = r;
          r = sg[j]! * i;
          i = -sg[j]! * t;
        }
        R[j] = r;
        I[j] = i;
      }
      cols.push(c);
    };
    const [tr, ti, ur, ui] = [W[4], W[5], W[6], W[7]];
    for (let s = 0; s < nShape; s++) {
      fftPair(dmz[s]!, dmx1[s]!, tr, ti, ur, ui);
      setLocal(s, tr, ti, ur, ui, 1);
    }
    // step derivatives (blurred 180 wall): d/dx0 = -d/du, d/dDelta and d/dh through H, d/dt
    let SdR: Float64Array | null = null,
      SdI: Float64Array | null = null,
      SHr: Float64Array | null = null,
      SHi: Float64Array | null = null,
      Str: Float64Array | null = null,
      Sti: Float64Array | null = null;
    if (stepInFft) {
      [SdR, SdI, SHr, SHi, Str, Sti] = [W[8], W[9], W[10], W[11], W[12], W[13]];
      fftPair(W[1], W[2], SdR, SdI, SHr, SHi);
      fftPair(W[3], WD, Str, Sti, SDr, SDi);
      for (let j = 0; j < n; j++) {
        colR[0]![j]! -= G[j]! * SdR[j]!;
        colI[0]![j]! -= G[j]! * SdI[j]!;
        colR[1]![j]! += G[j]! * SDr[j]!;
        colI[1]![j]! += G[j]! * SDi[j]!;
      }
    }
    // neel: C K (-i sg B)
    {
      const R = colR[iNeel]!,
        I = colI[iNeel]!;
      for (let j = 0; j < n; j++) {
        let r = K[j]! * sg[j]! * Bi[j]!;
        let i = -K[j]! * sg[j]! * Br[j]!;
        if (comp) {
          const t = r;
          r = sg[j]! * i;
          i = -sg[j]! * t;
        }
        R[j] = r;
        I[j] = i;
      }
      cols.push(iNeel);
    }
    // h, t: dK/dh = -|k| K, dK/dt = Kt; the step through H (h) and t
    {
      const Rh = colR[iH]!,
        Ih = colI[iH]!,
        Rt = colR[iT]!,
        It = colI[iT]!;
      for (let j = 0; j < n; j++) {
        const lr = Ar[j]! + sg[j]! * cg * Bi[j]!;
        const li = Ai[j]! - sg[j]! * cg * Br[j]!;
        let rh = -ak[j]! * K[j]! * lr;
        let ih = -ak[j]! * K[j]! * li;
        let rt = Kt[j]! * lr;
        let it = Kt[j]! * li;
        if (comp) {
          let t = rh;
          rh = sg[j]! * ih;
          ih = -sg[j]! * t;
          t = rt;
          rt = sg[j]! * it;
          it = -sg[j]! * t;
        }
        if (stepInFft) {
          rh += G[j]! * SHr![j]!;
          ih += G[j]! * SHi![j]!;
          rt += G[j]! * Str![j]!;
          it += G[j]! * Sti![j]!;
        }
        Rh[j] = rh;
        Ih[j] = ih;
        Rt[j] = rt;
        It[j] = it;
      }
      cols.push(iH, iT);
    }
    // Ms: O / Ms; blur: -k^2 s O
    {
      const Ms = p[iMs]!;
      const Rm = colR[iMs]!,
        Im = colI[iMs]!,
        Rb = colR[iBlur]!,
        Ib = colI[iBlur]!;
      for (let j = 0; j < n; j++) {
        Rm[j] = Or[j]! / Ms;
        Im[j] = Oi[j]! / Ms;
        const f = -kk[j]! * kk[j]! * blur;
        // d/ds of Q (G - 1) F is f Q G F; f Or holds f Q (G - 1) F of it, so add f Q F
        Rb[j] = f * Or[j]! + (blurred ? f * Qeff * Fr[j]! : 0);
        Ib[j] = f * Oi[j]! + (blurred ? f * Qeff * Fi[j]! : 0);
      }
      cols.push(iMs, iBlur);
    }
    if (blurred) {
      // the blurred net-charge field's derivatives: shape (dQ), neel (m_x charge), h and t
      for (let j = 0; j < n; j++) {
        const g1 = G[j]! - 1;
        for (let s2 = 0; s2 < nShape; s2++) {
          const dq = component === "bz" ? dQz[s2]! : cg * dQx[s2]!;
          colR[s2]![j]! += dq * g1 * Fr[j]!;
          colI[s2]![j]! += dq * g1 * Fi[j]!;
        }
        if (component === "bx") {
          colR[iNeel]![j]! += Qx * g1 * Fr[j]!;
          colI[iNeel]![j]! += Qx * g1 * Fi[j]!;
        }
        colR[iH]![j]! += Qeff * g1 * Fhr[j]!;
        colI[iH]![j]! += Qeff * g1 * Fhi[j]!;
        colR[iT]![j]! += Qeff * g1 * Ftr[j]!;
        colI[iT]![j]! += Qeff * g1 * Fti[j]!;
      }
    }
    // invert two columns per complex transform (both spectra are Hermitian); each is scaled to
    // unit peak first, since columns differ by up to 1e16 (units) and the round-off of the larger
    // would swamp the smaller
    const peakOf = (c: number) => {
      let v = 0;
      const R = colR[c]!,
        I = colI[c]!;
      for (let j = 0; j < n; j++) v = Math.max(v, Math.abs(R[j]!), Math.abs(I[j]!));
      return v > 0 ? v : 1;
    };
    for (let q = 0; q < cols.length; q += 2) {
      const a = cols[q]!;
      const b = q + 1 < cols.length ? cols[q + 1]! : -1;
      const pa = peakOf(a);
      const pb = b >= 0 ? peakOf(b) : 1;
      const ia = 1 / pa;
      const ib = 1 / pb;
      for (let j = 0; j < n; j++) {
        re[j] = colR[a]![j]! * ia - (b >= 0 ? colI[b]![j]! * ib : 0);
        im[j] = colI[a]![j]! * ia + (b >= 0 ? colR[b]![j]! * ib : 0);
      }
      const ja = jac.subarray(a * m, a * m + m);
      const jb = b >= 0 ? jac.subarray(b * m, b * m + m) : null;
      spectrumToPoints(grid, re, im, x, ja, jb, UPSAMPLE, fineRe, fineIm);
      for (let i = 0; i < m; i++) ja[i]! *= pa;
      if (jb) for (let i = 0; i < m; i++) jb[i]! *= pb;
    }
    // closed-form step at the data points (unblurred 180 wall)
    if (is180 && !stepInFft) {
      const [du, dH, dt, dD] = [Wm[0], Wm[1], Wm[2], Wm[3]];
      stepValues(x, p, stepAt, du, dH, dt, dD);
      for (let i = 0; i < m; i++) {
        jac[i]! -= du[i]!;
        jac[m + i]! += dD[i]!;
        jac[iH * m + i]! += dH[i]!;
        jac[iT * m + i]! += dt[i]!;
        jac[iMs * m + i]! += stepAt[i]! / p[iMs]!;
      }
    }
    if (zeroModes) {
      for (let s2 = 0; s2 < nShape; s2++) {
        const col = jac.subarray(s2 * m, s2 * m + m);
        for (let i = 0; i < m; i++) col[i]! += dQz[s2]! * Zz[i]! + cg * dQx[s2]! * Zx[i]!;
      }
      for (let i = 0; i < m; i++) {
        jac[iNeel * m + i]! += Qx * Zx[i]!;
        jac[iH * m + i]! += Qz * Zzh[i]! + cg * Qx * Zxh[i]!;
        jac[iT * m + i]! += Qz * Zzt[i]! + cg * Qx * Zxt[i]!;
        jac[iMs * m + i]! += (Qz * Zz[i]! + cg * Qx * Zx[i]!) / p[iMs]!;
      }
    }
    jac.fill(1, iOff * m, iOff * m + m);
  }

  return {
    model(p, out) {
      evaluate(p, out, null);
    },
    jacobian(p, out) {
      evaluate(p, scratch, out);
    },
  };
}
