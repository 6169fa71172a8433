/**
 * Dynamic structure factor of spin-1/2 rings, all polarization channels.
 *
 * Definition (N sites, S^a_q = N^{-1/2} sum_j e^{-iqj} S^a_j, so S^a_{-q} = (S^a_q)^dagger):
 *   S^{ab}(q, w) = sum_{m,n} p_m conj(<n|S^a_{-q}|m>) <n|S^b_{-q}|m> delta(w - E_n + E_m),
 * p_m the Boltzmann weights. At each (q, w) the 3 x 3 matrix S^{ab} is Hermitian and positive; its
 * antisymmetric part, seen by polarized neutrons, is the real chiral function
 *   C(q, w) = i (S^{yz} - S^{zy}) = -2 Im S^{yz}.
 *
 * Sum rules (derived here, verified in the tests):
 * - weight: int dw S^{aa}(q, w) = <S^a_q S^a_{-q}>, and (1/N) sum_q of it is <(S^a_j)^2> = 1/4.
 * - first moment (Hohenberg-Brinkman f-sum rule, P. Hohenberg, W. Brinkman, PRB 10, 128 (1974)),
 *   for a reflection-symmetric state: int dw w S^{zz}(q, w) = (1/2) <[S^z_q, [H, S^z_{-q}]]>
 *     = -Jperp (1 - cos q) <S^x_j S^x_{j+1} + S^y_j S^y_{j+1}> + (hx / 2) <S^x_j>
 *   (the exchange term from [S^z_j, S^+_j S^-_{j+1}] = S^+_j S^-_{j+1}; the field term from
 *   [S^z, [-hx S^x, S^z]] = hx S^x, per site).
 * - chiral weight: int dw C(q, w) = i <S^y_q S^z_{-q} - S^z_q S^y_{-q}>; the j = l terms give
 *   (i/N) sum_j <[S^y_j, S^z_j]> = -<S^x_j>, the j != l terms (2/N) sum sin(q(j-l)) <S^y_j S^z_l>
 *   cancel in a reflection-symmetric state. So int dw C = -<S^x> per site for every q; with hx = 0
 *   the Hamiltonian conserves S^z and S^y_{-q}|m> and S^z_{-q}|m> lie in different S^z sectors, so
 *   C vanishes identically; the pi rotation about z maps hx -> -hx and S^y -> -S^y, S^z -> S^z,
 *   so C is odd in hx.
 * - detailed balance: S^{aa}(-q, -w) = e^{-w/T} S^{aa}(q, w); with reflection S^{aa}(-q) = S^{aa}(q).
 *
 * Methods. T = 0: the ground state by Lanczos in its momentum sector, phi = A|0> for each needed
 * combination A of S^a_{-q}, and the Lanczos continued fraction of <phi|(w + E0 + i eta - H)^{-1}|phi>
 * (E. Gagliano, C. Balseiro, PRL 59, 2999 (1987)); cross terms by the polarization identity
 * <x|X|y> = (1/4) sum_{k=0..3} i^{-k} G(x + i^k y). T > 0: every level of every momentum sector by
 * dense diagonalization and the double sum over states (rings up to N = 12). Both broaden each line
 * into a Lorentzian of half width eta. The momentum sectors are those of translations only (the full
 * 2^N space, S^z not used), so that the vanishing of C at hx = 0 is computed, not imposed.
 */
import { InputError } from "../errors.js";
import type { ChainModel } from "./model.js";
import { ChainSector } from "./basis.js";
import { ChainHamiltonian, applyBetweenSectors, toComplex, type TermGenerator } from "./operator.js";
import { ComputationStopped, lowestEigenpairs, lanczosTridiagonal, continuedFractionSpectrum, dot, type TridiagonalResult } from "./lanczos.js";
import { sectorDense } from "./spectrum.js";

export type DsfComponent = "xx" | "yy" | "zz" | "xy" | "xz" | "yz" | "chiral";
export const dsfComponents: readonly DsfComponent[] = ["xx", "yy", "zz", "xy", "xz", "yz", "chiral"];

