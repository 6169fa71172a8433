/**
 * `helicoid charge FILE [--json] [--boundary B] [--layer K] [--mode cores|density] [--cell LEN]`
 *
 * Topological charge of a vector field file (.npy, .csv/.tsv/.txt, our .json form): the lattice
 * skyrmion number (Berg-Luescher solid angles) with a continuum estimate beside it, the objects
 * (charge, centre, radius, helicity, vorticity), vacuum cells, and for 3D fields Q per layer and the
 * Bloch points. JSON output (SI units: m, rad):
 *   {"file", "format", "grid": {...}, "boundary", "skyrmionNumber", "nearestInteger", "closed",
 *    "continuumEstimate", "vacuumCells", "missingCells", "objects": [{"charge", "center", "radius",
 *    "helicity", "vorticity", "kind", "area", "layer"}], "vortices", "layers"?, "blochPoints"?,
 *    "method", "sources", "assumptions", "notes"}
 * Exit codes: 0 done, 1 bad input (the message names what was found and what was expected), 2 usage.
 */
import {
  BOUNDARIES, ConvergenceError, InputError, LATTICE_Q_SOURCES, OBJECT_DEFINITIONS, continuumSkyrmionNumber, findBlochPoints,
  findObjects, findVortices, parseQuantity, skyrmionNumber, type Boundary, type VectorField,
} from "@helicoid/lib";
import { readVectorFieldFile } from "../io/readFieldFile.js";

export const chargeUsage =
  "helicoid charge FILE [--json] [--boundary periodic|open|periodic-x|periodic-y] [--layer K] [--mode cores|density] [--cell LEN | --dx LEN --dy LEN --dz LEN]";

interface Parsed {
  file?: string;
  json: boolean;
  options: Map<string, string>;
  unknown: string[];
}

const VALUED = ["--boundary", "--layer", "--mode", "--cell", "--dx", "--dy", "--dz"];

function parse(args: string[]): Parsed {
  const out: Parsed = { json: false, options: new Map(), unknown: [] };
  for (let i = 0; i < args.length; i++) {
    const a = args[i]!;
    if (a === "--json") { out.json = true; continue; }
    const eq = a.indexOf("=");
    const name = a.startsWith("--") && eq > 0 ? a.slice(0, eq) : a;
    if (VALUED.includes(name)) {
      const v = eq > 0 && a.startsWith("--") ? a.slice(eq + 1) : args[++i];
      if (v === undefined) { out.unknown.push(`${name} (needs a value)`); continue; }
      out.options.set(name, v);
    } else if (a.startsWith("-") && a.length > 1) out.unknown.push(a);
    else if (out.file === undefined) out.file = a;
    else out.unknown.push(a);
  }
  return out;
}

const nm = (v: number) => (v * 1e9).toFixed(2);
const deg = (v: number | null) => (v === null ? "-" : ((v * 180) / Math.PI).toFixed(1));

