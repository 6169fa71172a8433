import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { estimateNoiseLevel, findVortices, selectRank } from "../../../lib/src/topology/vortices.js";
import { vortexPairTexture } from "../../../lib/src/topology/textures.js";
import { vectorFieldFromFunction, vectorFieldFromInterleaved } from "../../../lib/src/topology/field.js";
import { mulberry32 } from "./randomFields.js";

const nm = 1e-9;

describe("vortices and antivortices by plaquette winding", () => {
  it("a vortex-antivortex pair: signs and positions (to half a cell)", () => {
    // Source: winding +1 of Phi = atan2(y, x) around its centre and -1 of -atan2 (N. D. Mermin, Rev. Mod. Phys. 51, 591 (1979)).
    const f = vortexPairTexture({ nx: 60, ny: 40 }, { vortex: [15.3 * nm, 20.6 * nm], antivortex: [44.2 * nm, 18.1 * nm], angle: 0.4 });
    const r = findVortices(f, { boundary: "open" });
    expect(r.vortices).toBe(1);
    expect(r.antivortices).toBe(1);
    const v = r.sites.find((s) => s.winding === 1)!,
      a = r.sites.find((s) => s.winding === -1)!;
    expect(Math.abs(v.x - 15.3 * nm)).toBeLessThan(0.5 * nm);
    expect(Math.abs(v.y - 20.6 * nm)).toBeLessThan(0.5 * nm);
    expect(Math.abs(a.x - 44.2 * nm)).toBeLessThan(0.5 * nm);
    expect(Math.abs(a.y - 18.1 * nm)).toBeLessThan(0.5 * nm);
  });

  it("core polarities are reported and meron charges follow Q = v p / 2", async () => {
    // Source: meron charge v p / 2 from Q = (v/2)[cos T(0) - cos T(inf)] with T(inf) = pi/2 (derivation in objects.ts).
    const { skyrmionNumber } = await import("../../../lib/src/topology/skyrmionNumber.js");
    const f = vortexPairTexture(
      { nx: 160, ny: 100 },
      { vortex: [50.3 * nm, 50.4 * nm], antivortex: [110.2 * nm, 50.1 * nm], coreRadius: 4 * nm, vortexPolarity: 1, antivortexPolarity: -1 },
    );
    const r = findVortices(f, { boundary: "open" });
    expect(r.sites.find((s) => s.winding === 1)!.mz).toBeGreaterThan(0.5);
    expect(r.sites.find((s) => s.winding === -1)!.mz).toBeLessThan(-0.5);
    // (1 * 1 + (-1) * (-1)) / 2 = 1, up to the in-plane far field cut by the open box
    expect(Math.abs(skyrmionNumber(f, { boundary: "open" }).Q - 1)).toBeLessThan(0.02);
    const same = vortexPairTexture(
      { nx: 160, ny: 100 },
      { vortex: [50.3 * nm, 50.4 * nm], antivortex: [110.2 * nm, 50.1 * nm], coreRadius: 4 * nm, vortexPolarity: 1, antivortexPolarity: 1 },
    );
    expect(Math.abs(skyrmionNumber(same, { boundary: "open" }).Q)).toBeLessThan(0.02);
  });

  it("windings add up to 0 on a closed lattice (random in-plane fields, both lattice kinds)", () => {
    // Source: on a torus every edge difference enters two plaquettes with opposite signs (common practice, no source).
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 1e6 }), fc.boolean(), (seed, tri) => {
        const rnd = mulberry32(seed);
        const m = Float64Array.from({ length: 3 * 12 * 10 }, (_, k) => (k % 3 === 2 ? 0 : rnd() * 2 - 1));
        // every site has a direction here: the noise (4) and zero-line (5) rules are off to test the plaquette bookkeeping
        const r = findVortices(vectorFieldFromInterleaved(m, { nx: 12, ny: 10, lattice: tri ? "triangular" : "square" }), { noise: 0, zeroLineAngle: Math.PI });
        expect(r.totalWinding).toBe(0);
        // with the rules on, what they take out is booked with the background: the torus total stays 0
        const on = findVortices(vectorFieldFromInterleaved(m, { nx: 12, ny: 10, lattice: tri ? "triangular" : "square" }));
        if (on.backgroundWinding !== null) expect(on.totalWinding + on.backgroundWinding).toBe(0);
        expect(r.vortices + r.antivortices).toBe(r.sites.length);
      }),
      { numRuns: 40 },
    );
  });

  it("a vortex of winding 2 (seen as two unit windings in neighbouring plaquettes) and a vortex on a triangular lattice", () => {
    // Source: Phi = 2 atan2(y, x) winds twice (Mermin 1979). Four wrapped steps, each < pi, sum to less than 4 pi,
    // so one square plaquette holds |w| <= 1 and the winding-2 defect spreads over neighbouring plaquettes.
    const g = { nx: 30, ny: 30, dx: nm };
    const f = vectorFieldFromFunction(g, (x, y) => {
      const p = 2 * Math.atan2(y - 15.4 * nm, x - 14.7 * nm);
      return [Math.cos(p), Math.sin(p), 0];
    });
    const r = findVortices(f, { boundary: "open" });
    expect(r.sites.reduce((s, x) => s + x.winding, 0)).toBe(2);
    for (const x of r.sites) expect(Math.hypot(x.x - 14.7 * nm, x.y - 15.4 * nm)).toBeLessThan(1.5 * nm);
    const t = vectorFieldFromFunction({ ...g, lattice: "triangular" }, (x, y) => {
      const p = Math.atan2(y - 12.2 * nm, x - 20.1 * nm);
      return [Math.cos(p), Math.sin(p), 0];
    });
    const rt = findVortices(t, { boundary: "open" });
    expect(rt.sites.length).toBe(1);
    expect(Math.hypot(rt.sites[0]!.x - 20.1 * nm, rt.sites[0]!.y - 12.2 * nm)).toBeLessThan(0.6 * nm);
  });

  it("plaquettes without an in-plane direction are skipped and counted", () => {
    const f = vectorFieldFromInterleaved([0, 0, 1, 1, 0, 0, 0, 1, 0, -1, 0, 0], { nx: 2, ny: 2 });
    expect(findVortices(f, { boundary: "open" }).skipped).toBe(1);
  });
});

