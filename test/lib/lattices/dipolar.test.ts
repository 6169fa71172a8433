import { describe, expect, it } from "vitest";
import { latticePreset, dipolarTensor, dipolarTensorDirect, dipolarBands, luttingerTisza, fractionalToQ, modeEnergy, InputError, type Lattice2D } from "@helicoid/lib/internal";
import { runPython } from "../../helpers/python.js";

const sums = runPython<{ square: number; triangular: number }>(
  "import json, mpmath as m\nm.mp.dps = 30\nz = m.zeta(1.5)\nprint(json.dumps({'square': float(4*z*m.dirichlet(1.5, [0, 1, 0, -1])), 'triangular': float(6*z*m.dirichlet(1.5, [0, 1, -1]))}))",
);

describe("Ewald dipolar tensor", () => {
  it("square lattice: J_zz(0) = sum' 1/r^3 = 4 zeta(3/2) beta(3/2) = 9.0336217; J_xx = J_yy = -J_zz/2", () => {
    // Source: closed form of the square-lattice sum (M. L. Glasser, I. J. Zucker, Theoretical
    // Chemistry: Advances and Perspectives 5, 67 (1980), from memory), as quoted in issue 17;
    // zeta and the Dirichlet beta evaluated with mpmath.
    expect(sums.square).toBeCloseTo(9.0336217, 7);
    const J = dipolarTensor(latticePreset("square"), [0, 0]);
    expect(J.re[8]).toBeCloseTo(sums.square, 12);
    expect(J.re[0]).toBeCloseTo(-sums.square / 2, 12);
    expect(J.re[4]).toBeCloseTo(-sums.square / 2, 12);
  });

  it("triangular lattice: J_zz(0) = 6 zeta(3/2) L_-3(3/2)", () => {
    // From memory: the hexagonal-lattice sum sum' |r|^-2s = 6 zeta(s) L_-3(s) (Glasser, Zucker 1980).
    const J = dipolarTensor(latticePreset("triangular"), [0, 0]);
    expect(J.re[8]).toBeCloseTo(sums.triangular, 12);
  });

  it("does not depend on the splitting parameter eta (honeycomb, generic q)", () => {
    // Common practice, no source: the Ewald split is exact for any eta.
    const lat = latticePreset("honeycomb");
    const q: [number, number] = [0.37, -1.21];
    const ref = dipolarTensor(lat, q, { eta: 1 });
    for (const eta of [0.5, 2, 3.5]) {
      const J = dipolarTensor(lat, q, { eta });
      for (let i = 0; i < J.re.length; i++) {
        expect(Math.abs(J.re[i]! - ref.re[i]!)).toBeLessThan(1e-11);
        expect(Math.abs(J.im[i]! - ref.im[i]!)).toBeLessThan(1e-11);
      }
    }
  });

  it("agrees with direct summation (large cutoff, 2D tail corrections at q = 0)", () => {
    // Common practice, no source: the direct sum converges absolutely in 2D; its tail beyond R is
    // (1/A) int_R^inf dr r int dtheta D(r) = 2 pi / (A R) for zz and -pi / (A R) for xx, yy at q = 0.
    const lat = latticePreset("honeycomb");
    const A = 1.5 * Math.sqrt(3);
    const R = 150;
    const ew = dipolarTensor(lat, [0, 0]);
    const dir = dipolarTensorDirect(lat, [0, 0], R);
    const N = ew.n;
    for (let a = 0; a < 2; a++)
      for (let b = 0; b < 2; b++) {
        const idx = (al: number, be: number) => (3 * a + al) * N + 3 * b + be;
        expect(Math.abs(dir.re[idx(2, 2)]! + (2 * Math.PI) / (A * R) - ew.re[idx(2, 2)]!)).toBeLessThan(2e-4);
        expect(Math.abs(dir.re[idx(0, 0)]! - Math.PI / (A * R) - ew.re[idx(0, 0)]!)).toBeLessThan(2e-4);
        expect(Math.abs(dir.re[idx(0, 1)]! - ew.re[idx(0, 1)]!)).toBeLessThan(2e-4);
      }
    // generic q: the tail oscillates and averages out
    const q = fractionalToQ(lat, 0.21, 0.13);
    const ewq = dipolarTensor(lat, q);
    const dq = dipolarTensorDirect(lat, q, R);
    for (let i = 0; i < ewq.re.length; i++) {
      expect(Math.abs(dq.re[i]! - ewq.re[i]!)).toBeLessThan(2e-3);
      expect(Math.abs(dq.im[i]! - ewq.im[i]!)).toBeLessThan(2e-3);
    }
  });

  it("refuses a degenerate lattice and coinciding basis sites", () => {
    const bad: Lattice2D = { name: "bad", a1: [1, 0], a2: [2, 0], basis: [[0, 0]] };
    expect(() => dipolarTensor(bad, [0, 0])).toThrow(InputError);
    const twin: Lattice2D = {
      name: "twin",
      a1: [1, 0],
      a2: [0, 1],
      basis: [
        [0, 0],
        [1, 0],
      ],
    };
    expect(() => dipolarTensor(twin, [0, 0])).toThrow(/basis/);
  });
});

