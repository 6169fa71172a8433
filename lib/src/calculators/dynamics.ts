/**
 * Calculators of wall and skyrmion dynamics (lib/src/dynamics/): `wall-motion` (velocity against the
 * out-of-plane field with Walker breakdown), `wall-current` (velocity against the current density,
 * spin-transfer and spin-orbit torques), `wall-trace` (q(t), phi(t) integrated in time),
 * `skyrmion-drift` (Thiele velocity and Hall angle against current and radius) and
 * `precessing-skyrmion` (a skyrmion held by spin torque in a nanocontact: omega(R), balance torque,
 * threshold, R(t)).
 * Defaults: the invented demo film HX-1 (lib/src/material/demo.ts) for walls and skyrmions, and an
 * invented DMI-free film for the nanocontact (values below, labelled invented).
 */
import type { CalculatorSpec, ComputeOptions, ComputeOutput, InputValues } from "./spec.js";
import { defaultSweep, defineCalculator, inputList, outputList, choiceInput } from "./spec.js";
import { sweepValues } from "./spec.js";
import { InputError } from "../errors.js";
import { formatQuantity } from "../quantity/units.js";
import { criticalDmi, makeFilm, requirePerpendicular, wallWidthParameter } from "../material/film.js";
import { demoFilmHX1 } from "../material/demo.js";
import { gammaElectron } from "../quantity/constants.js";
import {
  intrinsicPinningDrift,
  spinDriftVelocity,
  spinOrbitField,
  spinOrbitSaturationVelocity,
  walkerDriftVelocities,
  walkerFields,
  wallEquilibriumAngle,
  wallMotion,
  wallMotionModel,
  wallTrace,
  wallTraceBreathing,
  type WallDrive,
  type WallMotionModel,
} from "../dynamics/wallMotion.js";
import { driftProfileOfFilm, thieleVelocity } from "../dynamics/skyrmionDrift.js";
import { ansatzLocalIntegrals } from "../walls/skyrmionAnsatz.js";
import { dmiHelicity } from "../walls/skyrmionEnergy.js";
import { dropletModel, dropletStableRadius, dropletState, dropletThreshold, dropletTrace, slonczewskiRate, thinWallFrequency } from "../dynamics/precessingSkyrmion.js";

const demo = demoFilmHX1.film;

const filmInputs = inputList([
  { name: "Ms", symbol: "M_s", unit: "A/m", default: demo.Ms, min: 0.4e6, max: 1.2e6, scale: "linear", meaning: "saturation magnetization" },
  { name: "A", symbol: "A", unit: "J/m", default: demo.A, min: 5e-12, max: 30e-12, scale: "linear", meaning: "exchange stiffness" },
  {
    name: "Ku",
    symbol: "K_u",
    unit: "J/m^3",
    default: demo.Ku,
    min: 1.0e6,
    max: 3.0e6,
    scale: "linear",
    meaning: "uniaxial perpendicular anisotropy (K_eff = Ku - mu0 Ms^2 / 2 must be > 0)",
  },
  {
    name: "D",
    symbol: "D",
    unit: "J/m^2",
    default: demo.D,
    min: 0,
    max: 3e-3,
    scale: "linear",
    meaning: "interfacial DMI constant (D > 0: Neel walls pointing toward the +z domain)",
  },
  { name: "t", symbol: "t", unit: "m", default: demo.t, min: 0.4e-9, max: 3e-9, scale: "linear", meaning: "film thickness" },
  { name: "alpha", symbol: "\\alpha", unit: "", default: demo.alpha ?? 0.3, min: 0.01, max: 1, scale: "log", meaning: "Gilbert damping" },
]);

const currentInputs = inputList([
  {
    name: "j",
    symbol: "j",
    unit: "A/m^2",
    default: 0,
    min: 0,
    max: 3e12,
    scale: "linear",
    meaning: "current density along +x (electron flow along +x for the spin-transfer torque)",
  },
  { name: "P", symbol: "P", unit: "", default: 0.5, min: 0, max: 1, scale: "linear", meaning: "spin polarization of the current (spin-transfer torque)" },
  { name: "beta", symbol: "\\beta", unit: "", default: 0.1, min: 0, max: 1, scale: "linear", meaning: "non-adiabatic spin-transfer parameter" },
  {
    name: "thetaSH",
    symbol: "\\theta_{SH}",
    unit: "",
    default: 0,
    min: -0.3,
    max: 0.3,
    scale: "linear",
    meaning: "spin Hall angle of the underlayer (damping-like spin-orbit torque; 0 switches it off)",
  },
  {
    name: "fieldLike",
    symbol: "\\xi_{FL}",
    unit: "",
    default: 0,
    min: -2,
    max: 2,
    scale: "linear",
    meaning: "field-like spin-orbit field as a multiple of the damping-like one (along +y)",
  },
]);

const wallInputs = inputList([
  ...filmInputs,
  { name: "Bz", symbol: "\\mu_0 H_z", unit: "T", default: 0.05, min: 0, max: 0.3, scale: "linear", meaning: "out-of-plane field along +z (expands the +z domain)" },
  { name: "Bx", symbol: "\\mu_0 H_x", unit: "T", default: 0, min: -0.2, max: 0.2, scale: "linear", meaning: "in-plane field along the wall normal x" },
  ...currentInputs,
  choiceInput(
    "polarity",
    "p",
    [
      [1, "up-down"],
      [-1, "down-up"],
    ],
    "wall polarity: up-down (+z domain at x < q) or down-up",
  ),
]);

