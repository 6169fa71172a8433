/**
 * The 360-degree wall (a 1D pair of 180-degree walls enclosing a reversed -z core) in a perpendicular
 * film, with the 2-pi-wall ansatz
 *     tan(theta / 2) = sinh(R / w) / sinh(|x - x0| / w)
 * of H.-B. Braun, PRB 50, 16501 (1994): core half-width R (where m_z = 0) and wall width w.
 * Background +z, core -z, applied field B = mu0 H along +z (B > 0 compresses the core).
 *
 * Energy per unit wall area relative to the uniform +z state (local model, K_eff):
 *   E = Integral [A theta'^2 + K_eff sin^2 theta + Ms B (1 - cos theta)] dx + E_DMI.
 * With u = x / w, a = R / w, p = sinh^2 a and J(p) = Integral_0^inf du / (sinh^2 u + p):
 *   exchange   = 8 A p I1 / w,   I1 = Integral cosh^2 u / (sinh^2 u + p)^2 du = J + (p - 1) J'
 *   anisotropy = 8 K_eff w p I2, I2 = Integral sinh^2 u / (sinh^2 u + p)^2 du = J + p J'
 *   Zeeman     = 4 Ms B w p J
 *   J(p) = arccos(sqrt p) / sqrt(p (1 - p))  (p < 1),  arccosh(sqrt p) / sqrt(p (p - 1))  (p > 1),  1 (p = 1),
 * (our derivation: substitute s = tanh u). The DMI term is topological in 1D: both walls have the same
 * helicity gamma (the in-plane moment is m = (s sin theta cos gamma, s sin theta sin gamma, cos theta)
 * with s = sign(x - x0), the skyrmion convention cut along a diameter) and E_DMI = -2 pi D cos gamma
 * (interfacial) or -2 pi D sin gamma (bulk), independent of R and w.
 *
 * Equilibrium: the ansatz contains an exact solution of the 1D Euler-Lagrange equation
 * Delta^2 theta'' = sin theta cos theta + h sin theta (h = Ms B / (2 K_eff)):
 *   w = Delta / sqrt(1 + h),  sinh(R / w) = sqrt((1 + h) / h)
 * (derived and verified here; a pair solution of this double sine-Gordon form is in Braun 1994).
 * We nevertheless find R and w by minimizing E(R, w) (so extensions of the energy keep working)
 * and report the exact pair beside it. Existence: a bound pair needs B > 0 (the walls repel; at
 * B <= 0 they separate, R -> infinity). As B grows the pair is compressed continuously:
 * R -> arsinh(1) Delta / sqrt(h) -> 0 (collapse only as B -> infinity in this 1D continuum model).
 * Stability against rotating the in-plane moment out of the common plane (unwinding through the
 * sphere) is not analysed here; the ansatz is planar.
 *
 * Energy of the exact pair (our derivation from the first integral A theta'^2 = K_eff [sin^2 theta +
 * 2 h (1 - cos theta)] of the 1D equation, substituting c = cos(theta / 2)):
 *   E_pair(h) = 8 sqrt(A K_eff) [ sqrt(1 + h) + h asinh(1 / sqrt h) ] - 2 pi |D|,
 * which tends to two free walls, 2 (4 sqrt(A K_eff) - pi |D|), as h -> 0. The bracket grows
 * monotonically from 1, so for |D| > D_c = 4 sqrt(A K_eff) / pi the pair energy is negative below and
 * positive above the saturation field B_sat = 2 K_eff h_s / Ms, where sqrt(1 + h_s) + h_s asinh(1 /
 * sqrt h_s) = |D| / D_c. Below B_sat inserting 360-degree walls lowers the energy (a spiral or
 * strip-domain state is lower than the uniform one); above it the uniform state is lower than any
 * dilute array of such walls. Source: A. Bogdanov, A. Hubert, JMMM 138, 255 (1994) (the saturation
 * field of the spiral as the field where an isolated 360-degree wall costs no energy); the closed
 * form above is ours, checked against scipy in test/lib/walls/wall360.test.ts.
 */
import { InputError } from "../errors.js";
import { minimize2d } from "../numeric/minimize2d.js";
import { type Film, criticalDmi, requirePerpendicular, wallWidthParameter } from "../material/film.js";

