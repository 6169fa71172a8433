/**
 * Calculator specs of isolated skyrmions: `skyrmion` (360-degree-wall ansatz with non-local
 * thin-film magnetostatics, R(B) and w(B) sweeps) and `skyrmion-profile` (ansatz against the exact
 * radial profile of the local model). Defaults: the invented demo film HX-1 (lib/src/material/demo.ts).
 */
import type { CalculatorSpec, ComputeOptions, ComputeOutput, InputSpec, InputValues } from "./spec.js";
import { InputError } from "../errors.js";
import { makeFilm, requirePerpendicular, wallWidthParameter, type Film } from "../material/film.js";
import { demoFilmHX1 } from "../material/demo.js";
import { solveSkyrmionAnsatz, type AnsatzSkyrmion } from "../walls/skyrmionAnsatz.js";
import { solveSkyrmionExact } from "../walls/skyrmionExact.js";

const demo = demoFilmHX1.film;

function filmInputs(): InputSpec[] {
  return [
    { name: "Ms", symbol: "M_s", unit: "A/m", default: demo.Ms, min: 0.5e6, max: 1.3e6, scale: "linear", meaning: "Saturation magnetization" },
    { name: "A", symbol: "A", unit: "J/m", default: demo.A, min: 5e-12, max: 30e-12, scale: "linear", meaning: "Exchange stiffness" },
    { name: "Ku", symbol: "K_u", unit: "J/m^3", default: demo.Ku, min: 0.9e6, max: 3e6, scale: "linear", meaning: "Uniaxial perpendicular anisotropy (K_eff = Ku - mu0 Ms^2 / 2 must be > 0)" },
    { name: "D", symbol: "D", unit: "J/m^2", default: demo.D, min: 0, max: 4e-3, scale: "linear", meaning: "Interfacial DMI constant (sign selects the Neel helicity)" },
    { name: "t", symbol: "t", unit: "m", default: demo.t, min: 0.4e-9, max: 4e-9, scale: "linear", meaning: "Film thickness" },
    { name: "B", symbol: "\\mu_0 H", unit: "T", default: 0.05, min: -0.05, max: 0.3, scale: "linear", meaning: "Applied field along +z (the background direction; the core points along -z)" },
  ];
}

function filmOf(v: InputValues): Film {
  const film = makeFilm({ Ms: v.Ms, A: v.A, Ku: v.Ku, D: v.D, t: v.t, dmi: "interfacial" });
  requirePerpendicular(film, "an isolated skyrmion");
  return film;
}

const commonAssumptions = [
  "Continuum micromagnetics, zero temperature, magnetization uniform through the thickness (thin film).",
  "Isolated axisymmetric skyrmion (vorticity 1, core along -z) in an infinite film; interfacial DMI (Neel, helicity optimized against the volume charges).",
  "Defaults are the invented demo film HX-1 (not a real material).",
];

function describe(r: AnsatzSkyrmion): string {
  if (r.status === "ok") return "Metastable isolated skyrmion.";
  return r.notes.join(" ");
}

/** Refine the boundary between an existing (okField) and a non-existing (badField) skyrmion by bisection. */
function refineBoundary(film: Film, okField: number, badField: number, startRadius: number, tol = 1e-4): number {
  let ok = okField;
  let bad = badField;
  let start = startRadius;
  for (let i = 0; i < 40 && Math.abs(bad - ok) > tol; i++) {
    const mid = 0.5 * (ok + bad);
    const r = solveSkyrmionAnsatz(film, mid, { startRadius: start });
    if (r.status === "ok") {
      ok = mid;
      start = r.radius;
    } else bad = mid;
  }
  return ok;
}

