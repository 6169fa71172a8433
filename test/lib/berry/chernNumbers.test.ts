import { describe, expect, it } from "vitest";
import { chernNumbers, chernNumbersRefined, chernStrip, combineChernStrips } from "../../../lib/src/berry/chernNumbers.js";
import { getCalculator, runCalculator } from "../../../lib/src/calculators/index.js";
import { blochModelFromFunction } from "../../../lib/src/berry/blochModelFromFunction.js";
import { haldaneModel, haldaneSpec, supercellModel, haldaneCriticalMass, tightBindingModel } from "../../../lib/src/berry/blochModel.js";
import { solidAngle } from "../../../lib/src/topology/solidAngle.js";
import { InputError } from "../../../lib/src/errors.js";
import { runPython } from "../../helpers/python.js";

describe("Chern numbers by link variables", () => {
  const t2 = 0.1,
    phi = Math.PI / 2;
  const Mc = haldaneCriticalMass(t2, phi);

  it("Haldane model: C = -+1 inside |M| < 3 sqrt3 |t2 sin phi|, 0 outside; exact integers; sign flips with phi", () => {
    // Source: F. D. M. Haldane, PRL 61, 2015 (1988): phase boundary |M| = 3 sqrt(3) |t2 sin(phi)|.
    for (const M of [0, 0.3 * Mc, -0.7 * Mc, 1.3 * Mc, -2 * Mc]) {
      const r = chernNumbers(haldaneModel({ t2, phi, M }), { n1: 48 });
      const inside = Math.abs(M) < Mc;
      expect(r.chern).toEqual(inside ? [-1, 1] : [0, 0]);
      for (const c of r.chernSum) expect(Math.abs(c - Math.round(c))).toBeLessThan(1e-10);
      const flipped = chernNumbers(haldaneModel({ t2, phi: -phi, M }), { n1: 48 });
      expect(flipped.chern).toEqual(inside ? [1, -1] : [0, 0]);
    }
    // Other phi: boundary scales with |sin phi|.
    const phi2 = 0.6,
      Mc2 = haldaneCriticalMass(t2, phi2);
    expect(chernNumbers(haldaneModel({ t2, phi: phi2, M: 0.8 * Mc2 }), { n1: 120 }).chern[0]).toBe(-1);
    expect(chernNumbers(haldaneModel({ t2, phi: phi2, M: 1.2 * Mc2 }), { n1: 120 }).chern[0]).toBe(0);
  });

  it("locates the phase boundary to the grid resolution and never returns a wrong integer near it", () => {
    // Source: Haldane (1988) boundary. Resolution: a gap 2|M - Mc| below ~ v_F dk (v_F = 3 t1 / 2) is flagged.
    const n1 = 120;
    const dk = (4 * Math.PI) / 3 / n1; // |b| / n1 for nearest-neighbour distance 1
    const res = 3 * 1.5 * dk; // generous bound on the flagged window
    let lastResolvedInside = -Infinity,
      firstResolvedOutside = Infinity;
    for (let k = -20; k <= 20; k++) {
      const M = Mc * (1 + k * 0.01);
      const r = chernNumbers(haldaneModel({ t2, phi, M }), { n1, onUnresolved: "report" });
      if (r.status === "ok") {
        expect(r.chern[0], `M = ${M}`).toBe(M < Mc ? -1 : 0);
        if (M < Mc) lastResolvedInside = Math.max(lastResolvedInside, M);
        else firstResolvedOutside = Math.min(firstResolvedOutside, M);
      } else {
        expect(Math.abs(M - Mc)).toBeLessThan(res);
      }
    }
    expect(Mc - lastResolvedInside).toBeLessThan(res);
    expect(firstResolvedOutside - Mc).toBeLessThan(res);
  });

  it("too coarse a grid is an InputError, not a wrong integer", () => {
    const M = Mc * 0.995;
    expect(() => chernNumbers(haldaneModel({ t2, phi, M }), { n1: 30 })).toThrow(InputError);
    expect(() => chernNumbers(haldaneModel({ t2, phi, M }), { n1: 30 })).toThrow(/grid fine enough/);
  });

  it("lower-band flux of a two-band model equals half the solid angle of d(k) (independent geometric check)", () => {
    // Source: for H = d . sigma the lower band is spin-1/2 antiparallel to d; its Berry phase around
    // a plaquette is +Omega_d / 2 (Berry 1984), Omega_d by the Van Oosterom-Strackee formula.
    const model = haldaneModel({ t2, phi: 0.9, M: 0.2 });
    const n1 = 24;
    const r = chernNumbers(model, { n1, map: true, usePositions: false });
    const re = new Float64Array(4),
      im = new Float64Array(4);
    const d = (k1: number, k2: number) => {
      model.fill(k1, k2, re, im);
      return [re[1]!, -im[1]!, (re[0]! - re[3]!) / 2]; // H01 = dx - i dy
    };
    let maxDiff = 0;
    for (let j = 0; j < n1; j++)
      for (let i = 0; i < n1; i++) {
        const a = d(i / n1, j / n1),
          b = d((i + 1) / n1, j / n1),
          c = d((i + 1) / n1, (j + 1) / n1),
          e = d(i / n1, (j + 1) / n1);
        const nrm = (v: number[]) => {
          const l = Math.hypot(v[0]!, v[1]!, v[2]!);
          return v.map((x) => x / l);
        };
        const om = solidAngle(nrm(a), nrm(b), nrm(c)) + solidAngle(nrm(a), nrm(c), nrm(e));
        maxDiff = Math.max(maxDiff, Math.abs(r.flux![0]![j * n1 + i]! - om / 2));
      }
    expect(maxDiff).toBeLessThan(1e-12);
  });

  it("6-band supercell: the three lower bands carry the Haldane Chern number (determinant links)", () => {
    // Source: Haldane (1988); folding into a supercell leaves the total Chern number of filled bands.
    const model = supercellModel(haldaneSpec({ t2, phi, M: 0.1 }), 3, 1);
    const r = chernNumbers(model, {
      n1: 36,
      groups: [
        [0, 1, 2],
        [3, 4, 5],
      ],
    });
    expect(r.chern).toEqual([-1, 1]);
    // per band: folded bands touch, so single-band numbers are not all resolved; say so
    const per = chernNumbers(model, { n1: 36, onUnresolved: "report" });
    expect(per.status).toBe("unresolved");
    expect(per.notes.join(" ")).toMatch(/not resolved/);
  });

  it("models from a mathjs formula; positions do not change the Chern number; non-periodic H is rejected", () => {
    // Source: the massive Dirac lattice model of X.-L. Qi, Y.-S. Wu, S.-C. Zhang, PRB 74, 085308 (2006), from memory:
    // H = sin k1 sx + sin k2 sy + (m + cos k1 + cos k2) sz has |C| = 1 for 0 < |m| < 2, 0 for |m| > 2.
    const f = "[[m + cos(2 pi k1) + cos(2 pi k2), sin(2 pi k1) - i sin(2 pi k2)], [sin(2 pi k1) + i sin(2 pi k2), -(m + cos(2 pi k1) + cos(2 pi k2))]]";
    expect(Math.abs(chernNumbers(blochModelFromFunction(f, { m: 1 }), { n1: 24 }).chern[0]!)).toBe(1);
    expect(chernNumbers(blochModelFromFunction(f, { m: 3 }), { n1: 24 }).chern[0]).toBe(0);
    const a = chernNumbers(haldaneModel({ t2, phi, M: 0.2 }), { n1: 30 });
    const b = chernNumbers(haldaneModel({ t2, phi, M: 0.2 }), { n1: 30, usePositions: false });
    expect(a.chern).toEqual(b.chern);
    const open = blochModelFromFunction((k1: number) => [
      [Math.cos(Math.PI * k1), 1],
      [1, -Math.cos(Math.PI * k1)],
    ]);
    expect(() => chernNumbers(open, { n1: 10 })).toThrow(/periodic/);
    const nonHerm = blochModelFromFunction(() => [
      [1, 2],
      [0, 1],
    ]);
    expect(() => chernNumbers(nonHerm, { n1: 10 })).toThrow(/Hermitian/);
  });

  it("two-band closed form and the general Hermitian solver give the same flux map (1e-12)", () => {
    // Common practice, no source: the fluxes are gauge invariant, so both eigenvector routes must agree.
    for (const M of [0.2, -0.6, 0]) {
      const model = haldaneModel({ t2, phi: 0.7, M });
      const a = chernNumbers(model, { n1: 20, n2: 17, map: true, energies: true, onUnresolved: "report" });
      const b = chernNumbers(model, { n1: 20, n2: 17, map: true, energies: true, onUnresolved: "report", closedFormTwoBand: false });
      expect(a.chern).toEqual(b.chern);
      for (let g = 0; g < 2; g++) for (let i = 0; i < 20 * 17; i++) expect(Math.abs(a.flux![g]![i]! - b.flux![g]![i]!)).toBeLessThan(1e-12);
      for (let i = 0; i < a.energies!.length; i++) expect(Math.abs(a.energies![i]! - b.energies![i]!)).toBeLessThan(1e-13);
    }
  });

  it("6-band supercell flux maps agree with an independent numpy link-variable computation", () => {
    // Source: T. Fukui, Y. Hatsugai, H. Suzuki, J. Phys. Soc. Jpn. 74, 1674 (2005), evaluated by
    // numpy.linalg.eigh and numpy.linalg.det (Debian numpy) from the same H(k) on the same grid.
    // 3 x 1 supercell with a modulated on-site potential (so that no bands touch: folded bands of the
    // plain supercell are degenerate and their single-band fluxes ill-defined); groups of 1, 2 and 3
    // bands exercise every determinant path. Fluxes stay below 0.5 rad, well conditioned.
    const sc = supercellModel(haldaneSpec({ t2, phi, M: 0.1 }), 3, 1);
    const onsite = Array.from(sc.spec.onsite).map((x, i) => x + [0, 0.35, -0.25, 0.15, -0.3, 0.2][i]!);
    const model = tightBindingModel({ ...sc.spec, onsite });
    const n1 = 9,
      n2 = 7,
      n = 6;
    const groups = [[0], [1, 2], [3, 4, 5]];
    const r = chernNumbers(model, { n1, n2, groups, map: true, onUnresolved: "report" });
    const re = new Float64Array(n * n),
      im = new Float64Array(n * n);
    const H: number[][] = [];
    for (let j = 0; j < n2; j++)
      for (let i = 0; i < n1; i++) {
        model.fill(i / n1, j / n2, re, im);
        H.push([...Array.from(re), ...Array.from(im)]);
      }
    const ref = runPython<number[][]>(
      `
import json, sys, numpy as np
d = json.load(sys.stdin); n1, n2, n = d["n1"], d["n2"], d["n"]
pos = np.array(d["pos"])
V = {}
for j in range(n2):
    for i in range(n1):
        h = np.array(d["H"][j * n1 + i]); A = h[:n*n].reshape(n, n) + 1j * h[n*n:].reshape(n, n)
        V[i, j] = np.linalg.eigh(A)[1]
ph1 = np.exp(-2j * np.pi * pos[:, 0] / n1); ph2 = np.exp(-2j * np.pi * pos[:, 1] / n2)
def U(a, b, ph, g):
    m = a[:, g].conj().T @ (ph[:, None] * b[:, g]); z = np.linalg.det(m); return z / abs(z)
out = []
for g in d["groups"]:
    F = []
    for j in range(n2):
        for i in range(n1):
            ip, jp = (i + 1) % n1, (j + 1) % n2
            z = U(V[i, j], V[ip, j], ph1, g) * U(V[ip, j], V[ip, jp], ph2, g) * np.conj(U(V[i, jp], V[ip, jp], ph1, g)) * np.conj(U(V[i, j], V[i, jp], ph2, g))
            F.append(float(-np.angle(z)))
    out.append(F)
print(json.dumps(out))`,
      { n1, n2, n, H, groups, pos: model.positions },
    );
    expect(Math.max(...r.maxFlux)).toBeLessThan(0.5);
    groups.forEach((_, g) => {
      for (let q = 0; q < n1 * n2; q++) {
        // same branch of the angle unless the flux sits at +-pi
        const d = Math.abs(r.flux![g]![q]! - ref[g]![q]!);
        expect(Math.min(d, Math.abs(d - 2 * Math.PI)), `group ${g} plaquette ${q}`).toBeLessThan(1e-10);
      }
    });
  });

  it("complementary groups: the derived fluxes equal the directly computed ones (2-band and 6-band)", () => {
    // Common practice, no source: the link of all bands is a unitary determinant, so the fluxes of
    // two complementary groups are opposite on every plaquette; computing both checks it.
    const sc = supercellModel(haldaneSpec({ t2, phi, M: 0.1 }), 3, 1);
    const cases = [
      { model: haldaneModel({ t2, phi: 0.8, M: 0.15 }), groups: undefined, n1: 21 },
      {
        model: supercellModel(haldaneSpec({ t2, phi, M: 0.1 }), 3, 1),
        groups: [
          [0, 1, 2],
          [3, 4, 5],
        ],
        n1: 18,
      },
      // modulated on-site energies (invented) so that band 0 is separated from band 1
      {
        model: tightBindingModel({ ...sc.spec, onsite: Array.from(sc.spec.onsite).map((x, i) => x + [0, 0.35, -0.25, 0.15, -0.3, 0.2][i]!) }),
        groups: [[0], [1, 2, 3, 4, 5]],
        n1: 18,
      },
    ];
    for (const c of cases) {
      expect(Math.min(...chernNumbers(c.model, { n1: c.n1, onUnresolved: "report", ...(c.groups ? { groups: c.groups } : {}) }).minGap)).toBeGreaterThan(0.02);
      const opts = { n1: c.n1, map: true, onUnresolved: "report" as const, ...(c.groups ? { groups: c.groups } : {}) };
      const fast = chernNumbers(c.model, opts);
      const both = chernNumbers(c.model, { ...opts, complement: false });
      expect(fast.chern).toEqual(both.chern);
      expect(fast.resolved).toEqual(both.resolved);
      for (let g = 0; g < 2; g++) {
        expect(Math.abs(fast.chernSum[g]! - both.chernSum[g]!)).toBeLessThan(1e-9);
        expect(Math.abs(fast.maxFlux[g]! - both.maxFlux[g]!)).toBeLessThan(1e-9);
        for (let q = 0; q < c.n1 * c.n1; q++) {
          const d = Math.abs(fast.flux![g]![q]! - both.flux![g]![q]!);
          expect(Math.min(d, Math.abs(d - 2 * Math.PI))).toBeLessThan(1e-9);
        }
      }
    }
  });

  it("strips of plaquette rows combine to the whole-grid result (the unit of parallel work)", () => {
    // Common practice, no source: the flux sum is additive over plaquettes, so any partition of the
    // rows gives the same fluxes; compared with the single-strip computation of the same model.
    const sc = supercellModel(haldaneSpec({ t2: 0.1, phi: Math.PI / 2, M: 0.1 }), 3, 1);
    const opts = {
      n1: 30,
      n2: 24,
      groups: [
        [0, 1, 2],
        [3, 4, 5],
      ],
      map: true,
      energies: true,
    };
    const whole = chernNumbers(sc, opts);
    const parts = [
      [12, 24],
      [0, 5],
      [5, 12],
    ].map(([a, b]) => chernStrip(sc, opts, a!, b!));
    const merged = combineChernStrips(sc, opts, parts);
    expect(merged.chern).toEqual(whole.chern);
    expect(whole.chern).toEqual([-1, 1]);
    for (let g = 0; g < 2; g++) {
      expect(Math.abs(merged.chernSum[g]! - whole.chernSum[g]!)).toBeLessThan(1e-12);
      expect(merged.maxFlux[g]).toBe(whole.maxFlux[g]);
      expect(merged.minGap[g]).toBe(whole.minGap[g]);
      expect(Array.from(merged.flux![g]!)).toEqual(Array.from(whole.flux![g]!));
    }
    expect(Array.from(merged.energies!)).toEqual(Array.from(whole.energies!));
    // the flux map is really filled (not zeros) and the strips are what was asked
    expect(Math.max(...Array.from(whole.flux![0]!, Math.abs))).toBeGreaterThan(1e-3);
    expect(parts.map((p) => [p.rowFrom, p.rowTo])).toEqual([
      [12, 24],
      [0, 5],
      [5, 12],
    ]);
    // Bad partitions: a row twice, a row missing, an empty or out-of-range strip.
    expect(() => combineChernStrips(sc, opts, [parts[0]!, parts[1]!, parts[2]!, parts[1]!])).toThrow(/row 0 twice/);
    expect(() => combineChernStrips(sc, opts, [parts[0]!, parts[2]!])).toThrow(/row 0 missing/);
    expect(() => chernStrip(sc, opts, 5, 5)).toThrow(InputError);
    expect(() => chernStrip(sc, opts, 0, 25)).toThrow(/rowFrom, rowTo/);
  });
});