const wallAssumptions = [
  "Collective coordinates (position q, in-plane angle phi) of a rigid 180-degree wall, width Delta = sqrt(A / K_eff) fixed (wall-trace can add a breathing width Delta(t); the closed forms keep it fixed).",
  "Thin film, T = 0, no pinning or disorder; magnetostatics local through K_eff plus the Neel wall's shape anisotropy (demagnetizing factor N_x = t ln2 / (pi Delta)).",
  "Spin-transfer torque of Zhang and Li with u = g muB P j / (2 e Ms) along the electron flow; damping-like spin-orbit field mu0 H_DL = hbar theta_SH j / (2 e Ms t), spin polarization +y for theta_SH j > 0.",
  "Gyromagnetic ratio of the free electron, gamma = 1.76e11 rad/(s T). Defaults: the invented demo film HX-1 (not a real material).",
];

const wallSources = [
  "N. Schryer, L. Walker, J. Appl. Phys. 45, 5406 (1974)",
  "A. Malozemoff, J. Slonczewski, Magnetic Domain Walls in Bubble Materials (Academic Press 1979)",
  "A. Thiaville, Y. Nakatani, J. Miltat, Y. Suzuki, EPL 69, 990 (2005)",
  "A. Thiaville, S. Rohart, E. Jue, V. Cros, A. Fert, EPL 100, 57002 (2012)",
  "S. Zhang, Z. Li, PRL 93, 127204 (2004)",
  "G. Tatara, H. Kohno, PRL 92, 086601 (2004) (intrinsic pinning)",
  "A. Khvalkovskiy et al., PRB 87, 020402 (2013) (spin-orbit torques on walls; from memory)",
  "J. Dormand, P. Prince, J. Comput. Appl. Math. 6, 19 (1980) (the integrator)",
];

interface WallSetup {
  model: WallMotionModel;
  drive: WallDrive;
  notes: string[];
}

function wallDriveFromCurrent(v: InputValues, model: WallMotionModel, j: number): WallDrive {
  const BDL = spinOrbitField(j, v.thetaSH!, model.Ms, model.t);
  return {
    Bz: v.Bz!,
    Bx: v.Bx!,
    u: spinDriftVelocity(j, v.P!, model.Ms),
    beta: v.beta!,
    BDL,
    BFL: v.fieldLike! * BDL,
  };
}

function wallSetup(v: InputValues): WallSetup {
  const film = makeFilm({ Ms: v.Ms, A: v.A, Ku: v.Ku, D: v.D, t: v.t, dmi: "interfacial" });
  requirePerpendicular(film, "wall dynamics");
  if (!(v.alpha! > 0)) throw new InputError("alpha", v.alpha, "a positive Gilbert damping (the wall model divides by alpha)");
  if (!(v.P! >= 0 && v.P! <= 1)) throw new InputError("P", v.P, "a spin polarization from 0 to 1");
  if (!(v.beta! >= 0)) throw new InputError("beta", v.beta, "a non-negative non-adiabatic parameter");
  const model = wallMotionModel(film, { alpha: v.alpha!, polarity: v.polarity! });
  const notes: string[] = [];
  const Dc = criticalDmi(film);
  if (Math.abs(film.D) >= Dc) notes.push("|D| >= D_c: walls have negative energy and a spiral is the ground state; the isolated-wall model is outside its validity.");
  if (film.t >= model.Delta) notes.push("t is not below Delta: the thin-film wall demagnetizing factor is a rough estimate.");
  return { model, drive: wallDriveFromCurrent(v, model, v.j!), notes };
}

function scalarWallOutputs(s: WallSetup, v: InputValues): ComputeOutput["values"] {
  const { model, drive } = s;
  const here = wallMotion(model, drive);
  const wf = walkerFields(model, drive);
  const atWalker = wallMotion(model, { ...drive, Bz: wf.upper * (1 - 1e-12) });
  const pin = intrinsicPinningDrift(model, { Bx: drive.Bx });
  const uW = walkerDriftVelocities(model, { Bx: drive.Bx, beta: drive.beta });
  const uPerJ = spinDriftVelocity(1, v.P!, model.Ms);
  const values: ComputeOutput["values"] = {
    velocity: here.velocity,
    regime: here.regime === "steady" ? "steady motion below breakdown" : "precessing above breakdown (mean velocity over a period)",
    precessionFrequency: here.regime === "precessing" ? Math.abs(here.meanPhiRate) / (2 * Math.PI) : 0,
    wallAngle: here.regime === "steady" ? here.phi : wallEquilibriumAngle(model, drive),
    walkerField: wf.upper,
    walkerFieldLower: wf.lower,
    walkerVelocity: atWalker.velocity,
    width: model.Delta,
    shapeField: model.shapeField,
    dmiField: model.dmiField,
    driftVelocity: drive.u ?? 0,
    spinOrbitField: drive.BDL ?? 0,
    spinOrbitSaturation: spinOrbitSaturationVelocity(model),
  };
  if (uPerJ > 0 && Number.isFinite(pin.upper)) values.pinningCurrent = pin.upper / uPerJ;
  if (uPerJ > 0 && Number.isFinite(uW.upper)) values.walkerCurrent = uW.upper / uPerJ;
  return values;
}