/** J(p) = Integral_0^inf du / (sinh^2 u + p) and its derivative dJ/dp, for p > 0. */
export function pairIntegral(p: number): { J: number; dJ: number } {
  if (!(p > 0) || !Number.isFinite(p)) throw new InputError("p", p, "a positive finite number");
  const eps = p - 1;
  if (Math.abs(eps) < 0.05) {
    // J = Sum_n (-eps)^n c_n with c_n = Integral_0^1 (1 - t^2)^n dt = c_{n-1} 2n / (2n + 1), c_0 = 1.
    let c = 1;
    let J = 1;
    let dJ = 0;
    let pow = 1; // (-eps)^(n-1)
    for (let n = 1; n < 60; n++) {
      c *= (2 * n) / (2 * n + 1);
      dJ += -n * pow * c;
      pow *= -eps;
      J += pow * c;
      if (Math.abs(pow) < 1e-18) break;
    }
    return { J, dJ };
  }
  if (p < 1) {
    const f = Math.acos(Math.sqrt(p));
    const g = Math.sqrt(p * (1 - p));
    return { J: f / g, dJ: -(g + f * (1 - 2 * p)) / (2 * g * g * g) };
  }
  const f = Math.acosh(Math.sqrt(p));
  const g = Math.sqrt(p * (p - 1));
  return { J: f / g, dJ: (g - f * (2 * p - 1)) / (2 * g * g * g) };
}

/** The three shape integrals times p: p I1, p I2 and p J, as functions of a = R / w. */
function shapeIntegrals(a: number): { pI1: number; pI2: number; pJ: number } {
  if (a > 30) {
    // p = sinh^2 a > 1e25: corrections are O(a e^{-2a}) < 1e-24.
    return { pI1: 0.5, pI2: 0.5, pJ: a + Math.log1p(-Math.exp(-2 * a)) };
  }
  const p = Math.sinh(a) ** 2;
  const { J, dJ } = pairIntegral(p);
  return { pI1: p * (J + (p - 1) * dJ), pI2: p * (J + p * dJ), pJ: p * J };
}

/** Polar angle of the ansatz at x: theta in [0, pi], pi at the centre x0. */
export function wall360Angle(x: number, R: number, w: number, x0 = 0): number {
  const u = Math.abs(x - x0) / w;
  const a = R / w;
  if (u === 0) return Math.PI;
  // tan(theta/2) = sinh a / sinh u = e^{a - u} (1 - e^{-2a}) / (1 - e^{-2u}), safe for large a and u
  const ratio = Math.exp(a - u) * (Math.expm1(-2 * a) / Math.expm1(-2 * u));
  return 2 * Math.atan(ratio);
}

/** Unit magnetization of the 360-degree wall with helicity gamma (shared by both walls). */
export function wall360Magnetization(x: number, R: number, w: number, helicity: number, x0 = 0): [number, number, number] {
  const th = wall360Angle(x, R, w, x0);
  const s = x >= x0 ? 1 : -1;
  const st = Math.sin(th);
  return [s * st * Math.cos(helicity), s * st * Math.sin(helicity), Math.cos(th)];
}

export interface Wall360Energy {
  exchange: number;
  anisotropy: number;
  zeeman: number;
  dmi: number;
  /** Sum, per unit wall area, relative to the uniform +z state (J/m^2). */
  total: number;
}

function checkShape(R: number, w: number): void {
  if (!(R > 0) || !Number.isFinite(R)) throw new InputError("R", R, "a positive finite core half-width in m");
  if (!(w > 0) || !Number.isFinite(w)) throw new InputError("w", w, "a positive finite wall width in m");
}

/** DMI energy of the pair (both walls with helicity gamma), J/m^2. */
export function wall360DmiEnergy(f: Film, helicity: number): number {
  return f.dmi === "interfacial" ? -2 * Math.PI * f.D * Math.cos(helicity) : -2 * Math.PI * f.D * Math.sin(helicity);
}

/** The DMI-favoured helicity of the pair: interfacial 0 or pi, bulk +-pi/2; 0 without DMI. */
export function wall360Helicity(f: Film): number {
  if (f.dmi === "interfacial") return f.D < 0 ? Math.PI : 0;
  return f.D < 0 ? -Math.PI / 2 : Math.PI / 2;
}

