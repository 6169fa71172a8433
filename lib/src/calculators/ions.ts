/**
 * Calculators of the single-ion domain (lib/src/ions): `ion-levels` (crystal-field levels of one
 * ion, the Zeeman diagram along any direction, the ground-doublet g-tensor, Schottky heat,
 * magnetization and neutron dipole intensities). Energies are E / k_B in kelvin (inputs also read
 * "0.1 meV", "5 cm^-1", "20 GHz"); outputs repeat the levels in meV and cm^-1.
 */
import type { ComputeOutput, InputValues } from "./spec.js";
import { defineCalculator, choiceInput } from "./spec.js";
import { InputError } from "../errors.js";
import { kB, h as planck, e as eCharge } from "../quantity/constants.js";
import { direction, groundDoubletGTensor, groupLevels, ionSpectrum, magnetization, neutronTransitions, schottkyHeat, zeemanDiagram, type IonModel } from "../ions/singleIon.js";
import type { CrystalFieldTerm } from "../ions/stevens.js";

const kelvinToMeV = (kB / eCharge) * 1e3;
/** 1 K in cm^-1: k_B / (h c) / 100. */
const kelvinToWavenumber = kB / (planck * 299792458 * 100);

const ionSources = [
  "K. Stevens, Proc. Phys. Soc. A 65, 209 (1952)",
  "M. Hutchings, Solid State Physics 16, 227 (1964)",
  "J. Jensen, A. Mackintosh, Rare Earth Magnetism (Oxford 1991)",
];

const termNames: Array<[string, number, number, number, string]> = [
  // name, l, m, default, symmetry hint
  ["B20", 2, 0, -0.5, "axial"],
  ["B22", 2, 2, 0, "orthorhombic"],
  ["B40", 4, 0, 0.005, "axial, cubic"],
  ["B43", 4, 3, 0, "trigonal"],
  ["B44", 4, 4, 0, "tetragonal, cubic"],
  ["B60", 6, 0, 0, "axial, cubic"],
  ["B63", 6, 3, 0, "trigonal"],
  ["B64", 6, 4, 0, "tetragonal, cubic"],
  ["B66", 6, 6, 0, "hexagonal"],
];

const jChoices = Array.from({ length: 16 }, (_, i) => {
  const J = (i + 1) / 2;
  return { value: J, label: Number.isInteger(J) ? String(J) : `${2 * J}/2` };
});

const nZeeman = 8;
const gridPoints = 41;

function modelFrom(v: InputValues): IonModel {
  const terms: CrystalFieldTerm[] = termNames.map(([name, l, m]) => ({ l, m, B: v[name]! }));
  return { J: v.J!, gJ: v.gJ!, terms };
}

