/**
 * Calculator specs of isolated skyrmions: `skyrmion` (360-degree-wall ansatz with non-local
 * thin-film magnetostatics, R(B) and w(B) sweeps) and `skyrmion-profile` (ansatz against the exact
 * radial profile of the local model). Defaults: the invented demo film HX-1 (lib/src/material/demo.ts).
 */
import type { ComputeOptions, ComputeOutput, InputSpec, InputValues } from "./spec.js";
import { defineCalculator, inputList, outputList, choiceInput } from "./spec.js";
import { filmLimits, sweepValues } from "./spec.js";
import { ConvergenceError, InputError } from "../errors.js";
import { criticalDmi, makeFilm, requirePerpendicular, spiralState, wallWidthParameter, type Film } from "../material/film.js";
import { demoFilmHX1 } from "../material/demo.js";
import { findAnsatzMinima, skyrmionBranches, solveSkyrmionAnsatz, type AnsatzSkyrmion, type BranchEnd } from "../walls/skyrmionAnsatz.js";
import { solveSkyrmionExact } from "../walls/skyrmionExact.js";
import { skyrmionStability, stripOutField, type SkyrmionStability } from "../walls/skyrmionStability.js";
import { saturationField } from "../walls/wall360.js";

const demo = demoFilmHX1.film;

function filmInputs() {
  return inputList([
    { name: "Ms", symbol: "M_s", unit: "A/m", default: demo.Ms, min: 0.5e6, max: 1.3e6, scale: "linear", meaning: "Saturation magnetization" },
    { name: "A", symbol: "A", unit: "J/m", default: demo.A, min: 5e-12, max: 30e-12, scale: "linear", meaning: "Exchange stiffness" },
    {
      name: "Ku",
      symbol: "K_u",
      unit: "J/m^3",
      default: demo.Ku,
      min: 0.9e6,
      max: 3e6,
      scale: "linear",
      meaning: "Uniaxial perpendicular anisotropy (K_eff = Ku - mu0 Ms^2 / 2 must be > 0)",
    },
    { name: "D", symbol: "D", unit: "J/m^2", default: demo.D, min: 0, max: 4e-3, scale: "linear", meaning: "Interfacial DMI constant (sign selects the Neel helicity)" },
    { name: "t", symbol: "t", unit: "m", default: demo.t, min: 0.4e-9, max: 4e-9, scale: "linear", meaning: "Film thickness" },
    {
      name: "B",
      symbol: "\\mu_0 H",
      unit: "T",
      default: 0.05,
      min: -0.05,
      max: 0.3,
      scale: "linear",
      meaning: "Applied field along +z (the background direction; the core points along -z)",
    },
  ]);
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
  if (r.status === "ok") {
    const g = r.phase.groundState;
    return g === "uniform"
      ? "Metastable isolated skyrmion (verified local minimum of the ansatz energy) in a uniform ground state."
      : `Verified local minimum of the ansatz energy; ${r.phase.text}`;
  }
  return r.notes.join(" ");
}

/** Default lattice constant (m) and the validity radius in lattice constants (common practice, no source). */
const DEFAULT_LATTICE = 0.3e-9;
const VALIDITY_SPACINGS = 5;

const latticeInput: InputSpec<"a"> = {
  name: "a",
  symbol: "a",
  unit: "m",
  default: DEFAULT_LATTICE,
  min: 0.2e-9,
  max: 0.5e-9,
  scale: "linear",
  meaning: `Lattice constant of the film: a radius below ${VALIDITY_SPACINGS} a is outside what the continuum model describes`,
};

function fmtT(B: number): string {
  return `${(B * 1e3).toPrecision(5)} mT`;
}

function fmtM(x: number): string {
  return x >= 1e-6 ? `${(x * 1e6).toPrecision(4)} um` : `${(x * 1e9).toPrecision(4)} nm`;
}

function endText(e: BranchEnd, side: "lower" | "upper"): string {
  const where = `${fmtT(e.field)} (+- ${(e.resolution * 1e6).toPrecision(2)} uT)`;
  const beyond = side === "lower" ? "below" : "above";
  if (e.kind === "expansion") return `${beyond} ${where} the energy falls towards R = 100 w (run-away expansion, strip-out side; or a bubble larger than the ansatz window)`;
  if (e.kind === "below-window")
    return `${beyond} ${where} the minimum shrinks below R = 0.3 w, the ansatz window (not a continuum collapse: the continuum energy approaches 8 pi A t as R -> 0)`;
  return `${beyond} ${where} the minimum merges with a saddle and disappears`;
}

