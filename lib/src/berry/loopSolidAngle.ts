/**
 * Signed solid angle enclosed by a closed polygonal loop on the unit sphere (geodesic edges).
 *
 * Convention: positive for a loop run counterclockwise seen from outside the sphere (right-hand
 * rule about the outward normal of the enclosed region): a circle of colatitude theta about +z with
 * increasing phi encloses Omega = 2 pi (1 - cos theta). The solid angle of a closed loop is defined
 * modulo 4 pi (the two sides of the loop); we return the representative in (-2 pi, 2 pi], i.e. the
 * smaller side with its sign, and `left` in [0, 4 pi), the area to the left of the direction of travel.
 *
 * Method: fan of spherical triangles (apex, v_i, v_i+1), each by the triangle formula of
 * Van Oosterom and Strackee, Omega = 2 atan2(a . (b x c), 1 + a.b + b.c + c.a)
 * (A. Van Oosterom, J. Strackee, IEEE Trans. Biomed. Eng. 30, 125 (1983)). The formula is
 * ill-conditioned only when two of the three points are nearly antipodal (numerator and denominator
 * both vanish); the apex is therefore chosen among 14 candidate directions as the one farthest from
 * the antipodes of all vertices and edge midpoints, which keeps every triangle well conditioned
 * however the loop passes (including loops through both poles and great circles).
 */
import { triangleSolidAngle } from "../topology/solidAngle.js";
import { closedLoopVertices, type LoopOptions } from "./loopOnSphere.js";

export interface LoopSolidAngle {
  /** Signed solid angle in (-2 pi, 2 pi] (sr). */
  value: number;
  /** Area to the left of the loop, in [0, 4 pi) (sr); equals value mod 4 pi. */
  left: number;
  /** Number of geodesic edges. */
  edges: number;
  /** Apex used for the fan and its smallest distance |apex + v| to the antipode of a loop point. */
  apex: [number, number, number];
  apexClearance: number;
}

const r3 = 1 / Math.sqrt(3);
const candidates: Array<[number, number, number]> = [
  [1, 0, 0],
  [-1, 0, 0],
  [0, 1, 0],
  [0, -1, 0],
  [0, 0, 1],
  [0, 0, -1],
  [r3, r3, r3],
  [r3, r3, -r3],
  [r3, -r3, r3],
  [r3, -r3, -r3],
  [-r3, r3, r3],
  [-r3, r3, -r3],
  [-r3, -r3, r3],
  [-r3, -r3, -r3],
];

export function loopSolidAngle(points: ArrayLike<ArrayLike<number>>, options: LoopOptions = {}): LoopSolidAngle {
  const v = closedLoopVertices(points, options);
  return solidAngleOfVertices(v);
}

/** The same for normalized, implicitly closed vertices (interleaved x, y, z; no repeated point). */
export function solidAngleOfVertices(v: Float64Array): LoopSolidAngle {
  const n = v.length / 3;
  let best = candidates[0]!;
  let bestClear = -1;
  for (const a of candidates) {
    let clear = Infinity;
    for (let i = 0; i < n && clear > bestClear; i++) {
      const j = (i + 1) % n;
      const x = v[3 * i]!,
        y = v[3 * i + 1]!,
        z = v[3 * i + 2]!;
      // squared distances from the antipode of the vertex and of the edge midpoint direction
      clear = Math.min(clear, (a[0] + x) ** 2 + (a[1] + y) ** 2 + (a[2] + z) ** 2);
      const mx = x + v[3 * j]!,
        my = y + v[3 * j + 1]!,
        mz = z + v[3 * j + 2]!;
      const mr = Math.sqrt(mx * mx + my * my + mz * mz);
      if (mr > 0) clear = Math.min(clear, (a[0] + mx / mr) ** 2 + (a[1] + my / mr) ** 2 + (a[2] + mz / mr) ** 2);
    }
    if (clear > bestClear) {
      bestClear = clear;
      best = a;
    }
  }
  // Kahan-compensated sum of the triangle solid angles.
  let sum = 0;
  let comp = 0;
  for (let i = 0; i < n; i++) {
    const j = (i + 1) % n;
    const t = triangleSolidAngle(best[0], best[1], best[2], v[3 * i]!, v[3 * i + 1]!, v[3 * i + 2]!, v[3 * j]!, v[3 * j + 1]!, v[3 * j + 2]!);
    const y = t - comp;
    const s = sum + y;
    comp = s - sum - y;
    sum = s;
  }
  const fourPi = 4 * Math.PI;
  let left = sum - fourPi * Math.floor(sum / fourPi);
  if (left >= fourPi) left -= fourPi;
  let value = left > 2 * Math.PI ? left - fourPi : left;
  if (value <= -2 * Math.PI) value += fourPi;
  return { value, left, edges: n, apex: [best[0], best[1], best[2]], apexClearance: Math.sqrt(bestClear) };
}
