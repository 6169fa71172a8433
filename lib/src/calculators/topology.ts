import type { ComputeCost, ComputeOutput, InputValues } from "./spec.js";
import { defineCalculator, choiceInput } from "./spec.js";
import { findObjects } from "../topology/objects.js";
import { skyrmionNumber, LATTICE_Q_SOURCES } from "../topology/skyrmionNumber.js";
import { continuumSkyrmionNumber } from "../topology/continuumCharge.js";
import { findVortices } from "../topology/vortices.js";
import { skyrmionLatticeTexture, skyrmionTexture, skyrmioniumTexture, vortexPairTexture, type GridSpec } from "../topology/textures.js";
import type { VectorField } from "../topology/field.js";

const KINDS = [
  { value: 0, label: "skyrmion" },
  { value: 1, label: "antiskyrmion" },
  { value: 2, label: "skyrmionium" },
  { value: 3, label: "skyrmion lattice" },
  { value: 4, label: "higher-order skyrmion (vorticity input)" },
  { value: 5, label: "vortex-antivortex pair" },
];

/** Build the demo texture of the `texture` calculator. Exported for notebooks and tests. */
export function textureFromInputs(v: InputValues, notes: string[] = []): VectorField {
  const n = v.n!;
  const grid: GridSpec = { nx: n, ny: n, dx: v.cell!, periodic: v.boundary === 0 };
  const bg = v.background === 1 ? -1 : 1;
  const s = { R: v.R!, w: v.w!, helicity: v.helicity! };
  const L = n * v.cell!;
  switch (v.kind) {
    case 1:
      return skyrmionTexture(grid, { ...s, vorticity: -1 }, { background: bg });
    case 2:
      return skyrmioniumTexture(grid, { ...s, Rinner: s.R / 2 }, { background: bg });
    case 3: {
      // neighbouring cores must stay apart: a core of radius R with walls of width w fills about
      // R + 2w, and the centres of a triangular lattice are a apart
      if (s.R + 2 * s.w > v.a! / 2) {
        notes.push(
          `the skyrmions of this lattice overlap: R + 2w = ${((s.R + 2 * s.w) * 1e9).toPrecision(3)} nm exceeds half the lattice constant a/2 = ${((v.a! / 2) * 1e9).toPrecision(3)} nm, so the reversed cores merge and the objects found are the islands between them; choose R + 2w < a/2 (for a = ${(v.a! * 1e9).toPrecision(3)} nm, R below ${((v.a! / 2 - 2 * s.w) * 1e9).toPrecision(3)} nm)`,
        );
      }
      return skyrmionLatticeTexture(grid, { ...s, a: v.a! }, { background: bg });
    }
    case 4: {
      let vort = v.vorticity!;
      if (vort === 0) {
        notes.push("vorticity 0 describes no skyrmion; vorticity 1 was used");
        vort = 1;
      }
      return skyrmionTexture(grid, { ...s, vorticity: vort }, { background: bg });
    }
    case 5:
      return vortexPairTexture(grid, {
        vortex: [L / 3 + 0.3 * v.cell!, L / 2 + 0.2 * v.cell!],
        antivortex: [(2 * L) / 3 + 0.1 * v.cell!, L / 2 + 0.4 * v.cell!],
        coreRadius: v.w!,
        vortexPolarity: 1,
        antivortexPolarity: v.pairPolarity === 1 ? -1 : 1,
        angle: v.helicity!,
      });
    default:
      return skyrmionTexture(grid, s, { background: bg });
  }
}

/** Largest side (cells) of the field preview in the outputs. */
export const TEXTURE_PREVIEW_MAX = 64;

/**
 * A compact picture of an n x n texture for the outputs (widget state, exported pages): every k-th
 * cell along x and y, k = ceil(n / 64), so at most 64 x 64 cells (12 288 numbers), components
 * rounded to 1e-4 (for display; the full field comes from textureFromInputs).
 */
export function fieldPreview(m: Float64Array, n: number, cell: number): { size: number; cell: number; m: number[] } {
  const k = Math.ceil(n / TEXTURE_PREVIEW_MAX);
  const size = Math.ceil(n / k);
  const out = new Array<number>(3 * size * size);
  let o = 0;
  for (let j = 0; j < size; j++) {
    for (let i = 0; i < size; i++) {
      const c = 3 * (j * k * n + i * k);
      for (let comp = 0; comp < 3; comp++) out[o++] = Math.round(m[c + comp]! * 1e4) / 1e4 + 0; // + 0: no -0
    }
  }
  return { size, cell: k * cell, m: out };
}

/**
 * Cost of a demo texture: the field and its per-cell analyses (charge density, object labels,
 * vortex plaquettes: a few hundred bytes and steps a cell) plus, for the skyrmion lattice, one
 * object record per lattice site ((n cell / a)^2 sites: a = 1 pm on 128 nm is 1.9e10 of them).
 */
