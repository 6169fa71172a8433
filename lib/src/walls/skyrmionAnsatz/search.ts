/**
 * Search for the minima of the skyrmion ansatz energy at one field (see ../skyrmionAnsatz.ts): the
 * global scan of the w-minimized energy over ln(R / w), local searches from its minima and from warm
 * starts, the Newton polish on a central-difference stencil, and the verification of each candidate.
 */
import { ConvergenceError, InputError } from "../../errors.js";
import type { Film } from "../../material/film.js";
import { brentMinimize } from "../../numeric/brentMinimize.js";
import type { SkyrmionEnergyParts } from "../skyrmionEnergy.js";
import { ANSATZ_A_MAX, ANSATZ_A_MIN } from "./integrals.js";
import { energyAt, innerGlobal, innerLocal, makeContext, W_HI, W_LO, type AnsatzOptions, type Context } from "./energy.js";

/** Step of the global scan in ln(R / w). */
const SCAN_DU = 0.08;

/** Verification of a reported minimum (finite differences of the ansatz energy in ln(R/w), ln w). */
export interface AnsatzVerification {
  /** |grad E| in (ln(R/w), ln w), relative to the energy scale (sum of the magnitudes of the terms). */
  relativeGradient: number;
  /** Eigenvalues of the Hessian in (ln(R/w), ln w) relative to the energy scale, stencil 1e-3. */
  hessianEigenvalues: [number, number];
  /** The same with a stencil of 1e-2 (a minimum must be positive definite at both scales). */
  hessianEigenvaluesCoarse: [number, number];
  /** Energy scale (J): the sum of the magnitudes of the energy terms. */
  energyScale: number;
  /** Distance (in ln) of R / w and w from the edges of the searched window. */
  marginA: number;
  marginW: number;
  stationary: boolean;
  positiveDefinite: boolean;
  interior: boolean;
}

/** One verified local minimum of the ansatz energy at one field. */
export interface AnsatzState {
  radius: number;
  wallWidth: number;
  helicity: number;
  energy: SkyrmionEnergyParts;
  /** E / (8 pi A t): 1 is the Belavin-Polyakov limit approached as R -> 0 (local model). */
  energyOverBelavinPolyakov: number;
  verification: AnsatzVerification;
}

/** What the global search saw at one field. */
export interface AnsatzSearch {
  /** Verified minima, sorted by radius. */
  minima: AnsatzState[];
  /** The w-minimized energy decreases towards the small end of the window (R / w -> 0.3). */
  decreasesToSmallEdge: boolean;
  /** It decreases towards the large end (R / w -> 100). */
  decreasesToLargeEdge: boolean;
  /** The w-minimized energies (J) at the two ends of the scan (NaN without a scan). */
  smallEdgeEnergy: number;
  largeEdgeEnergy: number;
  /** Candidates that failed verification, in words. */
  rejected: string[];
  evaluations: number;
}

/**
 * Newton steps on E(ln a, ln w) with a central-difference gradient and Hessian (stencil 1e-3) from
 * a minimum located by Brent (to about 1e-7): the stencil's stationary point does not depend on
 * Brent's path (so not on last-ulp differences between JavaScript engines). Up to 12 steps, each
 * at most 0.05 long; stops when the Hessian is not positive definite.
 */
function newtonPolish(ctx: Context, u0: number, v0: number): [number, number] {
  const d = 1e-3;
  let u = u0;
  let v = v0;
  const E = emptyStencil();
  for (let it = 0; it < 12; it++) {
    stencil(ctx, u, v, d, E);
    const { gu, gv, huu, hvv, huv } = stencilDerivatives(E, d);
    const det = huu * hvv - huv * huv;
    if (!(huu > 0 && det > 0)) break;
    let su = -(hvv * gu - huv * gv) / det;
    let sv = -(huu * gv - huv * gu) / det;
    const len = Math.hypot(su, sv);
    if (len > 0.05) {
      su *= 0.05 / len;
      sv *= 0.05 / len;
    }
    // stay where the tables and the verification stencils reach (a point held here fails the margin)
    const uc = Math.min(Math.max(u + su, U_CLAMP[0]), U_CLAMP[1]);
    const lnD = Math.log(ctx.Delta);
    const vc = Math.min(Math.max(v + sv, lnD + W_LO + 0.011), lnD + W_HI - 0.011);
    const moved = Math.abs(uc - u) + Math.abs(vc - v);
    u = uc;
    v = vc;
    if (moved < 1e-11) break;
  }
  return [u, v];
}

