/**
 * Continuum finite-difference estimate of the skyrmion number, for comparison with the lattice
 * solid-angle sum: Q ~ (1 / 4 pi) Sum_cells m . (d_i m x d_j m) with central differences
 * d_i m = (m_{i+1} - m_{i-1}) / 2 in lattice coordinates (i, j). The integral of the topological
 * density is invariant under a change of oriented coordinates, so the same sum serves square and
 * triangular lattices and needs no cell size. Not an integer: its deviation from the lattice value
 * measures how well the grid resolves the texture. Cells whose stencil touches vacuum (or the edge of
 * an open boundary) are left out.
 * Source: the definition Q = (1/4 pi) Int m . (d_x m x d_y m) dx dy (A. Belavin, A. Polyakov,
 * JETP Lett. 22, 245 (1975)); second-order central differences are common practice, no source.
 */
import { type Boundary, wrapFlags } from "./boundary.js";
import { type VectorField, requireAtLeast, requireSomeMatter } from "./field.js";
import { InputError } from "../errors.js";

export interface ContinuumChargeResult {
  Q: number;
  /** Cells included (interior cells with a complete, non-vacuum stencil). */
  cellsUsed: number;
  /** Per-cell charge (sums to Q), index j * nx + i; 0 for excluded cells. Only when asked. */
  density?: Float64Array;
  method: string;
}

export function continuumSkyrmionNumber(field: VectorField, options: { boundary?: Boundary; layer?: number; density?: boolean } = {}): ContinuumChargeResult {
  const { wrapX, wrapY } = wrapFlags(options.boundary);
  const k = options.layer ?? 0;
  if (!Number.isInteger(k) || k < 0 || k >= field.nz) throw new InputError("layer", options.layer, `a whole number from 0 to ${field.nz - 1}`);
  requireAtLeast(field, 3, 3, "the central-difference stencil of the continuum estimate");
  requireSomeMatter(field, "the continuum skyrmion number");
  const { nx, ny, m, vacuum } = field;
  const base = k * nx * ny;
  const density = options.density ? new Float64Array(nx * ny) : null;
  let sum = 0;
  let used = 0;
  const i0 = wrapX ? 0 : 1,
    i1 = wrapX ? nx : nx - 1;
  const j0 = wrapY ? 0 : 1,
    j1 = wrapY ? ny : ny - 1;
  for (let j = j0; j < j1; j++) {
    const jm = j === 0 ? ny - 1 : j - 1,
      jp = j === ny - 1 ? 0 : j + 1;
    for (let i = i0; i < i1; i++) {
      const im = i === 0 ? nx - 1 : i - 1,
        ip = i === nx - 1 ? 0 : i + 1;
      const c = base + j * nx + i;
      const cE = base + j * nx + ip,
        cW = base + j * nx + im,
        cN = base + jp * nx + i,
        cS = base + jm * nx + i;
      if (vacuum !== null && (vacuum[c]! | vacuum[cE]! | vacuum[cW]! | vacuum[cN]! | vacuum[cS]!) !== 0) continue;
      const ux = 0.5 * (m[3 * cE]! - m[3 * cW]!),
        uy = 0.5 * (m[3 * cE + 1]! - m[3 * cW + 1]!),
        uz = 0.5 * (m[3 * cE + 2]! - m[3 * cW + 2]!);
      const vx = 0.5 * (m[3 * cN]! - m[3 * cS]!),
        vy = 0.5 * (m[3 * cN + 1]! - m[3 * cS + 1]!),
        vz = 0.5 * (m[3 * cN + 2]! - m[3 * cS + 2]!);
      const q = m[3 * c]! * (uy * vz - uz * vy) + m[3 * c + 1]! * (uz * vx - ux * vz) + m[3 * c + 2]! * (ux * vy - uy * vx);
      sum += q;
      used++;
      if (density !== null) density[j * nx + i] = q / (4 * Math.PI);
    }
  }
  const result: ContinuumChargeResult = {
    Q: sum / (4 * Math.PI),
    cellsUsed: used,
    method: "continuum estimate: m.(d_i m x d_j m) / 4 pi with central differences in lattice coordinates",
  };
  if (density !== null) result.density = density;
  return result;
}