export interface DsfOptions {
  /** Temperature (energy unit of the model, k_B = 1); 0 for the ground state. */
  T?: number;
  /** Lorentzian half width. */
  eta: number;
  /** Energy transfers. */
  omega: number[];
  components?: DsfComponent[];
  /** Momentum indices n (q = 2 pi n / N); default 0..floor(N/2). */
  qIndices?: number[];
  /** Continued-fraction depth (T = 0). */
  steps?: number;
  onProgress?: (done: number, total: number) => void;
  shouldStop?: () => boolean;
  /** Largest N for T > 0 (full spectrum). */
  maxThermalSites?: number;
}

export interface DsfChannel {
  /** Real part, per q, over omega. */
  re: Float64Array[];
  /** Imaginary part (off-diagonal channels only). */
  im?: Float64Array[];
  /** Exact frequency integral per q (real part; C for the chiral channel). */
  weight: number[];
}

export interface DsfResult {
  N: number;
  T: number;
  q: number[];
  qIndex: number[];
  omega: number[];
  channels: Partial<Record<DsfComponent, DsfChannel>>;
  groundEnergy: number;
  /** <S^x> per site and the nearest-neighbour transverse correlator <S^x S^x + S^y S^y>. */
  mx: number;
  transverseBond: number;
  sumRules: {
    /** (1/N) sum over all q of the weight of S^aa (expected 1/4), for the computed diagonal channels. */
    totalWeight: Partial<Record<"xx" | "yy" | "zz", number>>;
    /** zz first moment per q: exact (from the states) and from the f-sum formula. */
    firstMomentZZ?: { exact: number[]; formula: number[] };
    /** Chiral weight per q against -<S^x>. */
    chiralWeight?: { exact: number[]; expected: number };
    /** Largest relative violation of detailed balance over the diagonal channels (T > 0). */
    detailedBalance?: number;
  };
  notes: string[];
  method: string;
}

/** Terms of A = sum_a c_a S^a_{-q} on a word (c = [cx, cy, cz] complex as [re, im] pairs). */
function spinTerms(N: number, q: number, c: number[]): TermGenerator {
  const [xr, xi, yr, yi, zr, zi] = c as [number, number, number, number, number, number];
  const s = 1 / Math.sqrt(N);
  const cq = Float64Array.from({ length: N }, (_, j) => Math.cos(q * j) * s);
  const sq = Float64Array.from({ length: N }, (_, j) => Math.sin(q * j) * s);
  return (a, emit) => {
    let dr = 0,
      di = 0;
    for (let j = 0; j < N; j++) {
      const up = (a >>> j) & 1;
      const sz = up ? 0.5 : -0.5;
      // S^z_j: diagonal, S^x_j: flip with 1/2, S^y_j: flip with +i/2 (up) or -i/2 (down)
      dr += sz * cq[j]!;
      di += sz * sq[j]!;
      const yre = 0,
        yim = up ? 0.5 : -0.5;
      // coefficient of the flipped word: e^{iqj} (cx/2 + cy (i s)) with s = +-1/2
      const fr = 0.5 * xr + (yr * yre - yi * yim);
      const fi = 0.5 * xi + (yr * yim + yi * yre);
      if (fr !== 0 || fi !== 0) emit((a ^ (1 << j)) >>> 0, fr * cq[j]! - fi * sq[j]!, fr * sq[j]! + fi * cq[j]!);
    }
    const er = zr * dr - zi * di,
      ei = zr * di + zi * dr;
    if (er !== 0 || ei !== 0) emit(a, er, ei);
  };
}

const unitC: Record<"x" | "y" | "z", number[]> = {
  x: [1, 0, 0, 0, 0, 0],
  y: [0, 0, 1, 0, 0, 0],
  z: [0, 0, 0, 0, 1, 0],
};
/** a + i^k b as coefficient vectors. */
function combine(a: number[], b: number[], k: number): number[] {
  const ph = [
    [1, 0],
    [0, 1],
    [-1, 0],
    [0, -1],
  ][k]!;
  const out = a.slice();
  for (let t = 0; t < 3; t++) {
    const br = b[2 * t]!,
      bi = b[2 * t + 1]!;
    out[2 * t] = out[2 * t]! + ph[0]! * br - ph[1]! * bi;
    out[2 * t + 1] = out[2 * t + 1]! + ph[0]! * bi + ph[1]! * br;
  }
  return out;
}