// ---------------------------------------------------------------------------------------------
// Cores where m_xy vanishes on a lattice site (rule 3 in vortices.ts).

import { runPython } from "../../helpers/python.js";
import { runCalculator } from "../../../lib/src/calculators/spec.js";
import { textureSpec } from "../../../lib/src/calculators/topology.js";
import type { VectorField } from "../../../lib/src/topology/field.js";

/**
 * m = (cos(phi) sin(theta), sin(phi) sin(theta), cos(theta)) with phi = v * alpha + gamma around each
 * centre and theta = pi (1 - rho / Rc) inside rho < Rc, 0 outside (background exactly +z), on a
 * square grid of 1 nm cells. Centres in cells.
 */
function analyticSkyrmions(nx: number, ny: number, centres: Array<[number, number]>, opts: { v?: number; gamma?: number; Rc?: number; periodic?: boolean } = {}): VectorField {
  const v = opts.v ?? 1,
    gamma = opts.gamma ?? 0,
    Rc = opts.Rc ?? 8;
  return vectorFieldFromFunction({ nx, ny, dx: nm }, (x, y) => {
    for (const [cx, cy] of centres) {
      let X = x / nm - cx,
        Y = y / nm - cy;
      if (opts.periodic) {
        X -= nx * Math.round(X / nx);
        Y -= ny * Math.round(Y / ny);
      }
      const rho = Math.hypot(X, Y);
      if (rho < Rc) {
        const theta = Math.PI * (1 - rho / Rc),
          phi = v * Math.atan2(Y, X) + gamma;
        return [Math.cos(phi) * Math.sin(theta), Math.sin(phi) * Math.sin(theta), Math.cos(theta)];
      }
    }
    return [0, 0, 1];
  });
}