const wallScalarOutputs = outputList([
  { name: "velocity", symbol: "v", unit: "m/s", meaning: "steady velocity, or mean velocity above breakdown (period integral), at the given drive" },
  { name: "regime", symbol: "", unit: "", kind: "text" as const, meaning: "steady or precessing" },
  { name: "precessionFrequency", symbol: "f_\\phi", unit: "Hz", meaning: "mean precession frequency of phi (0 below breakdown)" },
  { name: "wallAngle", symbol: "\\phi", unit: "rad", meaning: "in-plane angle of the wall moment from +x (steady angle, or the start angle when precessing)" },
  {
    name: "walkerField",
    symbol: "\\mu_0 H_W",
    unit: "T",
    meaning: "Walker field (largest B_z with steady motion, other drives as given): exact maximum of the restoring torque over phi",
  },
  { name: "walkerFieldLower", symbol: "\\mu_0 H_W^-", unit: "T", meaning: "most negative B_z with steady motion" },
  { name: "walkerVelocity", symbol: "v_W", unit: "m/s", meaning: "velocity at the Walker field" },
  { name: "width", symbol: "\\Delta", unit: "m", meaning: "wall width parameter sqrt(A / K_eff)" },
  { name: "shapeField", symbol: "\\mu_0 H_K", unit: "T", meaning: "shape-anisotropy field of the Neel wall, N_x mu0 Ms" },
  { name: "dmiField", symbol: "\\mu_0 H_D", unit: "T", meaning: "DMI field D / (Ms Delta)" },
  { name: "driftVelocity", symbol: "u", unit: "m/s", meaning: "spin-drift velocity u = g muB P j / (2 e Ms)" },
  { name: "spinOrbitField", symbol: "\\mu_0 H_{DL}", unit: "T", meaning: "damping-like spin-orbit field hbar theta_SH j / (2 e Ms t)" },
  { name: "spinOrbitSaturation", symbol: "v_{sat}", unit: "m/s", meaning: "saturation speed under a large spin-orbit torque, (pi/2) gamma |D| / Ms" },
  {
    name: "pinningCurrent",
    symbol: "j_c",
    unit: "A/m^2",
    meaning: "intrinsic-pinning current density (beta = 0, no field): below it spin-transfer torque alone does not move the wall",
  },
  { name: "walkerCurrent", symbol: "j_W", unit: "A/m^2", meaning: "spin-transfer Walker current density for the given beta (absent when beta = alpha)" },
]);

function computeWallSweep(v: InputValues, over: "Bz" | "j", options: ComputeOptions, spec: CalculatorSpec): ComputeOutput {
  const s = wallSetup(v);
  const values = scalarWallOutputs(s, v);
  const sweep = options.sweep ?? defaultSweep(spec)!;
  const xs = sweepValues(spec, sweep);
  const vel: number[] = [];
  const freq: number[] = [];
  let breakdown = NaN;
  let prevSteady: boolean | undefined;
  for (const x of xs) {
    const d = sweep.over === "Bz" ? { ...s.drive, Bz: x } : sweep.over === "j" ? wallDriveFromCurrent({ ...v }, s.model, x) : s.drive;
    const r = wallMotion(s.model, d);
    vel.push(r.velocity);
    freq.push(r.regime === "precessing" ? Math.abs(r.meanPhiRate) / (2 * Math.PI) : 0);
    const steady = r.regime === "steady";
    if (prevSteady === true && !steady && Number.isNaN(breakdown)) breakdown = x;
    prevSteady = steady;
  }
  values.sweepValues = xs;
  values.sweepVelocity = vel;
  values.sweepFrequency = freq;
  const notes = [...s.notes];
  if (!Number.isNaN(breakdown))
    notes.push(
      `Breakdown along the sweep of ${sweep.over} near ${formatQuantity(breakdown, spec.inputs.find((i) => i.name === sweep.over)?.unit ?? "")} (first precessing point).`,
    );
  return { values, status: s.notes.length ? "warning" : "ok", notes };
}

const wallMotionSpec = defineCalculator({
  id: "wall-motion",
  title: "Wall velocity against field (Walker breakdown)",
  summary:
    "Velocity of a 180-degree wall in a perpendicular film against the out-of-plane field, with interfacial DMI, the Neel wall's shape anisotropy, an in-plane field and optional currents: steady motion below the Walker field (computed exactly as the maximum of the restoring torque over the wall angle), precession and the mean velocity (period integral) above it.",
  inputs: wallInputs,
  outputs: [
    ...wallScalarOutputs,
    { name: "sweepValues", symbol: "\\mu_0 H_z", unit: "T", kind: "array", meaning: "swept field" },
    { name: "sweepVelocity", symbol: "v", unit: "m/s", kind: "array", meaning: "steady or mean velocity" },
    { name: "sweepFrequency", symbol: "f_\\phi", unit: "Hz", kind: "array", meaning: "precession frequency (0 below breakdown: where it rises is the breakdown)" },
  ],
  plots: [
    { id: "velocity", title: "Wall velocity against field", x: "sweepValues", y: ["sweepVelocity"] },
    { id: "precession", title: "Precession frequency (breakdown where it leaves 0)", x: "sweepValues", y: ["sweepFrequency"] },
  ],
  sweep: { over: ["Bz"], points: 200 },
  assumptions: wallAssumptions,
  sources: wallSources,
  method:
    "Closed forms of the collective-coordinate equations: first zero of dphi/dt from the rest angle (steady), exact extremes of a degree-two trigonometric polynomial (Walker thresholds), periodic trapezoid with doubling to 1e-13 (period integrals above breakdown).",
  compute: (v, o = {}): ComputeOutput => computeWallSweep(v, "Bz", o, wallMotionSpec),
});

