import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { skyrmionNumber, skyrmionNumberPerLayer } from "../../../lib/src/topology/skyrmionNumber.js";
import { vectorFieldFromInterleaved, type VectorField } from "../../../lib/src/topology/field.js";
import {
  antiskyrmionTexture,
  higherOrderSkyrmionTexture,
  skyrmionLatticeTexture,
  skyrmionTexture,
  skyrmioniumTexture,
  textureOfObjects,
} from "../../../lib/src/topology/textures.js";
import { InputError } from "../../../lib/src/errors.js";
import { runPython } from "../../helpers/python.js";
import { mulberry32, randomSmoothComponents, rotationFromQuaternion } from "./randomFields.js";

const nm = 1e-9;
const grid = { nx: 96, ny: 96, dx: nm };

// Closed form used below: Q = (v / 2) [cos T(0) - cos T(inf)] for m = (sin T cos(v phi + g), sin T sin(v phi + g), cos T);
// derived in lib/src/topology/objects.ts from the definition of Q in lib/src/README.md (sign: core-down v = +1 in a +z
// background gives Q = -1). Source: N. Nagaosa, Y. Tokura, Nat. Nanotechnol. 8, 899 (2013) (from memory: the same
// product of polarity and vorticity).
describe("lattice skyrmion number: known charges of analytic textures (periodic, to 1e-9)", () => {
  const cases: Array<[string, () => VectorField, number]> = [
    ["Neel skyrmion, core down in +z", () => skyrmionTexture(grid, { R: 12 * nm, w: 3 * nm }), -1],
    ["Bloch skyrmion, core down in +z", () => skyrmionTexture(grid, { R: 12 * nm, w: 3 * nm, helicity: Math.PI / 2 }), -1],
    ["skyrmion, core up in -z", () => skyrmionTexture(grid, { R: 12 * nm, w: 3 * nm }, { background: -1 }), 1],
    ["antiskyrmion, core down in +z", () => antiskyrmionTexture(grid, { R: 12 * nm, w: 3 * nm }), 1],
    ["antiskyrmion, core up in -z", () => antiskyrmionTexture(grid, { R: 12 * nm, w: 3 * nm, helicity: 1 }, { background: -1 }), -1],
    ["skyrmionium", () => skyrmioniumTexture(grid, { R: 30 * nm, Rinner: 13 * nm, w: 3 * nm }), 0],
    ["charge-2 skyrmion (v = 2)", () => higherOrderSkyrmionTexture(grid, { R: 14 * nm, w: 3 * nm, vorticity: 2 }), -2],
    ["charge-2 skyrmion (v = 2), -z background", () => higherOrderSkyrmionTexture(grid, { R: 14 * nm, w: 3 * nm, vorticity: 2 }, { background: -1 }), 2],
    ["v = -3 antiskyrmion", () => higherOrderSkyrmionTexture(grid, { R: 16 * nm, w: 3 * nm, vorticity: -3 }), 3],
    ["skyrmion lattice of 3 x 4", () => skyrmionLatticeTexture(grid, { a: 32 * nm, R: 6 * nm, w: 2 * nm }), -12],
    [
      "skyrmion + antiskyrmion + skyrmion",
      () =>
        textureOfObjects(grid, [
          { x: 20 * nm, y: 20 * nm, R: 8 * nm, w: 2 * nm },
          { x: 70 * nm, y: 30 * nm, R: 8 * nm, w: 2 * nm, vorticity: -1 },
          { x: 40 * nm, y: 72 * nm, R: 8 * nm, w: 2 * nm, helicity: -Math.PI / 2 },
        ]),
      -1,
    ],
    ["triangular lattice skyrmion", () => skyrmionTexture({ ...grid, lattice: "triangular" }, { R: 12 * nm, w: 3 * nm }), -1],
    ["triangular lattice antiskyrmion, -z background", () => antiskyrmionTexture({ ...grid, lattice: "triangular" }, { R: 12 * nm, w: 3 * nm }, { background: -1 }), -1],
  ];
  for (const [name, make, Q] of cases) {
    it(`${name}: Q = ${Q}`, () => {
      const r = skyrmionNumber(make());
      expect(r.closed).toBe(true);
      expect(Math.abs(r.Q - Q)).toBeLessThan(1e-9);
      expect(r.nearestInteger).toBe(Q);
    });
  }

  it("the density map sums to Q and sits on the object", () => {
    // Source: Q = Sum of plaquette charges by construction (Berg, Luescher 1981); the density of a core-down v = 1
    // skyrmion is negative everywhere (T' sin T v / rho with T' < 0), from the closed form above.
    const f = skyrmionTexture(grid, { R: 12 * nm, w: 3 * nm });
    const r = skyrmionNumber(f, { density: true });
    const d = r.density!;
    expect(d.px * d.py).toBe(96 * 96);
    let s = 0,
      pos = 0;
    for (const v of d.charge) {
      s += v;
      if (v > 1e-12) pos += v;
    }
    expect(Math.abs(s - r.Q)).toBeLessThan(1e-12);
    expect(pos).toBeLessThan(1e-6);
  });

  it("a uniform field has Q = 0 and a 2x2 field is the smallest accepted", () => {
    // Common practice, no source.
    const u = vectorFieldFromInterleaved(
      new Array(12).fill(0).map((_, k) => (k % 3 === 2 ? 1 : 0)),
      { nx: 2, ny: 2 },
    );
    expect(skyrmionNumber(u).Q).toBe(0);
    const tiny = vectorFieldFromInterleaved([0, 0, 1, 0, 0, 1], { nx: 2, ny: 1, source: "tiny.npy" });
    expect(() => skyrmionNumber(tiny)).toThrow(/tiny\.npy = "2x1x1 cells".*at least 2x2x1 cells/);
    expect(() => skyrmionNumber(u, { boundary: "closed" as never })).toThrow(InputError);
    expect(() => skyrmionNumber(u, { layer: 1 })).toThrow(/layer/);
  });

  it("Q per layer of a stacked field", () => {
    // Common practice, no source: layers are independent 2D lattices.
    const a = skyrmionTexture({ nx: 32, ny: 32 }, { R: 6 * nm, w: 2 * nm });
    const b = antiskyrmionTexture({ nx: 32, ny: 32 }, { R: 6 * nm, w: 2 * nm });
    const m = new Float64Array(a.m.length * 2);
    m.set(a.m, 0);
    m.set(b.m, a.m.length);
    const f = vectorFieldFromInterleaved(m, { nx: 32, ny: 32, nz: 2, dx: nm });
    const q = skyrmionNumberPerLayer(f);
    expect(q[0]).toBeCloseTo(-1, 9);
    expect(q[1]).toBeCloseTo(1, 9);
  });

  it("vacuum cells: triangles touching vacuum are skipped; a skyrmion in a disk keeps Q near -1", () => {
    // Common practice, no source: masking removes only the vacuum part of the integral, which is tiny here.
    const f = textureOfObjects({ nx: 64, ny: 64, periodic: false }, [{ x: 32 * nm, y: 32 * nm, R: 8 * nm, w: 2 * nm }]);
    const m = f.m.slice();
    for (let j = 0; j < 64; j++) for (let i = 0; i < 64; i++) if ((i - 32) ** 2 + (j - 32) ** 2 > 30 * 30) m.fill(0, 3 * (j * 64 + i), 3 * (j * 64 + i) + 3);
    const d = vectorFieldFromInterleaved(m, { nx: 64, ny: 64, dx: nm });
    const r = skyrmionNumber(d);
    expect(d.vacuumCells).toBeGreaterThan(0);
    expect(r.closed).toBe(false);
    expect(r.trianglesSkipped).toBeGreaterThan(0);
    expect(Math.abs(r.Q + 1)).toBeLessThan(1e-4);
  });
});