/** Numpy oracle: exact degree of the bilinear interpolant of (m_x, m_y) around cells shifted by a quarter cell. */
const ORACLE = String.raw`
import sys, json, numpy as np
d = json.load(sys.stdin)
res = []
for f in d["fields"]:
    nx, ny, per = f["nx"], f["ny"], f["periodic"]
    m = np.array(f["m"], dtype=float).reshape(ny, nx, 3)
    mx, my = m[..., 0], m[..., 1]
    def interp(px, py):
        i0 = np.floor(px).astype(int); j0 = np.floor(py).astype(int)
        tx = px - i0; ty = py - j0
        i1, j1 = i0 + 1, j0 + 1
        if per:
            i0, i1, j0, j1 = i0 % nx, i1 % nx, j0 % ny, j1 % ny
        w00, w10, w01, w11 = (1-tx)*(1-ty), tx*(1-ty), (1-tx)*ty, tx*ty
        return (mx[j0,i0]*w00 + mx[j0,i1]*w10 + mx[j1,i0]*w01 + mx[j1,i1]*w11,
                my[j0,i0]*w00 + my[j0,i1]*w10 + my[j1,i0]*w01 + my[j1,i1]*w11)
    s = 0.25
    ci = np.arange(nx if per else nx - 2); cj = np.arange(ny if per else ny - 2)
    I, J = np.meshgrid(ci, cj)
    I = I.astype(float); J = J.astype(float)
    # counterclockwise loop; every segment runs along x or y inside one grid cell, where the
    # bilinear interpolant is linear, so its direction turns along the shorter arc
    loop = [(s, s), (1, s), (1 + s, s), (1 + s, 1), (1 + s, 1 + s), (1, 1 + s), (s, 1 + s), (s, 1)]
    vx, vy = zip(*[interp(I + a, J + b) for (a, b) in loop])
    vx, vy = np.array(vx), np.array(vy)
    mag = np.hypot(vx, vy)
    ang = np.arctan2(vy, vx)
    dif = np.roll(ang, -1, axis=0) - ang
    dif = (dif + np.pi) % (2 * np.pi) - np.pi
    w = np.rint(dif.sum(axis=0) / (2 * np.pi)).astype(int)
    w[(mag < 1e-9).any(axis=0)] = 0  # loop through a zero of the interpolant (background): not counted
    res.append({"vortices": int((w > 0).sum()), "antivortices": int((w < 0).sum()), "total": int(w.sum())})
print(json.dumps(res))
`;

