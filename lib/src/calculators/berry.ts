/**
 * Calculators of the Berry-phase domain: `berry-loop` (spin Berry phase around a cone, two methods),
 * `chern` (Haldane-model phase diagram by link variables), `magnon-hall` (honeycomb ferromagnet
 * magnons: Chern numbers and thermal Hall conductivity), `spin-tunnel` (giant-spin tunnel splitting
 * and its quenching along the hard axis) and `easy-plane` (easy-plane spin: steps and rotor form).
 * Energies of spin models are given as E / k_B in kelvin (the customary unit of molecular magnets);
 * compute functions receive them in J. Defaults use invented demo materials.
 */
import type { ComputeOptions, ComputeOutput, InputValues } from "./spec.js";
import { defineCalculator, choiceInput } from "./spec.js";
import { requireWholeAtLeast, sweepValues } from "./spec.js";
import { kB, muB } from "../quantity/constants.js";
import { coneLoop } from "../berry/loopOnSphere.js";
import { spinBerryPhase, wrapBerryPhase } from "../berry/spinBerryPhase.js";
import { chernNumbers, chernNumbersRefined } from "../berry/chernNumbers.js";
import { InputError } from "../errors.js";
import { haldaneModel, haldaneCriticalMass } from "../berry/blochModel.js";
import { honeycombMagnonHallConverged } from "../berry/magnonHoneycomb.js";
import { hardAxisQuenchingFields, hardAxisTunnelSplitting, gargQuenchingPeriod, giantSpinLevels, splittingMinima, tunnelSplittingAnyField } from "../berry/giantSpin.js";
import { easyPlaneCrossings, easyPlaneGroundM, easyPlaneMagnetization, rotorMagnetization, rotorTruncation } from "../berry/easyPlaneSpin.js";

const berrySources = [
  "M. Berry, Proc. R. Soc. A 392, 45 (1984)",
  "R. Resta, Rev. Mod. Phys. 66, 899 (1994)",
  "A. Van Oosterom, J. Strackee, IEEE Trans. Biomed. Eng. 30, 125 (1983)",
];

// ---------------------------------------------------------------- berry-loop
function computeBerryLoop(v: InputValues, options: ComputeOptions = {}): ComputeOutput {
  const S = requireWholeAtLeast(v, "twoS", 1, "twice the spin: 1 for S = 1/2") / 2;
  const theta = v.theta!;
  const N = v.segments!;
  const loop = coneLoop(theta, N);
  const mValues: number[] = [];
  const geo: number[] = [];
  const disc: number[] = [];
  const exact: number[] = [];
  let omega = 0;
  const shifted: number[] = [];
  let residual = 0,
    minFactor = Infinity;
  for (let k = 0; k <= v.twoS!; k++) {
    const m = S - k;
    const r = spinBerryPhase(loop, S, m);
    omega = r.solidAngle;
    mValues.push(m);
    geo.push(r.geometric);
    disc.push(r.discrete);
    exact.push(wrapBerryPhase(-m * 2 * Math.PI * (1 - Math.cos(theta))));
    if (r.edgeSign < 0) shifted.push(m);
    minFactor = Math.min(minFactor, r.minEdgeFactor);
    // the identity gamma_disc = -m Omega + pi [prod d^S_mm(alpha) < 0] checked on the computed overlaps
    residual = Math.max(residual, Math.abs(wrapBerryPhase(r.discrete - r.geometric - (r.edgeSign < 0 ? Math.PI : 0))));
  }
  const alpha = 2 * Math.asin(Math.min(1, Math.sin(theta) * Math.sin(Math.PI / N)));
  const loopNotes: string[] = [];
  if (shifted.length) {
    loopNotes.push(
      `The discrete phase of m = ${shifted.join(", ")} is off by exactly pi: for edges of arc ${alpha.toFixed(4)} rad the product of the diagonal Wigner elements d^S_mm(alpha) over the ${N} edges is negative (a loop too coarse for these states, not a numerical error). More edges (or an even number) remove it.`,
    );
  }
  if (minFactor < 1e-8)
    loopNotes.push(
      `An edge factor d^S_mm(alpha) is ${minFactor.toExponential(1)}: neighbouring states are nearly orthogonal and the discrete phase of that m is ill-defined; use more edges.`,
    );
  const values: ComputeOutput["values"] = {
    solidAngle: omega,
    capSolidAngle: 2 * Math.PI * (1 - Math.cos(theta)),
    gammaTop: geo[0]!,
    gammaTopDiscrete: disc[0]!,
    gammaTopExact: exact[0]!,
    maxDifference: Math.max(...geo.map((g, i) => Math.abs(wrapBerryPhase(g - disc[i]!)))),
    piShiftedCount: shifted.length,
    identityResidual: residual,
    edgeArc: alpha,
    mValues,
    gammaGeometric: geo,
    gammaDiscrete: disc,
    gammaCircle: exact,
  };
  if (options.sweep) {
    const ts = sweepValues(berryLoopSpec, options.sweep);
    const g1: number[] = [],
      g2: number[] = [],
      g3: number[] = [];
    for (const t of ts) {
      const r = spinBerryPhase(coneLoop(t, N), S, S);
      g1.push(r.geometric);
      g2.push(r.discrete);
      g3.push(wrapBerryPhase(-S * 2 * Math.PI * (1 - Math.cos(t))));
    }
    values.thetaSweep = ts;
    values.gammaTopSweep = g1;
    values.gammaTopDiscreteSweep = g2;
    values.gammaTopCircleSweep = g3;
  }
  return {
    values,
    status: loopNotes.length ? "warning" : "ok",
    notes: [
      ...loopNotes,
      `The loop is a geodesic ${N}-gon inscribed in the circle; its solid angle differs from the cap's by O(1/N^2). The discrete phase is -m Omega of the polygon exactly (or off by exactly pi, flagged); it has no discretization error of its own.`,
    ],
  };
}

