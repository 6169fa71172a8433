import { describe, expect, it } from "vitest";
import {
  chainModel,
  sectorLevels,
  ChainSector,
  applyBetweenSectors,
  vectorChiralityTerms,
  toComplex,
  dot,
  domainWallBand,
  twoWallContinuum,
  villainEdge,
  villainLineShape,
  wallDensity,
  twoWallTransverseLineShape,
  twoWallTransverseDensity,
  twoWallTransverseWeight,
  ChainHamiltonian,
  lanczosTridiagonal,
  wallTransverseMagnetization,
  besselI0,
  dynamicStructureFactor,
  InputError,
} from "@helicoid/lib/internal";
import { runPython } from "../../helpers/python.js";

// All checks below compare the first-order wall picture (derived in lib/src/chains/wallBand.ts) with
// exact diagonalization of odd rings, which hold exactly one wall; the expected error is of order
// Jperp^2 / Jz (second order), which the tests check by doubling Jz.

/** One-wall band of an odd ring from ED: lowest level of S^z = +1/2 at each k, shifted by the Neel
 * reference energy and the second-order background energy -N Jperp^2 / (4 Jz). */
function edBand(N: number, Jz: number, Jperp: number): number[] {
  const m = chainModel({ N, Jz, Jperp });
  const out: number[] = [];
  for (let mm = 0; mm < N; mm++) {
    const E = sectorLevels(m, { nUp: (N + 1) / 2, m: mm, flip: 0 }, { tol: 1e-12 }).values[0]!;
    out.push(E + (N * Jz) / 4 + (N * Jperp * Jperp) / (4 * Jz));
  }
  return out;
}

describe("one-wall band against ED of odd rings", () => {
  it("E(K) = Jz/2 + Jperp cos 2K with errors of order Jperp^2/Jz", () => {
    // Source: J. Villain, Physica B 79, 1 (1975); S. Ishimura, H. Shiba, Prog. Theor. Phys. 63, 743 (1980).
    const N = 11,
      J = 1;
    const errs: number[] = [];
    for (const Jz of [10, 20]) {
      const ed = edBand(N, Jz, J);
      const K = ed.map((_, mm) => (2 * Math.PI * mm) / N);
      const band = domainWallBand({ Jz, Jperp: J, hx: 0, hz: 0 }, K).lower;
      errs.push(Math.max(...ed.map((e, i) => Math.abs(e - band[i]!))));
    }
    expect(errs[0]).toBeLessThan((2 * (J * J)) / 10);
    expect(errs[1]).toBeLessThan((2 * (J * J)) / 20);
    expect(errs[0]! / errs[1]!).toBeGreaterThan(1.6); // error ~ 1/Jz
  });

  it("a transverse field splits the band by 2 hx |cos K| (both types mixed)", () => {
    const N = 9,
      Jz = 16,
      J = 1,
      hx = 0.6;
    const m = chainModel({ N, Jz, Jperp: J, hx });
    for (let mm = 0; mm < N; mm++) {
      const K = (2 * Math.PI * mm) / N;
      const r = sectorLevels(m, { nUp: null, m: mm, flip: 0 }, { levels: 2, tol: 1e-12 });
      const b = domainWallBand({ Jz, Jperp: J, hx, hz: 0 }, [K]);
      const split = r.values[1]! - r.values[0]!;
      expect(Math.abs(split - (b.upper[0]! - b.lower[0]!))).toBeLessThan((3 * (J * J + hx * hx)) / Jz);
    }
  });

  it("chirality of a band state: <kappa^z> = sigma sin 2K (ED sign), |spin current| = Jperp |sin 2K|", () => {
    const N = 11,
      Jz = 20,
      J = 1;
    const m = chainModel({ N, Jz, Jperp: J });
    const K: number[] = [],
      ed: number[] = [];
    for (let mm = 0; mm < N; mm++) {
      const label = { nUp: (N + 1) / 2, m: mm, flip: 0 as const };
      const r = sectorLevels(m, label, { tol: 1e-12 });
      const sec = new ChainSector(N, label);
      const v = toComplex(r.vectors[0]!, sec.complex);
      const w = new Float64Array(v.length);
      applyBetweenSectors(sec, sec, vectorChiralityTerms(N), v, w);
      const c = new Float64Array(2);
      dot(v, w, true, c);
      K.push((2 * Math.PI * mm) / N);
      ed.push(c[0]!);
    }
    const band = domainWallBand({ Jz, Jperp: J, hx: 0, hz: 0 }, K);
    ed.forEach((x, i) => expect(Math.abs(x - band.chiralityLower[i]!)).toBeLessThan(0.1));
    // and it is not trivially zero
    expect(Math.max(...ed.map(Math.abs))).toBeGreaterThan(0.9);
  });
});