export async function chargeCommand(args: string[], io: { stdout: (s: string) => void; stderr: (s: string) => void }): Promise<number> {
  const a = parse(args);
  if (a.file === undefined || a.unknown.length > 0) {
    if (a.unknown.length > 0) io.stderr(`helicoid charge: unknown argument ${a.unknown.join(", ")}\n`);
    io.stderr(`usage: ${chargeUsage}\n`);
    return 2;
  }
  try {
    const readOpts: { dx?: number; dy?: number; dz?: number } = {};
    const cell = a.options.get("--cell");
    if (cell !== undefined) readOpts.dx = readOpts.dy = readOpts.dz = parseQuantity("--cell", cell, "m");
    for (const k of ["dx", "dy", "dz"] as const) {
      const v = a.options.get(`--${k}`);
      if (v !== undefined) readOpts[k] = parseQuantity(`--${k}`, v, "m");
    }
    const { field, info } = readVectorFieldFile(a.file, readOpts);
    const notes = [...info.notes];
    const bArg = a.options.get("--boundary");
    if (bArg !== undefined && !BOUNDARIES.includes(bArg as Boundary)) throw new InputError("--boundary", bArg, BOUNDARIES.join(", "));
    const boundary = (bArg ?? info.boundary ?? "open") as Boundary;
    const layerArg = a.options.get("--layer");
    const layer = layerArg === undefined ? 0 : Number(layerArg);
    if (!Number.isInteger(layer) || layer < 0 || layer >= field.nz) throw new InputError("--layer", layerArg, `a whole number from 0 to ${field.nz - 1}`);
    const mode = (a.options.get("--mode") ?? "cores") as "cores" | "density";
    if (mode !== "cores" && mode !== "density") throw new InputError("--mode", mode, '"cores" or "density"');
    const report = analyse(field, boundary, layer, mode);
    const result = {
      file: a.file,
      format: info.format,
      grid: { nx: field.nx, ny: field.ny, nz: field.nz, dx: field.dx, dy: field.dy, dz: field.dz, lattice: field.lattice, unit: "m" },
      boundary,
      layer,
      ...report,
      vacuumCells: field.vacuumCells,
      missingCells: info.missingCells,
      method: `skyrmion number: ${report.method}; continuum estimate: central differences; objects: ${mode === "cores" ? "reversed-core regions" : "charge-density clusters"} grown to cover the grid`,
      definitions: OBJECT_DEFINITIONS,
      sources: LATTICE_Q_SOURCES,
      assumptions: [
        "|m| = 1 (vectors normalized on reading); zero, tiny or NaN vectors are vacuum",
        boundary === "periodic" ? "periodic boundaries along x and y" : `${boundary} boundaries (give --boundary periodic for a periodic simulation)`,
        "Q = (1/4 pi) Int m.(d_x m x d_y m) dx dy; with a +z background a core-down skyrmion of vorticity +1 has Q = -1",
        "lengths in m, angles in rad",
      ],
      notes,
    };
    if (a.json) io.stdout(JSON.stringify(result, null, 2) + "\n");
    else io.stdout(summary(result));
    return 0;
  } catch (err) {
    if (err instanceof InputError || err instanceof ConvergenceError) {
      io.stderr(`helicoid charge: ${err.message}\n`);
      return 1;
    }
    throw err;
  }
}

function analyse(field: VectorField, boundary: Boundary, layer: number, mode: "cores" | "density") {
  const q = skyrmionNumber(field, { boundary, layer });
  let continuum: number | null = null;
  if (field.nx >= 3 && field.ny >= 3) continuum = continuumSkyrmionNumber(field, { boundary, layer }).Q;
  const layersToScan = field.nz === 1 ? [layer] : Array.from({ length: field.nz }, (_, k) => k);
  const objects: Array<Record<string, unknown>> = [];
  const layers: Array<{ layer: number; skyrmionNumber: number }> = [];
  for (const k of layersToScan) {
    const hasMatter = field.vacuum === null || field.vacuum.subarray(k * field.nx * field.ny, (k + 1) * field.nx * field.ny).some((v) => v === 0);
    if (!hasMatter) continue;
    const o = findObjects(field, { boundary, layer: k, mode });
    if (field.nz > 1) layers.push({ layer: k, skyrmionNumber: o.Q });
    for (const ob of o.objects) {
      const entry: Record<string, unknown> = {
        charge: ob.charge, center: ob.center, radius: ob.radius, helicity: ob.helicity, vorticity: ob.vorticity,
        kind: ob.kind, area: ob.area, corePolarity: ob.corePolarity,
      };
      if (field.nz > 1) entry.layer = k;
      if (ob.note) entry.note = ob.note;
      objects.push(entry);
    }
  }
  const v = findVortices(field, { boundary, layer });
  const out: Record<string, unknown> & { method: string } = {
    skyrmionNumber: q.Q,
    nearestInteger: q.nearestInteger,
    closed: q.closed,
    continuumEstimate: continuum,
    objects,
    vortices: { vortices: v.vortices, antivortices: v.antivortices, totalWinding: v.totalWinding },
    method: q.method,
  };
  if (field.nz > 1) {
    out.layers = layers;
    if (field.lattice === "square") {
      const bp = findBlochPoints(field, { boundary });
      out.blochPoints = bp.points.map((p) => ({ center: [p.x, p.y, p.z], degree: p.degree, cell: [p.i, p.j, p.k] }));
    }
  }
  return out;
}

