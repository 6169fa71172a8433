/**
 * The 360-degree wall (or skyrmion cut) in the stray-field models (strayBound.ts): its magnetization
 * on the FFT grid, m_z - 1 and the signed in-plane part, from the ansatz
 * tan(theta/2) = sinh(R/w) / sinh(|x - x0|/w) (H.-B. Braun, PRB 50, 16501 (1994); F. Buettner,
 * I. Lemesh, G. Beach, Sci. Rep. 8, 4464 (2018)) evaluated in wallProfiles.ts.
 */
import { wall360Point } from "./wallProfiles.js";

/**
 * m_z - 1 and m_x / neel of the wall on the grid gx, and, when dmz and dmx1 are given, their
 * derivatives in x0 (index 0), R (1) and w (2).
 */
export function wall360GridFields(
  gx: Float64Array,
  x0: number,
  R: number,
  w: number,
  mzL: Float64Array,
  mx1: Float64Array,
  dmz: readonly [Float64Array, Float64Array, Float64Array] | null,
  dmx1: readonly [Float64Array, Float64Array, Float64Array] | null,
): void {
  const n = gx.length;
  for (let g = 0; g < n; g++) {
    const q = wall360Point(gx[g]!, x0, R, w);
    mzL[g] = q.mz - 1;
    mx1[g] = q.signedSin;
    if (dmz && dmx1) {
      // s = sign(u) sech L with dm_z = -sech^2 L dL: ds = sign(u) tanh(L) dm_z / sech(L), tanh L = -m_z
      const sech = Math.abs(q.signedSin);
      const f = sech > 1e-150 ? (Math.sign(gx[g]! - x0) * -q.mz) / sech : 0;
      dmz[0][g] = q.dx0;
      dmz[1][g] = q.dR;
      dmz[2][g] = q.dw;
      dmx1[0][g] = f * q.dx0;
      dmx1[1][g] = f * q.dR;
      dmx1[2][g] = f * q.dw;
    }
  }
}
