/**
 * Bloch Hamiltonians of 2D lattices for Berry curvature and Chern numbers.
 *
 * Wave vectors are in fractional (reduced) coordinates k = k1 b1 + k2 b2 with (k1, k2) in [0, 1)^2,
 * where b1, b2 are the reciprocal vectors of the lattice vectors a1, a2 (a_i . b_j = 2 pi delta_ij).
 * `fill(k1, k2, re, im)` writes H(k) (row-major, planar) in the periodic ("lattice vector") gauge:
 * H(k1 + 1, k2) = H(k1, k2 + 1) = H(k1, k2). Orbital positions r_alpha (fractional, in units of
 * a1, a2), when given, restore the Bloch embedding phases exp(-i k . r_alpha) in the link variables,
 * so that the Berry curvature is the one of the Bloch functions (Chern numbers do not depend on it).
 *
 * A tight-binding model is a list of orbitals and hoppings t c^dag_{alpha, 0} c_{beta, R}
 * (the Hermitian conjugate is added automatically): H_ab(k) = sum t exp(2 pi i k . R).
 */
import { InputError } from "../errors.js";

export interface BlochModel {
  /** Matrix size (number of bands). */
  bands: number;
  fill(k1: number, k2: number, re: Float64Array, im: Float64Array): void;
  /** Fractional orbital positions [r1, r2] (optional). */
  positions?: ReadonlyArray<readonly [number, number]>;
  /** Lattice vectors (any length unit), for Cartesian curvature; a1 x a2 > 0 expected. */
  latticeVectors?: readonly [readonly [number, number], readonly [number, number]];
  name?: string;
}

export interface Hopping {
  from: number;
  to: number;
  /** Lattice vector of the target cell, in units of (a1, a2). */
  R: readonly [number, number];
  /** Amplitude: a real number or [re, im]. */
  t: number | readonly [number, number];
}

export interface TightBindingSpec {
  orbitals: number;
  /** On-site energies (real), one per orbital. */
  onsite: ArrayLike<number>;
  hoppings: Hopping[];
  positions?: ReadonlyArray<readonly [number, number]>;
  latticeVectors?: readonly [readonly [number, number], readonly [number, number]];
  name?: string;
}

export interface TightBindingModel extends BlochModel {
  spec: TightBindingSpec;
}