function rotateField(f: VectorField, R: number[][]): VectorField {
  const m = new Float64Array(f.m.length);
  for (let c = 0; c < m.length; c += 3) {
    const x = f.m[c]!,
      y = f.m[c + 1]!,
      z = f.m[c + 2]!;
    for (let r = 0; r < 3; r++) m[c + r] = R[r]![0]! * x + R[r]![1]! * y + R[r]![2]! * z;
  }
  return vectorFieldFromInterleaved(m, f);
}

function rollField(f: VectorField, si: number, sj: number): VectorField {
  const m = new Float64Array(f.m.length);
  for (let j = 0; j < f.ny; j++)
    for (let i = 0; i < f.nx; i++) {
      const src = 3 * (j * f.nx + i),
        dst = 3 * (((j + sj) % f.ny) * f.nx + ((i + si) % f.nx));
      m[dst] = f.m[src]!;
      m[dst + 1] = f.m[src + 1]!;
      m[dst + 2] = f.m[src + 2]!;
    }
  return vectorFieldFromInterleaved(m, f);
}

describe("lattice skyrmion number: properties (fast-check)", () => {
  const small = { nx: 40, ny: 40, dx: nm };
  const base = skyrmionTexture(small, { R: 8 * nm, w: 2.5 * nm, helicity: 0.7 });

  it("is unchanged by global spin rotations", () => {
    // Source: the solid angle of a spherical triangle is invariant under rotations (Van Oosterom, Strackee 1983).
    fc.assert(
      fc.property(
        fc
          .tuple(
            fc.double({ min: -1, max: 1, noNaN: true }),
            fc.double({ min: -1, max: 1, noNaN: true }),
            fc.double({ min: -1, max: 1, noNaN: true }),
            fc.double({ min: -1, max: 1, noNaN: true }),
          )
          .filter((q) => Math.hypot(...q) > 0.1),
        (q) => {
          const r = skyrmionNumber(rotateField(base, rotationFromQuaternion(q)));
          expect(Math.abs(r.Q + 1)).toBeLessThan(1e-9);
        },
      ),
      { numRuns: 30 },
    );
  });

  it("is unchanged by translations on a periodic lattice (whole cells and sub-cell shifts of the texture)", () => {
    // Source: translation invariance of Q on a torus (the degree does not depend on the origin); common practice.
    fc.assert(
      fc.property(
        fc.integer({ min: 0, max: 39 }),
        fc.integer({ min: 0, max: 39 }),
        fc.double({ min: 0, max: 40, noNaN: true }),
        fc.double({ min: 0, max: 40, noNaN: true }),
        (si, sj, x, y) => {
          expect(Math.abs(skyrmionNumber(rollField(base, si, sj)).Q + 1)).toBeLessThan(1e-9);
          const moved = skyrmionTexture(small, { R: 8 * nm, w: 2.5 * nm, x: x * nm, y: y * nm });
          expect(Math.abs(skyrmionNumber(moved).Q + 1)).toBeLessThan(1e-9);
        },
      ),
      { numRuns: 30 },
    );
  });

  it("is unchanged by smooth deformations m -> (m + eps p) / |m + eps p|, |eps p| <= 0.5", () => {
    // Source: homotopy invariance of the degree (J. Milnor, Topology from the Differentiable Viewpoint, 1965):
    // m + t eps p never vanishes for |eps p| < 1, so the charge cannot change.
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 1e6 }), fc.double({ min: 0, max: 0.5, noNaN: true }), (seed, eps) => {
        const p = randomSmoothComponents(40, 40, seed, 3, 2);
        let max = 0;
        for (let c = 0; c < p.length; c += 3) max = Math.max(max, Math.hypot(p[c]!, p[c + 1]!, p[c + 2]!));
        const m = base.m.slice();
        for (let k = 0; k < m.length; k++) m[k]! += (eps * p[k]!) / max;
        expect(Math.abs(skyrmionNumber(vectorFieldFromInterleaved(m, base)).Q + 1)).toBeLessThan(1e-9);
      }),
      { numRuns: 30 },
    );
  });

  it("is an exact integer on closed lattices, even for rough random fields, on both lattice kinds", () => {
    // Source: Berg, Luescher (1981): the triangle solid angles tile a closed surface, so Sum Omega = 4 pi n.
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 1e6 }), fc.integer({ min: 3, max: 24 }), fc.boolean(), (seed, n, tri) => {
        const rnd = mulberry32(seed);
        const m = Float64Array.from({ length: 3 * n * n }, () => rnd() * 2 - 1);
        const r = skyrmionNumber(vectorFieldFromInterleaved(m, { nx: n, ny: n, lattice: tri ? "triangular" : "square" }));
        expect(r.distanceFromInteger).toBeLessThan(1e-9);
      }),
      { numRuns: 50 },
    );
  });
});

