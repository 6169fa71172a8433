/**
 * Calculators of the quantum spin-chain domain (lib/src/chains): `chain-spectrum` (ED levels per
 * momentum against the Bethe-ansatz values and the first-order wall picture), `chain-dynamics`
 * (S(q, w) in the xx, yy, zz and chiral channels with its sum rules and the wall-continuum bounds)
 * and `wall-band` (the first-order domain-wall band, chirality, Villain scattering and the chiral
 * weight against T and hx; instant). Energies are E / k_B in kelvin (the chains library also reads
 * meV and GHz with `energyInKelvin`); outputs repeat the headline energies in meV and GHz.
 * The plot spec draws lines and markers only (no heatmap), so the S(q, w) map is returned as
 * flattened arrays (row-major: q index, then w) next to cuts at q = pi and the bounds against q.
 */
import type { ComputeCost, ComputeOptions, ComputeOutput, InputValues } from "./spec.js";
import { defineCalculator, choiceInput } from "./spec.js";
import { requireWholeAtLeast, sweepValues } from "./spec.js";
import { InputError } from "../errors.js";
import { brentMinimize } from "../numeric/brentMinimize.js";
import { chainModel, kelvinToGHz, kelvinToMeV, ringLabel, type ChainModel } from "../chains/model.js";
import { sectorLevels } from "../chains/spectrum.js";
import { allowedSymmetries, sectorMemoryEstimate, sectorName, type SectorLabel } from "../chains/basis.js";
import { matrixStoreEstimate } from "../chains/operator.js";
import { xxzGap, xxzGroundEnergyPerSite, transverseIsingRing } from "../chains/closedForms.js";
import { dynamicStructureFactor } from "../chains/dynamics.js";
import {
  domainWallBand,
  twoWallContinuum,
  villainEdge,
  villainLineShape,
  wallDensity,
  wallTransverseMagnetization,
  wallValidityNotes,
  wallChiralitySign,
  twoWallTransverseLineShape,
} from "../chains/wallBand.js";

const chainSources = [
  "R. Orbach, Phys. Rev. 112, 309 (1958)",
  "J. des Cloizeaux, M. Gaudin, J. Math. Phys. 7, 1384 (1966)",
  "J. Johnson, S. Krinsky, B. McCoy, Phys. Rev. A 8, 2526 (1973)",
  "L. Hulthen, Ark. Mat. Astron. Fys. 26A, 1 (1938)",
  "P. Pfeuty, Ann. Phys. 57, 79 (1970)",
  "K. Wu, H. Simon, SIAM J. Matrix Anal. Appl. 22, 602 (2000) (thick-restart Lanczos)",
];
const wallSources = ["J. Villain, Physica B 79, 1 (1975)", "S. Ishimura, H. Shiba, Prog. Theor. Phys. 63, 743 (1980)"];

const energyInput = <N extends string>(name: N, symbol: string, def: number, min: number, max: number, meaning: string) => ({
  name,
  symbol,
  unit: "K",
  default: def,
  min,
  max,
  scale: "linear" as const,
  meaning: `${meaning} (E / k_B)`,
});

const modelInputs = [
  energyInput("Jz", "J_z", 10, -20, 20, "Ising exchange; > 0 antiferromagnet"),
  energyInput("Jperp", "J_\\perp", 2, 0, 20, "transverse exchange"),
  energyInput("hx", "h_x", 0, -10, 10, "transverse field, Zeeman energy g muB Bx"),
  energyInput("hz", "h_z", 0, -10, 10, "longitudinal field, Zeeman energy g muB Bz"),
];

function modelFrom(v: InputValues, N: number, boundary: "periodic" | "open" = "periodic"): ChainModel {
  return chainModel({ N, Jz: v.Jz!, Jperp: v.Jperp!, hx: v.hx!, hz: v.hz!, boundary });
}

function unitsText(label: string, eK: number): string {
  return `${label} = ${eK.toPrecision(6)} K = ${(eK * kelvinToMeV).toPrecision(6)} meV = ${(eK * kelvinToGHz).toPrecision(6)} GHz`;
}

// ---------------------------------------------------------------- chain-spectrum
/**
 * The sectors the spectrum calculator diagonalizes, grouped by momentum: S^z (the lowest |S^z| and
 * the next, when hx = 0), momentum 0..N/2 on rings, the reflection parity at k = 0 and pi (every
 * sector of an open chain), and the flip parity where it applies (hz = 0; S^z = 0 when hx = 0).
 */
function spectrumSectors(model: ChainModel): Array<{ m: number | null; labels: SectorLabel[] }> {
  const N = model.N;
  const sym = allowedSymmetries(model);
  const ms = sym.translation ? Array.from({ length: Math.floor(N / 2) + 1 }, (_, i) => i) : [null];
  const ups: Array<number | null> = sym.Sz ? [Math.ceil(N / 2), Math.ceil(N / 2) + 1].filter((u) => u <= N) : [null];
  return ms.map((m) => {
    const labels: SectorLabel[] = [];
    const reflections: Array<0 | 1 | -1> = m === null || m === 0 || 2 * m === N ? [1, -1] : [0];
    for (const nUp of ups) {
      const flips: Array<0 | 1 | -1> = (nUp === null ? sym.flip : sym.flipInSz0 && 2 * nUp === N) ? [1, -1] : [0];
      for (const reflection of reflections) for (const flip of flips) labels.push(reflection ? { nUp, m, flip, reflection } : { nUp, m, flip });
    }
    return { m, labels };
  });
}