function computeSkyrmion(v: InputValues, options: ComputeOptions = {}): ComputeOutput {
  const film = filmOf(v);
  const notes: string[] = [];
  const values: ComputeOutput["values"] = {};
  const r = solveSkyrmionAnsatz(film, v.B!);
  values.regime = describe(r);
  values.deltaParameter = wallWidthParameter(film);
  if (r.status === "spiral") {
    values.spiralPeriod = r.spiralPeriod!;
    return { values, status: "warning", notes: r.notes };
  }
  if (r.status === "ok") {
    values.radius = r.radius;
    values.wallWidth = r.wallWidth;
    values.energy = r.energy.total;
    values.helicity = r.helicity;
    values.magnetostaticEnergy = r.energy.magnetostaticSurface + r.energy.magnetostaticVolume;
    // Continuum limit: a few lattice spacings (~0.3 nm) across the core is where the continuum
    // energy stops being trustworthy (a lattice model is needed). Common practice, no source.
    if (r.radius < 3e-9) notes.push(`R = ${(r.radius * 1e9).toPrecision(3)} nm spans only a few atomic spacings: the continuum model is at its limit there (treat R as a rough estimate)`);
  } else {
    notes.push(...r.notes);
  }
  const sweep = options.sweep;
  if (sweep) {
    if (sweep.over !== "B") throw new InputError("sweep", sweep.over, "B (the only sweepable input of 'skyrmion')");
    const n = sweep.points;
    const fs: number[] = [];
    const rs: number[] = [];
    const ws: number[] = [];
    const es: number[] = [];
    let start: number | undefined;
    let lastOk: { B: number; R: number } | undefined;
    let collapse: number | undefined;
    let expansion: number | undefined;
    let prevStatus: string | undefined;
    let prevB = NaN;
    for (let i = 0; i < n; i++) {
      const B = sweep.from + ((sweep.to - sweep.from) * i) / (n - 1);
      const s = solveSkyrmionAnsatz(film, B, start !== undefined ? { startRadius: start } : {});
      if (s.status === "ok") {
        fs.push(B);
        rs.push(s.radius);
        ws.push(s.wallWidth);
        es.push(s.energy.total);
        if (prevStatus !== undefined && prevStatus !== "ok" && expansion === undefined && collapse === undefined) {
          // entering the metastable range (from the expanded side when sweeping upwards)
          const edge = refineBoundary(film, B, prevB, s.radius);
          if (prevStatus === "expanded") expansion = edge;
          else if (prevStatus === "collapsed") collapse = edge;
        }
        start = s.radius;
        lastOk = { B, R: s.radius };
      } else if (lastOk && prevStatus === "ok") {
        const edge = refineBoundary(film, lastOk.B, B, lastOk.R);
        if (s.status === "collapsed") collapse = edge;
        else if (s.status === "expanded") expansion = edge;
      }
      prevStatus = s.status;
      prevB = B;
    }
    values.fieldSweep = fs;
    values.radiusSweep = rs;
    values.wallWidthSweep = ws;
    values.energySweep = es;
    if (collapse !== undefined) values.collapseField = collapse;
    if (expansion !== undefined) values.expansionField = expansion;
    if (fs.length < n) {
      notes.push(
        `The sweep over B from ${(sweep.from * 1e3).toPrecision(4)} to ${(sweep.to * 1e3).toPrecision(4)} mT has a metastable skyrmion at ${fs.length} of ${n} fields; the sweep arrays hold those fields only.`,
      );
    }
    if (collapse !== undefined) notes.push(`Collapse: above B = ${(collapse * 1e3).toPrecision(4)} mT the ansatz minimum shrinks below R = 0.3 w (the skyrmion collapses).`);
    if (expansion !== undefined) notes.push(`Run-away expansion below B = ${(expansion * 1e3).toPrecision(4)} mT (the minimum runs to R > 100 w: stripe or reversed domain).`);
  }
  return { values, status: r.status === "ok" && notes.length === 0 ? "ok" : "warning", notes };
}

