/**
 * Matrix-free operators on chain sectors: H v and the Fourier-transformed spin operators, on
 * typed arrays. Real sectors hold vectors as Float64Array(dim); complex sectors as interleaved
 * Float64Array(2 dim) (re at 2i, im at 2i + 1).
 *
 * Terms of H on a basis word a (bit i set = spin i up, S^z_i = +-1/2):
 *   diagonal  sum_bonds Jz s_i s_{i+1} - hz sum_i s_i,
 *   exchange  (Jperp / 2)(S^+_i S^-_{i+1} + h.c.): flips an antiparallel pair, amplitude Jperp / 2,
 *   field     -hx S^x_i: flips spin i, amplitude -hx / 2.
 * In a symmetry sector the term c |b> of |r0> contributes c chi(h) sqrt(S_r'/S_r) to row r'
 * (basis.ts header).
 */
import type { ChainModel } from "./model.js";
import { bondCount } from "./model.js";
import { ChainSector } from "./basis.js";

/** A linear operator on a sector's vectors (what Lanczos needs). */
export interface SectorOperator {
  dim: number;
  complex: boolean;
  /** w = A v (w is overwritten). */
  apply(v: Float64Array, w: Float64Array): void;
}

/** Emits the plain-basis terms c |b> of an operator acting on the word a. */
export type TermGenerator = (a: number, emit: (b: number, re: number, im: number) => void) => void;

/**
 * Largest off-diagonal store kept as a sparse matrix (bytes, upper bound dim x terms x entry): above
 * it H is applied matrix-free from the bit patterns.
 */
export const matrixStoreBytes = 4e8;

/** Upper bound of the bytes of H's off-diagonal store for a sector (see ChainHamiltonian). */
export function matrixStoreEstimate(model: ChainModel, dim: number, complex: boolean): number {
  const terms = (model.Jperp !== 0 ? bondCount(model) : 0) + (model.hx !== 0 ? model.N : 0);
  return dim * terms * (4 + (complex ? 16 : 8)) + 4 * (dim + 1);
}

/**
 * The Hamiltonian restricted to one sector. Built once into a compressed-row sparse matrix of its
 * off-diagonal part (row a holds conj(H_{b a}) = H_{a b} for the terms b of a; rows read v by
 * gathering, write w once) when that store fits `matrixStoreBytes`; else applied matrix-free.
 */
export class ChainHamiltonian implements SectorOperator {
  readonly model: ChainModel;
  readonly sector: ChainSector;
  readonly dim: number;
  readonly complex: boolean;
  /** Diagonal energies of the representatives. */
  readonly diag: Float64Array;
  private readonly bonds: Uint32Array;
  private readonly sqrtStab: Float64Array;
  private readonly plain: boolean;
  private csr: { ptr: Int32Array; col: Int32Array; re: Float64Array; im: Float64Array | null } | null = null;

  constructor(model: ChainModel, sector: ChainSector, options: { matrix?: boolean } = {}) {
    this.model = model;
    this.sector = sector;
    this.dim = sector.dim;
    this.complex = sector.complex;
    const N = model.N;
    const nb = bondCount(model);
    this.bonds = new Uint32Array(nb);
    for (let i = 0; i < nb; i++) this.bonds[i] = ((1 << i) | (1 << ((i + 1) % N))) >>> 0;
    this.diag = new Float64Array(this.dim);
    for (let a = 0; a < this.dim; a++) this.diag[a] = diagonalEnergy(model, sector.reps[a]!, this.bonds);
    this.sqrtStab = sector.stab.map(Math.sqrt);
    this.plain = sector.G === 1;
    const store = matrixStoreEstimate(model, this.dim, this.complex);
    if (options.matrix ?? store <= matrixStoreBytes) this.csr = this.buildMatrix();
  }

  /** True when H is held as a sparse matrix (else matrix-free). */
  get stored(): boolean {
    return this.csr !== null;
  }