/** Steps of Lanczos on one sector: matrix-vector products times (terms + orthogonalization) per state. */
function lanczosSteps(model: ChainModel, dim: number, levels: number): number {
  const terms = model.N + (model.hx !== 0 ? model.N : 0);
  const matvecs = levels === 1 ? 150 : 150 + 60 * levels;
  const perState = terms + (levels === 1 ? 6 : 2 * Math.max(2 * levels + 20, 40));
  return dim * matvecs * perState;
}

function spectrumModel(v: InputValues): ChainModel {
  const N = requireWholeAtLeast(v, "N", 3, "sites");
  if (N > 24) throw new InputError("N", N, "at most 24 sites in the calculator (the library takes larger N within its memory budget)");
  return modelFrom(v, N, v.boundary === 1 ? "open" : "periodic");
}

function chainSpectrumCost(v: InputValues): ComputeCost {
  const model = spectrumModel(v);
  const levels = Math.max(1, Math.round(v.levels ?? 1));
  let bytes = 0,
    steps = 0,
    states = 0;
  for (const { labels } of spectrumSectors(model)) {
    for (const label of labels) {
      const est = sectorMemoryEstimate(model.N, label, levels === 1 ? 4 : Math.max(2 * levels + 20, 40));
      bytes = Math.max(bytes, est.bytes + matrixStoreEstimate(model, est.dimension, est.complex));
      steps += lanczosSteps(model, est.dimension, levels);
      states += est.dimension;
    }
  }
  return {
    bytes,
    steps,
    parameter: "N",
    what: `${states} states in the symmetry sectors of a ${model.boundary === "periodic" ? "ring" : "chain"} of ${model.N} sites, Lanczos for ${levels} level(s) in each`,
  };
}

function computeChainSpectrum(v: InputValues, options: ComputeOptions = {}): ComputeOutput {
  const model = spectrumModel(v);
  const N = model.N;
  const boundary = model.boundary;
  const notes: string[] = [ringLabel(model)];
  const levels = requireWholeAtLeast(v, "levels", 1, "levels per sector");
  const periodic = boundary === "periodic";
  const groups = spectrumSectors(model);
  const ups = Array.from(new Set(groups[0]!.labels.map((l) => l.nUp)));
  const kValues: number[] = [];
  const lowest: number[] = [];
  const second: number[] = [];
  let e0 = Infinity;
  let groundSector = "";
  const all: number[] = [];
  const sectorLines: string[] = [];
  // progress by states done (the work of a sector grows with its dimension)
  const dims = groups.map((g) => g.labels.map((l) => sectorMemoryEstimate(N, l, 0).dimension));
  const total = dims.flat().reduce((a, b) => a + b, 0);
  let done = 0;
  groups.forEach(({ m, labels }, gi) => {
    let best = Infinity,
      next = Infinity;
    labels.forEach((label, li) => {
      const name = sectorName(N, label);
      const share = dims[gi]![li]! / total;
      const r = sectorLevels(model, label, {
        levels,
        tol: 1e-10,
        onProgress: options.onProgress ? (p) => options.onProgress!(done / total + share * Math.min(0.95, p.matvecs / 200), `${name}: Lanczos step ${p.matvecs}`) : undefined,
      });
      done += dims[gi]![li]!;
      options.onProgress?.(done / total, `${name}: ${r.dimension} states, lowest ${r.values[0]!.toPrecision(8)} K`);
      sectorLines.push(`${name}: ${r.dimension} states`);
      all.push(...r.values);
      for (const e of r.values) {
        if (e < best) {
          next = best;
          best = e;
        } else if (e < next) next = e;
        if (e < e0) {
          e0 = e;
          groundSector = name;
        }
      }
    });
    kValues.push(m === null ? 0 : (2 * Math.PI * m) / N);
    lowest.push(best);
    second.push(Number.isFinite(next) ? next : best);
  });
  all.sort((a, b) => a - b);
  const gap = all.find((e) => e > e0 + 1e-9 * Math.max(1, Math.abs(e0))) ?? e0;
  const values: ComputeOutput["values"] = {
    groundEnergy: e0,
    groundEnergyPerSite: e0 / N,
    gapED: gap - e0,
    summary: `${unitsText("E0", e0)}; lowest excitation in the computed sectors ${unitsText("dE", gap - e0)}`,
    kValues,
    levelLowest: lowest.map((e) => e - e0),
    levelSecond: second.map((e) => e - e0),
    groundSector,
    sectors: sectorLines.join("; "),
  };
  if (model.hx !== 0) notes.push("hx != 0: S^z is not conserved; each momentum sector holds all S^z");
  else notes.push(`S^z sectors computed: ${ups.map((u) => (u! - N / 2).toString()).join(", ")} (the lowest |S^z| and the next)`);
  notes.push(
    `symmetry sectors: momentum${periodic ? "" : " (none: open chain)"}, reflection R = +-1 ${periodic ? "at k = 0 and pi" : "(sites j -> N - 1 - j)"}${groups[0]!.labels.some((l) => l.flip) ? ", spin inversion / pi rotation about x F = +-1" : ""}; levels at each k are the lowest of its sectors`,
  );
  const Delta = model.Jperp > 0 ? model.Jz / model.Jperp : Infinity;
  if (model.Jz > 0 && model.Jperp > 0 && Delta >= 1 && model.hx === 0 && model.hz === 0) {
    values.e0BethePerSite = model.Jperp * xxzGroundEnergyPerSite(Delta);
    if (Delta > 1) values.gapBethe = model.Jperp * xxzGap(Delta);
    notes.push(
      "Bethe-ansatz values are for the infinite chain; a ring of N sites approaches them exponentially fast in the gapped regime (Delta > 1), slowly (1/N^2) at Delta = 1",
    );
  }
  if (model.Jperp === 0 && model.hz === 0 && periodic) {
    values.e0TransverseIsing = transverseIsingRing(N, model.Jz, model.hx).E0;
  }
  if (model.Jz > 0 && periodic) {
    const wp = { Jz: model.Jz, Jperp: model.Jperp, hx: model.hx, hz: model.hz };
    if (N % 2 === 1) {
      // one wall: first-order band on the ED scale (Neel reference and second-order background)
      const ref = (-N * model.Jz) / 4 - (N * (model.Jperp ** 2 + model.hx ** 2)) / (4 * model.Jz) - e0;
      values.wallBandFirstOrder = domainWallBand(wp, kValues).lower.map((e) => e + ref);
      notes.push("odd ring: the lowest level at each k is the one-wall band; first-order band shifted by the Neel and second-order background energies");
    } else {
      const c = twoWallContinuum(wp, kValues);
      values.continuumLower = c.lower;
      values.continuumUpper = c.upper;
      notes.push("even ring: the two-wall continuum bounds (first order) are drawn against k measured from the ground-state momentum");
    }
    notes.push(...wallValidityNotes(wp));
  }
  return { values, status: "ok", notes };
}

