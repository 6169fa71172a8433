/**
 * Objects of a 2D texture: connected regions, each with its charge, charge-weighted centre, radius,
 * helicity and vorticity.
 *
 * Seeds (option `mode`):
 *   "cores"   - connected regions (4-neighbour, wrapping on periodic axes) of cells whose m_z points
 *               against the background (reversed cores);
 *   "density" - connected clusters of plaquettes whose |charge| exceeds `densityThreshold` times the
 *               largest |charge| of a plaquette.
 * Every non-vacuum cell is then given to its nearest seed region (multi-source breadth-first search
 * on the grid), and each plaquette's charge (Berg-Luescher, skyrmionNumber.ts) goes to the region of
 * its lower-left cell. Object charges therefore include the tails outside the cores and add up to
 * the total Q (minus charge cut off by vacuum, reported as `unassignedCharge`).
 *
 * Definitions (stated here, tested in test/lib/topology/objects.test.ts):
 *   centre    - charge-weighted mean of plaquette centres, sum(q r) / sum(q), with periodic images
 *               unwrapped around the seed; |q|-weighted when |sum q| < 0.5 (e.g. a skyrmionium).
 *   area      - area enclosed by the m_z = 0 contour: reversed cells of the object plus the holes they
 *               enclose (e.g. the core of a skyrmionium), in cells times the cell area.
 *   radius    - sqrt(area / pi).
 *   vorticity - v, the S1 winding number of the in-plane angle Phi = atan2(m_y, m_x) along a
 *               counterclockwise circle of that radius around the centre (bilinear interpolation).
 *   helicity  - gamma in (-pi, pi], the circular mean over the same circle of Phi - v * phi, phi the
 *               azimuth of the sample point around the centre, weighted by the in-plane magnitude.
 *               So m = (sin t cos(v phi + gamma), sin t sin(v phi + gamma), cos t) with sin t >= 0 on
 *               the circle: gamma = 0 outward Neel, pi inward Neel, +-pi/2 Bloch. For v != 1 gamma
 *               depends on the orientation of the x axis (it shifts by (1 - v) alpha under a rotation
 *               by alpha).
 * Closed form for checks: with m = (sin T cos Phi, sin T sin Phi, cos T), T(rho), Phi = v phi + gamma,
 *   m.(d_x m x d_y m) = (1/rho) m.(d_rho m x d_phi m) = (v / rho) T' sin T, so
 *   Q = (v / 2) [cos T(0) - cos T(inf)]   (-v for a core-down object in a +z background).
 * Sources: the definition of Q (lib/src/README.md; A. Belavin, A. Polyakov, JETP Lett. 22, 245 (1975));
 * vorticity and helicity as in N. Nagaosa, Y. Tokura, Nat. Nanotechnol. 8, 899 (2013) (from memory).
 */
import { InputError } from "../errors.js";
import { type Boundary, wrapFlags } from "./boundary.js";
import { type VectorField, requireSomeMatter } from "./field.js";
import { plaquetteCentre, skyrmionNumber, type SkyrmionNumberResult } from "./skyrmionNumber.js";
import { s1Winding, wrapAngle } from "./winding.js";

export interface FoundObject {
  id: number;
  /** Topological charge of the object (sum of its plaquettes; near an integer for isolated objects). */
  charge: number;
  /** Charge-weighted centre (m). */
  center: [number, number];
  /** Radius sqrt(area / pi) (m) and area inside the m_z = 0 contour (m^2). */
  radius: number;
  area: number;
  /** Vorticity and helicity (rad) measured on the circle of `radius`; null when that circle leaves
   * the grid, crosses vacuum or has no in-plane direction somewhere (see `note`). */
  vorticity: number | null;
  helicity: number | null;
  /** Seed size: reversed cells ("cores") or dense plaquettes ("density"). */
  seedSize: number;
  /** Direction of the core along z (opposite to the background). */
  corePolarity: 1 | -1;
  /** A name from charge and vorticity: skyrmion, antiskyrmion, skyrmionium, higher-order skyrmion, other. */
  kind: string;
  note?: string;
}