  /** The off-diagonal part as compressed rows (one pass of the term generator). */
  private buildMatrix(): { ptr: Int32Array; col: Int32Array; re: Float64Array; im: Float64Array | null } {
    const sec = this.sector;
    const dim = this.dim;
    const cplx = this.complex;
    const bound = Math.max(1, Math.round((matrixStoreEstimate(this.model, dim, cplx) - 4 * (dim + 1)) / (4 + (cplx ? 16 : 8))));
    let col = new Int32Array(bound);
    let re = new Float64Array(bound);
    let im = cplx ? new Float64Array(bound) : null;
    const ptr = new Int32Array(dim + 1);
    const G = sec.G,
      lookup = sec.lookup,
      ranker = sec.ranker,
      chiRe = sec.chiRe,
      chiIm = sec.chiIm;
    const sq = this.sqrtStab;
    let nnz = 0;
    for (let a = 0; a < dim; a++) {
      const inv = 1 / sq[a]!;
      this.offDiagonalTerms(sec.reps[a]!, (b, c) => {
        const code = lookup[ranker ? ranker.rank(b) : b]!;
        if (code < 0) return;
        const idx = (code / G) | 0;
        const g = code - idx * G;
        const f = c * sq[idx]! * inv;
        // H_{idx a} = f chi(g); row a holds its conjugate at column idx
        col[nnz] = idx;
        re[nnz] = f * chiRe[g]!;
        if (im) im[nnz] = -f * chiIm[g]!;
        nnz++;
      });
      ptr[a + 1] = nnz;
    }
    if (nnz < bound) {
      col = col.slice(0, nnz);
      re = re.slice(0, nnz);
      if (im) im = im.slice(0, nnz);
    }
    return { ptr, col, re, im };
  }

  private applyStored(v: Float64Array, w: Float64Array): void {
    const { ptr, col, re, im } = this.csr!;
    const diag = this.diag;
    const dim = this.dim;
    if (!im) {
      for (let a = 0; a < dim; a++) {
        let s = diag[a]! * v[a]!;
        const end = ptr[a + 1]!;
        for (let p = ptr[a]!; p < end; p++) s += re[p]! * v[col[p]!]!;
        w[a] = s;
      }
      return;
    }
    for (let a = 0; a < dim; a++) {
      const d = diag[a]!;
      let sr = d * v[2 * a]!;
      let si = d * v[2 * a + 1]!;
      const end = ptr[a + 1]!;
      for (let p = ptr[a]!; p < end; p++) {
        const j = 2 * col[p]!;
        const hr = re[p]!,
          hi = im[p]!;
        const xr = v[j]!,
          xi = v[j + 1]!;
        sr += hr * xr - hi * xi;
        si += hr * xi + hi * xr;
      }
      w[2 * a] = sr;
      w[2 * a + 1] = si;
    }
  }

  /** Plain-basis terms of H (off-diagonal only) on the word a. */
  offDiagonalTerms(a: number, emit: (b: number, re: number, im: number) => void): void {
    const half = this.model.Jperp / 2;
    if (half !== 0) {
      for (let i = 0; i < this.bonds.length; i++) {
        const mk = this.bonds[i]!;
        const x = a & mk;
        if (x !== 0 && x !== mk) emit((a ^ mk) >>> 0, half, 0);
      }
    }
    const fx = -this.model.hx / 2;
    if (fx !== 0) for (let i = 0; i < this.model.N; i++) emit((a ^ (1 << i)) >>> 0, fx, 0);
  }