const wallCurrentSpec = defineCalculator({
  id: "wall-current",
  title: "Wall velocity against current (spin-transfer and spin-orbit torques)",
  summary:
    "Velocity of a 180-degree wall against the current density: spin-transfer torque (u, beta) with its intrinsic pinning and Walker current, damping-like and field-like spin-orbit torques with the saturation at (pi/2) gamma D / Ms; breakdown marked by the precession frequency.",
  inputs: wallInputs.map((i) => (i.name === "j" ? { ...i, default: 1e12 } : i.name === "Bz" ? { ...i, default: 0 } : i.name === "thetaSH" ? { ...i, default: 0.1 } : i)),
  outputs: [
    ...wallScalarOutputs,
    { name: "sweepValues", symbol: "j", unit: "A/m^2", kind: "array", meaning: "swept current density" },
    { name: "sweepVelocity", symbol: "v", unit: "m/s", kind: "array", meaning: "steady or mean velocity" },
    { name: "sweepFrequency", symbol: "f_\\phi", unit: "Hz", kind: "array", meaning: "precession frequency (0 below breakdown)" },
  ],
  plots: [
    { id: "velocity", title: "Wall velocity against current density", x: "sweepValues", y: ["sweepVelocity"] },
    { id: "precession", title: "Precession frequency (breakdown where it leaves 0)", x: "sweepValues", y: ["sweepFrequency"] },
  ],
  sweep: { over: ["j"], points: 200 },
  assumptions: wallAssumptions,
  sources: wallSources,
  method: "Closed forms of the collective-coordinate equations (as wall-motion), with u and the spin-orbit fields proportional to j.",
  compute: (v, o = {}): ComputeOutput => computeWallSweep(v, "j", o, wallCurrentSpec),
});

function computeWallTrace(v: InputValues): ComputeOutput {
  const s = wallSetup(v);
  const values = scalarWallOutputs(s, v);
  const duration = v.duration!;
  if (!(duration > 0) || !Number.isFinite(duration)) throw new InputError("duration", duration, "a positive time in s");
  const breathing = v.breathing === 1;
  const tr = breathing ? wallTraceBreathing(s.model, s.drive, { duration, points: 401 }) : wallTrace(s.model, s.drive, { duration, points: 401 });
  values.widthTrace = breathing ? (tr as ReturnType<typeof wallTraceBreathing>).Delta : tr.t.map(() => s.model.Delta);
  values.time = tr.t;
  values.position = tr.q;
  values.angle = tr.phi;
  values.turns = tr.turnTimes.length;
  if (tr.turnTimes.length >= 1) {
    values.tracePeriod = tr.turnTimes[0]!;
    values.traceVelocity = tr.turnPositions[0]! / tr.turnTimes[0]!;
  }
  return { values, status: s.notes.length ? "warning" : "ok", notes: s.notes };
}

const wallTraceSpec = defineCalculator({
  id: "wall-trace",
  title: "Wall time traces q(t), phi(t)",
  summary:
    "Position and in-plane angle of a 180-degree wall against time from the rest state, integrated with an adaptive Dormand-Prince 5(4) method (error control, dense output, event detection of each full turn of phi); the closed-form velocity is shown beside the one read from the first turn.",
  inputs: [
    ...wallInputs.map((i) => (i.name === "Bz" ? { ...i, default: 0.15 } : i)),
    { name: "duration", symbol: "t_{end}", unit: "s", default: 2e-9, min: 0.1e-9, max: 20e-9, scale: "log", meaning: "length of the time trace" },
    choiceInput("breathing", "", ["rigid", "breathing"], "wall width fixed (rigid) or a third coordinate Delta(t) (breathing; changes only with in-plane fields)"),
  ],
  outputs: [
    ...wallScalarOutputs,
    { name: "time", symbol: "t", unit: "s", kind: "array", meaning: "time" },
    { name: "position", symbol: "q", unit: "m", kind: "array", meaning: "wall position" },
    { name: "angle", symbol: "\\phi", unit: "rad", kind: "array", meaning: "in-plane angle of the wall moment (unwrapped)" },
    { name: "widthTrace", symbol: "\\Delta(t)", unit: "m", kind: "array", meaning: "wall width against time (constant unless breathing)" },
    { name: "turns", symbol: "n", unit: "", meaning: "number of full turns of phi within the trace" },
    { name: "tracePeriod", symbol: "T", unit: "s", meaning: "time of the first full turn of phi (event)" },
    { name: "traceVelocity", symbol: "\\bar v", unit: "m/s", meaning: "advance over the first turn divided by its time (compare with velocity)" },
  ],
  plots: [
    { id: "q", title: "Wall position q(t)", x: "time", y: ["position"] },
    { id: "phi", title: "Wall angle phi(t)", x: "time", y: ["angle"] },
    { id: "width", title: "Wall width Delta(t)", x: "time", y: ["widthTrace"] },
  ],
  assumptions: wallAssumptions,
  sources: wallSources,
  method: "Dormand-Prince 5(4) with rtol 1e-10, dense output at 401 times, turns of phi located as events on the dense output (Brent).",
  compute: (v) => computeWallTrace(v),
});

