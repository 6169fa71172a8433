/**
 * Closed loops on the unit sphere: input checking, closing, and the cone (circle of latitude).
 * A loop is a sequence of direction vectors [x, y, z] (normalized here, never modified in place)
 * whose last point equals the first: the loop is closed explicitly, so that an open path is an
 * error rather than a silent closure (pass { close: true } to close it by a final geodesic edge).
 */
import { InputError } from "../errors.js";

export type Vec3 = readonly [number, number, number];

export interface LoopOptions {
  /** Close the path by a geodesic from the last point to the first (default false: must be closed). */
  close?: boolean;
  /** Closure tolerance on |last - first| (default 1e-9). */
  tolerance?: number;
  parameter?: string;
}

/**
 * Normalized vertices of a closed loop, WITHOUT the repeated final point (vertex count n >= 3).
 * Errors: open loop, fewer than 3 distinct vertices, zero or non-finite vectors, consecutive
 * vertices that are antipodal (the geodesic edge between them is undefined).
 */
export function closedLoopVertices(points: ArrayLike<ArrayLike<number>>, options: LoopOptions = {}): Float64Array {
  const name = options.parameter ?? "loop";
  const tol = options.tolerance ?? 1e-9;
  const n0 = points.length;
  if (n0 < 3) throw new InputError(name, points, "a closed loop of at least 3 direction vectors [x, y, z], last equal to first");
  const v = new Float64Array(3 * n0);
  for (let i = 0; i < n0; i++) {
    const p = points[i]!;
    if (!p || p.length !== 3) throw new InputError(`${name}[${i}]`, p, "a direction vector [x, y, z]");
    const x = p[0]!,
      y = p[1]!,
      z = p[2]!;
    const r = Math.sqrt(x * x + y * y + z * z);
    if (!Number.isFinite(r) || r === 0) throw new InputError(`${name}[${i}]`, p, "a finite, non-zero direction vector");
    v[3 * i] = x / r;
    v[3 * i + 1] = y / r;
    v[3 * i + 2] = z / r;
  }
  let n = n0;
  const gap = Math.hypot(v[0]! - v[3 * (n - 1)]!, v[1]! - v[3 * (n - 1) + 1]!, v[2]! - v[3 * (n - 1) + 2]!);
  if (gap <= tol) {
    n -= 1; // drop the repeated closing point
  } else if (!options.close) {
    throw new InputError(
      name,
      `open path (last point is ${gap.toExponential(3)} from the first)`,
      `a closed loop: last point equal to the first within ${tol} (or pass { close: true })`,
    );
  }
  if (n < 3) throw new InputError(name, points, "at least 3 distinct vertices");
  const out = v.slice(0, 3 * n);
  for (let i = 0; i < n; i++) {
    const j = (i + 1) % n;
    const dot = out[3 * i]! * out[3 * j]! + out[3 * i + 1]! * out[3 * j + 1]! + out[3 * i + 2]! * out[3 * j + 2]!;
    if (dot < -1 + 1e-12) {
      throw new InputError(
        `${name}[${i}], ${name}[${j}]`,
        [Array.from(out.subarray(3 * i, 3 * i + 3)), Array.from(out.subarray(3 * j, 3 * j + 3))],
        "consecutive points that are not antipodal (the geodesic between antipodes is undefined); add an intermediate point",
      );
    }
  }
  return out;
}

/**
 * A circle of colatitude `theta` about +z, run counterclockwise seen from +z (phi increasing),
 * as a closed loop of `segments` geodesic edges (segments + 1 points, last = first).
 */
export function coneLoop(theta: number, segments: number, phi0 = 0): Array<[number, number, number]> {
  if (!Number.isFinite(theta) || theta <= 0 || theta >= Math.PI) throw new InputError("theta", theta, "a cone half-angle in (0, pi) rad");
  if (!Number.isInteger(segments) || segments < 3) throw new InputError("segments", segments, "a whole number >= 3");
  const pts: Array<[number, number, number]> = [];
  const s = Math.sin(theta);
  const c = Math.cos(theta);
  for (let k = 0; k < segments; k++) {
    const p = phi0 + (2 * Math.PI * k) / segments;
    pts.push([s * Math.cos(p), s * Math.sin(p), c]);
  }
  pts.push(pts[0]!.slice() as [number, number, number]);
  return pts;
}
