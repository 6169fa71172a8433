/**
 * 3D demo textures with point singularities (analytic, not simulated).
 *
 * - hedgehogTexture: m = s (r - r0) / |r - r0| (s = +1 hedgehog, degree +1; with z flipped an
 *   anti-hedgehog, degree -1).
 * - blochPointTexture: a skyrmion tube in the upper part of the sample that ends at a Bloch point.
 *   With X, Y, Z the position relative to the point in units of lambda and rho^2 = X^2 + Y^2,
 *   n = (X, Y, exp(rho^2 / 2) - 1 - Z), m = n / |n|. n vanishes only at the origin; its Jacobian there
 *   is diag(1, 1, -1), so the degree is sign det = -1 (J. Milnor, Topology from the Differentiable
 *   Viewpoint, 1965). Layers above the point hold a core-down skyrmion of vorticity +1 (Q = -1),
 *   layers below are uniform (Q = 0), consistent with degree = Q(above) - Q(below).
 */
import { InputError } from "../errors.js";
import { type VectorField, vectorFieldFromFunction } from "./field.js";

export interface Grid3D {
  nx: number;
  ny: number;
  nz: number;
  /** Cell size (m), the same along x, y, z unless dy, dz are given. Default 1 nm. */
  dx?: number;
  dy?: number;
  dz?: number;
}

function geometry(g: Grid3D, source: string) {
  const dx = g.dx ?? 1e-9;
  return { nx: g.nx, ny: g.ny, nz: g.nz, dx, dy: g.dy ?? dx, dz: g.dz ?? dx, lattice: "square" as const, source };
}

/**
 * A hedgehog (charge +1) or anti-hedgehog (-1, z component flipped) centred at (x0, y0, z0) (m;
 * default: the centre of the box, offset by a quarter cell so no site sits on the singularity).
 */
export function hedgehogTexture(grid: Grid3D, options: { sign?: 1 | -1; x0?: number; y0?: number; z0?: number } = {}): VectorField {
  const g = geometry(grid, options.sign === -1 ? "generated anti-hedgehog" : "generated hedgehog");
  const x0 = options.x0 ?? ((g.nx - 1) / 2 + 0.25) * g.dx;
  const y0 = options.y0 ?? ((g.ny - 1) / 2 + 0.25) * g.dy;
  const z0 = options.z0 ?? ((g.nz - 1) / 2 + 0.25) * g.dz;
  const s = options.sign ?? 1;
  if (s !== 1 && s !== -1) throw new InputError("sign", options.sign, "+1 (hedgehog) or -1 (anti-hedgehog)");
  return vectorFieldFromFunction(g, (x, y, z) => {
    const len = Math.hypot(x - x0, y - y0, z - z0);
    return len > 0 ? [(x - x0) / len, (y - y0) / len, (s * (z - z0)) / len] : [0, 0, 0];
  });
}

/**
 * Skyrmion tube ending at a Bloch point at (x0, y0, z0) (default: centre, offset by a quarter cell);
 * lambda (m) sets the size of the tube (default 4 cells).
 */
export function blochPointTexture(grid: Grid3D, options: { lambda?: number; x0?: number; y0?: number; z0?: number } = {}): VectorField {
  const g = geometry(grid, "generated Bloch point (skyrmion tube end)");
  const lambda = options.lambda ?? 4 * g.dx;
  if (!(lambda > 0)) throw new InputError("lambda", options.lambda, "a positive length (m)");
  const x0 = options.x0 ?? ((g.nx - 1) / 2 + 0.25) * g.dx;
  const y0 = options.y0 ?? ((g.ny - 1) / 2 + 0.25) * g.dy;
  const z0 = options.z0 ?? ((g.nz - 1) / 2 + 0.25) * g.dz;
  return vectorFieldFromFunction(g, (x, y, z) => {
    const X = (x - x0) / lambda,
      Y = (y - y0) / lambda,
      Z = (z - z0) / lambda;
    const r2 = Math.min(X * X + Y * Y, 600);
    const nz = Math.expm1(r2 / 2) - Z;
    // unit vectors here: |n| spans many decades, and a relative vacuum threshold must not see that
    const len = Math.hypot(X, Y, nz);
    return len > 0 ? [X / len, Y / len, nz / len] : [0, 0, 0];
  });
}
