/**
 * Demo texture generators (for notebooks, tests and the `texture` calculator). They build analytic
 * textures on a grid; none is a simulation. Convention (lib/src/README.md): background along `background`
 * (+z by default), object cores opposite to it, in-plane angle Phi = v * phi + gamma around each
 * object centre (v = vorticity, gamma = helicity), polar angle from the background axis theta(rho).
 *
 * Closed form of the charge (derived in objects.ts, checked in the tests):
 *   Q = (v / 2) [cos Theta(0) - cos Theta(inf)], Theta the polar angle from +z,
 * so a core-down skyrmion (v = 1) in a +z background has Q = -1, an antiskyrmion (v = -1) Q = +1,
 * a skyrmionium 0 and a skyrmion of vorticity n has Q = -n (all with the sign flipped for a -z
 * background).
 *
 * Wall profile: tan(theta / 2) = sinh(R / w) / sinh(rho / w), radius R (where m_z = 0) and wall width
 * w. Source: F. Buettner, I. Lemesh, G. Beach, Sci. Rep. 8, 4464 (2018).
 */
import { InputError } from "../errors.js";
import { type FieldGeometry, type LatticeKind, type VectorField, cellPosition, vectorFieldFromFunction } from "./field.js";

export interface GridSpec {
  nx: number;
  ny: number;
  /** Cell size (m); for a triangular lattice the lattice constant. Default 1 nm. */
  dx?: number;
  dy?: number;
  lattice?: LatticeKind;
  /** Periodic images are used for distances (default true). */
  periodic?: boolean;
}

export type ObjectKind = "skyrmion" | "skyrmionium";

export interface TextureObject {
  kind?: ObjectKind;
  /** Centre (m). */
  x: number;
  y: number;
  /** Radius where m_z = 0 (m). For a skyrmionium, the outer radius. */
  R: number;
  /** Wall width (m). */
  w: number;
  /** Inner radius of a skyrmionium (m); default R / 2. */
  Rinner?: number;
  /** Vorticity v (integer): 1 skyrmion, -1 antiskyrmion, n: higher-order skyrmion. Default 1. */
  vorticity?: number;
  /** Helicity gamma (rad): 0 Neel (outward), pi Neel (inward), +-pi/2 Bloch. Default 0. */
  helicity?: number;
}

export interface TextureOptions {
  /** Background direction along z: +1 (default) or -1. Cores point the other way. */
  background?: 1 | -1;
  source?: string;
}

/** theta(rho) of the wall profile, from pi at rho = 0 to 0 far away. */
export function wallProfileTheta(rho: number, R: number, w: number): number {
  const s = Math.sinh(rho / w);
  return 2 * Math.atan(Math.sinh(R / w) / s);
}

function gridGeometry(grid: GridSpec, source: string): FieldGeometry {
  const g: FieldGeometry = { nx: grid.nx, ny: grid.ny, dx: grid.dx ?? 1e-9, lattice: grid.lattice ?? "square", source };
  if (grid.dy !== undefined) g.dy = grid.dy;
  return g;
}

/** Minimum-image displacement on the (possibly periodic, possibly sheared) grid. */
function displacementFn(geom: FieldGeometry, periodic: boolean): (x: number, y: number, x0: number, y0: number) => [number, number] {
  const dx = geom.dx ?? 1e-9;
  const tri = geom.lattice === "triangular";
  const dy = geom.dy ?? (tri ? (dx * Math.sqrt(3)) / 2 : dx);
  const a1: [number, number] = [geom.nx * dx, 0];
  const a2: [number, number] = tri ? [(geom.ny * dx) / 2, geom.ny * dy] : [0, geom.ny * dy];
  return (x, y, x0, y0) => {
    let ex = x - x0,
      ey = y - y0;
    if (!periodic) return [ex, ey];
    // reduce to the supercell in lattice coordinates, then test the neighbouring images
    const v = Math.round(ey / a2[1]);
    ex -= v * a2[0];
    ey -= v * a2[1];
    const u = Math.round(ex / a1[0]);
    ex -= u * a1[0];
    let bx = ex,
      by = ey,
      best = ex * ex + ey * ey;
    for (let p = -1; p <= 1; p++) {
      for (let q = -1; q <= 1; q++) {
        const tx = ex + p * a1[0] + q * a2[0],
          ty = ey + q * a2[1];
        const d = tx * tx + ty * ty;
        if (d < best) {
          best = d;
          bx = tx;
          by = ty;
        }
      }
    }
    return [bx, by];
  };
}