function computeIonLevels(v: InputValues): ComputeOutput {
  const model = modelFrom(v);
  const notes: string[] = [];
  for (const t of model.terms) {
    if (t.B !== 0 && t.l > 2 * model.J) notes.push(`B${t.l}${t.m} has no effect for J = ${model.J} (O_${t.l}^${t.m} vanishes for l > 2J)`);
  }
  if (!(v.Bmax! > 0)) throw new InputError("Bmax", v.Bmax, "a positive largest field in tesla for the Zeeman diagram and M(B)");
  if (!(v.T! >= 0)) throw new InputError("T", v.T, "a temperature >= 0 K");
  const dir = direction(v.theta!, v.phi!);
  const B = v.B!;
  const sp0 = ionSpectrum(model);
  const e0 = sp0.energies[0]!;
  const levels = Array.from(sp0.energies, (e) => e - e0);
  const groups = groupLevels(sp0.energies);
  const g = groundDoubletGTensor(model);
  notes.push(...g.notes);
  const spB = ionSpectrum(model, [B * dir[0], B * dir[1], B * dir[2]]);
  const levelsInField = Array.from(spB.energies, (e) => e - spB.energies[0]!);
  // Zeeman diagram, energies relative to the zero-field ground level
  const fields = Array.from({ length: gridPoints }, (_, i) => (v.Bmax! * i) / (gridPoints - 1));
  const diagram = zeemanDiagram(model, dir, fields);
  const values: ComputeOutput["values"] = {};
  values.levels = levels;
  values.levelsMeV = levels.map((e) => e * kelvinToMeV);
  values.levelsWavenumber = levels.map((e) => e * kelvinToWavenumber);
  values.levelsInField = levelsInField;
  values.gPrincipal1 = g.principal[0];
  values.gPrincipal2 = g.principal[1];
  values.gPrincipal3 = g.principal[2];
  values.gAxis1 = g.axes[0]!;
  values.gAxis3 = g.axes[2]!;
  values.doubletSplitting = g.splitting;
  values.fieldGrid = fields;
  for (let k = 0; k < nZeeman; k++) {
    if (k < sp0.n) values[`zeeman${k + 1}`] = diagram.map((row) => row[k]! - e0);
  }
  // Schottky heat on a log grid of temperatures
  const temps = Array.from({ length: gridPoints }, (_, i) => 0.1 * Math.pow(3000, i / (gridPoints - 1)));
  values.temperatureGrid = temps;
  values.heat = temps.map((T) => schottkyHeat(spB.energies, T));
  values.magnetizationCurve = fields.map((b) => magnetization(model, dir, b, v.T!));
  values.magnetization = magnetization(model, dir, B, v.T!);
  // neutrons: from the ground level (and thermally populated ones) at T, zero field
  const tr = neutronTransitions(model, v.T!).filter((t) => t.energy > 1e-9 * Math.max(1, levels[levels.length - 1]!));
  values.transitionEnergy = tr.map((t) => t.energy);
  values.transitionPowder = tr.map((t) => t.powder * t.population);
  const g0 = groups[0]!.energy;
  const levelText = groups.map((gr) => {
    const de = gr === groups[0] ? 0 : gr.energy - g0;
    return `${de.toPrecision(5)} K (${(de * kelvinToMeV).toPrecision(4)} meV, ${(de * kelvinToWavenumber).toPrecision(4)} cm^-1) x${gr.states.length}`;
  });
  values.summary =
    `zero-field levels: ${levelText.join("; ")}. Ground doublet g = (${g.principal.map((x) => x.toPrecision(5)).join(", ")})` +
    `${g.kramers ? " (Kramers ion)" : " (non-Kramers ion)"}`;
  if (v.T! === 0) notes.push("T = 0: M(B) is the ground-state moment (averaged over a degenerate ground level); the heat curve is computed on its own temperature grid");
  notes.push(
    "transition intensities: (2/3) sum_a |<i|J_a|j>|^2 (powder average of the perpendicular part) times the initial level's population; no form factor, no Debye-Waller factor",
  );
  const quartet = g.notes.some((n) => n.includes("more than two-fold"));
  return { values, status: quartet ? "warning" : "ok", notes };
}

const energyInput = (name: string, l: number, m: number, def: number, hint: string) => {
  const scale = l === 2 ? 5 : l === 4 ? 0.1 : 0.002;
  return {
    name,
    symbol: `B_${l}^{${m}}`,
    unit: "K",
    default: def,
    min: -scale,
    max: scale,
    scale: "linear" as const,
    meaning: `crystal-field coefficient of O_${l}^${m} (${hint}), E / k_B`,
  };
};

