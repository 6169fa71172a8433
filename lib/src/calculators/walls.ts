/**
 * Calculators of the walls domain: `wall` (180-degree wall characteristics), `wall360` (the
 * 360-degree wall pair in a field) and `wall-type` (Bloch or Neel against D and t).
 * Defaults: the invented demo film "Film HX-1 (invented)" (lib/src/material/demo.ts).
 * Ranges keep K_eff = Ku - mu0 Ms^2 / 2 > 0 at every corner, so every corner computes.
 */
import type { ComputeOptions, ComputeOutput, InputValues } from "./spec.js";
import { defineCalculator, inputList } from "./spec.js";
import { filmLimits } from "./spec.js";
import { sweepValues } from "./spec.js";
import {
  type Film,
  makeFilm,
  effectiveAnisotropy,
  exchangeLength,
  qualityFactor,
  criticalDmi,
  neelThresholdDmi,
  spiralPeriod,
  spiralState,
  filmRegime,
  requirePerpendicular,
} from "../material/film.js";
import { demoFilmHX1 } from "../material/demo.js";
import { chiralWallEnergy, equilibriumWall, wallWidths, wallProfile } from "../walls/wall180.js";
import { saturationField, wall360Equilibrium, wall360MergeField, wall360Profile } from "../walls/wall360.js";
import { wallType, neelThresholdCurve } from "../walls/wallType.js";

const demo = demoFilmHX1.film;

const filmInputs = inputList([
  { name: "Ms", symbol: "M_s", unit: "A/m", default: demo.Ms, min: 0.4e6, max: 1.2e6, scale: "linear", meaning: "saturation magnetization" },
  { name: "A", symbol: "A", unit: "J/m", default: demo.A, min: 5e-12, max: 30e-12, scale: "linear", meaning: "exchange stiffness" },
  { name: "Ku", symbol: "K_u", unit: "J/m^3", default: demo.Ku, min: 1.0e6, max: 3.0e6, scale: "linear", meaning: "uniaxial perpendicular anisotropy (before shape anisotropy)" },
  { name: "D", symbol: "D", unit: "J/m^2", default: demo.D, min: 0, max: 3e-3, scale: "linear", meaning: "interfacial DMI constant (sign selects the chirality)" },
  { name: "t", symbol: "t", unit: "m", default: demo.t, min: 0.3e-9, max: 5e-9, scale: "linear", meaning: "film thickness" },
]);

const commonAssumptions = [
  "Continuum micromagnetics at T = 0; magnetization uniform through the thickness t.",
  "Interfacial DMI w = D [m_z div m - (m . grad) m_z]; D > 0 selects Neel walls whose central moment points toward the +z domain (helicity 0).",
  "Magnetostatics local through K_eff = Ku - mu0 Ms^2 / 2 unless stated (thin-film limit).",
];

const wallSources = [
  "L. Landau, E. Lifshitz, Phys. Z. Sowjetunion 8, 153 (1935)",
  "A. Hubert, R. Schaefer, Magnetic Domains (Springer 1998)",
  "A. Thiaville, S. Rohart, E. Jue, V. Cros, A. Fert, EPL 100, 57002 (2012)",
  "S. Rohart, A. Thiaville, PRB 88, 184422 (2013)",
  "M. Tarasenko et al., JMMM 189, 19 (1998) (Neel wall demagnetizing factor, from memory; re-derived)",
];

function filmOf(v: InputValues): Film {
  return makeFilm({ Ms: v.Ms, A: v.A, Ku: v.Ku, D: v.D, t: v.t, dmi: "interfacial" });
}