export function tightBindingModel(spec: TightBindingSpec): TightBindingModel {
  const n = spec.orbitals;
  if (!Number.isInteger(n) || n < 1) throw new InputError("orbitals", n, "a positive whole number");
  if (spec.onsite.length !== n) throw new InputError("onsite", spec.onsite, `${n} on-site energies`);
  const hops = spec.hoppings.map((h, i) => {
    if (!Number.isInteger(h.from) || !Number.isInteger(h.to) || h.from < 0 || h.to < 0 || h.from >= n || h.to >= n) {
      throw new InputError(`hoppings[${i}]`, h, `orbital indices from 0 to ${n - 1}`);
    }
    if (!Number.isInteger(h.R[0]) || !Number.isInteger(h.R[1])) throw new InputError(`hoppings[${i}].R`, h.R, "whole lattice-vector components");
    const [tr, ti] = typeof h.t === "number" ? [h.t, 0] : [h.t[0], h.t[1]];
    if (h.from === h.to && h.R[0] === 0 && h.R[1] === 0) throw new InputError(`hoppings[${i}]`, h, "a hopping between different sites (put on-site energies in onsite)");
    return { a: h.from, b: h.to, R1: h.R[0], R2: h.R[1], tr, ti };
  });
  const onsite = Float64Array.from(spec.onsite);
  const twoPi = 2 * Math.PI;
  // Unique lattice vectors: one cos/sin pair per R, not per hopping.
  const keys = new Map<string, number>();
  const uniqueR: Array<[number, number]> = [];
  const rIndex = new Int32Array(hops.length);
  hops.forEach((h, i) => {
    const key = `${h.R1},${h.R2}`;
    let k = keys.get(key);
    if (k === undefined) {
      k = uniqueR.length;
      keys.set(key, k);
      uniqueR.push([h.R1, h.R2]);
    }
    rIndex[i] = k;
  });
  const cr = new Float64Array(uniqueR.length);
  const ci = new Float64Array(uniqueR.length);
  // exp(2 pi i k.R) = exp(2 pi i k1 R1) exp(2 pi i k2 R2): one cos/sin pair per distinct |R1| > 0
  // and |R2| > 0 (negative R by conjugation); the k2 factors are kept while k2 does not change
  // (a grid row), so a call costs a few trigonometric evaluations instead of two per lattice vector.
  const abs1 = [...new Set(uniqueR.map((r) => Math.abs(r[0])).filter((x) => x > 0))];
  const abs2 = [...new Set(uniqueR.map((r) => Math.abs(r[1])).filter((x) => x > 0))];
  const idx1 = Int32Array.from(uniqueR.map((r) => (r[0] === 0 ? -1 : abs1.indexOf(Math.abs(r[0])))));
  const idx2 = Int32Array.from(uniqueR.map((r) => (r[1] === 0 ? -1 : abs2.indexOf(Math.abs(r[1])))));
  const sgn1 = Float64Array.from(uniqueR.map((r) => (r[0] < 0 ? -1 : 1)));
  const sgn2 = Float64Array.from(uniqueR.map((r) => (r[1] < 0 ? -1 : 1)));
  const a1 = Float64Array.from(abs1),
    a2 = Float64Array.from(abs2);
  const e1r = new Float64Array(abs1.length),
    e1i = new Float64Array(abs1.length);
  const e2r = new Float64Array(abs2.length),
    e2i = new Float64Array(abs2.length);
  const lastK2 = new Float64Array([NaN]); // typed-array slot: a captured `let` double would be boxed
  const A = Int32Array.from(hops.map((h) => h.a));
  const B = Int32Array.from(hops.map((h) => h.b));
  const TR = Float64Array.from(hops.map((h) => h.tr));
  const TI = Float64Array.from(hops.map((h) => h.ti));
  const H = hops.length;
  const model: TightBindingModel = {
    bands: n,
    spec,
    fill(k1, k2, re, im) {
      re.fill(0);
      im.fill(0);
      for (let a = 0; a < n; a++) re[a * n + a] = onsite[a]!;
      for (let q = 0; q < a1.length; q++) {
        const ph = twoPi * k1 * a1[q]!;
        e1r[q] = Math.cos(ph);
        e1i[q] = Math.sin(ph);
      }
      if (k2 !== lastK2[0]) {
        for (let q = 0; q < a2.length; q++) {
          const ph = twoPi * k2 * a2[q]!;
          e2r[q] = Math.cos(ph);
          e2i[q] = Math.sin(ph);
        }
        lastK2[0] = k2;
      }
      for (let u = 0; u < cr.length; u++) {
        const q1 = idx1[u]!,
          q2 = idx2[u]!;
        const xr = q1 < 0 ? 1 : e1r[q1]!,
          xi = q1 < 0 ? 0 : sgn1[u]! * e1i[q1]!;
        const yr = q2 < 0 ? 1 : e2r[q2]!,
          yi = q2 < 0 ? 0 : sgn2[u]! * e2i[q2]!;
        cr[u] = xr * yr - xi * yi;
        ci[u] = xr * yi + xi * yr;
      }
      for (let q = 0; q < H; q++) {
        const u = rIndex[q]!;
        const c = cr[u]!;
        const s = ci[u]!;
        const a = A[q]!;
        const b = B[q]!;
        // t e^{i ph} at (a, b) and its conjugate at (b, a)
        const xr = TR[q]! * c - TI[q]! * s;
        const xi = TR[q]! * s + TI[q]! * c;
        re[a * n + b] = re[a * n + b]! + xr;
        im[a * n + b] = im[a * n + b]! + xi;
        re[b * n + a] = re[b * n + a]! + xr;
        im[b * n + a] = im[b * n + a]! - xi;
      }
    },
  };
  if (spec.positions) model.positions = spec.positions;
  if (spec.latticeVectors) model.latticeVectors = spec.latticeVectors;
  if (spec.name) model.name = spec.name;
  return model;
}

/**
 * The m1 x m2 supercell of a tight-binding model (orbital (alpha, s1, s2) -> index
 * alpha + n (s1 + m1 s2)): the same system with m1 m2 n bands; the total Chern number of a filled
 * set of bands below a gap is unchanged by the folding.
 */