export const berryLoopSpec = defineCalculator({
  id: "berry-loop",
  title: "Spin Berry phase around a cone",
  summary:
    "Berry phase of a spin S in each state m along its axis when the axis runs once counterclockwise (seen from +z) around a cone of half-angle theta: geometric -m Omega and the gauge-invariant product of overlaps of rotated spin-S states, against -m 2 pi (1 - cos theta).",
  inputs: [
    { name: "twoS", symbol: "2S", unit: "", default: 3, min: 1, max: 12, scale: "linear", kind: "integer", meaning: "twice the spin (1 for S = 1/2)" },
    { name: "theta", symbol: "\\theta", unit: "rad", default: 1.0, min: 0.05, max: 3.09, scale: "linear", meaning: "cone half-angle (rad)" },
    { name: "segments", symbol: "N", unit: "", default: 200, min: 16, max: 4000, scale: "log", kind: "integer", meaning: "geodesic edges of the discretized loop" },
  ],
  outputs: [
    { name: "solidAngle", symbol: "\\Omega", unit: "sr", meaning: "solid angle of the polygon, in (-2 pi, 2 pi] (sr)" },
    { name: "capSolidAngle", symbol: "2\\pi(1-\\cos\\theta)", unit: "sr", meaning: "solid angle of the circular cap (sr)" },
    { name: "gammaTop", symbol: "\\gamma_S", unit: "rad", meaning: "Berry phase of m = S, geometric (rad, in (-pi, pi])" },
    { name: "gammaTopDiscrete", symbol: "\\gamma_S^{disc}", unit: "rad", meaning: "Berry phase of m = S from overlaps (rad)" },
    { name: "gammaTopExact", symbol: "-S\\,2\\pi(1-\\cos\\theta)", unit: "rad", meaning: "closed form for the circle (rad)" },
    { name: "maxDifference", symbol: "\\max|\\Delta\\gamma|", unit: "rad", meaning: "largest difference of the two methods over m (rad): 0 or pi (see piShiftedCount)" },
    { name: "piShiftedCount", symbol: "n_\\pi", unit: "", meaning: "number of m whose discrete phase is off by pi (product of d^S_mm(alpha) over the edges negative)" },
    { name: "identityResidual", symbol: "\\epsilon", unit: "rad", meaning: "largest |gamma_disc + m Omega - pi [sign]| over m: rounding only" },
    { name: "edgeArc", symbol: "\\alpha", unit: "rad", meaning: "arc of each geodesic edge (rad)" },
    { name: "mValues", symbol: "m", unit: "", kind: "array", meaning: "spin projections" },
    { name: "gammaGeometric", symbol: "\\gamma_m", unit: "rad", kind: "array", meaning: "-m Omega (rad)" },
    { name: "gammaDiscrete", symbol: "\\gamma_m^{disc}", unit: "rad", kind: "array", meaning: "-Im ln prod <u_i|u_i+1> (rad)" },
    { name: "gammaCircle", symbol: "\\gamma_m^{circle}", unit: "rad", kind: "array", meaning: "-m 2 pi (1 - cos theta) (rad)" },
    { name: "thetaSweep", symbol: "\\theta", unit: "rad", kind: "array", meaning: "cone half-angles of the sweep (rad)" },
    { name: "gammaTopSweep", symbol: "\\gamma_S(\\theta)", unit: "rad", kind: "array", meaning: "geometric phase of m = S over the sweep (rad, in (-pi, pi])" },
    { name: "gammaTopDiscreteSweep", symbol: "\\gamma_S^{disc}(\\theta)", unit: "rad", kind: "array", meaning: "discrete phase of m = S over the sweep (rad)" },
    { name: "gammaTopCircleSweep", symbol: "\\gamma_S^{circle}(\\theta)", unit: "rad", kind: "array", meaning: "closed form over the sweep (rad)" },
  ],
  plots: [
    { id: "phase-vs-m", title: "Berry phase of each m", x: "mValues", y: ["gammaGeometric", "gammaDiscrete", "gammaCircle"], mode: "markers" },
    {
      id: "phase-vs-theta",
      title: "Berry phase of m = S against the cone angle",
      x: "thetaSweep",
      y: ["gammaTopSweep", "gammaTopDiscreteSweep", "gammaTopCircleSweep"],
      yPeriod: 2 * Math.PI,
    },
  ],
  sweep: { over: ["theta"], points: 24 },
  assumptions: [
    "Adiabatic transport of the state |S, m> quantized along the moving axis; phases modulo 2 pi in (-pi, pi].",
    "Sign convention: gamma = -Im ln prod <u_i|u_i+1> = i oint <u|du>; Omega > 0 for counterclockwise loops seen from outside, so gamma = -m Omega.",
    "Derived (spinBerryPhase.ts): prod <u_i|u_i+1> = exp(i m Omega) prod_i d^S_mm(alpha_i) for a geodesic polygon, so the discrete phase is -m Omega exactly, or off by exactly pi when that product is negative (possible for |m| < S on coarse loops).",
  ],
  sources: berrySources,
  method: "Van Oosterom-Strackee solid angle of the geodesic polygon; Wigner-D spin-S states and the discrete product of overlaps",
  cost: (v, o) => {
    // per vertex a rotated spin-S basis ((2S+1)^2 entries, O(2S) each), per m an overlap chain
    const d = v.twoS! + 1,
      N = v.segments!,
      sweep = o.sweep?.points ?? 0;
    const driver = N / 4000 > d / 13 ? "segments" : "twoS";
    return {
      bytes: 16 * d * d * (N + 2) + 64 * N,
      steps: 20 * d * d * d * (N + sweep) + 50 * N,
      parameter: driver,
      what: `${N} loop vertices with ${d} x ${d} rotated spin states each`,
    };
  },
  compute: computeBerryLoop,
});

