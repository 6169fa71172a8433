/**
 * The domain-wall picture of Ising-like chains, to first order in Jperp and hx (|Jz| large).
 *
 * Antiferromagnet (Jz > 0). An Ising configuration with one ferromagnetic bond (a wall) costs Jz/2
 * above the Neel energy (one bond from -Jz/4 to +Jz/4). Label the wall by its bond j (sites j, j+1)
 * and its type sigma: both spins up (sigma = +1, S^z = +1/2 carried) or both down (sigma = -1). Acting
 * on such a state within the one-wall manifold (derived here):
 * - (Jperp/2)(S^+ S^- + h.c.) on the antiparallel pair next to the wall exchanges it: the wall
 *   moves by two bonds, j -> j +- 2, type kept, amplitude Jperp/2;
 * - -hx S^x on a spin of the wall bond flips it: the wall moves by one bond, j -> j +- 1, and its
 *   type flips, amplitude -hx/2 (flipping any other spin makes three walls: second order);
 * - -hz S^z gives -sigma hz / 2.
 * With Bloch states |K, sigma> = N^{-1/2} sum_j e^{iKj} |j, sigma> (K the crystal momentum, since a
 * translation by one site moves the wall by one bond) the 2 x 2 band Hamiltonian is
 *   [[Jz/2 + Jperp cos 2K - hz/2, -hx cos K], [-hx cos K, Jz/2 + Jperp cos 2K + hz/2]],
 *   E_-+(K) = Jz/2 + Jperp cos 2K -+ sqrt(hz^2/4 + hx^2 cos^2 K).
 * At hx = hz = 0 this is Jz/2 + Jperp cos 2K (J. Villain, Physica B 79, 1 (1975); S. Ishimura,
 * H. Shiba, Prog. Theor. Phys. 63, 743 (1980)). Verified against ED of odd rings (which hold exactly
 * one wall) with errors of order Jperp^2/Jz (test/lib/chains/wallBand.test.ts).
 *
 * Chirality and spin current of a band state. The vector chirality kappa^z = sum_l (S^x_l S^y_{l+1} -
 * S^y_l S^x_{l+1}) = sum_l (i/2)(S^+_l S^-_{l+1} - S^-_l S^+_{l+1}) is dH/dphi / Jperp for a twist
 * S^+_l S^-_{l+1} -> e^{i phi} S^+_l S^-_{l+1}. An up-up wall moves right by S^-_{j+1} S^+_{j+2}
 * (phase e^{-i phi}) and a down-down wall by S^+ S^- (e^{+i phi}), so E_sigma(K, phi) =
 * Jperp cos(2K - sigma phi) and <kappa^z> = sigma sin 2K for the pure types, weighted by the type
 * content in a mixed (hx != 0) state: <kappa^z> = (|u_+|^2 - |u_-|^2) sin 2K. The spin current
 * j^z = Jperp kappa^z equals (carried S^z) x (group velocity), sigma/2 x (-2 Jperp sin 2K) up to the
 * sign convention of K (checked against ED: the sign printed here is the ED sign).
 *
 * Two walls and neutrons at T = 0 (AFM): S^x or S^y on the Neel state flips one spin and makes two
 * walls of one type with total momentum q = K1 + K2 (mod pi); their energies fill
 *   Jz + Jperp (cos 2K1 + cos 2K2) = Jz + 2 Jperp cos q cos(2K1 - q),  i.e. [Jz - 2Jperp|cos q|, Jz + 2Jperp|cos q|].
 * With fields the bounds are the extremes of E_a(K) + E_b(q - K) over K and bands.
 *
 * Intraband ("Villain") scattering at T > 0: S^z_q moves a thermally excited wall from K to K - q
 * without creating walls, at w = E(K - q) - E(K) = 2 Jperp sin q sin(2K - q) (hx = hz = 0), so the
 * weight fills |w| <= 2 Jperp |sin q| with square-root edges. For a wall at bond j the spins change
 * sign across it, and the matrix element is |<K - q|S^z_q|K>|^2 = 1 / (4 N cos^2(q/2)) (the
 * Fourier sum of a staggered step; valid for |q - pi| larger than the wall density), so per site
 *   S_V(q, w) = n_w / (4 cos^2(q/2)) sum_roots p(K_r) / (2 pi |dw/dK|)    (derived here),
 * with p(K) the thermal distribution of wall momenta, which for T >> Jperp gives
 * n_w / (4 cos^2(q/2)) / (pi sqrt(4 Jperp^2 sin^2 q - w^2)). The wall density of the dilute gas is
 * n_w = z / (1 + z), z = (1/2) sum_bands int dK/2pi exp(-E(K)/T) (the one-wall states count each
 * position twice, once per global spin flip), so n_w ~ exp(-Jz / 2T) I_0(Jperp / T) at hx = 0.
 *
 * Transverse magnetization and the chiral weight: in first order the Neel state acquires
 * <S^x> = hx / (2 Jz) per site (a flipped spin costs Jz), and each wall in band -+ adds
 * -dE/dhx = +-|cos K| hx cos^2K / sqrt(...) (hz = 0: +-|cos K|). The chiral weight of S(q, w) then
 * follows from its sum rule, int dw C = -<S^x> (dynamics.ts).
 *
 * Ferromagnet (Jz < 0): a wall (up|down) costs |Jz|/2; Jperp exchanges the antiparallel wall pair
 * and makes three walls (no first-order hopping); -hx S^x on a spin next to the wall moves it by one
 * bond with amplitude -hx/2, so E(K) = |Jz|/2 - hx cos K, without chirality in first order. A field
 * hz makes the wall energy depend on its position (a potential ramp), not a band: said in the notes.
 *
 * Chiral-soliton literature on these chains (H.-B. Braun, D. Loss and coworkers) is recalled from
 * memory, not checked; nothing here depends on it.
 */