// ---------------------------------------------------------------- skyrmion drift

const skyrmionInputs = inputList([
  ...filmInputs.map((i) => (i.name === "D" ? { ...i, default: 2.5e-3 } : i)),
  { name: "B", symbol: "\\mu_0 H", unit: "T", default: 0.05, min: 0, max: 0.3, scale: "linear", meaning: "field along +z (background direction; the core points along -z)" },
  ...currentInputs.map((i) => (i.name === "j" ? { ...i, default: 1e11, max: 1e12 } : i.name === "thetaSH" ? { ...i, default: 0.1 } : i)).filter((i) => i.name !== "fieldLike"),
  choiceInput("profile", "", ["ansatz", "exact"], "profile: 360-degree-wall ansatz or exact radial profile (local magnetostatics)"),
]);

function computeSkyrmionDrift(v: InputValues, options: ComputeOptions = {}): ComputeOutput {
  const film = makeFilm({ Ms: v.Ms, A: v.A, Ku: v.Ku, D: v.D, t: v.t, dmi: "interfacial" });
  requirePerpendicular(film, "skyrmion drift");
  if (!(v.alpha! > 0)) throw new InputError("alpha", v.alpha, "a positive Gilbert damping");
  if (!(v.P! >= 0 && v.P! <= 1)) throw new InputError("P", v.P, "a spin polarization from 0 to 1");
  const kind = v.profile === 1 ? "exact" : "ansatz";
  const notes: string[] = [];
  let prof: ReturnType<typeof driftProfileOfFilm> | null = null;
  try {
    prof = driftProfileOfFilm(film, v.B!, kind);
    notes.push(...prof.notes);
  } catch (err) {
    if (!(err instanceof InputError)) throw err;
    notes.push(`No equilibrium skyrmion at these inputs (${err.message}); only the radius sweep (ansatz with w = Delta) is given.`);
  }
  const helicity = prof ? prof.helicity : dmiHelicity(film);
  const base = { Ms: film.Ms, t: film.t, alpha: v.alpha!, Q: -1, helicity };
  const drive = (j: number) => ({ u: spinDriftVelocity(j, v.P!, film.Ms), beta: v.beta!, BDL: spinOrbitField(j, v.thetaSH!, film.Ms, film.t) });
  const values: ComputeOutput["values"] = { helicity };
  if (prof) {
    const integrals = prof.integrals;
    const here = thieleVelocity({ ...base, integrals, ...drive(v.j!) });
    const stt = thieleVelocity({ ...base, integrals, u: spinDriftVelocity(v.j!, v.P!, film.Ms), beta: v.beta! });
    const sot = thieleVelocity({ ...base, integrals, BDL: spinOrbitField(v.j!, v.thetaSH!, film.Ms, film.t) });
    const unitForce = thieleVelocity({ ...base, integrals, force: [1e-15, 0] });
    Object.assign(values, {
      radius: prof.radius,
      charge: integrals.charge,
      dissipationIntegral: integrals.dissipation,
      dmiIntegral: integrals.dmi,
      gyrocoupling: here.gyrocoupling,
      dissipation: here.dissipation,
      vx: here.vx,
      vy: here.vy,
      speed: here.speed,
      hallAngle: here.speed > 0 ? here.hallAngle : 0,
      hallAngleStt: stt.speed > 0 ? stt.hallAngle : 0,
      hallAngleSot: sot.speed > 0 ? sot.hallAngle : 0,
      forceHallAngle: unitForce.hallAngle,
    });
    const sw = options.sweep ?? defaultSweep(skyrmionDriftSpec)!;
    const js = sweepValues(skyrmionDriftSpec, sw);
    const vx: number[] = [],
      vy: number[] = [];
    for (const j of js) {
      const r = thieleVelocity({ ...base, integrals, ...drive(j) });
      vx.push(r.vx);
      vy.push(r.vy);
    }
    values.currents = js;
    values.currentVx = vx;
    values.currentVy = vy;
    if (prof.radius < 3e-9) notes.push(`R = ${(prof.radius * 1e9).toPrecision(3)} nm spans only a few atomic spacings: the continuum rigid-profile model is at its limit.`);
  }
  // against radius: the ansatz with the wall width of this film (the solved w, or Delta)
  const w = prof && Number.isFinite(prof.wallWidth) ? prof.wallWidth : wallWidthParameter(film);
  const radii: number[] = [],
    hallR: number[] = [],
    forceR: number[] = [],
    speedR: number[] = [];
  for (let i = 0; i < 60; i++) {
    const R = w * 0.5 * Math.pow(60, i / 59);
    const L = ansatzLocalIntegrals(R / w); // the ansatz's own integrals: I = I_ex, I_D = w I_D(a)
    const I = { dissipation: L.ex, dmi: w * L.D };
    const r = thieleVelocity({ ...base, integrals: I, ...drive(v.j!) });
    const rf = thieleVelocity({ ...base, integrals: I, force: [1e-15, 0] });
    radii.push(R);
    hallR.push(r.speed > 0 ? r.hallAngle : 0);
    speedR.push(r.speed);
    forceR.push(rf.hallAngle);
  }
  values.radii = radii;
  values.radiusHallAngle = hallR;
  values.radiusForceHallAngle = forceR;
  values.radiusSpeed = speedR;
  return { values, status: notes.length ? "warning" : "ok", notes };
}