// ---------------------------------------------------------------- chern (Haldane phase diagram)
/** Largest grid the chern calculator refines to (the work bound). */
const CHERN_MAX_GRID = 1024;
function computeChern(v: InputValues, options: ComputeOptions = {}): ComputeOutput {
  const n = requireWholeAtLeast(v, "grid", 3, "grid points per reciprocal direction");
  const model = (M: number) => haldaneModel({ t1: 1, t2: v.t2!, phi: v.phi!, M });
  // work bound: grids up to 1024 x 1024 (about 1e6 two-band diagonalizations, a few seconds)
  const maxN = CHERN_MAX_GRID;
  const r = chernNumbersRefined(model(v.M!), { n, maxN });
  const Mc = haldaneCriticalMass(v.t2!, v.phi!);
  const closed = (M: number) => (Math.abs(M) < Mc ? -Math.sign(v.t2! * Math.sin(v.phi!)) : 0) + 0;
  const notes = [...r.notes];
  const values: ComputeOutput["values"] = {
    criticalMass: Mc,
    chernClosedForm: closed(v.M!),
    resolved:
      r.status === "ok"
        ? `resolved on the ${r.n1} x ${r.n2} grid (grids tried: ${r.gridsTried.join(", ")})`
        : r.stop === "gapless"
          ? "not resolved: the gap closes on the grid (no Chern number at a gap closing)"
          : `not resolved up to the ${maxN} x ${maxN} grid (the work bound): the gap is too small`,
    gridUsed: r.n1,
    gapK: 2 * Math.abs(v.M! - 3 * Math.sqrt(3) * v.t2! * Math.sin(v.phi!)),
    gapKprime: 2 * Math.abs(v.M! + 3 * Math.sqrt(3) * v.t2! * Math.sin(v.phi!)),
  };
  if (r.status === "ok") {
    values.chernLower = r.chern[0]!;
    values.chernUpper = r.chern[1]!;
  }
  if (options.sweep) {
    // The phase diagram runs 21+ grids: on its own (coarser) grid; unresolved points near the
    // boundary are reported, never guessed, so a coarse grid costs resolution, not correctness.
    const ns = v.sweepGrid === undefined ? 24 : requireWholeAtLeast(v, "sweepGrid", 3, "grid points per direction of the phase diagram");
    const Ms = sweepValues(chernSpec, options.sweep);
    const xs: number[] = [],
      cs: number[] = [],
      cf: number[] = [],
      un: number[] = [];
    for (const M of Ms) {
      const s = chernNumbers(model(M), { n1: ns, onUnresolved: "report" });
      if (s.status === "ok") {
        xs.push(M);
        cs.push(s.chern[0]!);
      } else un.push(M);
      cf.push(closed(M));
    }
    values.MSweep = Ms;
    values.chernClosedFormSweep = cf;
    values.MResolved = xs;
    values.chernSweep = cs;
    values.MUnresolved = un;
    if (un.length)
      notes.push(
        `${un.length} sweep points near |M| = ${Mc.toPrecision(4)} are not resolved on the ${ns} x ${ns} sweep grid and are left out of chernSweep (raise sweepGrid to resolve them).`,
      );
  }
  return { values, status: r.status === "ok" && notes.length === 0 ? "ok" : "warning", notes };
}

export const chernSpec = defineCalculator({
  id: "chern",
  title: "Chern numbers of the Haldane model",
  summary:
    "Chern numbers of the two bands of the Haldane model (honeycomb lattice, NN hopping t1 = 1, complex NNN hopping t2 e^{+-i phi}, sublattice mass M) by link variables on an n x n zone grid, the phase diagram against M, and the closed-form boundary |M| = 3 sqrt(3) |t2 sin phi|. Points the grid cannot resolve are reported, never guessed.",
  inputs: [
    { name: "t2", symbol: "t_2", unit: "", default: 0.1, min: 0.02, max: 0.3, scale: "linear", meaning: "next-nearest-neighbour hopping (units of t1)" },
    { name: "phi", symbol: "\\phi", unit: "rad", default: Math.PI / 2, min: -Math.PI, max: Math.PI, scale: "linear", meaning: "phase of the NNN hopping (rad)" },
    { name: "M", symbol: "M", unit: "", default: 0.2, min: -1.5, max: 1.5, scale: "linear", meaning: "sublattice (Semenoff) mass (units of t1)" },
    {
      name: "grid",
      symbol: "n",
      unit: "",
      default: 30,
      min: 12,
      max: 120,
      scale: "linear",
      kind: "integer",
      meaning: "first grid (points per reciprocal direction) for the Chern numbers at M; refined until resolved",
    },
    {
      name: "sweepGrid",
      symbol: "n_{sweep}",
      unit: "",
      default: 24,
      min: 12,
      max: 72,
      scale: "linear",
      kind: "integer",
      meaning: "grid points per direction for the phase diagram against M (refine to resolve points near the boundary)",
    },
  ],
  outputs: [
    { name: "chernLower", symbol: "C_-", unit: "", meaning: "Chern number of the lower band (omitted if unresolved)" },
    { name: "chernUpper", symbol: "C_+", unit: "", meaning: "Chern number of the upper band (omitted if unresolved)" },
    { name: "chernClosedForm", symbol: "C_-^{Haldane}", unit: "", meaning: "closed form -sgn(t2 sin phi) inside |M| < 3 sqrt3 |t2 sin phi|, 0 outside" },
    { name: "criticalMass", symbol: "M_c", unit: "", meaning: "3 sqrt(3) |t2 sin phi| (units of t1)" },
    { name: "gapK", symbol: "\\Delta_K", unit: "", meaning: "direct gap at K (units of t1)" },
    { name: "gapKprime", symbol: "\\Delta_{K'}", unit: "", meaning: "direct gap at K' (units of t1)" },
    { name: "resolved", symbol: "", unit: "", kind: "text", meaning: "whether the grid resolves the bands, and the grids tried" },
    { name: "gridUsed", symbol: "n_{used}", unit: "", meaning: "grid of the reported Chern numbers (after refinement)" },
    { name: "MSweep", symbol: "M", unit: "", kind: "array", meaning: "masses of the sweep" },
    { name: "chernClosedFormSweep", symbol: "C_-^{Haldane}(M)", unit: "rad", kind: "array", meaning: "closed form over the sweep (rad)" },
    { name: "MResolved", symbol: "M", unit: "", kind: "array", meaning: "sweep masses resolved on the grid" },
    { name: "chernSweep", symbol: "C_-(M)", unit: "", kind: "array", meaning: "lower-band Chern number at MResolved" },
    { name: "MUnresolved", symbol: "M", unit: "", kind: "array", meaning: "sweep masses the grid does not resolve" },
  ],
  plots: [
    { id: "phase-diagram", title: "Lower-band Chern number against M", x: "MResolved", y: ["chernSweep"], mode: "markers" },
    { id: "closed-form", title: "Closed form", x: "MSweep", y: ["chernClosedFormSweep"] },
  ],
  sweep: { over: ["M"], points: 21 },
  assumptions: [
    "Non-interacting tight-binding electrons (or any two-band Bloch system of this form); T = 0 band topology.",
    "Chern number in the (k1, k2) orientation of the right-handed basis a1 = (sqrt3/2, 3/2), a2 = (-sqrt3/2, 3/2); C = (1/2pi) int Omega with Omega = -2 Im <d1u|d2u>.",
  ],
  sources: ["F. D. M. Haldane, PRL 61, 2015 (1988)", "T. Fukui, Y. Hatsugai, H. Suzuki, J. Phys. Soc. Jpn. 74, 1674 (2005)"],
  method:
    "Fukui-Hatsugai-Suzuki link variables with resolution checks (gap, plaquette flux below 1 rad, gap vs band change per step), the grid refined until they hold (up to 1024 x 1024, the work bound); two-band eigenvectors in closed form",
  cost: (v, o) => {
    const g = v.grid!,
      sg = v.sweepGrid!,
      sweep = o.sweep?.points ?? 0;
    const cells = g * g + sweep * sg * sg;
    return {
      bytes: 200 * g * g + 80 * sg * sg,
      steps: 400 * cells,
      parameter: sweep * sg * sg > g * g ? "sweepGrid" : "grid",
      what: `${g}^2 k-points, plus ${sweep} sweep points of ${sg}^2`,
    };
  },
  compute: computeChern,
});

