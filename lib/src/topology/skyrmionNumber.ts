/**
 * Lattice skyrmion number by the Berg-Luescher solid-angle method: total, per-plaquette density map,
 * periodic or open boundaries, vacuum masks, square or triangular lattices.
 *
 * Q = (1 / 4 pi) Sum_triangles Omega, with the triangulation and the formula in latticeKernel.ts.
 * Sign convention (lib/src/README.md): Q = (1/4 pi) Int m . (d_x m x d_y m) dx dy, so that with a +z
 * background a core-down skyrmion of vorticity +1 has Q = -1.
 * On a closed lattice (periodic both ways, no vacuum) Q is an exact integer up to rounding, because the
 * triangles then tile a closed surface whose image covers the sphere an integer number of times.
 * Sources: B. Berg, M. Luescher, Nucl. Phys. B 190, 412 (1981); A. Van Oosterom, J. Strackee,
 * IEEE Trans. Biomed. Eng. 30, 125 (1983).
 */
import { InputError } from "../errors.js";
import { type Boundary, wrapFlags } from "./boundary.js";
import { type VectorField, requireAtLeast, requireSomeMatter } from "./field.js";
import { solidAngleSumGeneral, solidAngleSumSquare } from "./latticeKernel.js";

export interface SkyrmionNumberOptions {
  /** Default "periodic". */
  boundary?: Boundary;
  /** Layer index k of a 3D field (default 0). */
  layer?: number;
  /** Also return the per-plaquette charge map (default false: total only, no allocation). */
  density?: boolean;
}

export interface ChargeDensityMap {
  /** Plaquettes along x and y: nx or nx - 1 (open x), ny or ny - 1 (open y). */
  px: number;
  py: number;
  /** Charge of each plaquette (dimensionless, sums to Q), index j * px + i. */
  charge: Float64Array;
  /** Position (m) of the centre of plaquette (0, 0); plaquette (i, j) is offset by the lattice vectors. */
  origin: [number, number];
}

export interface SkyrmionNumberResult {
  /** The lattice skyrmion number (raw sum / 4 pi, not rounded). */
  Q: number;
  /** Nearest integer of Q and the distance to it. */
  nearestInteger: number;
  distanceFromInteger: number;
  /** True when the lattice is closed (periodic both ways, no vacuum): Q is then an exact integer. */
  closed: boolean;
  boundary: Boundary;
  lattice: VectorField["lattice"];
  layer: number;
  trianglesUsed: number;
  trianglesSkipped: number;
  density?: ChargeDensityMap;
  method: string;
  sources: string[];
}

export const LATTICE_Q_SOURCES = ["B. Berg, M. Luescher, Nucl. Phys. B 190, 412 (1981)", "A. Van Oosterom, J. Strackee, IEEE Trans. Biomed. Eng. 30, 125 (1983)"];

function checkLayer(field: VectorField, layer: number | undefined): number {
  const k = layer ?? 0;
  if (!Number.isInteger(k) || k < 0 || k >= field.nz) throw new InputError("layer", layer, `a whole number from 0 to ${field.nz - 1}`);
  return k;
}

/** Lattice skyrmion number of one layer. */
export function skyrmionNumber(field: VectorField, options: SkyrmionNumberOptions = {}): SkyrmionNumberResult {
  const { wrapX, wrapY, boundary } = wrapFlags(options.boundary);
  const layer = checkLayer(field, options.layer);
  requireAtLeast(field, 2, 2, "the lattice skyrmion number (one plaquette needs 2x2 cells)");
  requireSomeMatter(field, "the skyrmion number");
  const { nx, ny, m } = field;
  const base = layer * nx * ny;
  const px = wrapX ? nx : nx - 1;
  const py = wrapY ? ny : ny - 1;
  const triangular = field.lattice === "triangular";
  let sum: number;
  let density: Float64Array | null = null;
  const counts = new Float64Array(2);
  if (!options.density && field.vacuum === null && !triangular) {
    sum = solidAngleSumSquare(m, nx, ny, base, 0, py, wrapX);
    counts[0] = 2 * px * py;
  } else {
    if (options.density) density = new Float64Array(px * py);
    const vac = field.vacuum === null ? null : field.vacuum.subarray(base, base + nx * ny);
    sum = solidAngleSumGeneral(m.subarray(3 * base, 3 * (base + nx * ny)), vac, nx, ny, 0, 0, py, wrapX, triangular, density, counts);
  }
  const Q = sum / (4 * Math.PI);
  const nearest = Math.round(Q);
  const result: SkyrmionNumberResult = {
    Q,
    nearestInteger: nearest === 0 ? 0 : nearest,
    distanceFromInteger: Math.abs(Q - nearest),
    closed: wrapX && wrapY && field.vacuumCells === 0,
    boundary,
    lattice: field.lattice,
    layer,
    trianglesUsed: counts[0]!,
    trianglesSkipped: counts[1]!,
    method: `lattice solid angles (Berg-Luescher), ${triangular ? "triangular lattice: the two equilateral triangles of each rhombus" : "square lattice: two triangles per plaquette"}, ${boundary} boundary`,
    sources: LATTICE_Q_SOURCES,
  };
  if (density !== null) {
    result.density = { px, py, charge: density, origin: plaquetteOrigin(field) };
  }
  return result;
}

/** Position of the centre of plaquette (0, 0). */
export function plaquetteOrigin(field: VectorField): [number, number] {
  return field.lattice === "triangular" ? [0.75 * field.dx, 0.5 * field.dy] : [0.5 * field.dx, 0.5 * field.dy];
}

/** Position (m) of the centre of plaquette (i, j). */
export function plaquetteCentre(field: VectorField, i: number, j: number): [number, number] {
  return field.lattice === "triangular" ? [(i + 0.5 + (j + 0.5) / 2) * field.dx, (j + 0.5) * field.dy] : [(i + 0.5) * field.dx, (j + 0.5) * field.dy];
}

/** Skyrmion number of every layer of a (3D) field, lower layer first (0 for a layer that is all vacuum). */
export function skyrmionNumberPerLayer(field: VectorField, options: Omit<SkyrmionNumberOptions, "layer" | "density"> = {}): number[] {
  const out: number[] = [];
  for (let k = 0; k < field.nz; k++) {
    const layerEmpty = field.vacuum !== null && field.vacuum.subarray(k * field.nx * field.ny, (k + 1) * field.nx * field.ny).every((v) => v === 1);
    if (layerEmpty) {
      out.push(0);
      continue;
    }
    out.push(skyrmionNumber(field, { ...options, layer: k }).Q);
  }
  return out;
}
