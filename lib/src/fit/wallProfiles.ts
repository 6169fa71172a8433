/**
 * Magnetization profiles across walls for fitting, vectorized over positions, with analytic
 * derivatives. Conventions are those of lib/src/walls/wall180.ts (shared by walls and skyrmions):
 *
 * - 180-degree wall, up (+z) domain at x < x0: theta = 2 arctan(exp((x - x0)/Delta)),
 *   m_z = -tanh(u), sin theta = sech(u), u = (x - x0)/Delta; in-plane moment
 *   (m_x, m_y) = -sin theta (cos gamma, sin gamma) with helicity gamma (0: Neel toward the up
 *   domain, pi: Neel toward the down domain, +-pi/2: Bloch). Source: L. Landau, E. Lifshitz (1935);
 *   A. Hubert, R. Schaefer, *Magnetic Domains* (Springer 1998).
 * - 360-degree wall / skyrmion line cut through the core at x0 (core down, background up):
 *   tan(theta/2) = sinh(R/w) / sinh(|x - x0|/w), so m_z = -tanh(L), sin theta = sech(L) with
 *   L = ln sinh(R/w) - ln sinh(|x - x0|/w) (computed in logarithms: no overflow for R >> w); the
 *   in-plane moment of the cut is sign(x - x0) sin theta (cos gamma, sin gamma) (a skyrmion of
 *   helicity gamma cut along a diameter). Sources: H.-B. Braun, PRB 50, 16501 (1994);
 *   F. Buettner, I. Lemesh, G. Beach, Sci. Rep. 8, 4464 (2018).
 */

/** ln sinh(a) for a >= 0 (-Infinity at 0), accurate for small and large a. */
export function logSinh(a: number): number {
  if (a === 0) return -Infinity;
  if (a < 1e-4) return Math.log(a) + (a * a) / 6;
  return a + Math.log1p(-Math.exp(-2 * a)) - Math.LN2;
}

/** coth(a) for a > 0. */
function coth(a: number): number {
  if (a > 20) return 1;
  if (a < 1e-5) return 1 / a + a / 3;
  return 1 / Math.tanh(a);
}

/** m_z and sin(theta) of the 180-degree wall at one position. */
export function wall180Point(x: number, x0: number, Delta: number): { mz: number; sinTheta: number } {
  const u = (x - x0) / Delta;
  return { mz: -Math.tanh(u), sinTheta: 1 / Math.cosh(u) };
}

/**
 * 360-degree wall / skyrmion cut at one position: m_z, the signed in-plane amplitude
 * s = sign(x - x0) sin theta, and the derivatives of m_z with respect to x0, R and w.
 */
export function wall360Point(x: number, x0: number, R: number, w: number): { mz: number; signedSin: number; dx0: number; dR: number; dw: number } {
  const u = x - x0;
  const a = Math.abs(u) / w;
  const b = R / w;
  const L = logSinh(b) - logSinh(a);
  const mz = -Math.tanh(L);
  const sech = 1 / Math.cosh(L);
  const sech2 = sech * sech;
  // dmz/dL = -sech^2 L; dL/dR = coth(b)/w; dL/dx0 = sign(u) coth(a)/w; dL/dw = (-b coth b + a coth a)/w
  const cb = coth(b);
  let dx0 = 0;
  let acoth = 0;
  if (a > 0) {
    const ca = coth(a);
    dx0 = (-sech2 * (Math.sign(u) * ca)) / w;
    acoth = a * ca;
  } else {
    acoth = 1; // a coth a -> 1 as a -> 0
  }
  const dR = (-sech2 * cb) / w;
  const dw = (-sech2 * (-b * cb + acoth)) / w;
  return { mz, signedSin: Math.sign(u) * sech, dx0, dR, dw };
}

/**
 * Vectorized m_z of the 360-degree wall / skyrmion cut (same formula as wall360Point, written as
 * m_z = (sinh^2 a - sinh^2 b) / (sinh^2 a + sinh^2 b), a = |x - x0|/w, b = R/w, with one exp per
 * point; falls back to the logarithmic form when sinh would overflow).
 */
export function wall360Mz(x: ArrayLike<number>, x0: number, R: number, w: number, out: Float64Array): void {
  const b = R / w;
  if (b > 300) {
    for (let i = 0; i < x.length; i++) out[i] = wall360Point(x[i]!, x0, R, w).mz;
    return;
  }
  const sb = Math.sinh(b);
  const sb2 = sb * sb;
  const iw = 1 / w;
  for (let i = 0; i < x.length; i++) {
    const a = Math.abs(x[i]! - x0) * iw;
    if (a > 300) {
      out[i] = 1;
      continue;
    }
    const e = Math.exp(a);
    const sa = 0.5 * (e - 1 / e);
    const sa2 = sa * sa;
    out[i] = (sa2 - sb2) / (sa2 + sb2);
  }
}

/**
 * Vectorized m_z and its derivatives (x0, R, w) of the 360-degree wall, written into `mz` and the
 * column-major block `d` (3 columns of length x.length). dm_z/dL = -(1 - m_z^2).
 */
export function wall360MzDerivatives(x: ArrayLike<number>, x0: number, R: number, w: number, mz: Float64Array, d: Float64Array): void {
  const m = x.length;
  const b = R / w;
  if (b > 300) {
    for (let i = 0; i < m; i++) {
      const q = wall360Point(x[i]!, x0, R, w);
      mz[i] = q.mz;
      d[i] = q.dx0;
      d[m + i] = q.dR;
      d[2 * m + i] = q.dw;
    }
    return;
  }
  const sb = Math.sinh(b);
  const sb2 = sb * sb;
  const cb = 1 / Math.tanh(b);
  const iw = 1 / w;
  for (let i = 0; i < m; i++) {
    const u = x[i]! - x0;
    const a = Math.abs(u) * iw;
    if (a > 300) {
      mz[i] = 1;
      d[i] = 0;
      d[m + i] = 0;
      d[2 * m + i] = 0;
      continue;
    }
    const e = Math.exp(a);
    const ie = 1 / e;
    const sa = 0.5 * (e - ie);
    const sa2 = sa * sa;
    const v = (sa2 - sb2) / (sa2 + sb2);
    mz[i] = v;
    const s2 = 1 - v * v; // sech^2 L
    let ca = 0;
    let acoth = 1;
    if (a > 0) {
      ca = (e + ie) / (e - ie);
      acoth = a * ca;
    }
    d[i] = a > 0 ? -s2 * Math.sign(u) * ca * iw : 0;
    d[m + i] = -s2 * cb * iw;
    d[2 * m + i] = -s2 * (-b * cb + acoth) * iw;
  }
}