// ---------------------------------------------------------------- magnon-hall
function computeMagnonHall(v: InputValues, options: ComputeOptions = {}): ComputeOutput {
  const S = v.S!;
  const p = { J: v.J! * kB, D: v.D! * kB, S, zeeman: (v.g ?? 2) * muB * v.B! };
  const Ts = options.sweep ? sweepValues(magnonHallSpec, options.sweep) : [];
  const rtol = 1e-3;
  const c = honeycombMagnonHallConverged(p, [v.T!, ...Ts], { n0: 24, maxN: 192, rtol });
  const r = c.last;
  const notes = [...r.notes];
  const values: ComputeOutput["values"] = {
    gapAtK: r.gapAtK / kB,
    bandBottom: r.bandBottom / kB,
    bandTop: r.bandTop / kB,
    chernText: r.chern
      ? `C = (${r.chern[0]}, ${r.chern[1]}) for the (lower, upper) band`
      : r.status === "gapless"
        ? "undefined: the bands touch at K and K' (D = 0)"
        : "not resolved on the grid",
    zoneGrid: c.grids.at(-1)!,
    magnonDepletion: c.depletion[0]!,
  };
  if (c.kappaXY[0] !== null) {
    values.kappaXY = c.kappaXY[0]!;
    values.kappaXYReduced = c.kappaXYReduced[0]!;
    values.kappaXYReducedError = c.errorReduced[0]!;
  } else if (r.status === "unresolved") {
    notes.push(
      `kappa_xy is not given: the Berry curvature is not resolved on the ${c.grids.at(-1)} x ${c.grids.at(-1)} zone grid (gap too small), so the weighted zone sum cannot be trusted.`,
    );
  } else {
    notes.push(
      `kappa_xy is not given: it did not converge to the relative tolerance ${rtol} by the ${c.grids.at(-1)} x ${c.grids.at(-1)} zone grid (last change ${c.errorReduced[0]!.toExponential(2)} in units of k_B^2 T / hbar); the integrand is concentrated near the band bottom at this temperature.`,
    );
  }
  if (r.chern) {
    values.chernLower = r.chern[0];
    values.chernUpper = r.chern[1];
  }
  const width = (r.bandTop - r.bandBottom) / kB;
  if (kB * v.T! > 0.1 * (r.bandTop - r.bandBottom)) {
    notes.push(
      `k_B T = ${v.T!.toPrecision(3)} K is not small against the magnon band width ${width.toPrecision(3)} K: linear spin waves (non-interacting magnons) are not reliable here.`,
    );
  }
  if (c.depletion[0]! > 0.1)
    notes.push(
      `The thermal magnon population reduces the ordered moment by ${(100 * c.depletion[0]!).toPrecision(3)} % (delta S / S in LSWT): the spin-wave description of the ordered state is failing.`,
    );
  notes.push(
    "A single 2D layer: with isotropic exchange there is no long-range order at T > 0 (Mermin-Wagner); the ordered state assumed here is held by the magnon gap g muB B (or an anisotropy gap, or interlayer coupling in a crystal), and the magnon depletion grows like ln(k_B T / gap) as that gap closes.",
  );
  if (options.sweep) {
    values.TSweep = Ts;
    // unconverged points are left out (never guessed); TSweepConverged lists those that are given
    const keep = Ts.map((_, i) => c.kappaXY[i + 1] !== null);
    values.TSweepConverged = Ts.filter((_, i) => keep[i]);
    values.kappaXYSweep = Ts.flatMap((_, i) => (keep[i] ? [c.kappaXY[i + 1]!] : []));
    values.kappaXYReducedSweep = Ts.flatMap((_, i) => (keep[i] ? [c.kappaXYReduced[i + 1]!] : []));
    const left = keep.filter((k) => !k).length;
    if (left) notes.push(`${left} sweep temperatures did not converge to the tolerance by the ${c.grids.at(-1)} x ${c.grids.at(-1)} grid and are left out of the kappa sweep.`);
  }
  const warn = c.kappaXY[0] === null || r.status !== "ok" || notes.some((t) => /not reliable|failing|left out/.test(t));
  return { values, status: warn ? "warning" : "ok", notes };
}