function computeWall(v: InputValues): ComputeOutput {
  const f = filmOf(v);
  requirePerpendicular(f, "the wall calculator");
  const widths = wallWidths(f);
  const eq = equilibriumWall(f, "full-kernel");
  const type = wallType(f, "full-kernel");
  // one threshold for both texts: the full thin-film kernel's (the thin-film limit is an output for reference)
  const regime = filmRegime(f, { neelThreshold: type.wall.neelThreshold, neelThresholdModel: "full kernel" });
  const spiral = spiralState(f);
  const profile = wallProfile(widths.Delta, eq.helicity, 161, 5);
  const notes: string[] = [];
  const energy = chiralWallEnergy(f);
  if (energy <= 0) notes.push("|D| >= D_c: the wall energy is negative and a chiral spiral is the ground state; the isolated wall is not stable.");
  if (!regime.thinFilm) {
    notes.push(
      `t is not below Delta: the thin-film results are rough estimates (magnetization taken uniform through the thickness; a twist of the wall across the thickness is not modelled). The verdict uses the full-kernel Neel threshold D_N = ${(type.wall.neelThreshold * 1e3).toPrecision(3)} mJ/m^2; the thin-film limit ${(neelThresholdDmi(f) * 1e3).toPrecision(3)} mJ/m^2 (output neelThresholdThinFilm) overestimates it here.`,
    );
  }
  const values: ComputeOutput["values"] = {
    width: widths.Delta,
    energy,
    criticalDmi: criticalDmi(f),
    exchangeLength: exchangeLength(f),
    effectiveAnisotropy: effectiveAnisotropy(f),
    qualityFactor: qualityFactor(f),
    lilleyWidth: widths.lilleyWidth,
    mzSlopeWidth: widths.mzSlopeWidth,
    inPlaneFwhm: widths.inPlaneFwhm,
    neelThreshold: type.neelThresholdFullKernel,
    neelThresholdThinFilm: neelThresholdDmi(f),
    wallType: type.text,
    helicity: eq.helicity,
    energyWithVolumeCharges: eq.energy,
    regime: regime.text,
    x: profile.x,
    mz: profile.mz,
    mInPlane: profile.mInPlane,
  };
  if (f.D !== 0) values.dmiSpiralPeriod = spiralPeriod(f);
  if (spiral.groundState) values.spiralPeriod = spiral.period;
  return { values, status: notes.length ? "warning" : "ok", notes };
}

const wallSpec = defineCalculator({
  id: "wall",
  title: "180-degree domain wall",
  summary:
    "Width, energy and character of the 180-degree wall of a perpendicular thin film with interfacial DMI: the named width conventions, the wall energy 4 sqrt(A K_eff) - pi |D|, the critical DMI, the Bloch/Neel character from D against the magnetostatic cost of the Neel wall, and the profile.",
  inputs: filmInputs,
  outputs: [
    { name: "width", symbol: "\\Delta", unit: "m", meaning: "wall width parameter sqrt(A / K_eff)" },
    { name: "energy", symbol: "\\sigma", unit: "J/m^2", meaning: "energy per unit area of the DMI-favoured wall, 4 sqrt(A K_eff) - pi |D| (local model)" },
    { name: "criticalDmi", symbol: "D_c", unit: "J/m^2", meaning: "DMI above which walls have negative energy, 4 sqrt(A K_eff) / pi" },
    { name: "exchangeLength", symbol: "l_{ex}", unit: "m", meaning: "exchange length sqrt(2A / (mu0 Ms^2))" },
    { name: "effectiveAnisotropy", symbol: "K_{eff}", unit: "J/m^3", meaning: "effective anisotropy Ku - mu0 Ms^2 / 2" },
    { name: "qualityFactor", symbol: "Q_K", unit: "", meaning: "quality factor 2 Ku / (mu0 Ms^2)" },
    { name: "lilleyWidth", symbol: "\\pi\\Delta", unit: "m", meaning: "Lilley width pi Delta (tangent of theta at the centre)" },
    { name: "mzSlopeWidth", symbol: "2\\Delta", unit: "m", meaning: "slope width of m_z, 2 Delta" },
    { name: "inPlaneFwhm", symbol: "w_{FWHM}", unit: "m", meaning: "full width at half maximum of the in-plane component, 2 arccosh(2) Delta" },
    { name: "neelThreshold", symbol: "D_N", unit: "J/m^2", meaning: "Neel threshold with the full thin-film kernel (finite t / Delta): the one wallType and regime use" },
    { name: "neelThresholdThinFilm", symbol: "D_N^{(0)}", unit: "J/m^2", meaning: "Neel threshold in the thin-film limit, 2 ln2 mu0 Ms^2 t / pi^2 (for reference)" },
    { name: "wallType", symbol: "", unit: "", kind: "text", meaning: "Bloch, intermediate or Neel, in words" },
    { name: "helicity", symbol: "\\gamma", unit: "rad", meaning: "in-plane angle of the wall moment from the direction toward the up domain" },
    { name: "energyWithVolumeCharges", symbol: "\\sigma'", unit: "J/m^2", meaning: "equilibrium wall energy including the Neel volume-charge cost (full kernel)" },
    { name: "dmiSpiralPeriod", symbol: "L_D", unit: "m", meaning: "zero-anisotropy spiral period 4 pi A / |D| (absent for D = 0)", optional: true },
    { name: "spiralPeriod", symbol: "\\lambda", unit: "m", meaning: "spin spiral period with anisotropy (only when |D| > D_c)", optional: true },
    { name: "regime", symbol: "", unit: "", kind: "text", meaning: "what the film does, in words" },
    { name: "x", symbol: "x", unit: "m", kind: "array", meaning: "position across the wall" },
    { name: "mz", symbol: "m_z", unit: "", kind: "array", meaning: "out-of-plane component, -tanh(x / Delta)" },
    { name: "mInPlane", symbol: "m_\\parallel", unit: "", kind: "array", meaning: "in-plane component, sech(x / Delta)" },
  ],
  plots: [{ id: "profile", title: "Wall profile", x: "x", y: ["mz", "mInPlane"] }],
  assumptions: [...commonAssumptions, "Rigid Landau-Lifshitz profile; the Neel volume-charge cost uses that profile (collective coordinates)."],
  sources: wallSources,
  method:
    "Closed forms (Landau-Lifshitz profile, Thiaville et al. wall energy); Neel charge energy by tanh-sinh quadrature of the thin-film kernel; spiral period from the soliton-lattice condition E(k)/k = |D|/D_c.",
  headline: ["width", "energy", "criticalDmi", "neelThreshold"],
  limits: filmLimits,
  compute: computeWall,
});

