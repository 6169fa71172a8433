/**
 * Calculators of the lattice domain (lib/src/lattices): `dipolar-lattice` (Ewald dipolar bands of a
 * two-dimensional lattice and its Luttinger-Tisza ground state) and `field-tuned-order` (ordered
 * windows of an easy-plane antiferromagnet against field in site-decoupled mean field, with the
 * Bose-Hubbard Mott lobes of the boson mapping).
 */
import type { ComputeOutput, InputValues } from "./spec.js";
import { defineCalculator, choiceInput } from "./spec.js";
import { InputError } from "../errors.js";
import { kB, mu0, muB } from "../quantity/constants.js";
import { dipolarBands, fractionalToQ, latticePreset, luttingerTisza, type Lattice2D } from "../lattices/dipolar.js";
import { easyPlaneMeanField, mottLobeBoundary, mottLobeTip, orderingTemperature, spinOneCriticalFields } from "../lattices/meanField.js";

const latticeNames = ["square", "triangular", "honeycomb"] as const;

function dipolarPath(lat: Lattice2D): { labels: string[]; points: Array<[number, number]> } {
  if (lat.name === "square")
    return {
      labels: ["G", "X", "M", "G"],
      points: [
        [0, 0],
        [0.5, 0],
        [0.5, 0.5],
        [0, 0],
      ],
    };
  return {
    labels: ["G", "M", "K", "G"],
    points: [
      [0, 0],
      [0.5, 0],
      [2 / 3, 1 / 3],
      [0, 0],
    ],
  };
}

function computeDipolar(v: InputValues): ComputeOutput {
  const name = latticeNames[v.lattice!];
  if (!name) throw new InputError("lattice", v.lattice, "0 (square), 1 (triangular) or 2 (honeycomb)");
  const lat = latticePreset(name);
  const grid = v.grid!;
  if (!Number.isInteger(grid) || grid < 4 || grid > 60) throw new InputError("grid", grid, "a whole number of zone points per direction, 4 to 60");
  // energy unit D = mu0 mu^2 / (4 pi d^3), mu in muB, d in m
  const mu = v.moment! * muB;
  const DK = (mu0 * mu * mu) / (4 * Math.PI * v.d! ** 3) / kB;
  const lt = luttingerTisza(lat, grid);
  const path = dipolarPath(lat);
  const per = 20;
  const dist: number[] = [];
  const nb = 3 * lat.basis.length;
  const bands: number[][] = Array.from({ length: nb }, () => []);
  let s = 0;
  let prev: [number, number] | null = null;
  for (let seg = 0; seg < path.points.length - 1; seg++) {
    const [p0, p1] = [path.points[seg]!, path.points[seg + 1]!];
    for (let k = 0; k < per + (seg === path.points.length - 2 ? 1 : 0); k++) {
      const t = k / per;
      const f: [number, number] = [p0[0] + t * (p1[0] - p0[0]), p0[1] + t * (p1[1] - p0[1])];
      const q = fractionalToQ(lat, f[0], f[1]);
      if (prev) s += Math.hypot(q[0] - prev[0], q[1] - prev[1]);
      prev = q;
      dist.push(s);
      const vals = dipolarBands(lat, q).values;
      for (let b = 0; b < nb; b++) bands[b]!.push(vals[b]!);
    }
  }
  const values: ComputeOutput["values"] = {
    lambdaMin: lt.lambdaMin,
    energyPerSite: lt.energyPerSite,
    energyPerSiteK: lt.energyPerSite * DK,
    dipolarUnitK: DK,
    qMinFractional: lt.fractional[0]!,
    degeneracy: lt.degeneracy,
    spinLengthSpread: lt.spinLengthSpread,
    pathDistance: dist,
  };
  bands.forEach((b, i) => (values[`band${i + 1}`] = b));
  values.summary = `${name}: LT minimum lambda = ${lt.lambdaMin.toPrecision(7)} D at q = (${lt.fractional[0]!.map((x) => x.toFixed(4)).join(", ")}) b-coordinates, energy ${lt.energyPerSite.toPrecision(6)} D = ${(lt.energyPerSite * DK).toPrecision(4)} K per moment; spin-length spread ${lt.spinLengthSpread.toExponential(1)}; path ${path.labels.join("-")}`;
  const notes = [...lt.notes];
  if (name === "honeycomb")
    notes.push(
      "in-plane honeycomb: the LT state at K is not unique: a global phase of the K mode rotates the two sublattices in opposite senses at equal energy (continuous counter-rotating family)",
    );
  return { values, status: lt.spinLengthSpread > 1e-6 ? "warning" : "ok", notes };
}