function checkObject(o: TextureObject, k: number): void {
  for (const key of ["x", "y", "R", "w"] as const) {
    if (!Number.isFinite(o[key])) throw new InputError(`objects[${k}].${key}`, o[key], "a finite number (m)");
  }
  if (!(o.R > 0)) throw new InputError(`objects[${k}].R`, o.R, "a positive radius (m)");
  if (!(o.w > 0)) throw new InputError(`objects[${k}].w`, o.w, "a positive wall width (m)");
  const v = o.vorticity ?? 1;
  if (!Number.isInteger(v) || v === 0) throw new InputError(`objects[${k}].vorticity`, o.vorticity, "a non-zero whole number");
  if (o.Rinner !== undefined && !(o.Rinner > 0 && o.Rinner < o.R)) {
    throw new InputError(`objects[${k}].Rinner`, o.Rinner, `a radius between 0 and R = ${o.R}`);
  }
}

/**
 * A texture of several objects on a uniform background. Each cell takes the profile of its nearest
 * object (objects should be farther apart than a few wall widths beyond their radii).
 */
export function textureOfObjects(
  grid: GridSpec,
  objects: readonly TextureObject[],
  options: TextureOptions = {},
  /** Optional shortlist of object indices that may be nearest to (x, y) (default: all objects). */
  candidates?: (x: number, y: number) => ArrayLike<number>,
): VectorField {
  const source = options.source ?? "generated texture";
  const geom = gridGeometry(grid, source);
  objects.forEach(checkObject);
  const bg = options.background ?? 1;
  if (bg !== 1 && bg !== -1) throw new InputError("background", bg, "+1 (m along +z) or -1 (along -z)");
  const disp = displacementFn(geom, grid.periodic ?? true);
  return vectorFieldFromFunction(geom, (x, y) => {
    if (objects.length === 0) return [0, 0, bg];
    let best = Infinity,
      ex = 0,
      ey = 0,
      o: TextureObject = objects[0]!;
    const list = candidates ? candidates(x, y) : null;
    const count = list ? list.length : objects.length;
    for (let q = 0; q < count; q++) {
      const obj = objects[list ? list[q]! : q]!;
      const [px, py] = disp(x, y, obj.x, obj.y);
      const d = px * px + py * py;
      if (d < best) {
        best = d;
        ex = px;
        ey = py;
        o = obj;
      }
    }
    const rho = Math.sqrt(best);
    let theta = wallProfileTheta(rho, o.R, o.w);
    if (o.kind === "skyrmionium") theta += wallProfileTheta(rho, o.Rinner ?? o.R / 2, o.w);
    const Phi = (o.vorticity ?? 1) * Math.atan2(ey, ex) + (o.helicity ?? 0);
    const s = Math.sin(theta);
    return [s * Math.cos(Phi), s * Math.sin(Phi), bg * Math.cos(theta)];
  });
}

function centre(grid: GridSpec): [number, number] {
  const dx = grid.dx ?? 1e-9;
  const tri = (grid.lattice ?? "square") === "triangular";
  const dy = grid.dy ?? (tri ? (dx * Math.sqrt(3)) / 2 : dx);
  const [x, y] = cellPosition({ dx, dy, lattice: grid.lattice ?? "square" }, (grid.nx - 1) / 2, (grid.ny - 1) / 2);
  return [x, y];
}

export interface SkyrmionSpec {
  /** Radius (m) and wall width (m). */
  R: number;
  w: number;
  vorticity?: number;
  helicity?: number;
  /** Centre (m); default the centre of the grid. */
  x?: number;
  y?: number;
}

/** One skyrmion (vorticity +1 by default) in the centre of the grid. */
export function skyrmionTexture(grid: GridSpec, s: SkyrmionSpec, options: TextureOptions = {}): VectorField {
  const [x, y] = centre(grid);
  return textureOfObjects(grid, [{ ...s, x: s.x ?? x, y: s.y ?? y, kind: "skyrmion" }], { source: "generated skyrmion", ...options });
}

/** One antiskyrmion (vorticity -1). */
export function antiskyrmionTexture(grid: GridSpec, s: Omit<SkyrmionSpec, "vorticity">, options: TextureOptions = {}): VectorField {
  return skyrmionTexture(grid, { ...s, vorticity: -1 }, { source: "generated antiskyrmion", ...options });
}

/** A skyrmionium (skyrmion inside a reversed skyrmion, Q = 0) of outer radius R and inner radius Rinner. */
export function skyrmioniumTexture(grid: GridSpec, s: SkyrmionSpec & { Rinner?: number }, options: TextureOptions = {}): VectorField {
  const [x, y] = centre(grid);
  return textureOfObjects(grid, [{ ...s, x: s.x ?? x, y: s.y ?? y, kind: "skyrmionium" }], { source: "generated skyrmionium", ...options });
}

/** A higher-order skyrmion of vorticity n (|Q| = |n|). */
export function higherOrderSkyrmionTexture(grid: GridSpec, s: SkyrmionSpec & { vorticity: number }, options: TextureOptions = {}): VectorField {
  return skyrmionTexture(grid, s, { source: `generated skyrmion of vorticity ${s.vorticity}`, ...options });
}

