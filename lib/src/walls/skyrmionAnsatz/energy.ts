/**
 * Energy of the skyrmion ansatz (see ../skyrmionAnsatz.ts) at (a = R / w, w) and its minimum over the
 * wall width w at fixed a: the per-solve context, the energy terms with the optimal helicity, their
 * analytic derivatives in ln w (Newton) and the inner minimization over w (Newton, Brent, coarse scan).
 */
import { mu0 } from "../../quantity/constants.js";
import { requirePerpendicular, wallWidthParameter, type Film } from "../../material/film.js";
import { brentMinimize } from "../../numeric/brentMinimize.js";
import type { SkyrmionEnergyParts } from "../skyrmionEnergy.js";
import type { AnsatzIntegrals } from "./integrals.js";
import { ansatzTable, type AnsatzTable } from "./table.js";

/** Options of the ansatz solver. */
export interface AnsatzOptions {
  /** Include non-local magnetostatics (default true); false: local K_eff model only. */
  nonlocal?: boolean;
  /** Fix the helicity psi (rad); default: optimized (interfacial) or DMI-favoured (bulk). */
  helicity?: number;
  /** Start radius (m) for a local search besides the global scan (warm start); picks the minimum reported. */
  startRadius?: number;
  /** Start wall width (m) with startRadius (default Delta). */
  startWidth?: number;
}

/** State of one solve: the film and field, the table it reads, and the scratch of its evaluations. */
export interface Context {
  film: Film;
  B: number;
  Keff: number;
  Delta: number;
  nonlocal: boolean;
  fixedPsi: number | undefined;
  evals: number;
  I: AnsatzIntegrals;
  // last inner solution
  w: number;
  /** ln(w / Delta) of the last inner minimum (NaN before the first). */
  lwLast: number;
  /** ln(t / Delta): ln tau = lnTauDelta - ln(w / Delta). */
  lnTauDelta: number;
  h: number;
  vf: number;
  /** The table of the non-local integrals and the local integrals (shared: see table.ts). */
  table: AnsatzTable;
  /** Scratch of energyAt (overwritten by each evaluation). */
  terms: AnsatzEnergyTerms;
  /** Energy and its first two derivatives in ln w, written by energyDerivativesInLnW. */
  der: { e: number; e1: number; e2: number };
}

/** The terms of the ansatz energy (J) at one (a, w); see `ansatzEnergyTerms`. */
export interface AnsatzEnergyTerms {
  exchange: number;
  anisotropy: number;
  zeeman: number;
  /** DMI energy at helicity factor h = 1: the DMI term is dmiScale * h. */
  dmiScale: number;
  /** Surface-charge correction (J). */
  surface: number;
  /** Volume-charge correction at cos psi = 1 (J): the term is volumeScale * vf. */
  volumeScale: number;
  /** Helicity factor of the DMI term (cos psi interfacial, sin psi bulk). */
  h: number;
  /** cos^2 psi, the weight of the volume charges. */
  vf: number;
  total: number;
}

/**
 * The ansatz energy at (a = R/w, w) from the local integrals `I` at a and the dimensionless
 * nonlocal values (`surface`, `volume` of ansatzNonlocal(a, t/w); 0 for local magnetostatics), with
 * the optimal helicity (or `fixedPsi`): for interfacial DMI, cos psi minimizes X c + V c^2 on [-1, 1];
 * for bulk DMI the Bloch sign is chosen (no volume charges). Writes into and returns `out`.
 */
export function ansatzEnergyTerms(
  film: Film,
  B: number,
  Keff: number,
  I: AnsatzIntegrals,
  w: number,
  surface: number,
  volume: number,
  fixedPsi: number | undefined,
  out: AnsatzEnergyTerms,
): AnsatzEnergyTerms {
  const twoPiT = 2 * Math.PI * film.t;
  const pref = mu0 * film.Ms * film.Ms * film.t * w * w;
  const X = twoPiT * film.D * w * I.D;
  const V = pref * volume;
  let h: number;
  let vf: number;
  if (fixedPsi !== undefined) {
    h = film.dmi === "interfacial" ? Math.cos(fixedPsi) : Math.sin(fixedPsi);
    vf = Math.cos(fixedPsi) ** 2;
  } else if (film.dmi === "interfacial") {
    if (V > 0 && Math.abs(X) < 2 * V) h = -X / (2 * V);
    else h = X > 0 ? -1 : 1;
    vf = h * h;
  } else {
    h = X > 0 ? -1 : 1;
    vf = 0;
  }
  out.exchange = twoPiT * film.A * I.ex;
  out.anisotropy = twoPiT * Keff * w * w * I.K;
  out.zeeman = twoPiT * film.Ms * B * w * w * I.Z;
  out.dmiScale = X;
  out.surface = pref * surface;
  out.volumeScale = V;
  out.h = h;
  out.vf = vf;
  out.total = out.exchange + out.anisotropy + out.zeeman + X * h + out.surface + vf * V;
  return out;
}