export const chainSpectrumSpec = defineCalculator({
  id: "chain-spectrum",
  title: "Spin-1/2 XXZ chain: levels per momentum by exact diagonalization",
  summary:
    "Lowest levels of H = sum [Jz S^z S^z + Jperp (S^x S^x + S^y S^y)] - hx sum S^x - hz sum S^z on a ring or open chain of N spins 1/2, per momentum (and S^z when hx = 0), by Lanczos in symmetry sectors; against the Bethe-ansatz ground energy and gap, the transverse-field Ising closed form, and the first-order domain-wall band (odd rings) or two-wall continuum (even rings).",
  inputs: [
    { name: "N", symbol: "N", unit: "", default: 12, min: 4, max: 24, scale: "linear", kind: "integer", meaning: "number of sites (odd rings hold one domain wall)" },
    ...modelInputs,
    choiceInput("boundary", "\\text{bc}", ["ring", "open"], "periodic ring or open chain"),
    { name: "levels", symbol: "n_\\text{lev}", unit: "", default: 2, min: 1, max: 8, scale: "linear", kind: "integer", meaning: "Lanczos levels per sector" },
  ],
  outputs: [
    { name: "groundEnergy", symbol: "E_0", unit: "K", meaning: "ground-state energy (E / k_B)" },
    { name: "groundEnergyPerSite", symbol: "E_0/N", unit: "K", meaning: "ground-state energy per site" },
    { name: "gapED", symbol: "\\Delta E", unit: "K", meaning: "lowest excitation among the computed sectors" },
    { name: "e0BethePerSite", symbol: "e_0^{BA}", unit: "K", meaning: "Bethe-ansatz ground energy per site, infinite chain (Jz >= Jperp > 0, no field)" },
    { name: "gapBethe", symbol: "\\Delta^{BA}", unit: "K", meaning: "Bethe-ansatz gap (two spinons), infinite chain" },
    { name: "e0TransverseIsing", symbol: "E_0^{TFIM}", unit: "K", meaning: "closed-form ground energy of the transverse-field Ising ring (Jperp = 0)", optional: true },
    { name: "summary", symbol: "", unit: "", kind: "text", meaning: "headline energies in K, meV and GHz" },
    { name: "groundSector", symbol: "", unit: "", kind: "text", meaning: "symmetry sector of the ground state (S^z, momentum, reflection R and flip F parities)" },
    { name: "sectors", symbol: "", unit: "", kind: "text", meaning: "the sectors diagonalized and their dimensions" },
    { name: "kValues", symbol: "k", unit: "rad", kind: "array", meaning: "momenta (rad per site)" },
    { name: "levelLowest", symbol: "E_1(k) - E_0", unit: "K", kind: "array", meaning: "lowest level at each k above the ground state" },
    { name: "levelSecond", symbol: "E_2(k) - E_0", unit: "K", kind: "array", meaning: "second level at each k" },
    {
      name: "wallBandFirstOrder",
      symbol: "E_w(k)",
      unit: "K",
      kind: "array",
      meaning: "first-order one-wall band on the same scale (odd antiferromagnetic rings)",
      optional: true,
    },
    { name: "continuumLower", symbol: "\\omega_-(q)", unit: "K", kind: "array", meaning: "first-order two-wall continuum, lower bound (even rings)" },
    { name: "continuumUpper", symbol: "\\omega_+(q)", unit: "K", kind: "array", meaning: "first-order two-wall continuum, upper bound (even rings)" },
  ],
  plots: [
    { id: "levels", title: "Levels per momentum", x: "kValues", y: ["levelLowest", "levelSecond", "wallBandFirstOrder", "continuumLower", "continuumUpper"], mode: "markers" },
  ],
  assumptions: [
    "Spin-1/2 XXZ chain with nearest-neighbour exchange only; fields are Zeeman energies g muB B along x and z.",
    "Levels are Lanczos Ritz values with residual below 1e-10 relative; sectors: momentum on rings, S^z when hx = 0, reflection at k = 0, pi (open chains: always), spin inversion / pi rotation about x when hz = 0.",
    "Bethe-ansatz and wall-band values are for the infinite chain (thermodynamic limit) and first order in Jperp, hx respectively.",
  ],
  sources: chainSources,
  method: "exact diagonalization in symmetry sectors (combinatorial ranking, sparse or matrix-free H, Lanczos: plain recursion for one level, thick restart for several)",
  cost: chainSpectrumCost,
  compute: computeChainSpectrum,
});

