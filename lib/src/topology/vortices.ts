/**
 * Vortices and antivortices of the in-plane part of a field, from the S1 winding (winding.ts) of the
 * in-plane angle phi = atan2(m_y, m_x) around closed loops of lattice sites. Source: N. D. Mermin,
 * Rev. Mod. Phys. 51, 591 (1979) (winding of an order parameter around a loop); the lattice rules
 * below are common practice, no source.
 *
 * Rule.
 * 1. A site has an in-plane direction when it is matter and |m_xy| >= minInPlane |m| (default 1e-3,
 *    i.e. m within about 0.06 degrees of +-z has none). Below that the direction is rounding or
 *    the far tail of a profile and is not used.
 * 2. A plaquette (square a -> b -> c -> d counterclockwise, or each triangle of the triangular
 *    lattice) whose corners all have a direction contributes its own winding. A square plaquette
 *    holds |w| <= 1 (four wrapped steps, each below pi), so a defect of winding 2 shows as two unit
 *    windings in neighbouring plaquettes; sum `winding` over nearby sites for its order.
 * 3. Sites without a direction are grouped into connected sets (8 neighbours on the square lattice,
 *    6 on the triangular one). The plaquettes touching a set are merged into one region; with this
 *    connectivity every edge on the border of the region joins two sites that have a direction, so
 *    the winding around the border is well defined. It equals the sum of the windings the merged
 *    plaquettes would have for any directions inside, so merging never changes a total.
 *    - A set that is enclosed (reaches no open edge, no vacuum, and does not wrap around a periodic
 *      direction) is one core: a zero of m_xy exactly on a site, or a flat core such as a
 *      skyrmion with sharp walls. Its border winding is reported once (coreSites = size of the set),
 *      at the centroid of the set; winding 0 is not reported.
 *    - Any other set is background (a uniform +-z region, the far field of an object, vacuum): its
 *      plaquettes are skipped and its winding is not a vortex. On a closed (periodic) lattice the
 *      border windings of the background are summed in `backgroundWinding`, so that
 *      totalWinding + backgroundWinding = 0 (every edge enters two loops with opposite signs).
 *      On a torus a single vortex must be balanced somewhere (the indices of a planar field on a
 *      torus add up to 0); with a periodic single-object texture that balance sits in the
 *      background tails, where |m_xy| is negligible, and is reported there rather than as vortices.
 *
 * 4. Noise. With `noise: "auto"` (default) the level sigma of uncorrelated noise on m is estimated
 *    robustly from the second differences of m_x and m_y along x and y (median |m(i+1) - 2 m(i) + m(i-1)| /
 *    (0.6745 sqrt 6), sqrt 6 being the standard deviation of a second difference of white noise; a
 *    smooth texture resolved by several cells contributes little, and the median ignores walls), and
 *    the in-plane tolerance becomes max(minInPlane, 4 sigma), capped at 0.5. Noise of 0.1 on a
 *    saturated film then leaves the random in-plane directions of the background without direction
 *    (rule 1) instead of reporting thousands of vortices. Pass a number to give sigma yourself, 0 to
 *    switch this off.
 * 5. Zero lines of m_xy. Where m_xy passes through zero along a line (the middle ring of a
 *    skyrmionium, a 360-degree wall seen in-plane) neighbouring sites point in nearly opposite in-plane
 *    directions, and the wrap of that edge (about pi) decides plaquette windings at random. Both ends
 *    of every edge whose in-plane directions differ by more than 120 degrees lose their direction, so a
 *    zero line becomes a connected set of sites without direction. A set that is a line or a ring (it
 *    encloses sites with direction, or its extent squared is at least 4 times its size and it spans 4
 *    or more cells) is not a core: like the background its plaquettes are skipped, its border winding
 *    is booked with the background, and it is counted in `zeroLines`. A point zero (a vortex core
 *    between sites) stays a compact set and counts once (rule 3).
 *
 * Edge differences are taken once per undirected edge (wrapped into [-pi, pi) in the direction of
 * increasing site index, negated for the other direction), so loop sums cancel exactly.
 */
import { type Boundary, wrapFlags } from "./boundary.js";
import { type VectorField, cellPosition, requireAtLeast, requireSomeMatter } from "./field.js";
import { wrapAngle } from "./winding.js";
import { InputError } from "../errors.js";

