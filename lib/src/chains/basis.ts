/**
 * Bases of spin-1/2 chains as bit patterns (bit i set = spin i up) and their symmetry sectors.
 *
 * Ranking without a hash table. The states with a fixed number n of up spins (fixed total S^z),
 * listed in increasing integer order, are the n-subsets of {0..N-1} in colexicographic order, whose
 * rank is the combinatorial number system: rank(s) = sum_{t=1..n} C(c_t, t) for the set bits
 * c_1 < c_2 < ... < c_n (D. H. Lehmer's combinadic; D. E. Knuth, TAOCP 4A, 7.2.1.3, eq. (20)).
 * For speed the same rank is read from two tables ("lookup by halves"): with s = (hi, lo) split
 * into high and low bits, rank(s) = base[hi] + lowRank[lo], where lowRank[lo] is the rank of lo
 * among the low patterns with its own number of bits and base[hi] counts the states whose high
 * part is smaller. Both tables have 2^(N/2) entries; the two ranks agree (checked in the tests).
 *
 * Symmetry sectors. The group G = {T^l R^r F^f} of translations T (site j -> j + 1, rings only),
 * the reflection R (site j -> N - 1 - j, bit reversal) and, where it commutes with H, the global spin
 * flip F = prod_j sigma^x_j (spin inversion at h = 0 in the S^z = 0 sector; with hx != 0 and hz = 0
 * it is the pi rotation about x). A sector is labelled by the momentum k = 2 pi m / N (character
 * chi(T^l) = e^{i k l}, so T has eigenvalue e^{ik}), the reflection parity p_R = +-1 and the flip
 * parity p = +-1 (chi(F) = p). Since R T R^-1 = T^-1, a one-dimensional character with chi(R) = +-1
 * needs chi(T) = chi(T)^-1: reflection labels exist only at k = 0 and k = pi on rings (and always on
 * open chains); the other momenta pair k with -k. Characters are products,
 * chi(T^l R^r F^f) = e^{ikl} p_R^r p^f. Its basis states are the normalized projections
 *   |r> = (|G| S_r)^{-1/2} sum_g chi(g)^* g |r0>,  S_r = sum_{s in Stab(r0)} chi(s)^*,
 * of one representative r0 per orbit (the smallest integer of the orbit); orbits with S_r = 0 are
 * not compatible with (k, p) and dropped. For b = h r'0 (h in G), sum_g chi(g)^* g |b> = chi(h) |r'~>,
 * so an operator term c |b> from |r0> gives the matrix element c chi(h) sqrt(S_r' / S_r)
 * (A. W. Sandvik, AIP Conf. Proc. 1297, 135 (2010), section 4, in our own notation).
 */
import { InputError } from "../errors.js";
import type { ChainModel } from "./model.js";

/** Binomial coefficients C(n, k) for n, k <= 32 as doubles (exact below 2^53). */
const binomialTable: Float64Array = (() => {
  const t = new Float64Array(33 * 33);
  for (let n = 0; n <= 32; n++) {
    t[n * 33] = 1;
    for (let k = 1; k <= n; k++) t[n * 33 + k] = t[(n - 1) * 33 + k - 1]! + (k <= n - 1 ? t[(n - 1) * 33 + k]! : 0);
  }
  return t;
})();

export function binomial(n: number, k: number): number {
  if (k < 0 || n < 0 || k > n) return 0;
  return binomialTable[n * 33 + k]!;
}

/** Number of set bits of a 32-bit word. */
export function popcount(x: number): number {
  x = x - ((x >>> 1) & 0x55555555);
  x = (x & 0x33333333) + ((x >>> 2) & 0x33333333);
  return (((x + (x >>> 4)) & 0x0f0f0f0f) * 0x01010101) >>> 24;
}

/** Combinatorial-number-system rank of a state among those with the same number of set bits. */
export function combinadicRank(state: number): number {
  let r = 0;
  let t = 0;
  for (let c = 0; state !== 0 && c < 32; c++) {
    if (state & 1) {
      t++;
      r += binomial(c, t);
    }
    state >>>= 1;
  }
  return r;
}