export const dipolarLatticeSpec = defineCalculator({
  id: "dipolar-lattice",
  title: "Dipolar interaction on a two-dimensional lattice: Ewald bands and the Luttinger-Tisza ground state",
  summary:
    "J^{ab}(q) of classical point dipoles (three components, lattice in the plane) by two-dimensional Ewald summation for the square, triangular and honeycomb lattices; its eigen-bands along a path through the zone; the Luttinger-Tisza minimum over the zone with the spin-length check (the bound is the ground state when all moments come out of equal length).",
  inputs: [
    choiceInput("lattice", "\\text{lattice}", ["square", "triangular", "honeycomb"], "lattice preset (lengths in the nearest-neighbour distance d)", { default: 2 }),
    { name: "moment", symbol: "\\mu", unit: "", default: 7, min: 0.1, max: 12, scale: "linear", meaning: "moment per site in Bohr magnetons" },
    { name: "d", symbol: "d", unit: "m", default: 4e-10, min: 2e-10, max: 2e-9, scale: "log", meaning: "nearest-neighbour distance" },
    { name: "grid", symbol: "n_q", unit: "", default: 12, min: 4, max: 60, scale: "linear", kind: "integer", meaning: "zone points per direction of the LT search (then refined)" },
  ],
  outputs: [
    { name: "summary", symbol: "", unit: "", kind: "text", meaning: "LT minimum, its wavevector and energy" },
    { name: "lambdaMin", symbol: "\\lambda_{min}", unit: "", meaning: "lowest eigenvalue of J(q) over the zone, units D = mu0 mu^2 / (4 pi d^3)" },
    { name: "energyPerSite", symbol: "E/N", unit: "", meaning: "LT energy per moment, units D" },
    { name: "energyPerSiteK", symbol: "E/N k_B", unit: "K", meaning: "LT energy per moment in kelvin" },
    { name: "dipolarUnitK", symbol: "D/k_B", unit: "K", meaning: "dipolar energy unit mu0 mu^2 / (4 pi d^3 k_B)" },
    { name: "qMinFractional", symbol: "q_{min}", unit: "", kind: "array", meaning: "LT wavevector in units of the reciprocal vectors b1, b2" },
    { name: "degeneracy", symbol: "g", unit: "", meaning: "degeneracy of the lowest eigenvalue at q_min" },
    { name: "spinLengthSpread", symbol: "\\delta|S|", unit: "", meaning: "max |S| / min |S| - 1 of the LT state (0: the bound is reached)" },
    { name: "pathDistance", symbol: "|q|", unit: "", kind: "array", meaning: "distance along the zone path (1/d)" },
    ...Array.from({ length: 6 }, (_, i) => ({
      name: `band${i + 1}`,
      symbol: `\\lambda_${i + 1}(q)`,
      unit: "",
      kind: "array" as const,
      meaning: `band ${i + 1} of J(q), units D (bands beyond 3 x basis absent)`,
    })),
  ],
  plots: [{ id: "bands", title: "Dipolar bands along the zone path", x: "pathDistance", y: Array.from({ length: 6 }, (_, i) => `band${i + 1}`) }],
  assumptions: [
    "Classical point dipoles of fixed length on a rigid two-dimensional lattice, dipolar interaction only (no exchange, no anisotropy).",
    "Luttinger-Tisza: the lowest eigenvalue of J(q) bounds the energy from below; it is the ground state only when the spin-length check passes.",
  ],
  sources: ["D. Parry, Surf. Sci. 49, 433 (1975)", "K. De'Bell, A. MacIsaac, J. Whitehead, Rev. Mod. Phys. 72, 225 (2000)", "J. Luttinger, L. Tisza, Phys. Rev. 70, 954 (1946)"],
  method: "two-dimensional Ewald summation (erfc / erf split, Poisson summation over the plane), Hermitian diagonalization, zone grid + local refinement",
  limits: { moment: { above: 0, why: "a moment" }, d: { above: 0, why: "a distance" } },
  compute: computeDipolar,
});