// ---------------------------------------------------------------- chain-dynamics
/** Largest N for exact diagonalization in the dynamics calculator; above it the thermodynamic-limit model. */
export const chainDynamicsMaxED = 16;
/** Largest N at T > 0 (every level of the 2^N states). */
export const chainDynamicsMaxThermalED = 12;

function dynamicsOmega(v: InputValues): number[] {
  const points = requireWholeAtLeast(v, "points", 8, "energy points");
  if (points > 2000) throw new InputError("points", points, "at most 2000 energy points");
  if (!(v.omegaMax! > 0)) throw new InputError("omegaMax", v.omegaMax, "a positive largest energy transfer");
  // T = 0: 0..omegaMax; T > 0 also negative transfers (detailed balance)
  const lo = v.T! > 0 ? -v.omegaMax! : 0;
  return Array.from({ length: points }, (_, i) => lo + ((v.omegaMax! - lo) * i) / (points - 1));
}

function chainDynamicsCost(v: InputValues): ComputeCost {
  const N = requireWholeAtLeast(v, "N", 4, "sites");
  if (N > chainDynamicsMaxED) {
    const nq = Math.floor(N / 2) + 1;
    return { bytes: 64 * nq * 2000, steps: nq * 2000 * 400 * 4, parameter: "N", what: `thermodynamic-limit model on ${nq} momenta` };
  }
  const dim = 2 ** N / N;
  const flip = v.hz === 0 && v.hx !== 0 ? 2 : 1;
  const nq = Math.floor(N / 2) + 1;
  const terms = 2 * N;
  if (v.T! > 0) {
    if (N > chainDynamicsMaxThermalED)
      throw new InputError("N", N, `at most ${chainDynamicsMaxThermalED} sites at T > 0 (full spectrum); the thermodynamic-limit model takes over above N = ${chainDynamicsMaxED}`);
    // dense diagonalization of N sectors, then the double sum over states (3 operators, 2 dots each)
    const steps = N * 10 * dim ** 3 + nq * N * dim * (3 * dim * N + dim * 12 * dim);
    return {
      bytes: N * dim * dim * 16 * 2 + 3 * dim * dim * 8,
      steps,
      parameter: "N",
      what: `every level of ${N} momentum sectors of about ${Math.round(dim)} states and the double sum over states at ${nq} momenta`,
    };
  }
  const d = dim / flip;
  const steps = (nq * flip + 1) * d * 2 * terms * 100 + nq * 5 * 200 * d * 2 * (terms + 6);
  return {
    bytes: 4 * 2 ** N + 4 * d * terms * 20 + 10 * d * 16,
    steps,
    parameter: "N",
    what: `Lanczos ground state over ${nq * flip} sectors of about ${Math.round(d)} states and 5 continued fractions of depth 200 at ${nq} momenta`,
  };
}

function computeChainDynamics(v: InputValues, options: ComputeOptions = {}): ComputeOutput {
  const N = requireWholeAtLeast(v, "N", 4, "sites");
  if (N > 1000) throw new InputError("N", N, "at most 1000 sites (the thermodynamic-limit model is sampled at the ring's N momenta)");
  if (N > chainDynamicsMaxED) return thermodynamicLimitDynamics(v, N);
  const model = modelFrom(v, N);
  const T = v.T!;
  if (T > 0 && N > chainDynamicsMaxThermalED)
    throw new InputError("N", N, `at most ${chainDynamicsMaxThermalED} sites at T > 0 (full spectrum); the thermodynamic-limit model takes over above N = ${chainDynamicsMaxED}`);
  const omega = dynamicsOmega(v);
  const r = dynamicStructureFactor(model, {
    T,
    eta: v.eta!,
    omega,
    components: ["xx", "yy", "zz", "chiral"],
    onProgress: options.onProgress ? (done, total) => options.onProgress!(done / total, `S(q, w): momentum ${done} of ${total}`) : undefined,
  });
  const iPi = r.qIndex.length - 1;
  const flat = (rows: Float64Array[]) => rows.flatMap((row) => Array.from(row));
  const notes = [ringLabel(model), ...r.notes, "the S(q, w) maps are flattened row-major (q index, then w): the plot spec has no heatmap, so cuts at q = pi are plotted"];
  const values: ComputeOutput["values"] = {
    model: `exact diagonalization of the ring of ${N} sites (N <= ${chainDynamicsMaxED}; above it the thermodynamic-limit domain-wall model is used)`,
    qValues: r.q,
    omega,
    mapZZ: flat(r.channels.zz!.re),
    mapXX: flat(r.channels.xx!.re),
    mapYY: flat(r.channels.yy!.re),
    mapChiral: flat(r.channels.chiral!.re),
    cutZZ: Array.from(r.channels.zz!.re[iPi]!),
    cutXX: Array.from(r.channels.xx!.re[iPi]!),
    cutChiral: Array.from(r.channels.chiral!.re[iPi]!),
    totalWeightZZ: r.sumRules.totalWeight.zz ?? 0,
    magnetizationX: r.mx,
    chiralWeight: r.sumRules.chiralWeight!.exact[0]!,
    fSumDeviation: Math.max(...r.sumRules.firstMomentZZ!.exact.map((e, i) => Math.abs(e - r.sumRules.firstMomentZZ!.formula[i]!))),
  };
  if (r.sumRules.detailedBalance !== undefined) values.detailedBalance = r.sumRules.detailedBalance;
  if (model.Jz > 0) {
    const wp = { Jz: model.Jz, Jperp: model.Jperp, hx: model.hx, hz: model.hz };
    const c = twoWallContinuum(wp, r.q);
    values.continuumLower = c.lower;
    values.continuumUpper = c.upper;
    values.villainEdge = villainEdge(wp, r.q);
    notes.push(...wallValidityNotes(wp));
  }
  return { values, status: "ok", notes };
}