function checkOptions(model: ChainModel, o: DsfOptions): { T: number; comps: DsfComponent[]; qIdx: number[] } {
  if (model.boundary !== "periodic") throw new InputError("boundary", model.boundary, "a ring (periodic): S(q, w) uses the momentum sectors");
  if (model.N > 20) throw new InputError("N", model.N, "at most 20 sites for S(q, w) (2^N / N states per momentum sector)");
  const T = o.T ?? 0;
  if (!(T >= 0) || !Number.isFinite(T)) throw new InputError("T", o.T, "a temperature >= 0");
  if (!(o.eta > 0) || !Number.isFinite(o.eta)) throw new InputError("eta", o.eta, "a positive broadening (half width)");
  if (!Array.isArray(o.omega) || o.omega.length === 0 || o.omega.some((w) => !Number.isFinite(w))) throw new InputError("omega", o.omega, "a non-empty list of finite energies");
  const comps = o.components ?? ["xx", "yy", "zz", "chiral"];
  for (const c of comps) if (!dsfComponents.includes(c)) throw new InputError("components", c, `some of ${dsfComponents.join(", ")}`);
  const qIdx = o.qIndices ?? Array.from({ length: Math.floor(model.N / 2) + 1 }, (_, i) => i);
  for (const n of qIdx) if (!Number.isInteger(n) || n < 0 || n >= model.N) throw new InputError("qIndices", n, `momentum indices 0..${model.N - 1}`);
  return { T, comps, qIdx };
}

/** Multiplicity of q index n among all N momenta when S(-q) = S(q) (reflection). */
function multiplicity(N: number, n: number): number {
  return n === 0 || 2 * n === N ? 1 : 2;
}

export function dynamicStructureFactor(model: ChainModel, options: DsfOptions): DsfResult {
  const { T, comps, qIdx } = checkOptions(model, options);
  if (T > 0) return thermalDsf(model, options, T, comps, qIdx);
  return groundStateDsf(model, options, comps, qIdx);
}

/** The Hamiltonian with Jperp = 1 only: <.|H|.> / N is the transverse bond correlator. */
function bondOperator(model: ChainModel, sector: ChainSector): ChainHamiltonian {
  return new ChainHamiltonian({ ...model, Jz: 0, Jperp: 1, hx: 0, hz: 0 }, sector);
}

/** A continued fraction split into the flip-parity sectors it reaches (their spectra add). */
interface Cf {
  parts: TridiagonalResult[];
  norm2: number;
}