export interface ObjectsResult {
  objects: FoundObject[];
  /** Total lattice Q of the layer. */
  Q: number;
  background: 1 | -1;
  mode: "cores" | "density";
  boundary: Boundary;
  /** Charge of plaquettes not reachable from any seed (cut off by vacuum). */
  unassignedCharge: number;
  definitions: string;
}

export interface ObjectOptions {
  boundary?: Boundary;
  layer?: number;
  mode?: "cores" | "density";
  /** Background direction along z; "auto": the sign of the mean m_z. */
  background?: 1 | -1 | "auto";
  /** Density mode: fraction of the largest |plaquette charge| that makes a plaquette dense (0.1). */
  densityThreshold?: number;
  /** Seeds smaller than this (cells or plaquettes) are ignored (default 1). */
  minSeed?: number;
  /**
   * The layer's lattice skyrmion number with its density, when the caller already has it:
   * `skyrmionNumber(field, { boundary, layer, density: true })` of this field. It is then not
   * computed again (a large field costs one pass, not two).
   */
  charge?: SkyrmionNumberResult;
}

export const OBJECT_DEFINITIONS =
  "centre: charge-weighted mean position; radius: sqrt(area inside m_z = 0 / pi); vorticity: winding of the in-plane angle on that circle; helicity: circular mean of Phi - v*phi on it (0 outward Neel, pi inward Neel, +-pi/2 Bloch)";

/** Index of the q-th 4-neighbour (east, west, north, south) of cell (i, j); -1 outside an open edge. */
function neighbour(i: number, j: number, q: number, nx: number, ny: number, wrapX: boolean, wrapY: boolean): number {
  let ii = i,
    jj = j;
  if (q === 0) {
    ii++;
    if (ii === nx) {
      if (!wrapX) return -1;
      ii = 0;
    }
  } else if (q === 1) {
    ii--;
    if (ii < 0) {
      if (!wrapX) return -1;
      ii = nx - 1;
    }
  } else if (q === 2) {
    jj++;
    if (jj === ny) {
      if (!wrapY) return -1;
      jj = 0;
    }
  } else {
    jj--;
    if (jj < 0) {
      if (!wrapY) return -1;
      jj = ny - 1;
    }
  }
  return jj * nx + ii;
}

/** Connected components of cells with flag[c] = 1 (4-neighbour). Returns labels (-1 = none) and sizes. */
function components(flag: Uint8Array, nx: number, ny: number, wrapX: boolean, wrapY: boolean): { label: Int32Array; sizes: number[] } {
  const n = nx * ny;
  const label = new Int32Array(n).fill(-1);
  const queue = new Int32Array(n);
  const sizes: number[] = [];
  for (let s = 0; s < n; s++) {
    if (flag[s] !== 1 || label[s] !== -1) continue;
    const id = sizes.length;
    let head = 0,
      tail = 0;
    queue[tail++] = s;
    label[s] = id;
    while (head < tail) {
      const c = queue[head++]!;
      const i = c % nx,
        j = (c - i) / nx;
      for (let q = 0; q < 4; q++) {
        const d = neighbour(i, j, q, nx, ny, wrapX, wrapY);
        if (d >= 0 && flag[d] === 1 && label[d] === -1) {
          label[d] = id;
          queue[tail++] = d;
        }
      }
    }
    sizes.push(tail);
  }
  return { label, sizes };
}

