/**
 * Spectra of XXZ chains by exact diagonalization in symmetry sectors.
 *
 * - `sectorLevels`: the lowest levels of one sector by Lanczos (lanczos.ts): for one level the plain
 *   three-term recursion (re-orthogonalization is not needed for the lowest level), for several the
 *   thick restart with full re-orthogonalization; the memory needed is estimated and checked against
 *   a budget before anything is allocated (H is stored as a sparse matrix only when it fits too).
 * - `chainSectors`: the sectors a model decomposes into (S^z when hx = 0, momentum on rings,
 *   optionally reflection at k = 0, pi or on open chains, and spin inversion / pi rotation about x).
 * - `denseSpectrum`: every level of every (S^z, k) sector by dense diagonalization with the
 *   project's Hermitian eigensolver (rings up to N = 14), for thermal averages: with E_n the levels,
 *   Z = sum_n exp(-E_n / T), U = <E>, C = (<E^2> - <E>^2) / T^2 (k_B = 1, energies and T in one unit),
 *   S = (U - F) / T with F = -T ln Z, M_z = <sum_j S^z_j> / N.
 */
import { InputError } from "../errors.js";
import { eigenHermitian } from "../numeric/eigenHermitian.js";
import type { ChainModel } from "./model.js";
import { ChainSector, allowedSymmetries, sectorMemoryEstimate, sectorName, type SectorLabel } from "./basis.js";
import { ChainHamiltonian, matrixStoreBytes, matrixStoreEstimate } from "./operator.js";
import { lowestEigenpairs, type LanczosOptions, type LanczosResult } from "./lanczos.js";

export const defaultMemoryBudget = 1.5e9;

export interface SectorLevels extends LanczosResult {
  label: SectorLabel;
  dimension: number;
  /** Momentum k of the sector (rad per site; 0 without translation). */
  k: number;
  /** Total S^z, or null when not conserved. */
  Sz: number | null;
  /** Readable sector label ("S^z = 0, k = pi (m = 6), R = +1, F = -1"). */
  name: string;
  sector: ChainSector;
  hamiltonian: ChainHamiltonian;
}

/** Check that a sector label fits the model's symmetries. */
export function checkLabel(model: ChainModel, label: SectorLabel): void {
  const sym = allowedSymmetries(model);
  if (label.nUp !== null && !sym.Sz) throw new InputError("Sz", label.nUp - model.N / 2, "no S^z label: S^z is not conserved when hx != 0");
  if (label.m !== null && !sym.translation) throw new InputError("k", label.m, "no momentum label on an open chain");
  if (label.flip !== 0) {
    const ok = label.nUp === null ? sym.flip : sym.flipInSz0 && 2 * label.nUp === model.N;
    if (!ok) throw new InputError("flip", label.flip, "0: spin inversion / pi rotation about x needs hz = 0 (and S^z = 0 when hx = 0)");
  }
  if (label.reflection) {
    if (label.m !== null && !(label.m === 0 || 2 * label.m === model.N)) {
      throw new InputError("reflection", label.reflection, `0: on a ring the reflection commutes with the translations only at k = 0 and k = pi (m = 0 or ${model.N / 2})`);
    }
  }
}

/** Lowest levels of one sector by Lanczos. */
export function sectorLevels(model: ChainModel, label: SectorLabel, options: LanczosOptions & { memoryBudget?: number } = {}): SectorLevels {
  checkLabel(model, label);
  const levels = options.levels ?? 1;
  const krylov = options.krylov ?? (levels === 1 ? 24 : Math.max(2 * levels + 20, 40));
  const budget = options.memoryBudget ?? defaultMemoryBudget;
  const sector = new ChainSector(model.N, label, budget, krylov);
  // the sparse-matrix store only when sector, Krylov vectors and matrix together fit the budget
  const est = sectorMemoryEstimate(model.N, label, krylov);
  const H = new ChainHamiltonian(model, sector, { matrix: est.bytes + matrixStoreEstimate(model, sector.dim, sector.complex) <= Math.min(budget, est.bytes + matrixStoreBytes) });
  // one level: the plain recursion (no re-orthogonalization) unless asked otherwise; several levels
  // need the orthogonal basis (thick restart)
  const reorthogonalization = options.reorthogonalization ?? (levels === 1 ? "none" : "full");
  // an empty sector (no orbit compatible with its characters, e.g. R = -1 of a tiny ring) has no levels
  const r = sector.dim === 0 ? { values: [], vectors: [], residuals: [], matvecs: 0, restarts: 0 } : lowestEigenpairs(H, { ...options, levels, krylov, reorthogonalization });
  return {
    ...r,
    label,
    dimension: sector.dim,
    k: sector.k,
    Sz: label.nUp === null ? null : label.nUp - model.N / 2,
    name: sectorName(model.N, label),
    sector,
    hamiltonian: H,
  };
}

/**
 * Sectors whose union is the whole Hilbert space, in a fixed order: S^z when hx = 0; momentum on
 * rings (option `momentum`, default on); with `reflection` the parity R = +-1 where it commutes
 * (every sector of an open chain, k = 0 and pi on a ring); with `flip` the spin inversion F = +-1
 * where it applies (hz = 0: in S^z = 0 when hx = 0, everywhere when hx != 0).
 */
