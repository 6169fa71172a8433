/**
 * 50 random films across the regimes (D / D_c 0.1 - 1.5, quality factor 1.05 - 5, t / Delta 0.05 - 2,
 * B from -0.1 to 1 T), seeded: every state the global search of lib/src/walls/skyrmionAnsatz.ts
 * reports is a local minimum of the ansatz energy computed another way (exact local integrals and the
 * Gauss-Legendre / Bessel magnetostatics, not the tables), and no minimum of an independent dense
 * brute-force grid over (ln R/w, ln w) inside the window is missing from its list.
 */
import { describe, expect, it } from "vitest";
import {
  makeFilm,
  criticalDmi,
  mu0,
  findAnsatzMinima,
  ansatzEnergyTerms,
  ansatzLocalIntegrals,
  ansatzLocalIntegralsTabulated,
  ansatzNonlocal,
  ansatzTransforms,
  nonlocalFromTransforms,
  wallWidthParameter,
  type AnsatzEnergyTerms,
  type AnsatzIntegrals,
  type Film,
} from "@helicoid/lib/internal";

/** Seeded uniform numbers (mulberry32). Common practice, no source. */
function rng(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

interface Case {
  film: Film;
  B: number;
  label: string;
}

function randomCases(n: number, seed: number): Case[] {
  const r = rng(seed);
  const out: Case[] = [];
  for (let i = 0; i < n; i++) {
    const Ms = 0.5e6 + r() * 1e6;
    const A = 5e-12 + r() * 20e-12;
    const Q = 1.05 + r() * 3.95;
    const Ku = (Q * mu0 * Ms * Ms) / 2;
    const Keff = Ku - (mu0 * Ms * Ms) / 2;
    const Delta = Math.sqrt(A / Keff);
    const tau = 0.05 + r() * 1.95;
    const ratio = 0.1 + r() * 1.4;
    const sign = r() < 0.2 ? -1 : 1;
    const B = -0.1 + r() * 1.1;
    const probe = makeFilm({ Ms, A, Ku, D: 1e-3, t: tau * Delta });
    const D = sign * ratio * criticalDmi(probe);
    out.push({
      film: makeFilm({ Ms, A, Ku, D, t: tau * Delta }),
      B,
      label: `#${i} Q=${Q.toFixed(2)} t/Delta=${tau.toFixed(2)} D/Dc=${(sign * ratio).toFixed(2)} B=${B.toFixed(3)} T`,
    });
  }
  return out;
}

const UMIN = Math.log(0.3);
const UMAX = Math.log(100);
const WLO = Math.log(1 / 40);
const WHI = Math.log(40);

/** Energy of the ansatz at (ln a, ln(w / Delta)) through the tables (for the dense grid). */
function tableEnergy(c: Case, Keff: number, Delta: number, I: AnsatzIntegrals, u: number, lw: number, out: AnsatzEnergyTerms): number {
  const a = Math.exp(u);
  const w = Delta * Math.exp(lw);
  const nl = ansatzNonlocal(a, c.film.t / w);
  return ansatzEnergyTerms(c.film, c.B, Keff, I, w, nl.surface, nl.volume, undefined, out).total;
}

describe("ansatz minima over 50 random films", () => {
  const cases = randomCases(50, 20261202);
  it("every reported state is a local minimum of the directly computed energy; the dense grid finds no other", () => {
    // Common practice, no source: an independent brute-force scan and an independent energy evaluation.
    const terms: AnsatzEnergyTerms = { exchange: 0, anisotropy: 0, zeeman: 0, dmiScale: 0, surface: 0, volumeScale: 0, h: 0, vf: 0, total: 0 };
    let withMinima = 0;
    let gridMinima = 0;
    const seen = new Set<string>();
    for (const c of cases) {
      const f = c.film;
      const Keff = f.Ku - (mu0 * f.Ms * f.Ms) / 2;
      const Delta = wallWidthParameter(f);
      const s = findAnsatzMinima(f, c.B);
      if (s.minima.length) withMinima++;
      if (Math.abs(f.D) > criticalDmi(f)) seen.add("above Dc");
      if (c.B < 0) seen.add("negative B");
      // (1) each reported state: stationary with a positive-definite Hessian of the direct energy
      for (const m of s.minima) {
        expect(m.verification.stationary && m.verification.positiveDefinite && m.verification.interior, c.label).toBe(true);
        const u0 = Math.log(m.radius / m.wallWidth);
        const v0 = Math.log(m.wallWidth);
        const d = 3e-3;
        const E: number[][] = [];
        for (const du of [-1, 0, 1]) {
          const a = Math.exp(u0 + du * d);
          const I = ansatzLocalIntegrals(a);
          const tr = ansatzTransforms(a);
          E.push(
            [-1, 0, 1].map((dv) => {
              const w = Math.exp(v0 + dv * d);
              const nl = nonlocalFromTransforms(tr, f.t / w);
              return ansatzEnergyTerms(f, c.B, Keff, I, w, nl.surface, nl.volume, undefined, terms).total;
            }),
          );
        }
        const e0 = E[1]![1]!;
        const gu = (E[2]![1]! - E[0]![1]!) / (2 * d);
        const gv = (E[1]![2]! - E[1]![0]!) / (2 * d);
        const huu = (E[2]![1]! - 2 * e0 + E[0]![1]!) / (d * d);
        const hvv = (E[1]![2]! - 2 * e0 + E[1]![0]!) / (d * d);
        const huv = (E[2]![2]! - E[2]![0]! - E[0]![2]! + E[0]![0]!) / (4 * d * d);
        const det = huu * hvv - huv * huv;
        expect(huu, c.label).toBeGreaterThan(0);
        expect(det, c.label).toBeGreaterThan(0);
        expect(Math.abs((hvv * gu - huv * gv) / det), `${c.label}: Newton step in ln(R/w)`).toBeLessThan(2e-3);
        expect(Math.abs((huu * gv - huv * gu) / det), `${c.label}: Newton step in ln w`).toBeLessThan(2e-3);
        expect(Math.abs(e0 / m.energy.total - 1), c.label).toBeLessThan(1e-4);
      }
      // (2) dense grid: every strict discrete minimum away from the window edges is reported
      const du = 0.025;
      const dw = 0.05;
      const nu = Math.round((UMAX - UMIN) / du) + 1;
      const nw = Math.round((WHI - WLO) / dw) + 1;
      const grid = new Float64Array(nu * nw);
      const I: AnsatzIntegrals = { ex: 0, K: 0, D: 0, Z: 0 };
      for (let i = 0; i < nu; i++) {
        const u = UMIN + ((UMAX - UMIN) * i) / (nu - 1);
        ansatzLocalIntegralsTabulated(Math.exp(u), I);
        for (let j = 0; j < nw; j++) grid[i * nw + j] = tableEnergy(c, Keff, Delta, I, u, WLO + ((WHI - WLO) * j) / (nw - 1), terms);
      }
      for (let i = 2; i < nu - 2; i++) {
        for (let j = 2; j < nw - 2; j++) {
          const e = grid[i * nw + j]!;
          let isMin = true;
          for (let p = -1; p <= 1 && isMin; p++) for (let q = -1; q <= 1; q++) if ((p || q) && !(grid[(i + p) * nw + j + q]! > e)) isMin = false;
          if (!isMin) continue;
          gridMinima++;
          const u = UMIN + ((UMAX - UMIN) * i) / (nu - 1);
          const lw = WLO + ((WHI - WLO) * j) / (nw - 1);
          const found = s.minima.some((m) => Math.abs(Math.log(m.radius / m.wallWidth) - u) < 2 * du && Math.abs(Math.log(m.wallWidth / Delta) - lw) < 2 * dw);
          expect(
            found,
            `${c.label}: grid minimum at R/w = ${Math.exp(u).toPrecision(4)}, w/Delta = ${Math.exp(lw).toPrecision(4)} not reported (reported: ${s.minima.map((m) => (m.radius / m.wallWidth).toPrecision(4)).join(", ")})`,
          ).toBe(true);
        }
      }
    }
    // the sample covers the regimes it is meant to
    expect(withMinima).toBeGreaterThan(10);
    expect(gridMinima).toBeGreaterThanOrEqual(withMinima);
    expect(seen.has("above Dc") && seen.has("negative B")).toBe(true);
  }, 300_000);
});