export function findObjects(field: VectorField, options: ObjectOptions = {}): ObjectsResult {
  const { wrapX, wrapY, boundary } = wrapFlags(options.boundary);
  const mode = options.mode ?? "cores";
  if (mode !== "cores" && mode !== "density") throw new InputError("mode", mode, '"cores" or "density"');
  const thr = options.densityThreshold ?? 0.1;
  if (!(thr > 0 && thr < 1)) throw new InputError("densityThreshold", options.densityThreshold, "a fraction between 0 and 1");
  const minSeed = options.minSeed ?? 1;
  const layer = options.layer ?? 0;
  requireSomeMatter(field, "object finding");
  const q = options.charge ?? skyrmionNumber(field, { boundary, layer, density: true });
  if (options.charge !== undefined) {
    const px = wrapX ? field.nx : field.nx - 1,
      py = wrapY ? field.ny : field.ny - 1;
    const d = q.density;
    if (!d || q.layer !== layer || q.boundary !== boundary || q.lattice !== field.lattice || d.px !== px || d.py !== py || d.charge.length !== px * py) {
      throw new InputError(
        "charge",
        `skyrmion number of layer ${q.layer}, ${q.boundary} boundary${d ? `, ${d.px} x ${d.py} plaquettes` : ", no density"}`,
        `skyrmionNumber(field, { boundary: "${boundary}", layer: ${layer}, density: true }) of this field (${px} x ${py} plaquettes)`,
      );
    }
  }
  const dens = q.density!;
  const { nx, ny, m, vacuum } = field;
  const n = nx * ny;
  const base = layer * n;
  const isVac = (c: number) => vacuum !== null && vacuum[base + c] === 1;

  let bg: 1 | -1;
  if (options.background === undefined || options.background === "auto") {
    let s = 0;
    for (let c = 0; c < n; c++) if (!isVac(c)) s += m[3 * (base + c) + 2]!;
    bg = s < 0 ? -1 : 1;
  } else if (options.background === 1 || options.background === -1) {
    bg = options.background;
  } else {
    throw new InputError("background", options.background, '+1, -1 or "auto"');
  }

  // reversed cells and the m_z = 0 "filled" regions (reversed cells plus enclosed holes)
  const reversed = new Uint8Array(n);
  const rest = new Uint8Array(n);
  for (let c = 0; c < n; c++) {
    if (isVac(c)) continue;
    if (m[3 * (base + c) + 2]! * bg < 0) reversed[c] = 1;
    else rest[c] = 1;
  }
  const filled = reversed.slice();
  {
    const comp = components(rest, nx, ny, wrapX, wrapY);
    const outside = new Uint8Array(comp.sizes.length);
    if (wrapX && wrapY) {
      let big = -1,
        bigSize = -1;
      comp.sizes.forEach((s, id) => {
        if (s > bigSize) {
          bigSize = s;
          big = id;
        }
      });
      if (big >= 0) outside[big] = 1;
    }
    // components touching an open edge or a vacuum cell are outside (not enclosed by a core)
    for (let j = 0; j < ny; j++) {
      for (let i = 0; i < nx; i++) {
        const c = j * nx + i;
        const id = comp.label[c]!;
        if (id < 0) continue;
        const edge = (!wrapX && (i === 0 || i === nx - 1)) || (!wrapY && (j === 0 || j === ny - 1));
        let nearVac = false;
        if (vacuum !== null) {
          for (let q = 0; q < 4; q++) {
            const d = neighbour(i, j, q, nx, ny, true, true);
            if (isVac(d)) nearVac = true;
          }
        }
        if (edge || nearVac) outside[id] = 1;
      }
    }
    for (let c = 0; c < n; c++) {
      const id = comp.label[c]!;
      if (id >= 0 && outside[id] === 0) filled[c] = 1;
    }
  }

  // seeds
  const seedFlag = new Uint8Array(n);
  let seedLabel: Int32Array;
  let seedSizes: number[];
  if (mode === "cores") {
    const comp = components(reversed, nx, ny, wrapX, wrapY);
    seedLabel = comp.label;
    seedSizes = comp.sizes;
  } else {
    const { px, py, charge } = dens;
    let max = 0;
    for (let p = 0; p < charge.length; p++) max = Math.max(max, Math.abs(charge[p]!));
    const flagP = new Uint8Array(n);
    for (let j = 0; j < py; j++) for (let i = 0; i < px; i++) if (Math.abs(charge[j * px + i]!) > thr * max && max > 0) flagP[j * nx + i] = 1;
    const comp = components(flagP, nx, ny, wrapX, wrapY);
    seedLabel = comp.label;
    seedSizes = comp.sizes;
  }
  const keep = seedSizes.map((s) => s >= minSeed);
  const newId = new Int32Array(seedSizes.length).fill(-1);
  let nObj = 0;
  keep.forEach((k, id) => {
    if (k) newId[id] = nObj++;
  });
  const basin = new Int32Array(n).fill(-1);
  const seedCell = new Int32Array(nObj).fill(-1);
  const seedCount = new Float64Array(nObj);
  const queue = new Int32Array(n);
  let tail = 0;
  for (let c = 0; c < n; c++) {
    const id = seedLabel[c]!;
    if (id < 0 || newId[id]! < 0 || isVac(c)) continue;
    const o = newId[id]!;
    basin[c] = o;
    seedFlag[c] = 1;
    seedCount[o]!++;
    if (seedCell[o] === -1) seedCell[o] = c;
    queue[tail++] = c;
  }
  let head = 0;
  while (head < tail) {
    const c = queue[head++]!;
    const i = c % nx,
      j = (c - i) / nx;
    const o = basin[c]!;
    for (let q = 0; q < 4; q++) {
      const d = neighbour(i, j, q, nx, ny, wrapX, wrapY);
      if (d >= 0 && basin[d] === -1 && !isVac(d)) {
        basin[d] = o;
        queue[tail++] = d;
      }
    }
  }

  // charges, centres, areas
  const charge = new Float64Array(nObj),
    absCharge = new Float64Array(nObj);
  const sx = new Float64Array(nObj),
    sy = new Float64Array(nObj),
    ax = new Float64Array(nObj),
    ay = new Float64Array(nObj);
  const area = new Float64Array(nObj);
  const Lx = nx * field.dx,
    Ly = ny * field.dy;
  const tri = field.lattice === "triangular";
  // reference point of each object for unwrapping periodic images: the (circular) mean of its seed
  const refPos = seedCentroids(seedFlag, basin, nObj, nx, ny, wrapX, wrapY).map(([u, v]) => latticeToPosition(field, u, v));
  let unassigned = 0;
  const { px, py } = dens;
  for (let j = 0; j < py; j++) {
    for (let i = 0; i < px; i++) {
      const qp = dens.charge[j * px + i]!;
      const o = basin[j * nx + i]!;
      if (o < 0) {
        unassigned += qp;
        continue;
      }
      let [x, y] = plaquetteCentre(field, i, j);
      // unwrap periodic images around the seed
      const [rx, ry] = refPos[o]!;
      if (wrapY) {
        const s = Math.round((y - ry) / Ly);
        y -= s * Ly;
        if (tri) x -= (s * (ny * field.dx)) / 2;
      }
      if (wrapX) {
        const s = Math.round((x - rx) / Lx);
        x -= s * Lx;
      }
      charge[o]! += qp;
      absCharge[o]! += Math.abs(qp);
      sx[o]! += qp * x;
      sy[o]! += qp * y;
      ax[o]! += Math.abs(qp) * x;
      ay[o]! += Math.abs(qp) * y;
    }
  }
  const cellArea = field.dx * field.dy;
  for (let c = 0; c < n; c++) if (filled[c] === 1 && basin[c]! >= 0) area[basin[c]!]! += cellArea;

  const objects: FoundObject[] = [];
  for (let o = 0; o < nObj; o++) {
    let cx: number, cy: number;
    if (Math.abs(charge[o]!) >= 0.5) {
      cx = sx[o]! / charge[o]!;
      cy = sy[o]! / charge[o]!;
    } else if (absCharge[o]! > 0) {
      cx = ax[o]! / absCharge[o]!;
      cy = ay[o]! / absCharge[o]!;
    } else {
      [cx, cy] = refPos[o]!;
    }
    // back into the box
    if (wrapY) {
      const s = Math.floor(cy / Ly);
      cy -= s * Ly;
      if (tri) cx -= (s * (ny * field.dx)) / 2;
    }
    if (wrapX) cx -= Math.floor(cx / Lx) * Lx;
    const radius = Math.sqrt(area[o]! / Math.PI);
    const loop = loopWinding(field, layer, cx, cy, radius, wrapX, wrapY);
    const obj: FoundObject = {
      id: o,
      charge: charge[o]!,
      center: [cx, cy],
      radius,
      area: area[o]!,
      vorticity: loop.vorticity,
      helicity: loop.helicity,
      seedSize: seedCount[o]!,
      corePolarity: bg === 1 ? -1 : 1,
      kind: "other",
    };
    if (loop.note) obj.note = loop.note;
    obj.kind = kindOf(obj);
    objects.push(obj);
  }
  return { objects, Q: q.Q, background: bg, mode, boundary, unassignedCharge: unassigned, definitions: OBJECT_DEFINITIONS };
}