describe("Villain intraband scattering", () => {
  it("the edge 2 Jperp |sin q| bounds the intraband transitions of ED one-wall states", () => {
    const N = 11,
      Jz = 20,
      J = 1;
    const ed = edBand(N, Jz, J);
    for (let n = 1; n < N; n++) {
      const q = (2 * Math.PI * n) / N;
      let edMax = 0,
        foMax = 0;
      for (let mm = 0; mm < N; mm++) {
        const k = (2 * Math.PI * mm) / N;
        edMax = Math.max(edMax, Math.abs(ed[mm]! - ed[(((mm - n) % N) + N) % N]!));
        foMax = Math.max(foMax, Math.abs(J * (Math.cos(2 * k) - Math.cos(2 * (k - q)))));
      }
      expect(Math.abs(edMax - foMax)).toBeLessThan((2 * J * J) / Jz);
      expect(foMax).toBeLessThanOrEqual(villainEdge({ Jz, Jperp: J, hx: 0, hz: 0 }, [q])[0]! + 1e-12);
    }
  });

  it("S^zz of an odd ring at T << Jz has its low-energy weight inside |w| <= 2 Jperp |sin q|", () => {
    const N = 9,
      Jz = 12,
      J = 1;
    const omega = Array.from({ length: 121 }, (_, i) => -Jz / 3 + ((2 * Jz) / 3) * (i / 120));
    const r = dynamicStructureFactor(chainModel({ N, Jz, Jperp: J }), { T: 1, eta: 0.02, omega, components: ["zz"], qIndices: [2, 3] });
    r.qIndex.forEach((n, i) => {
      const edge = 2 * J * Math.abs(Math.sin((2 * Math.PI * n) / N)) + (2 * J * J) / Jz;
      const row = r.channels.zz!.re[i]!;
      const peak = Math.max(...row);
      omega.forEach((w, t) => {
        if (Math.abs(w) > edge + 0.3) expect(row[t]! / peak).toBeLessThan(5e-3);
      });
      expect(peak).toBeGreaterThan(0.05);
    });
  });

  it("line shape: unit area at high T, square-root edges; wall density ~ exp(-Jz/2T) I0(Jperp/T)", () => {
    const p = { Jz: 10, Jperp: 1, hx: 0, hz: 0 };
    const q = 1.1,
      T = 2;
    const edge = 2 * Math.sin(q);
    const n = 20001;
    const w = Array.from({ length: n }, (_, i) => -edge + (2 * edge * (i + 0.5)) / n);
    const s = villainLineShape(p, q, w, T);
    const area = s.reduce((a, b) => a + b, 0) * ((2 * edge) / n);
    // Common practice, no source: the line shape integrates to n_w / (4 cos^2(q/2)) (normalized
    // momentum distribution); midpoint rule on the integrable edge singularities, hence 1e-2.
    const nw = wallDensity(p, T);
    expect(area / (nw / (4 * Math.cos(q / 2) ** 2))).toBeCloseTo(1, 2);
    // Source (series of I0): mpmath besseli.
    const ref = runPython<number[]>("import sys, json, mpmath as mp\nprint(json.dumps([float(mp.besseli(0, x)) for x in json.load(sys.stdin)]))", [0.1, 1, 7.5, 30]);
    [0.1, 1, 7.5, 30].forEach((x, i) => expect(besselI0(x) / ref[i]!).toBeCloseTo(1, 12));
    // dilute limit: z = exp(-Jz/2T) I0(Jperp/T)
    const z = Math.exp(-p.Jz / (2 * 0.8)) * besselI0(p.Jperp / 0.8);
    expect(wallDensity(p, 0.8) / (z / (1 + z))).toBeCloseTo(1, 8);
  });
});

describe("continuum and transverse magnetization", () => {
  it("two-wall levels of an even ring lie inside [Jz - 2Jperp|cos q|, Jz + 2Jperp|cos q|] (+ O(Jperp^2/Jz))", () => {
    const N = 12,
      Jz = 20,
      J = 1;
    const m = chainModel({ N, Jz, Jperp: J });
    let e0 = Infinity;
    for (const mm of [0, 6]) e0 = Math.min(e0, sectorLevels(m, { nUp: 6, m: mm, flip: 0 }).values[0]!);
    for (const mm of [0, 2, 3, 5]) {
      const r = sectorLevels(m, { nUp: 7, m: mm, flip: 0 }, { levels: 4, tol: 1e-11 });
      const q = (2 * Math.PI * mm) / N;
      const b = twoWallContinuum({ Jz, Jperp: J, hx: 0, hz: 0 }, [q]);
      expect(b.lower[0]).toBeCloseTo(Jz - 2 * J * Math.abs(Math.cos(q)), 3);
      for (const e of r.values) {
        if (e - e0 > Jz + 3 * J) continue;
        expect(e - e0).toBeGreaterThan(b.lower[0]! - (3 * J * J) / Jz);
        expect(e - e0).toBeLessThan(b.upper[0]! + (3 * J * J) / Jz);
      }
    }
  });

  it("<S^x> of the ground state is hx/(2 Jz) to first order (ED of an even ring)", () => {
    const N = 10,
      Jz = 20,
      J = 1,
      hx = 0.5;
    const r = dynamicStructureFactor(chainModel({ N, Jz, Jperp: J, hx }), { eta: 0.1, omega: [0], components: ["zz"], qIndices: [0] });
    expect(Math.abs(r.mx - wallTransverseMagnetization({ Jz, Jperp: J, hx, hz: 0 }, 0))).toBeLessThan(((hx * J) / (Jz * Jz)) * 2);
  });

  it("bad input", () => {
    expect(() => domainWallBand({ Jz: 0, Jperp: 1, hx: 0, hz: 0 }, [0])).toThrow(InputError);
    expect(() => wallDensity({ Jz: 1, Jperp: 1, hx: 0, hz: 0 }, -1)).toThrow(/T/);
    expect(domainWallBand({ Jz: 1, Jperp: 0.8, hx: 0, hz: 0 }, [0]).notes.join(" ")).toMatch(/not small/);
  });
});