/** The state of rank `rank` among N-bit states with n set bits (inverse of combinadicRank). */
export function combinadicUnrank(rank: number, n: number, N: number): number {
  let s = 0;
  let c = N - 1;
  for (let t = n; t >= 1; t--) {
    while (binomial(c, t) > rank) c--;
    rank -= binomial(c, t);
    s |= 1 << c;
    c--;
  }
  return s >>> 0;
}

/** Next larger integer with the same number of set bits (Gosper's hack), for N < 32. */
export function nextSamePopcount(v: number): number {
  const t = (v | (v - 1)) >>> 0;
  const low = (t + 1) >>> 0;
  return (low | ((((~t & -~t) >>> 0) - 1) >>> (ctz(v) + 1))) >>> 0;
}
function ctz(v: number): number {
  return 31 - Math.clz32(v & -v);
}

/** Rank tables "by halves" for the N-bit states with n up spins. */
export class HalfRanker {
  readonly N: number;
  readonly n: number;
  readonly lowBits: number;
  readonly lowMask: number;
  readonly size: number;
  readonly base: Float64Array;
  readonly lowRank: Int32Array;
  constructor(N: number, n: number) {
    this.N = N;
    this.n = n;
    this.lowBits = N >> 1;
    this.lowMask = (1 << this.lowBits) - 1;
    const highBits = N - this.lowBits;
    this.lowRank = new Int32Array(1 << this.lowBits);
    const counter = new Int32Array(this.lowBits + 1);
    for (let lo = 0; lo < 1 << this.lowBits; lo++) this.lowRank[lo] = counter[popcount(lo)]!++;
    this.base = new Float64Array(1 << highBits);
    let acc = 0;
    for (let hi = 0; hi < 1 << highBits; hi++) {
      this.base[hi] = acc;
      const need = n - popcount(hi);
      acc += binomial(this.lowBits, need);
    }
    this.size = acc;
  }
  rank(state: number): number {
    return this.base[state >>> this.lowBits]! + this.lowRank[state & this.lowMask]!;
  }
}

export interface SectorLabel {
  /** Number of up spins (total S^z = nUp - N/2), or null when S^z is not conserved (hx != 0). */
  nUp: number | null;
  /** Momentum index m (k = 2 pi m / N) on rings, or null for no translation symmetry. */
  m: number | null;
  /** Flip parity +1 or -1, or 0 when the flip is not used. */
  flip: 0 | 1 | -1;
  /**
   * Reflection parity (sites j -> N - 1 - j) +1 or -1, or 0 / absent when not used. On a ring it
   * commutes with the translations only in the k = 0 and k = pi sectors (R T R^-1 = T^-1).
   */
  reflection?: 0 | 1 | -1;
}

/** Which symmetries a model allows (see the file header). */
export function allowedSymmetries(model: ChainModel): { Sz: boolean; translation: boolean; flipInSz0: boolean; flip: boolean; reflection: boolean } {
  const Sz = model.hx === 0;
  const translation = model.boundary === "periodic";
  // Spin inversion (h = 0, S^z = 0 only) or the pi rotation about x (hx != 0): both need hz = 0.
  // Reflection: uniform couplings and fields, on rings and open chains alike.
  return { Sz, translation, flipInSz0: Sz && model.hz === 0 && model.N % 2 === 0, flip: !Sz && model.hz === 0, reflection: true };
}

/** Order of a sector's symmetry group: translations x reflection x flip. */
export function sectorGroupOrder(N: number, label: SectorLabel): number {
  return (label.m === null ? 1 : N) * (label.reflection ? 2 : 1) * (label.flip === 0 ? 1 : 2);
}

/** A readable sector name: "S^z = 0, k = pi (m = 6), R = +1, F = -1". */
export function sectorName(N: number, label: SectorLabel): string {
  const parts: string[] = [];
  if (label.nUp !== null) parts.push(`S^z = ${label.nUp - N / 2}`);
  if (label.m !== null) {
    const k = label.m === 0 ? "0" : 2 * label.m === N ? "pi" : `2 pi ${label.m}/${N}`;
    parts.push(`k = ${k} (m = ${label.m})`);
  }
  if (label.reflection) parts.push(`R = ${label.reflection > 0 ? "+1" : "-1"}`);
  if (label.flip) parts.push(`F = ${label.flip > 0 ? "+1" : "-1"}`);
  return parts.length ? parts.join(", ") : "no symmetry label";
}