function computeSkyrmion(v: InputValues, options: ComputeOptions = {}): ComputeOutput {
  const film = filmOf(v);
  const lattice = v.a ?? DEFAULT_LATTICE;
  if (!(lattice > 0)) throw new InputError("a", lattice, "a positive lattice constant in m");
  const Rvalid = VALIDITY_SPACINGS * lattice;
  const notes: string[] = [];
  const values: ComputeOutput["values"] = {};
  const r = solveSkyrmionAnsatz(film, v.B!);
  values.regime = describe(r);
  values.deltaParameter = wallWidthParameter(film);
  values.validityRadius = Rvalid;
  values.groundState = r.phase.text;
  values.belavinPolyakovEnergy = 8 * Math.PI * film.A * film.t;
  if (Math.abs(film.D) > criticalDmi(film)) {
    values.saturationField = r.phase.saturationField;
    values.spiralPeriod = r.spiralPeriod ?? spiralState(film).period;
  }
  if (r.status === "ok") {
    values.radius = r.radius;
    values.wallWidth = r.wallWidth;
    values.energy = r.energy.total;
    values.helicity = r.helicity;
    values.magnetostaticEnergy = r.energy.magnetostaticSurface + r.energy.magnetostaticVolume;
    values.energyOverBelavinPolyakov = r.energyOverBelavinPolyakov!;
    values.minimaCount = r.minima.length;
    values.states = r.minima
      .map(
        (m, k) =>
          `${k + 1} (${m.radius / m.wallWidth < 4 ? "compact skyrmion" : "bubble"}): R = ${fmtM(m.radius)}, w = ${fmtM(m.wallWidth)}, E = ${(m.energy.total / (8 * Math.PI * film.A * film.t)).toPrecision(4)} x 8 pi A t; ` +
          `verified minimum (relative gradient ${m.verification.relativeGradient.toExponential(1)}, Hessian eigenvalues ${m.verification.hessianEigenvalues.map((x) => x.toPrecision(3)).join(", ")} of the energy scale); ` +
          (m.radius >= Rvalid ? `valid (R >= ${VALIDITY_SPACINGS} a)` : `outside the continuum model's validity (R < ${VALIDITY_SPACINGS} a = ${fmtM(Rvalid)})`),
      )
      .join("\n");
    if (r.radius < Rvalid)
      notes.push(
        `R = ${fmtM(r.radius)} is below ${VALIDITY_SPACINGS} a = ${fmtM(Rvalid)} (a = ${fmtM(lattice)}): the continuum model is not trustworthy there; the energy is ${r.energyOverBelavinPolyakov!.toPrecision(4)} x 8 pi A t (Belavin-Polyakov limit 1 as R -> 0).`,
      );
    if (r.phase.groundState !== "uniform") notes.push(r.phase.text);
    // angular stability: the exact profile of the local model at this field (the ansatz Hessian above
    // covers only R and w)
    try {
      const st = skyrmionStability(film, v.B!);
      values.stability = `${stabilityValues(st).stability as string} (exact profile of the local model, R = ${fmtM(st.skyrmion.radius)}; non-local magnetostatics not in this analysis)`;
      if (!st.stable) notes.push(values.stability as string);
    } catch (e) {
      if (!(e instanceof ConvergenceError)) throw e;
      values.stability = `Not analysed: the local model (K_eff only) has no exact skyrmion at this field (${e.message}); within the ansatz the state is a verified minimum in R and w.`;
    }
    if (r.minima.length > 1) notes.push(`${r.minima.length} local minima at this field: see 'states'; the one reported is the lowest in energy.`);
  } else {
    notes.push(...r.notes);
  }
  const sweep = options.sweep;
  if (sweep) {
    // over, points (at most sweep.maxPoints: each field gets a global search) and ends checked there
    const grid = sweepValues(skyrmionSpec, sweep);
    const n = grid.length;
    const br = skyrmionBranches(film, grid);
    // principal branch: the one holding the reported state, else the one with the most fields
    let principal = br.branches.find((b) => r.status === "ok" && b.states.some((s) => Math.abs(Math.log(s.radius / r.radius)) < 1e-6));
    if (!principal && br.branches.length) principal = br.branches.reduce((p, q) => (q.fields.length > p.fields.length ? q : p));
    values.fieldSweep = principal ? principal.fields : [];
    values.radiusSweep = principal ? principal.states.map((s) => s.radius) : [];
    values.wallWidthSweep = principal ? principal.states.map((s) => s.wallWidth) : [];
    values.energySweep = principal ? principal.states.map((s) => s.energy.total) : [];
    values.branchCount = br.branches.length;
    if (principal) values.principalBranch = principal.id;
    values.allFieldSweep = br.perField.flatMap((list, i) => list.map(() => br.fields[i]!));
    values.allRadiusSweep = br.perField.flatMap((list) => list.map((x) => x.state.radius));
    values.allBranchSweep = br.perField.flatMap((list) => list.map((x) => x.branch));
    const lines: string[] = [];
    let expansion: number | undefined;
    let windowEnd: number | undefined;
    let res = 0;
    for (const b of br.branches) {
      const parts = [
        `branch ${b.id} (${b.label}): ${b.fields.length} fields from ${fmtT(b.fields[0]!)} to ${fmtT(b.fields[b.fields.length - 1]!)}, R ${fmtM(b.states[0]!.radius)} .. ${fmtM(b.states[b.states.length - 1]!.radius)}`,
      ];
      if (b.lowerEnd) {
        parts.push(endText(b.lowerEnd, "lower"));
        if (b.lowerEnd.kind === "expansion" && (expansion === undefined || b.lowerEnd.field < expansion)) {
          expansion = b.lowerEnd.field;
          res = Math.max(res, b.lowerEnd.resolution);
        }
      }
      if (b.upperEnd) {
        parts.push(endText(b.upperEnd, "upper"));
        if (b.upperEnd.kind === "below-window" && (windowEnd === undefined || b.upperEnd.field > windowEnd)) {
          windowEnd = b.upperEnd.field;
          res = Math.max(res, b.upperEnd.resolution);
        }
      }
      lines.push(parts.join("; "));
    }
    values.branches = lines.length ? lines.join("\n") : "No verified minimum anywhere in the sweep.";
    if (expansion !== undefined) values.expansionField = expansion;
    if (windowEnd !== undefined) values.windowEndField = windowEnd;
    values.boundaryResolution = Math.max(res, br.boundaryTolerance);
    // continuum validity along the principal branch: bisection of R(B) = 5 a between sweep points
    if (principal) {
      const k = principal.states.findIndex((s) => s.radius < Rvalid);
      if (k > 0) {
        let lo = principal.fields[k - 1]!;
        let hi = principal.fields[k]!;
        let st = principal.states[k - 1]!;
        for (let it = 0; it < 60 && hi - lo > br.boundaryTolerance; it++) {
          const mid = 0.5 * (lo + hi);
          const sr = findAnsatzMinima(film, mid, { starts: [st], scan: false });
          const c = sr.minima.find((m) => Math.abs(Math.log(m.radius / st.radius)) < 0.25);
          if (!c) break;
          if (c.radius >= Rvalid) {
            lo = mid;
            st = c;
          } else hi = mid;
        }
        values.continuumLimitField = 0.5 * (lo + hi);
        notes.push(
          `Above B = ${fmtT(0.5 * (lo + hi))} the radius of branch ${principal.id} is below ${VALIDITY_SPACINGS} a = ${fmtM(Rvalid)}: the continuum model is not trustworthy there (a lattice model is needed).`,
        );
      }
    }
    const nFields = br.perField.filter((l) => l.length > 0).length;
    if (nFields < n)
      notes.push(
        `The sweep from ${fmtT(sweep.from)} to ${fmtT(sweep.to)} has a verified minimum at ${nFields} of ${n} fields; the sweep arrays hold the principal branch only (all states: allFieldSweep, allRadiusSweep, allBranchSweep).`,
      );
    if (br.branches.length > 1) notes.push(`${br.branches.length} branches of minima in the sweep (see 'branches').`);
  }
  return { values, status: r.status === "ok" && notes.length === 0 ? "ok" : "warning", notes };
}