function summary(r: Record<string, unknown>): string {
  const g = r.grid as { nx: number; ny: number; nz: number; dx: number; dy: number; dz: number; lattice: string };
  const lines: string[] = [];
  lines.push(`file: ${r.file} (${r.format}; ${g.nx} x ${g.ny} x ${g.nz} cells of ${nm(g.dx)} x ${nm(g.dy)} x ${nm(g.dz)} nm, ${g.lattice} lattice)`);
  lines.push(`boundary: ${r.boundary}; vacuum cells: ${r.vacuumCells}${(r.missingCells as number) > 0 ? ` (${r.missingCells} missing rows)` : ""}`);
  const Q = r.skyrmionNumber as number;
  lines.push(`skyrmion number Q = ${Q.toFixed(6)}${r.closed ? " (closed lattice: exact integer)" : ""}  [layer ${r.layer}; lattice solid angles, Berg-Luescher]`);
  if (r.continuumEstimate !== null) lines.push(`continuum estimate: ${(r.continuumEstimate as number).toFixed(6)}`);
  const layers = r.layers as Array<{ layer: number; skyrmionNumber: number }> | undefined;
  if (layers) lines.push(`Q per layer: ${layers.map((l) => l.skyrmionNumber.toFixed(3)).join(" ")}`);
  const bp = r.blochPoints as Array<{ center: number[]; degree: number }> | undefined;
  if (bp) {
    lines.push(`Bloch points / hedgehogs: ${bp.length}`);
    for (const p of bp.slice(0, 20)) lines.push(`  degree ${p.degree > 0 ? "+" : ""}${p.degree} at (${p.center.map(nm).join(", ")}) nm`);
  }
  const objs = r.objects as Array<{ kind: string; charge: number; center: number[]; radius: number; vorticity: number | null; helicity: number | null; layer?: number }>;
  lines.push(`objects: ${objs.length}`);
  if (objs.length > 0) {
    lines.push(`  ${"#".padStart(3)}  ${"kind".padEnd(22)} ${"charge".padStart(8)}  ${"centre (nm)".padEnd(20)} ${"radius (nm)".padStart(11)} ${"vorticity".padStart(9)} ${"helicity (deg)".padStart(14)}`);
    objs.slice(0, 50).forEach((o, k) => {
      lines.push(`  ${String(k).padStart(3)}  ${(o.kind + (o.layer !== undefined ? ` (layer ${o.layer})` : "")).padEnd(22)} ${o.charge.toFixed(3).padStart(8)}  ${`(${nm(o.center[0]!)}, ${nm(o.center[1]!)})`.padEnd(20)} ${nm(o.radius).padStart(11)} ${String(o.vorticity ?? "-").padStart(9)} ${deg(o.helicity).padStart(14)}`);
    });
    if (objs.length > 50) lines.push(`  ... ${objs.length - 50} more (use --json)`);
  }
  const v = r.vortices as { vortices: number; antivortices: number };
  lines.push(`in-plane vortices: ${v.vortices}, antivortices: ${v.antivortices}`);
  for (const n of r.notes as string[]) lines.push(`note: ${n}`);
  lines.push(`assumptions: ${(r.assumptions as string[]).join("; ")}`);
  return lines.join("\n") + "\n";
}