function computeWall360(v: InputValues, options: ComputeOptions = {}): ComputeOutput {
  const f = filmOf(v);
  const eq = wall360Equilibrium(f, v.B!);
  const notes = [...eq.notes];
  const Delta = wallWidths(f).Delta;
  const Dc = criticalDmi(f);
  const aboveDc = Math.abs(f.D) > Dc;
  const values: ComputeOutput["values"] = {
    pairState:
      eq.status !== "bound"
        ? "no bound pair (walls separate)"
        : aboveDc && eq.energy <= 0
          ? "bound pair with negative energy (|D| > D_c, B <= B_sat): not a metastable excitation; spiral or strips are lower than the uniform film"
          : aboveDc
            ? "bound pair (|D| > D_c but B > B_sat: positive energy, an excitation of the uniform film)"
            : "bound pair",
    mergeField: wall360MergeField(f),
    helicity: eq.helicity,
  };
  if (aboveDc) values.saturationField = saturationField(f);
  if (eq.status === "bound") {
    values.radius = eq.radius;
    values.wallWidth = eq.width;
    values.energy = eq.energy;
    values.exactRadius = eq.exact!.radius;
    values.exactWidth = eq.exact!.width;
    const span = eq.radius + 8 * eq.width;
    const p = wall360Profile(eq.radius, eq.width, eq.helicity, span, 201);
    values.x = p.x;
    values.mz = p.mz;
    values.mInPlane = p.mx.map((mx, i) => mx * Math.cos(eq.helicity) + p.my[i]! * Math.sin(eq.helicity));
  } else {
    values.wallWidth = Delta;
    if (Number.isFinite(eq.energy)) values.energy = eq.energy;
  }
  if (options.sweep) {
    const Bs = sweepValues(wall360Spec, options.sweep);
    const R: number[] = [];
    const w: number[] = [];
    const E: number[] = [];
    const fieldSweep: number[] = [];
    for (const B of Bs) {
      const r = wall360Equilibrium(f, B);
      if (r.status !== "bound") continue; // no pair at B <= 0: left out of the arrays, noted below
      fieldSweep.push(B);
      R.push(r.radius);
      w.push(r.width);
      E.push(r.energy);
    }
    if (fieldSweep.length < Bs.length) notes.push(`${Bs.length - fieldSweep.length} sweep points at B <= 0 have no bound pair and are left out.`);
    values.fieldSweep = fieldSweep;
    values.radiusSweep = R;
    values.wallWidthSweep = w;
    values.energySweep = E;
  }
  return { values, status: eq.status === "bound" && notes.length === 0 ? "ok" : "warning", notes };
}