describe("Luttinger-Tisza ground states", () => {
  it("triangular: in-plane ferromagnet, lambda = -(1/2) sum' 1/r^3, doubly degenerate", () => {
    // Source: trace of D vanishes, in-plane isotropy of the triangular lattice; sum from the test above.
    const lt = luttingerTisza(latticePreset("triangular"), 12);
    expect(Math.hypot(...lt.qMin[0]!)).toBeLessThan(1e-6);
    expect(lt.lambdaMin).toBeCloseTo(-sums.triangular / 2, 9);
    expect(lt.degeneracy).toBe(2);
    expect(lt.spinLengthSpread).toBeLessThan(1e-9);
  });

  it("square: minimum at (0, pi), energy -2.5494 D per spin (in-plane columnar state)", () => {
    // From memory: K. De'Bell, A. MacIsaac, I. Booth, J. Whitehead, PRB 55, 15108 (1997): in-plane
    // ground state of the square dipolar lattice, E = -2.549 mu^2/a^3 per spin.
    const lt = luttingerTisza(latticePreset("square"), 12);
    expect(lt.energyPerSite).toBeCloseTo(-2.5494, 3);
    const q = lt.qMin[0]!;
    expect(Math.min(Math.abs(q[0]), Math.abs(q[1]))).toBeLessThan(1e-6);
    expect(Math.max(Math.abs(q[0]), Math.abs(q[1]))).toBeCloseTo(Math.PI, 6);
    expect(lt.spinLengthSpread).toBeLessThan(1e-9);
  });

  it("honeycomb: minimum at K, equal spin lengths, a continuous counter-rotating family at equal energy", () => {
    // Source: issue 17 / background notes (in-plane honeycomb dipoles: LT minimum at K with a
    // continuous counter-rotating family); checked here two ways: the LT bound from J(K), and the
    // energies of the real spin states on a 3 x 3 supercell evaluated with the supercell's own
    // q = 0 Ewald tensor (18 sites).
    const lat = latticePreset("honeycomb");
    const lt = luttingerTisza(lat, 12);
    expect(Math.hypot(...lt.qMin[0]!)).toBeCloseTo((4 * Math.PI) / (3 * Math.sqrt(3)), 6);
    expect(lt.spinLengthSpread).toBeLessThan(1e-9);
    const K = lt.qMin[0]!;
    const bands = dipolarBands(lat, K);
    const N = 6;
    // lowest eigenvector, normalized so that |S| = 1 (u^dag u = 2 per site)
    let uRe = Array.from({ length: N }, (_, k) => bands.vectorsRe[k * N]!),
      uIm = Array.from({ length: N }, (_, k) => bands.vectorsIm[k * N]!);
    const norm = Math.sqrt(uRe.reduce((s, x, k) => s + x * x + uIm[k]! ** 2, 0) / 4);
    uRe = uRe.map((x) => x / norm);
    uIm = uIm.map((x) => x / norm);
    // moments lie in the plane
    expect(Math.hypot(uRe[2]!, uIm[2]!, uRe[5]!, uIm[5]!)).toBeLessThan(1e-9);
    const superLat: Lattice2D = { name: "honeycomb 3x3", a1: [3 * lat.a1[0], 3 * lat.a1[1]], a2: [3 * lat.a2[0], 3 * lat.a2[1]], basis: [] };
    const pos: Array<[number, number, number]> = [];
    for (let i = 0; i < 3; i++)
      for (let j = 0; j < 3; j++)
        for (let a = 0; a < 2; a++) {
          const p: [number, number] = [i * lat.a1[0] + j * lat.a2[0] + lat.basis[a]![0], i * lat.a1[1] + j * lat.a2[1] + lat.basis[a]![1]];
          superLat.basis.push(p);
          pos.push([a, p[0], p[1]]);
        }
    const Js = dipolarTensor(superLat, [0, 0]);
    const M = Js.n;
    const energies: number[] = [];
    const angleA: number[] = [];
    for (const phi of [0, 0.4, 1.1, 2.3, 4]) {
      const S: number[] = [];
      for (const [a, x, y] of pos) {
        const ph = K[0] * x + K[1] * y + phi;
        for (let al = 0; al < 3; al++) S.push(uRe[3 * a + al]! * Math.cos(ph) - uIm[3 * a + al]! * Math.sin(ph));
      }
      for (let s = 0; s < 18; s++) expect(Math.hypot(S[3 * s]!, S[3 * s + 1]!, S[3 * s + 2]!)).toBeCloseTo(1, 9);
      let e = 0;
      for (let i = 0; i < M; i++) for (let j = 0; j < M; j++) e += S[i]! * Js.re[i * M + j]! * S[j]!;
      energies.push(e / (2 * 18));
      angleA.push(Math.atan2(S[1]!, S[0]!) - Math.atan2(S[4]!, S[3]!));
      // mode energy from J(K) agrees
      const ph = [Math.cos(phi), Math.sin(phi)];
      expect(
        modeEnergy(
          lat,
          K,
          uRe.map((x, k) => x * ph[0]! - uIm[k]! * ph[1]!),
          uIm.map((x, k) => uRe[k]! * ph[1]! + x * ph[0]!),
        ),
      ).toBeCloseTo(lt.energyPerSite, 9);
    }
    for (const e of energies) expect(e).toBeCloseTo(lt.energyPerSite, 9);
    // counter-rotating: the angle between the A and B moments of one cell changes with phi
    expect(Math.max(...angleA) - Math.min(...angleA)).toBeGreaterThan(0.5);
    // and no supercell state lies below: the LT bound equals the lowest q = 0 eigenvalue of the supercell
    const sb = dipolarBands(superLat, [0, 0]);
    expect(sb.values[0]!).toBeCloseTo(lt.lambdaMin, 8);
  });
});