/** Mean lattice coordinates (u, v) of the seed cells of each object; circular means on periodic axes. */
function seedCentroids(seed: Uint8Array, basin: Int32Array, nObj: number, nx: number, ny: number, wrapX: boolean, wrapY: boolean): Array<[number, number]> {
  const cu = new Float64Array(nObj),
    su = new Float64Array(nObj),
    cv = new Float64Array(nObj),
    sv = new Float64Array(nObj);
  const mu = new Float64Array(nObj),
    mv = new Float64Array(nObj),
    cnt = new Float64Array(nObj);
  for (let c = 0; c < nx * ny; c++) {
    if (seed[c] !== 1) continue;
    const o = basin[c]!;
    const i = c % nx,
      j = (c - i) / nx;
    cu[o]! += Math.cos((2 * Math.PI * i) / nx);
    su[o]! += Math.sin((2 * Math.PI * i) / nx);
    cv[o]! += Math.cos((2 * Math.PI * j) / ny);
    sv[o]! += Math.sin((2 * Math.PI * j) / ny);
    mu[o]! += i;
    mv[o]! += j;
    cnt[o]!++;
  }
  const out: Array<[number, number]> = [];
  for (let o = 0; o < nObj; o++) {
    const u = wrapX ? ((Math.atan2(su[o]!, cu[o]!) / (2 * Math.PI)) * nx + nx) % nx : mu[o]! / cnt[o]!;
    const v = wrapY ? ((Math.atan2(sv[o]!, cv[o]!) / (2 * Math.PI)) * ny + ny) % ny : mv[o]! / cnt[o]!;
    out.push([u, v]);
  }
  return out;
}