function textureCost(v: InputValues): ComputeCost {
  const n = v.n!,
    cells = n * n;
  const sites = v.kind === 3 ? (2 / Math.sqrt(3)) * ((n * v.cell!) / v.a!) ** 2 : 1;
  const bytes = 400 * cells + 300 * sites;
  const steps = 400 * cells + 100 * sites;
  return {
    bytes,
    steps,
    parameter: sites > cells ? "a" : "n",
    what: sites > cells ? `a skyrmion lattice of about ${sites.toExponential(1)} sites on ${n} x ${n} cells` : `${n} x ${n} cells with their analyses`,
  };
}

function computeTexture(v: InputValues): ComputeOutput {
  const notes: string[] = [];
  const field = textureFromInputs(v, notes);
  const boundary = v.boundary === 1 ? "open" : "periodic";
  if (v.kind === 5 && boundary === "periodic") notes.push("a vortex-antivortex pair is not periodic: choose the open boundary for a meaningful Q");
  const q = skyrmionNumber(field, { boundary });
  const cont = continuumSkyrmionNumber(field, { boundary });
  const objs = findObjects(field, { boundary });
  const vort = findVortices(field, { boundary });
  const n = field.nx;
  const j = Math.floor(n / 2);
  const lineX: number[] = [],
    lineMz: number[] = [];
  for (let i = 0; i < n; i++) {
    lineX.push(i * field.dx);
    lineMz.push(field.m[3 * (j * n + i) + 2]!);
  }
  if (objs.objects.length === 0) notes.push("no reversed core: no objects");
  if (vort.backgroundWinding !== null && vort.backgroundWinding !== 0) {
    notes.push(
      `in-plane winding ${vort.backgroundWinding} sits in the background (|m_xy| < ${vort.minInPlane} |m|): on a periodic grid the windings add up to 0, and this balance is not counted as vortices`,
    );
  }
  const preview = fieldPreview(field.m, n, field.dx);
  return {
    status: notes.some((s) => s.startsWith("a vortex") || s.startsWith("the skyrmions of this lattice overlap")) ? "warning" : "ok",
    notes,
    values: {
      Q: q.Q,
      Qinteger: q.nearestInteger,
      Qcontinuum: cont.Q,
      objectCount: objs.objects.length,
      vortexCount: vort.vortices,
      antivortexCount: vort.antivortices,
      zeroLineCount: vort.zeroLines,
      inPlaneTolerance: vort.minInPlane,
      objectX: objs.objects.map((o) => o.center[0]),
      objectY: objs.objects.map((o) => o.center[1]),
      objectCharge: objs.objects.map((o) => o.charge),
      objectRadius: objs.objects.map((o) => o.radius),
      objectVorticity: objs.objects.map((o) => o.vorticity ?? 0),
      objectHelicity: objs.objects.map((o) => o.helicity ?? 0),
      objectKinds: objs.objects.map((o) => o.kind).join(", ") || "(none)",
      lineX,
      lineMz,
      previewSize: preview.size,
      previewCell: preview.cell,
      fieldPreview: preview.m,
    },
  };
}