export interface SkyrmionLatticeSpec {
  /** Target lattice constant (m) of the hexagonal arrangement; adjusted to fit the periodic box. */
  a: number;
  R: number;
  w: number;
  vorticity?: number;
  helicity?: number;
}

/**
 * Skyrmions on a hexagonal (triangular) arrangement that tiles the periodic box: columns
 * round(Lx / a), rows an even round(Ly / (a sqrt(3) / 2)), so the box is periodic. Returns the field
 * and the centres used.
 */
export function skyrmionLatticeTexture(grid: GridSpec, s: SkyrmionLatticeSpec, options: TextureOptions = {}): VectorField & { centres: Array<[number, number]> } {
  if ((grid.lattice ?? "square") !== "square") throw new InputError("lattice", grid.lattice, '"square" for the skyrmion-lattice generator');
  if (!(s.a > 0)) throw new InputError("a", s.a, "a positive lattice constant (m)");
  const dx = grid.dx ?? 1e-9,
    dy = grid.dy ?? dx;
  const Lx = grid.nx * dx,
    Ly = grid.ny * dy;
  const cols = Math.max(1, Math.round(Lx / s.a));
  const rows = Math.max(2, 2 * Math.round(Ly / (s.a * Math.sqrt(3))));
  const centres: Array<[number, number]> = [];
  const objects: TextureObject[] = [];
  for (let r = 0; r < rows; r++) {
    for (let c = 0; c < cols; c++) {
      const x = ((c + 0.25 + 0.5 * (r % 2)) * Lx) / cols;
      const y = ((r + 0.5) * Ly) / rows;
      centres.push([x, y]);
      const o: TextureObject = { x, y, R: s.R, w: s.w, kind: "skyrmion" };
      if (s.vorticity !== undefined) o.vorticity = s.vorticity;
      if (s.helicity !== undefined) o.helicity = s.helicity;
      objects.push(o);
    }
  }
  // the nearest centre lies within two rows and one column of the cell: 15 candidates instead of all
  const rowH = Ly / rows,
    colW = Lx / cols;
  const list = new Int32Array(15);
  const near = (x: number, y: number) => {
    const r0 = Math.floor(y / rowH);
    let k = 0;
    for (let dr = -2; dr <= 2; dr++) {
      const r = (((r0 + dr) % rows) + rows) % rows;
      const c0 = Math.floor((x - (0.25 + 0.5 * (r % 2)) * colW) / colW);
      for (let dc = 0; dc <= 2; dc++) list[k++] = r * cols + ((((c0 + dc - 1) % cols) + cols) % cols);
    }
    return list;
  };
  const field = textureOfObjects({ ...grid, periodic: true }, objects, { source: "generated skyrmion lattice", ...options }, near);
  return Object.assign(field, { centres });
}

export interface VortexPairSpec {
  /** Centres (m) of the vortex (winding +1) and of the antivortex (winding -1). */
  vortex: [number, number];
  antivortex: [number, number];
  /** Core polarities (+1 core up, -1 core down) and core radius (m); coreRadius 0: purely in plane. */
  vortexPolarity?: 1 | -1;
  antivortexPolarity?: 1 | -1;
  coreRadius?: number;
  /** Global rotation of the in-plane angle (rad). */
  angle?: number;
}

/**
 * An in-plane vortex-antivortex pair, Phi = atan2(y - y1, x - x1) - atan2(y - y2, x - x2) + angle, with
 * Gaussian out-of-plane cores m_z = p1 exp(-r1^2 / rc^2) + p2 exp(-r2^2 / rc^2) (clipped to [-1, 1]).
 * Each core is a meron of charge Q = v p / 2 (v vorticity, p polarity); the far field is in plane, so
 * the texture is meant for open boundaries.
 */
export function vortexPairTexture(grid: GridSpec, s: VortexPairSpec, options: { source?: string } = {}): VectorField {
  const geom = gridGeometry(grid, options.source ?? "generated vortex-antivortex pair");
  const rc = s.coreRadius ?? 0;
  if (!(rc >= 0)) throw new InputError("coreRadius", s.coreRadius, "a core radius >= 0 (m)");
  const p1 = s.vortexPolarity ?? 1,
    p2 = s.antivortexPolarity ?? 1;
  const [x1, y1] = s.vortex,
    [x2, y2] = s.antivortex;
  return vectorFieldFromFunction(geom, (x, y) => {
    const Phi = Math.atan2(y - y1, x - x1) - Math.atan2(y - y2, x - x2) + (s.angle ?? 0);
    let mz = 0;
    if (rc > 0) {
      mz = p1 * Math.exp(-((x - x1) ** 2 + (y - y1) ** 2) / (rc * rc)) + p2 * Math.exp(-((x - x2) ** 2 + (y - y2) ** 2) / (rc * rc));
      mz = Math.max(-1, Math.min(1, mz));
    }
    const s2 = Math.sqrt(1 - mz * mz);
    return [s2 * Math.cos(Phi), s2 * Math.sin(Phi), mz];
  });
}