/** The ansatz energy (J) at (a, w) with ctx.I the local integrals at a; the parts into `parts` when given. */
export function energyAt(ctx: Context, a: number, w: number, parts?: SkyrmionEnergyParts): number {
  let surface = 0;
  let volume = 0;
  if (ctx.nonlocal) {
    const nl = ctx.table.nonlocalSlice(a, ctx.film.t / w);
    surface = nl.surface;
    volume = nl.volume;
  }
  const T = ansatzEnergyTerms(ctx.film, ctx.B, ctx.Keff, ctx.I, w, surface, volume, ctx.fixedPsi, ctx.terms);
  ctx.h = T.h;
  ctx.vf = T.vf;
  if (parts) {
    parts.exchange = T.exchange;
    parts.anisotropy = T.anisotropy;
    parts.zeeman = T.zeeman;
    parts.dmi = T.dmiScale * T.h;
    parts.magnetostaticSurface = T.surface;
    parts.magnetostaticVolume = T.vf * T.volumeScale;
    parts.total = T.total;
  }
  return T.total;
}

/**
 * Energy at (a, w = Delta exp(lw)) and its first two derivatives in lw (ctx.I must hold the local
 * integrals at a), from the analytic w-dependence of each term and the slice's derivatives in ln tau
 * (tau = t / w), written to ctx.der. Returns false outside the tau table.
 */
function energyDerivativesInLnW(ctx: Context, a: number, lw: number): boolean {
  const { film, B } = ctx;
  const I = ctx.I;
  const w = ctx.Delta * Math.exp(lw);
  if (!ctx.table.sliceDerivatives(a, ctx.lnTauDelta - lw)) return false;
  const twoPiT = 2 * Math.PI * film.t;
  const ex = twoPiT * film.A * I.ex;
  const Q = twoPiT * (ctx.Keff * I.K + film.Ms * B * I.Z) * w * w; // Q' = 2Q, Q'' = 4Q
  const X = twoPiT * film.D * w * I.D; // X' = X'' = X
  const P = mu0 * film.Ms * film.Ms * film.t * w * w;
  // Phi_s = -exp(s), Phi_v = exp(v) with s, v functions of ln tau = const - lw
  const sd = ctx.table.sliceDer;
  const es = Math.exp(sd.s);
  const s1 = sd.s1;
  const s2 = sd.s2;
  const ev = Math.exp(sd.v);
  const v1 = sd.v1;
  const v2 = sd.v2;
  const fs = -es;
  const fs1 = es * s1;
  const fs2 = -es * (s1 * s1 + s2);
  const fv = ev;
  const fv1 = -ev * v1;
  const fv2 = ev * (v1 * v1 + v2);
  const S = P * fs;
  const S1 = P * (2 * fs + fs1);
  const S2 = P * (4 * fs + 4 * fs1 + fs2);
  const V = P * fv;
  const V1 = P * (2 * fv + fv1);
  const V2 = P * (4 * fv + 4 * fv1 + fv2);
  let H: number;
  let H1: number;
  let H2: number;
  if (ctx.fixedPsi !== undefined) {
    const h = film.dmi === "interfacial" ? Math.cos(ctx.fixedPsi) : Math.sin(ctx.fixedPsi);
    const vf = Math.cos(ctx.fixedPsi) ** 2;
    H = X * h + vf * V;
    H1 = X * h + vf * V1;
    H2 = X * h + vf * V2;
  } else if (film.dmi === "interfacial" && V > 0 && Math.abs(X) < 2 * V) {
    // H = -X^2 / (4 V) = -F / 4, ln F = 2 ln|X| - ln V
    const F = (X * X) / V;
    const g1 = 2 - V1 / V;
    const g2 = (V1 / V) ** 2 - V2 / V;
    H = -F / 4;
    H1 = (-F * g1) / 4;
    H2 = (-F * (g1 * g1 + g2)) / 4;
  } else {
    const h = X > 0 ? -1 : 1;
    const vf = film.dmi === "interfacial" ? 1 : 0;
    H = X * h + vf * V;
    H1 = X * h + vf * V1;
    H2 = X * h + vf * V2;
  }
  const der = ctx.der;
  der.e = ex + Q + S + H;
  der.e1 = 2 * Q + S1 + H1;
  der.e2 = 4 * Q + S2 + H2;
  return true;
}

/**
 * Newton's method for the inner minimum over lw = ln(w / Delta) from l0, inside (lo, hi); NaN when
 * it does not converge there (then Brent takes over).
 */
function innerNewton(ctx: Context, a: number, l0: number, lo: number, hi: number): number {
  let l = l0;
  const der = ctx.der;
  for (let it = 0; it < 12; it++) {
    if (!energyDerivativesInLnW(ctx, a, l)) return NaN;
    if (!(der.e2 > 0)) return NaN;
    let step = -der.e1 / der.e2;
    if (step > 0.25) step = 0.25;
    else if (step < -0.25) step = -0.25;
    l += step;
    if (!(l > lo && l < hi)) return NaN;
    if (Math.abs(step) < 1e-9) return l;
  }
  return NaN;
}