describe("Chern numbers on a grid refined until the link-variable conditions hold", () => {
  // Source: F. D. M. Haldane, PRL 61, 2015 (1988) (C = -sgn(t2 sin phi) for |M| < 3 sqrt3 |t2 sin phi|, 0
  // outside, with the H(k) of blochModel.ts); oracle: an independent numpy implementation of the
  // Fukui-Hatsugai-Suzuki link variables (J. Phys. Soc. Jpn. 74, 1674 (2005)) on a fixed fine grid.
  const cases: [number, number, number, number][] = [
    [0.1, 0, 0.1, 120],
    [0.1, Math.PI / 2, 0.51, 600],
  ];
  const ref = runPython<[number, number, number][]>(
    `
import json, sys
import numpy as np
def chern(t2, phi, M, n):
    # honeycomb, NN distance 1; a1, a2 lattice vectors; b1, b2 reciprocal (a_i . b_j = 2 pi delta_ij)
    a1 = np.array([np.sqrt(3) / 2, 1.5]); a2 = np.array([-np.sqrt(3) / 2, 1.5])
    d = [np.array([0, 1.0]), np.array([np.sqrt(3) / 2, -0.5]), np.array([-np.sqrt(3) / 2, -0.5])]
    nnn = [a1, -a2, a2 - a1]  # NNN vectors, 120 degrees apart
    A = np.array([a1, a2]); B = 2 * np.pi * np.linalg.inv(A).T
    s = np.arange(n) / n
    k1, k2 = np.meshgrid(s, s, indexing="ij")
    K = k1[..., None] * B[0] + k2[..., None] * B[1]
    dx = sum(np.cos(K @ v) for v in d); dy = sum(np.sin(K @ v) for v in d)
    dz = M - 2 * t2 * np.sin(phi) * sum(np.sin(K @ v) for v in nnn)
    H = np.zeros(K.shape[:2] + (2, 2), complex)
    H[..., 0, 0] = dz; H[..., 1, 1] = -dz; H[..., 0, 1] = dx + 1j * dy; H[..., 1, 0] = dx - 1j * dy
    H += (-2 * t2 * np.cos(phi) * sum(np.cos(K @ v) for v in nnn))[..., None, None] * np.eye(2)
    w, V = np.linalg.eigh(H)
    u = V[..., :, 0]
    # the Bloch basis with orbital positions is periodic in k only up to a diagonal phase; this periodic-gauge
    # form (no positions) has H(k + b) = H(k), and the Chern number does not depend on the choice
    U1 = np.sum(u.conj() * np.roll(u, -1, 0), -1); U2 = np.sum(u.conj() * np.roll(u, -1, 1), -1)
    U1 /= abs(U1); U2 /= abs(U2)
    F = -np.angle(U1 * np.roll(U2, -1, 0) * np.conj(np.roll(U1, -1, 1)) * np.conj(U2))
    return float(F.sum() / (2 * np.pi)), float(abs(F).max()), float((w[..., 1] - w[..., 0]).min())
print(json.dumps([chern(*c) for c in json.load(sys.stdin)]))
`,
    cases,
  );

  it("phi = 0, M = 0.1 gives C = 0 and the gap-0.019 point C = -1 (no longer declined), as numpy says", () => {
    // numpy's own integers on its fine grids
    expect(Math.round(ref[0]![0]) + 0).toBe(0);
    expect(Math.round(ref[1]![0])).toBe(-1);
    expect(ref[1]![2]).toBeCloseTo(0.0192, 4);
    const triv = chernNumbersRefined(haldaneModel({ t2: 0.1, phi: 0, M: 0.1 }), { n: 30 });
    expect(triv.status).toBe("ok");
    expect(triv.chern[0]).toBe(Math.round(ref[0]![0]) + 0);
    const small = chernNumbersRefined(haldaneModel({ t2: 0.1, phi: Math.PI / 2, M: 0.51 }), { n: 120, maxN: 1024 });
    expect(small.status).toBe("ok");
    expect(small.stop).toBe("resolved");
    expect(small.chern[0]).toBe(Math.round(ref[1]![0]));
    expect(small.gridsTried[0]).toBe(120);
    expect(small.n1).toBeGreaterThan(120);
    expect(Math.max(...small.maxFlux)).toBeLessThan(1);
    // the calculator on the same points answers
    const c0 = runCalculator(getCalculator("chern"), { phi: 0, M: 0.1 });
    expect(c0.outputs.chernLower!.value).toBe(0);
    const c1 = runCalculator(getCalculator("chern"), { M: 0.51, grid: 120 });
    expect(c1.outputs.chernLower!.value).toBe(-1);
    expect(c1.outputs.gridUsed!.value as number).toBe(small.n1);
  });

  it("work bound: a gap below what maxN resolves is reported unresolved, never guessed; a closed gap stops at once", () => {
    const r = chernNumbersRefined(haldaneModel({ t2: 0.1, phi: Math.PI / 2, M: 0.5196 }), { n: 30, maxN: 90 });
    expect(r.status).toBe("unresolved");
    expect(r.stop).toBe("work-bound");
    expect(r.gridsTried.at(-1)).toBe(90);
    const closed = chernNumbersRefined(haldaneModel({ t2: 0.1, phi: Math.PI / 2, M: haldaneCriticalMass(0.1, Math.PI / 2) }), { n: 30, maxN: 4096 });
    expect(closed.stop).toBe("gapless");
    expect(closed.gridsTried).toEqual([30]);
    expect(() => chernNumbersRefined(haldaneModel({ t2: 0.1, phi: 0, M: 0.1 }), { n: 50, maxN: 40 })).toThrow(/maxN = 40/);
  });
});