/** Bytes per basis state of a sector (representative word, norm, lookup slot) plus per vector entry. */
export function sectorMemoryEstimate(N: number, label: SectorLabel, krylovVectors: number): { dimension: number; bytes: number; complex: boolean } {
  const parent = label.nUp === null ? 2 ** N : binomial(N, label.nUp);
  const dimension = Math.ceil(parent / sectorGroupOrder(N, label));
  const complex = isComplexSector(N, label);
  const lookup = 4 * (label.nUp === null ? 2 ** N : parent);
  const halves = label.nUp === null ? 0 : 12 * 2 ** Math.ceil(N / 2);
  const bytes = lookup + halves + 12 * dimension + (krylovVectors + 3) * dimension * 8 * (complex ? 2 : 1);
  return { dimension, bytes, complex };
}

/** Characters are real for k = 0 and k = pi (and without translation). */
export function isComplexSector(N: number, label: SectorLabel): boolean {
  if (label.m === null) return false;
  const m = ((label.m % N) + N) % N;
  return !(m === 0 || 2 * m === N);
}

/** The N-bit word with its bits in reverse order (site j -> N - 1 - j). */
export function reverseBits(s: number, N: number): number {
  s = ((s >>> 1) & 0x55555555) | ((s & 0x55555555) << 1);
  s = ((s >>> 2) & 0x33333333) | ((s & 0x33333333) << 2);
  s = ((s >>> 4) & 0x0f0f0f0f) | ((s & 0x0f0f0f0f) << 4);
  s = ((s >>> 8) & 0x00ff00ff) | ((s & 0x00ff00ff) << 8);
  s = (s >>> 16) | (s << 16);
  return (s >>> 0) >>> (32 - N);
}

/** The basis of one symmetry sector. */
export class ChainSector {
  readonly N: number;
  readonly label: SectorLabel;
  readonly complex: boolean;
  /** Representatives (smallest integer of each orbit). */
  readonly reps: Uint32Array;
  /** S_r (see header), > 0. */
  readonly stab: Float64Array;
  readonly dim: number;
  /**
   * Parent index (the state, or its S^z rank) -> code index * G + g with state = g r0 for the kept
   * representative r0 = reps[index] and the group element number g = (l nR + r) nF + f standing for
   * T^l R^r F^f; -1 for states of orbits not compatible with the sector. One table read replaces the
   * search over the orbit (no hash table).
   */
  readonly lookup: Int32Array;
  readonly ranker: HalfRanker | null;
  private readonly mask: number;
  /** Translation characters cos(k l), sin(k l) for l = 0..L-1. */
  readonly cosK: Float64Array;
  readonly sinK: Float64Array;
  /** Number of translations in the group (N on rings with momentum, else 1). */
  readonly L: number;
  /** 2 with reflection, else 1. */
  readonly nR: number;
  /** 2 with the flip, else 1. */
  readonly nF: number;
  /** Group order L nR nF. */
  readonly G: number;
  /** Character chi(g) of each group element number g (re, im). */
  readonly chiRe: Float64Array;
  readonly chiIm: Float64Array;