export function supercellModel(spec: TightBindingSpec, m1: number, m2: number): TightBindingModel {
  if (!Number.isInteger(m1) || m1 < 1) throw new InputError("m1", m1, "a positive whole number");
  if (!Number.isInteger(m2) || m2 < 1) throw new InputError("m2", m2, "a positive whole number");
  const n = spec.orbitals;
  const idx = (a: number, s1: number, s2: number) => a + n * (s1 + m1 * s2);
  const onsite: number[] = new Array(n * m1 * m2);
  const positions: Array<[number, number]> = [];
  const hoppings: Hopping[] = [];
  const mod = (x: number, m: number) => ((x % m) + m) % m;
  for (let s2 = 0; s2 < m2; s2++)
    for (let s1 = 0; s1 < m1; s1++)
      for (let a = 0; a < n; a++) {
        onsite[idx(a, s1, s2)] = spec.onsite[a]!;
        const p = spec.positions?.[a] ?? [0, 0];
        positions[idx(a, s1, s2)] = [(p[0] + s1) / m1, (p[1] + s2) / m2];
      }
  for (let s2 = 0; s2 < m2; s2++)
    for (let s1 = 0; s1 < m1; s1++) {
      for (const h of spec.hoppings) {
        const t1 = s1 + h.R[0];
        const t2 = s2 + h.R[1];
        hoppings.push({
          from: idx(h.from, s1, s2),
          to: idx(h.to, mod(t1, m1), mod(t2, m2)),
          R: [Math.floor(t1 / m1), Math.floor(t2 / m2)],
          t: h.t,
        });
      }
    }
  const lv = spec.latticeVectors;
  const out: TightBindingSpec = { orbitals: n * m1 * m2, onsite, hoppings, positions, name: `${spec.name ?? "model"} (${m1} x ${m2} supercell)` };
  if (lv)
    out.latticeVectors = [
      [lv[0][0] * m1, lv[0][1] * m1],
      [lv[1][0] * m2, lv[1][1] * m2],
    ];
  return tightBindingModel(out);
}

/**
 * Haldane model on the honeycomb lattice (nearest-neighbour distance 1):
 *   H(k) = 2 t2 cos(phi) sum_i cos(k.b_i) + t1 [f(k) sigma^+ + h.c.] + (M - 2 t2 sin(phi) sum_i sin(k.b_i)) sigma_z
 * with sublattice A = index 0 (on-site +M), B = index 1 (-M); NNN hopping t2 e^{+i phi} on A and
 * t2 e^{-i phi} on B along b1 = a2 - a1, b2 = -a2, b3 = a1; a1 = (sqrt3/2, 3/2), a2 = (-sqrt3/2, 3/2).
 * The gap at K, K' is 2 |M -+ 3 sqrt(3) t2 sin(phi)|. Source: F. D. M. Haldane, PRL 61, 2015 (1988).
 */
export function haldaneSpec(p: { t1?: number; t2: number; phi: number; M: number }): TightBindingSpec {
  const t1 = p.t1 ?? 1;
  const { t2, phi, M } = p;
  for (const [k, v] of Object.entries({ t1, t2, phi, M })) if (!Number.isFinite(v)) throw new InputError(k, v, "a finite number");
  const ea: [number, number] = [t2 * Math.cos(phi), t2 * Math.sin(phi)];
  const eb: [number, number] = [t2 * Math.cos(phi), -t2 * Math.sin(phi)];
  const b: Array<[number, number]> = [
    [-1, 1],
    [0, -1],
    [1, 0],
  ];
  const s3 = Math.sqrt(3);
  return {
    orbitals: 2,
    onsite: [M, -M],
    hoppings: [
      { from: 0, to: 1, R: [0, 0], t: t1 },
      { from: 0, to: 1, R: [-1, 0], t: t1 },
      { from: 0, to: 1, R: [0, -1], t: t1 },
      ...b.map((R) => ({ from: 0, to: 0, R, t: ea })),
      ...b.map((R) => ({ from: 1, to: 1, R, t: eb })),
    ],
    positions: [
      [0, 0],
      [1 / 3, 1 / 3],
    ],
    latticeVectors: [
      [s3 / 2, 1.5],
      [-s3 / 2, 1.5],
    ],
    name: "Haldane model",
  };
}

export function haldaneModel(p: { t1?: number; t2: number; phi: number; M: number }): TightBindingModel {
  return tightBindingModel(haldaneSpec(p));
}

/** The closed-form Haldane phase boundary |M| = 3 sqrt(3) |t2 sin(phi)|. */
export function haldaneCriticalMass(t2: number, phi: number): number {
  return 3 * Math.sqrt(3) * Math.abs(t2 * Math.sin(phi));
}