export function chainSectors(model: ChainModel, options: { momentum?: boolean; reflection?: boolean; flip?: boolean } = {}): SectorLabel[] {
  const sym = allowedSymmetries(model);
  const N = model.N;
  const useK = (options.momentum ?? true) && sym.translation;
  const ups: Array<number | null> = sym.Sz ? Array.from({ length: N + 1 }, (_, i) => i) : [null];
  const ms: Array<number | null> = useK ? Array.from({ length: N }, (_, i) => i) : [null];
  const out: SectorLabel[] = [];
  for (const nUp of ups) {
    const flips: Array<0 | 1 | -1> = options.flip && (nUp === null ? sym.flip : sym.flipInSz0 && 2 * nUp === N) ? [1, -1] : [0];
    for (const m of ms) {
      const reflectable = options.reflection && sym.reflection && (m === null || m === 0 || 2 * m === N);
      for (const reflection of (reflectable ? [1, -1] : [0]) as Array<0 | 1 | -1>) {
        for (const flip of flips) out.push(reflection ? { nUp, m, flip, reflection } : { nUp, m, flip });
      }
    }
  }
  return out;
}

export interface DenseSector {
  label: SectorLabel;
  sector: ChainSector;
  values: Float64Array;
  /** Eigenvectors as interleaved complex columns: vector n is vectors[n] (length 2 dim). */
  vectors: Float64Array[] | null;
}

export interface DenseSpectrum {
  model: ChainModel;
  sectors: DenseSector[];
  groundEnergy: number;
}

/** Largest N for the full dense spectrum. */
export const maxDenseSites = 14;

/** Every level of every sector by dense diagonalization (eigenvectors optional). */
export function denseSpectrum(model: ChainModel, options: { vectors?: boolean; momentum?: boolean; reflection?: boolean; flip?: boolean; maxSites?: number } = {}): DenseSpectrum {
  const maxN = options.maxSites ?? maxDenseSites;
  if (model.N > maxN) {
    throw new InputError("N", model.N, `at most ${maxN} sites for the full spectrum (dense diagonalization of every sector)`, `2^${model.N} = ${2 ** model.N} states`);
  }
  const sectors: DenseSector[] = [];
  let e0 = Infinity;
  for (const label of chainSectors(model, options)) {
    const sector = new ChainSector(model.N, label);
    if (sector.dim === 0) continue;
    const { values, vectors } = sectorDense(model, sector, options.vectors ?? false);
    e0 = Math.min(e0, values[0]!);
    sectors.push({ label, sector, values, vectors });
  }
  return { model, sectors, groundEnergy: e0 };
}

/** Every level of one sector by dense diagonalization (vectors as interleaved complex columns). */
export function sectorDense(model: ChainModel, sector: ChainSector, wantVectors = false): { values: Float64Array; vectors: Float64Array[] | null } {
  const H = new ChainHamiltonian(model, sector);
  const n = sector.dim;
  const c = sector.complex ? 2 : 1;
  const re = new Float64Array(n * n);
  const im = new Float64Array(n * n);
  const unit = new Float64Array(c * n);
  const col = new Float64Array(c * n);
  for (let j = 0; j < n; j++) {
    unit.fill(0);
    unit[c * j] = 1;
    H.apply(unit, col);
    for (let i = 0; i < n; i++) {
      re[i * n + j] = col[c * i]!;
      if (c === 2) im[i * n + j] = col[c * i + 1]!;
    }
  }
  const eig = eigenHermitian(n, re, sector.complex ? im : null, { vectors: wantVectors, tolerance: 1e-9 });
  let vectors: Float64Array[] | null = null;
  if (wantVectors) {
    vectors = [];
    for (let k = 0; k < n; k++) {
      const v = new Float64Array(2 * n);
      for (let i = 0; i < n; i++) {
        v[2 * i] = eig.vectorsRe![i * n + k]!;
        v[2 * i + 1] = eig.vectorsIm![i * n + k]!;
      }
      vectors.push(v);
    }
  }
  return { values: eig.values, vectors };
}

export interface ThermalAverages {
  T: number[];
  /** Internal energy per site. */
  energy: number[];
  /** Specific heat per site (k_B = 1). */
  specificHeat: number[];
  /** Entropy per site (k_B = 1). */
  entropy: number[];
  /** <S^z> per site (computed only when S^z is conserved; else NaN-free zeros are not given). */
  magnetizationZ: number[] | null;
}

/** Thermal averages from a dense spectrum at temperatures T (same energy unit, k_B = 1). */
export function thermalAverages(spec: DenseSpectrum, T: number[]): ThermalAverages {
  const N = spec.model.N;
  const e0 = spec.groundEnergy;
  const hasSz = spec.sectors.every((s) => s.label.nUp !== null);
  const out: ThermalAverages = { T: [...T], energy: [], specificHeat: [], entropy: [], magnetizationZ: hasSz ? [] : null };
  for (const t of T) {
    if (!(t > 0) || !Number.isFinite(t)) throw new InputError("T", t, "a positive temperature");
    let Z = 0,
      E1 = 0,
      E2 = 0,
      Mz = 0;
    for (const s of spec.sectors) {
      const sz = s.label.nUp === null ? 0 : s.label.nUp - N / 2;
      for (const e of s.values) {
        const x = e - e0;
        const w = Math.exp(-x / t);
        Z += w;
        E1 += w * x;
        E2 += w * x * x;
        Mz += w * sz;
      }
    }
    const u = E1 / Z;
    const c = (E2 / Z - u * u) / (t * t);
    out.energy.push((u + e0) / N);
    out.specificHeat.push(c / N);
    out.entropy.push((u / t + Math.log(Z)) / N);
    if (out.magnetizationZ) out.magnetizationZ.push(Mz / Z / N);
  }
  return out;
}

/** Memory estimate for a sector (exported for the calculators' messages). */
export { sectorMemoryEstimate };