import { InputError } from "../errors.js";

export interface WallParameters {
  Jz: number;
  Jperp: number;
  hx: number;
  hz: number;
}

export interface WallBand {
  K: number[];
  lower: number[];
  upper: number[];
  /** <kappa^z> of the lower and upper band states (total, per wall). */
  chiralityLower: number[];
  chiralityUpper: number[];
  /** Spin current j^z = Jperp kappa^z of the lower band. */
  spinCurrentLower: number[];
  notes: string[];
}

function check(p: WallParameters): void {
  for (const k of ["Jz", "Jperp", "hx", "hz"] as const) if (!Number.isFinite(p[k])) throw new InputError(k, p[k], "a finite energy");
  if (p.Jz === 0) throw new InputError("Jz", p.Jz, "a non-zero Ising exchange (the wall picture needs |Jz| > 0)");
}

/** Notes on the validity of the first-order picture. */
export function wallValidityNotes(p: WallParameters): string[] {
  const notes: string[] = [];
  const r = Math.max(Math.abs(p.Jperp), Math.abs(p.hx)) / Math.abs(p.Jz);
  if (r > 0.3) notes.push(`first order in Jperp and hx: max(|Jperp|, |hx|) / |Jz| = ${r.toFixed(2)} is not small; corrections of relative order ${(r * r).toFixed(2)} and beyond`);
  if (p.Jz < 0 && p.hz !== 0) notes.push("ferromagnet with hz != 0: the field makes the wall energy grow with its displacement (no band); hz is ignored in the band shown");
  return notes;
}

/** Band 2 x 2 at momentum K: energies, lower-state type content |u_+|^2. */
function afmBand(p: WallParameters, K: number): { lo: number; hi: number; wUp: number } {
  const c = p.Jz / 2 + p.Jperp * Math.cos(2 * K);
  const a = -p.hz / 2; // diagonal offset of the up-up type
  const b = -p.hx * Math.cos(K);
  const R = Math.hypot(a, b);
  // lower eigenvector of [[a, b], [b, -a]]: weight on up-up = (1 - a/R)/2 ... for eigenvalue -R
  const wUp = R === 0 ? 0.5 : 0.5 * (1 - a / R);
  return { lo: c - R, hi: c + R, wUp };
}

