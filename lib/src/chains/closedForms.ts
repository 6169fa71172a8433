/**
 * Closed forms for spin-1/2 chains (energies in units of Jperp unless said otherwise).
 *
 * XXZ chain, H = Jperp sum (S^x S^x + S^y S^y + Delta S^z S^z), Delta = cosh(gamma) > 1, infinite
 * chain (Bethe ansatz):
 * - ground-state energy per site (R. Orbach, Phys. Rev. 112, 309 (1958); C. N. Yang, C. P. Yang,
 *   Phys. Rev. 150, 321 (1966) for the series form)
 *     e0 = Delta / 4 - sinh(gamma) [1/2 + 2 sum_{n>=1} 1 / (e^{2 n gamma} + 1)];
 * - spinon dispersion (J. des Cloizeaux, M. Gaudin, J. Math. Phys. 7, 1384 (1966); J. Johnson,
 *   S. Krinsky, B. McCoy, Phys. Rev. A 8, 2526 (1973))
 *     eps(p) = sinh(gamma) (K(k) / pi) sqrt(1 - k^2 cos^2 p),
 *   with the elliptic modulus k fixed by K(k') / K(k) = gamma / pi. We write it against the domain-
 *   wall momentum K_w = p + pi/2 of this folder (the momentum of an odd ring's one-wall state), so
 *   eps = sinh(gamma) (K/pi) sqrt(1 - k^2 sin^2 K_w), which tends to Delta/2 + cos(2 K_w) for large
 *   Delta, the first-order wall band (wallBand.ts). The nome is q = e^{-gamma}; K = (pi/2) theta_3^2,
 *   k = theta_2^2 / theta_3^2, k' = theta_4^2 / theta_3^2 (E. T. Whittaker, G. N. Watson, A Course of
 *   Modern Analysis, ch. 21-22). Spinons are created in pairs: the gap of the chain (to the lowest
 *   two-spinon state) is 2 min eps = 2 sinh(gamma) (K/pi) k'.
 * - Delta = 1 (Heisenberg): e0 = 1/4 - ln 2 (L. Hulthen, Ark. Mat. Astron. Fys. 26A, 1 (1938)).
 *
 * Transverse-field Ising ring (Jperp = 0, hz = 0), H = Jz sum S^z S^z - hx sum S^x, exactly on a
 * finite ring of N sites (P. Pfeuty, Ann. Phys. 57, 79 (1970); parity sectors as in E. Lieb,
 * T. Schultz, D. Mattis, Ann. Phys. 16, 407 (1961)). With Pauli matrices H = -J sum s^z s^z - h sum s^x,
 * J = -Jz/4, h = hx/2. The Jordan-Wigner fermions see antiperiodic momenta k = pi(2j+1)/N in the
 * sector of even fermion parity P = prod s^x = +1 and periodic k = 2 pi j / N for P = -1. Momenta
 * with -k != k pair into Bogoliubov modes of energy eps_k = 2 sqrt(J^2 + h^2 - 2 J h cos k), with
 * vacuum energy -eps_k/2 per pair member; the unpaired momenta k = 0, pi carry 2 a_k (n_k - 1/2),
 * a_k = h - J cos k. The lowest state of a sector is the vacuum with each unpaired mode set to its
 * lower level, and if that has the wrong fermion parity the cheapest single excitation added
 * (eps_k of a paired mode, or 2|a_k| of an unpaired one). E0 is the lower of the two sectors.
 */
import { InputError } from "../errors.js";

function checkDelta(Delta: number): number {
  if (!(Delta > 1) || !Number.isFinite(Delta)) throw new InputError("Delta", Delta, "an anisotropy Jz/Jperp > 1 (Ising-like regime)");
  return Math.acosh(Delta);
}

/** Bethe-ansatz ground-state energy per site, in units of Jperp, for Delta > 1; Delta = 1 gives 1/4 - ln 2. */
export function xxzGroundEnergyPerSite(Delta: number): number {
  if (Delta === 1) return 0.25 - Math.LN2;
  const g = checkDelta(Delta);
  let sum = 0;
  for (let n = 1; n < 10_000_000; n++) {
    const t = 1 / (Math.exp(2 * n * g) + 1);
    sum += t;
    if (t < 1e-18 * sum) break;
  }
  return Delta / 4 - Math.sinh(g) * (0.5 + 2 * sum);
}