/** The window of ln(w / Delta) searched: Delta / 40 <= w <= 40 Delta. */
export const W_LO = Math.log(1 / 40);
export const W_HI = Math.log(40);

/** Step of the coarse scan in ln w. */
const SCAN_DW = 0.5;

/** A fresh context for one solve at field B (reads the shared table). */
export function makeContext(film: Film, B: number, options: AnsatzOptions): Context {
  const Keff = requirePerpendicular(film, "an isolated skyrmion");
  const Delta = wallWidthParameter(film);
  return {
    film,
    B,
    Keff,
    Delta,
    nonlocal: options.nonlocal ?? true,
    fixedPsi: options.helicity,
    evals: 0,
    I: { ex: 0, K: 0, D: 0, Z: 0 },
    w: Delta,
    lwLast: NaN,
    lnTauDelta: Math.log(film.t / Delta),
    h: 1,
    vf: 1,
    table: ansatzTable,
    terms: { exchange: 0, anisotropy: 0, zeeman: 0, dmiScale: 0, surface: 0, volumeScale: 0, h: 0, vf: 0, total: 0 },
    der: { e: 0, e1: 0, e2: 0 },
  };
}

export interface Inner {
  e: number;
  /** ln(w / Delta) of the minimum over w. */
  lw: number;
  /** The minimum over w lies on an edge of the w window (no interior minimum in w). */
  edge: boolean;
}

/** Energy at u = ln(R / w) minimized over the whole w window: coarse scan in ln w, then Brent. */
export function innerGlobal(ctx: Context, u: number): Inner {
  const a = Math.exp(u);
  ctx.table.localIntegrals(a, ctx.I);
  ctx.evals++;
  const { Delta } = ctx;
  const f = (lw: number) => energyAt(ctx, a, Delta * Math.exp(lw));
  if (!ctx.nonlocal) {
    const gam = ctx.Keff * ctx.I.K + ctx.film.Ms * ctx.B * ctx.I.Z;
    const bet = Math.abs(ctx.film.D * ctx.I.D);
    if (gam > 0 && bet > 0) {
      const l = Math.log(bet / (2 * gam) / Delta);
      if (l > W_LO && l < W_HI) return { e: f(l), lw: l, edge: false };
      const lc = Math.min(Math.max(l, W_LO), W_HI);
      return { e: f(lc), lw: lc, edge: true };
    }
    const lc = gam <= 0 ? W_HI : W_LO;
    return { e: f(lc), lw: lc, edge: true };
  }
  const nk = Math.ceil((W_HI - W_LO) / SCAN_DW);
  let best = 0;
  let eBest = Infinity;
  for (let k = 0; k <= nk; k++) {
    const e = f(W_LO + ((W_HI - W_LO) * k) / nk);
    if (e < eBest) {
      eBest = e;
      best = k;
    }
  }
  const lk = (k: number) => W_LO + ((W_HI - W_LO) * k) / nk;
  if (best === 0 || best === nk) return { e: eBest, lw: lk(best), edge: true };
  const r = brentMinimize(f, lk(best - 1), lk(best + 1), 1e-5, 60);
  return { e: r.f, lw: r.x, edge: false };
}

/**
 * Energy at u minimized over w near the last inner minimum ctx.lwLast (Newton, then Brent on
 * +-0.35 in ln w); the whole window (innerGlobal) when that local minimum sits on its bracket edge.
 * Sets ctx.lwLast and ctx.w.
 */
export function innerLocal(ctx: Context, u: number): number {
  if (!ctx.nonlocal || !(ctx.lwLast === ctx.lwLast)) {
    const g = innerGlobal(ctx, u);
    ctx.lwLast = g.lw;
    ctx.w = ctx.Delta * Math.exp(g.lw);
    return g.e;
  }
  const a = Math.exp(u);
  ctx.table.localIntegrals(a, ctx.I);
  ctx.evals++;
  const { Delta } = ctx;
  const f = (lw: number) => energyAt(ctx, a, Delta * Math.exp(lw));
  const lo = Math.max(W_LO, ctx.lwLast - 0.35);
  const hi = Math.min(W_HI, ctx.lwLast + 0.35);
  let lw = innerNewton(ctx, a, ctx.lwLast, lo, hi);
  if (!(lw === lw)) {
    const r = brentMinimize(f, lo, hi, 1e-7, 80);
    lw = r.x;
    if (lw - lo < 1e-3 || hi - lw < 1e-3) {
      const g = innerGlobal(ctx, u);
      lw = g.lw;
    }
  }
  ctx.lwLast = lw;
  ctx.w = Delta * Math.exp(lw);
  return f(lw);
}