const skyrmionSpec = defineCalculator({
  id: "skyrmion",
  title: "Isolated skyrmion: radius, wall width and energy (360-degree-wall ansatz)",
  summary:
    "Finds every local minimum of the energy of an isolated Neel skyrmion with the ansatz tan(theta/2) = sinh(R/w)/sinh(rho/w) (R, w and the helicity), with exchange, anisotropy, interfacial DMI, Zeeman and thin-film magnetostatics (surface and volume charges): a global scan over R/w with w minimized, local searches, and a finite-difference check that each reported state is a minimum inside the searched window. Over a field sweep the minima are followed in both directions as labelled branches, and each branch end (expansion, leaving the window, or a fold) is located by halving the continuation step. Says which state is the ground state (uniform film, spiral or strips below B_sat when |D| > D_c, or a dense skyrmion array when the skyrmion energy is negative) and where the radius falls below what a continuum model describes for the lattice constant a.",
  inputs: [...filmInputs(), latticeInput],
  outputs: [
    { name: "radius", symbol: "R", unit: "m", meaning: "Radius where m_z = 0 (the lowest-energy verified minimum at this field)" },
    { name: "wallWidth", symbol: "w", unit: "m", meaning: "Wall width parameter of the ansatz" },
    { name: "energy", symbol: "E", unit: "J", meaning: "Energy relative to the uniform film" },
    { name: "energyOverBelavinPolyakov", symbol: "E/8\\pi A t", unit: "", meaning: "Energy in units of the Belavin-Polyakov energy 8 pi A t, its limit as R -> 0" },
    { name: "helicity", symbol: "\\gamma", unit: "rad", meaning: "Helicity (0: outward Neel; pi: inward; intermediate when volume charges compete)" },
    { name: "magnetostaticEnergy", symbol: "E_{nl}", unit: "J", meaning: "Non-local magnetostatic part of the energy (surface + volume charges)" },
    { name: "minimaCount", symbol: "n", unit: "", meaning: "Number of verified local minima at this field" },
    { name: "stability", symbol: "", unit: "", kind: "text", meaning: "Stability against angular deformations m = 0..4 of the exact profile of the local model at this field" },
    { name: "states", symbol: "", unit: "", kind: "text", meaning: "Every verified minimum at this field: R, w, energy, verification, validity" },
    { name: "deltaParameter", symbol: "\\Delta", unit: "m", meaning: "Wall width parameter sqrt(A / K_eff) of the film" },
    { name: "validityRadius", symbol: "R_{min}", unit: "m", meaning: "5 a: below this radius the continuum model is not trustworthy" },
    { name: "belavinPolyakovEnergy", symbol: "8\\pi A t", unit: "J", meaning: "Belavin-Polyakov energy, the continuum limit of the skyrmion energy as R -> 0" },
    { name: "groundState", symbol: "", unit: "", kind: "text", meaning: "Ground state at this field and the place of the skyrmion" },
    {
      name: "saturationField",
      symbol: "B_{sat}",
      unit: "T",
      meaning: "For |D| > D_c: field above which the uniform film is lower than spiral or strips (360-degree wall energy zero)",
      optional: true,
    },
    { name: "spiralPeriod", symbol: "\\lambda", unit: "m", meaning: "Spin spiral period (only when |D| > D_c)", optional: true },
    {
      name: "expansionField",
      symbol: "B_e",
      unit: "T",
      meaning: "Lowest field of the sweep range down to which a branch exists before it expands beyond R = 100 w",
      optional: true,
    },
    {
      name: "windowEndField",
      symbol: "B_w",
      unit: "T",
      meaning: "Field above which the smallest branch shrinks below R = 0.3 w (the ansatz window; not a collapse)",
      optional: true,
    },
    { name: "continuumLimitField", symbol: "B_a", unit: "T", meaning: "Field above which the principal branch's radius is below 5 a", optional: true },
    { name: "boundaryResolution", symbol: "\\delta B", unit: "T", meaning: "Half-width of the brackets of the branch ends" },
    { name: "branchCount", symbol: "", unit: "", meaning: "Number of branches of minima in the sweep" },
    { name: "principalBranch", symbol: "", unit: "", meaning: "Branch shown in the sweep arrays", optional: true },
    { name: "branches", symbol: "", unit: "", kind: "text", meaning: "Every branch: label, field range, radii, ends" },
    { name: "regime", symbol: "", unit: "", meaning: "What the film does at this field", kind: "text" },
    { name: "fieldSweep", symbol: "\\mu_0 H", unit: "T", meaning: "Fields of the principal branch", kind: "array" },
    { name: "radiusSweep", symbol: "R", unit: "m", meaning: "Radius along the principal branch", kind: "array" },
    { name: "wallWidthSweep", symbol: "w", unit: "m", meaning: "Wall width along the principal branch", kind: "array" },
    { name: "energySweep", symbol: "E", unit: "J", meaning: "Energy along the principal branch", kind: "array" },
    { name: "allFieldSweep", symbol: "\\mu_0 H", unit: "T", meaning: "Field of every verified minimum of the sweep", kind: "array" },
    { name: "allRadiusSweep", symbol: "R", unit: "m", meaning: "Radius of every verified minimum of the sweep", kind: "array" },
    { name: "allBranchSweep", symbol: "", unit: "", meaning: "Branch of every verified minimum of the sweep", kind: "array" },
  ],
  plots: [
    { id: "radius-vs-field", title: "Radius and wall width against field", x: "fieldSweep", y: ["radiusSweep", "wallWidthSweep"] },
    { id: "energy-vs-field", title: "Skyrmion energy against field", x: "fieldSweep", y: ["energySweep"] },
  ],
  sweep: { over: ["B"], points: 200, maxPoints: 2000, maxPointsWhy: "every field gets a global search of the minima" },
  assumptions: [
    ...commonAssumptions,
    "Profile restricted to the 360-degree-wall ansatz (an upper bound on the energy; compare skyrmion-profile).",
    "A reported state is a verified local minimum of the ansatz energy inside the window 0.3 <= R/w <= 100, Delta/40 <= w <= 40 Delta (relative gradient below 1e-6, Hessian in ln R/w, ln w positive definite at stencils 1e-3 and 1e-2); a point on a window edge is never reported. Non-axisymmetric (elliptic, strip-out) stability is evaluated for the exact profile of the local model in skyrmion-profile.",
    "Continuum validity: a radius below 5 lattice constants (input a, default 0.3 nm) is flagged. Common practice, no source.",
    "Ground state for |D| > D_c from the 360-degree wall energy of the local model (B_sat); a negative isolated-skyrmion energy means a dense skyrmion array (not computed) is lower than the uniform film.",
    "Non-local magnetostatics from thin-film Hankel transforms, verified against an FFT grid computation.",
  ],
  sources: [
    "H.-B. Braun, PRB 50, 16501 (1994) (360-degree-wall ansatz)",
    "F. Buettner, I. Lemesh, G. Beach, Sci. Rep. 8, 4464 (2018) (skyrmion ansatz and thin-film magnetostatics)",
    "S. Rohart, A. Thiaville, PRB 88, 184422 (2013) (energy functional, D_c)",
    "A. Bogdanov, A. Hubert, JMMM 138, 255 (1994) (saturation field above D_c; isolated skyrmions above it)",
    "A. Belavin, A. Polyakov, JETP Lett. 22, 245 (1975) (8 pi A t limit)",
  ],
  method:
    "Global scan of the w-minimized ansatz energy over ln(R/w) (step 0.08), local searches and Newton polish, finite-difference verification; branches by continuation with step control up and down in field, ends by step halving. Ansatz energy minimized over ln R and w (Brent, nested), helicity in closed form; magnetostatics from Hankel transforms by the lattice (2D trapezoid) rule, tabulated where the solves go and interpolated (6-point Lagrange, about 1e-6 relative).",
  limits: filmLimits,
  compute: computeSkyrmion,
});

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
  if (ex.status !== "ok") {
    values.regime = ex.notes.join(" ");
    if (ex.spiralPeriod !== undefined) values.spiralPeriod = ex.spiralPeriod;
    return { values, status: "warning", notes: ex.notes };
  }
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
  // stability of the exact profile against angular modes, and continuum validity
  const st = skyrmionStability(film, B, { skyrmion: ex });
  Object.assign(values, stabilityValues(st));
  if (!st.stable) notes.push(values.stability as string);
  notes.push(...st.notes);
  const lattice = v.a ?? DEFAULT_LATTICE;
  values.validity = validityText(ex.radius, lattice, ex.energy / (8 * Math.PI * film.A * film.t));
  if (ex.radius < VALIDITY_SPACINGS * lattice) notes.push(values.validity as string);
  values.branch = `${ex.radius / Delta < 4 ? "compact skyrmion" : "bubble"}, continued from the minimum of the local ansatz (R = ${fmtM(an.radius)})`;
  return { values, status: notes.length ? "warning" : "ok", notes };
}