/**
 * Above N = 16 sites: the thermodynamic-limit domain-wall model (first order in Jperp, hx) on the
 * momenta q = 2 pi n / N, 0 <= n <= N/2: the T = 0 two-wall continuum S^xx = S^yy (semicircle of
 * weight 1/4 between the continuum bounds, zero field), the intraband (Villain) S^zz of thermal walls
 * (T > 0, zero field), and the chiral weight -<S^x> from the wall picture (its line shape is not
 * modelled: the chiral map is zero, its integral is given). Said in the notes and the `model` output.
 */
function thermodynamicLimitDynamics(v: InputValues, N: number): ComputeOutput {
  const p = { Jz: v.Jz!, Jperp: v.Jperp!, hx: v.hx!, hz: v.hz! };
  if (!(p.Jz > 0))
    throw new InputError(
      "Jz",
      p.Jz,
      `an antiferromagnetic Jz > 0 above N = ${chainDynamicsMaxED} sites (the thermodynamic-limit model is the antiferromagnet's domain-wall picture)`,
    );
  const T = v.T!;
  const eta = v.eta!;
  if (!(eta > 0)) throw new InputError("eta", eta, "a positive broadening (half width)");
  const omega = dynamicsOmega(v);
  const nq = Math.floor(N / 2) + 1;
  const q = Array.from({ length: nq }, (_, n) => (2 * Math.PI * n) / N);
  const zeroField = { ...p, hx: 0, hz: 0 };
  const lorentz = (x: number): number => eta / Math.PI / (x * x + eta * eta);
  const transverse = q.map((Q) => twoWallTransverseLineShape(zeroField, Q, omega, eta));
  // Villain S^zz: the unbroadened line shape on a fine grid, convolved with the Lorentzian
  const zz = q.map((Q) => {
    if (!(T > 0) || Q === 0 || Math.abs(Q - Math.PI) < 1e-12 || p.Jperp === 0) return omega.map(() => 0);
    const edge = 2 * Math.abs(p.Jperp * Math.sin(Q));
    const n = 400;
    // substitution w = edge sin(x) removes the square-root edges: dw = edge cos(x) dx
    const xs = Array.from({ length: n }, (_, i) => -Math.PI / 2 + (Math.PI * (i + 0.5)) / n);
    const ws = xs.map((x) => edge * Math.sin(x));
    const shape = villainLineShape(zeroField, Q, ws, T);
    return omega.map((w) => {
      let s = 0;
      for (let i = 0; i < n; i++) s += shape[i]! * edge * Math.cos(xs[i]!) * lorentz(w - ws[i]!);
      return (s * Math.PI) / n;
    });
  });
  const mx = wallTransverseMagnetization(p, Math.max(T, 0));
  const c = twoWallContinuum(p, q);
  const flat = (rows: number[][]) => rows.flat();
  const iPi = nq - 1;
  const notes = [
    `N = ${N} > ${chainDynamicsMaxED}: thermodynamic-limit domain-wall model (first order in Jperp and hx), not exact diagonalization; sampled at the ${nq} momenta 2 pi n / N`,
    "S^xx = S^yy: T = 0 two-wall continuum (semicircle of weight 1/4, zero field; thermal depletion not included); S^zz: intraband (Villain) scattering of thermal walls (zero field), without the elastic Bragg weight at q = pi",
    "chiral part: only its integral -<S^x> per site is modelled (map zero)",
    ...wallValidityNotes(p),
  ];
  if (p.hx !== 0 || p.hz !== 0) notes.push("the line shapes are drawn at zero field; the continuum bounds include the fields");
  const values: ComputeOutput["values"] = {
    model: `thermodynamic-limit domain-wall model (N = ${N} > ${chainDynamicsMaxED}; first order in Jperp, hx)`,
    qValues: q,
    omega,
    mapZZ: flat(zz),
    mapXX: flat(transverse),
    mapYY: flat(transverse),
    mapChiral: omega.flatMap(() => q.map(() => 0)),
    cutZZ: zz[iPi]!,
    cutXX: transverse[iPi]!,
    cutChiral: omega.map(() => 0),
    totalWeightZZ: 0.25,
    magnetizationX: mx,
    chiralWeight: -mx,
    continuumLower: c.lower,
    continuumUpper: c.upper,
    villainEdge: villainEdge(p, q),
  };
  return { values, status: "warning", notes };
}