describe("cores on lattice sites, background regions", () => {
  const rnd = mulberry32(20240611);
  const randomOffsets: Array<[number, number]> = [
    [rnd(), rnd()],
    [rnd(), rnd()],
  ];
  const offsets: Array<[string, [number, number]]> = [
    ["on a site", [0, 0]],
    ["at a half-site offset", [0.5, 0.5]],
    ...randomOffsets.map((o, k): [string, [number, number]] => [`at random offset ${k}`, o]),
  ];
  const kinds = [
    { name: "Neel skyrmion", v: 1, gamma: 0 },
    { name: "Bloch skyrmion", v: 1, gamma: Math.PI / 2 },
    { name: "antiskyrmion", v: -1, gamma: 0.3 },
  ];

  for (const kind of kinds) {
    for (const [label, [ox, oy]] of offsets) {
      it(`${kind.name} ${label}: exactly one defect of winding v`, () => {
        // Source: the in-plane winding of m = (cos phi sin theta, sin phi sin theta, cos theta) with
        // phi = v alpha + gamma around the core is v (common practice; Mermin 1979 for the winding).
        const cx = 24 + ox,
          cy = 23 + oy;
        for (const boundary of ["open", "periodic"] as const) {
          const f = analyticSkyrmions(48, 46, [[cx, cy]], { v: kind.v, gamma: kind.gamma, periodic: boundary === "periodic" });
          const r = findVortices(f, { boundary });
          expect(r.sites.length).toBe(1);
          expect(r.sites[0]!.winding).toBe(kind.v);
          expect(r.vortices).toBe(kind.v > 0 ? 1 : 0);
          expect(r.antivortices).toBe(kind.v < 0 ? 1 : 0);
          expect(Math.hypot(r.sites[0]!.x / nm - cx, r.sites[0]!.y / nm - cy)).toBeLessThan(0.75);
          expect(r.sites[0]!.mz).toBeLessThan(-0.9);
          if (ox === 0 && oy === 0) {
            expect(r.sites[0]!.coreSites).toBe(1);
            expect(r.sites[0]!.x / nm).toBeCloseTo(cx, 9);
            expect(r.sites[0]!.y / nm).toBeCloseTo(cy, 9);
          }
          // Source: on a torus the windings of all loops add up to 0 (every edge enters two loops
          // with opposite signs; common practice, no source): the background carries -v.
          if (boundary === "periodic") expect(r.backgroundWinding).toBe(-kind.v);
          else expect(r.backgroundWinding).toBeNull();
        }
      });
    }
  }

  it("three skyrmions with cores on sites, periodic: three vortices, the background balances them", () => {
    // Source: winding v = 1 per core (as above); the torus sum 0 (common practice, no source).
    const f = analyticSkyrmions(
      96,
      96,
      [
        [20, 20],
        [70, 25],
        [45, 70],
      ],
      { periodic: true },
    );
    const r = findVortices(f, { boundary: "periodic" });
    expect(r.vortices).toBe(3);
    expect(r.antivortices).toBe(0);
    expect(r.sites.every((s) => s.coreSites === 1 && s.winding === 1)).toBe(true);
    expect(r.sites.map((s) => [s.i, s.j]).sort((a, b) => a[0]! - b[0]!)).toEqual([
      [20, 20],
      [45, 70],
      [70, 25],
    ]);
    expect(r.backgroundWinding).toBe(-3);
    expect(r.backgroundRegions).toBe(1);
  });

  it("a vortex-antivortex pair in an in-plane film, cores on sites: one of each, at the sites", () => {
    // Source: winding +1 of atan2(y, x) and -1 of -atan2 around their centres (Mermin 1979).
    const f = vortexPairTexture({ nx: 60, ny: 40 }, { vortex: [15 * nm, 20 * nm], antivortex: [44 * nm, 18 * nm], coreRadius: 2 * nm, vortexPolarity: 1, antivortexPolarity: -1 });
    const r = findVortices(f, { boundary: "open" });
    expect(r.vortices).toBe(1);
    expect(r.antivortices).toBe(1);
    const v = r.sites.find((s) => s.winding === 1)!,
      a = r.sites.find((s) => s.winding === -1)!;
    expect([v.i, v.j, v.coreSites]).toEqual([15, 20, 1]);
    expect([a.i, a.j, a.coreSites]).toEqual([44, 18, 1]);
    expect(v.mz).toBeCloseTo(1, 9);
    expect(a.mz).toBeCloseTo(-1, 9);
  });

  it("regions without in-plane direction: a uniform domain and stripe domains give no vortex; a flat core counts once", () => {
    // Common practice, no source: m_xy = 0 has no direction, so a uniform region carries no defect.
    const up = vectorFieldFromFunction({ nx: 12, ny: 10 }, () => [0, 0, 1]);
    for (const boundary of ["open", "periodic"] as const) {
      const r = findVortices(up, { boundary });
      expect(r.sites.length).toBe(0);
      expect(r.backgroundRegions).toBe(1);
      expect(r.skipped).toBe(boundary === "open" ? 11 * 9 : 120);
    }
    expect(findVortices(up, { boundary: "periodic" }).backgroundWinding).toBe(0);
    // +z / -z stripes with one-cell in-plane walls (Bloch walls along y), periodic
    const stripes = vectorFieldFromFunction({ nx: 24, ny: 10, dx: nm }, (x) => {
      const i = Math.round(x / nm) % 12;
      return i === 0 ? [0, 1, 0] : i === 6 ? [0, -1, 0] : i < 6 ? [0, 0, 1] : [0, 0, -1];
    });
    const rs = findVortices(stripes, { boundary: "periodic" });
    expect(rs.sites.length).toBe(0);
    expect(rs.backgroundWinding).toBe(0);
    // an in-plane vortex whose core is exactly +z on every site within 2.5 cells: one core of 21 sites
    const flat = vectorFieldFromFunction({ nx: 30, ny: 30, dx: nm }, (x, y) => {
      const X = x / nm - 15,
        Y = y / nm - 14;
      if (Math.hypot(X, Y) < 2.5) return [0, 0, 1];
      const p = Math.atan2(Y, X) + 0.7;
      return [Math.cos(p), Math.sin(p), 0];
    });
    const rf = findVortices(flat, { boundary: "open" });
    expect(rf.sites.length).toBe(1);
    expect(rf.sites[0]!.winding).toBe(1);
    expect(rf.sites[0]!.coreSites).toBe(21); // Source: lattice points with X^2 + Y^2 < 6.25 (count by hand: 1 + 4 + 4 + 4 + 8)
    expect(rf.sites[0]!.x / nm).toBeCloseTo(15, 9);
    expect(rf.sites[0]!.y / nm).toBeCloseTo(14, 9);
  });

  it("an isolated site without direction: its core winding is the sum of the four plaquettes it replaces, and the torus total stays 0", () => {
    // Source: the border of the four plaquettes around a site is its ring of 8 neighbours; the inner
    // edges cancel, so the ring winding is their sum for any direction at the centre (common practice, no source).
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 1e6 }), fc.integer({ min: 0, max: 11 }), fc.integer({ min: 0, max: 9 }), (seed, si, sj) => {
        const r0 = mulberry32(seed);
        const nx = 12,
          ny = 10;
        const m = Float64Array.from({ length: 3 * nx * ny }, (_, q) => (q % 3 === 2 ? 0 : r0() * 2 - 1));
        const c = sj * nx + si;
        const zeroed = Float64Array.from(m);
        zeroed[3 * c] = 0;
        zeroed[3 * c + 1] = 0;
        zeroed[3 * c + 2] = 1;
        // bookkeeping of rule 3 alone: random directions, so the noise (4) and zero-line (5) rules are off
        const raw = { noise: 0, zeroLineAngle: Math.PI };
        const full = findVortices(vectorFieldFromInterleaved(m, { nx, ny }), raw);
        const cut = findVortices(vectorFieldFromInterleaved(zeroed, { nx, ny }), raw);
        const touches = (s: { i: number; j: number }) => (s.i === si || s.i === (si + nx - 1) % nx) && (s.j === sj || s.j === (sj + ny - 1) % ny);
        const around = full.sites.filter(touches).reduce((t, s) => t + s.winding, 0);
        const core = cut.sites.filter((s) => s.coreSites > 0);
        expect(core.reduce((t, s) => t + s.winding, 0)).toBe(around);
        expect(core.every((s) => s.i === si && s.j === sj)).toBe(true);
        const key = (s: { i: number; j: number; winding: number }) => `${s.i},${s.j},${s.winding}`;
        expect(
          cut.sites
            .filter((s) => s.coreSites === 0)
            .map(key)
            .sort(),
        ).toEqual(
          full.sites
            .filter((s) => !touches(s))
            .map(key)
            .sort(),
        );
        expect(cut.totalWinding + cut.backgroundWinding!).toBe(0);
      }),
      { numRuns: 40 },
    );
  });

  it("random clusters of sites without direction on a torus: totalWinding + backgroundWinding = 0 (both lattice kinds)", () => {
    // Source: on a torus every edge enters two loops with opposite signs (common practice, no source).
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 1e6 }), fc.boolean(), (seed, tri) => {
        const r0 = mulberry32(seed);
        const nx = 14,
          ny = 12;
        const m = Float64Array.from({ length: 3 * nx * ny }, (_, q) => (q % 3 === 2 ? 0 : r0() * 2 - 1));
        for (let c = 0; c < nx * ny; c++)
          if (r0() < 0.25) {
            m[3 * c] = 0;
            m[3 * c + 1] = 1e-5 * r0();
            m[3 * c + 2] = r0() < 0.5 ? 1 : -1;
          }
        const r = findVortices(vectorFieldFromInterleaved(m, { nx, ny, lattice: tri ? "triangular" : "square" }));
        expect(r.totalWinding + r.backgroundWinding!).toBe(0);
        expect(r.vortices + r.antivortices).toBe(r.sites.length);
      }),
      { numRuns: 40 },
    );
  });

  it("counts agree with a numpy oracle (degree of the bilinear interpolant on a quarter-cell shifted grid)", () => {
    // Source: Debian numpy as an independent oracle; the shifted loops never pass through a lattice
    // site or a plaquette centre, so on-site and half-site cores are both inside one oracle cell.
    const cases: Array<{ field: VectorField; periodic: boolean }> = [];
    for (const kind of kinds) {
      for (const [, [ox, oy]] of offsets) cases.push({ field: analyticSkyrmions(40, 40, [[20 + ox, 19 + oy]], { v: kind.v, gamma: kind.gamma }), periodic: false });
    }
    cases.push({
      field: analyticSkyrmions(
        96,
        96,
        [
          [20, 20],
          [70, 25],
          [45, 70],
        ],
        { periodic: true },
      ),
      periodic: true,
    });
    cases.push({
      field: vortexPairTexture({ nx: 60, ny: 40 }, { vortex: [15 * nm, 20 * nm], antivortex: [44 * nm, 18 * nm], coreRadius: 2 * nm, vortexPolarity: 1, antivortexPolarity: -1 }),
      periodic: false,
    });
    // an in-plane film with five vortices and antivortices at random places, three snapped onto sites
    const r1 = mulberry32(7);
    const defects = Array.from({ length: 5 }, (_, q) => {
      let x = 8 + q * 11 + r1() * 3,
        y = 8 + r1() * 30;
      if (q % 2 === 0) {
        x = Math.round(x);
        y = Math.round(y);
      }
      return { x, y, s: q % 3 === 1 ? -1 : 1 };
    });
    cases.push({
      periodic: false,
      field: vectorFieldFromFunction({ nx: 66, ny: 46, dx: nm }, (x, y) => {
        let p = 0,
          amp = 1;
        for (const d of defects) {
          const X = x / nm - d.x,
            Y = y / nm - d.y;
          p += d.s * Math.atan2(Y, X);
          amp *= Math.tanh(Math.hypot(X, Y) / 2);
        }
        return [amp * Math.cos(p), amp * Math.sin(p), Math.sqrt(Math.max(0, 1 - amp * amp))];
      }),
    });
    const oracle = runPython<Array<{ vortices: number; antivortices: number; total: number }>>(ORACLE, {
      fields: cases.map((c) => ({ nx: c.field.nx, ny: c.field.ny, periodic: c.periodic, m: Array.from(c.field.m) })),
    });
    cases.forEach((c, q) => {
      const r = findVortices(c.field, { boundary: c.periodic ? "periodic" : "open" });
      expect({ q, vortices: r.vortices, antivortices: r.antivortices, total: r.totalWinding }).toEqual({ q, ...oracle[q] });
    });
    // and the film with five defects really has 3 vortices and 2 antivortices (by construction)
    expect(oracle[cases.length - 1]).toEqual({ vortices: 3, antivortices: 2, total: 1 });
  });

  it("the texture calculator on its defaults: one skyrmion, one vortex, no antivortex", () => {
    // Source: one skyrmion of vorticity 1 has in-plane winding +1 around its core (as above).
    const r = runCalculator(textureSpec, {});
    expect(r.outputs.objectCount!.value).toBe(1);
    expect(r.outputs.vortexCount!.value).toBe(1);
    expect(r.outputs.antivortexCount!.value).toBe(0);
    expect(r.notes.join(" ")).toMatch(/in-plane winding -1 sits in the background/);
    const anti = runCalculator(textureSpec, { kind: 1 });
    expect([anti.outputs.vortexCount!.value, anti.outputs.antivortexCount!.value]).toEqual([0, 1]);
  });
});