describe("lattice skyrmion number against Debian's numpy (same formula, same random smooth fields)", () => {
  it("total and per-plaquette density agree to 1e-10 (square/triangular, periodic/open, with vacuum)", () => {
    // Source: oracle = numpy 1.24 (python3-numpy) running the Berg-Luescher formula vectorized, independently
    // normalizing the raw components.
    const cases: Array<{ nx: number; ny: number; lattice: "square" | "triangular"; boundary: "periodic" | "open"; vacuum: boolean; m: number[] }> = [];
    let seed = 11;
    for (const lattice of ["square", "triangular"] as const) {
      for (const boundary of ["periodic", "open"] as const) {
        for (const vacuum of [false, true]) {
          const nx = 24 + (seed % 7),
            ny = 19 + (seed % 5);
          const raw = randomSmoothComponents(nx, ny, seed++, 5, 2, [0, 0, 0.4]);
          if (vacuum) {
            const rnd = mulberry32(seed * 7);
            for (let c = 0; c < nx * ny; c++) if (rnd() < 0.1) raw.fill(0, 3 * c, 3 * c + 3);
          }
          cases.push({ nx, ny, lattice, boundary, vacuum, m: Array.from(raw) });
        }
      }
    }
    const ref = runPython<Array<{ Q: number; density: number[] }>>(
      `
import json, sys
import numpy as np
out = []
for c in json.load(sys.stdin):
    nx, ny = c["nx"], c["ny"]
    m = np.array(c["m"], dtype=float).reshape(ny, nx, 3)
    norm = np.linalg.norm(m, axis=-1)
    vac = ~(norm > 1e-6 * norm.max())
    m = np.where(vac[..., None], 0.0, m / np.where(vac, 1.0, norm)[..., None])
    sh = lambda x, di, dj: np.roll(np.roll(x, -dj, axis=0), -di, axis=1)
    a, b, cc, d = m, sh(m, 1, 0), sh(m, 1, 1), sh(m, 0, 1)
    va, vb, vc, vd = vac, sh(vac, 1, 0), sh(vac, 1, 1), sh(vac, 0, 1)
    def omega(p, q, r, ok):
        t = np.einsum("...i,...i", p, np.cross(q, r))
        den = 1 + (p * q).sum(-1) + (q * r).sum(-1) + (r * p).sum(-1)
        return np.where(ok, 2 * np.arctan2(t, den), 0.0)
    if c["lattice"] == "triangular":
        w = omega(a, b, d, ~(va | vb | vd)) + omega(b, cc, d, ~(vb | vc | vd))
    else:
        w = omega(a, b, cc, ~(va | vb | vc)) + omega(a, cc, d, ~(va | vc | vd))
    if c["boundary"] == "open":
        w = w[:-1, :-1]
    q = w / (4 * np.pi)
    out.append({"Q": float(q.sum()), "density": q.ravel().tolist()})
print(json.dumps(out))
`,
      cases,
    );
    cases.forEach((c, k) => {
      const f = vectorFieldFromInterleaved(c.m, { nx: c.nx, ny: c.ny, lattice: c.lattice });
      expect(f.vacuumCells > 0).toBe(c.vacuum);
      const r = skyrmionNumber(f, { boundary: c.boundary, density: true });
      expect(Math.abs(r.Q - ref[k]!.Q), `case ${k}`).toBeLessThan(1e-10);
      const d = r.density!.charge;
      expect(d.length).toBe(ref[k]!.density.length);
      let maxDiff = 0;
      for (let p = 0; p < d.length; p++) maxDiff = Math.max(maxDiff, Math.abs(d[p]! - ref[k]!.density[p]!));
      expect(maxDiff, `case ${k}`).toBeLessThan(1e-10);
      // the fast path (total only, no mask, square) agrees with the general path
      if (!c.vacuum && c.lattice === "square") expect(Math.abs(skyrmionNumber(f, { boundary: c.boundary }).Q - r.Q)).toBeLessThan(1e-12);
    });
    // open-boundary random fields are not integers: the oracle comparison is not trivially 0 = 0
    expect(ref.some((r) => Math.abs(r.Q - Math.round(r.Q)) > 1e-3)).toBe(true);
  });
});

