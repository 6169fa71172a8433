/**
 * Bloch points and hedgehogs of 3D fields: the signed S2 degree enclosed by each cubic cell of the
 * grid (8 neighbouring sites), as the sum of the solid angles of its 6 faces (2 triangles each,
 * oriented counterclockwise seen from outside the cell) divided by 4 pi. The surface is closed, so the
 * degree is an exact integer; a non-zero value marks a point singularity inside the cell: +1 for a
 * hedgehog m = r / |r|, -1 for an anti-hedgehog. Face diagonals match those of neighbouring cells and
 * of the 2D layer triangulation (latticeKernel.ts), so Sum of degrees between layers k and k+1 equals
 * Q(k+1) - Q(k) on an x-y periodic grid (Gauss). Sources: B. Berg, M. Luescher, Nucl. Phys. B 190,
 * 412 (1981) (solid-angle density); J. Milnor, Topology from the Differentiable Viewpoint (1965)
 * (degree of a map as sign det of its Jacobian at a regular zero).
 */
import { type Boundary, wrapFlags } from "./boundary.js";
import { type VectorField, requireAtLeast, requireSomeMatter } from "./field.js";
import { InputError } from "../errors.js";

export interface BlochPoint {
  /** Cell indices (lower corner). */
  i: number;
  j: number;
  k: number;
  /** Centre of the cell (m). */
  x: number;
  y: number;
  z: number;
  /** Signed degree (+1 hedgehog-like, -1 anti-hedgehog-like). */
  degree: number;
}

export interface BlochPointResult {
  points: BlochPoint[];
  /** Sum of all degrees. */
  totalDegree: number;
  /** Cells examined and cells skipped (a vacuum corner). */
  cells: number;
  skipped: number;
}

// Corner offsets (di, dj, dk) of the 12 outward-oriented face triangles.
const FACE_TRIANGLES: ReadonlyArray<readonly [number, number, number]> = [
  // z+ : (0,0,1) (1,0,1) (1,1,1) (0,1,1)
  [4, 5, 7],
  [4, 7, 6],
  // z- : (0,0,0) (0,1,0) (1,1,0) (1,0,0)
  [0, 2, 3],
  [0, 3, 1],
  // x+ : (1,0,0) (1,1,0) (1,1,1) (1,0,1)
  [1, 3, 7],
  [1, 7, 5],
  // x- : (0,0,0) (0,0,1) (0,1,1) (0,1,0)
  [0, 4, 6],
  [0, 6, 2],
  // y+ : (0,1,0) (0,1,1) (1,1,1) (1,1,0)
  [2, 6, 7],
  [2, 7, 3],
  // y- : (0,0,0) (1,0,0) (1,0,1) (0,0,1)
  [0, 1, 5],
  [0, 5, 4],
];
// corner number b = di + 2 dj + 4 dk

export function findBlochPoints(field: VectorField, options: { boundary?: Boundary } = {}): BlochPointResult {
  if (field.lattice !== "square") throw new InputError("lattice", field.lattice, '"square" (3D grids are rectangular)');
  requireAtLeast(field, 2, 2, "Bloch-point cells (a cell needs 2x2x2 sites)", 2);
  requireSomeMatter(field, "Bloch-point finding");
  const { wrapX, wrapY } = wrapFlags(options.boundary ?? "open");
  const { nx, ny, nz, m, vacuum } = field;
  const ci = wrapX ? nx : nx - 1,
    cj = wrapY ? ny : ny - 1;
  const corner = new Int32Array(8);
  const points: BlochPoint[] = [];
  let total = 0,
    cells = 0,
    skipped = 0;
  for (let k = 0; k < nz - 1; k++) {
    for (let j = 0; j < cj; j++) {
      const jn = j + 1 === ny ? 0 : j + 1;
      for (let i = 0; i < ci; i++) {
        const inx = i + 1 === nx ? 0 : i + 1;
        let anyVac = 0;
        for (let b = 0; b < 8; b++) {
          const c = ((k + (b >> 2)) * ny + (b & 2 ? jn : j)) * nx + (b & 1 ? inx : i);
          corner[b] = c;
          if (vacuum !== null) anyVac |= vacuum[c]!;
        }
        cells++;
        if (anyVac) {
          skipped++;
          continue;
        }
        let omega = 0;
        for (const [p, q, r] of FACE_TRIANGLES) {
          const a = 3 * corner[p]!,
            b2 = 3 * corner[q]!,
            c2 = 3 * corner[r]!;
          const ax = m[a]!,
            ay = m[a + 1]!,
            az = m[a + 2]!;
          const bx = m[b2]!,
            by = m[b2 + 1]!,
            bz = m[b2 + 2]!;
          const cx = m[c2]!,
            cy = m[c2 + 1]!,
            cz = m[c2 + 2]!;
          const t = ax * (by * cz - bz * cy) + ay * (bz * cx - bx * cz) + az * (bx * cy - by * cx);
          omega += 2 * Math.atan2(t, 1 + ax * bx + ay * by + az * bz + bx * cx + by * cy + bz * cz + cx * ax + cy * ay + cz * az);
        }
        const degree = Math.round(omega / (4 * Math.PI));
        if (degree !== 0) {
          points.push({
            i,
            j,
            k,
            degree,
            x: (i + 0.5) * field.dx,
            y: (j + 0.5) * field.dy,
            z: (k + 0.5) * field.dz,
          });
          total += degree;
        }
      }
    }
  }
  return { points, totalDegree: total, cells, skipped };
}