const skyrmionSpec: CalculatorSpec = {
  id: "skyrmion",
  title: "Isolated skyrmion: radius, wall width and energy (360-degree-wall ansatz)",
  summary:
    "Minimizes the energy of an isolated Neel skyrmion with the ansatz tan(theta/2) = sinh(R/w)/sinh(rho/w) over R, w and the helicity, with exchange, anisotropy, interfacial DMI, Zeeman and thin-film magnetostatics (surface and volume charges, beyond the local K_eff term). Gives R(B), w(B) and the energy over a field sweep with warm starts, and the field range of metastability (collapse, run-away expansion). For |D| >= D_c no isolated skyrmion exists: the spin spiral period is reported.",
  inputs: filmInputs(),
  outputs: [
    { name: "radius", symbol: "R", unit: "m", meaning: "Radius where m_z = 0" },
    { name: "wallWidth", symbol: "w", unit: "m", meaning: "Wall width parameter of the ansatz" },
    { name: "energy", symbol: "E", unit: "J", meaning: "Energy relative to the uniform film" },
    { name: "helicity", symbol: "\\psi", unit: "", meaning: "Helicity in rad (0: outward Neel; pi: inward; intermediate when volume charges compete)" },
    { name: "magnetostaticEnergy", symbol: "E_{nl}", unit: "J", meaning: "Non-local magnetostatic part of the energy (surface + volume charges)" },
    { name: "deltaParameter", symbol: "\\Delta", unit: "m", meaning: "Wall width parameter sqrt(A / K_eff) of the film" },
    { name: "spiralPeriod", symbol: "\\lambda", unit: "m", meaning: "Spin spiral period (only when |D| >= D_c)" },
    { name: "collapseField", symbol: "B_c", unit: "T", meaning: "Field above which the skyrmion collapses (within the sweep range)" },
    { name: "expansionField", symbol: "B_e", unit: "T", meaning: "Field below which the skyrmion runs away in size (within the sweep range)" },
    { name: "regime", symbol: "", unit: "", meaning: "What the film does at this field", kind: "text" },
    { name: "fieldSweep", symbol: "\\mu_0 H", unit: "T", meaning: "Fields of the sweep with a metastable skyrmion", kind: "array" },
    { name: "radiusSweep", symbol: "R", unit: "m", meaning: "Radius over the sweep", kind: "array" },
    { name: "wallWidthSweep", symbol: "w", unit: "m", meaning: "Wall width over the sweep", kind: "array" },
    { name: "energySweep", symbol: "E", unit: "J", meaning: "Energy over the sweep", kind: "array" },
  ],
  plots: [
    { id: "radius-vs-field", title: "Radius and wall width against field", x: "fieldSweep", y: ["radiusSweep", "wallWidthSweep"] },
    { id: "energy-vs-field", title: "Skyrmion energy against field", x: "fieldSweep", y: ["energySweep"] },
  ],
  sweep: { over: ["B"], points: 200 },
  assumptions: [
    ...commonAssumptions,
    "Profile restricted to the 360-degree-wall ansatz (an upper bound on the energy; compare skyrmion-profile).",
    "Metastability is judged within the axisymmetric ansatz: collapse when the minimum shrinks below R = 0.3 w, run-away expansion beyond R = 100 w; elliptic (strip-out) deformations are not evaluated.",
    "Non-local magnetostatics from thin-film Hankel transforms, verified against an FFT grid computation.",
  ],
  sources: [
    "H.-B. Braun, PRB 50, 16501 (1994) (360-degree-wall ansatz)",
    "F. Buettner, I. Lemesh, G. Beach, Sci. Rep. 8, 4464 (2018) (skyrmion ansatz and thin-film magnetostatics)",
    "S. Rohart, A. Thiaville, PRB 88, 184422 (2013) (energy functional, D_c)",
  ],
  method: "Ansatz energy minimized over ln R and w (Brent, nested), helicity in closed form; magnetostatics from Hankel transforms by the lattice (2D trapezoid) rule, tabulated where the solves go and interpolated (6-point Lagrange, about 1e-6 relative).",
  limits: {
    Ms: { above: 0, why: "a saturation magnetization" },
    A: { above: 0, why: "an exchange stiffness" },
    t: { above: 0, why: "a film thickness" },
  },
  compute: computeSkyrmion,
};

function computeProfile(v: InputValues): ComputeOutput {
  const film = filmOf(v);
  const B = v.B!;
  const notes: string[] = [];
  const values: ComputeOutput["values"] = {};
  const an = solveSkyrmionAnsatz(film, B, { nonlocal: false });
  if (an.status !== "ok") {
    values.regime = describe(an);
    if (an.status === "spiral") values.spiralPeriod = an.spiralPeriod!;
    return { values, status: "warning", notes: an.notes };
  }
  const ex = solveSkyrmionExact(film, B);
  const full = solveSkyrmionAnsatz(film, B, { startRadius: an.radius });
  const Delta = wallWidthParameter(film);
  const rhoMax = Math.max(ex.radius, an.radius) + 8 * Delta;
  const n = 200;
  const rho: number[] = [];
  const ta: number[] = [];
  const te: number[] = [];
  const ma: number[] = [];
  const me: number[] = [];
  const a = an.radius / an.wallWidth;
  const sa = Math.sinh(a);
  for (let i = 0; i < n; i++) {
    const r = (rhoMax * i) / (n - 1);
    const thA = 2 * Math.atan2(sa, Math.sinh(r / an.wallWidth));
    const thE = ex.profile.theta(r);
    rho.push(r);
    ta.push(thA);
    te.push(thE);
    ma.push(Math.cos(thA));
    me.push(Math.cos(thE));
  }
  Object.assign(values, {
    rho,
    thetaAnsatz: ta,
    thetaExact: te,
    mzAnsatz: ma,
    mzExact: me,
    radiusAnsatz: an.radius,
    radiusExact: ex.radius,
    wallWidthAnsatz: an.wallWidth,
    energyAnsatz: an.energy.total,
    energyExact: ex.energy,
    regime: "Metastable isolated skyrmion (local model).",
  });
  if (full.status === "ok") values.radiusAnsatzNonlocal = full.radius;
  else notes.push(`With non-local magnetostatics the ansatz reports '${full.status}'.`);
  return { values, status: notes.length ? "warning" : "ok", notes };
}