const skyrmionDriftSpec = defineCalculator({
  id: "skyrmion-drift",
  title: "Skyrmion drift and Hall angle (Thiele)",
  summary:
    "Velocity and skyrmion Hall angle of a rigid isolated skyrmion under spin-transfer torque (u, beta), damping-like spin-orbit torque (force from the profile integral, turning with the helicity) or a force, from the gyrovector 4 pi Q Ms t / gamma and the dissipation integral of the ansatz or exact profile; against current and against radius.",
  inputs: skyrmionInputs,
  outputs: [
    { name: "radius", symbol: "R", unit: "m", meaning: "radius (m_z = 0) of the equilibrium skyrmion" },
    { name: "helicity", symbol: "\\gamma", unit: "rad", meaning: "helicity of the skyrmion (0: outward Neel, pi: inward Neel, +-pi/2: Bloch)" },
    { name: "charge", symbol: "Q", unit: "", meaning: "skyrmion number (core down on +z: -1)" },
    { name: "dissipationIntegral", symbol: "I", unit: "", meaning: "Integral (theta'^2 + sin^2 theta / rho^2) rho drho (4 for Belavin-Polyakov)" },
    { name: "dmiIntegral", symbol: "I_D", unit: "m", meaning: "Integral (theta' + sin theta cos theta / rho) rho drho (sets the spin-orbit force)" },
    { name: "gyrocoupling", symbol: "G", unit: "kg/s", meaning: "gyrocoupling 4 pi Q Ms t / gamma" },
    { name: "dissipation", symbol: "\\mathcal{D}", unit: "kg/s", meaning: "dissipation (Ms t / gamma) pi I" },
    { name: "vx", symbol: "v_x", unit: "m/s", meaning: "velocity along the current (+x)" },
    { name: "vy", symbol: "v_y", unit: "m/s", meaning: "velocity across the current" },
    { name: "speed", symbol: "|v|", unit: "m/s", meaning: "speed" },
    { name: "hallAngle", symbol: "\\theta_{Sk}", unit: "rad", meaning: "angle of the velocity from +x (both torques)" },
    { name: "hallAngleStt", symbol: "\\theta_{STT}", unit: "rad", meaning: "angle of the velocity from +x under spin-transfer torque alone" },
    { name: "hallAngleSot", symbol: "\\theta_{SOT}", unit: "rad", meaning: "angle of the velocity from +x under spin-orbit torque alone" },
    { name: "forceHallAngle", symbol: "\\theta_F", unit: "rad", meaning: "angle of the velocity from a force along +x, atan2(-G, alpha D)" },
    { name: "currents", symbol: "j", unit: "A/m^2", kind: "array", meaning: "swept current density" },
    { name: "currentVx", symbol: "v_x", unit: "m/s", kind: "array", meaning: "velocity along +x against j" },
    { name: "currentVy", symbol: "v_y", unit: "m/s", kind: "array", meaning: "velocity along +y against j" },
    { name: "radii", symbol: "R", unit: "m", kind: "array", meaning: "radius of the ansatz profile (w fixed)" },
    { name: "radiusHallAngle", symbol: "\\theta_{Sk}", unit: "rad", kind: "array", meaning: "Hall angle against radius at the given current" },
    { name: "radiusForceHallAngle", symbol: "\\theta_F", unit: "rad", kind: "array", meaning: "deflection from a force against radius" },
    { name: "radiusSpeed", symbol: "|v|", unit: "m/s", kind: "array", meaning: "speed against radius at the given current" },
  ],
  plots: [
    { id: "current", title: "Velocity against current density", x: "currents", y: ["currentVx", "currentVy"] },
    { id: "radius", title: "Skyrmion Hall angle against radius", x: "radii", y: ["radiusHallAngle", "radiusForceHallAngle"], xLog: true },
    { id: "speed", title: "Speed against radius", x: "radii", y: ["radiusSpeed"], xLog: true },
  ],
  sweep: { over: ["j"], points: 60 },
  assumptions: [
    "Rigid axisymmetric skyrmion (no deformation or breathing), no pinning, T = 0, thin film; Thiele equation F + G (v - u) - D (alpha v - beta u) = 0.",
    "Profile from the 360-degree-wall ansatz (local magnetostatics) or the exact radial profile; the radius sweep keeps the ansatz wall width fixed.",
    "u = g muB P j / (2 e Ms) along +x (electron flow); damping-like spin-orbit field hbar theta_SH j / (2 e Ms t) with spin polarization +y.",
    "Gyromagnetic ratio of the free electron. Defaults: the invented demo film HX-1 with D raised to 2.5 mJ/m^2 (not a real material).",
  ],
  sources: [
    "A. Thiele, PRL 30, 230 (1973)",
    "J. Iwasaki, M. Mochizuki, N. Nagaosa, Nat. Nanotechnol. 8, 742 (2013) (current-driven skyrmions; from memory)",
    "R. Tomasello et al., Sci. Rep. 4, 6784 (2014) (spin-orbit-driven skyrmions; from memory)",
    "A. Belavin, A. Polyakov, JETP Lett. 22, 245 (1975)",
    "F. Buettner, I. Lemesh, G. Beach, Sci. Rep. 8, 4464 (2018) (ansatz)",
  ],
  method: "Profile from the existing ansatz or exact solver; Thiele integrals by composite Gauss-Legendre; the 2x2 Thiele system solved in closed form.",
  compute: computeSkyrmionDrift,
});