/** Closed-form ansatz energy per unit area for radius R, width w in field B (T), helicity gamma. */
export function wall360Energy(f: Film, R: number, w: number, B: number, helicity = wall360Helicity(f)): Wall360Energy {
  checkShape(R, w);
  if (!Number.isFinite(B)) throw new InputError("B", B, "a finite field in T");
  const K = requirePerpendicular(f, "the 360-degree wall");
  const { pI1, pI2, pJ } = shapeIntegrals(R / w);
  const exchange = (8 * f.A * pI1) / w;
  const anisotropy = 8 * K * w * pI2;
  const zeeman = 4 * f.Ms * B * w * pJ;
  const dmi = wall360DmiEnergy(f, helicity);
  return { exchange, anisotropy, zeeman, dmi, total: exchange + anisotropy + zeeman + dmi };
}

/** The exact stationary pair of the 1D equation (B > 0): w = Delta / sqrt(1 + h), sinh(R/w) = sqrt((1+h)/h). */
export function wall360ExactPair(f: Film, B: number): { radius: number; width: number } | null {
  const K = requirePerpendicular(f, "the 360-degree wall");
  if (!(B > 0)) return null;
  const Delta = Math.sqrt(f.A / K);
  const h = (f.Ms * B) / (2 * K);
  const width = Delta / Math.sqrt(1 + h);
  return { radius: width * Math.asinh(Math.sqrt((1 + h) / h)), width };
}

/** The bracket sqrt(1 + h) + h asinh(1 / sqrt h) of the exact pair energy (1 at h = 0, increasing). */
function pairBracket(h: number): number {
  if (h === 0) return 1;
  return Math.sqrt(1 + h) + h * Math.asinh(1 / Math.sqrt(h));
}

/** Energy per unit area (J/m^2) of the exact 360-degree pair at B > 0 (local model), DMI-favoured helicity. */
export function wall360ExactPairEnergy(f: Film, B: number): number {
  if (!(B > 0) || !Number.isFinite(B)) throw new InputError("B", B, "a positive finite field in T (a bound pair)");
  const K = requirePerpendicular(f, "the 360-degree wall");
  const h = (f.Ms * B) / (2 * K);
  return 8 * Math.sqrt(f.A * K) * pairBracket(h) - 2 * Math.PI * Math.abs(f.D);
}

/**
 * Saturation field B_sat (T) for |D| > D_c: the field where the exact 360-degree pair energy vanishes
 * (see the file header); 0 for |D| <= D_c (the pair energy is positive at every B > 0). Bisection on
 * h to a relative 1e-14.
 */
export function saturationField(f: Film): number {
  const K = requirePerpendicular(f, "the saturation field");
  const ratio = (Math.PI * Math.abs(f.D)) / (4 * Math.sqrt(f.A * K));
  if (!(ratio > 1)) return 0;
  let lo = 0;
  let hi = 1;
  while (pairBracket(hi) < ratio) hi *= 2;
  for (let i = 0; i < 200 && hi - lo > 1e-15 * hi; i++) {
    const mid = 0.5 * (lo + hi);
    if (pairBracket(mid) < ratio) lo = mid;
    else hi = mid;
  }
  return (2 * K * 0.5 * (lo + hi)) / f.Ms;
}

/** Field above which R < w (the two walls have merged into one compressed 2-pi soliton), T. */
export function wall360MergeField(f: Film): number {
  const K = requirePerpendicular(f, "the 360-degree wall");
  const h = 1 / (Math.sinh(1) ** 2 - 1);
  return (2 * K * h) / f.Ms;
}

export interface Wall360Equilibrium {
  /** "bound": a compressed pair exists; "unbound": B <= 0, the walls separate (R -> infinity). */
  status: "bound" | "unbound";
  /** Core half-width R (m); Infinity when unbound. */
  radius: number;
  /** Wall width w (m); Delta when unbound. */
  width: number;
  /** Energy per unit area (J/m^2); 2 sigma (two free walls) when unbound and B = 0. */
  energy: number;
  parts: Wall360Energy | null;
  helicity: number;
  /** The exact pair of the Euler-Lagrange equation, for comparison. */
  exact: { radius: number; width: number } | null;
  minimizer: { evaluations: number; restarts: number; success: boolean; message: string } | null;
  notes: string[];
}