const U_CLAMP: readonly [number, number] = [Math.log(ANSATZ_A_MIN) + 0.011, Math.log(ANSATZ_A_MAX) - 0.011];

/** Energies on a 3 x 3 stencil, E[3 p + q] at (u + (p - 1) d, v + (q - 1) d). */
type Stencil = [number, number, number, number, number, number, number, number, number];

const emptyStencil = (): Stencil => [0, 0, 0, 0, 0, 0, 0, 0, 0];

/** Central-difference gradient and Hessian in (u, v) from a stencil of step d. */
function stencilDerivatives(E: Stencil, d: number): { gu: number; gv: number; huu: number; hvv: number; huv: number } {
  const e0 = E[4];
  return {
    gu: (E[7] - E[1]) / (2 * d),
    gv: (E[5] - E[3]) / (2 * d),
    huu: (E[7] - 2 * e0 + E[1]) / (d * d),
    hvv: (E[5] - 2 * e0 + E[3]) / (d * d),
    huv: (E[8] - E[6] - E[2] + E[0]) / (4 * d * d),
  };
}

/** Energies on the 3 x 3 stencil of step d around (u = ln a, v = ln w), E[3 p + q]. */
function stencil(ctx: Context, u: number, v: number, d: number, E: Stencil): void {
  for (let p = 0; p < 3; p++) {
    const a = Math.exp(u + (p - 1) * d);
    ctx.table.localIntegrals(a, ctx.I);
    for (let q = 0; q < 3; q++) E[3 * p + q] = energyAt(ctx, a, Math.exp(v + (q - 1) * d));
  }
}

function sym2Eigen(a: number, b: number, c: number): [number, number] {
  const m = 0.5 * (a + c);
  const r = Math.hypot(0.5 * (a - c), b);
  return [m - r, m + r];
}

/** Relative gradient below which a point counts as stationary. */
export const ANSATZ_STATIONARY_TOLERANCE = 1e-6;

/** Finite-difference verification at (u = ln a, v = ln w); see AnsatzVerification. */
function verify(ctx: Context, u: number, v: number): AnsatzVerification {
  const E = emptyStencil();
  const parts: SkyrmionEnergyParts = { exchange: 0, anisotropy: 0, dmi: 0, zeeman: 0, magnetostaticSurface: 0, magnetostaticVolume: 0, total: 0 };
  ctx.table.localIntegrals(Math.exp(u), ctx.I);
  energyAt(ctx, Math.exp(u), Math.exp(v), parts);
  const scale =
    Math.abs(parts.exchange) +
    Math.abs(parts.anisotropy) +
    Math.abs(parts.dmi) +
    Math.abs(parts.zeeman) +
    Math.abs(parts.magnetostaticSurface) +
    Math.abs(parts.magnetostaticVolume);
  const hess = (d: number): { g: number; ev: [number, number] } => {
    stencil(ctx, u, v, d, E);
    const { gu, gv, huu, hvv, huv } = stencilDerivatives(E, d);
    const ev = sym2Eigen(huu, huv, hvv);
    return { g: Math.hypot(gu, gv) / scale, ev: [ev[0] / scale, ev[1] / scale] };
  };
  const fine = hess(1e-3);
  const coarse = hess(1e-2);
  const lw = v - Math.log(ctx.Delta);
  const marginA = Math.min(u - Math.log(ANSATZ_A_MIN), Math.log(ANSATZ_A_MAX) - u);
  const marginW = Math.min(lw - W_LO, W_HI - lw);
  const stationary = fine.g < ANSATZ_STATIONARY_TOLERANCE;
  const positiveDefinite = fine.ev[0] > 1e-9 && coarse.ev[0] > 1e-9;
  const interior = marginA > 0.03 && marginW > 0.03;
  return {
    relativeGradient: fine.g,
    hessianEigenvalues: fine.ev,
    hessianEigenvaluesCoarse: coarse.ev,
    energyScale: scale,
    marginA,
    marginW,
    stationary,
    positiveDefinite,
    interior,
  };
}

