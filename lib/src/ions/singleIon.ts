/**
 * One ion in a crystal field and a magnetic field:
 *   H = sum_{l,m} B_l^m O_l^m + g_J muB B . J        (energies E / k_B in kelvin, B in tesla)
 * diagonalized exactly in the 2J + 1 states |J, M>. Sources: K. Stevens, Proc. Phys. Soc. A 65, 209
 * (1952); M. Hutchings, Solid State Physics 16, 227 (1964); J. Jensen, A. Mackintosh, *Rare Earth
 * Magnetism* (Oxford 1991), ch. 1.
 *
 * Ground-doublet g-tensor (derived here, not assumed). Project g_J J_a (a = x, y, z) onto the two
 * lowest zero-field states {|1>, |2>}: the 2 x 2 matrices M_a = g_J <i|J_a|j>. In a degenerate
 * (Kramers) doublet, time reversal makes Tr M_a = 0, so M_a = (1/2) sum_k G_ak sigma_k with
 * G_ak = Tr(M_a sigma_k); the effective Zeeman term is muB sum_ak B_a G_ak S_k, S = sigma / 2.
 * The energies in a field B along the unit vector n are +- (1/2) muB B |G^T n|, so the tensor
 * g = sqrt(G G^T) (basis independent: a unitary change of doublet basis rotates the columns of G) has
 * the principal values = singular values of G, principal axes = its left singular vectors.
 * For |+-1/2> in a pure B20 field this gives g_par = 2 g_J |<1/2|J_z|1/2>| = g_J and
 * g_perp = 2 g_J |<1/2|J_x|-1/2>| = g_J (J + 1/2). A non-Kramers doublet has only the sigma_z-like
 * part (g_perp = 0). If the two lowest levels are not degenerate the result is that of the
 * quasi-doublet and is reported with its splitting.
 *
 * Schottky heat: C / R = beta^2 (<E^2> - <E>^2) per mole of ions (k_B per ion).
 * Magnetization along n: M = -g_J <J . n> muB per ion (H = +g_J muB B.J: the moment is -g_J muB J), thermal average at field B n.
 * Neutron dipole intensities (J. Jensen, A. Mackintosh, ch. 4 / M. Hutchings): the cross-section of
 * i -> j is proportional to sum_{a perp Q} |<i|J_a|j>|^2; its powder (orientation) average is 2/3 of
 * sum_{a = x,y,z} |<i|J_a|j>|^2. Degenerate levels are grouped (summed over the states of a level).
 */
import { InputError } from "../errors.js";
import { HermitianEigenSolver } from "../numeric/eigenHermitian.js";
import { kB, muB } from "../quantity/constants.js";
import { angularMomentum, stevensOperator, twiceJ, zeroMatrix, addScaled, type ComplexMatrix, type CrystalFieldTerm } from "./stevens.js";

/** muB / k_B in K / T. */
export const muBOverKB = muB / kB;

export interface IonModel {
  /** Total angular momentum J (1/2 ... 8). */
  J: number;
  /** Lande factor g_J. */
  gJ: number;
  /** Crystal-field terms B_l^m O_l^m, B in kelvin. */
  terms: CrystalFieldTerm[];
}

export function checkIonModel(model: IonModel): number {
  const t = twiceJ(model.J);
  if (!Number.isFinite(model.gJ)) throw new InputError("gJ", model.gJ, "a finite Lande factor");
  for (const term of model.terms) {
    if (!Number.isFinite(term.B)) throw new InputError(`B${term.l}${term.m}`, term.B, "a finite coefficient in kelvin");
  }
  return t + 1;
}

/** The Hamiltonian matrix in kelvin for field (Bx, By, Bz) in tesla. */
export function ionHamiltonian(model: IonModel, field: [number, number, number] = [0, 0, 0]): ComplexMatrix {
  const n = checkIonModel(model);
  const H = zeroMatrix(n);
  for (const term of model.terms) {
    if (term.B === 0) continue;
    // O_l^m vanishes identically for l > 2J (no rank-l tensor in 2J + 1 states); it adds ~0
    addScaled(H, stevensOperator(model.J, term.l, term.m), term.B);
  }
  const ops = angularMomentum(model.J);
  const z = model.gJ * muBOverKB;
  if (field[0] !== 0) addScaled(H, ops.x, z * field[0]);
  if (field[1] !== 0) addScaled(H, ops.y, z * field[1]);
  if (field[2] !== 0) addScaled(H, ops.z, z * field[2]);
  return H;
}

export interface IonSpectrum {
  n: number;
  /** Energies in kelvin, ascending. */
  energies: Float64Array;
  vectorsRe: Float64Array;
  vectorsIm: Float64Array;
}

const solvers = new Map<number, HermitianEigenSolver>();