export interface VortexSite {
  /** Plaquette indices (lower-left corner), or for a core the site nearest to its centre. */
  i: number;
  j: number;
  /** Position (m): centre of the plaquette (square), centroid of the triangle, or centroid of the core sites. */
  x: number;
  y: number;
  /** Winding number: > 0 vortex, < 0 antivortex. */
  winding: number;
  /** Mean m_z of the corners (plaquette) or of the core sites: the sign gives the core polarity. */
  mz: number;
  /** 0: the winding of one plaquette; k >= 1: a core of k sites without in-plane direction (rule 3). */
  coreSites: number;
}

export interface VortexResult {
  sites: VortexSite[];
  vortices: number;
  antivortices: number;
  /** Sum of the reported windings. */
  totalWinding: number;
  /**
   * Sum of the border windings of the background regions (rule 3) when both directions are periodic,
   * else null. On a closed lattice totalWinding + backgroundWinding = 0.
   */
  backgroundWinding: number | null;
  /** Number of background regions (connected sets of sites without in-plane direction that are not cores). */
  backgroundRegions: number;
  /** Plaquettes not counted because they touch a background region (vacuum, or no in-plane direction). */
  skipped: number;
  /** The tolerance used: sites with |m_xy| < minInPlane |m| have no in-plane direction (after the noise scaling of rule 4). */
  minInPlane: number;
  /** The noise level sigma of m used (estimated, given, or 0). */
  noiseLevel: number;
  /** Sets of sites without direction that form lines or rings (zero lines of m_xy, rule 5): not cores, not counted as vortices. */
  zeroLines: number;
}

export interface VortexOptions {
  boundary?: Boundary;
  layer?: number;
  /** Sites with |m_xy| < minInPlane |m| have no in-plane direction (default 1e-3; 0 keeps every non-zero m_xy). */
  minInPlane?: number;
  /** Noise level of m: "auto" (default) estimates it (rule 4), a number gives it, 0 switches the scaling off. */
  noise?: "auto" | number;
  /** Rule 5: both ends of an edge turning by more than this angle (rad) lose their direction (default 2 pi / 3; pi switches it off). */
  zeroLineAngle?: number;
}

/**
 * Robust estimate of the standard deviation of uncorrelated noise on the in-plane components of m, from
 * the median absolute second difference of m_x and m_y along x and y (matter sites only):
 * sigma = median / (0.6745 sqrt 6). (m_z is left out: near +-z its noise is of second order.)
 */
export function estimateNoiseLevel(field: VectorField, layer = 0): number {
  const { nx, ny, m, vacuum } = field;
  const base = layer * nx * ny;
  const d = new Float64Array(4 * nx * ny);
  let nd = 0;
  const vac = vacuum;
  // Same values in the same order as a per-cell loop over (x, y) neighbour pairs; written without
  // per-cell arrays (a 2888^2 field spent half of `helicoid charge` here).
  for (let j = 0; j < ny; j++) {
    const yIn = j > 0 && j + 1 < ny;
    for (let i = 0; i < nx; i++) {
      const c = j * nx + i;
      if (vac !== null && vac[base + c] !== 0) continue;
      const g = 3 * (base + c);
      if (i > 0 && i + 1 < nx && (vac === null || (vac[base + c - 1] === 0 && vac[base + c + 1] === 0))) {
        d[nd++] = Math.abs(m[g - 3]! - 2 * m[g]! + m[g + 3]!);
        d[nd++] = Math.abs(m[g - 2]! - 2 * m[g + 1]! + m[g + 4]!);
      }
      if (yIn && (vac === null || (vac[base + c - nx] === 0 && vac[base + c + nx] === 0))) {
        const s = 3 * nx;
        d[nd++] = Math.abs(m[g - s]! - 2 * m[g]! + m[g + s]!);
        d[nd++] = Math.abs(m[g - s + 1]! - 2 * m[g + 1]! + m[g + s + 1]!);
      }
    }
  }
  if (nd === 0) return 0;
  // The element of rank floor(nd / 2) (the upper median), by selection instead of a full sort.
  const med = selectRank(d, nd, Math.floor(nd / 2));
  return med / (0.6745 * Math.sqrt(6));
}