// ---------------------------------------------------------------- precessing skyrmion

/** Invented DMI-free film for the nanocontact defaults (not a real material). */
const contactFilm = { Ms: 0.8e6, A: 13e-12, Ku: 0.65e6, t: 3e-9, alpha: 0.05 };

const precessingInputs = inputList([
  { name: "Ms", symbol: "M_s", unit: "A/m", default: contactFilm.Ms, min: 0.4e6, max: 1.0e6, scale: "linear", meaning: "saturation magnetization (invented default)" },
  { name: "A", symbol: "A", unit: "J/m", default: contactFilm.A, min: 5e-12, max: 30e-12, scale: "linear", meaning: "exchange stiffness" },
  { name: "Ku", symbol: "K_u", unit: "J/m^3", default: contactFilm.Ku, min: 0.5e6, max: 2e6, scale: "linear", meaning: "uniaxial perpendicular anisotropy (K_eff > 0 needed)" },
  { name: "t", symbol: "t", unit: "m", default: contactFilm.t, min: 0.5e-9, max: 6e-9, scale: "linear", meaning: "free-layer thickness" },
  { name: "alpha", symbol: "\\alpha", unit: "", default: contactFilm.alpha, min: 0.005, max: 0.3, scale: "log", meaning: "Gilbert damping" },
  { name: "B", symbol: "\\mu_0 H", unit: "T", default: 0.1, min: 0, max: 0.5, scale: "linear", meaning: "field along +z (the background direction)" },
  { name: "contactRadius", symbol: "\\rho_c", unit: "m", default: 40e-9, min: 10e-9, max: 150e-9, scale: "log", meaning: "radius of the nanocontact" },
  { name: "P", symbol: "P", unit: "", default: 0.4, min: 0.05, max: 1, scale: "linear", meaning: "spin polarization of the current through the contact" },
  { name: "current", symbol: "I", unit: "A", default: 2e-3, min: 0, max: 10e-3, scale: "linear", meaning: "current through the contact (pumps reversed spins into it)" },
  { name: "startRadius", symbol: "R_0", unit: "m", default: 30e-9, min: 2e-9, max: 150e-9, scale: "log", meaning: "radius at t = 0 for the time trace" },
  { name: "duration", symbol: "t_{end}", unit: "s", default: 10e-9, min: 0.5e-9, max: 50e-9, scale: "log", meaning: "length of the time trace" },
]);

function computePrecessing(v: InputValues): ComputeOutput {
  const film = makeFilm({ Ms: v.Ms, A: v.A, Ku: v.Ku, D: 0, t: v.t });
  requirePerpendicular(film, "the precessing skyrmion");
  if (!(v.P! > 0 && v.P! <= 1)) throw new InputError("P", v.P, "a spin polarization in (0, 1]");
  if (!(v.current! >= 0)) throw new InputError("current", v.current, "a non-negative current in A (positive pumps reversed spins)");
  const m = dropletModel(film, { B: v.B!, alpha: v.alpha!, contactRadius: v.contactRadius! });
  const notes: string[] = [];
  const perAmp = slonczewskiRate(1, v.P!, m.rhoC, m.Ms, m.t, gammaElectron);
  const sigma = v.current! * perAmp;
  const th = dropletThreshold(m);
  const values: ComputeOutput["values"] = { torqueRate: sigma, width: m.w };
  if (th.status === "ok") {
    values.thresholdTorque = th.torque;
    values.thresholdCurrent = th.torque / perAmp;
    values.thresholdRadius = th.radius;
    const Rs = dropletStableRadius(m, sigma, th);
    if (Number.isFinite(Rs)) {
      values.stableRadius = Rs;
      values.frequency = dropletState(m, Rs).omega / (2 * Math.PI);
      values.state = "precessing skyrmion held by the contact (stable radius on the rising branch of the balance torque)";
    } else {
      values.state = "below threshold: a reversed disc shrinks and collapses";
    }
  } else {
    values.state = "no balance: omega <= 0 at every radius (the field favours expansion)";
    notes.push("omega(R) <= 0 on the whole range: the torque cannot balance damping (status no-minimum).");
  }
  const radii: number[] = [],
    freq: number[] = [],
    thin: number[] = [],
    balance: number[] = [];
  const aHi = Math.max(6, m.rhoC / m.w + 10);
  for (let i = 0; i < 80; i++) {
    const R = m.w * 0.3 * Math.pow(aHi / 0.3, i / 79);
    const s = dropletState(m, R);
    radii.push(R);
    freq.push(s.omega / (2 * Math.PI));
    thin.push(thinWallFrequency(m, R) / (2 * Math.PI));
    balance.push(Number.isFinite(s.balanceTorque) && s.omega > 0 ? Math.min(s.balanceTorque / perAmp, 1e3) : 1e3);
  }
  values.radii = radii;
  values.radiusFrequency = freq;
  values.thinWallFrequency = thin;
  values.balanceCurrent = balance;
  const tr = dropletTrace(m, sigma, v.startRadius!, v.duration!, 301, 1e-8);
  values.time = tr.t;
  values.traceRadius = tr.R;
  values.traceAngle = tr.Phi;
  values.traceStatus =
    tr.status === "collapsed"
      ? `collapsed at t = ${(tr.tEnd * 1e9).toPrecision(3)} ns (R < 0.1 Delta, where the ansatz no longer holds a skyrmion)`
      : "running at the end of the trace";
  if (balance.some((b) => b >= 1e3)) notes.push("balanceCurrent is capped at 1 kA where the contact sits in the saturated core (no balance).");
  return { values, status: notes.length ? "warning" : "ok", notes };
}