describe("T = 0 two-wall transverse line shape (thermodynamic-limit model)", () => {
  it("the semicircle has weight (1/4)(1 - 2 (Jperp/Jz) cos q), mean Jz and variance Jperp^2 cos^2 q (numerical integration of the closed form)", () => {
    // Derived in lib/src/chains/wallBand.ts; here the moments of the function are integrated numerically.
    const p = { Jz: 10, Jperp: 1, hx: 0, hz: 0 };
    for (const q of [0.3, 1.0, 2.5]) {
      const W = 2 * Math.abs(Math.cos(q));
      let m0 = 0,
        m1 = 0,
        m2 = 0;
      const n = 20000;
      for (let i = 0; i < n; i++) {
        const w = p.Jz - W + (2 * W * (i + 0.5)) / n;
        const d = twoWallTransverseDensity(p, q, w) * ((2 * W) / n);
        m0 += d;
        m1 += d * w;
        m2 += d * w * w;
      }
      const w0 = 0.25 * (1 - 0.2 * Math.cos(q));
      expect(m0).toBeCloseTo(w0, 4);
      expect(m1 / m0).toBeCloseTo(p.Jz, 6);
      expect(m2 / m0 - (m1 / m0) ** 2).toBeCloseTo(Math.cos(q) ** 2, 3);
      // the broadened shape keeps the weight (Lorentzian tails aside) and peaks at Jz
      const omega = Array.from({ length: 4001 }, (_, i) => p.Jz - 40 + (80 * i) / 4000);
      const b = twoWallTransverseLineShape(p, q, omega, 0.05);
      const area = b.reduce((a, x) => a + x, 0) * (80 / 4000);
      expect(Math.abs(area - w0)).toBeLessThan((0.25 * (2 * 0.05)) / (Math.PI * 40) + 1e-3);
    }
  });

  it("agrees with the continued fraction of an ED ring: weight, mean and width of S^+_q|0> to O(Jperp^2/Jz)", () => {
    // Source: E. Gagliano, C. Balseiro, PRL 59, 2999 (1987): the first Lanczos coefficients of
    // phi = S^+_{-q}|0> / 2 are its weight <phi|phi>, mean a_0 - E_0 and width b_1 (the semicircle's
    // are w(q)/2 per S^+ half of S^x, Jz and Jperp |cos q|). The weight's first-order factor
    // 1 - 2 (Jperp/Jz) cos q is checked here too (without it the deviation is 0.04 at q = 2 pi/14).
    const N = 14,
      Jz = 10,
      Jperp = 1;
    const model = chainModel({ N, Jz, Jperp });
    const gs = sectorLevels(model, { nUp: N / 2, m: 0, flip: 0 }, { tol: 1e-12 });
    const src = gs.sector;
    const g = toComplex(gs.vectors[0]!, false);
    for (const n of [1, 3, 5]) {
      const q = (2 * Math.PI * n) / N;
      const dst = new ChainSector(N, { nUp: N / 2 + 1, m: N - n, flip: 0 });
      const Hd = new ChainHamiltonian(model, dst);
      const phi = new Float64Array(2 * dst.dim);
      const s = 1 / (2 * Math.sqrt(N));
      applyBetweenSectors(
        src,
        dst,
        (a, emit) => {
          for (let j = 0; j < N; j++) if (!((a >>> j) & 1)) emit((a | (1 << j)) >>> 0, s * Math.cos(q * j), s * Math.sin(q * j));
        },
        g,
        phi,
      );
      const t = lanczosTridiagonal(Hd, phi, 3);
      const tol = (3 * Jperp * Jperp) / Jz;
      // S^x = (S^+ + S^-)/2, both halves equal by spin inversion: weight of S^xx = 2 <phi|phi>
      expect(Math.abs(2 * t.norm2 - twoWallTransverseWeight({ Jz, Jperp, hx: 0, hz: 0 }, q))).toBeLessThan(0.25 * (Jperp / Jz) ** 2 * 4);
      expect(Math.abs(t.a[0]! - gs.values[0]! - Jz)).toBeLessThan(tol);
      expect(Math.abs(t.b[1]! - Jperp * Math.abs(Math.cos(q)))).toBeLessThan(tol);
    }
  });
});