/**
 * The value of rank k (0-based, ascending) among a[0 .. n-1], by quickselect (Hoare partition
 * around the median of three, expected O(n)); reorders a. Common practice, no source (C. A. R.
 * Hoare, "Algorithm 65: Find", Commun. ACM 4, 321 (1961) is the original).
 */
export function selectRank(a: Float64Array, n: number, k: number): number {
  let lo = 0;
  let hi = n - 1;
  while (hi > lo) {
    const mid = (lo + hi) >>> 1;
    // median of three as the pivot value
    let x = a[lo]!,
      y = a[mid]!;
    const z = a[hi]!;
    if (x > y) [x, y] = [y, x];
    if (y > z) y = x > z ? x : z;
    const pivot = y;
    let i = lo;
    let j = hi;
    while (i <= j) {
      while (a[i]! < pivot) i++;
      while (a[j]! > pivot) j--;
      if (i <= j) {
        const t = a[i]!;
        a[i] = a[j]!;
        a[j] = t;
        i++;
        j--;
      }
    }
    // a[lo..j] <= pivot <= a[i..hi], and a[j+1..i-1] == pivot
    if (k <= j) hi = j;
    else if (k >= i) lo = i;
    else return a[k]!;
  }
  return a[k]!;
}

/** Largest in-plane tolerance the noise scaling may set. */
const MAX_NOISE_TOLERANCE = 0.5;

/** Default relative in-plane tolerance of findVortices. */
export const DEFAULT_MIN_IN_PLANE = 1e-3;

const TWO_PI = 2 * Math.PI;
const SQUARE_NEIGHBOURS: ReadonlyArray<readonly [number, number]> = [
  [1, 0],
  [-1, 0],
  [0, 1],
  [0, -1],
  [1, 1],
  [1, -1],
  [-1, 1],
  [-1, -1],
];
// triangles (i,j)(i+1,j)(i,j+1) and (i+1,j)(i+1,j+1)(i,j+1): the six bonds
const TRIANGULAR_NEIGHBOURS: ReadonlyArray<readonly [number, number]> = [
  [1, 0],
  [-1, 0],
  [0, 1],
  [0, -1],
  [1, -1],
  [-1, 1],
];

interface SiteSet {
  sites: number[];
  /** Sum of unwrapped indices (for the centroid). */
  si: number;
  sj: number;
  reachesEdge: boolean;
  wraps: boolean;
  hasVacuum: boolean;
  plaquettes: number[][];
}

