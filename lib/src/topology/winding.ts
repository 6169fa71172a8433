/**
 * S1 winding numbers.
 *
 * The winding number of a closed sequence of angles phi_0 ... phi_{n-1} (phi_n = phi_0) is
 * w = (1 / 2 pi) Sum_k wrap(phi_{k+1} - phi_k), with wrap() mapping a difference into [-pi, pi).
 * The result is an exact integer whenever consecutive samples differ by less than pi in the true
 * angle, which is the sampling condition of the method. Source: common practice for the degree of a
 * map S1 -> S1 (e.g. N. D. Mermin, Rev. Mod. Phys. 51, 591 (1979), winding of an order parameter).
 */
import { InputError } from "../errors.js";

const TWO_PI = 2 * Math.PI;

/** Map an angle difference into [-pi, pi). */
export function wrapAngle(d: number): number {
  if (d >= -Math.PI && d < Math.PI) return d;
  return d - TWO_PI * Math.floor((d + Math.PI) / TWO_PI);
}

/**
 * Winding number of a closed sequence of angles (radians). The loop closes from the last sample back
 * to the first. Returns an integer (rounded; the raw sum is an integer multiple of 2 pi to rounding).
 */
export function s1Winding(angles: ArrayLike<number>): number {
  const n = angles.length;
  if (n < 2) throw new InputError("angles", angles, "a closed sequence of at least 2 angles");
  let sum = 0;
  for (let k = 0; k < n; k++) {
    const a = angles[k]!,
      b = angles[(k + 1) % n]!;
    if (!Number.isFinite(a)) throw new InputError(`angles[${k}]`, a, "a finite angle in radians");
    sum += wrapAngle(b - a);
  }
  return Math.round(sum / TWO_PI) + 0; // + 0 turns -0 into 0
}

/**
 * Winding number of a closed sequence of planar vectors (vx[k], vy[k]): the S1 winding of their
 * directions atan2(vy, vx). A zero vector has no direction and is an error.
 */
export function s1WindingOfVectors(vx: ArrayLike<number>, vy: ArrayLike<number>): number {
  if (vx.length !== vy.length) throw new InputError("vy", vy, `the same length as vx (${vx.length})`);
  const angles = new Float64Array(vx.length);
  for (let k = 0; k < vx.length; k++) {
    const x = vx[k]!,
      y = vy[k]!;
    if (!(x * x + y * y > 0)) throw new InputError(`vectors[${k}]`, [x, y], "a non-zero planar vector (a direction)");
    angles[k] = Math.atan2(y, x);
  }
  return s1Winding(angles);
}