export const magnonHallSpec = defineCalculator({
  id: "magnon-hall",
  title: "Topological magnons and thermal Hall effect of a honeycomb ferromagnet",
  summary:
    "Linear spin waves of a honeycomb ferromagnet with exchange J, next-nearest-neighbour DMI D (along z) and a field B along the magnetization: band range, gap at K, Chern numbers of the two bands, and the magnon thermal Hall conductivity kappa_xy per layer against temperature.",
  inputs: [
    { name: "J", symbol: "J/k_B", unit: "K", default: 14, min: 2, max: 60, scale: "linear", meaning: "nearest-neighbour ferromagnetic exchange, J / k_B" },
    { name: "D", symbol: "D/k_B", unit: "K", default: 2.2, min: -10, max: 10, scale: "linear", meaning: "next-nearest-neighbour DMI, D / k_B (sign flips the Chern numbers)" },
    choiceInput(
      "S",
      "S",
      [0.5, 1, 1.5, 2, 2.5, 3, 3.5].map((s) => ({ value: s, label: `S = ${s}` })),
      "spin length",
      { default: 2 },
    ),
    { name: "B", symbol: "B", unit: "T", default: 0.5, min: 0.01, max: 10, scale: "log", meaning: "field along the magnetization (gaps the Goldstone mode)" },
    { name: "T", symbol: "T", unit: "K", default: 10, min: 0.5, max: 100, scale: "log", meaning: "temperature" },
  ],
  outputs: [
    { name: "chernLower", symbol: "C_-", unit: "", meaning: "Chern number of the lower magnon band" },
    { name: "chernUpper", symbol: "C_+", unit: "", meaning: "Chern number of the upper magnon band" },
    { name: "chernText", symbol: "C", unit: "", kind: "text", meaning: "Chern numbers in words (or why undefined)" },
    { name: "gapAtK", symbol: "\\Delta_K/k_B", unit: "K", meaning: "gap 6 sqrt3 |D| S at K, K'" },
    { name: "bandBottom", symbol: "E_{min}/k_B", unit: "K", meaning: "lowest magnon energy (g muB B)" },
    { name: "bandTop", symbol: "E_{max}/k_B", unit: "K", meaning: "highest magnon energy" },
    { name: "kappaXY", symbol: "\\kappa_{xy}^{2D}", unit: "W/K", meaning: "thermal Hall conductivity per layer at T" },
    { name: "kappaXYReduced", symbol: "\\kappa_{xy}^{2D} \\hbar / (k_B^2 T)", unit: "", meaning: "the same in units of k_B^2 T / hbar", uncertainty: "kappaXYReducedError" },
    {
      name: "kappaXYReducedError",
      symbol: "\\delta(\\kappa_{xy} \\hbar / k_B^2 T)",
      unit: "",
      meaning: "error estimate of the reduced value (change between the last two Richardson values)",
    },
    { name: "zoneGrid", symbol: "n_k", unit: "", meaning: "finest zone grid used (points per direction)" },
    { name: "magnonDepletion", symbol: "\\delta S / S", unit: "", meaning: "thermal reduction of the ordered moment in LSWT at T (small for the theory to hold)" },
    { name: "TSweep", symbol: "T", unit: "K", kind: "array", meaning: "temperatures of the sweep" },
    { name: "TSweepConverged", symbol: "T", unit: "K", kind: "array", meaning: "sweep temperatures where kappa_xy converged" },
    { name: "kappaXYSweep", symbol: "\\kappa_{xy}(T)", unit: "W/K", kind: "array", meaning: "kappa_xy per layer over the sweep" },
    { name: "kappaXYReducedSweep", symbol: "\\kappa_{xy} \\hbar/(k_B^2 T)", unit: "", kind: "array", meaning: "reduced kappa_xy over the sweep" },
  ],
  plots: [{ id: "kappa-vs-T", title: "Magnon thermal Hall conductivity per layer", x: "TSweepConverged", y: ["kappaXYSweep"], xLog: true }],
  sweep: { over: ["T"], points: 12 },
  assumptions: [
    "Linear spin-wave theory about the fully polarized state (no magnon interactions); valid for k_B T well below the band width ~6 J S.",
    "2D conductivity per layer in W/K (divide by the layer spacing for W/(K m)); g = 2; zone grids 24, 48, 96, 192 per direction (the work bound), Richardson-extrapolated in pairs until two successive values agree to 1e-3 relative (not given otherwise).",
    "Strictly 2D layer: long-range order at T > 0 only through a gap (field, anisotropy) or interlayer coupling (Mermin-Wagner).",
    "kappa_xy = -(k_B^2 T / hbar) sum_n int d^2k/(2pi)^2 c2(rho_n) Omega_n (Matsumoto-Murakami).",
  ],
  sources: [
    "R. Matsumoto, S. Murakami, PRL 106, 197202 (2011)",
    "S. A. Owerre, J. Phys.: Condens. Matter 28, 386001 (2016)",
    "S. K. Kim, H. Ochoa, R. Zarzuela, Y. Tserkovnyak, PRL 117, 227201 (2016)",
    "T. Fukui, Y. Hatsugai, H. Suzuki, J. Phys. Soc. Jpn. 74, 1674 (2005)",
  ],
  method:
    "Holstein-Primakoff LSWT (Haldane-type two-band model), link-variable Berry curvature, c2-weighted zone sum on doubling grids with Richardson extrapolation to a stated tolerance",
  limits: {
    J: { above: 0, why: "a ferromagnetic exchange J/k_B" },
    B: { above: 0, why: "a field that gaps the Goldstone magnon" },
    T: { above: 0, why: "a temperature" },
  },
  compute: computeMagnonHall,
});