describe("vortex counts where the in-plane direction is undefined: noise and zero lines (numpy oracle)", () => {
  // Source: the winding of an order parameter around a loop (N. D. Mermin, Rev. Mod. Phys. 51, 591
  // (1979)); oracle: numpy builds the noisy fields (numpy.random.default_rng), reports the standard
  // deviation of the noise it added and the winding of the noise-free field around a large loop
  // (np.unwrap of the in-plane angle); for the skyrmionium it reads our field and unwraps the angle on
  // circles inside the inner ring and between the rings (bilinear sampling in numpy).
  const n = 96;
  const ref = runPython<{ sat: number[]; vort: number[]; sigmaSat: number; sigmaVort: number; windVort: number }>(`
import json, sys
import numpy as np
n = ${n}
rng = np.random.default_rng(7)
def norm(m):
    return m / np.linalg.norm(m, axis=-1, keepdims=True)
# saturated film + noise 0.1 on every component
clean = np.zeros((n, n, 3)); clean[..., 2] = 1
noise = 0.1 * rng.standard_normal((n, n, 3))
sat = norm(clean + noise)
sigma_sat = float(np.std((sat - clean)[..., :2]))
# in-plane vortex with an out-of-plane core (radius 4 cells) + noise 0.05
y, x = np.mgrid[0:n, 0:n] - (n - 1) / 2 + 0.31
r = np.hypot(x, y); th = np.where(r < 4, np.pi / 2 * r / 4, np.pi / 2)
v = np.stack([-y / np.maximum(r, 1e-12) * np.sin(th), x / np.maximum(r, 1e-12) * np.sin(th), np.cos(th)], -1)
noise2 = 0.05 * rng.standard_normal((n, n, 3))
vn = norm(v + noise2)
sigma_v = float(np.std((vn - v)[..., :2]))
# winding of the clean vortex on a circle of radius 30 cells
a = np.linspace(0, 2 * np.pi, 721)
# on the circle (x, y) = 30 (cos a, sin a): m_xy is proportional to (-y, x)
ph = np.unwrap(np.arctan2(30 * np.cos(a), -30 * np.sin(a)))
wind = round((ph[-1] - ph[0]) / (2 * np.pi))
print(json.dumps({"sat": sat.reshape(-1).tolist(), "vort": vn.reshape(-1).tolist(), "sigmaSat": sigma_sat, "sigmaVort": sigma_v, "windVort": wind}))
`);
  const field = (data: number[]) => vectorFieldFromInterleaved(Float64Array.from(data), { nx: n, ny: n, dx: nm });

  it("noise 0.1 on a saturated film: the noise is estimated (within 10 % of numpy's) and gives no vortices", () => {
    const f = field(ref.sat);
    const r = findVortices(f, { boundary: "open" });
    expect(Math.abs(r.noiseLevel / ref.sigmaSat - 1)).toBeLessThan(0.1);
    expect(r.minInPlane).toBeCloseTo(Math.min(0.5, 4 * r.noiseLevel), 12);
    expect(r.vortices + r.antivortices).toBe(0);
    // with the scaling switched off the same field is read as a sea of vortices and antivortices
    const off = findVortices(f, { boundary: "open", noise: 0, minInPlane: 1e-3 });
    expect(off.vortices + off.antivortices).toBeGreaterThan(0);
  });

  it("a vortex in noise 0.05: exactly the one vortex numpy's clean field has", () => {
    expect(ref.windVort).toBe(1);
    const r = findVortices(field(ref.vort), { boundary: "open" });
    // the texture's own curvature adds to the second differences: the estimate is within 30 % here
    expect(Math.abs(r.noiseLevel / ref.sigmaVort - 1)).toBeLessThan(0.3);
    expect(r.vortices).toBe(1);
    expect(r.antivortices).toBe(0);
  });

  it("skyrmionium: one vortex at the centre and one zero line (the middle ring), no artefacts; numpy unwraps the windings", async () => {
    const { textureFromInputs } = await import("../../../lib/src/calculators/topology.js");
    const { getCalculator } = await import("../../../lib/src/calculators/index.js");
    const spec = getCalculator("texture");
    const v = Object.fromEntries(spec.inputs.map((i) => [i.name, i.default])) as Record<string, number>;
    v.kind = 2;
    v.boundary = 1;
    const f = textureFromInputs(v);
    const r = findVortices(f, { boundary: "open" });
    // numpy: winding of m_xy on circles of radius 0.25 R and 0.75 R about the centre (inside the inner ring, R_inner = R / 2, and between the rings)
    const o = runPython<{ w: number[] }>(
      `
import json, sys
import numpy as np
d = json.load(sys.stdin); n = d["n"]; m = np.array(d["m"]).reshape(n, n, 3)
c = (n - 1) / 2 if d["centre"] is None else d["centre"]
out = []
for rad in d["radii"]:
    a = np.linspace(0, 2 * np.pi, 2001)
    xs = c + rad * np.cos(a); ys = c + rad * np.sin(a)
    i0 = np.floor(xs).astype(int); j0 = np.floor(ys).astype(int); fx = xs - i0; fy = ys - j0
    def bil(q):
        return (q[j0, i0] * (1 - fx) * (1 - fy) + q[j0, i0 + 1] * fx * (1 - fy) + q[j0 + 1, i0] * (1 - fx) * fy + q[j0 + 1, i0 + 1] * fx * fy)
    ph = np.unwrap(np.arctan2(bil(m[..., 1]), bil(m[..., 0])))
    out.append(int(round((ph[-1] - ph[0]) / (2 * np.pi))))
print(json.dumps({"w": out}))
`,
      { n: f.nx, m: Array.from(f.m), centre: null, radii: [(0.25 * v.R!) / v.cell!, (0.75 * v.R!) / v.cell!] },
    );
    expect(o.w[0]).toBe(1);
    const centreVortices = r.sites.filter((s) => s.winding === 1);
    expect(r.vortices).toBe(o.w[0]);
    expect(r.antivortices).toBe(0);
    expect(r.zeroLines).toBeGreaterThanOrEqual(1);
    const L = f.nx * f.dx;
    expect(Math.hypot(centreVortices[0]!.x - L / 2, centreVortices[0]!.y - L / 2)).toBeLessThan(2 * f.dx);
  });
});