const precessingSpec = defineCalculator({
  id: "precessing-skyrmion",
  title: "Precessing skyrmion held by spin torque in a nanocontact",
  summary:
    "A reversed disc (360-degree-wall ansatz, no DMI) whose radius R and precession angle Phi are driven by a Slonczewski torque confined to a nanocontact and damped by alpha: the conservative frequency omega(R) = dE/d(hbar n), the current that balances damping at each radius, the threshold current, the stable radius and frequency, and R(t) from any start.",
  inputs: precessingInputs,
  outputs: [
    { name: "torqueRate", symbol: "\\sigma", unit: "s^-1", meaning: "Slonczewski torque rate gamma hbar P j / (2 e Ms t) of the given current" },
    { name: "width", symbol: "\\Delta", unit: "m", meaning: "wall width parameter of the ansatz, Delta = sqrt(A / K_eff)" },
    { name: "thresholdTorque", symbol: "\\sigma_{th}", unit: "s^-1", meaning: "smallest torque rate that holds a precessing skyrmion (minimum of the balance torque over R)" },
    { name: "thresholdCurrent", symbol: "I_{th}", unit: "A", meaning: "threshold current through the contact" },
    { name: "thresholdRadius", symbol: "R_{th}", unit: "m", meaning: "radius at the threshold" },
    { name: "stableRadius", symbol: "R^*", unit: "m", meaning: "stable radius at the given current (absent below threshold)" },
    { name: "frequency", symbol: "f", unit: "Hz", meaning: "precession frequency omega(R*) / 2 pi" },
    { name: "state", symbol: "", unit: "", kind: "text", meaning: "what the contact holds" },
    { name: "radii", symbol: "R", unit: "m", kind: "array", meaning: "radius" },
    { name: "radiusFrequency", symbol: "f(R)", unit: "Hz", kind: "array", meaning: "conservative precession frequency omega(R) / 2 pi" },
    { name: "thinWallFrequency", symbol: "f_{thin}", unit: "Hz", kind: "array", meaning: "thin-wall limit (gamma B + gamma sigma_w / (2 Ms R)) / 2 pi" },
    { name: "balanceCurrent", symbol: "I_b(R)", unit: "A", kind: "array", meaning: "current that balances damping at radius R (capped at 1 kA where there is no balance)" },
    { name: "time", symbol: "t", unit: "s", kind: "array", meaning: "time" },
    { name: "traceRadius", symbol: "R(t)", unit: "m", kind: "array", meaning: "radius against time" },
    { name: "traceAngle", symbol: "\\Phi(t)", unit: "rad", kind: "array", meaning: "precession angle against time" },
    { name: "traceStatus", symbol: "", unit: "", kind: "text", meaning: "how the trace ended" },
  ],
  plots: [
    { id: "omega", title: "Precession frequency against radius", x: "radii", y: ["radiusFrequency", "thinWallFrequency"], xLog: true },
    { id: "balance", title: "Current that balances damping", x: "radii", y: ["balanceCurrent"], xLog: true, yLog: true },
    { id: "trace", title: "Radius against time", x: "time", y: ["traceRadius"] },
  ],
  assumptions: [
    "Rigid 360-degree-wall ansatz with w = Delta (no deformation, no non-axisymmetric modes), no DMI, local magnetostatics through K_eff.",
    "Slonczewski torque sigma m x (m x z) uniform inside the contact and zero outside, sigma = gamma hbar P j / (2 e Ms t); no Oersted field, T = 0.",
    "Collective coordinates R, Phi from L = (Ms t / gamma) N(R) dPhi/dt - E(R) and F = (alpha Ms t / 2 gamma)(I_RR dR/dt^2 + I_PP dPhi/dt^2) (see lib/src/dynamics/precessingSkyrmion.ts).",
    "Defaults: an invented DMI-free film and contact (not a real material or device).",
  ],
  sources: [
    "M. Hoefer, T. Silva, M. Keller, PRB 82, 054432 (2010)",
    "S. Mohseni et al., Science 339, 1295 (2013)",
    "Y. Zhou et al., Nat. Commun. 6, 8193 (2015) (dynamically stabilized skyrmions; from memory)",
    "J. Slonczewski, JMMM 159, L1 (1996)",
    "H.-B. Braun, PRB 50, 16501 (1994) (360-degree-wall ansatz)",
  ],
  method:
    "Ansatz integrals and their R-derivatives by composite Gauss-Legendre; threshold by Brent minimization in ln R; stable radius by Brent root; R(t), Phi(t) by Dormand-Prince 5(4).",
  compute: (v) => computePrecessing(v),
});

export const dynamicsCalculators = [wallMotionSpec, wallCurrentSpec, wallTraceSpec, skyrmionDriftSpec, precessingSpec];