function validityText(R: number, lattice: number, eBP: number): string {
  const Rv = VALIDITY_SPACINGS * lattice;
  return R >= Rv
    ? `R = ${fmtM(R)} >= ${VALIDITY_SPACINGS} a = ${fmtM(Rv)}: inside the continuum model's validity (energy ${eBP.toPrecision(4)} x 8 pi A t).`
    : `R = ${fmtM(R)} < ${VALIDITY_SPACINGS} a = ${fmtM(Rv)} (a = ${fmtM(lattice)}): the continuum model is not trustworthy at this size; its energy ${eBP.toPrecision(4)} x 8 pi A t approaches the Belavin-Polyakov value 1 as R -> 0.`;
}

/** Outputs of a stability analysis: lowest eigenvalue per mode and the verdict. */
function stabilityValues(st: SkyrmionStability): ComputeOutput["values"] {
  const lowest = st.modes.map((m) => (m.m === 1 ? m.eigenvalues[1] : m.eigenvalues[0]));
  const parts = st.modes.map((m) =>
    m.m === 1 ? `m = 1: ${m.eigenvalues[0].toExponential(1)} (translation zero mode), next ${m.eigenvalues[1].toPrecision(4)}` : `m = ${m.m}: ${m.eigenvalues[0].toPrecision(4)}`,
  );
  return {
    modeNumber: st.modes.map((m) => m.m),
    modeEigenvalue: lowest,
    translationEigenvalue: st.modes[1]!.eigenvalues[0],
    continuumEdge: st.continuumEdge,
    stability: st.stable
      ? `Stable against small deformations with m = 0..4 (lowest eigenvalues in units of K_eff: ${parts.join("; ")}; continuum from ${st.continuumEdge.toPrecision(4)}).`
      : `Unstable: mode m = ${st.unstableMode} has a negative eigenvalue (${parts.join("; ")}); ${st.unstableMode === 2 ? "elliptic (strip-out) deformation" : "the state deforms"}.`,
  };
}