  apply(v: Float64Array, w: Float64Array): void {
    if (this.csr) return this.applyStored(v, w);
    if (this.plain) return this.applyPlain(v, w);
    const sec = this.sector;
    const lookup = sec.lookup;
    const ranker = sec.ranker;
    const G = sec.G;
    const chiRe = sec.chiRe,
      chiIm = sec.chiIm;
    const dim = this.dim;
    const reps = sec.reps;
    const bonds = this.bonds;
    const nb = bonds.length;
    const half = this.model.Jperp / 2;
    const fx = -this.model.hx / 2;
    const N = this.model.N;
    const sq = this.sqrtStab;
    const cplx = this.complex;
    if (!cplx) for (let a = 0; a < dim; a++) w[a] = this.diag[a]! * v[a]!;
    else
      for (let a = 0; a < dim; a++) {
        w[2 * a] = this.diag[a]! * v[2 * a]!;
        w[2 * a + 1] = this.diag[a]! * v[2 * a + 1]!;
      }
    const nTerms = nb + N;
    for (let a = 0; a < dim; a++) {
      const vr = cplx ? v[2 * a]! : v[a]!;
      const vi = cplx ? v[2 * a + 1]! : 0;
      if (vr === 0 && vi === 0) continue;
      const s = reps[a]!;
      const inv = 1 / sq[a]!;
      for (let t = 0; t < nTerms; t++) {
        let b: number;
        let c: number;
        if (t < nb) {
          if (half === 0) continue;
          const mk = bonds[t]!;
          const x = s & mk;
          if (x === 0 || x === mk) continue;
          b = (s ^ mk) >>> 0;
          c = half;
        } else {
          if (fx === 0) break;
          b = (s ^ (1 << (t - nb))) >>> 0;
          c = fx;
        }
        // representative and group element of b from the symmetry table (basis.ts)
        const code = lookup[ranker ? ranker.rank(b) : b]!;
        if (code < 0) continue;
        const idx = (code / G) | 0;
        const g = code - idx * G;
        const f = c * sq[idx]! * inv;
        if (!cplx) {
          w[idx] = w[idx]! + f * chiRe[g]! * vr;
        } else {
          const cr = f * chiRe[g]!,
            ci = f * chiIm[g]!;
          const j = 2 * idx;
          w[j] = w[j]! + cr * vr - ci * vi;
          w[j + 1] = w[j + 1]! + cr * vi + ci * vr;
        }
      }
    }
  }

  /** No symmetry beyond S^z: ranks by halves, real arithmetic, no closures in the hot loop. */
  private applyPlain(v: Float64Array, w: Float64Array): void {
    const sec = this.sector;
    const reps = sec.reps;
    const dim = this.dim;
    const bonds = this.bonds;
    const nb = bonds.length;
    const half = this.model.Jperp / 2;
    const fx = -this.model.hx / 2;
    const N = this.model.N;
    const lookup = sec.lookup;
    // rank by halves inlined: index = lookup[base[hi] + lowRank[lo]] (group of order 1 here)
    const ranker = sec.ranker;
    const base = ranker ? ranker.base : null;
    const lowRank = ranker ? ranker.lowRank : null;
    const lowBits = ranker ? ranker.lowBits : 0;
    const lowMask = ranker ? ranker.lowMask : 0;
    const diag = this.diag;
    const fullMask = N === 32 ? 0xffffffff : (2 ** N - 1) >>> 0;
    const bondMask = nb === 32 ? 0xffffffff : (2 ** nb - 1) >>> 0; // open chains: no bond N-1
    for (let a = 0; a < dim; a++) w[a] = diag[a]! * v[a]!;
    for (let a = 0; a < dim; a++) {
      const va = v[a]!;
      if (va === 0) continue;
      const s = reps[a]!;
      if (half !== 0) {
        const hv = half * va;
        // bit i of anti: spins i and i+1 antiparallel (bond i flippable); visit the set bits only
        let anti = (s ^ ((((s >>> 1) | (s << (N - 1))) & fullMask) >>> 0)) & bondMask;
        while (anti !== 0) {
          const low = anti & -anti;
          anti ^= low;
          const b = (s ^ bonds[31 - Math.clz32(low)]!) >>> 0;
          const r = base ? base[b >>> lowBits]! + lowRank![b & lowMask]! : b;
          const j = lookup[r]!;
          w[j] = w[j]! + hv;
        }
      }
      if (fx !== 0) {
        const fv = fx * va;
        for (let i = 0; i < N; i++) {
          const b = (s ^ (1 << i)) >>> 0;
          const code = lookup[base ? base[b >>> lowBits]! + lowRank![b & lowMask]! : b]!;
          if (code >= 0) w[code] = w[code]! + fv;
        }
      }
    }
  }
}