/** The state at (u, v) with its energy parts and verification. */
function stateAt(ctx: Context, u: number, v: number): AnsatzState {
  const verification = verify(ctx, u, v);
  const a = Math.exp(u);
  const w = Math.exp(v);
  ctx.table.localIntegrals(a, ctx.I);
  const parts: SkyrmionEnergyParts = { exchange: 0, anisotropy: 0, dmi: 0, zeeman: 0, magnetostaticSurface: 0, magnetostaticVolume: 0, total: 0 };
  energyAt(ctx, a, w, parts);
  const film = ctx.film;
  let psi: number;
  if (ctx.fixedPsi !== undefined) psi = ctx.fixedPsi;
  else if (film.dmi === "interfacial") psi = Math.acos(Math.max(-1, Math.min(1, ctx.h)));
  else psi = ctx.h > 0 ? Math.PI / 2 : -Math.PI / 2;
  return {
    radius: a * w,
    wallWidth: w,
    helicity: psi,
    energy: parts,
    energyOverBelavinPolyakov: parts.total / (8 * Math.PI * film.A * film.t),
    verification,
  };
}

type LocalOutcome = { kind: "min"; u: number; lw: number } | { kind: "small-edge" | "large-edge" };

/**
 * Downhill walk in u from u0 (inner w warm-started at lw0) to a bracket, then Brent and the Newton
 * polish; or the window edge the energy runs to.
 */
function localSearch(ctx: Context, u0: number, lw0: number): LocalOutcome {
  const uMin = Math.log(ANSATZ_A_MIN);
  const uMax = Math.log(ANSATZ_A_MAX);
  ctx.lwLast = lw0;
  const E = (uu: number) => innerLocal(ctx, uu);
  const u = Math.min(Math.max(u0, uMin), uMax);
  let step = 0.02;
  const f0 = E(u);
  const lwAt0 = ctx.lwLast;
  const up = Math.min(u + step, uMax);
  const fup = E(up);
  let dir = 1;
  let prev = u;
  let cur = up;
  let fcur = fup;
  if (!(fup < f0)) {
    ctx.lwLast = lwAt0;
    const um = Math.max(u - step, uMin);
    const fum = E(um);
    if (fum >= f0) return refine(ctx, um, up, lwAt0);
    dir = -1;
    cur = um;
    fcur = fum;
  }
  for (let it = 0; it < 400; it++) {
    step = Math.min(step * 1.5, 0.3);
    const next = Math.min(uMax, Math.max(uMin, cur + dir * step));
    const lwCur = ctx.lwLast;
    const fnext = E(next);
    if (fnext >= fcur) return refine(ctx, Math.min(prev, next), Math.max(prev, next), lwCur);
    if (next === uMin) return { kind: "small-edge" };
    if (next === uMax) return { kind: "large-edge" };
    prev = cur;
    cur = next;
    fcur = fnext;
  }
  throw new ConvergenceError("skyrmion ansatz search", "no bracket of a minimum within 400 steps", { B: ctx.B, lnA: cur, evaluations: ctx.evals });
}

/** Brent over u in [lo, hi] (inner w from lw0), then the Newton polish in (ln a, ln w). */
function refine(ctx: Context, lo: number, hi: number, lw0: number): LocalOutcome {
  ctx.lwLast = lw0;
  const r = brentMinimize((uu) => innerLocal(ctx, uu), lo, hi, 1e-7, 100);
  innerLocal(ctx, r.x);
  const [u, v] = newtonPolish(ctx, r.x, Math.log(ctx.w));
  return { kind: "min", u, lw: v - Math.log(ctx.Delta) };
}

/** Warm start for the global search (a state of a neighbouring field). */
export interface AnsatzStart {
  radius: number;
  wallWidth: number;
}

/**
 * All verified local minima of the ansatz energy at field B inside the window 0.3 <= R / w <= 100,
 * Delta / 40 <= w <= 40 Delta: a global scan of the w-minimized energy over ln(R / w) (step 0.08; at
 * each point a coarse scan of ln w, step 0.5, then Brent), a local search from each discrete minimum
 * of the scan and from each warm start, the Newton polish, and the verification of each candidate
 * (stationary, Hessian positive definite at two finite-difference steps, not on a window edge).
 */