// ---------------------------------------------------------------- spin-tunnel
function computeSpinTunnel(v: InputValues, options: ComputeOptions = {}): ComputeOutput {
  const p = { S: v.S!, D: v.D! * kB, E: v.E! * kB, C: (v.C ?? 0) * kB, g: 2 };
  const phiB = v.misalignment ?? 0;
  if (!Number.isFinite(phiB) || Math.abs(phiB) > Math.PI / 2) throw new InputError("misalignment", phiB, "a field azimuth from the hard axis x within [-pi/2, pi/2] rad");
  const aligned = phiB === 0;
  const dir: [number, number, number] = [Math.cos(phiB), Math.sin(phiB), 0];
  const half = Math.round(2 * p.S) % 2 === 1;
  const notes: string[] = [];
  const values: ComputeOutput["values"] = { gargPeriod: gargQuenchingPeriod(p) };
  /** Fields where the splitting vanishes or is smallest: the curve is refined around them. */
  let dips: number[] = [];
  if (aligned) {
    const q = hardAxisQuenchingFields(p, v.Bmax!, 6);
    values.zeros = q.zeros;
    values.zeroCount = q.zeros.length;
    dips = q.zeros;
    if (q.spacings.length) {
      values.meanPeriod = q.meanPeriod;
      values.deviation = q.deviation;
      if (p.C === 0)
        notes.push(
          "For C = 0 the zeros are exact and equally spaced with exactly Garg's period (Kececioglu and Garg, PRB 63, 064422 (2001)): `deviation` is rounding of the numerics, not a physical correction.",
        );
      else
        notes.push(
          `C != 0: Garg's period is that of the quadratic Hamiltonian; the deviation ${(q.deviation * 100).toPrecision(3)} % is the effect of the fourth-order term (spacings from ${Math.min(...q.spacings).toPrecision(5)} to ${Math.max(...q.spacings).toPrecision(5)} T).`,
        );
    } else notes.push("fewer than two quenching fields below Bmax: raise Bmax to measure the period");
  } else {
    const mins = splittingMinima(p, v.Bmax!, dir, 120);
    values.zeros = [];
    values.zeroCount = 0;
    values.minimumFields = mins.fields;
    dips = mins.fields;
    values.minimumSplittings = mins.splittings.map((x) => x / kB);
    notes.push(
      `The field is ${phiB.toPrecision(3)} rad off the hard axis: the parity symmetry is broken, so the splitting has minima of finite depth instead of zeros (minimumFields, minimumSplittings).`,
    );
    if (mins.splittings.some((x, i) => x < 10 * mins.resolution[i]!))
      notes.push("Some minima are within 10x the double-precision resolution of the splitting and cannot be told from zero.");
    if (mins.fields.length >= 2) {
      values.meanPeriod = (mins.fields.at(-1)! - mins.fields[0]!) / (mins.fields.length - 1);
      values.deviation = values.meanPeriod / (values.gargPeriod as number) - 1;
    }
  }
  // At B = 0 a half-integer spin is a Kramers doublet (time reversal, any C): exactly degenerate.
  values.splittingZeroField = half ? 0 : hardAxisTunnelSplitting(p, 0).splitting / kB;
  if (half) notes.push("Half-integer S: the zero-field splitting is exactly 0 (Kramers degeneracy), not computed.");
  {
    // Over [0, Bmax] (the field range of this calculator): 60 even points, refined where the curve
    // needs it: geometric steps toward each zero (minimum) found above, down to 1e-4 of the period,
    // then midpoints wherever neighbours differ by more than 0.4 decades (at most 640 points in
    // all). On a log scale a zero is a dip to the resolution floor; even sampling misses its depth.
    void options;
    const Bmax = v.Bmax!;
    const logAt = (B: number): number => {
      const t = aligned ? hardAxisTunnelSplitting(p, B) : tunnelSplittingAnyField(p, [B * dir[0], B * dir[1], 0]);
      return Math.log10(Math.max(t.splitting, t.resolution) / kB);
    };
    const curve = new Map<number, number>();
    const add = (B: number) => {
      if (B >= 0 && B <= Bmax && !curve.has(B)) curve.set(B, logAt(B));
    };
    for (let i = 0; i < 60; i++) add((Bmax * i) / 59);
    const scale = Number.isFinite(values.gargPeriod as number) && (values.gargPeriod as number) > 0 ? Math.min(values.gargPeriod as number, Bmax) : Bmax / 10;
    for (const z of dips) {
      add(z);
      for (const f of [0.1, 0.03, 0.01, 3e-3, 1e-3, 3e-4, 1e-4]) {
        add(z - f * scale);
        add(z + f * scale);
      }
    }
    const BUDGET = 640;
    for (let round = 0; round < 8 && curve.size < BUDGET; round++) {
      const xs = [...curve.keys()].sort((a, b) => a - b);
      let added = 0;
      for (let i = 1; i < xs.length && curve.size < BUDGET; i++) {
        const a = xs[i - 1]!,
          b = xs[i]!;
        if (b - a > 1e-7 * Bmax && Math.abs(curve.get(b)! - curve.get(a)!) > 0.4) {
          add((a + b) / 2);
          added++;
        }
      }
      if (added === 0) break;
    }
    const Bs = [...curve.keys()].sort((a, b) => a - b);
    const logSplit = Bs.map((B) => curve.get(B)!);
    const l0: number[] = [],
      l1: number[] = [],
      l2: number[] = [];
    const levels = giantSpinLevels(p, Bs, dir);
    for (let i = 0; i < Bs.length; i++) {
      l0.push(levels[i]![0]! / kB);
      l1.push(levels[i]![1]! / kB);
      l2.push(levels[i]![2]! / kB);
    }
    values.BSweep = Bs;
    values.log10Splitting = logSplit;
    values.level0 = l0;
    values.level1 = l1;
    values.level2 = l2;
  }
  const warn = notes.some((t) => /raise Bmax|cannot be told/.test(t));
  return { values, status: warn ? "warning" : "ok", notes };
}

