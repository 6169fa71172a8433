/**
 * The vector field every topology function works on.
 *
 * Layout (stated once, used everywhere): cell (i, j, k) with i along x (fastest), j along y, k along z
 * has the flat index c = (k * ny + j) * nx + i, and its unit vector is stored INTERLEAVED in `m` at
 * m[3c], m[3c + 1], m[3c + 2] (mx, my, mz). `vacuum[c] = 1` marks a vacuum (empty) cell; its entries in
 * `m` are 0. Non-vacuum vectors have |m| = 1 to rounding.
 *
 * Lattices: "square" is the rectangular grid with spacings dx, dy (dz between layers). "triangular"
 * is the 2D hexagonal Bravais lattice (also called the hexagonal lattice) with lattice vectors
 * a1 = (dx, 0) and a2 = (dx / 2, dx * sqrt(3) / 2): site (i, j) sits at (i + j / 2, j sqrt(3) / 2) dx.
 * Periodic boundaries of a triangular field are periodic along a1 and a2 (a rhombic supercell).
 */
import { InputError } from "../errors.js";

export type LatticeKind = "square" | "triangular";

export interface VectorField {
  nx: number;
  ny: number;
  nz: number;
  /** Cell sizes (m). For a triangular lattice dx is the lattice constant and dy = dx sqrt(3)/2. */
  dx: number;
  dy: number;
  dz: number;
  lattice: LatticeKind;
  /** Layout of `m`: always interleaved (mx, my, mz per cell), x fastest. */
  layout: "interleaved";
  /** Unit vectors, length 3 * nx * ny * nz. */
  m: Float64Array;
  /** 1 = vacuum cell; null when no cell is vacuum. */
  vacuum: Uint8Array | null;
  /** Number of vacuum cells (0 when `vacuum` is null). */
  vacuumCells: number;
  /** Where the field came from (a file name, a generator), for messages and reports. */
  source?: string;
}

/**
 * Below this magnitude a vector is taken as vacuum (zero, tiny or NaN). Relative to 1 for a unit
 * field; readers scale it by the largest magnitude found. Common practice, no source.
 */
export const VACUUM_THRESHOLD = 1e-6;

export interface NormalizeOptions {
  /** Magnitudes below `threshold * maxMagnitude` become vacuum. Default VACUUM_THRESHOLD. */
  threshold?: number;
  source?: string;
}

/**
 * Normalize vectors IN PLACE in `m` (a buffer the caller owns, never the user's array) and build the
 * vacuum mask. Cells with NaN/infinite components or magnitude below threshold * max become vacuum.
 * `preVacuum` marks cells already known to be vacuum (for example rows missing from a CSV).
 */
export function normalizeInPlace(
  m: Float64Array,
  nCells: number,
  options: NormalizeOptions = {},
  preVacuum: Uint8Array | null = null,
): { vacuum: Uint8Array | null; vacuumCells: number } {
  const threshold = options.threshold ?? VACUUM_THRESHOLD;
  let max2 = 0;
  for (let c = 0, p = 0; c < nCells; c++, p += 3) {
    const x = m[p]!,
      y = m[p + 1]!,
      z = m[p + 2]!;
    const s = x * x + y * y + z * z;
    if (s > max2 && s < Infinity) max2 = s;
  }
  const limit2 = max2 * threshold * threshold;
  let vacuum: Uint8Array | null = preVacuum;
  let count = 0;
  for (let c = 0, p = 0; c < nCells; c++, p += 3) {
    const x = m[p]!,
      y = m[p + 1]!,
      z = m[p + 2]!;
    const s = x * x + y * y + z * z;
    // NaN fails every comparison, so `!(s > limit2)` catches NaN, zero and tiny vectors.
    if (!(s > limit2) || s === Infinity || (preVacuum !== null && preVacuum[c] === 1)) {
      if (vacuum === null) vacuum = new Uint8Array(nCells);
      vacuum[c] = 1;
      m[p] = 0;
      m[p + 1] = 0;
      m[p + 2] = 0;
      count++;
    } else if (s !== 1) {
      const inv = 1 / Math.sqrt(s);
      m[p] = x * inv;
      m[p + 1] = y * inv;
      m[p + 2] = z * inv;
    }
  }
  return { vacuum: count > 0 ? vacuum : null, vacuumCells: count };
}

export interface FieldGeometry {
  nx: number;
  ny: number;
  nz?: number;
  dx?: number;
  dy?: number;
  dz?: number;
  lattice?: LatticeKind;
  source?: string;
}

function checkGeometry(g: FieldGeometry): Required<Omit<FieldGeometry, "source">> {
  const nz = g.nz ?? 1;
  for (const [name, v] of [
    ["nx", g.nx],
    ["ny", g.ny],
    ["nz", nz],
  ] as const) {
    if (!Number.isInteger(v) || v < 1) throw new InputError(name, v, "a whole number of cells >= 1");
  }
  const lattice = g.lattice ?? "square";
  if (lattice !== "square" && lattice !== "triangular") {
    throw new InputError("lattice", lattice, '"square" or "triangular"');
  }
  const dx = g.dx ?? 1;
  const dy = g.dy ?? (lattice === "triangular" ? (dx * Math.sqrt(3)) / 2 : dx);
  const dz = g.dz ?? dx;
  for (const [name, v] of [
    ["dx", dx],
    ["dy", dy],
    ["dz", dz],
  ] as const) {
    if (!(v > 0) || !Number.isFinite(v)) throw new InputError(name, v, "a positive, finite cell size in m");
  }
  if (lattice === "triangular" && nz !== 1) throw new InputError("nz", nz, "1 for a triangular (2D) lattice");
  return { nx: g.nx, ny: g.ny, nz, dx, dy, dz, lattice };
}