/** Diagonal energy of a word: Ising bonds and the longitudinal Zeeman term. */
export function diagonalEnergy(model: ChainModel, s: number, bonds?: Uint32Array): number {
  const N = model.N;
  const nb = bondCount(model);
  let aligned = 0;
  for (let i = 0; i < nb; i++) {
    const mk = bonds ? bonds[i]! : ((1 << i) | (1 << ((i + 1) % N))) >>> 0;
    const x = s & mk;
    if (x === 0 || x === mk) aligned++;
  }
  let up = 0;
  for (let i = 0; i < N; i++) if (s & (1 << i)) up++;
  return (model.Jz / 4) * (2 * aligned - nb) - model.hz * (up - N / 2);
}

/**
 * Apply an operator given by its plain-basis terms from sector `src` to sector `dst` (both with
 * the same translation structure, no flip): w = O v. For an operator with T O T^-1 = e^{-iq} O
 * (such as S^a_{-q} = N^{-1/2} sum_j e^{iqj} S^a_j), dst must have momentum k_src - q; the matrix
 * element of the term c |b>, b = T^l r'0, is c chi_dst(T^l) sqrt(S_r' / S_r).
 * Vectors are interleaved complex (both sectors treated as complex).
 */
export function applyBetweenSectors(src: ChainSector, dst: ChainSector, terms: TermGenerator, v: Float64Array, w: Float64Array): void {
  w.fill(0);
  const found = { index: -1, l: 0, f: 0, r: 0, g: 0 };
  const chi = new Float64Array(2);
  for (let a = 0; a < src.dim; a++) {
    const vr = v[2 * a]!,
      vi = v[2 * a + 1]!;
    if (vr === 0 && vi === 0) continue;
    const sa = Math.sqrt(src.stab[a]!);
    terms(src.reps[a]!, (b, cr0, ci0) => {
      dst.find(b, found);
      if (found.index < 0) return;
      dst.characterOf(found.g, chi);
      const f = Math.sqrt(dst.stab[found.index]!) / sa;
      const cr = f * (cr0 * chi[0]! - ci0 * chi[1]!);
      const ci = f * (cr0 * chi[1]! + ci0 * chi[0]!);
      const j = 2 * found.index;
      w[j] = w[j]! + cr * vr - ci * vi;
      w[j + 1] = w[j + 1]! + cr * vi + ci * vr;
    });
  }
}

/** A real sector vector as interleaved complex. */
export function toComplex(v: Float64Array, complex: boolean): Float64Array {
  if (complex) return v;
  const out = new Float64Array(2 * v.length);
  for (let i = 0; i < v.length; i++) out[2 * i] = v[i]!;
  return out;
}

/**
 * Terms of the total vector chirality kappa^z = sum_l (S^x_l S^y_{l+1} - S^y_l S^x_{l+1})
 * = sum_l (i/2)(S^+_l S^-_{l+1} - S^-_l S^+_{l+1}) on a ring (translation invariant, q = 0).
 */
export function vectorChiralityTerms(N: number): TermGenerator {
  return (a, emit) => {
    for (let l = 0; l < N; l++) {
      const r = (l + 1) % N;
      const ul = (a >>> l) & 1,
        ur = (a >>> r) & 1;
      if (ul === ur) continue;
      const b = (a ^ (1 << l) ^ (1 << r)) >>> 0;
      // l down, r up: S^+_l S^-_{l+1} acts, coefficient +i/2; l up, r down: -S^-_l S^+_{l+1}, -i/2
      emit(b, 0, ul === 0 ? 0.5 : -0.5);
    }
  };
}