function groundStateDsf(model: ChainModel, o: DsfOptions, comps: DsfComponent[], qIdx: number[]): DsfResult {
  const N = model.N;
  const notes: string[] = [];
  // ground state: lowest level over the momentum sectors (reflection pairs m, N - m are degenerate),
  // split by the parity under the pi rotation about x when it commutes (hx != 0, hz = 0). The lowest
  // level of each sector by the plain recursion (no vectors), then the vector of the best sector only;
  // the lowest levels of the other sectors tell whether the ground state is isolated.
  const useFlip = model.hx !== 0 && model.hz === 0;
  const flips: Array<0 | 1 | -1> = useFlip ? [1, -1] : [0];
  let best: { e: number; m: number; flip: 0 | 1 | -1; v: Float64Array; sector: ChainSector; H: ChainHamiltonian } | null = null;
  const energies: number[] = [];
  for (let m = 0; m <= Math.floor(N / 2); m++) {
    for (const flip of flips) {
      const sector = new ChainSector(N, { nUp: null, m, flip });
      if (sector.dim === 0) continue;
      const H = new ChainHamiltonian(model, sector);
      const r = lowestEigenpairs(H, { levels: 1, tol: 1e-11, vectors: false, reorthogonalization: "none", shouldStop: o.shouldStop });
      energies.push(r.values[0]!);
      if (!best || r.values[0]! < best.e) best = { e: r.values[0]!, m, flip, v: new Float64Array(0), sector, H };
    }
  }
  {
    // the vector of the winning sector (the same recursion again, accumulating the Ritz vector)
    const r = lowestEigenpairs(best!.H, { levels: 1, tol: 1e-11, reorthogonalization: "none", shouldStop: o.shouldStop });
    energies[energies.indexOf(best!.e)] = r.values[0]!;
    best!.e = r.values[0]!;
    best!.v = toComplex(r.vectors[0]!, best!.sector.complex);
  }
  const e0 = best!.e;
  energies.sort((a, b) => a - b);
  const split = energies[1]! - energies[0]!;
  if (split < 1e-8 * Math.max(1, Math.abs(e0)) || (best!.m !== 0 && 2 * best!.m !== N)) {
    notes.push(
      `the ground state is (nearly) degenerate (lowest level of another momentum sector ${split.toExponential(2)} above, or a +-k pair): the T = 0 result refers to one state of the ground multiplet`,
    );
  }
  const src = best!.sector;
  const g = best!.v;
  // <S^x> per site and the transverse bond correlator in the ground state
  const tmp = new Float64Array(g.length);
  applyBetweenSectors(src, src, spinTerms(N, 0, unitC.x), g, tmp);
  const c2 = new Float64Array(2);
  dot(g, tmp, true, c2);
  const mx = c2[0]! / Math.sqrt(N);
  const Hb = bondOperator(model, src);
  const gb = src.complex ? g : Float64Array.from({ length: g.length / 2 }, (_, i) => g[2 * i]!);
  const hb = new Float64Array(gb.length);
  Hb.apply(gb, hb);
  dot(gb, hb, src.complex, c2);
  const transverseBond = c2[0]! / N;

  const steps = o.steps ?? 200;
  const channels: Partial<Record<DsfComponent, DsfChannel>> = {};
  for (const c of comps) channels[c] = { re: [], weight: [], ...(["xy", "xz", "yz"].includes(c) ? { im: [] } : {}) };
  const qs: number[] = [];
  const exactM1: number[] = [];
  const formulaM1: number[] = [];
  const chiralW: number[] = [];
  let done = 0;
  for (const n of qIdx) {
    const q = (2 * Math.PI * n) / N;
    qs.push(q);
    const mT = (((best!.m - n) % N) + N) % N;
    // destination sectors: momentum k0 - q; with the flip, S^x keeps the parity and S^y, S^z change it
    const dsts = new Map<number, { sector: ChainSector; op: { dim: number; complex: boolean; apply: (v: Float64Array, w: Float64Array) => void } }>();
    const dstOf = (flip: 0 | 1 | -1) => {
      let d = dsts.get(flip);
      if (!d) {
        const sector = new ChainSector(N, { nUp: null, m: mT, flip });
        const Hd = new ChainHamiltonian(model, sector);
        d = { sector, op: { dim: sector.dim, complex: true, apply: complexOperator(Hd) } };
        dsts.set(flip, d);
      }
      return d;
    };
    const cfCache = new Map<string, Cf>();
    const G = (coef: number[]): Cf => {
      const key = coef.join(",");
      let t = cfCache.get(key);
      if (!t) {
        // the part of the operator that keeps the flip parity (x) and the part that changes it (y, z)
        const pieces: Array<{ c: number[]; flip: 0 | 1 | -1 }> = !useFlip
          ? [{ c: coef, flip: 0 }]
          : [
              { c: [coef[0]!, coef[1]!, 0, 0, 0, 0], flip: best!.flip },
              { c: [0, 0, coef[2]!, coef[3]!, coef[4]!, coef[5]!], flip: -best!.flip as 1 | -1 },
            ];
        const parts: TridiagonalResult[] = [];
        for (const piece of pieces) {
          if (piece.c.every((x) => x === 0)) continue;
          const dst = dstOf(piece.flip);
          if (dst.sector.dim === 0) continue;
          const phi = new Float64Array(2 * dst.sector.dim);
          applyBetweenSectors(src, dst.sector, spinTerms(N, q, piece.c), g, phi);
          parts.push(lanczosTridiagonal(dst.op, phi, steps, o.shouldStop));
        }
        t = { parts, norm2: parts.reduce((a, p) => a + p.norm2, 0) };
        cfCache.set(key, t);
      }
      return t;
    };
    const spectrum = (t: Cf): Float64Array => Float64Array.from(o.omega, (w) => t.parts.reduce((acc, p) => acc + continuedFractionSpectrum(p, w, e0, o.eta), 0));
    for (const c of comps) {
      const ch = channels[c]!;
      if (c === "xx" || c === "yy" || c === "zz") {
        const t = G(unitC[c[0] as "x"]);
        ch.re.push(spectrum(t));
        ch.weight.push(t.norm2);
        if (c === "zz") {
          exactM1.push(t.parts.reduce((acc, p) => acc + (p.a[0]! - e0) * p.norm2, 0));
          formulaM1.push(-model.Jperp * (1 - Math.cos(q)) * transverseBond + (model.hx / 2) * mx);
        }
      } else if (c === "chiral") {
        const tp = G(combine(unitC.y, unitC.z, 1));
        const sp = spectrum(tp);
        let re: Float64Array, w: number;
        if (comps.includes("yy") && comps.includes("zz")) {
          // G(y + iz) + G(y - iz) = 2 (G(y) + G(z)): C = (G(y + iz) - G(y - iz)) / 2 = G(y + iz) - G(y) - G(z),
          // one continued fraction fewer when S^yy and S^zz are computed anyway
          const ty = G(unitC.y),
            tz = G(unitC.z);
          const sy = spectrum(ty),
            sz = spectrum(tz);
          re = sp.map((v, i) => v - sy[i]! - sz[i]!);
          w = tp.norm2 - ty.norm2 - tz.norm2;
        } else {
          const tm = G(combine(unitC.y, unitC.z, 3));
          const sm = spectrum(tm);
          re = sp.map((v, i) => 0.5 * (v - sm[i]!));
          w = 0.5 * (tp.norm2 - tm.norm2);
        }
        ch.re.push(re);
        ch.weight.push(w);
        chiralW.push(w);
      } else {
        const a = unitC[c[0] as "x"],
          b = unitC[c[1] as "x"];
        const t0 = G(combine(a, b, 0)),
          t1 = G(combine(a, b, 1)),
          t2 = G(combine(a, b, 2)),
          t3 = G(combine(a, b, 3));
        const s0 = spectrum(t0),
          s1 = spectrum(t1),
          s2 = spectrum(t2),
          s3 = spectrum(t3);
        ch.re.push(s0.map((v, i) => 0.25 * (v - s2[i]!)));
        ch.im!.push(s0.map((_, i) => 0.25 * (s3[i]! - s1[i]!)));
        ch.weight.push(0.25 * (t0.norm2 - t2.norm2));
      }
    }
    done++;
    o.onProgress?.(done, qIdx.length);
  }
  const result = assemble(model, 0, qs, qIdx, o.omega, channels, e0, mx, transverseBond, notes);
  if (exactM1.length) result.sumRules.firstMomentZZ = { exact: exactM1, formula: formulaM1 };
  if (chiralW.length) result.sumRules.chiralWeight = { exact: chiralW, expected: -mx };
  result.method = `T = 0: Lanczos ground state (k = ${((2 * Math.PI * best!.m) / N).toFixed(4)}${useFlip ? `, parity ${best!.flip > 0 ? "+1" : "-1"} under the pi rotation about x` : ""}), continued fractions of depth <= ${steps} (Gagliano-Balseiro), Lorentzian half width ${o.eta}`;
  return result;
}

