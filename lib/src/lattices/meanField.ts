/**
 * Site-decoupled mean field for two models that map onto each other (spins as bosons: S+ <-> b+,
 * S^z = n - S; T. Matsubara, H. Matsuda, Prog. Theor. Phys. 16, 569 (1956); the field is a chemical
 * potential and order appears where single-ion levels cross: T. Giamarchi, C. Rueegg,
 * O. Tchernyshyov, Nature Phys. 4, 198 (2008)).
 *
 * 1. Bose-Hubbard model H = -t sum_<ij> (b_i+ b_j + h.c.) + (U/2) sum n(n-1) - mu sum n, z neighbours.
 *    Decoupling b_i+ b_j -> psi (b_i+ + b_j) - psi^2 (psi = <b> real >= 0) gives per site
 *      H(psi) = (U/2) n(n-1) - mu n - z t psi (b + b+) + z t psi^2,
 *    and the mean-field energy E(psi) = min eig H(psi); the self-consistent psi minimizes E(psi)
 *    (dE/dpsi = 2 z t (psi - <b>) = 0 by Hellmann-Feynman). Source: M. Fisher et al., PRB 40, 546
 *    (1989); D. van Oosten, P. van der Straten, H. Stoof, PRA 63, 053601 (2001).
 *    Lobe boundary (derived): second-order perturbation theory in psi around the Mott state n
 *    (n - 1 < x = mu/U < n) gives E = E_n + a2 psi^2 + O(psi^4) with
 *      a2 = z t + (z t)^2 [ n / (U(n-1) - mu) + (n+1) / (mu - U n) ],
 *    and a2 = 0 at U/(z t) = (n+1)/(n - x) + n/(x - n + 1) = (1 + x) / ((n - x)(x - n + 1)), i.e.
 *      z t / U = (n - x)(x - n + 1) / (1 + x).
 *    With y = 1 + x, z t / U = 2n + 1 - y - n(n+1)/y is largest at y = sqrt(n(n+1)): the lobe tip at
 *    x = sqrt(n(n+1)) - 1, z t / U = 2n + 1 - 2 sqrt(n(n+1)) = (sqrt(n+1) - sqrt(n))^2.
 *    The Fock space is truncated at nMax (checked: the weight of the top state is reported).
 *
 * 2. Easy-plane spins H = sum [D S_z^2 - h S_z] + J sum_<ij> (S^x S^x + S^y S^y + Delta S^z S^z), J > 0
 *    antiferromagnetic on a bipartite lattice with z neighbours (h = g muB B, energies in kelvin).
 *    Product states with a staggered transverse moment m_perp and a uniform m_z: per site
 *      E = D <S_z^2> - h <S_z> + (z J / 2) (Delta m_z^2 - m_perp^2),
 *    minimized by iterating the site Hamiltonian D S_z^2 - (h - z J Delta m_z) S_z - z J m_perp S_x
 *    (solved by Newton's method on the self-consistency residual). The ansatz has a uniform m_z: a Neel state along z (favoured
 *    for Delta > 1 at low field) is not among the states compared.
 *    Spin 1, closed forms (derived): the paramagnet |0> is unstable when z J chi_perp >= 1 with
 *    chi_perp = 2 sum |<m|S_x|0>|^2 / (E_m - E_0) = 1/(D - h) + 1/(D + h) = 2D / (D^2 - h^2):
 *      h_c1 = sqrt(D^2 - 2 D z J)   (no gap closing if D < 2 z J: ordered at h = 0);
 *    the saturated state |1> (m_z = 1, effective field h - z J Delta) is unstable when
 *    z J / (h - z J Delta - D) >= 1:   h_c2 = D + z J (1 + Delta)   (saturation field).
 *    Caveats: mean field overestimates order; in two dimensions the finite-temperature transition is
 *    of the Berezinskii-Kosterlitz-Thouless kind; dipolar S+S+ terms break the U(1) symmetry, so the
 *    condensate picture is then approximate.
 */
import { InputError } from "../errors.js";
import { HermitianEigenSolver } from "../numeric/eigenHermitian.js";
import { brentMinimize } from "../numeric/brentMinimize.js";

// ------------------------------------------------------------------ Bose-Hubbard
/** Lobe boundary z t / U of the Mott lobe n at x = mu / U (n - 1 <= x <= n; 0 outside). */
export function mottLobeBoundary(n: number, x: number): number {
  if (!Number.isInteger(n) || n < 1) throw new InputError("n", n, "a whole filling n >= 1");
  if (x < n - 1 || x > n) return 0;
  return ((n - x) * (x - n + 1)) / (1 + x);
}