export function domainWallBand(p: WallParameters, K: number[]): WallBand {
  check(p);
  const notes = wallValidityNotes(p);
  const out: WallBand = { K: [...K], lower: [], upper: [], chiralityLower: [], chiralityUpper: [], spinCurrentLower: [], notes };
  for (const k of K) {
    if (p.Jz > 0) {
      const b = afmBand(p, k);
      out.lower.push(b.lo);
      out.upper.push(b.hi);
      const s = Math.sin(2 * k);
      // at hx = hz = 0 the bands are degenerate: the lower state is taken as the up-up wall
      const wUp = p.hx === 0 && p.hz === 0 ? 1 : b.wUp;
      out.chiralityLower.push((2 * wUp - 1) * s * wallChiralitySign);
      out.chiralityUpper.push(-(2 * wUp - 1) * s * wallChiralitySign);
      out.spinCurrentLower.push(p.Jperp * (2 * wUp - 1) * s * wallChiralitySign);
    } else {
      const e = -p.Jz / 2 - Math.abs(p.hx) * Math.cos(k);
      out.lower.push(e);
      out.upper.push(e);
      out.chiralityLower.push(0);
      out.chiralityUpper.push(0);
      out.spinCurrentLower.push(0);
    }
  }
  if (p.Jz > 0 && p.hx === 0 && p.hz === 0)
    notes.push("hx = hz = 0: the up-up and down-down walls are degenerate; the chirality shown is the up-up wall's (the down-down wall has the opposite sign)");
  return out;
}

/** Sign relating <kappa^z> to sigma sin 2K with this folder's conventions (fixed by ED, see tests). */
export const wallChiralitySign = 1;

/** T = 0 two-wall continuum bounds at total momentum q (AFM; extremes over K and the two bands). */
export function twoWallContinuum(p: WallParameters, q: number[], samples = 361): { lower: number[]; upper: number[] } {
  check(p);
  const lower: number[] = [],
    upper: number[] = [];
  for (const Q of q) {
    let lo = Infinity,
      hi = -Infinity;
    for (let i = 0; i < samples; i++) {
      const K = (Math.PI * i) / (samples - 1);
      if (p.Jz > 0) {
        const b1 = afmBand(p, K),
          b2 = afmBand(p, Q - K);
        lo = Math.min(lo, b1.lo + b2.lo);
        hi = Math.max(hi, b1.hi + b2.hi);
      } else {
        const e = -p.Jz - Math.abs(p.hx) * (Math.cos(K) + Math.cos(Q - K));
        lo = Math.min(lo, e);
        hi = Math.max(hi, e);
      }
    }
    lower.push(lo);
    upper.push(hi);
  }
  return { lower, upper };
}

/** Villain intraband edge: max over K of |E(K) - E(K - q)| within the lower band (2 Jperp |sin q| at zero field). */
export function villainEdge(p: WallParameters, q: number[], samples = 721): number[] {
  check(p);
  return q.map((Q) => {
    if (p.Jz > 0 && p.hx === 0) return 2 * Math.abs(p.Jperp * Math.sin(Q));
    let best = 0;
    for (let i = 0; i < samples; i++) {
      const K = (2 * Math.PI * i) / (samples - 1);
      const e = (k: number): number => (p.Jz > 0 ? afmBand(p, k).lo : -p.Jz / 2 - Math.abs(p.hx) * Math.cos(k));
      best = Math.max(best, Math.abs(e(K) - e(K - Q)));
    }
    return best;
  });
}

