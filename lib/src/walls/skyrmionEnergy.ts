/**
 * Energy of an isolated axisymmetric skyrmion in a thin film, for any radial profile theta(rho).
 *
 * Conventions (lib/src/README.md): m = (sin theta cos(phi + psi), sin theta sin(phi + psi), cos theta),
 * background theta = 0 (+z), core theta(0) = pi (-z), vorticity +1 (skyrmion number Q = -1), helicity
 * psi; field B = mu0 H along +z (T). Energies are relative to the uniform +z film.
 *
 * With theta' = d theta / d rho, the energy per film (J) is
 *   E = 2 pi t Int_0^inf [ A (theta'^2 + sin^2 theta / rho^2) + K_eff sin^2 theta
 *        + D h (theta' + sin theta cos theta / rho) + Ms B (1 - cos theta) ] rho d rho + E_nl,
 * derived term by term (ours):
 * - exchange A |grad m|^2 = A (theta'^2 + sin^2 theta / rho^2) for vorticity 1;
 * - Ku sin^2 theta plus the local thin-film magnetostatics (mu0 Ms^2/2) cos^2 theta give
 *   K_eff sin^2 theta with K_eff = Ku - mu0 Ms^2 / 2 (constant dropped);
 * - interfacial DMI w = D [m_z div m - (m . grad) m_z]: with m_rho = sin theta cos psi,
 *   div m = cos psi (cos theta theta' + sin theta / rho), (m . grad) m_z = -cos psi sin^2 theta theta',
 *   so w = D cos(psi) (theta' + sin theta cos theta / rho): h = cos(psi);
 * - bulk DMI w = D m . curl m: (curl m)_phi = sin theta theta', (curl m)_z = sin psi (cos theta theta'
 *   + sin theta / rho), so w = D sin(psi) (theta' + sin theta cos theta / rho): h = sin(psi);
 * - Zeeman -Ms B m_z relative to the background: Ms B (1 - cos theta);
 * - E_nl: non-local thin-film magnetostatics (surface charges, and volume charges with weight
 *   cos^2 psi), magnetostatics.ts.
 * Helicity selected by the sign of D: the DMI integral Int (theta' rho + sin theta cos theta) d rho is
 * negative for a core-down skyrmion (about -pi R for R >> wall width), so the DMI lowers the energy
 * when D h > 0: interfacial D > 0 -> Neel psi = 0 (in-plane moments point radially outward in the
 * wall, towards the +z background), D < 0 -> psi = pi (inward); bulk D > 0 -> Bloch psi = +pi/2
 * (counter-clockwise seen from +z), D < 0 -> psi = -pi/2. Tested in test/lib/walls/skyrmionEnergy.test.ts.
 * Sources: A. Bogdanov, A. Hubert, JMMM 138, 255 (1994); S. Rohart, A. Thiaville, PRB 88, 184422 (2013).
 */
import { InputError } from "../errors.js";
import { effectiveAnisotropy, type Film } from "../material/film.js";
import { compositeGaussLegendre } from "../numeric/gaussLegendre.js";
import { profileNonlocalEnergy } from "./magnetostatics.js";

/** An axisymmetric profile with its derivative and the lengths that set the quadrature. */
export interface RadialProfile {
  /** theta(rho) (rad), rho in m. */
  theta(rho: number): number;
  /** d theta / d rho (rad/m). */
  dtheta(rho: number): number;
  /** Radius (m) beyond which theta is zero to the accuracy wanted. */
  rhoMax: number;
  /** Smallest feature (m): wall width or core radius. */
  scale: number;
  /** Radius (m) inside which theta = pi to 1e-12 (optional). */
  saturatedCore?: number;
}

/** Parts of the skyrmion energy (J), relative to the uniform film. */
export interface SkyrmionEnergyParts {
  exchange: number;
  /** K_eff sin^2 theta term (includes the local magnetostatics). */
  anisotropy: number;
  dmi: number;
  zeeman: number;
  /** Non-local surface-charge correction (<= 0); 0 when not computed. */
  magnetostaticSurface: number;
  /** Volume-charge energy (>= 0, Neel only); 0 when not computed. */
  magnetostaticVolume: number;
  total: number;
}