/** Tip of the Mott lobe n: x = sqrt(n(n+1)) - 1, z t / U = (sqrt(n+1) - sqrt(n))^2. */
export function mottLobeTip(n: number): { x: number; ztOverU: number } {
  if (!Number.isInteger(n) || n < 1) throw new InputError("n", n, "a whole filling n >= 1");
  return { x: Math.sqrt(n * (n + 1)) - 1, ztOverU: (Math.sqrt(n + 1) - Math.sqrt(n)) ** 2 };
}

export interface BoseHubbardSite {
  /** Order parameter psi = <b> (>= 0). */
  psi: number;
  /** <b> in the ground state of H(psi): equals psi at self-consistency. */
  expectationB: number;
  density: number;
  /** Energy per site in units of U. */
  energy: number;
  /** Weight of the highest Fock state kept (truncation check). */
  truncationWeight: number;
}

/** Decoupled site problem at (z t / U, mu / U): psi minimizing E(psi), in units U = 1. */
export function boseHubbardMeanField(ztOverU: number, muOverU: number, nMax = 12): BoseHubbardSite {
  if (!(ztOverU >= 0) || !Number.isFinite(ztOverU)) throw new InputError("ztOverU", ztOverU, "a hopping z t / U >= 0");
  if (!Number.isFinite(muOverU)) throw new InputError("muOverU", muOverU, "a finite chemical potential mu / U");
  if (!Number.isInteger(nMax) || nMax < 2 || nMax > 200) throw new InputError("nMax", nMax, "a Fock cutoff from 2 to 200");
  const dim = nMax + 1;
  const solver = new HermitianEigenSolver(dim);
  const Hre = new Float64Array(dim * dim),
    Him = new Float64Array(dim * dim);
  const site = (psi: number) => {
    Hre.fill(0);
    for (let n = 0; n <= nMax; n++) {
      Hre[n * dim + n] = 0.5 * n * (n - 1) - muOverU * n;
      if (n > 0) {
        const v = -ztOverU * psi * Math.sqrt(n);
        Hre[(n - 1) * dim + n] = v;
        Hre[n * dim + (n - 1)] = v;
      }
    }
    solver.solve(Hre, Him, true);
    return solver.values[0]! + ztOverU * psi * psi;
  };
  const psiMax = Math.sqrt(nMax);
  let psi = 0;
  if (ztOverU > 0) {
    const r = brentMinimize(site, 0, psiMax, 1e-12, 400);
    psi = r.x;
    // no lowering beyond rounding: the Mott (psi = 0) state
    if (site(0) <= r.f + 1e-14 * Math.max(1, Math.abs(r.f))) psi = 0;
  }
  const energy = site(psi);
  let b = 0,
    dens = 0;
  for (let n = 0; n <= nMax; n++) {
    const cn = solver.vectorsRe[n * dim]!;
    dens += n * cn * cn;
    if (n > 0) b += Math.sqrt(n) * solver.vectorsRe[(n - 1) * dim]! * cn;
  }
  const top = solver.vectorsRe[nMax * dim]! ** 2;
  return { psi, expectationB: Math.abs(b), density: dens, energy, truncationWeight: top };
}

// ------------------------------------------------------------------ easy-plane spins
export interface EasyPlaneParams {
  /** Spin S (1/2, 1, 3/2, ...; up to 10). */
  S: number;
  /** Single-ion anisotropy D (K), > 0 easy plane. */
  D: number;
  /** z J (K), antiferromagnetic exchange summed over neighbours. */
  zJ: number;
  /** Longitudinal exchange anisotropy Delta (1: Heisenberg). */
  Delta: number;
}

export interface EasyPlaneState {
  mPerp: number;
  mz: number;
  /** Energy per site (K). */
  energy: number;
  iterations: number;
}

function checkSpin(S: number): number {
  const t = 2 * S;
  if (!Number.isFinite(S) || Math.abs(t - Math.round(t)) > 1e-9 || t < 1 || t > 20) throw new InputError("S", S, "a spin S = 1/2, 1, 3/2, ... 10");
  return Math.round(t) + 1;
}

/**
 * Site-decoupled mean field at field h (K) and temperature T (K; thermal averages and the mean-field
 * free energy at T > 0); returns the lowest-energy state of several starts
 * (plus `start`, e.g. the solution at a neighbouring field).
 */