/**
 * Build a VectorField from interleaved components (copied: the caller's array is never changed),
 * normalizing each vector and masking vacuum cells.
 */
export function vectorFieldFromInterleaved(components: ArrayLike<number>, geometry: FieldGeometry, options: NormalizeOptions = {}): VectorField {
  const g = checkGeometry(geometry);
  const n = g.nx * g.ny * g.nz;
  if (components.length !== 3 * n) {
    throw new InputError("components", components, `${3 * n} numbers (3 components for each of nx*ny*nz = ${g.nx}*${g.ny}*${g.nz} cells)`, `found ${components.length}`);
  }
  const m = Float64Array.from(components);
  return finishField(m, g, options, null, geometry.source ?? options.source);
}

/** Build a VectorField from planar components mx[], my[], mz[] (each nx*ny*nz long, x fastest). */
export function vectorFieldFromPlanar(mx: ArrayLike<number>, my: ArrayLike<number>, mz: ArrayLike<number>, geometry: FieldGeometry, options: NormalizeOptions = {}): VectorField {
  const g = checkGeometry(geometry);
  const n = g.nx * g.ny * g.nz;
  for (const [name, a] of [
    ["mx", mx],
    ["my", my],
    ["mz", mz],
  ] as const) {
    if (a.length !== n) throw new InputError(name, a, `${n} values (nx*ny*nz = ${g.nx}*${g.ny}*${g.nz})`, `found ${a.length}`);
  }
  const m = new Float64Array(3 * n);
  for (let c = 0; c < n; c++) {
    m[3 * c] = mx[c]!;
    m[3 * c + 1] = my[c]!;
    m[3 * c + 2] = mz[c]!;
  }
  return finishField(m, g, options, null, geometry.source ?? options.source);
}

/**
 * Take ownership of a freshly allocated interleaved buffer (readers use this to avoid a second copy),
 * normalize it in place and wrap it as a VectorField.
 */
export function adoptInterleaved(m: Float64Array, geometry: FieldGeometry, options: NormalizeOptions = {}, preVacuum: Uint8Array | null = null): VectorField {
  const g = checkGeometry(geometry);
  if (m.length !== 3 * g.nx * g.ny * g.nz) {
    throw new InputError("components", m, `${3 * g.nx * g.ny * g.nz} numbers`, `found ${m.length}`);
  }
  return finishField(m, g, options, preVacuum, geometry.source ?? options.source);
}

function finishField(
  m: Float64Array,
  g: Required<Omit<FieldGeometry, "source">>,
  options: NormalizeOptions,
  preVacuum: Uint8Array | null,
  source: string | undefined,
): VectorField {
  const { vacuum, vacuumCells } = normalizeInPlace(m, g.nx * g.ny * g.nz, options, preVacuum);
  const field: VectorField = { ...g, layout: "interleaved", m, vacuum, vacuumCells };
  if (source !== undefined) field.source = source;
  return field;
}

/** Build a field by evaluating f(x, y, z) -> [mx, my, mz] at cell positions (see the lattice note). */
export function vectorFieldFromFunction(
  geometry: FieldGeometry,
  f: (x: number, y: number, z: number, i: number, j: number, k: number) => readonly [number, number, number] | null,
  options: NormalizeOptions = {},
): VectorField {
  const g = checkGeometry(geometry);
  const m = new Float64Array(3 * g.nx * g.ny * g.nz);
  for (let k = 0, c = 0; k < g.nz; k++) {
    for (let j = 0; j < g.ny; j++) {
      for (let i = 0; i < g.nx; i++, c++) {
        const [x, y] = cellPosition(g, i, j);
        const v = f(x, y, k * g.dz, i, j, k);
        if (v === null) continue; // vacuum (left at zero)
        m[3 * c] = v[0];
        m[3 * c + 1] = v[1];
        m[3 * c + 2] = v[2];
      }
    }
  }
  return finishField(m, g, options, null, geometry.source ?? options.source);
}

/** In-plane position (m) of cell (i, j): square grid i*dx, j*dy; triangular (i + j/2) dx, j dy. */
export function cellPosition(g: { dx: number; dy: number; lattice: LatticeKind }, i: number, j: number): [number, number] {
  return g.lattice === "triangular" ? [(i + j / 2) * g.dx, j * g.dy] : [i * g.dx, j * g.dy];
}

/** The number of non-vacuum cells. */
export function filledCells(field: VectorField): number {
  return field.nx * field.ny * field.nz - field.vacuumCells;
}

/** Throw a clear InputError when every cell is vacuum. */
export function requireSomeMatter(field: VectorField, what: string): void {
  if (filledCells(field) === 0) {
    throw new InputError(field.source ?? "field", `${field.nx}x${field.ny}x${field.nz} cells, all vacuum`, `at least one non-vacuum cell for ${what}`);
  }
}

/** Throw a clear InputError when the field is smaller than a stencil needs. */
export function requireAtLeast(field: VectorField, nx: number, ny: number, what: string, nz = 1): void {
  if (field.nx < nx || field.ny < ny || field.nz < nz) {
    throw new InputError(field.source ?? "field", `${field.nx}x${field.ny}x${field.nz} cells`, `at least ${nx}x${ny}x${nz} cells for ${what}`);
  }
}
