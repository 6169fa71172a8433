/**
 * Vortices and antivortices of the in-plane part of a field by plaquette winding: the S1 winding
 * (winding.ts) of the in-plane angle phi = atan2(m_y, m_x) around each plaquette, counterclockwise
 * a -> b -> c -> d (square) or around each triangle (triangular lattice). +1 = vortex, -1 = antivortex,
 * A square plaquette holds |w| <= 1 (four wrapped steps, each below pi), so a defect of winding 2 shows
 * as two unit windings in neighbouring plaquettes; sum `winding` over nearby sites for its order. Source: N. D. Mermin, Rev. Mod. Phys. 51, 591 (1979) (winding of
 * an order parameter around a loop); the plaquette form is common practice, no source.
 */
import { type Boundary, wrapFlags } from "./boundary.js";
import { type VectorField, requireAtLeast, requireSomeMatter } from "./field.js";
import { wrapAngle } from "./winding.js";
import { InputError } from "../errors.js";

export interface VortexSite {
  /** Plaquette indices (lower-left corner). */
  i: number;
  j: number;
  /** Position (m): centre of the plaquette (square) or centroid of the triangle (triangular). */
  x: number;
  y: number;
  /** Winding number: +1 vortex, -1 antivortex. */
  winding: number;
  /** Mean m_z of the corners: the sign gives the core polarity. */
  mz: number;
}

export interface VortexResult {
  sites: VortexSite[];
  vortices: number;
  antivortices: number;
  /** Sum of all windings (0 on a closed lattice). */
  totalWinding: number;
  /** Plaquettes skipped because a corner is vacuum or has no in-plane direction. */
  skipped: number;
}

export interface VortexOptions {
  boundary?: Boundary;
  layer?: number;
  /** Corners with in-plane magnitude below this have no direction; their plaquettes are skipped. */
  minInPlane?: number;
}

const TWO_PI = 2 * Math.PI;

export function findVortices(field: VectorField, options: VortexOptions = {}): VortexResult {
  const { wrapX, wrapY } = wrapFlags(options.boundary);
  const k = options.layer ?? 0;
  if (!Number.isInteger(k) || k < 0 || k >= field.nz) throw new InputError("layer", options.layer, `a whole number from 0 to ${field.nz - 1}`);
  requireAtLeast(field, 2, 2, "plaquette windings (one plaquette needs 2x2 cells)");
  requireSomeMatter(field, "vortex finding");
  const minInPlane = options.minInPlane ?? 1e-9;
  const { nx, ny, m, vacuum } = field;
  const base = k * nx * ny;
  const n = nx * ny;
  const phi = new Float64Array(n);
  const ok = new Uint8Array(n);
  for (let c = 0; c < n; c++) {
    const g = base + c;
    const x = m[3 * g]!, y = m[3 * g + 1]!;
    if ((vacuum === null || vacuum[g] === 0) && x * x + y * y > minInPlane * minInPlane) {
      phi[c] = Math.atan2(y, x);
      ok[c] = 1;
    }
  }
  const px = wrapX ? nx : nx - 1, py = wrapY ? ny : ny - 1;
  const sites: VortexSite[] = [];
  let skipped = 0;
  const tri = field.lattice === "triangular";
  const loop = (cs: number[], i: number, j: number, x: number, y: number) => {
    for (const c of cs) if (ok[c] === 0) { skipped++; return; }
    let s = 0;
    for (let q = 0; q < cs.length; q++) s += wrapAngle(phi[cs[(q + 1) % cs.length]!]! - phi[cs[q]!]!);
    const w = Math.round(s / TWO_PI);
    if (w !== 0) {
      let mz = 0;
      for (const c of cs) mz += m[3 * (base + c) + 2]!;
      sites.push({ i, j, x, y, winding: w, mz: mz / cs.length });
    }
  };
  for (let j = 0; j < py; j++) {
    const jn = j + 1 === ny ? 0 : j + 1;
    for (let i = 0; i < px; i++) {
      const inx = i + 1 === nx ? 0 : i + 1;
      const a = j * nx + i, b = j * nx + inx, c = jn * nx + inx, d = jn * nx + i;
      if (!tri) {
        loop([a, b, c, d], i, j, (i + 0.5) * field.dx, (j + 0.5) * field.dy);
      } else {
        // centroids of the two triangles of the rhombus (see field.ts for site positions)
        loop([a, b, d], i, j, (i + 1 / 3 + (j + 1 / 3) / 2) * field.dx, (j + 1 / 3) * field.dy);
        loop([b, c, d], i, j, (i + 2 / 3 + (j + 2 / 3) / 2) * field.dx, (j + 2 / 3) * field.dy);
      }
    }
  }
  let vortices = 0, antivortices = 0, total = 0;
  for (const s of sites) {
    if (s.winding > 0) vortices++;
    else antivortices++;
    total += s.winding;
  }
  return { sites, vortices, antivortices, totalWinding: total, skipped };
}