export function easyPlaneMeanField(p: EasyPlaneParams, h: number, start?: { mz: number; mPerp: number }, T = 0): EasyPlaneState {
  if (!(T >= 0) || !Number.isFinite(T)) throw new InputError("T", T, "a temperature >= 0 K");
  const n = checkSpin(p.S);
  if (!Number.isFinite(p.D) || !Number.isFinite(p.zJ) || !(p.zJ >= 0) || !Number.isFinite(p.Delta))
    throw new InputError("D, zJ, Delta", p, "finite D, zJ >= 0 (antiferromagnetic) and Delta");
  if (!Number.isFinite(h)) throw new InputError("h", h, "a finite field energy in kelvin");
  const S = p.S;
  const solver = new HermitianEigenSolver(n);
  const Hre = new Float64Array(n * n),
    Him = new Float64Array(n * n);
  const sx: number[] = [];
  for (let i = 1; i < n; i++) {
    const M = S - i; // row i - 1 holds M + 1
    sx.push(0.5 * Math.sqrt(S * (S + 1) - M * (M + 1)));
  }
  const siteSolve = (mz: number, mp: number) => {
    Hre.fill(0);
    for (let i = 0; i < n; i++) {
      const M = S - i;
      Hre[i * n + i] = p.D * M * M - (h - p.zJ * p.Delta * mz) * M;
      if (i > 0) {
        Hre[(i - 1) * n + i] = -p.zJ * mp * sx[i - 1]!;
        Hre[i * n + (i - 1)] = -p.zJ * mp * sx[i - 1]!;
      }
    }
    solver.solve(Hre, Him, true);
    let ez = 0,
      ez2 = 0,
      ex = 0,
      Z = 0;
    const e0 = solver.values[0]!;
    for (let k = 0; k < (T > 0 ? n : 1); k++) {
      const w = T > 0 ? Math.exp(-(solver.values[k]! - e0) / T) : 1;
      if (w < 1e-300) continue;
      Z += w;
      for (let i = 0; i < n; i++) {
        const c = solver.vectorsRe[i * n + k]!;
        const M = S - i;
        ez += w * M * c * c;
        ez2 += w * M * M * c * c;
        if (i > 0) ex += w * 2 * sx[i - 1]! * solver.vectorsRe[(i - 1) * n + k]! * c;
      }
    }
    ez /= Z;
    ez2 /= Z;
    ex /= Z;
    if (T > 0) {
      // mean-field free energy per site: -T ln Z_site - (zJ/2)(Delta m_z^2 - m_perp^2) at the input moments
      return { mz: ez, mp: Math.abs(ex), energy: e0 - T * Math.log(Z) - (p.zJ / 2) * (p.Delta * mz * mz - mp * mp) };
    }
    return { mz: ez, mp: Math.abs(ex), energy: p.D * ez2 - h * ez + (p.zJ / 2) * (p.Delta * ez * ez - ex * ex) };
  };
  let best: EasyPlaneState | null = null;
  const starts: Array<readonly [number, number]> = [
    [0, S],
    [S, 0.5],
    [0, 0],
    [S, 0],
  ];
  // a given start (the solution at a neighbouring field) first, nudged off m_perp = 0
  if (start) starts.unshift([start.mz, Math.max(start.mPerp, 0.05)]);
  for (const start0 of starts) {
    const [mz0, mp0] = start0;
    // Newton on the residual F(m) = m_out(m) - m (finite-difference 2 x 2 Jacobian, halving line
    // search on |F|), m = (m_z, m_perp >= 0); plain iteration is slow where the map is marginal
    let mz = mz0,
      mp = mp0,
      it = 0,
      e = 0;
    const resid = (a: number, b: number) => {
      const r = siteSolve(a, b);
      return [r.mz - a, r.mp - b] as const;
    };
    let F = resid(mz, mp);
    for (; it < 200; it++) {
      const nF = Math.hypot(F[0], F[1]);
      if (nF < 1e-12) break;
      const hstep = 1e-7;
      const Fa = resid(mz + hstep, mp),
        Fb = resid(mz, mp + hstep);
      const j11 = (Fa[0] - F[0]) / hstep,
        j21 = (Fa[1] - F[1]) / hstep,
        j12 = (Fb[0] - F[0]) / hstep,
        j22 = (Fb[1] - F[1]) / hstep;
      const det = j11 * j22 - j12 * j21;
      let dz: number, dp: number;
      if (Math.abs(det) > 1e-14) {
        dz = (-F[0] * j22 + F[1] * j12) / det;
        dp = (-F[1] * j11 + F[0] * j21) / det;
      } else {
        dz = F[0];
        dp = F[1];
      }
      let t = 1,
        accepted = false;
      for (let k = 0; k < 12; k++) {
        const nz = mz + t * dz,
          np = Math.max(0, mp + t * dp);
        const Fn = resid(nz, np);
        if (Math.hypot(Fn[0], Fn[1]) < nF) {
          mz = nz;
          mp = np;
          F = Fn;
          accepted = true;
          break;
        }
        t /= 2;
      }
      if (!accepted) break; // no descent: abandon this start
    }
    const converged = Math.hypot(F[0], F[1]) < 1e-9;
    if (!converged && (best || starts.indexOf(start0) < starts.length - 1)) continue;
    // the energy of the converged site state (E is variational only at the fixed point)
    e = siteSolve(mz, mp).energy;
    if (!best || e < best.energy - 1e-12) best = { mPerp: mp, mz, energy: e, iterations: it };
  }
  return best!;
}