export function findAnsatzMinima(film: Film, B: number, options: AnsatzOptions & { starts?: readonly AnsatzStart[]; scan?: boolean } = {}): AnsatzSearch {
  if (!Number.isFinite(B)) throw new InputError("B", B, "a finite field in T");
  const ctx = makeContext(film, B, options);
  const uMin = Math.log(ANSATZ_A_MIN);
  const uMax = Math.log(ANSATZ_A_MAX);
  const candidates: Array<{ u: number; lw: number; probe?: boolean }> = [];
  const rejected: string[] = [];
  let small = false;
  let large = false;
  let eSmall = NaN;
  let eLarge = NaN;
  const outcome = (o: LocalOutcome) => {
    if (o.kind === "min") candidates.push({ u: o.u, lw: o.lw });
    else if (o.kind === "small-edge") small = true;
    else large = true;
  };
  if (options.scan !== false) {
    const n = Math.ceil((uMax - uMin) / SCAN_DU);
    // the w-minimized energy at n + 1 points of u = ln(R / w) across the window
    const scan: Array<{ u: number; e: number; lw: number; edge: boolean }> = [];
    for (let i = 0; i <= n; i++) {
      const u = uMin + ((uMax - uMin) * i) / n;
      const g = innerGlobal(ctx, u);
      scan.push({ u, e: g.e, lw: g.lw, edge: g.edge });
    }
    const first = scan[0];
    const second = scan[1];
    const last = scan[n];
    const beforeLast = scan[n - 1];
    if (!first || !second || !last || !beforeLast) throw new Error(`the global scan needs at least 2 points, not ${scan.length}`);
    small = first.e < second.e;
    large = last.e < beforeLast.e;
    eSmall = first.e;
    eLarge = last.e;
    // a minimum between the last two scan points and the window edge is still reportable when it
    // keeps the margin: probe those intervals (a failed probe only confirms the trend)
    if (small) {
      const o = refine(ctx, first.u, second.u, first.lw);
      if (o.kind === "min") candidates.push({ u: o.u, lw: o.lw, probe: true });
    }
    if (large) {
      const o = refine(ctx, beforeLast.u, last.u, last.lw);
      if (o.kind === "min") candidates.push({ u: o.u, lw: o.lw, probe: true });
    }
    for (let i = 1; i < n; i++) {
      const prev = scan[i - 1];
      const cur = scan[i];
      const next = scan[i + 1];
      if (!prev || !cur || !next) continue; // not reached: 1 <= i < n
      if (cur.edge || !(cur.e <= prev.e && cur.e <= next.e)) continue;
      const o = refine(ctx, prev.u, next.u, cur.lw);
      if (o.kind === "min" && Math.abs(o.u - cur.u) > 2 * SCAN_DU) {
        // the polish left the scan bracket: a local search from the scan point decides
        outcome(localSearch(ctx, cur.u, cur.lw));
      } else outcome(o);
    }
  }
  for (const s of options.starts ?? []) {
    if (!(s.radius > 0 && s.wallWidth > 0)) continue;
    const lw = Math.min(Math.max(Math.log(s.wallWidth / ctx.Delta), W_LO + 0.01), W_HI - 0.01);
    outcome(localSearch(ctx, Math.log(s.radius / s.wallWidth), lw));
  }
  const minima: AnsatzState[] = [];
  const seen: Array<[number, number]> = [];
  for (const c of candidates) {
    const v = c.lw + Math.log(ctx.Delta);
    if (seen.some(([u, vv]) => Math.abs(u - c.u) < 1e-4 && Math.abs(vv - v) < 1e-4)) continue;
    seen.push([c.u, v]);
    const st = stateAt(ctx, c.u, v);
    const ver = st.verification;
    if (ver.stationary && ver.positiveDefinite && ver.interior) {
      if (!minima.some((m) => Math.abs(Math.log(m.radius / st.radius)) < 1e-4)) minima.push(st);
    } else {
      if (!ver.interior && ver.stationary) {
        if (c.u > 0.5 * (uMin + uMax)) large = true;
        else small = true;
      }
      if (c.probe) continue;
      rejected.push(
        `R = ${fmtLen(st.radius)}, w = ${fmtLen(st.wallWidth)} not reported: ${[
          ver.stationary ? "" : `gradient ${ver.relativeGradient.toExponential(1)} (relative) is not ~0`,
          ver.positiveDefinite ? "" : "the Hessian is not positive definite",
          ver.interior ? "" : "it lies on an edge of the searched window (0.3 <= R/w <= 100, Delta/40 <= w <= 40 Delta)",
        ]
          .filter((x) => x)
          .join("; ")}.`,
      );
    }
  }
  minima.sort((p, q) => p.radius - q.radius);
  return { minima, decreasesToSmallEdge: small, decreasesToLargeEdge: large, smallEdgeEnergy: eSmall, largeEdgeEnergy: eLarge, rejected, evaluations: ctx.evals };
}

/** A length in um or nm, 4 significant digits. */
export function fmtLen(x: number): string {
  if (x >= 1e-6) return `${(x * 1e6).toPrecision(4)} um`;
  return `${(x * 1e9).toPrecision(4)} nm`;
}