/** H on interleaved complex vectors; a real sector applies H to the real and imaginary parts (buffers kept). */
function complexOperator(H: ChainHamiltonian): (v: Float64Array, w: Float64Array) => void {
  if (H.complex) return (v, w) => H.apply(v, w);
  const n = H.dim;
  const a = new Float64Array(n),
    b = new Float64Array(n),
    ra = new Float64Array(n),
    rb = new Float64Array(n);
  return (v, w) => {
    for (let i = 0; i < n; i++) {
      a[i] = v[2 * i]!;
      b[i] = v[2 * i + 1]!;
    }
    H.apply(a, ra);
    H.apply(b, rb);
    for (let i = 0; i < n; i++) {
      w[2 * i] = ra[i]!;
      w[2 * i + 1] = rb[i]!;
    }
  };
}

function applyComplex(H: ChainHamiltonian, v: Float64Array, w: Float64Array): void {
  complexOperator(H)(v, w);
}

function assemble(
  model: ChainModel,
  T: number,
  q: number[],
  qIdx: number[],
  omega: number[],
  channels: Partial<Record<DsfComponent, DsfChannel>>,
  e0: number,
  mx: number,
  transverseBond: number,
  notes: string[],
): DsfResult {
  const N = model.N;
  const totalWeight: DsfResult["sumRules"]["totalWeight"] = {};
  const complete = new Set(qIdx).size === Math.floor(N / 2) + 1 && qIdx.every((n) => 2 * n <= N);
  for (const c of ["xx", "yy", "zz"] as const) {
    const ch = channels[c];
    if (!ch || !complete) continue;
    let s = 0;
    qIdx.forEach((n, i) => (s += multiplicity(N, n) * ch.weight[i]!));
    totalWeight[c] = s / N;
  }
  if (!complete) notes.push("the total-weight sum rule needs q indices 0..N/2; not reported for this selection");
  return { N, T, q, qIndex: qIdx, omega, channels, groundEnergy: e0, mx, transverseBond, sumRules: { totalWeight }, notes, method: "" };
}

