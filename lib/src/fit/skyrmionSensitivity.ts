/**
 * Radius R(B) and wall width w(B) of the ansatz skyrmion (walls/skyrmionAnsatz.ts) and their
 * derivatives with respect to the film parameters A, D and Ku, for fitting material parameters to
 * a field series.
 *
 * Method (ours): implicit differentiation of the energy minimum. With u = (ln a, ln w), a = R / w,
 * the solver finds grad_u Estar(u; theta) = 0, where Estar is the ansatz energy with the helicity at its
 * optimum (the same expression as in skyrmionAnsatz.ts):
 *   Estar = 2 pi t [A I_ex(a) + (K_eff I_K(a) + Ms B I_Z(a)) w^2 + D h I_D(a) w]
 *        + mu0 Ms^2 t w^2 [Phi_s(a, t/w) + h^2 Phi_v(a, t/w)],
 * h = cos(psi) at its optimum. Differentiating the stationarity condition gives
 *   du/dtheta = -H^-1 d(grad_u E*)/dtheta,  H = Hessian of Estar in u,
 * and dEstar/dtheta is known in closed form at fixed u (envelope theorem for the helicity):
 *   dEstar/dA = 2 pi t I_ex,  dEstar/dD = 2 pi t h I_D w,  dEstar/dKu = 2 pi t I_K w^2.
 * H and the u-derivatives of dEstar/dtheta are taken by central differences of these smooth functions
 * (step 2e-3 in ln a and ln w, truncation error ~ 1e-6 relative). Then
 *   dR/dtheta = R (du_1 + du_2),  dw/dtheta = w du_2.
 * Checked against central differences of the full solver in test/lib/fit/skyrmionSensitivity.test.ts
 * (two independent routes: differentiation of the stationarity condition versus re-minimization).
 *
 * Assumptions: those of the ansatz solver (continuum, T = 0, magnetization uniform through the
 * thickness, ansatz profile, non-local thin-film magnetostatics unless switched off).
 */
import { InputError } from "../errors.js";
import { effectiveAnisotropy, makeFilm, type Film } from "../material/film.js";
import { ansatzEnergyTerms, ansatzLocalIntegrals, ansatzNonlocal, solveSkyrmionAnsatz, type AnsatzSkyrmion } from "../walls/skyrmionAnsatz.js";

/** Film parameters a field-series fit can vary. */
export type SeriesParameter = "A" | "D" | "Ku";

export interface SkyrmionSensitivity {
  /** Solver status ("ok" or why there is no metastable skyrmion). */
  status: AnsatzSkyrmion["status"];
  B: number;
  /** Radius (m, m_z = 0) and wall width (m) of the ansatz; NaN unless status is "ok". */
  R: number;
  w: number;
  /** dR/dtheta and dw/dtheta (m per SI unit of theta) for the requested parameters, in order. */
  dR: number[];
  dw: number[];
  parameters: SeriesParameter[];
  notes: string[];
}

export interface SensitivityOptions {
  /** Include non-local magnetostatics (default true, as the solver). */
  nonlocal?: boolean;
  /** Warm start radius (m) for the solver. */
  startRadius?: number;
}

/** A copy of `film` with some of A, D, Ku replaced (the input film is never changed). */
export function filmWith(film: Film, values: Partial<Record<SeriesParameter, number>>): Film {
  return makeFilm({ Ms: film.Ms, A: values.A ?? film.A, Ku: values.Ku ?? film.Ku, D: values.D ?? film.D, dmi: film.dmi, t: film.t, alpha: film.alpha, gamma: film.gamma });
}

interface EnergyAndGradient {
  E: number;
  /** dEstar/dA, dEstar/dD, dEstar/dKu at fixed (a, w). */
  gA: number;
  gD: number;
  gK: number;
}

/** The ansatz energy with the optimal helicity, and its closed-form parameter gradient. */
export function ansatzEnergyAt(film: Film, B: number, a: number, w: number, nonlocal = true): EnergyAndGradient {
  const I = ansatzLocalIntegrals(a);
  const nl = nonlocal ? ansatzNonlocal(a, film.t / w) : { surface: 0, volume: 0 };
  const T = ansatzEnergyTerms(film, B, effectiveAnisotropy(film), I, w, nl.surface, nl.volume, undefined, {
    exchange: 0,
    anisotropy: 0,
    zeeman: 0,
    dmiScale: 0,
    surface: 0,
    volumeScale: 0,
    h: 0,
    vf: 0,
    total: 0,
  });
  const twoPiT = 2 * Math.PI * film.t;
  return { E: T.total, gA: twoPiT * I.ex, gD: twoPiT * w * I.D * T.h, gK: twoPiT * w * w * I.K };
}

const STEP = 2e-3;

/**
 * Solve the ansatz skyrmion at field B and return R, w and their derivatives with respect to the
 * requested film parameters (default A and D).
 */
export function skyrmionSensitivity(film: Film, B: number, parameters: SeriesParameter[] = ["A", "D"], options: SensitivityOptions = {}): SkyrmionSensitivity {
  for (const p of parameters) if (p !== "A" && p !== "D" && p !== "Ku") throw new InputError("parameters", p, `"A", "D" or "Ku"`);
  const nonlocal = options.nonlocal ?? true;
  const sol = solveSkyrmionAnsatz(film, B, { nonlocal, startRadius: options.startRadius });
  if (sol.status !== "ok") {
    return { status: sol.status, B, R: NaN, w: NaN, dR: parameters.map(() => NaN), dw: parameters.map(() => NaN), parameters, notes: sol.notes };
  }
  const R = sol.radius;
  const w = sol.wallWidth;
  const u1 = Math.log(R / w);
  const u2 = Math.log(w);
  const at = (d1: number, d2: number) => ansatzEnergyAt(film, B, Math.exp(u1 + d1), Math.exp(u2 + d2), nonlocal);
  const s = STEP;
  const c = at(0, 0);
  const p1 = at(s, 0);
  const m1 = at(-s, 0);
  const p2 = at(0, s);
  const m2 = at(0, -s);
  const pp = at(s, s);
  const pm = at(s, -s);
  const mp = at(-s, s);
  const mm = at(-s, -s);
  const H11 = (p1.E - 2 * c.E + m1.E) / (s * s);
  const H22 = (p2.E - 2 * c.E + m2.E) / (s * s);
  const H12 = (pp.E - pm.E - mp.E + mm.E) / (4 * s * s);
  const det = H11 * H22 - H12 * H12;
  const notes = [...sol.notes];
  if (!(H11 > 0 && det > 0)) notes.push("the energy Hessian at the solver's minimum is not positive definite: derivatives are unreliable (a flat or marginal minimum)");
  const key = { A: "gA", D: "gD", Ku: "gK" } as const;
  const dR: number[] = [];
  const dw: number[] = [];
  for (const p of parameters) {
    const k = key[p];
    const M1 = (p1[k] - m1[k]) / (2 * s);
    const M2 = (p2[k] - m2[k]) / (2 * s);
    // du = -H^-1 M
    const du1 = -(H22 * M1 - H12 * M2) / det;
    const du2 = -(-H12 * M1 + H11 * M2) / det;
    dR.push(R * (du1 + du2));
    dw.push(w * du2);
  }
  return { status: "ok", B, R, w, dR, dw, parameters, notes };
}