export const spinTunnelSpec = defineCalculator({
  id: "spin-tunnel",
  title: "Quenching of spin tunnelling by a hard-axis field",
  summary:
    "Giant spin H = -D Sz^2 + E (Sx^2 - Sy^2) + C (S+^4 + S-^4) - g muB B.S (B at azimuth phi_B from the hard axis x in the hard plane) by exact diagonalization: tunnel splitting of the ground doublet against the hard-axis field, its zeros (root finding on the signed splitting of the two parity sectors) and their period against Garg's semiclassical (2 k_B / g muB) sqrt(2E(E + D)).",
  inputs: [
    choiceInput(
      "S",
      "S",
      [4, 4.5, 5, 5.5, 6, 6.5, 7, 7.5, 8, 8.5, 9, 9.5, 10, 10.5, 11, 11.5, 12].map((s) => ({ value: s, label: `S = ${s}` })),
      "spin of the molecule",
      { default: 9 },
    ),
    { name: "D", symbol: "D/k_B", unit: "K", default: 0.42, min: 0.05, max: 1, scale: "linear", meaning: "axial (easy-axis) anisotropy" },
    { name: "E", symbol: "E/k_B", unit: "K", default: 0.04, min: 0.005, max: 0.2, scale: "linear", meaning: "rhombic anisotropy (x hard axis)" },
    { name: "Bmax", symbol: "B_{max}", unit: "T", default: 1.5, min: 0.2, max: 3, scale: "linear", meaning: "largest hard-axis field searched" },
    { name: "C", symbol: "C/k_B", unit: "K", default: 0, min: -2e-4, max: 2e-4, scale: "linear", meaning: "fourth-order transverse anisotropy C (S+^4 + S-^4)" },
    {
      name: "misalignment",
      symbol: "\\varphi_B",
      unit: "rad",
      default: 0,
      min: 0,
      max: 0.3,
      scale: "linear",
      meaning: "field azimuth from the hard axis x toward the medium axis y (rad)",
    },
  ],
  outputs: [
    { name: "gargPeriod", symbol: "\\Delta B_{Garg}", unit: "T", meaning: "semiclassical quenching period" },
    { name: "meanPeriod", symbol: "\\Delta B", unit: "T", meaning: "mean spacing of the zeros (of the minima for a misaligned field)" },
    {
      name: "deviation",
      symbol: "\\Delta B/\\Delta B_{Garg} - 1",
      unit: "",
      meaning: "relative deviation from Garg: rounding for C = 0 (the zeros are exact), the effect of C otherwise",
    },
    { name: "zeroCount", symbol: "n_0", unit: "", meaning: "number of zeros in (0, Bmax]" },
    { name: "zeros", symbol: "B_k", unit: "T", kind: "array", meaning: "quenching fields" },
    { name: "splittingZeroField", symbol: "\\Delta_0/k_B", unit: "K", meaning: "ground tunnel splitting at B = 0 (exactly 0 for half-integer S: Kramers)" },
    { name: "minimumFields", symbol: "B_k^{min}", unit: "T", kind: "array", meaning: "fields of the splitting minima (misaligned field only)", optional: true },
    { name: "minimumSplittings", symbol: "\\Delta_k^{min}/k_B", unit: "K", kind: "array", meaning: "splitting at each minimum (misaligned field only)", optional: true },
    { name: "BSweep", symbol: "B_x", unit: "T", kind: "array", meaning: "hard-axis fields of the sweep" },
    { name: "log10Splitting", symbol: "\\log_{10}(\\Delta/k_B\\,[K])", unit: "", kind: "array", meaning: "log10 of the splitting in K (floored at the resolution)" },
    { name: "level0", symbol: "E_0/k_B", unit: "K", kind: "array", meaning: "lowest level" },
    { name: "level1", symbol: "E_1/k_B", unit: "K", kind: "array", meaning: "second level" },
    { name: "level2", symbol: "E_2/k_B", unit: "K", kind: "array", meaning: "third level" },
  ],
  plots: [
    { id: "splitting", title: "Ground tunnel splitting against the hard-axis field", x: "BSweep", y: ["log10Splitting"] },
    { id: "levels", title: "Lowest levels against the hard-axis field", x: "BSweep", y: ["level0", "level1", "level2"] },
  ],
  assumptions: [
    "Single-spin (giant spin) Hamiltonian, no hyperfine or intermolecular couplings, T = 0; g = 2.",
    "For C = 0 and the field along x the zeros are exact with Garg's period (E. Kececioglu, A. Garg, PRB 63, 064422 (2001)); C changes the period; a misaligned field (phi_B != 0) breaks the parity symmetry and leaves minima, computed in double precision.",
    "Field along the hard axis x (phi_B = 0): splittings resolved down to ~1e-29 D S^2: lowest level of each parity block as the double-double Rayleigh quotient of its double-precision eigenvector (error ~ residual^2 / gap, bounded a posteriori).",
  ],
  sources: ["A. Garg, EPL 22, 205 (1993)", "W. Wernsdorfer, R. Sessoli, Science 284, 133 (1999)", "E. Kececioglu, A. Garg, PRB 63, 064422 (2001)"],
  method: "exact diagonalization of the P-symmetric and antisymmetric blocks (banded solver, double-double Rayleigh quotients), sign changes + Brent",
  limits: {
    D: { above: 0, why: "an easy-axis anisotropy D/k_B (the model needs an easy axis)" },
    E: { above: 0, why: "a rhombic anisotropy E/k_B (with E = 0 the splitting has no quenching fields to find)" },
    Bmax: { above: 0, why: "the largest field searched" },
  },
  compute: computeSpinTunnel,
});