export const chainDynamicsSpec = defineCalculator({
  id: "chain-dynamics",
  title: "Dynamic structure factor S(q, w) of a spin-1/2 ring, with the chiral channel",
  summary:
    "S^{ab}(q, w) for a ring of N spins 1/2 in the xx, yy, zz channels and the chiral part C = i(S^yz - S^zy) seen by polarized neutrons; T = 0 by Lanczos continued fractions, T > 0 by sums over the full spectrum; Lorentzian broadening eta; sum rules (total weight, f-sum, chiral weight = -<S^x>, detailed balance) reported; first-order two-wall continuum and Villain edge for comparison.",
  inputs: [
    {
      name: "N",
      symbol: "N",
      unit: "",
      default: 10,
      min: 4,
      max: 64,
      scale: "linear",
      kind: "integer",
      meaning: "number of sites (ring); exact diagonalization up to 16, the thermodynamic-limit domain-wall model above",
    },
    ...modelInputs.map((i) => (i.name === "hx" ? { ...i, default: 1 } : i)),
    {
      name: "T",
      symbol: "T",
      unit: "K",
      default: 0,
      min: 0,
      max: 20,
      scale: "linear",
      meaning: "temperature (0: ground state; > 0 by exact diagonalization of the full spectrum within the work budget, about N <= 10; by the wall model above N = 16)",
    },
    { name: "eta", symbol: "\\eta", unit: "K", default: 0.3, min: 0.01, max: 3, scale: "log", meaning: "Lorentzian half width (E / k_B)" },
    { name: "omegaMax", symbol: "\\omega_{max}", unit: "K", default: 20, min: 1, max: 100, scale: "linear", meaning: "largest energy transfer shown (E / k_B)" },
    { name: "points", symbol: "n_\\omega", unit: "", default: 201, min: 20, max: 2000, scale: "log", kind: "integer", meaning: "energy points" },
  ],
  outputs: [
    { name: "model", symbol: "", unit: "", kind: "text", meaning: "which model computed the maps: exact diagonalization (N <= 16) or the thermodynamic-limit domain-wall model" },
    { name: "totalWeightZZ", symbol: "\\frac1N\\sum_q\\int S^{zz}", unit: "", meaning: "total zz weight (sum rule: 1/4)" },
    { name: "magnetizationX", symbol: "\\langle S^x\\rangle", unit: "", meaning: "transverse magnetization per site" },
    { name: "chiralWeight", symbol: "\\int C\\,d\\omega", unit: "", meaning: "frequency-integrated chiral weight (sum rule: -<S^x>)" },
    { name: "fSumDeviation", symbol: "\\delta_{f}", unit: "K", meaning: "largest deviation of the zz first moment from the f-sum formula" },
    { name: "detailedBalance", symbol: "\\delta_{db}", unit: "", meaning: "largest relative violation of detailed balance (T > 0)", optional: true },
    { name: "qValues", symbol: "q", unit: "rad", kind: "array", meaning: "momentum transfers 0..pi" },
    { name: "omega", symbol: "\\omega", unit: "K", kind: "array", meaning: "energy transfers (E / k_B)" },
    { name: "mapZZ", symbol: "S^{zz}(q,\\omega)", unit: "1/K", kind: "array", meaning: "zz map, flattened (q, then w)" },
    { name: "mapXX", symbol: "S^{xx}(q,\\omega)", unit: "1/K", kind: "array", meaning: "xx map, flattened" },
    { name: "mapYY", symbol: "S^{yy}(q,\\omega)", unit: "1/K", kind: "array", meaning: "yy map, flattened" },
    { name: "mapChiral", symbol: "C(q,\\omega)", unit: "1/K", kind: "array", meaning: "chiral map, flattened" },
    { name: "cutZZ", symbol: "S^{zz}(\\pi,\\omega)", unit: "1/K", kind: "array", meaning: "zz at q = pi" },
    { name: "cutXX", symbol: "S^{xx}(\\pi,\\omega)", unit: "1/K", kind: "array", meaning: "xx at q = pi" },
    { name: "cutChiral", symbol: "C(\\pi,\\omega)", unit: "1/K", kind: "array", meaning: "chiral part at q = pi" },
    { name: "continuumLower", symbol: "\\omega_-(q)", unit: "K", kind: "array", meaning: "first-order two-wall continuum, lower bound" },
    { name: "continuumUpper", symbol: "\\omega_+(q)", unit: "K", kind: "array", meaning: "first-order two-wall continuum, upper bound" },
    { name: "villainEdge", symbol: "2J_\\perp|\\sin q|", unit: "K", kind: "array", meaning: "first-order edge of the intraband (Villain) scattering" },
  ],
  plots: [
    { id: "cut-pi", title: "S(q = pi, w)", x: "omega", y: ["cutZZ", "cutXX", "cutChiral"] },
    { id: "bounds", title: "Wall continuum and Villain edge", x: "qValues", y: ["continuumLower", "continuumUpper", "villainEdge"] },
  ],
  assumptions: [
    "Ring of N spins 1/2 (finite-size spectrum: discrete lines broadened into Lorentzians of half width eta).",
    "S^{ab}(q, w) = sum p_m conj(<n|S^a_-q|m>) <n|S^b_-q|m> delta(w - E_n + E_m), S^a_q = N^-1/2 sum_j e^{-iqj} S^a_j; q from 0 to pi (S(-q) = S(q) by reflection).",
    "Maps at T = 0 refer to one ground state; a (nearly) degenerate ground state is said in the notes.",
  ],
  sources: ["E. Gagliano, C. Balseiro, PRL 59, 2999 (1987)", "P. Hohenberg, W. Brinkman, PRB 10, 128 (1974)", ...wallSources],
  method:
    "Lanczos continued fractions (T = 0) or full exact-diagonalization sums (T > 0) in momentum sectors for N <= 16; above, the thermodynamic-limit domain-wall model (two-wall semicircle, Villain intraband scattering)",
  cost: chainDynamicsCost,
  compute: computeChainDynamics,
});