export const ionLevelsSpec = defineCalculator({
  id: "ion-levels",
  title: "Crystal-field levels of one ion: Zeeman diagram, g-tensor, Schottky heat, magnetization",
  summary:
    "Exact levels of H = sum B_l^m O_l^m + g_J muB B . J for one ion of total angular momentum J (1/2 ... 8) with Stevens operators of ranks 2, 4, 6 (axial, orthorhombic, trigonal, tetragonal, hexagonal and cubic terms); the levels against a field along any direction, the ground-doublet g-tensor computed from the eigenstates, the Schottky heat, the magnetization along the field and the neutron dipole intensities (powder average).",
  inputs: [
    choiceInput("J", "J", jChoices, "total angular momentum of the ground multiplet", { default: 7.5 }),
    { name: "gJ", symbol: "g_J", unit: "", default: 1.2, min: 0, max: 2.5, scale: "linear", meaning: "Lande factor of the multiplet" },
    ...termNames.map(([name, l, m, def, hint]) => energyInput(name, l, m, def, hint)),
    { name: "B", symbol: "B", unit: "T", default: 1, min: 0, max: 20, scale: "linear", meaning: "applied field magnitude (for the levels in field and M)" },
    { name: "theta", symbol: "\\theta_B", unit: "rad", default: 0, min: 0, max: Math.PI, scale: "linear", meaning: "polar angle of the field from the crystal-field z axis" },
    { name: "phi", symbol: "\\phi_B", unit: "rad", default: 0, min: 0, max: 2 * Math.PI, scale: "linear", meaning: "azimuth of the field from x" },
    { name: "Bmax", symbol: "B_{max}", unit: "T", default: 10, min: 0.1, max: 60, scale: "linear", meaning: "largest field of the Zeeman diagram and M(B)" },
    { name: "T", symbol: "T", unit: "K", default: 2, min: 0, max: 300, scale: "linear", meaning: "temperature for M(B) and the neutron populations" },
  ],
  outputs: [
    { name: "summary", symbol: "", unit: "", kind: "text", meaning: "levels in K, meV and cm^-1 with degeneracies; g principal values" },
    { name: "gPrincipal1", symbol: "g_1", unit: "", meaning: "largest principal g-value of the ground doublet" },
    { name: "gPrincipal2", symbol: "g_2", unit: "", meaning: "middle principal g-value" },
    { name: "gPrincipal3", symbol: "g_3", unit: "", meaning: "smallest principal g-value" },
    { name: "gAxis1", symbol: "\\hat n_1", unit: "", kind: "array", meaning: "principal axis of g_1 (x, y, z)" },
    { name: "gAxis3", symbol: "\\hat n_3", unit: "", kind: "array", meaning: "principal axis of g_3 (x, y, z)" },
    { name: "doubletSplitting", symbol: "\\Delta_{12}", unit: "K", meaning: "zero-field splitting of the two lowest states (0 for a true doublet)" },
    { name: "magnetization", symbol: "M", unit: "", meaning: "moment per ion along the field at B and T, in muB" },
    { name: "levels", symbol: "E_i - E_0", unit: "K", kind: "array", meaning: "zero-field levels above the ground level (E / k_B)" },
    { name: "levelsMeV", symbol: "E_i - E_0", unit: "", kind: "array", meaning: "zero-field levels in meV" },
    { name: "levelsWavenumber", symbol: "E_i - E_0", unit: "", kind: "array", meaning: "zero-field levels in cm^-1" },
    { name: "levelsInField", symbol: "E_i(B) - E_0(B)", unit: "K", kind: "array", meaning: "levels at field B above the lowest" },
    { name: "fieldGrid", symbol: "B", unit: "T", kind: "array", meaning: "fields of the Zeeman diagram and M(B)" },
    ...Array.from({ length: nZeeman }, (_, k) => ({
      name: `zeeman${k + 1}`,
      symbol: `E_${k + 1}(B)`,
      unit: "K",
      kind: "array" as const,
      meaning: `level ${k + 1} (counted from the lowest) against field, relative to the zero-field ground level`,
    })),
    { name: "temperatureGrid", symbol: "T", unit: "K", kind: "array", meaning: "temperatures of the heat curve (0.1 to 300 K, log)" },
    { name: "heat", symbol: "C/R", unit: "", kind: "array", meaning: "Schottky heat per mole of ions at field B, in units of R" },
    { name: "magnetizationCurve", symbol: "M(B)", unit: "", kind: "array", meaning: "moment per ion along the field direction against field at T, in muB" },
    { name: "transitionEnergy", symbol: "\\hbar\\omega", unit: "K", kind: "array", meaning: "energy transfers of the dipole transitions from populated levels (zero field)" },
    { name: "transitionPowder", symbol: "I", unit: "", kind: "array", meaning: "powder-averaged (2/3) sum |<i|J|j>|^2 times the initial population" },
  ],
  plots: [
    { id: "zeeman", title: "Levels against field", x: "fieldGrid", y: Array.from({ length: nZeeman }, (_, k) => `zeeman${k + 1}`) },
    { id: "heat", title: "Schottky heat", x: "temperatureGrid", y: ["heat"], xLog: true },
    { id: "magnetization", title: "Magnetization along the field", x: "fieldGrid", y: ["magnetizationCurve"] },
    { id: "neutrons", title: "Neutron dipole intensities (powder)", x: "transitionEnergy", y: ["transitionPowder"], mode: "markers" },
  ],
  assumptions: [
    "One ion, ground J multiplet only (no J mixing); Stevens operator equivalents with the normalization of Hutchings' table, sine-type terms absent in this calculator (the library takes them).",
    "Energies E / k_B in kelvin; the Zeeman term g_J muB B . J; no interactions between ions (dilute limit).",
    "g-tensor: effective spin-1/2 of the two lowest zero-field states; meaningful when the next level is far above the Zeeman energy.",
  ],
  sources: ionSources,
  method: "exact diagonalization of the (2J + 1)-state Hamiltonian (Householder + QL); Stevens operators by symmetrized harmonic polynomials; thermal averages over all levels",
  limits: { Bmax: { above: 0, why: "a largest field" }, T: { min: 0, why: "a temperature" }, B: { min: 0, why: "a field magnitude (direction by the angles)" } },
  compute: computeIonLevels,
});

export const ionCalculators = [ionLevelsSpec];