describe("noise level and its median selection", () => {
  it("selectRank gives numpy.partition's element of each rank; estimateNoiseLevel the median formula of rule 4 on numpy's median", () => {
    // Oracle: numpy.partition (introselect) and numpy.median of the same second differences
    // (Debian's numpy through test/helpers/python.ts); sigma = median / (0.6745 sqrt 6) as documented.
    const rnd = mulberry32(5);
    const nx = 37,
      ny = 23;
    const m = new Float64Array(3 * nx * ny);
    for (let c = 0; c < nx * ny; c++) {
      const i = c % nx,
        j = Math.floor(c / nx);
      const x = Math.cos(0.2 * i + 0.1 * j) + 0.02 * (rnd() - 0.5),
        y = Math.sin(0.2 * i + 0.1 * j) + 0.02 * (rnd() - 0.5),
        z = 0.3;
      const n = Math.hypot(x, y, z);
      m[3 * c] = x / n;
      m[3 * c + 1] = y / n;
      m[3 * c + 2] = z / n;
    }
    const f = vectorFieldFromInterleaved(m, { nx, ny, dx: nm });
    const lists = [Array.from({ length: 101 }, () => rnd()), Array.from({ length: 64 }, () => Math.floor(rnd() * 4)), [3, 3, 3, 3, 3], [2, 1]];
    const ref = runPython<{ ranks: number[][]; sigma: number }>(
      `
import sys, json, numpy as np
d = json.load(sys.stdin)
ranks = [[float(np.partition(np.array(a), k)[k]) for k in range(len(a))] for a in d["lists"]]
nx, ny = d["nx"], d["ny"]
m = np.array(d["m"]).reshape(ny, nx, 3)
f = np.array(d["f"]).reshape(ny, nx, 3)
sd = [np.abs(f[:, :-2, q] - 2 * f[:, 1:-1, q] + f[:, 2:, q]).ravel() for q in (0, 1)]
sd += [np.abs(f[:-2, :, q] - 2 * f[1:-1, :, q] + f[2:, :, q]).ravel() for q in (0, 1)]
v = np.sort(np.concatenate(sd))
print(json.dumps({"ranks": ranks, "sigma": float(v[len(v) // 2] / (0.6745 * np.sqrt(6)))}))`,
      { lists, nx, ny, m: Array.from(m), f: Array.from(f.m) },
    );
    lists.forEach((a, t) => {
      for (let k = 0; k < a.length; k++) expect(selectRank(Float64Array.from(a), a.length, k)).toBe(ref.ranks[t]![k]);
    });
    // numpy's sorted middle element (rank floor(n / 2)), the rank the documented estimator uses
    expect(estimateNoiseLevel(f)).toBeCloseTo(ref.sigma, 15);
  });
});