const wall360Spec = defineCalculator({
  id: "wall360",
  title: "360-degree wall in a field",
  summary:
    "A pair of 180-degree walls enclosing a reversed core (a 1D 360-degree wall) in a perpendicular film, with the Braun ansatz tan(theta/2) = sinh(R/w) / sinh(|x|/w): equilibrium core half-width R and wall width w in a field B along the background, its energy, and R(B), w(B) over a field sweep.",
  inputs: [
    ...filmInputs,
    {
      name: "B",
      symbol: "\\mu_0 H",
      unit: "T",
      default: 0.05,
      min: 1e-3,
      max: 1,
      scale: "log",
      meaning: "applied field mu0 H along +z (the background); B > 0 compresses the core",
    },
  ],
  outputs: [
    { name: "radius", symbol: "R", unit: "m", meaning: "core half-width (m_z = 0 at x = +-R), by minimization" },
    { name: "wallWidth", symbol: "w", unit: "m", meaning: "wall width of the ansatz, by minimization" },
    { name: "energy", symbol: "\\sigma", unit: "J/m^2", meaning: "energy per unit area relative to the uniform state" },
    { name: "exactRadius", symbol: "R^*", unit: "m", meaning: "R of the exact 1D pair, w asinh(sqrt((1+h)/h))" },
    { name: "exactWidth", symbol: "w^*", unit: "m", meaning: "w of the exact 1D pair, Delta / sqrt(1+h)" },
    { name: "mergeField", symbol: "B_m", unit: "T", meaning: "field above which R < w (the walls merge into one compressed 2-pi soliton)" },
    { name: "helicity", symbol: "\\gamma", unit: "rad", meaning: "helicity of both walls (DMI-favoured)" },
    { name: "pairState", symbol: "", unit: "", kind: "text", meaning: "bound pair or not; for |D| > D_c whether it is an excitation of the uniform film" },
    {
      name: "saturationField",
      symbol: "B_{sat}",
      unit: "T",
      meaning:
        "for |D| > D_c: field where the pair energy vanishes (8 sqrt(A K_eff) [sqrt(1+h) + h asinh(1/sqrt h)] = 2 pi |D|); below it a spiral or strips are lower than the uniform film",
      optional: true,
    },
    { name: "x", symbol: "x", unit: "m", kind: "array", meaning: "position" },
    { name: "mz", symbol: "m_z", unit: "", kind: "array", meaning: "out-of-plane component" },
    { name: "mInPlane", symbol: "m_\\parallel", unit: "", kind: "array", meaning: "in-plane component along the helicity direction (signed)" },
    { name: "fieldSweep", symbol: "\\mu_0 H", unit: "T", kind: "array", meaning: "fields of the sweep" },
    { name: "radiusSweep", symbol: "R", unit: "m", kind: "array", meaning: "R over the sweep" },
    { name: "wallWidthSweep", symbol: "w", unit: "m", kind: "array", meaning: "w over the sweep" },
    { name: "energySweep", symbol: "\\sigma", unit: "J/m^2", kind: "array", meaning: "energy per unit area over the sweep" },
  ],
  plots: [
    { id: "profile", title: "360-degree wall profile", x: "x", y: ["mz", "mInPlane"] },
    { id: "size", title: "R and w against B", x: "fieldSweep", y: ["radiusSweep", "wallWidthSweep"], xLog: true, yLog: true },
    { id: "energy", title: "Energy against B", x: "fieldSweep", y: ["energySweep"], xLog: true },
  ],
  sweep: { over: ["B"], points: 60 },
  assumptions: [
    ...commonAssumptions,
    "1D pair (walls straight and infinite along y); planar ansatz with one helicity for both walls.",
    "The DMI energy of the pair is -2 pi |D| whatever R and w (topological in 1D), so D does not change R and w.",
    "A bound pair needs B > 0 (the walls repel); stability against unwinding out of the plane is not analysed.",
    "For |D| > D_c the pair energy is negative below B_sat: there the pair is not an excitation of a uniform ground state (said in pairState and notes, status warning).",
  ],
  sources: ["H.-B. Braun, PRB 50, 16501 (1994)", "A. Bogdanov, A. Hubert, JMMM 138, 255 (1994) (saturation field above D_c)", ...wallSources.slice(0, 3)],
  method: "Closed-form ansatz energy (our derivation), minimized over (ln R, ln w) by restarted Nelder-Mead; exact 1D pair shown beside it.",
  limits: filmLimits,
  compute: computeWall360,
});