/** Position (m) of fractional lattice coordinates (u, v) (cell (i, j) sits at u = i, v = j). */
function latticeToPosition(field: VectorField, u: number, v: number): [number, number] {
  return field.lattice === "triangular" ? [(u + v / 2) * field.dx, v * field.dy] : [u * field.dx, v * field.dy];
}

function kindOf(o: FoundObject): string {
  const Qi = Math.round(o.charge);
  if (Math.abs(o.charge - Qi) > 0.25) return "other";
  if (Qi === 0) return o.vorticity !== null ? "skyrmionium" : "other";
  if (o.vorticity === null) return "other";
  if (Math.abs(Qi) === 1 && o.vorticity === 1) return "skyrmion";
  if (Math.abs(Qi) === 1 && o.vorticity === -1) return "antiskyrmion";
  if (Math.abs(Qi) >= 2 && Math.abs(o.vorticity) === Math.abs(Qi)) return "higher-order skyrmion";
  return "other";
}

/** Bilinear sample of (m_x, m_y) at position (x, y); null if outside an open grid or touching vacuum. */
function sampleInPlane(field: VectorField, layer: number, x: number, y: number, wrapX: boolean, wrapY: boolean): [number, number] | null {
  const { nx, ny, m, vacuum } = field;
  let v = y / field.dy;
  let u = field.lattice === "triangular" ? x / field.dx - v / 2 : x / field.dx;
  if (wrapY) {
    const s = Math.floor(v / ny);
    v -= s * ny;
    if (field.lattice === "triangular") u += (s * ny) / 2;
  }
  if (wrapX) u -= Math.floor(u / nx) * nx;
  const i0 = Math.floor(u),
    j0 = Math.floor(v);
  const fu = u - i0,
    fv = v - j0;
  let sxv = 0,
    syv = 0;
  for (const [di, dj, w] of [
    [0, 0, (1 - fu) * (1 - fv)],
    [1, 0, fu * (1 - fv)],
    [0, 1, (1 - fu) * fv],
    [1, 1, fu * fv],
  ] as const) {
    let i = i0 + di,
      j = j0 + dj;
    if (i >= nx) {
      if (!wrapX) return null;
      i -= nx;
    }
    if (j >= ny) {
      if (!wrapY) return null;
      j -= ny;
    }
    if (i < 0 || j < 0) return null;
    const c = layer * nx * ny + j * nx + i;
    if (vacuum !== null && vacuum[c] === 1) return null;
    sxv += w * m[3 * c]!;
    syv += w * m[3 * c + 1]!;
  }
  return [sxv, syv];
}