export function ionSpectrum(model: IonModel, field: [number, number, number] = [0, 0, 0]): IonSpectrum {
  const H = ionHamiltonian(model, field);
  const n = H.n;
  let s = solvers.get(n);
  if (!s) {
    s = new HermitianEigenSolver(n);
    solvers.set(n, s);
  }
  s.solve(H.re, H.im, true);
  return { n, energies: Float64Array.from(s.values), vectorsRe: Float64Array.from(s.vectorsRe), vectorsIm: Float64Array.from(s.vectorsIm) };
}

/** <i| A |j> for eigenvectors i, j (columns of the spectrum) and operator A: [re, im]. */
export function matrixElement(sp: IonSpectrum, A: ComplexMatrix, i: number, j: number): [number, number] {
  const n = sp.n;
  let re = 0,
    im = 0;
  for (let p = 0; p < n; p++) {
    // conj(v_i[p])
    const ar = sp.vectorsRe[p * n + i]!,
      ai = -sp.vectorsIm[p * n + i]!;
    let sr = 0,
      si = 0;
    for (let q = 0; q < n; q++) {
      const hr = A.re[p * n + q]!,
        hi = A.im[p * n + q]!;
      if (hr === 0 && hi === 0) continue;
      const br = sp.vectorsRe[q * n + j]!,
        bi = sp.vectorsIm[q * n + j]!;
      sr += hr * br - hi * bi;
      si += hr * bi + hi * br;
    }
    re += ar * sr - ai * si;
    im += ar * si + ai * sr;
  }
  return [re, im];
}

/** Unit vector from polar angle theta (from z) and azimuth phi. */
export function direction(theta: number, phi: number): [number, number, number] {
  return [Math.sin(theta) * Math.cos(phi), Math.sin(theta) * Math.sin(phi), Math.cos(theta)];
}

/** Group ascending energies into degenerate levels (tolerance relative to the spread, absolute floor). */
export function groupLevels(energies: ArrayLike<number>, tol = 1e-7): Array<{ energy: number; states: number[] }> {
  const spread = Math.max(1, Math.abs(energies[energies.length - 1]! - energies[0]!));
  const out: Array<{ energy: number; states: number[] }> = [];
  for (let i = 0; i < energies.length; i++) {
    const e = energies[i]!;
    const last = out[out.length - 1];
    if (last && Math.abs(e - energies[last.states[last.states.length - 1]!]!) <= tol * spread) {
      last.states.push(i);
      last.energy = (last.energy * (last.states.length - 1) + e) / last.states.length;
    } else out.push({ energy: e, states: [i] });
  }
  return out;
}

export interface GTensorResult {
  /** Principal values, descending. */
  principal: [number, number, number];
  /** Principal axes (unit vectors, lab frame), matching `principal`. */
  axes: [number, number, number][];
  /** The 3 x 3 matrix G_ak (lab a, doublet Pauli k), row-major. */
  G: number[];
  /** Splitting of the two lowest zero-field levels (K) and the gap to the third (K). */
  splitting: number;
  gapToNext: number;
  kramers: boolean;
  notes: string[];
}

/** Ground-doublet g-tensor from the zero-field eigenstates (see the file header for the formula). */
export function groundDoubletGTensor(model: IonModel): GTensorResult {
  const sp = ionSpectrum(model);
  const n = sp.n;
  if (n < 2) throw new InputError("J", model.J, "J >= 1/2 (a doublet needs two states)");
  const ops = angularMomentum(model.J);
  const kramers = (n - 1) % 2 === 1;
  const G: number[] = [];
  for (const A of [ops.x, ops.y, ops.z]) {
    const m11 = matrixElement(sp, A, 0, 0),
      m22 = matrixElement(sp, A, 1, 1),
      m12 = matrixElement(sp, A, 0, 1);
    // Tr(M sigma_x) = 2 Re M12, Tr(M sigma_y) = -2 Im M12 (M21 = conj M12), Tr(M sigma_z) = M11 - M22
    G.push(2 * model.gJ * m12[0], -2 * model.gJ * m12[1], model.gJ * (m11[0] - m22[0]));
  }
  // G G^T (symmetric 3 x 3): eigen-decomposition by the Hermitian solver (real input)
  const GGt = new Float64Array(9);
  for (let a = 0; a < 3; a++)
    for (let b = 0; b < 3; b++) {
      let s = 0;
      for (let k = 0; k < 3; k++) s += G[a * 3 + k]! * G[b * 3 + k]!;
      GGt[a * 3 + b] = s;
    }
  const solver = new HermitianEigenSolver(3);
  solver.solve(GGt, new Float64Array(9), true);
  const principal: number[] = [];
  const axes: [number, number, number][] = [];
  for (let k = 2; k >= 0; k--) {
    principal.push(Math.sqrt(Math.max(0, solver.values[k]!)));
    axes.push([solver.vectorsRe[k]!, solver.vectorsRe[3 + k]!, solver.vectorsRe[6 + k]!]);
  }
  const splitting = sp.energies[1]! - sp.energies[0]!;
  const gapToNext = n > 2 ? sp.energies[2]! - sp.energies[1]! : Infinity;
  const notes: string[] = [];
  const scale = Math.max(1, Math.abs(sp.energies[n - 1]! - sp.energies[0]!));
  if (splitting > 1e-7 * scale)
    notes.push(
      `the two lowest levels are split by ${splitting.toPrecision(4)} K at zero field: a quasi-doublet; the g-tensor is that of the pair and holds only for Zeeman energies well above the splitting`,
    );
  if (n > 2 && gapToNext < 1e-7 * scale)
    notes.push("the ground level is more than two-fold degenerate: the doublet g-tensor depends on the states picked; add crystal-field terms that split it");
  return { principal: principal as [number, number, number], axes, G, splitting, gapToNext, kramers, notes };
}