// ------------------------------------------------------------------ field-tuned-order
const spinChoices = Array.from({ length: 10 }, (_, i) => ({ value: (i + 1) / 2, label: (i + 1) % 2 === 0 ? String((i + 1) / 2) : `${i + 1}/2` }));

function computeFieldOrder(v: InputValues): ComputeOutput {
  const p = { S: v.S!, D: v.D!, zJ: v.zJ!, Delta: v.Delta! };
  if (!(p.zJ >= 0)) throw new InputError("zJ", p.zJ, "an antiferromagnetic exchange zJ >= 0 K");
  if (!(v.Bmax! > 0)) throw new InputError("Bmax", v.Bmax, "a positive largest field");
  const zeemanK = (v.g! * muB) / kB; // h = g muB B / k_B
  const pts = 121;
  const fields = Array.from({ length: pts }, (_, i) => (v.Bmax! * i) / (pts - 1));
  const states: ReturnType<typeof easyPlaneMeanField>[] = [];
  for (const B of fields)
    states.push(easyPlaneMeanField(p, zeemanK * B, states[states.length - 1] ? { mz: states[states.length - 1]!.mz, mPerp: states[states.length - 1]!.mPerp } : undefined));
  const mPerp = states.map((s) => s.mPerp);
  const mz = states.map((s) => s.mz);
  // ordered windows: runs with m_perp > 1e-6
  const windows: Array<[number, number]> = [];
  let start: number | null = null;
  mPerp.forEach((m, i) => {
    if (m > 1e-6 && start === null) start = fields[i]!;
    if ((m <= 1e-6 || i === pts - 1) && start !== null) {
      windows.push([start, m > 1e-6 ? fields[i]! : fields[i - 1]!]);
      start = null;
    }
  });
  const Tc = fields.map((B) => orderingTemperature(p, zeemanK * B));
  const values: ComputeOutput["values"] = { fieldGrid: fields, mPerp, mz, orderingTemperature: Tc, maxOrderingTemperature: Math.max(...Tc) };
  const notes = [
    "site-decoupled mean field at T = 0: it overestimates order; in two dimensions the finite-temperature transition is of the Berezinskii-Kosterlitz-Thouless kind; dipolar S+S+ terms break the U(1) symmetry, so the condensate picture is then approximate",
    `ordered windows from a ${pts}-point field grid (edges to within ${(v.Bmax! / (pts - 1)).toPrecision(3)} T)`,
  ];
  values.windows = windows.length ? windows.map(([a, b]) => `${a.toPrecision(4)} T to ${b.toPrecision(4)} T`).join("; ") : "no ordered window below Bmax";
  if (p.S === 1 && p.D > 0) {
    const { hc1, hc2 } = spinOneCriticalFields(p.D, p.zJ, p.Delta);
    values.Bc1 = hc1 / zeemanK;
    values.Bc2 = hc2 / zeemanK;
    notes.push("spin 1 closed forms: h_c1 = sqrt(D^2 - 2 D zJ), h_c2 = D + zJ (1 + Delta) (h = g muB B)");
  }
  // Bose-Hubbard lobes of the mapping (units U)
  const xs = Array.from({ length: 151 }, (_, i) => (3 * i) / 150);
  values.muOverU = xs;
  for (const n of [1, 2, 3]) values[`lobe${n}`] = xs.map((x) => mottLobeBoundary(n, x));
  values.lobeTip1 = mottLobeTip(1).ztOverU;
  return { values, status: "ok", notes };
}