// ---------------------------------------------------------------- easy-plane
function computeEasyPlane(v: InputValues, options: ComputeOptions = {}): ComputeOutput {
  const S = requireWholeAtLeast(v, "twoS", 1, "twice the spin: 1 for S = 1/2") / 2;
  const D = v.D! * kB;
  const gm = 2 * muB;
  const b = gm * v.B!;
  const half = v.twoS! % 2 === 1;
  const exact = easyPlaneMagnetization(S, D, b, v.T!);
  const rotor = rotorMagnetization(D, b, v.T!, half).value;
  const trunc = rotorTruncation(S, D, b, v.T!);
  const notes: string[] = [];
  if (trunc > 1e-12)
    notes.push(
      `outside the rotor limit: the levels beyond |m| = S carry ${trunc.toExponential(2)} of the rotor's Boltzmann weight, so the finite spin differs from the rotor form (rotorDifference is that difference, not an error of either)`,
    );
  const values: ComputeOutput["values"] = {
    groundM: easyPlaneGroundM(S, D, b),
    szExact: exact,
    szRotor: rotor,
    rotorDifference: exact - rotor,
    truncation: trunc,
    crossingFields: easyPlaneCrossings(S, D).map((x) => x / gm),
  };
  if (options.sweep) {
    const Bs = sweepValues(easyPlaneSpec, options.sweep);
    values.BSweep = Bs;
    values.szSweep = Bs.map((B) => easyPlaneMagnetization(S, D, gm * B, v.T!));
    values.szRotorSweep = Bs.map((B) => rotorMagnetization(D, gm * B, v.T!, half).value);
    values.groundMSweep = Bs.map((B) => easyPlaneGroundM(S, D, gm * B));
  }
  return { values, status: notes.length ? "warning" : "ok", notes };
}

export const easyPlaneSpec = defineCalculator({
  id: "easy-plane",
  title: "Easy-plane spin in a hard-axis field: steps and rotor form",
  summary:
    "H = D Sz^2 - g muB B Sz: level crossings at g muB B = D (2m + 1), the T = 0 magnetization staircase, and <Sz>(B, T) by the exact finite sum and by the rotor (Jacobi theta function) form; integer and half-integer spins differ by a half step.",
  inputs: [
    { name: "twoS", symbol: "2S", unit: "", default: 20, min: 1, max: 60, scale: "linear", kind: "integer", meaning: "twice the spin (odd = half-integer spin)" },
    { name: "D", symbol: "D/k_B", unit: "K", default: 1, min: 0.1, max: 5, scale: "linear", meaning: "easy-plane anisotropy (z hard axis)" },
    { name: "B", symbol: "B", unit: "T", default: 2, min: 0, max: 20, scale: "linear", meaning: "field along the hard axis z (g = 2)" },
    { name: "T", symbol: "T", unit: "K", default: 0.5, min: 0.02, max: 20, scale: "log", meaning: "temperature" },
  ],
  outputs: [
    { name: "groundM", symbol: "m_0", unit: "", meaning: "T = 0 ground-state Sz" },
    { name: "szExact", symbol: "\\langle S_z\\rangle", unit: "", meaning: "thermal <Sz>, exact sum over m = -S..S" },
    { name: "szRotor", symbol: "\\langle S_z\\rangle_{rotor}", unit: "", meaning: "rotor (theta function) form" },
    { name: "rotorDifference", symbol: "\\delta", unit: "", meaning: "exact minus rotor" },
    { name: "truncation", symbol: "w_{|m|>S}", unit: "", meaning: "fraction of the rotor's Boltzmann weight on the levels beyond |m| = S (0 in the rotor limit)" },
    { name: "crossingFields", symbol: "B_m", unit: "T", kind: "array", meaning: "level-crossing fields D (2m + 1) / (g muB)" },
    { name: "BSweep", symbol: "B", unit: "T", kind: "array", meaning: "fields of the sweep" },
    { name: "szSweep", symbol: "\\langle S_z\\rangle(B)", unit: "", kind: "array", meaning: "exact <Sz> over the sweep" },
    { name: "szRotorSweep", symbol: "\\langle S_z\\rangle_{rotor}(B)", unit: "", kind: "array", meaning: "rotor form over the sweep" },
    { name: "groundMSweep", symbol: "m_0(B)", unit: "", kind: "array", meaning: "T = 0 staircase" },
  ],
  plots: [{ id: "steps", title: "Magnetization steps", x: "BSweep", y: ["szSweep", "szRotorSweep", "groundMSweep"] }],
  sweep: { over: ["B"], points: 200 },
  assumptions: ["Single spin, no transverse anisotropy (Sz conserved), g = 2, thermal equilibrium."],
  sources: ["E. T. Whittaker, G. N. Watson, A Course of Modern Analysis (1927), ch. 21"],
  method:
    "exact Boltzmann sums; rotor form from whichever of its two equal series converges without cancellation: the direct sum over m for beta D >= pi, the Poisson-dual theta series x + (pi / 2 beta D) theta'/theta below (accurate to ~1e-15 (1 + |x|) at every beta D)",
  limits: {
    D: { above: 0, why: "an easy-plane anisotropy D/k_B" },
    T: { above: 0, why: "a temperature" },
  },
  cost: (v, o) => {
    // Boltzmann sums over the 2S+1 levels at each field, a few exponentials per level
    const d = v.twoS! + 1,
      fields = (o.sweep?.points ?? 0) + 4;
    return { bytes: 8 * (d + 4 * fields) + 8 * d, steps: 30 * d * fields, parameter: "twoS", what: `${d} levels at ${fields} fields` };
  },
  compute: computeEasyPlane,
});

/** Calculator specs of the berry domain. */
export const berryCalculators = [berryLoopSpec, chernSpec, magnonHallSpec, spinTunnelSpec, easyPlaneSpec];