const stabilityOutputs = outputList([
  { name: "stability", symbol: "", unit: "", kind: "text", meaning: "Stable or unstable against angular deformations m = 0..4 of the exact profile, with the eigenvalues" },
  { name: "modeNumber", symbol: "m", unit: "", kind: "array", meaning: "Angular mode numbers 0..4" },
  {
    name: "modeEigenvalue",
    symbol: "\\lambda_m",
    unit: "",
    kind: "array",
    meaning: "Lowest eigenvalue of each mode in units of K_eff (m = 1: the one above the translation zero mode)",
  },
  { name: "translationEigenvalue", symbol: "\\lambda_T", unit: "", meaning: "m = 1 translation mode (zero up to discretization: a check)" },
  { name: "continuumEdge", symbol: "\\lambda_c", unit: "", meaning: "Edge of the spin-wave continuum 1 + Ms B / (2 K_eff), units of K_eff" },
  { name: "validity", symbol: "", unit: "", kind: "text", meaning: "Radius against 5 lattice constants; energy in units of 8 pi A t" },
  { name: "branch", symbol: "", unit: "", kind: "text", meaning: "Which state was analysed" },
]);

function computeStability(v: InputValues): ComputeOutput {
  const film = filmOf(v);
  const B = v.B!;
  const notes: string[] = [];
  const values: ComputeOutput["values"] = {};
  let ex: ReturnType<typeof solveSkyrmionExact>;
  try {
    ex = solveSkyrmionExact(film, B);
  } catch (e) {
    if (!(e instanceof ConvergenceError)) throw e;
    values.regime = `No exact skyrmion of the local model at this field: ${e.message}`;
    return { values, status: "warning", notes: [values.regime as string] };
  }
  if (ex.status !== "ok") {
    values.regime = ex.notes.join(" ");
    return { values, status: "warning", notes: ex.notes };
  }
  const st = skyrmionStability(film, B, { skyrmion: ex });
  Object.assign(values, stabilityValues(st));
  notes.push(...st.notes);
  if (!st.stable) notes.push(values.stability as string);
  values.radiusExact = ex.radius;
  values.energyExact = ex.energy;
  const Delta = wallWidthParameter(film);
  values.branch = `${ex.radius / Delta < 4 ? "compact skyrmion" : "bubble"} (exact profile of the local model, started from the local ansatz minimum)`;
  const lattice = v.a ?? DEFAULT_LATTICE;
  values.validity = validityText(ex.radius, lattice, ex.energy / (8 * Math.PI * film.A * film.t));
  if (ex.radius < VALIDITY_SPACINGS * lattice) notes.push(values.validity as string);
  if (Math.abs(film.D) > criticalDmi(film)) values.saturationField = saturationField(film);
  if ((v.search ?? 0) >= 0.5) {
    const Bmin = v.Bmin ?? -0.05;
    if (!(Bmin < B)) throw new InputError("Bmin", Bmin, `a field below B = ${B} T (the strip-out search goes down in field)`);
    const so = stripOutField(film, B, Bmin, 1e-5);
    values.stripOutKind =
      so.kind === "softens"
        ? `The m = 2 (elliptic) eigenvalue crosses zero at ${fmtT(so.field)} (+- ${(so.resolution * 1e6).toPrecision(2)} uT): below it the skyrmion strips out.`
        : so.kind === "ends"
          ? `The exact skyrmion stops existing at ${fmtT(so.field)} (+- ${(so.resolution * 1e6).toPrecision(2)} uT) before the m = 2 mode crosses zero; its eigenvalue there is ${so.lastEigenvalue.toPrecision(3)} K_eff${Math.abs(film.D) > criticalDmi(film) ? ` (|D| > D_c: this is B_sat = ${fmtT(saturationField(film))}, where the radius diverges and the elliptic mode softens towards zero)` : ""}.`
          : `Neither softening nor the end of existence down to ${fmtT(so.field)}.`;
    if (so.kind !== "none") {
      values.stripOutField = so.field;
      values.stripOutResolution = so.resolution;
    }
  }
  return { values, status: notes.length ? "warning" : "ok", notes };
}