export function findVortices(field: VectorField, options: VortexOptions = {}): VortexResult {
  const { wrapX, wrapY } = wrapFlags(options.boundary);
  const k = options.layer ?? 0;
  if (!Number.isInteger(k) || k < 0 || k >= field.nz) throw new InputError("layer", options.layer, `a whole number from 0 to ${field.nz - 1}`);
  const tol0 = options.minInPlane ?? DEFAULT_MIN_IN_PLANE;
  if (!(tol0 >= 0 && tol0 < 1)) throw new InputError("minInPlane", options.minInPlane, "a tolerance |m_xy| / |m| from 0 up to (not including) 1");
  const noiseOpt = options.noise ?? "auto";
  if (noiseOpt !== "auto" && !(typeof noiseOpt === "number" && noiseOpt >= 0 && Number.isFinite(noiseOpt)))
    throw new InputError("noise", options.noise, '"auto" or a noise level >= 0 of the components of m');
  requireAtLeast(field, 2, 2, "plaquette windings (one plaquette needs 2x2 cells)");
  requireSomeMatter(field, "vortex finding");
  const zeroLineAngle = options.zeroLineAngle ?? (2 * Math.PI) / 3;
  if (!(zeroLineAngle > 0 && zeroLineAngle <= Math.PI))
    throw new InputError("zeroLineAngle", options.zeroLineAngle, "an angle in (0, pi] rad (pi switches the zero-line rule off)");
  const noiseLevel = noiseOpt === "auto" ? estimateNoiseLevel(field, k) : noiseOpt;
  const tol = Math.max(tol0, Math.min(MAX_NOISE_TOLERANCE, 4 * noiseLevel));
  const { nx, ny, m, vacuum } = field;
  const tri = field.lattice === "triangular";
  const base = k * nx * ny;
  const n = nx * ny;
  const phi = new Float64Array(n);
  const ok = new Uint8Array(n);
  const isVacuum = (c: number) => vacuum !== null && vacuum[base + c] !== 0;
  for (let c = 0; c < n; c++) {
    if (isVacuum(c)) continue;
    const g = 3 * (base + c);
    const x = m[g]!,
      y = m[g + 1]!,
      z = m[g + 2]!;
    const p2 = x * x + y * y;
    if (p2 > 0 && p2 >= tol * tol * (p2 + z * z)) {
      phi[c] = Math.atan2(y, x);
      ok[c] = 1;
    }
  }
  // rule 5: both ends of an edge whose directions differ by more than 120 degrees lose their direction
  {
    const flip = new Uint8Array(n);
    const cosMax = Math.cos(zeroLineAngle);
    const pairs: Array<[number, number]> = tri
      ? [
          [1, 0],
          [0, 1],
          [-1, 1],
        ]
      : [
          [1, 0],
          [0, 1],
        ];
    for (let j = 0; j < ny; j++) {
      for (let i = 0; i < nx; i++) {
        const c = j * nx + i;
        if (ok[c] !== 1) continue;
        for (const [di, dj] of pairs) {
          let ii = i + di,
            jj = j + dj;
          if (ii < 0 || ii >= nx) {
            if (!wrapX) continue;
            ii = (ii + nx) % nx;
          }
          if (jj >= ny) {
            if (!wrapY) continue;
            jj -= ny;
          }
          const t = jj * nx + ii;
          if (ok[t] !== 1) continue;
          if (Math.cos(phi[t]! - phi[c]!) < cosMax) flip[c] = flip[t] = 1;
        }
      }
    }
    for (let c = 0; c < n; c++) if (flip[c]) ok[c] = 0;
  }
  const edge = (u: number, v: number): number => (u < v ? wrapAngle(phi[v]! - phi[u]!) : -wrapAngle(phi[u]! - phi[v]!));

  // rule 3: connected sets of sites without direction, with unwrapped indices to see wrapping
  const setOf = new Int32Array(n).fill(-1);
  const ui = new Int32Array(n),
    uj = new Int32Array(n);
  const sets: SiteSet[] = [];
  const offsets = tri ? TRIANGULAR_NEIGHBOURS : SQUARE_NEIGHBOURS;
  for (let c0 = 0; c0 < n; c0++) {
    if (ok[c0] === 1 || setOf[c0]! >= 0) continue;
    const id = sets.length;
    const set: SiteSet = { sites: [], si: 0, sj: 0, reachesEdge: false, wraps: false, hasVacuum: false, plaquettes: [] };
    sets.push(set);
    setOf[c0] = id;
    ui[c0] = c0 % nx;
    uj[c0] = Math.floor(c0 / nx);
    const stack = [c0];
    while (stack.length > 0) {
      const s = stack.pop()!;
      set.sites.push(s);
      set.si += ui[s]!;
      set.sj += uj[s]!;
      if (isVacuum(s)) set.hasVacuum = true;
      for (const [di, dj] of offsets) {
        const a = ui[s]! + di,
          b = uj[s]! + dj;
        let ii = a,
          jj = b;
        if (ii < 0 || ii >= nx) {
          if (!wrapX) {
            set.reachesEdge = true;
            continue;
          }
          ii = ((ii % nx) + nx) % nx;
        }
        if (jj < 0 || jj >= ny) {
          if (!wrapY) {
            set.reachesEdge = true;
            continue;
          }
          jj = ((jj % ny) + ny) % ny;
        }
        const t = jj * nx + ii;
        if (ok[t] === 1) continue;
        if (setOf[t] === id) {
          if (ui[t] !== a || uj[t] !== b) set.wraps = true;
          continue;
        }
        setOf[t] = id;
        ui[t] = a;
        uj[t] = b;
        stack.push(t);
      }
    }
  }

  const sites: VortexSite[] = [];
  // Corners as numbers (a, b, c, and d for a square; d < 0 for a triangle): an array is made only
  // for a plaquette kept for a merged region (most plaquettes of a large field are not).
  const plaquette = (a: number, b: number, c: number, d: number, i: number, j: number, x: number, y: number) => {
    const tri3 = d < 0;
    let first = -1;
    if (ok[a] === 0) first = a;
    else if (ok[b] === 0) first = b;
    else if (ok[c] === 0) first = c;
    else if (!tri3 && ok[d] === 0) first = d;
    if (first >= 0) {
      sets[setOf[first]!]!.plaquettes.push(tri3 ? [a, b, c] : [a, b, c, d]);
      return;
    }
    const s = tri3 ? edge(a, b) + edge(b, c) + edge(c, a) : edge(a, b) + edge(b, c) + edge(c, d) + edge(d, a);
    const w = Math.round(s / TWO_PI) + 0;
    if (w !== 0) {
      const mz = tri3
        ? m[3 * (base + a) + 2]! + m[3 * (base + b) + 2]! + m[3 * (base + c) + 2]!
        : m[3 * (base + a) + 2]! + m[3 * (base + b) + 2]! + m[3 * (base + c) + 2]! + m[3 * (base + d) + 2]!;
      sites.push({ i, j, x, y, winding: w, mz: mz / (tri3 ? 3 : 4), coreSites: 0 });
    }
  };
  const px = wrapX ? nx : nx - 1,
    py = wrapY ? ny : ny - 1;
  for (let j = 0; j < py; j++) {
    const jn = j + 1 === ny ? 0 : j + 1;
    for (let i = 0; i < px; i++) {
      const inx = i + 1 === nx ? 0 : i + 1;
      const a = j * nx + i,
        b = j * nx + inx,
        c = jn * nx + inx,
        d = jn * nx + i;
      if (!tri) {
        plaquette(a, b, c, d, i, j, (i + 0.5) * field.dx, (j + 0.5) * field.dy);
      } else {
        // centroids of the two triangles of the rhombus (see field.ts for site positions)
        plaquette(a, b, d, -1, i, j, (i + 1 / 3 + (j + 1 / 3) / 2) * field.dx, (j + 1 / 3) * field.dy);
        plaquette(b, c, d, -1, i, j, (i + 2 / 3 + (j + 2 / 3) / 2) * field.dx, (j + 2 / 3) * field.dy);
      }
    }
  }

  // border winding of a merged region: directed edges met in both directions are interior
  const borderSumMap = (plaqs: number[][]): { sum: number; closed: boolean } => {
    const directed = new Map<number, [number, number]>();
    for (const cs of plaqs) {
      for (let q = 0; q < cs.length; q++) {
        const u = cs[q]!,
          v = cs[(q + 1) % cs.length]!;
        const back = v * n + u;
        if (directed.has(back)) directed.delete(back);
        else directed.set(u * n + v, [u, v]);
      }
    }
    let sum = 0,
      closed = true;
    for (const [u, v] of directed.values()) {
      if (ok[u] === 0 || ok[v] === 0) {
        closed = false;
        continue;
      }
      sum += edge(u, v);
    }
    return { sum, closed };
  };
  // The same with a net count per undirected lattice edge (3 per site: +x, +y, and (-1, +1) for the
  // triangular lattice) instead of a Map keyed by site pairs: on grids of at least 3 x 3 two sites
  // share at most one edge, so the two agree; a 2888^2 field spent a quarter of its analysis in the
  // Map. Each plaquette meets an edge once, neighbours in opposite directions, so counts are -1, 0, 1.
  const big = nx >= 3 && ny >= 3;
  const counts = big ? new Int8Array(3 * n) : null;
  /** Edge id times its direction (+ along the edge's own orientation) for the step u -> v. */
  const edgeOf = (u: number, v: number): number => {
    const iu = u % nx,
      ju = (u - iu) / nx,
      iv = v % nx,
      jv = (v - iv) / nx;
    let di = iv - iu,
      dj = jv - ju;
    if (di > 1) di -= nx;
    else if (di < -1) di += nx;
    if (dj > 1) dj -= ny;
    else if (dj < -1) dj += ny;
    if (dj === 0) return di === 1 ? 3 * u + 1 : -(3 * v + 1);
    if (di === 0) return dj === 1 ? 3 * u + 2 : -(3 * v + 2);
    return dj === 1 ? 3 * u + 3 : -(3 * v + 3); // (di, dj) = (-1, 1) or (1, -1)
  };
  const borderSum = (plaqs: number[][]): { sum: number; closed: boolean } => {
    if (!counts) return borderSumMap(plaqs);
    for (const cs of plaqs) {
      const L = cs.length;
      for (let q = 0; q < L; q++) {
        const id = edgeOf(cs[q]!, cs[q + 1 === L ? 0 : q + 1]!);
        if (id > 0) counts[id - 1]!++;
        else counts[-id - 1]!--;
      }
    }
    let sum = 0,
      closed = true;
    for (const cs of plaqs) {
      const L = cs.length;
      for (let q = 0; q < L; q++) {
        const u = cs[q]!,
          v = cs[q + 1 === L ? 0 : q + 1]!;
        const id = edgeOf(u, v);
        const k = id > 0 ? id - 1 : -id - 1;
        const c = counts[k]!;
        if (c === 0) continue;
        counts[k] = 0;
        // c = +1: the border runs along the edge's orientation; the step u -> v is that way iff id > 0
        const fwd = c > 0 === id > 0;
        if (ok[u] === 0 || ok[v] === 0) {
          closed = false;
          continue;
        }
        sum += fwd ? edge(u, v) : edge(v, u);
      }
    }
    return { sum, closed };
  };

  // rule 5: is a set a line or a ring (not a point)?
  const isLine = (set: SiteSet): boolean => {
    let i0 = Infinity,
      i1 = -Infinity,
      j0 = Infinity,
      j1 = -Infinity;
    for (const c of set.sites) {
      i0 = Math.min(i0, ui[c]!);
      i1 = Math.max(i1, ui[c]!);
      j0 = Math.min(j0, uj[c]!);
      j1 = Math.max(j1, uj[c]!);
    }
    const extent = Math.max(i1 - i0 + 1, j1 - j0 + 1);
    if (extent >= 4 && extent * extent >= 4 * set.sites.length) return true;
    // a hole: cells of the box (one cell margin) not in the set and not reachable from its border
    const bw = i1 - i0 + 3,
      bh = j1 - j0 + 3;
    if (bw * bh > 4_000_000) return false;
    const mark = new Uint8Array(bw * bh);
    for (const c of set.sites) mark[(uj[c]! - j0 + 1) * bw + (ui[c]! - i0 + 1)] = 1;
    const stack: number[] = [0];
    mark[0] = 2;
    let reached = 1;
    while (stack.length) {
      const q = stack.pop()!;
      const qi = q % bw,
        qj = (q - qi) / bw;
      for (const [di, dj] of [
        [1, 0],
        [-1, 0],
        [0, 1],
        [0, -1],
      ] as const) {
        const a = qi + di,
          b = qj + dj;
        if (a < 0 || b < 0 || a >= bw || b >= bh) continue;
        const r = b * bw + a;
        if (mark[r] !== 0) continue;
        mark[r] = 2;
        reached++;
        stack.push(r);
      }
    }
    return reached + set.sites.length < bw * bh;
  };

  let skipped = 0,
    backgroundRegions = 0,
    background = 0,
    backgroundClosed = wrapX && wrapY,
    zeroLines = 0;
  for (const set of sets) {
    const { sum, closed } = borderSum(set.plaquettes);
    const enclosed = !set.reachesEdge && !set.wraps && !set.hasVacuum;
    const line = enclosed && closed && isLine(set);
    if (line) zeroLines++;
    if (!enclosed || !closed || line) {
      if (!line) backgroundRegions++;
      skipped += set.plaquettes.length;
      if (closed) background += Math.round(sum / TWO_PI);
      else backgroundClosed = false;
      continue;
    }
    const w = Math.round(sum / TWO_PI) + 0;
    if (w === 0) continue;
    const count = set.sites.length;
    let mz = 0;
    for (const c of set.sites) mz += m[3 * (base + c) + 2]!;
    const ci = (((set.si / count) % nx) + nx) % nx,
      cj = (((set.sj / count) % ny) + ny) % ny;
    const [x, y] = cellPosition(field, ci, cj);
    sites.push({ i: Math.round(ci) % nx, j: Math.round(cj) % ny, x, y, winding: w, mz: mz / count, coreSites: count });
  }

  let vortices = 0,
    antivortices = 0,
    total = 0;
  for (const s of sites) {
    if (s.winding > 0) vortices++;
    else antivortices++;
    total += s.winding;
  }
  return {
    sites,
    vortices,
    antivortices,
    totalWinding: total,
    backgroundWinding: backgroundClosed ? background + 0 : null,
    backgroundRegions,
    skipped,
    minInPlane: tol,
    noiseLevel,
    zeroLines,
  };
}