  constructor(N: number, label: SectorLabel, budgetBytes = 1.5e9, krylovVectors = 0) {
    if (label.nUp !== null && (!Number.isInteger(label.nUp) || label.nUp < 0 || label.nUp > N)) {
      throw new InputError("Sz", label.nUp - N / 2, `a total S^z from ${-N / 2} to ${N / 2} in steps of 1`);
    }
    if (label.m !== null && (!Number.isInteger(label.m) || label.m < 0 || label.m >= N)) {
      throw new InputError("m", label.m, `a momentum index 0..${N - 1} (k = 2 pi m / N)`);
    }
    if (label.flip !== 0 && label.nUp !== null && 2 * label.nUp !== N) {
      throw new InputError("flip", label.flip, "0 (no spin inversion) outside the S^z = 0 sector");
    }
    const refl = label.reflection ?? 0;
    if (refl !== 0 && refl !== 1 && refl !== -1) throw new InputError("reflection", refl, "+1, -1 or 0 (no reflection label)");
    if (refl !== 0 && label.m !== null && !(label.m === 0 || 2 * label.m === N)) {
      throw new InputError("reflection", refl, `0: on a ring the reflection commutes with the translations only at k = 0 and k = pi (m = 0 or ${N / 2}), not at m = ${label.m}`);
    }
    const est = sectorMemoryEstimate(N, label, krylovVectors);
    if (est.bytes > budgetBytes) {
      throw new InputError(
        "N",
        N,
        `a sector that fits the memory budget of ${(budgetBytes / 1e9).toFixed(2)} GB`,
        `the sector (${sectorName(N, label)}) has about ${est.dimension} states and needs about ${(est.bytes / 1e9).toFixed(2)} GB with ${krylovVectors} Krylov vectors`,
      );
    }
    this.N = N;
    this.label = label;
    this.complex = isComplexSector(N, label);
    this.mask = N === 32 ? 0xffffffff : (1 << N) - 1;
    this.L = label.m === null ? 1 : N;
    this.nR = refl !== 0 ? 2 : 1;
    this.nF = label.flip !== 0 ? 2 : 1;
    this.G = this.L * this.nR * this.nF;
    this.cosK = new Float64Array(this.L);
    this.sinK = new Float64Array(this.L);
    for (let l = 0; l < this.L; l++) {
      const k = label.m === null ? 0 : (2 * Math.PI * label.m) / N;
      this.cosK[l] = Math.cos(k * l);
      this.sinK[l] = Math.sin(k * l);
    }
    if (label.m !== null && (label.m === 0 || 2 * label.m === N)) {
      for (let l = 0; l < this.L; l++) {
        this.cosK[l] = label.m === 0 || l % 2 === 0 ? 1 : -1;
        this.sinK[l] = 0;
      }
    }
    // chi(T^l R^r F^f) = chi(T)^l chi(R)^r chi(F)^f (one-dimensional representations)
    this.chiRe = new Float64Array(this.G);
    this.chiIm = new Float64Array(this.G);
    for (let l = 0; l < this.L; l++) {
      for (let r = 0; r < this.nR; r++) {
        for (let f = 0; f < this.nF; f++) {
          const g = (l * this.nR + r) * this.nF + f;
          const p = (r ? refl : 1) * (f ? label.flip : 1);
          this.chiRe[g] = this.cosK[l]! * p;
          this.chiIm[g] = this.sinK[l]! * p;
        }
      }
    }
    this.ranker = label.nUp === null ? null : new HalfRanker(N, label.nUp);
    const parentSize = label.nUp === null ? 2 ** N : this.ranker!.size;
    this.lookup = new Int32Array(parentSize).fill(-1);
    const reps: number[] = [];
    const stab: number[] = [];
    const visit = (s: number): void => {
      const st = this.orbitStabilizer(s);
      if (st > 1e-9) {
        // every member T^l R^r F^f s of the orbit points at (representative, g)
        const index = reps.length;
        reps.push(s);
        stab.push(st);
        for (let r = 0; r < this.nR; r++) {
          for (let f = 0; f < this.nF; f++) {
            let t = this.applyRF(s, r, f);
            for (let l = 0; l < this.L; l++) {
              this.lookup[this.parentIndex(t)] = index * this.G + (l * this.nR + r) * this.nF + f;
              t = (((t << 1) & this.mask) | (t >>> (this.N - 1))) >>> 0;
            }
          }
        }
      }
    };
    if (label.nUp === null) {
      for (let s = 0; s < parentSize; s++) visit(s);
    } else if (label.nUp === 0) {
      visit(0);
    } else {
      let s = 2 ** label.nUp - 1;
      for (let i = 0; i < parentSize; i++) {
        visit(s);
        if (i + 1 < parentSize) s = nextSamePopcount(s);
      }
    }
    this.reps = Uint32Array.from(reps);
    this.stab = Float64Array.from(stab);
    this.dim = reps.length;
  }