describe("lattice skyrmion number: the grouped fast path (16 plaquettes a shared atan2) against numpy", () => {
  it("agrees to 1e-12 with two arctan2 a plaquette on a rough field (large and antipodal angles) and a smooth fine one", () => {
    // Source: oracle = Debian's numpy running the Berg-Luescher formula with one arctan2 per triangle
    // (B. Berg, M. Luescher, Nucl. Phys. B 190, 412 (1981)), on the same unit vectors.
    const rnd = mulberry32(2024);
    const cases: Array<{ nx: number; ny: number; m: number[] }> = [];
    // rough: independent random directions, so many plaquettes exceed pi/16 and some denominators are <= 0
    {
      const nx = 37,
        ny = 29;
      const m: number[] = [];
      for (let c = 0; c < nx * ny; c++) {
        const z = 2 * rnd() - 1,
          ph = 2 * Math.PI * rnd(),
          s = Math.sqrt(1 - z * z);
        m.push(s * Math.cos(ph), s * Math.sin(ph), z);
      }
      cases.push({ nx, ny, m });
    }
    // smooth and finely sampled: almost every plaquette below pi/16, long groups of 16
    {
      const nx = 160,
        ny = 96;
      const raw = randomSmoothComponents(nx, ny, 77, 4, 2, [0, 0, 0.3]);
      const m: number[] = [];
      for (let c = 0; c < nx * ny; c++) {
        const x = raw[3 * c]!,
          y = raw[3 * c + 1]!,
          z = raw[3 * c + 2]!,
          r = Math.hypot(x, y, z);
        m.push(x / r, y / r, z / r);
      }
      cases.push({ nx, ny, m });
    }
    // coarse dense skyrmion lattice (period 6 cells): runs of neighbouring plaquettes with large angles of
    // one sign, whose sum over 16 plaquettes would wrap past pi if the grouping bound were wrong
    {
      const f = skyrmionLatticeTexture({ nx: 48, ny: 48, dx: 1e-9 }, { a: 6e-9, R: 1.5e-9, w: 0.8e-9, helicity: 0.3 });
      cases.push({ nx: 48, ny: 48, m: Array.from(f.m) });
    }
    const ref = runPython<number[]>(
      `
import json, sys
import numpy as np
out = []
for c in json.load(sys.stdin):
    m = np.array(c["m"], dtype=float).reshape(c["ny"], c["nx"], 3)
    sh = lambda x, di, dj: np.roll(np.roll(x, -dj, axis=0), -di, axis=1)
    a, b, cc, d = m, sh(m, 1, 0), sh(m, 1, 1), sh(m, 0, 1)
    def omega(p, q, r):
        t = np.einsum("...i,...i", p, np.cross(q, r))
        den = 1 + (p * q).sum(-1) + (q * r).sum(-1) + (r * p).sum(-1)
        return 2 * np.arctan2(t, den)
    out.append(float((omega(a, b, cc) + omega(a, cc, d)).sum() / (4 * np.pi)))
print(json.dumps(out))
`,
      cases,
    );
    cases.forEach((c, k) => {
      const f = vectorFieldFromInterleaved(c.m, { nx: c.nx, ny: c.ny });
      const q = skyrmionNumber(f, { boundary: "periodic" }).Q;
      expect(Math.abs(q - ref[k]!), `case ${k}: Q = ${q}, numpy ${ref[k]}`).toBeLessThan(1e-12);
      // closed lattice: an integer
      expect(Math.abs(q - Math.round(q))).toBeLessThan(1e-12);
    });
  });
});
