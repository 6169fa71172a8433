/**
 * Berry phase of a spin S in the state |S, m; n> (m along its instantaneous axis n) when n follows
 * a closed loop C on the sphere, computed two independent ways:
 *
 *  - geometric: gamma = -m Omega(C), Omega the signed solid angle of the loop (loopSolidAngle.ts,
 *    positive counterclockwise seen from outside). Source: M. Berry, Proc. R. Soc. A 392, 45 (1984).
 *  - discrete: the gauge-invariant product of overlaps of spin-S states built with the spin-S
 *    rotation matrices (Wigner D, spinCoherentState.ts) at the vertices of the loop,
 *    gamma = -Im ln prod_i <u_i | u_i+1>, u_N = u_0. Sources: R. Resta, Rev. Mod. Phys. 66, 899
 *    (1994); R. King-Smith, D. Vanderbilt, PRB 47, 1651 (1993).
 *
 * Sign convention (both methods): |psi(T)> = exp(i gamma) exp(-i int E dt / hbar) |psi(0)> for
 * adiabatic transport, with gamma = i oint <u | grad u> . dn = -Im ln prod <u_i|u_i+1>. For a spin
 * whose state m is along n and a loop counterclockwise about +z (seen from outside) gamma = -m Omega:
 * negative for m > 0. gamma is defined modulo 2 pi; both methods are reported in (-pi, pi].
 * Discrete phase, exactly (derived here). Between neighbouring vertices n_i, n_i+1 (arc alpha_i of
 * the great circle, unit normal e_i = n_i x n_i+1 / |...|) write |m; n_i+1> = exp(-i alpha_i S.e_i)
 * |m; n_i> up to a phase: rotating about e_i carries n_i to n_i+1 and is parallel transport along
 * the geodesic edge. With that transported frame the overlap is <m; n_i| exp(-i alpha_i S.e_i)
 * |m; n_i> = d^S_mm(alpha_i), the diagonal Wigner small-d element (e_i is perpendicular to n_i, so
 * the matrix element is that of exp(-i alpha S_y) in n_i's frame: real). Around the closed polygon
 * the transported frame comes back turned by the enclosed solid angle Omega (the holonomy of
 * parallel transport on the unit sphere), which multiplies the state by exp(i m Omega). Hence
 *   prod_i <u_i|u_i+1> = exp(i m Omega) prod_i d^S_mm(alpha_i),
 *   gamma_discrete = -m Omega + pi [prod_i d^S_mm(alpha_i) < 0]   (mod 2 pi)
 * for every N: the discrete phase equals -m Omega of the geodesic polygon exactly, or is off by
 * exactly pi when the product of the diagonal small-d elements is negative. For m = +-S,
 * d^S_SS(alpha) = cos^(2S)(alpha / 2) > 0 (alpha < pi): always exact (the Bargmann invariant). For
 * |m| < S, d^S_mm(alpha) has zeros at finite alpha: edges longer than its first zero flip signs.
 * Nothing here converges as O(1/N^2); only the polygon's Omega differs from an inscribed circle's
 * cap by O(1/N^2). `edgeSign` is that product's sign (computed from the d^S_mm(alpha_i), not from
 * the overlaps), `minEdgeFactor` its smallest |d^S_mm(alpha_i)| (near 0 the phase is ill-defined).
 * Sources for the pieces: D. M. Brink, G. R. Satchler, Angular Momentum (Oxford, 1968), ch. 2
 * (rotation matrices); the holonomy of a geodesic polygon (Gauss-Bonnet).
 */
import { InputError } from "../errors.js";
import { checkSpin, spinBasis } from "./spinOperators.js";
import { wignerSmallDColumn } from "./spinCoherentState.js";
import { closedLoopVertices, type LoopOptions } from "./loopOnSphere.js";
import { solidAngleOfVertices } from "./loopSolidAngle.js";