const stabilitySpec = defineCalculator({
  id: "skyrmion-stability",
  title: "Skyrmion stability against elliptic and other angular deformations",
  summary:
    "Lowest eigenvalues of the linearized energy (radial fluctuation operator, derived in lib/src/walls/skyrmionStability.ts) of the exact skyrmion profile of the local model for angular modes m = 0..4: stable when all are positive (besides the m = 1 translation zero mode, reported as a check). Optionally searches down in field for the strip-out field where the m = 2 (elliptic) mode softens, or where the skyrmion stops existing first.",
  inputs: [
    // defaults: the demo film with a stronger DMI, where the skyrmion is several nm across
    ...filmInputs().map((i) => (i.name === "D" ? { ...i, default: 2.9e-3 } : i.name === "B" ? { ...i, default: 0.02 } : i)),
    latticeInput,
    choiceInput("search", "", ["skip", "strip-out search"], "Search down in field for the strip-out field (a few seconds)"),
    { name: "Bmin", symbol: "B_{min}", unit: "T", default: -0.05, min: -0.3, max: 0.3, scale: "linear", meaning: "Lowest field of the strip-out search" },
  ],
  outputs: [
    ...stabilityOutputs,
    { name: "radiusExact", symbol: "R_e", unit: "m", meaning: "Radius of the exact profile (m_z = 0)" },
    { name: "energyExact", symbol: "E_e", unit: "J", meaning: "Energy of the exact profile relative to the uniform film" },
    { name: "saturationField", symbol: "B_{sat}", unit: "T", meaning: "For |D| > D_c: field above which the uniform film is lower than spiral or strips", optional: true },
    { name: "stripOutField", symbol: "B_{so}", unit: "T", meaning: "Field where m = 2 softens (or where the skyrmion stops existing first)", optional: true },
    { name: "stripOutResolution", symbol: "\\delta B", unit: "T", meaning: "Half-width of the strip-out bracket", optional: true },
    { name: "stripOutKind", symbol: "", unit: "", kind: "text", meaning: "What ends the skyrmion going down in field", optional: true },
    { name: "regime", symbol: "", unit: "", kind: "text", meaning: "Why there is no skyrmion, when there is none", optional: true },
  ],
  plots: [{ id: "mode-eigenvalues", title: "Lowest eigenvalue per angular mode", x: "modeNumber", y: ["modeEigenvalue"], mode: "markers" }],
  assumptions: [
    ...commonAssumptions,
    "Local magnetostatics (K_eff only): the non-local dipolar terms, which drive the strip-out of large bubbles in thicker films, are not in this operator.",
    "Small deformations of the exact axisymmetric profile; eigenvalues in units of K_eff, per unit norm Int |delta m|^2 dA.",
    "Continuum validity: a radius below 5 lattice constants (input a) is flagged. Common practice, no source.",
  ],
  sources: [
    "A. Bogdanov, A. Hubert, JMMM 138, 255 (1994) (stability of isolated skyrmions, strip-out; saturation field above D_c)",
    "S. Rohart, A. Thiaville, PRB 88, 184422 (2013) (radial Euler-Lagrange equation)",
  ],
  method:
    "Finite volumes on cells (j - 1/2) h, grids h and h/2 with Richardson extrapolation; eigenvalues by bisection on the inertia of the block LDL^T factorization; strip-out by growing steps down in field, then Brent's root method (or bisection on existence).",
  limits: filmLimits,
  compute: computeStability,
});