  private parentIndex(s: number): number {
    return this.ranker ? this.ranker.rank(s) : s;
  }

  /** R^r F^f s. */
  private applyRF(s: number, r: number, f: number): number {
    let t = f ? (~s & this.mask) >>> 0 : s;
    if (r) t = reverseBits(t, this.N);
    return t;
  }

  /** Rotate the N-bit word right by one: T^{-1} on states. */
  rotateRight(s: number): number {
    return ((s >>> 1) | ((s & 1) << (this.N - 1))) >>> 0;
  }

  /** S_r if s is the smallest element of its orbit, else 0. */
  private orbitStabilizer(s: number): number {
    let re = 0;
    for (let r = 0; r < this.nR; r++) {
      for (let f = 0; f < this.nF; f++) {
        let t = this.applyRF(s, r, f);
        for (let l = 0; l < this.L; l++) {
          // t = T^l R^r F^f s
          if (t < s) return 0;
          // chi(g)^* summed over the stabilizer; imaginary parts cancel (g and g^-1 both in it)
          if (t === s) re += this.chiRe[(l * this.nR + r) * this.nF + f]!;
          t = (((t << 1) & this.mask) | (t >>> (this.N - 1))) >>> 0;
        }
      }
    }
    return re;
  }

  /**
   * Representative of the orbit of b (one table read): sets `found.index` (rep index or -1),
   * `found.g` (group element number) and its parts `found.l`, `found.r`, `found.f` with b = T^l R^r F^f r0.
   */
  find(b: number, found: { index: number; l: number; f: number; r?: number; g?: number }): void {
    const code = this.lookup[this.parentIndex(b)]!;
    if (code < 0) {
      found.index = -1;
      return;
    }
    const G = this.G;
    found.index = Math.floor(code / G);
    const g = code - found.index * G;
    found.g = g;
    found.f = g % this.nF;
    const lr = (g - found.f) / this.nF;
    found.r = lr % this.nR;
    found.l = (lr - found.r) / this.nR;
  }

  /** Character chi(g) of group element number g: [re, im] written into out. */
  characterOf(g: number, out: Float64Array): void {
    out[0] = this.chiRe[g]!;
    out[1] = this.chiIm[g]!;
  }

  /** Character chi(T^l F^f) (no reflection): [re, im] written into out. */
  character(l: number, f: number, out: Float64Array): void {
    this.characterOf(l * this.nR * this.nF + f, out);
  }

  /** Momentum k of the sector (0 without translation). */
  get k(): number {
    return this.label.m === null ? 0 : (2 * Math.PI * this.label.m) / this.N;
  }

  /**
   * Amplitudes of this sector's basis state `index` on plain basis states: calls visit(state, re, im)
   * for every state of the orbit (used to expand eigenvectors; normalized).
   */
  expand(index: number, visit: (state: number, re: number, im: number) => void): void {
    const r0 = this.reps[index]!;
    const norm = 1 / Math.sqrt(this.G * this.stab[index]!);
    const acc = new Map<number, [number, number]>();
    for (let r = 0; r < this.nR; r++) {
      for (let f = 0; f < this.nF; f++) {
        let t = this.applyRF(r0, r, f);
        for (let l = 0; l < this.L; l++) {
          // chi(g)^* g|r0> with g = T^l R^r F^f
          const g = (l * this.nR + r) * this.nF + f;
          const cur = acc.get(t) ?? [0, 0];
          cur[0] += this.chiRe[g]! * norm;
          cur[1] -= this.chiIm[g]! * norm;
          acc.set(t, cur);
          t = (((t << 1) & this.mask) | (t >>> (this.N - 1))) >>> 0;
        }
      }
    }
    for (const [s, [re, im]] of acc) if (Math.abs(re) > 1e-14 || Math.abs(im) > 1e-14) visit(s, re, im);
  }
}