export interface SpinBerryPhaseResult {
  S: number;
  m: number;
  /** Solid angle in (-2 pi, 2 pi] (sr). */
  solidAngle: number;
  /** -m Omega wrapped to (-pi, pi]. */
  geometric: number;
  /** -Im ln prod <u_i|u_i+1> wrapped to (-pi, pi]. */
  discrete: number;
  /** |prod <u_i|u_i+1>| (1 for m = +-S up to the geodesic-polygon shrinkage; < 1 otherwise). */
  overlapMagnitude: number;
  /** Wrapped difference discrete - geometric. */
  difference: number;
  /** Sign of prod_i d^S_mm(alpha_i) over the edges (arcs alpha_i): +1 the discrete phase is -m Omega exactly, -1 it is off by pi. */
  edgeSign: 1 | -1;
  /** Smallest |d^S_mm(alpha_i)| over the edges (0 would leave the discrete phase undefined); for short edges its lower bound 1 - alpha^2 (S(S+1) - m^2) / 4. */
  minEdgeFactor: number;
  edges: number;
  method: string;
  sources: string[];
}

export function wrapBerryPhase(x: number): number {
  const twoPi = 2 * Math.PI;
  let y = x - twoPi * Math.floor((x + Math.PI) / twoPi);
  if (y <= -Math.PI) y += twoPi;
  if (y > Math.PI) y -= twoPi;
  return y;
}

export function checkSpinProjection(S: number, m: number): void {
  checkSpin(S);
  const k = S - m;
  if (!Number.isFinite(m) || Math.abs(k - Math.round(k)) > 1e-12 || m > S + 1e-12 || m < -S - 1e-12) {
    throw new InputError("m", m, `one of S, S-1, ..., -S for S = ${S}`);
  }
}