/** Wall density per bond of the dilute wall gas at temperature T (k_B = 1, energies in one unit). */
export function wallDensity(p: WallParameters, T: number, samples = 720): number {
  check(p);
  if (!(T > 0) || !Number.isFinite(T)) throw new InputError("T", T, "a positive temperature");
  let z = 0;
  for (let i = 0; i < samples; i++) {
    const K = (2 * Math.PI * (i + 0.5)) / samples;
    if (p.Jz > 0) {
      const b = afmBand(p, K);
      z += 0.5 * (Math.exp(-b.lo / T) + Math.exp(-b.hi / T));
    } else {
      z += Math.exp((p.Jz / 2 + Math.abs(p.hx) * Math.cos(K)) / T);
    }
  }
  z /= samples;
  return z / (1 + z);
}

/**
 * Villain intraband S^zz(q, w) per site (AFM, hx = hz = 0, first order) at temperature T, without
 * broadening: n_w / (4 cos^2(q/2)) times the thermal density of transitions.
 */
export function villainLineShape(p: WallParameters, q: number, omega: number[], T: number): number[] {
  check(p);
  if (p.Jz <= 0) throw new InputError("Jz", p.Jz, "an antiferromagnetic Jz > 0 for the intraband (Villain) scattering");
  const nw = wallDensity({ ...p, hx: 0, hz: 0 }, T);
  const edge = 2 * Math.abs(p.Jperp * Math.sin(q));
  const norm = besselI0(p.Jperp / T) * Math.exp(0); // int dK/2pi e^{-Jperp cos 2K / T} = I_0(Jperp/T)
  const amp = nw / (4 * Math.cos(q / 2) ** 2);
  return omega.map((w) => {
    if (Math.abs(w) >= edge || edge === 0) return 0;
    // roots of w = 2 Jperp sin q sin(2K - q): sin x = w / edge, x = 2K - q
    const x0 = Math.asin(w / (2 * p.Jperp * Math.sin(q)));
    const d = 2 * Math.sqrt(edge * edge - w * w);
    let s = 0;
    for (const x of [x0, Math.PI - x0]) {
      for (const shift of [0, Math.PI]) {
        const K = (x + q) / 2 + shift;
        s += Math.exp(-(p.Jperp * Math.cos(2 * K)) / T) / norm;
      }
    }
    return (amp * s) / (2 * Math.PI * d);
  });
}

/** Modified Bessel I_0 by its power series (|x| < 50) or asymptotics. */
export function besselI0(x: number): number {
  const a = Math.abs(x);
  if (a > 50) return (Math.exp(a) / Math.sqrt(2 * Math.PI * a)) * (1 + 1 / (8 * a) + 9 / (128 * a * a));
  let term = 1,
    sum = 1;
  for (let k = 1; k < 500; k++) {
    term *= (a / (2 * k)) ** 2;
    sum += term;
    if (term < 1e-17 * sum) break;
  }
  return sum;
}

/**
 * Transverse magnetization per site in the first-order picture: the Neel term hx / (2 Jz) plus the
 * thermal walls (AFM). Its negative is the frequency-integrated chiral weight of S(q, w).
 */
export function wallTransverseMagnetization(p: WallParameters, T: number, samples = 720): number {
  check(p);
  if (p.Jz <= 0) throw new InputError("Jz", p.Jz, "an antiferromagnetic Jz > 0");
  let m = p.hx / (2 * p.Jz);
  if (T > 0) {
    const nw = wallDensity(p, T, samples);
    let num = 0,
      den = 0;
    for (let i = 0; i < samples; i++) {
      const K = (2 * Math.PI * (i + 0.5)) / samples;
      const b = afmBand(p, K);
      const R = (b.hi - b.lo) / 2;
      const dR = R === 0 ? 0 : (p.hx * Math.cos(K) ** 2) / R; // dR/dhx
      const wl = Math.exp(-b.lo / T),
        wh = Math.exp(-b.hi / T);
      num += wl * dR - wh * dR; // -dE/dhx: lower band +dR, upper band -dR
      den += wl + wh;
    }
    m += nw * (num / den);
  }
  return m;
}