// ---------------------------------------------------------------- wall-band
/**
 * Bottom of the lower one-wall band: the grid minimum refined by Brent's method between its grid
 * neighbours (the band is smooth there), so the gap is not the grid's value (off by up to ~1e-4 K on
 * the 121-point grid).
 */
function wallBandBottom(p: { Jz: number; Jperp: number; hx: number; hz: number }, K: number[], lower: number[]): number {
  let i = 0;
  for (let j = 1; j < lower.length; j++) if (lower[j]! < lower[i]!) i = j;
  const step = K[1]! - K[0]!;
  const k0 = K[i]!;
  const refined = brentMinimize((k) => domainWallBand(p, [k]).lower[0]!, k0 - step, k0 + step, 1e-12);
  return Math.min(refined.f, lower[i]!);
}
function computeWallBand(v: InputValues, options: ComputeOptions = {}): ComputeOutput {
  const p = { Jz: v.Jz!, Jperp: v.Jperp!, hx: v.hx!, hz: v.hz! };
  if (p.Jz === 0) throw new InputError("Jz", 0, "a non-zero Ising exchange");
  const K = Array.from({ length: 121 }, (_, i) => -Math.PI + (2 * Math.PI * i) / 120);
  const q = Array.from({ length: 61 }, (_, i) => (Math.PI * i) / 60);
  const band = domainWallBand(p, K);
  const notes = [...band.notes];
  const values: ComputeOutput["values"] = {
    K,
    bandLower: band.lower,
    bandUpper: band.upper,
    chirality: band.chiralityLower,
    chiralityUpUpWall: K.map((k) => (p.Jz > 0 ? Math.sin(2 * k) * wallChiralitySign : 0)),
    spinCurrent: band.spinCurrentLower,
    q,
  };
  if (p.Jz > 0) {
    const c = twoWallContinuum(p, q);
    values.continuumLower = c.lower;
    values.continuumUpper = c.upper;
    values.villainEdge = villainEdge(p, q);
    values.wallGap = wallBandBottom(p, K, band.lower);
    const T = v.T!;
    if (T > 0) {
      values.wallDensity = wallDensity(p, T);
      const mx = wallTransverseMagnetization(p, T);
      values.magnetizationX = mx;
      values.chiralWeight = -mx;
      const edge = villainEdge({ ...p, hx: 0, hz: 0 }, [v.q!])[0]!;
      const w = Array.from({ length: 201 }, (_, i) => -1.2 * edge + (2.4 * edge * i) / 200);
      values.villainOmega = w;
      values.villainShape = v.q! > 0 && v.q! < Math.PI && p.Jperp > 0 ? villainLineShape(p, v.q!, w, T) : w.map(() => 0);
      if (p.hx !== 0 || p.hz !== 0) notes.push("the Villain line shape is drawn at zero field (first order)");
    } else {
      const mx = wallTransverseMagnetization(p, 0);
      values.magnetizationX = mx;
      values.chiralWeight = -mx;
      values.wallDensity = 0;
    }
    values.summary = `wall gap ${Number(values.wallGap).toPrecision(4)} K = ${(Number(values.wallGap) * kelvinToMeV).toPrecision(4)} meV; chiral weight int C dw = ${Number(values.chiralWeight).toPrecision(4)} per site`;
    if (options.sweep) {
      const xs = sweepValues(wallBandSpec, options.sweep);
      values.sweepValues = xs;
      values.sweepChiralWeight = xs.map((x) => {
        const pp = options.sweep!.over === "hx" ? { ...p, hx: x } : p;
        const TT = options.sweep!.over === "T" ? x : v.T!;
        return -wallTransverseMagnetization(pp, Math.max(TT, 0));
      });
      values.sweepWallDensity = xs.map((x) => {
        const TT = options.sweep!.over === "T" ? x : v.T!;
        const pp = options.sweep!.over === "hx" ? { ...p, hx: x } : p;
        return TT > 0 ? wallDensity(pp, TT) : 0;
      });
    }
  } else {
    values.summary = "ferromagnet: walls move only through hx in first order, E(K) = |Jz|/2 - |hx| cos K, no chirality";
  }
  return { values, status: "ok", notes };
}