/** Largest N for the finite-temperature sums. */
export const maxThermalDsfSites = 12;

function thermalDsf(model: ChainModel, o: DsfOptions, T: number, comps: DsfComponent[], qIdx: number[]): DsfResult {
  const N = model.N;
  const maxN = o.maxThermalSites ?? maxThermalDsfSites;
  if (N > maxN) throw new InputError("N", N, `at most ${maxN} sites at T > 0 (every level of the 2^N states is summed)`);
  const notes: string[] = [];
  // all levels and vectors per momentum sector
  const secs: Array<{ sector: ChainSector; values: Float64Array; vectors: Float64Array[] }> = [];
  let e0 = Infinity;
  for (let m = 0; m < N; m++) {
    if (o.shouldStop?.()) throw new ComputationStopped("finite-temperature S(q, w)", { matvecs: m });
    const sector = new ChainSector(N, { nUp: null, m, flip: 0 });
    const d = sectorDense(model, sector, true);
    secs.push({ sector, values: d.values, vectors: d.vectors! });
    e0 = Math.min(e0, d.values[0]!);
  }
  let Z = 0;
  for (const s of secs) for (const e of s.values) Z += Math.exp(-(e - e0) / T);
  const pOf = (e: number): number => Math.exp(-(e - e0) / T) / Z;
  const cut = 1e-14;
  // thermal <S^x> and transverse bond correlator
  let mx = 0,
    bond = 0;
  const c2 = new Float64Array(2);
  for (const s of secs) {
    const Sx = spinTerms(N, 0, unitC.x);
    const Hb = bondOperator(model, s.sector);
    const w = new Float64Array(2 * s.sector.dim);
    for (let i = 0; i < s.values.length; i++) {
      const p = pOf(s.values[i]!);
      if (p < cut) continue;
      applyBetweenSectors(s.sector, s.sector, Sx, s.vectors[i]!, w);
      dot(s.vectors[i]!, w, true, c2);
      mx += (p * c2[0]!) / Math.sqrt(N);
      applyComplex(Hb, s.vectors[i]!, w);
      dot(s.vectors[i]!, w, true, c2);
      bond += (p * c2[0]!) / N;
    }
  }
  const channels: Partial<Record<DsfComponent, DsfChannel>> = {};
  for (const c of comps) channels[c] = { re: [], weight: [], ...(["xy", "xz", "yz"].includes(c) ? { im: [] } : {}) };
  const qs: number[] = [];
  const exactM1: number[] = [];
  const formulaM1: number[] = [];
  const chiralW: number[] = [];
  let dbWorst = 0;
  const elastic = 1e-9 * Math.max(1, Math.abs(e0));
  const omega = Float64Array.from(o.omega);
  const nOmega = omega.length;
  const etaPi = o.eta / Math.PI,
    eta2 = o.eta * o.eta;
  // lines below this weight are dropped (selection rules make most elements vanish)
  const lineCut = 1e-15;
  const compA = comps.map((c) => (c === "chiral" ? 1 : "xyz".indexOf(c[0]!)));
  const compB = comps.map((c) => (c === "chiral" ? 2 : "xyz".indexOf(c[1]!)));
  const compChiral = comps.map((c) => c === "chiral");
  const amp = new Float64Array(6),
    diagEl = new Float64Array(3);
  let done = 0;
  for (const n of qIdx) {
    const q = (2 * Math.PI * n) / N;
    qs.push(q);
    const acc = comps.map(() => ({ re: new Float64Array(o.omega.length), im: new Float64Array(o.omega.length), w: 0 }));
    let m1 = 0;
    const neg = new Float64Array(3),
      posB = new Float64Array(3),
      tot = new Float64Array(3);
    for (let m = 0; m < N; m++) {
      const src = secs[m]!;
      const dst = secs[(((m - n) % N) + N) % N]!;
      const ops = (["x", "y", "z"] as const).map((a) => spinTerms(N, q, unitC[a]));
      const w = [0, 1, 2].map(() => new Float64Array(2 * dst.sector.dim));
      for (let i = 0; i < src.values.length; i++) {
        const p = pOf(src.values[i]!);
        if (p < cut) continue;
        for (let a = 0; a < 3; a++) applyBetweenSectors(src.sector, dst.sector, ops[a]!, src.vectors[i]!, w[a]!);
        for (let j = 0; j < dst.values.length; j++) {
          const dw = dst.values[j]! - src.values[i]!;
          for (let a = 0; a < 3; a++) {
            dot(dst.vectors[j]!, w[a]!, true, c2);
            amp[2 * a] = c2[0]!;
            amp[2 * a + 1] = c2[1]!;
          }
          // element (a, b) = p conj(amp_a) amp_b
          for (let a = 0; a < 3; a++) {
            const v = p * (amp[2 * a]! * amp[2 * a]! + amp[2 * a + 1]! * amp[2 * a + 1]!);
            diagEl[a] = v;
            tot[a] = tot[a]! + v;
            // lines between degenerate levels (|dw| at rounding level) are elastic: on neither side
            if (dw < -elastic) neg[a] = neg[a]! + v;
            else if (dw > elastic) posB[a] = posB[a]! + v * Math.exp(-dw / T);
          }
          m1 += dw * diagEl[2]!;
          for (let ci = 0; ci < comps.length; ci++) {
            const x = compA[ci]!,
              y = compB[ci]!;
            const ar = amp[2 * x]!,
              ai = amp[2 * x + 1]!,
              br = amp[2 * y]!,
              bi = amp[2 * y + 1]!;
            let re = p * (ar * br + ai * bi);
            let im = p * (ar * bi - ai * br);
            if (compChiral[ci]) {
              re = -2 * im;
              im = 0;
            }
            if (Math.abs(re) < lineCut && Math.abs(im) < lineCut) continue;
            const A = acc[ci]!;
            A.w += re;
            for (let t = 0; t < nOmega; t++) {
              const x2 = omega[t]! - dw;
              const l = etaPi / (x2 * x2 + eta2);
              A.re[t] = A.re[t]! + re * l;
              if (im !== 0) A.im[t] = A.im[t]! + im * l;
            }
          }
        }
      }
    }
    comps.forEach((c, ci) => {
      const ch = channels[c]!;
      ch.re.push(acc[ci]!.re);
      if (ch.im) ch.im.push(acc[ci]!.im);
      ch.weight.push(acc[ci]!.w);
      if (c === "chiral") chiralW.push(acc[ci]!.w);
    });
    exactM1.push(m1);
    formulaM1.push(-model.Jperp * (1 - Math.cos(q)) * bond + (model.hx / 2) * mx);
    for (let a = 0; a < 3; a++) if (tot[a]! > 0) dbWorst = Math.max(dbWorst, Math.abs(neg[a]! - posB[a]!) / tot[a]!);
    done++;
    o.onProgress?.(done, qIdx.length);
  }
  const result = assemble(model, T, qs, qIdx, o.omega, channels, e0, mx, bond, notes);
  result.sumRules.firstMomentZZ = { exact: exactM1, formula: formulaM1 };
  if (chiralW.length) result.sumRules.chiralWeight = { exact: chiralW, expected: -mx };
  result.sumRules.detailedBalance = dbWorst;
  result.method = `T = ${T}: dense diagonalization of all ${N} momentum sectors and the double sum over states, Lorentzian half width ${o.eta}`;
  return result;
}