/**
 * T = 0 transverse line shape S^xx(q, w) = S^yy(q, w) per site of the antiferromagnet in the
 * two-wall picture, first order in Jperp, hx = hz = 0 (derived here): S^x_q on the Neel state flips
 * one spin, i.e. makes two walls of one type on neighbouring bonds. With total momentum q fixed the
 * two walls move in their relative coordinate d = 1, 3, 5, ... (bonds apart); each wall hops by two
 * bonds with Jperp/2, so in d the hopping is t = Jperp cos q (two paths with phases e^{+-iq}) and the
 * energy Jz + 2 t cos theta fills [Jz - 2 Jperp|cos q|, Jz + 2 Jperp|cos q|] (the continuum bounds).
 * The spin flip is the end site d = 1 of this half-infinite chain, whose local density of states is
 * the semicircle (2 / (pi W^2)) sqrt(W^2 - (w - Jz)^2), W = 2 Jperp |cos q| (a half-infinite uniform
 * chain: its continued fraction has all a_n = Jz, b_n = |t|). The weight: the ground state to first
 * order is |A> + c sum_b P_b |A>, P_b exchanging the antiparallel pair of bond b, c = -Jperp / (2 Jz)
 * (that exchange costs Jz). S^+ at the up site of an exchanged pair gives the same single flip F_o as
 * S^+ at the odd site o of |A>, from both neighbouring pairs, so <F_o|S^+_{-q}|0> is proportional to
 * 1 + 2 c cos q and the weight is w(q) = (1/4)(1 - 2 (Jperp / Jz) cos q) to first order (derived
 * here). So S^xx(q, w) = w(q)(2 / (pi W^2)) sqrt(W^2 - (w - Jz)^2): mean Jz, variance
 * W^2 / 4 = Jperp^2 cos^2 q (checked against the continued fractions of ED rings, with corrections of
 * order Jperp^2 / Jz). At q = pi/2 (W = 0) the line is a delta at Jz.
 * The line shape is returned broadened by a Lorentzian of half width eta (numerical convolution).
 */
export function twoWallTransverseLineShape(p: WallParameters, q: number, omega: number[], eta: number): number[] {
  check(p);
  if (p.Jz <= 0) throw new InputError("Jz", p.Jz, "an antiferromagnetic Jz > 0 for the two-wall continuum");
  if (!(eta > 0) || !Number.isFinite(eta)) throw new InputError("eta", eta, "a positive broadening (half width)");
  const W = 2 * Math.abs(p.Jperp * Math.cos(q));
  const weight = twoWallTransverseWeight(p, q);
  const lorentz = (x: number): number => eta / Math.PI / (x * x + eta * eta);
  if (W < 1e-12 * Math.abs(p.Jz)) return omega.map((w) => weight * lorentz(w - p.Jz));
  // the semicircle on x = Jz + W cos(theta): weight density (2 / pi) sin^2(theta) d theta (midpoint rule)
  const n = 400;
  return omega.map((w) => {
    let s = 0;
    for (let i = 0; i < n; i++) {
      const th = (Math.PI * (i + 0.5)) / n;
      s += Math.sin(th) ** 2 * lorentz(w - p.Jz - W * Math.cos(th));
    }
    return weight * (2 / Math.PI) * (Math.PI / n) * s;
  });
}

/** First-order weight of the two-wall transverse line: (1/4)(1 - 2 (Jperp / Jz) cos q), not below 0. */
export function twoWallTransverseWeight(p: WallParameters, q: number): number {
  return Math.max(0, 0.25 * (1 - ((2 * p.Jperp) / p.Jz) * Math.cos(q)));
}

/** The unbroadened semicircle of twoWallTransverseLineShape (for checks): per site, at w. */
export function twoWallTransverseDensity(p: WallParameters, q: number, w: number): number {
  check(p);
  const W = 2 * Math.abs(p.Jperp * Math.cos(q));
  const x = w - p.Jz;
  if (W === 0 || Math.abs(x) >= W) return 0;
  return (twoWallTransverseWeight(p, q) * 2 * Math.sqrt(W * W - x * x)) / (Math.PI * W * W);
}