/** Spin-1 closed forms of the ordered window at T = 0 (see the header). h_c1 = 0 when D <= 2 z J. */
export function spinOneCriticalFields(D: number, zJ: number, Delta: number): { hc1: number; hc2: number } {
  if (!(D > 0)) throw new InputError("D", D, "an easy-plane anisotropy D > 0");
  return { hc1: D > 2 * zJ ? Math.sqrt(D * D - 2 * D * zJ) : 0, hc2: D + zJ * (1 + Delta) };
}

/**
 * Transverse susceptibility chi_perp of the paramagnetic site (m_perp = 0) at field h and temperature
 * T, with the uniform m_z self-consistent: chi = sum_{m,n} |<n|S_x|m>|^2 (p_m - p_n) / (E_n - E_m)
 * (limit p_m / T for E_n = E_m). Order sets in where z J chi_perp = 1 (second-order transition).
 */
export function paramagneticTransverseSusceptibility(p: EasyPlaneParams, h: number, T: number): { chi: number; mz: number } {
  const n = checkSpin(p.S);
  const S = p.S;
  const levels = (mz: number) =>
    Array.from({ length: n }, (_, i) => {
      const M = S - i;
      return p.D * M * M - (h - p.zJ * p.Delta * mz) * M;
    });
  const weights = (E: number[]) => {
    const e0 = Math.min(...E);
    const w = E.map((e) => (T > 0 ? Math.exp(-(e - e0) / T) : e - e0 < 1e-12 * Math.max(1, Math.abs(e0)) ? 1 : 0));
    const Z = w.reduce((a, b) => a + b, 0);
    return w.map((x) => x / Z);
  };
  const mzOut = (mz: number) => {
    const pw = weights(levels(mz));
    return pw.reduce((acc, w, i) => acc + w * (S - i), 0);
  };
  // m_z = mzOut(m_z): mzOut decreases with m_z for antiferromagnetic Delta >= 0, so the root is unique
  let mz: number;
  if (p.zJ * p.Delta === 0) mz = mzOut(0);
  else {
    const f = (m: number) => mzOut(m) - m;
    let lo = -S,
      hi = S;
    for (let k = 0; k < 200 && hi - lo > 1e-13; k++) {
      const mid = (lo + hi) / 2;
      if (f(mid) > 0) lo = mid;
      else hi = mid;
    }
    mz = (lo + hi) / 2;
  }
  const E = levels(mz);
  const pw = weights(E);
  let chi = 0;
  for (let i = 0; i < n; i++)
    for (const j of [i - 1, i + 1]) {
      if (j < 0 || j >= n) continue;
      const M = S - Math.min(i, j); // <M|S_x|M-1> with M the larger
      const el2 = 0.25 * (S * (S + 1) - M * (M - 1));
      const dE = E[j]! - E[i]!;
      chi += el2 * (Math.abs(dE) > 1e-12 ? (pw[i]! - pw[j]!) / dE : T > 0 ? pw[i]! / T : 0);
    }
  return { chi, mz };
}

/**
 * Mean-field ordering temperature T_c(h): the largest T with z J chi_perp(T) = 1 (0 when the
 * paramagnet is stable down to T = 0). Bisection in T on [0, Tmax].
 */
export function orderingTemperature(p: EasyPlaneParams, h: number): number {
  const g = (T: number) => p.zJ * paramagneticTransverseSusceptibility(p, h, T).chi - 1;
  const Tmax = Math.max(1e-9, p.zJ * p.S * (p.S + 1)); // above the Curie-Weiss scale zJ S(S+1)/3 x 3
  if (g(1e-9 * Tmax) <= 0) return 0;
  let lo = 1e-9 * Tmax,
    hi = Tmax;
  if (g(hi) > 0) return hi;
  for (let k = 0; k < 100 && hi - lo > 1e-12 * Tmax; k++) {
    const mid = (lo + hi) / 2;
    if (g(mid) > 0) lo = mid;
    else hi = mid;
  }
  return (lo + hi) / 2;
}