/** Equilibrium R and w of the pair in field B (T) by minimizing the ansatz energy. */
export function wall360Equilibrium(f: Film, B: number): Wall360Equilibrium {
  if (!Number.isFinite(B)) throw new InputError("B", B, "a finite field in T");
  const Delta = wallWidthParameter(f);
  const K = requirePerpendicular(f, "the 360-degree wall");
  const helicity = wall360Helicity(f);
  const sigmaPair = 8 * Math.sqrt(f.A * K) + wall360DmiEnergy(f, helicity);
  const aboveDc = f.dmi === "interfacial" || f.dmi === "bulk" ? Math.abs(f.D) > criticalDmi(f) : false;
  const dcNote = (): string[] => {
    if (!aboveDc) return [];
    const Bsat = saturationField(f);
    const head = `|D| = ${(Math.abs(f.D) * 1e3).toPrecision(4)} mJ/m^2 > D_c = ${(criticalDmi(f) * 1e3).toPrecision(4)} mJ/m^2, saturation field B_sat = ${(Bsat * 1e3).toPrecision(4)} mT`;
    return [
      B > Bsat
        ? `${head}: B > B_sat, the pair energy is positive and the uniform film is lower than a spiral or strips; the pair is an excitation of it.`
        : `${head}: B <= B_sat, the pair energy is negative (each 360-degree wall lowers the energy), so a spiral or strip state is lower than the uniform film; the pair is not a metastable excitation of a uniform ground state.`,
    ];
  };
  if (!(B > 0)) {
    return {
      status: "unbound",
      radius: Infinity,
      width: Delta,
      energy: B === 0 ? sigmaPair : -Infinity,
      parts: null,
      helicity,
      exact: null,
      minimizer: null,
      notes: [
        B === 0
          ? "B = 0: the two walls repel and separate; the energy tends to that of two free walls, 2 sigma."
          : "B < 0 favours the core: the reversed domain grows without bound (no pair).",
        ...dcNote(),
      ],
    };
  }
  // Minimize over (ln(R/Delta), ln(w/Delta)) from a generic start.
  const E = (lr: number, lw: number) => wall360Energy(f, Delta * Math.exp(lr), Delta * Math.exp(lw), B, helicity).total / Math.sqrt(f.A * K);
  const r = minimize2d(E, [Math.log(2), 0], { step: [0.5, 0.3], xTol: 1e-11 });
  const radius = Delta * Math.exp(r.x[0]);
  const width = Delta * Math.exp(r.x[1]);
  const parts = wall360Energy(f, radius, width, B, helicity);
  const notes: string[] = [];
  if (!r.success) notes.push(`minimizer: ${r.message}`);
  if (radius < width) notes.push("R < w: the pair is compressed into a single 2-pi soliton (field above the merge field).");
  notes.push(...dcNote());
  return {
    status: "bound",
    radius,
    width,
    energy: parts.total,
    parts,
    helicity,
    exact: wall360ExactPair(f, B),
    minimizer: { evaluations: r.evaluations, restarts: r.restarts, success: r.success, message: r.message },
    notes,
  };
}

/** Sampled 360-degree wall profile for plots, x from -span to +span (m). */
export function wall360Profile(R: number, w: number, helicity: number, span: number, points = 201): { x: number[]; mz: number[]; mx: number[]; my: number[] } {
  checkShape(R, w);
  if (!(span > 0)) throw new InputError("span", span, "a positive half-length in m");
  if (!Number.isInteger(points) || points < 2) throw new InputError("points", points, "a whole number >= 2");
  const out = { x: [] as number[], mz: [] as number[], mx: [] as number[], my: [] as number[] };
  for (let i = 0; i < points; i++) {
    const x = -span + (2 * span * i) / (points - 1);
    const [mx, my, mz] = wall360Magnetization(x, R, w, helicity);
    out.x.push(x);
    out.mx.push(mx);
    out.my.push(my);
    out.mz.push(mz);
  }
  return out;
}