export const wallBandSpec = defineCalculator({
  id: "wall-band",
  title: "Domain-wall band of an Ising-like chain (first order)",
  summary:
    "One domain wall's band E(K) = Jz/2 + Jperp cos 2K split by a transverse field into Jz/2 + Jperp cos 2K -+ sqrt(hz^2/4 + hx^2 cos^2 K), the chirality and spin current of each band state, the T = 0 two-wall continuum, the Villain intraband edge 2 Jperp |sin q| with its line shape and the wall density at T, and the chiral weight -<S^x> against hx and T.",
  inputs: [
    energyInput("Jz", "J_z", 10, -20, 20, "Ising exchange; > 0 antiferromagnet"),
    energyInput("Jperp", "J_\\perp", 1, 0, 10, "transverse exchange"),
    energyInput("hx", "h_x", 0.5, -5, 5, "transverse field, Zeeman energy"),
    energyInput("hz", "h_z", 0, -5, 5, "longitudinal field, Zeeman energy"),
    { name: "T", symbol: "T", unit: "K", default: 3, min: 0, max: 20, scale: "linear", meaning: "temperature" },
    { name: "q", symbol: "q", unit: "rad", default: 1.2, min: 0.05, max: 3.09, scale: "linear", meaning: "momentum transfer of the Villain line shape (rad per site)" },
  ],
  outputs: [
    { name: "wallGap", symbol: "E_w^{min}", unit: "K", meaning: "bottom of the one-wall band (E / k_B)" },
    { name: "wallDensity", symbol: "n_w", unit: "", meaning: "thermal walls per bond (dilute gas)" },
    { name: "magnetizationX", symbol: "\\langle S^x\\rangle", unit: "", meaning: "transverse magnetization per site (first order)" },
    { name: "chiralWeight", symbol: "\\int C\\,d\\omega", unit: "", meaning: "frequency-integrated chiral weight per site, -<S^x>" },
    { name: "summary", symbol: "", unit: "", kind: "text", meaning: "headline numbers" },
    { name: "K", symbol: "K", unit: "rad", kind: "array", meaning: "wall momentum" },
    { name: "bandLower", symbol: "E_-(K)", unit: "K", kind: "array", meaning: "lower wall band" },
    { name: "bandUpper", symbol: "E_+(K)", unit: "K", kind: "array", meaning: "upper wall band" },
    { name: "chirality", symbol: "\\langle\\kappa^z\\rangle", unit: "", kind: "array", meaning: "vector chirality of the lower-band state" },
    {
      name: "chiralityUpUpWall",
      symbol: "\\langle\\kappa^z\\rangle_{\\uparrow\\uparrow}",
      unit: "",
      kind: "array",
      meaning: "vector chirality of a pure up-up wall at K (the down-down wall carries the opposite; a transverse field mixes them)",
    },
    { name: "spinCurrent", symbol: "j^z", unit: "K", kind: "array", meaning: "spin current of the lower-band state (Jperp kappa^z)" },
    { name: "q", symbol: "q", unit: "rad", kind: "array", meaning: "momentum transfer" },
    { name: "continuumLower", symbol: "\\omega_-(q)", unit: "K", kind: "array", meaning: "two-wall continuum, lower bound" },
    { name: "continuumUpper", symbol: "\\omega_+(q)", unit: "K", kind: "array", meaning: "two-wall continuum, upper bound" },
    { name: "villainEdge", symbol: "\\omega_V(q)", unit: "K", kind: "array", meaning: "edge of the intraband scattering" },
    { name: "villainOmega", symbol: "\\omega", unit: "K", kind: "array", meaning: "energy transfer of the line shape" },
    { name: "villainShape", symbol: "S_V(q,\\omega)", unit: "1/K", kind: "array", meaning: "Villain intraband S^zz per site at q (zero field)" },
    { name: "sweepValues", symbol: "x", unit: "", kind: "array", meaning: "swept hx or T (K)" },
    { name: "sweepChiralWeight", symbol: "\\int C", unit: "", kind: "array", meaning: "chiral weight over the sweep" },
    { name: "sweepWallDensity", symbol: "n_w", unit: "", kind: "array", meaning: "wall density over the sweep" },
  ],
  plots: [
    { id: "band", title: "Wall band", x: "K", y: ["bandLower", "bandUpper"] },
    { id: "chirality", title: "Chirality and spin current of band states", x: "K", y: ["chiralityUpUpWall", "chirality", "spinCurrent"] },
    { id: "continuum", title: "Two-wall continuum and Villain edge", x: "q", y: ["continuumLower", "continuumUpper", "villainEdge"] },
    { id: "villain", title: "Villain line shape at q", x: "villainOmega", y: ["villainShape"] },
    { id: "sweep", title: "Chiral weight and wall density over the sweep", x: "sweepValues", y: ["sweepChiralWeight", "sweepWallDensity"] },
  ],
  sweep: { over: ["hx", "T"], points: 41 },
  assumptions: [
    "First order in Jperp and hx against |Jz| (notes say when they are not small); infinite chain; dilute thermal walls (n_w << 1).",
    "Wall momentum K is the crystal momentum of the one-wall state; the Villain line shape uses the zero-field band and |q - pi| larger than the wall density.",
  ],
  sources: wallSources,
  method:
    "degenerate first-order perturbation theory in the one-wall manifold (2 x 2 Bloch Hamiltonian), derived in lib/src/chains/wallBand.ts and checked against exact diagonalization",
  compute: computeWallBand,
});

export const chainCalculators = [chainSpectrumSpec, chainDynamicsSpec, wallBandSpec];