function computeWallType(v: InputValues): ComputeOutput {
  const f = filmOf(v);
  const r = wallType(f, "full-kernel");
  const tInput = filmInputs.find((i) => i.name === "t")!;
  const ts: number[] = [];
  const n = 60;
  for (let i = 0; i < n; i++) ts.push(tInput.min + ((tInput.max - tInput.min) * i) / (n - 1));
  const curve = neelThresholdCurve(f, ts);
  return {
    values: {
      wallType: r.text,
      character: r.wall.character,
      cosHelicity: r.wall.cosHelicity,
      helicity: r.wall.helicity,
      neelThreshold: r.neelThresholdFullKernel,
      neelThresholdThinFilm: r.neelThresholdThinFilm,
      curveT: curve.t,
      curveFullKernel: curve.fullKernel,
      curveThinFilm: curve.thinFilm,
      ...(Math.abs(f.D) > criticalDmi(f) ? { saturationField: saturationField(f) } : {}),
    },
    status: Math.abs(f.D) > criticalDmi(f) ? "warning" : "ok",
    notes: aboveCriticalNote(f),
  };
}

/** For |D| > D_c: walls have negative energy at zero field; the saturation field above which the uniform film is lower. */
function aboveCriticalNote(f: Film): string[] {
  const Dc = criticalDmi(f);
  if (!(Math.abs(f.D) > Dc)) return [];
  return [
    `|D| = ${(Math.abs(f.D) * 1e3).toPrecision(4)} mJ/m^2 > D_c = 4 sqrt(A K_eff) / pi = ${(Dc * 1e3).toPrecision(4)} mJ/m^2: an isolated 180-degree wall has negative energy at zero field, so a spiral or strip-domain state is lower than uniform domains; the wall type above describes the walls of that texture. A field along the background restores the uniform film above B_sat = ${(saturationField(f) * 1e3).toPrecision(4)} mT (where a 360-degree wall costs no energy).`,
  ];
}

const wallTypeSpec = defineCalculator({
  id: "wall-type",
  title: "Bloch or Neel wall",
  summary:
    "Whether the 180-degree wall of a perpendicular film is Bloch, intermediate or Neel, from the interfacial DMI against the magnetostatic cost of the Neel wall's volume charges; the phase boundary D_N(t).",
  inputs: filmInputs,
  outputs: [
    { name: "wallType", symbol: "", unit: "", kind: "text", meaning: "the wall type in words" },
    { name: "character", symbol: "", unit: "", kind: "text", meaning: "Bloch, intermediate or Neel" },
    { name: "cosHelicity", symbol: "\\cos \\gamma", unit: "", meaning: "signed Neel fraction of the wall moment, D / D_N clipped to [-1, 1]" },
    { name: "helicity", symbol: "\\gamma", unit: "rad", meaning: "helicity of the wall" },
    { name: "neelThreshold", symbol: "D_N", unit: "J/m^2", meaning: "Neel threshold with the full thin-film kernel (finite t / Delta): the one wallType uses" },
    { name: "neelThresholdThinFilm", symbol: "D_N^{(0)}", unit: "J/m^2", meaning: "Neel threshold in the thin-film limit, 2 ln2 mu0 Ms^2 t / pi^2 (for reference)" },
    { name: "saturationField", symbol: "B_{sat}", unit: "T", meaning: "for |D| > D_c: field above which the uniform film is lower than a spiral or strips", optional: true },
    { name: "curveT", symbol: "t", unit: "m", kind: "array", meaning: "thicknesses of the phase boundary" },
    { name: "curveFullKernel", symbol: "D_N(t)", unit: "J/m^2", kind: "array", meaning: "phase boundary, full kernel" },
    { name: "curveThinFilm", symbol: "D_N^{(0)}(t)", unit: "J/m^2", kind: "array", meaning: "phase boundary, thin-film limit" },
  ],
  plots: [{ id: "boundary", title: "Neel threshold against thickness (Neel above the curve)", x: "curveT", y: ["curveFullKernel", "curveThinFilm"] }],
  assumptions: [...commonAssumptions, "Rigid profile of width Delta; only the Neel volume charges differ between Bloch and Neel walls."],
  sources: wallSources,
  method: "Minimize sigma(gamma) = sigma_0 - pi D cos gamma + C cos^2 gamma; C by quadrature of the thin-film kernel.",
  limits: filmLimits,
  compute: computeWallType,
});

/** Calculator specs of the walls domain. */
export const wallCalculators = [wallSpec, wall360Spec, wallTypeSpec];