export function spinBerryPhase(points: ArrayLike<ArrayLike<number>>, S: number, m: number, options: LoopOptions = {}): SpinBerryPhaseResult {
  checkSpinProjection(S, m);
  const v = closedLoopVertices(points, options);
  const n = v.length / 3;
  const omega = solidAngleOfVertices(v).value;
  const { dim } = spinBasis(S);
  const twoS = dim - 1;
  // States at each vertex; the product of overlaps is kept as a unit phase times a magnitude
  // (renormalized) so that it never underflows.
  let zr = 1,
    zi = 0;
  let logMag = 0;
  let magProd = 1;
  const d = new Float64Array(dim);
  let prevRe = new Float64Array(dim);
  let prevIm = new Float64Array(dim);
  let curRe = new Float64Array(dim);
  let curIm = new Float64Array(dim);
  const firstRe = new Float64Array(dim);
  const firstIm = new Float64Array(dim);
  let lastTheta = NaN;
  let lastZ = NaN;
  const state = (i: number, re: Float64Array, im: Float64Array) => {
    const x = v[3 * i]!,
      y = v[3 * i + 1]!,
      z = v[3 * i + 2]!;
    const rho = Math.sqrt(x * x + y * y);
    if (z !== lastZ) {
      // the small-d column depends on the polar angle only (constant along a cone)
      const t = Math.atan2(rho, z);
      if (t !== lastTheta) {
        wignerSmallDColumn(S, m, t, d);
        lastTheta = t;
      }
      lastZ = z;
    }
    // exp(-i m_k p) for m_k = S, S-1, ..., -S, with u = exp(i p) = (x + i y) / rho: start at
    // exp(-i S p) = conj(u)^S, then steps of u (relative error ~ 2S eps, no trigonometric call).
    // For half-integer S any square root of conj(u) will do: the other one flips the sign of every
    // component, a phase of the state, and the discrete product is gauge invariant.
    const ur = rho > 0 ? x / rho : 1;
    const ui = rho > 0 ? y / rho : 0;
    let cr: number, ci: number;
    if (twoS <= 64) {
      if (twoS % 2 === 1) {
        // principal square root of conj(u) = (ur, -ui), |u| = 1
        const a = Math.sqrt(0.5 * (1 + Math.abs(ur)));
        const b = -ui / (2 * a);
        if (ur >= 0) {
          cr = a;
          ci = b;
        } else {
          cr = Math.abs(b);
          ci = -ui >= 0 ? a : -a;
        }
      } else {
        cr = 1;
        ci = 0;
      }
      for (let q = 0; q < twoS >> 1; q++) {
        const nr = cr * ur + ci * ui; // times conj(u)
        ci = ci * ur - cr * ui;
        cr = nr;
      }
    } else {
      const p = Math.atan2(y, x);
      cr = Math.cos(S * p);
      ci = -Math.sin(S * p);
    }
    for (let k = 0; k < dim; k++) {
      re[k] = cr * d[k]!;
      im[k] = ci * d[k]!;
      const nr = cr * ur - ci * ui;
      ci = cr * ui + ci * ur;
      cr = nr;
    }
  };
  state(0, prevRe, prevIm);
  firstRe.set(prevRe);
  firstIm.set(prevIm);
  for (let i = 1; i <= n; i++) {
    if (i < n) state(i, curRe, curIm);
    else {
      curRe.set(firstRe);
      curIm.set(firstIm);
    }
    let sr = 0;
    let si = 0;
    for (let k = 0; k < dim; k++) {
      // conj(prev) * cur
      sr += prevRe[k]! * curRe[k]! + prevIm[k]! * curIm[k]!;
      si += prevRe[k]! * curIm[k]! - prevIm[k]! * curRe[k]!;
    }
    const mag = Math.sqrt(sr * sr + si * si);
    if (mag < 1e-300) {
      throw new InputError("loop", `edge ${i - 1} -> ${i % n}`, "edges short enough that consecutive states overlap (refine the loop)");
    }
    // running product of the normalized overlaps (its argument is the phase sum mod 2 pi) and of
    // the magnitudes (renormalized before it can underflow)
    const wr = sr / mag,
      wi = si / mag;
    const nzr = zr * wr - zi * wi;
    zi = zr * wi + zi * wr;
    zr = nzr;
    if ((i & 63) === 0) {
      const l = Math.sqrt(zr * zr + zi * zi);
      zr /= l;
      zi /= l;
    }
    magProd *= mag;
    if (magProd < 1e-150) {
      logMag += Math.log(magProd);
      magProd = 1;
    }
    const tr = prevRe;
    const ti = prevIm;
    prevRe = curRe;
    prevIm = curIm;
    curRe = tr;
    curIm = ti;
  }
  // sign of prod d^S_mm(alpha_i), alpha_i the arcs of the geodesic edges (see header)
  let edgeSign: 1 | -1 = 1;
  let minEdgeFactor = Infinity;
  {
    const dd = new Float64Array(dim);
    const col = Math.round(S - m);
    let lastAlpha = NaN,
      lastF = NaN;
    for (let i = 0; i < n; i++) {
      const j = (i + 1) % n;
      const ax = v[3 * i]!,
        ay = v[3 * i + 1]!,
        az = v[3 * i + 2]!;
      const bx = v[3 * j]!,
        by = v[3 * j + 1]!,
        bz = v[3 * j + 2]!;
      const cx = ay * bz - az * by,
        cy = az * bx - ax * bz,
        cz = ax * by - ay * bx;
      const alpha = Math.atan2(Math.sqrt(cx * cx + cy * cy + cz * cz), ax * bx + ay * by + az * bz);
      // short edges: d^S_mm(alpha) >= 1 - alpha^2 <Sy^2> / 2 = 1 - alpha^2 (S(S+1) - m^2) / 4 (cos x >= 1 - x^2/2
      // on the spectral decomposition of Sy), so it is positive and the bound serves as its size
      const bound = 1 - (alpha * alpha * (S * (S + 1) - m * m)) / 4;
      if (bound > 0.5) lastF = bound;
      else if (alpha !== lastAlpha) {
        wignerSmallDColumn(S, m, alpha, dd);
        lastAlpha = alpha;
        lastF = dd[col]!;
      }
      if (lastF < 0) edgeSign = edgeSign === 1 ? -1 : 1;
      minEdgeFactor = Math.min(minEdgeFactor, Math.abs(lastF));
    }
  }
  const geometric = wrapBerryPhase(-m * omega);
  logMag += Math.log(magProd);
  const discrete = wrapBerryPhase(-Math.atan2(zi, zr));
  return {
    S,
    m,
    solidAngle: omega,
    geometric,
    discrete,
    overlapMagnitude: Math.exp(logMag),
    difference: wrapBerryPhase(discrete - geometric),
    edgeSign,
    minEdgeFactor,
    edges: n,
    method: "geometric -m Omega (Van Oosterom-Strackee fan) and discrete product of overlaps of rotated spin-S states",
    sources: ["M. Berry, Proc. R. Soc. A 392, 45 (1984)", "R. Resta, Rev. Mod. Phys. 66, 899 (1994)", "A. Van Oosterom, J. Strackee, IEEE Trans. Biomed. Eng. 30, 125 (1983)"],
  };
}