/** Jacobi theta functions theta_2, theta_3, theta_4 at argument 0 for nome 0 < q < 1. */
export function thetaNulls(q: number): { t2: number; t3: number; t4: number } {
  let t3 = 1,
    t4 = 1,
    s2 = 0;
  for (let n = 1; ; n++) {
    const a = Math.pow(q, n * n);
    t3 += 2 * a;
    t4 += (n % 2 ? -2 : 2) * a;
    if (a < 1e-18) break;
  }
  for (let n = 0; ; n++) {
    const a = Math.pow(q, n * (n + 1));
    s2 += a;
    if (a < 1e-18) break;
  }
  return { t2: 2 * Math.pow(q, 0.25) * s2, t3, t4 };
}

/** Elliptic data of the XXZ chain at Delta > 1: modulus k, complementary k', K(k)/pi. */
export function xxzEllipticData(Delta: number): { gamma: number; k: number; kPrime: number; KoverPi: number } {
  const g = checkDelta(Delta);
  const { t2, t3, t4 } = thetaNulls(Math.exp(-g));
  return { gamma: g, k: (t2 * t2) / (t3 * t3), kPrime: (t4 * t4) / (t3 * t3), KoverPi: (t3 * t3) / 2 };
}

/** Spinon (domain-wall) energy at wall momentum K (units of Jperp), Delta > 1. */
export function xxzSpinonEnergy(Delta: number, K: number): number {
  const d = xxzEllipticData(Delta);
  const s = Math.sin(K);
  return Math.sinh(d.gamma) * d.KoverPi * Math.sqrt(1 - d.k * d.k * s * s);
}

/** Gap to the lowest two-spinon states (units of Jperp), Delta > 1. */
export function xxzGap(Delta: number): number {
  const d = xxzEllipticData(Delta);
  return 2 * Math.sinh(d.gamma) * d.KoverPi * d.kPrime;
}

export interface IsingRingLevels {
  /** Ground energy. */
  E0: number;
  /** Lowest energy of the even (P = +1) and odd (P = -1) fermion-parity sectors. */
  evenSector: number;
  oddSector: number;
}

/** Exact lowest energies of the transverse-field Ising ring, H = Jz sum S^z S^z - hx sum S^x. */
export function transverseIsingRing(N: number, Jz: number, hx: number): IsingRingLevels {
  if (!Number.isInteger(N) || N < 3) throw new InputError("N", N, "a whole number of sites >= 3");
  if (!Number.isFinite(Jz)) throw new InputError("Jz", Jz, "a finite energy");
  if (!Number.isFinite(hx)) throw new InputError("hx", hx, "a finite energy");
  const J = -Jz / 4;
  const h = hx / 2;
  const sectorLowest = (periodic: boolean, parity: 0 | 1): number => {
    let vacuum = 0;
    let vacParity = 0;
    let cheapest = Infinity;
    for (let j = 0; j < N; j++) {
      const k = periodic ? (2 * Math.PI * j) / N : (Math.PI * (2 * j + 1)) / N;
      const unpaired = Math.abs(Math.sin(k)) < 1e-12;
      if (unpaired) {
        const a = h - J * Math.cos(k);
        vacuum -= Math.abs(a);
        if (a < 0) vacParity ^= 1;
        cheapest = Math.min(cheapest, 2 * Math.abs(a));
      } else {
        const eps = 2 * Math.sqrt(J * J + h * h - 2 * J * h * Math.cos(k));
        vacuum -= eps / 2;
        cheapest = Math.min(cheapest, eps);
      }
    }
    return vacParity === parity ? vacuum : vacuum + cheapest;
  };
  const even = sectorLowest(false, 0);
  const odd = sectorLowest(true, 1);
  return { E0: Math.min(even, odd), evenSector: even, oddSector: odd };
}