export const fieldTunedOrderSpec = defineCalculator({
  id: "field-tuned-order",
  title: "Field-tuned order of an easy-plane antiferromagnet (spins as bosons), with the Mott lobes",
  summary:
    "Single-ion D S_z^2 - h S_z with antiferromagnetic exchange zJ (XXZ, anisotropy Delta) in site-decoupled mean field at T = 0: the staggered transverse moment (the condensate) and the uniform moment against field, the ordered windows where single-ion levels cross and the gapped plateaus between; spin-1 critical fields in closed form; the Bose-Hubbard Mott-lobe boundaries z t / U = (n - x)(x - n + 1)/(1 + x) of the decoupling approximation.",
  inputs: [
    choiceInput("S", "S", spinChoices, "spin", { default: 1 }),
    { name: "D", symbol: "D", unit: "K", default: 10, min: 0, max: 30, scale: "linear", meaning: "easy-plane single-ion anisotropy (E / k_B)" },
    { name: "zJ", symbol: "zJ", unit: "K", default: 2, min: 0, max: 10, scale: "linear", meaning: "antiferromagnetic exchange summed over neighbours (E / k_B)" },
    { name: "Delta", symbol: "\\Delta", unit: "", default: 1, min: 0, max: 2, scale: "linear", meaning: "longitudinal exchange anisotropy (1: Heisenberg)" },
    { name: "g", symbol: "g", unit: "", default: 2, min: 0.5, max: 10, scale: "linear", meaning: "g-factor along the field (z)" },
    { name: "Bmax", symbol: "B_{max}", unit: "T", default: 15, min: 0.5, max: 60, scale: "linear", meaning: "largest field" },
  ],
  outputs: [
    { name: "windows", symbol: "", unit: "", kind: "text", meaning: "ordered field windows" },
    { name: "Bc1", symbol: "B_{c1}", unit: "T", meaning: "spin 1: onset of order (closed form)" },
    { name: "Bc2", symbol: "B_{c2}", unit: "T", meaning: "spin 1: saturation field (closed form)" },
    { name: "fieldGrid", symbol: "B", unit: "T", kind: "array", meaning: "fields" },
    { name: "mPerp", symbol: "m_\\perp", unit: "", kind: "array", meaning: "staggered transverse moment per site (order parameter)" },
    { name: "mz", symbol: "m_z", unit: "", kind: "array", meaning: "uniform moment per site along the field" },
    { name: "orderingTemperature", symbol: "T_c(B)", unit: "K", kind: "array", meaning: "mean-field ordering temperature against field (z J chi_perp = 1 of the paramagnet)" },
    { name: "maxOrderingTemperature", symbol: "T_c^{max}", unit: "K", meaning: "top of the ordering domes" },
    { name: "muOverU", symbol: "\\mu/U", unit: "", kind: "array", meaning: "chemical potential of the boson lobes" },
    { name: "lobe1", symbol: "zt/U|_{n=1}", unit: "", kind: "array", meaning: "boundary of the n = 1 Mott lobe" },
    { name: "lobe2", symbol: "zt/U|_{n=2}", unit: "", kind: "array", meaning: "boundary of the n = 2 Mott lobe" },
    { name: "lobe3", symbol: "zt/U|_{n=3}", unit: "", kind: "array", meaning: "boundary of the n = 3 Mott lobe" },
    { name: "lobeTip1", symbol: "(zt/U)_c", unit: "", meaning: "tip of the n = 1 lobe, (sqrt 2 - 1)^2" },
  ],
  plots: [
    { id: "order", title: "Order parameter and magnetization against field", x: "fieldGrid", y: ["mPerp", "mz"] },
    { id: "domes", title: "Ordering temperature against field", x: "fieldGrid", y: ["orderingTemperature"] },
    { id: "lobes", title: "Mott lobes (decoupling mean field)", x: "muOverU", y: ["lobe1", "lobe2", "lobe3"] },
  ],
  assumptions: [
    "Site-decoupled (product-state) mean field at T = 0 on a bipartite lattice; field along the hard axis z of the easy-plane anisotropy.",
    "Mean field overestimates order; in two dimensions the transition at T > 0 is of the BKT kind; dipolar S+S+ terms would break the U(1) symmetry.",
  ],
  sources: [
    "T. Matsubara, H. Matsuda, Prog. Theor. Phys. 16, 569 (1956)",
    "T. Giamarchi, C. Rueegg, O. Tchernyshyov, Nature Phys. 4, 198 (2008)",
    "M. Fisher et al., PRB 40, 546 (1989)",
    "D. van Oosten, P. van der Straten, H. Stoof, PRA 63, 053601 (2001) (from memory)",
  ],
  method: "self-consistent site Hamiltonian (several starts, lowest energy kept); closed forms from second-order perturbation theory",
  limits: { D: { min: 0, why: "an easy-plane anisotropy" }, zJ: { min: 0, why: "an antiferromagnetic exchange" }, Bmax: { above: 0, why: "a largest field" } },
  compute: computeFieldOrder,
});

export const latticeCalculators = [dipolarLatticeSpec, fieldTunedOrderSpec];