const profileSpec = defineCalculator({
  id: "skyrmion-profile",
  title: "Skyrmion profile: 360-degree-wall ansatz against the exact radial solution",
  summary:
    "Solves the radial Euler-Lagrange equation of an isolated skyrmion (local magnetostatics through K_eff) by Newton relaxation with Richardson extrapolation, and compares it with the minimized 360-degree-wall ansatz of the same energy functional: profiles theta(rho) and m_z(rho), radii (m_z = 0) and energies. The exact energy lies below the ansatz energy (variational bound). Reports the stability of the exact profile against angular deformations m = 0..4 and whether its radius is inside the continuum model's validity for the lattice constant a.",
  inputs: [...filmInputs(), latticeInput],
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
    { name: "spiralPeriod", symbol: "\\lambda", unit: "m", meaning: "Spin spiral period (only when |D| >= D_c)", optional: true },
    { name: "regime", symbol: "", unit: "", meaning: "What the film does at this field", kind: "text" },
    ...stabilityOutputs,
  ],
  plots: [
    { id: "theta-profiles", title: "theta(rho): ansatz and exact", x: "rho", y: ["thetaAnsatz", "thetaExact"] },
    { id: "mz-profiles", title: "m_z(rho): ansatz and exact", x: "rho", y: ["mzAnsatz", "mzExact"] },
  ],
  assumptions: [
    ...commonAssumptions,
    "Exact profile and its comparison use local magnetostatics (K_eff only); radiusAnsatzNonlocal adds the thin-film non-local terms.",
    "Stability of the exact solution: lowest eigenvalues of the linearized energy for angular modes m = 0..4 (local magnetostatics); see skyrmion-stability for the strip-out search.",
    "Continuum validity: a radius below 5 lattice constants (input a) is flagged. Common practice, no source.",
  ],
  sources: [
    "S. Rohart, A. Thiaville, PRB 88, 184422 (2013) (radial Euler-Lagrange equation)",
    "H.-B. Braun, PRB 50, 16501 (1994); F. Buettner, I. Lemesh, G. Beach, Sci. Rep. 8, 4464 (2018) (ansatz)",
    "A. Bogdanov, A. Hubert, JMMM 138, 255 (1994) (stability against angular modes)",
  ],
  method:
    "Finite differences (grids h, h/2, Richardson), Newton with tridiagonal Jacobian; ansatz by global scan and verified local minimization; stability by the radial fluctuation operator (finite volumes, inertia bisection, Richardson).",
  limits: filmLimits,
  compute: computeProfile,
});

/** Calculator specs of isolated skyrmions. */
export const skyrmionCalculators = [skyrmionSpec, profileSpec, stabilitySpec];