/** Levels (K, ascending, absolute) against field magnitude along a direction. */
export function zeemanDiagram(model: IonModel, dir: [number, number, number], fields: number[]): number[][] {
  return fields.map((B) => Array.from(ionSpectrum(model, [B * dir[0], B * dir[1], B * dir[2]]).energies));
}

/** Schottky heat capacity C / R (per mole of ions; C / k_B per ion) of a spectrum at temperature T (K). */
export function schottkyHeat(energies: ArrayLike<number>, T: number): number {
  if (!(T > 0)) throw new InputError("T", T, "a positive temperature in kelvin");
  const e0 = Math.min(...Array.from(energies));
  let Z = 0,
    E1 = 0,
    E2 = 0;
  for (let i = 0; i < energies.length; i++) {
    const x = (energies[i]! - e0) / T;
    const w = Math.exp(-x);
    Z += w;
    E1 += w * x;
    E2 += w * x * x;
  }
  E1 /= Z;
  E2 /= Z;
  return Math.max(0, E2 - E1 * E1);
}

/** Magnetization per ion along dir (in muB) at field B (T) along dir and temperature T (K; 0: ground state, averaged over a degenerate ground level). */
export function magnetization(model: IonModel, dir: [number, number, number], B: number, T: number): number {
  if (!(T >= 0)) throw new InputError("T", T, "a temperature >= 0 K");
  const sp = ionSpectrum(model, [B * dir[0], B * dir[1], B * dir[2]]);
  const ops = angularMomentum(model.J);
  const Jn = zeroMatrix(sp.n);
  addScaled(Jn, ops.x, dir[0]);
  addScaled(Jn, ops.y, dir[1]);
  addScaled(Jn, ops.z, dir[2]);
  const e0 = sp.energies[0]!;
  let Z = 0,
    m = 0;
  for (let i = 0; i < sp.n; i++) {
    const x = sp.energies[i]! - e0;
    const w = T > 0 ? Math.exp(-x / T) : x < 1e-9 * Math.max(1, Math.abs(e0)) ? 1 : 0;
    if (w < 1e-300) continue;
    Z += w;
    m += w * matrixElement(sp, Jn, i, i)[0];
  }
  // H = + g_J muB B . J (the moment is -g_J muB J): M = -dF/dB = -g_J muB <J . n>
  return (-model.gJ * m) / Z;
}

export interface Transition {
  /** Level energies (K) above the ground level. */
  from: number;
  to: number;
  /** Energy transfer to - from (K). */
  energy: number;
  /** sum_{a = x,y,z} sum over the states of both levels |<i|J_a|j>|^2 (initial states averaged over their level). */
  total: number;
  /** Powder average of the perpendicular part: (2/3) total. */
  powder: number;
  /** Thermal population of the initial level (fraction) at the temperature asked. */
  population: number;
}

/**
 * Neutron dipole transitions between zero-field levels out of levels with population >= minPopulation
 * at T (K), the elastic (within-level) entry included: summed over final levels the totals of one
 * initial level give J(J + 1) (sum rule).
 */
export function neutronTransitions(model: IonModel, T: number, minPopulation = 1e-4): Transition[] {
  const sp = ionSpectrum(model);
  const groups = groupLevels(sp.energies);
  const ops = angularMomentum(model.J);
  const e0 = groups[0]!.energy;
  const Z = groups.reduce((s, g) => s + g.states.length * (T > 0 ? Math.exp(-(g.energy - e0) / T) : g === groups[0] ? 1 : 0), 0);
  const out: Transition[] = [];
  for (const gi of groups) {
    const pop = (gi.states.length * (T > 0 ? Math.exp(-(gi.energy - e0) / T) : gi === groups[0] ? 1 : 0)) / Z;
    if (pop < minPopulation) continue;
    for (const gj of groups) {
      let total = 0;
      for (const i of gi.states)
        for (const j of gj.states)
          for (const A of [ops.x, ops.y, ops.z]) {
            const [re, im] = matrixElement(sp, A, i, j);
            total += re * re + im * im;
          }
      total /= gi.states.length;
      out.push({ from: gi.energy - e0, to: gj.energy - e0, energy: gj.energy - gi.energy, total, powder: (2 / 3) * total, population: pop });
    }
  }
  return out;
}