export const textureSpec = defineCalculator({
  id: "texture",
  title: "Demo texture: topological charge and objects",
  summary:
    "Generates an analytic demo texture (skyrmion, antiskyrmion, skyrmionium, skyrmion lattice, higher-order skyrmion or vortex-antivortex pair) on an n x n grid and counts its topology: lattice skyrmion number Q (Berg-Luescher solid angles), a continuum finite-difference estimate beside it, in-plane vortices, and the objects with their charge, centre, radius (area inside m_z = 0), vorticity and helicity.",
  inputs: [
    choiceInput("kind", "\\text{kind}", KINDS, "which texture to generate"),
    { name: "n", symbol: "n", unit: "", default: 128, min: 16, max: 512, scale: "log", kind: "integer", meaning: "cells along x and y" },
    { name: "cell", symbol: "\\delta x", unit: "m", default: 1e-9, min: 1e-10, max: 1e-8, scale: "log", meaning: "cell size" },
    {
      name: "R",
      symbol: "R",
      unit: "m",
      default: 20e-9,
      min: 1e-9,
      max: 100e-9,
      scale: "log",
      meaning: "radius where m_z = 0 (outer radius of a skyrmionium); for walls thin against R, the profiles add, so thick walls shift the zeros",
    },
    { name: "w", symbol: "w", unit: "m", default: 5e-9, min: 5e-10, max: 30e-9, scale: "log", meaning: "wall width of the profile (core radius of a vortex)" },
    {
      name: "helicity",
      symbol: "\\gamma",
      unit: "rad",
      default: 0,
      min: -Math.PI,
      max: Math.PI,
      scale: "linear",
      meaning: "helicity: 0 outward Neel, pi inward Neel, +-pi/2 Bloch (90deg accepted)",
    },
    { name: "vorticity", symbol: "v", unit: "", default: 2, min: -4, max: 4, scale: "linear", kind: "integer", meaning: "vorticity of the higher-order skyrmion (kind 4)" },
    { name: "a", symbol: "a", unit: "m", default: 45e-9, min: 10e-9, max: 200e-9, scale: "log", meaning: "target lattice constant of the skyrmion lattice (kind 3)" },
    choiceInput("background", "m_\\infty", ["+z", "-z"], "background direction (cores point the other way)"),
    choiceInput("pairPolarity", "p_1 p_2", ["same core polarities", "opposite core polarities"], "core polarities of the vortex-antivortex pair (kind 5)"),
    choiceInput("boundary", "\\text{bc}", ["periodic", "open"], "boundary of the grid"),
  ],
  outputs: [
    { name: "Q", symbol: "Q", unit: "", meaning: "lattice skyrmion number (exact integer on a periodic grid)" },
    { name: "Qinteger", symbol: "[Q]", unit: "", meaning: "nearest integer of Q" },
    { name: "Qcontinuum", symbol: "Q_{\\mathrm{fd}}", unit: "", meaning: "continuum finite-difference estimate of Q (resolution check)" },
    { name: "objectCount", symbol: "N", unit: "", meaning: "number of objects (reversed-core regions)" },
    {
      name: "vortexCount",
      symbol: "N_v",
      unit: "",
      meaning: "in-plane vortices: plaquettes, or cores of sites without in-plane direction, with winding > 0 (rule in topology/vortices.ts)",
    },
    { name: "antivortexCount", symbol: "N_{av}", unit: "", meaning: "in-plane antivortices: plaquettes or cores with winding < 0" },
    { name: "zeroLineCount", symbol: "N_{0}", unit: "", meaning: "lines or rings where m_xy passes through zero (e.g. the middle ring of a skyrmionium): not vortex cores" },
    { name: "inPlaneTolerance", symbol: "\\epsilon_{xy}", unit: "", meaning: "|m_xy| / |m| below which a site has no in-plane direction (1e-3, raised to 4x the estimated noise)" },
    { name: "objectX", symbol: "x_c", unit: "m", kind: "array", meaning: "charge-weighted centres, x" },
    { name: "objectY", symbol: "y_c", unit: "m", kind: "array", meaning: "charge-weighted centres, y" },
    { name: "objectCharge", symbol: "Q_i", unit: "", kind: "array", meaning: "charge of each object" },
    { name: "objectRadius", symbol: "R_i", unit: "m", kind: "array", meaning: "radius sqrt(area inside m_z = 0 / pi)" },
    { name: "objectVorticity", symbol: "v_i", unit: "", kind: "array", meaning: "vorticity (0 where it cannot be measured)" },
    { name: "objectHelicity", symbol: "\\gamma_i", unit: "rad", kind: "array", meaning: "helicity of each object (0 where it cannot be measured)" },
    { name: "objectKinds", symbol: "\\text{kinds}", unit: "", kind: "text", meaning: "names of the objects" },
    { name: "lineX", symbol: "x", unit: "m", kind: "array", meaning: "x along the middle row" },
    { name: "lineMz", symbol: "m_z", unit: "", kind: "array", meaning: "m_z along the middle row" },
    { name: "previewSize", symbol: "n_p", unit: "", meaning: "cells along x and y of the field preview (at most 64)" },
    { name: "previewCell", symbol: "\\Delta_p", unit: "m", meaning: "cell size of the field preview (every k-th cell of the grid)" },
    {
      name: "fieldPreview",
      symbol: "\\mathbf{m}_p",
      unit: "",
      kind: "array",
      meaning: "the texture at preview resolution: mx, my, mz interleaved, x fastest (3 previewSize^2 numbers, rounded to 1e-4); the full field is textureFromInputs(inputs)",
    },
  ],
  plots: [{ id: "profile", title: "m_z along the middle row", x: "lineX", y: ["lineMz"] }],
  assumptions: [
    "analytic demo textures (not simulations): wall profile tan(theta/2) = sinh(R/w)/sinh(rho/w), each cell takes its nearest object",
    "|m| = 1; Q = (1/4 pi) Int m.(d_x m x d_y m) dx dy, so a core-down skyrmion of vorticity +1 in a +z background has Q = -1",
    "the lattice Q is an exact integer only on a closed (periodic, vacuum-free) grid",
    "in-plane vortices: sites with |m_xy| < 1e-3 |m| have no in-plane direction; an enclosed set of them is one core counted by the winding around it, a set reaching the open edge or wrapping around the periodic grid is background and not counted (on a periodic grid its winding balances the vortices and is given in a note)",
    "the outputs carry a preview of the field (every k-th cell, at most 64 x 64 cells, components rounded to 1e-4); the counts use the full n x n grid, and textureFromInputs(inputs) regenerates the full field",
  ],
  sources: [
    ...LATTICE_Q_SOURCES,
    "F. Buettner, I. Lemesh, G. Beach, Sci. Rep. 8, 4464 (2018) (profile)",
    "N. Nagaosa, Y. Tokura, Nat. Nanotechnol. 8, 899 (2013) (vorticity and helicity)",
  ],
  method: "analytic texture generator; Berg-Luescher solid angles; central differences; reversed-core regions grown over the grid",
  limits: {
    cell: { above: 0, why: "a cell size" },
    R: { above: 0, why: "a radius" },
    w: { above: 0, why: "a wall width" },
    a: { above: 0, why: "a lattice constant" },
  },
  cost: textureCost,
  compute: computeTexture,
});

/** Calculator specs of the topology domain. */
export const topologyCalculators = [textureSpec];