/** Helicity factors: h multiplying D (cos psi interfacial, sin psi bulk) and cos^2 psi for volume charges. */
export function helicityFactors(dmi: Film["dmi"], psi: number): { dmiFactor: number; volumeFactor: number } {
  const c = Math.cos(psi);
  return { dmiFactor: dmi === "interfacial" ? c : Math.sin(psi), volumeFactor: c * c };
}

/** Helicity psi (rad) favoured by the DMI alone: 0 / pi (interfacial, D >= 0 / D < 0), +-pi/2 (bulk). */
export function dmiHelicity(film: Film): number {
  if (film.dmi === "interfacial") return film.D >= 0 ? 0 : Math.PI;
  return film.D >= 0 ? Math.PI / 2 : -Math.PI / 2;
}

/** Options of `skyrmionEnergy`. */
export interface SkyrmionEnergyOptions {
  /** Helicity psi (rad); default the DMI-favoured one. */
  helicity?: number;
  /** Include non-local magnetostatics (default true). */
  nonlocal?: boolean;
}

/**
 * Energy (J) of an axisymmetric skyrmion with any profile in a film at field B (T). Local terms by
 * composite Gauss-Legendre quadrature, the non-local magnetostatics by Hankel transforms.
 */
export function skyrmionEnergy(film: Film, B: number, profile: RadialProfile, options: SkyrmionEnergyOptions = {}): SkyrmionEnergyParts {
  if (!Number.isFinite(B)) throw new InputError("B", B, "a finite field in T");
  const { rhoMax, scale } = profile;
  if (!(scale > 0)) throw new InputError("scale", scale, "a positive length in m");
  if (!(rhoMax > scale)) throw new InputError("rhoMax", rhoMax, `a length in m larger than scale = ${scale}`);
  const psi = options.helicity ?? dmiHelicity(film);
  const { dmiFactor, volumeFactor } = helicityFactors(film.dmi, psi);
  const Keff = effectiveAnisotropy(film);
  const core = Math.max(0, profile.saturatedCore ?? 0);
  // Panels: graded near the axis, then width scale / 4.
  const breaks: number[] = [];
  const h = scale / 4;
  if (core > 0) {
    breaks.push(core);
  } else {
    breaks.push(0);
    for (let b = h / 64; b < h; b *= 2) breaks.push(b);
  }
  const start = breaks[breaks.length - 1]!;
  const nPan = Math.max(1, Math.ceil((rhoMax - start) / h));
  for (let p = 1; p <= nPan; p++) breaks.push(start + ((rhoMax - start) * p) / nPan);
  const { x, w } = compositeGaussLegendre(breaks, 10);
  let ex = 0;
  let an = 0;
  let dm = 0;
  let ze = core * core; // Int_0^core 2 rho d rho
  for (let i = 0; i < x.length; i++) {
    const r = x[i]!;
    const th = profile.theta(r);
    const dth = profile.dtheta(r);
    if (!Number.isFinite(th) || !Number.isFinite(dth)) throw new InputError("profile", th, `a finite theta and theta' at rho = ${r} m`);
    const s = Math.sin(th);
    const c = Math.cos(th);
    const wi = w[i]!;
    ex += wi * (dth * dth * r + (s * s) / r);
    an += wi * s * s * r;
    dm += wi * (dth * r + s * c);
    ze += wi * (1 - c) * r;
  }
  const twoPiT = 2 * Math.PI * film.t;
  const exchange = twoPiT * film.A * ex;
  const anisotropy = twoPiT * Keff * an;
  const dmi = twoPiT * film.D * dmiFactor * dm;
  const zeeman = twoPiT * film.Ms * B * ze;
  let magnetostaticSurface = 0;
  let magnetostaticVolume = 0;
  if (options.nonlocal ?? true) {
    const nl = profileNonlocalEnergy(film.Ms, film.t, (r) => profile.theta(r), {
      rhoMax,
      scale,
      saturatedCore: core,
      cosHelicity: Math.sqrt(volumeFactor),
    });
    magnetostaticSurface = nl.surface;
    magnetostaticVolume = nl.volume;
  }
  return {
    exchange,
    anisotropy,
    dmi,
    zeeman,
    magnetostaticSurface,
    magnetostaticVolume,
    total: exchange + anisotropy + dmi + zeeman + magnetostaticSurface + magnetostaticVolume,
  };
}