const profileSpec: CalculatorSpec = {
  id: "skyrmion-profile",
  title: "Skyrmion profile: 360-degree-wall ansatz against the exact radial solution",
  summary:
    "Solves the radial Euler-Lagrange equation of an isolated skyrmion (local magnetostatics through K_eff) by Newton relaxation with Richardson extrapolation, and compares it with the minimized 360-degree-wall ansatz of the same energy functional: profiles theta(rho) and m_z(rho), radii (m_z = 0) and energies. The exact energy lies below the ansatz energy (variational bound).",
  inputs: filmInputs(),
  outputs: [
    { name: "rho", symbol: "\\rho", unit: "m", meaning: "Radial positions", kind: "array" },
    { name: "thetaAnsatz", symbol: "\\theta_a", unit: "rad", meaning: "Polar angle (rad) of the ansatz", kind: "array" },
    { name: "thetaExact", symbol: "\\theta_e", unit: "rad", meaning: "Polar angle (rad) of the exact profile", kind: "array" },
    { name: "mzAnsatz", symbol: "m_z", unit: "", meaning: "m_z of the ansatz", kind: "array" },
    { name: "mzExact", symbol: "m_z", unit: "", meaning: "m_z of the exact profile", kind: "array" },
    { name: "radiusAnsatz", symbol: "R_a", unit: "m", meaning: "Radius (m_z = 0) of the ansatz, local model" },
    { name: "radiusExact", symbol: "R_e", unit: "m", meaning: "Radius (m_z = 0) of the exact profile, local model" },
    { name: "radiusAnsatzNonlocal", symbol: "R", unit: "m", meaning: "Radius of the ansatz with non-local magnetostatics" },
    { name: "wallWidthAnsatz", symbol: "w", unit: "m", meaning: "Wall width of the ansatz, local model" },
    { name: "energyAnsatz", symbol: "E_a", unit: "J", meaning: "Ansatz energy, local model" },
    { name: "energyExact", symbol: "E_e", unit: "J", meaning: "Exact energy, local model (below E_a)" },
    { name: "spiralPeriod", symbol: "\\lambda", unit: "m", meaning: "Spin spiral period (only when |D| >= D_c)" },
    { name: "regime", symbol: "", unit: "", meaning: "What the film does at this field", kind: "text" },
  ],
  plots: [
    { id: "theta-profiles", title: "theta(rho): ansatz and exact", x: "rho", y: ["thetaAnsatz", "thetaExact"] },
    { id: "mz-profiles", title: "m_z(rho): ansatz and exact", x: "rho", y: ["mzAnsatz", "mzExact"] },
  ],
  assumptions: [
    ...commonAssumptions,
    "Exact profile and its comparison use local magnetostatics (K_eff only); radiusAnsatzNonlocal adds the thin-film non-local terms.",
    "The exact solution is a stationary point of the radial functional; its stability against non-axisymmetric modes is not checked.",
  ],
  sources: [
    "S. Rohart, A. Thiaville, PRB 88, 184422 (2013) (radial Euler-Lagrange equation)",
    "H.-B. Braun, PRB 50, 16501 (1994); F. Buettner, I. Lemesh, G. Beach, Sci. Rep. 8, 4464 (2018) (ansatz)",
  ],
  method: "Finite differences (grids h, h/2, Richardson), Newton with tridiagonal Jacobian; ansatz by nested Brent minimization.",
  limits: {
    Ms: { above: 0, why: "a saturation magnetization" },
    A: { above: 0, why: "an exchange stiffness" },
    t: { above: 0, why: "a film thickness" },
  },
  compute: computeProfile,
};

/** Calculator specs of isolated skyrmions. */
export const skyrmionCalculators: CalculatorSpec[] = [skyrmionSpec, profileSpec];