/**
 * Vorticity (S1 winding of the in-plane angle) and helicity on a counterclockwise circle of radius r
 * around (cx, cy).
 */
export function loopWinding(
  field: VectorField,
  layer: number,
  cx: number,
  cy: number,
  r: number,
  wrapX: boolean,
  wrapY: boolean,
): { vorticity: number | null; helicity: number | null; note?: string } {
  const h = Math.min(field.dx, field.dy);
  const rr = Math.max(r, 1.5 * h);
  const N = Math.max(32, Math.ceil((2 * Math.PI * rr) / (0.5 * h)));
  const Phi = new Float64Array(N);
  const weight = new Float64Array(N);
  for (let k = 0; k < N; k++) {
    const phi = (2 * Math.PI * k) / N;
    const s = sampleInPlane(field, layer, cx + rr * Math.cos(phi), cy + rr * Math.sin(phi), wrapX, wrapY);
    if (s === null) return { vorticity: null, helicity: null, note: "the measuring circle leaves the grid or crosses vacuum" };
    const mag = Math.hypot(s[0], s[1]);
    if (mag < 0.05) return { vorticity: null, helicity: null, note: "no in-plane direction on part of the measuring circle" };
    Phi[k] = Math.atan2(s[1], s[0]);
    weight[k] = mag;
  }
  const v = s1Winding(Phi);
  let c = 0,
    s = 0;
  for (let k = 0; k < N; k++) {
    const g = wrapAngle(Phi[k]! - (v * 2 * Math.PI * k) / N);
    c += weight[k]! * Math.cos(g);
    s += weight[k]! * Math.sin(g);
  }
  let gamma = Math.atan2(s, c);
  if (gamma <= -Math.PI + 1e-12) gamma = Math.PI;
  // one helicity describes the object only if Phi - v phi is nearly constant on the circle: the
  // weighted mean resultant length (1 for a rotationally symmetric object) must be high
  let wsum = 0;
  for (let k = 0; k < N; k++) wsum += weight[k]!;
  const coherence = Math.hypot(c, s) / wsum;
  if (coherence < 0.9) {
    return {
      vorticity: v === 0 ? 0 : v,
      helicity: null,
      note: `one helicity does not describe this object: Phi - v phi varies along the measuring circle (mean resultant length ${coherence.toFixed(2)} < 0.9), e.g. several cores or a distorted object; see the vortex cores (findVortices) inside it`,
    };
  }
  return { vorticity: v === 0 ? 0 : v, helicity: gamma };
}
