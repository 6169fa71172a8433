/**
 * `helicoid charge FILE [--json] [--boundary B] [--layer K] [--mode cores|density] [--cell LEN]`
 *
 * Topological charge of a vector field file (.npy, .csv/.tsv/.txt, our .json form): the lattice
 * skyrmion number (Berg-Luescher solid angles) with a continuum estimate beside it, the objects
 * (charge, centre, radius, helicity, vorticity), vacuum cells, and for 3D fields Q per layer and the
 * Bloch points. JSON output (SI units: m, rad; the text summary shows nm and degrees):
 *   {"file", "format", "grid": {...}, "boundary", "skyrmionNumber", "nearestInteger", "closed",
 *    "continuumEstimate", "vacuumCells", "missingCells", "objects": [{"charge", "center", "radius",
 *    "helicity", "vorticity", "kind", "area", "layer"}], "vortices", "layers"?, "blochPoints"?,
 *    "method", "sources", "assumptions", "notes"}
 * Exit codes: 0 done; 2 bad input or usage (a missing, unreadable or malformed file, a bad option
 * value, an unknown option: one line naming what was found and what was expected); 1 a
 * computation that failed. With --json an error is also a JSON object on stdout, the shape of
 * `helicoid calc --json`'s: {"id": "charge", "file", "status": "error", "error": {"type", "message", ...}}.
 */
import { BOUNDARIES, ConvergenceError, InputError, analyseTexture, parseQuantity, type Boundary } from "@helicoid/lib";
import { readVectorFieldFile } from "../io/readFieldFile.js";
import { errorJson, fileReason, inputFileReason, isFileSystemError, parseStrict, UsageError, type CommandIO } from "./args.js";

export const chargeUsage = [
  "usage: helicoid charge FILE [--json] [--boundary B] [--layer K] [--mode cores|density] [--cell LEN | --dx LEN --dy LEN --dz LEN]",
  "  FILE                 a vector field: .npy (ny, nx, 3) or (nz, ny, nx, 3), .csv/.tsv/.txt columns x y [z] mx my mz, or .json",
  `  --json               JSON on stdout, SI units (m, rad); the text summary shows nm and degrees`,
  `  --boundary B         ${BOUNDARIES.join(", ")} (default: the file's own, else open)`,
  "  --layer K            the layer of a 3D field for Q (0 to nz-1, default 0)",
  "  --mode cores|density how objects are found: reversed cores (default) or charge-density clusters",
  "  --cell LEN           a cubic cell, such as 2nm (a .npy file has no cell size: 1 nm if not given)",
  "  --dx LEN --dy LEN --dz LEN   the cell edges: give all three, or --cell LEN with any of them to override",
  "Formats: .npy float32/float64 in either byte order, C or Fortran order, shape (ny, nx, 3) or (nz, ny, nx, 3), x fastest,",
  "  or component-first (3, ny, nx) or (3, nz, ny, nx) (the layout read is said in the output);",
  "  .csv/.tsv/.txt with a header naming the columns (x, y, [z,] mx, my, mz; units in ( ) after a name), one row per cell;",
  '  .json {"kind": "helicoid-vector-field", "version": 1, nx, ny, [nz,] [cell: ["1 nm", ...],] [boundary,] m: [mx, my, mz, ...]}',
  "  (components interleaved, x fastest; or mx/my/mz arrays; null = vacuum). The file is never modified.",
  "Exit status: 0 done, 2 bad input or usage, 1 a computation that failed.",
].join("\n");

const OPTIONS = {
  flags: ["--json"],
  valued: {
    "--boundary": BOUNDARIES.join(", "),
    "--layer": "a layer number such as 0",
    "--mode": "cores or density",
    "--cell": "a length such as 2nm",
    "--dx": "a length such as 2nm",
    "--dy": "a length such as 2nm",
    "--dz": "a length such as 2nm",
  },
};

/** The cell size from --cell and --dx/--dy/--dz: never inferred from a partial set. */
function cellOptions(o: Map<string, string>): { dx?: number; dy?: number; dz?: number } {
  const out: { dx?: number; dy?: number; dz?: number } = {};
  const length = (name: string, raw: string) => {
    const v = parseQuantity(name, raw, "m");
    if (!(v > 0)) throw new InputError(name, raw, "a positive length such as 2nm");
    return v;
  };
  const cell = o.get("--cell");
  if (cell !== undefined) out.dx = out.dy = out.dz = length("--cell", cell);
  const given = (["dx", "dy", "dz"] as const).filter((k) => o.has(`--${k}`));
  if (cell === undefined && given.length > 0 && given.length < 3) {
    const missing = (["dx", "dy", "dz"] as const).filter((k) => !o.has(`--${k}`)).map((k) => `--${k}`);
    throw new UsageError(
      `${given.map((k) => `--${k}`).join(" and ")} without ${missing.join(" and ")}: give ${missing.join(" and ")} too, or --cell LEN (with --dx/--dy/--dz to override single edges)`,
    );
  }
  for (const k of given) out[k] = length(`--${k}`, o.get(`--${k}`)!);
  return out;
}

/** The readers' notes speak of their options (dx, dy, dz); on the command line those are --cell or --dx --dy --dz. */
const commandLineNote = (n: string) => n.replace(/give dx, dy, dz to change it/g, "give --cell LEN, or --dx --dy --dz, to change it");

const nm = (v: number) => (v * 1e9).toFixed(2);
const deg = (v: number | null) => (v === null ? "-" : ((v * 180) / Math.PI).toFixed(1));

export async function chargeCommand(args: string[], io: CommandIO): Promise<number> {
  const json = args.includes("--json");
  let file: string | undefined;
  const fail = (err: Error, status: number): number => {
    if (json) io.stdout(errorJson("charge", err, { file: file ?? null }));
    io.stderr(`helicoid charge: ${err.message}\n`);
    if (err instanceof UsageError) io.stderr(`${chargeUsage}\n`);
    return status;
  };
  if (args.includes("--help") || args.includes("-h")) {
    io.stdout(`${chargeUsage}\n`);
    return 0;
  }
  try {
    const a = parseStrict(args, OPTIONS);
    if (a.positional.length > 1) throw new UsageError(`one FILE expected, ${a.positional.length} given (${a.positional.join(", ")})`);
    file = a.positional[0];
    if (file === undefined) throw new UsageError("no FILE given");
    const readOpts = cellOptions(a.options);
    const bArg = a.options.get("--boundary");
    if (bArg !== undefined && !BOUNDARIES.includes(bArg as Boundary)) throw new InputError("--boundary", bArg, BOUNDARIES.join(", "));
    const mode = (a.options.get("--mode") ?? "cores") as "cores" | "density";
    if (mode !== "cores" && mode !== "density") throw new InputError("--mode", mode, '"cores" or "density"');
    const layerArg = a.options.get("--layer");
    const layer = layerArg === undefined ? 0 : Number(layerArg);
    if (layerArg !== undefined && (!/^\d+$/.test(layerArg.trim()) || !Number.isInteger(layer)))
      throw new InputError("--layer", layerArg, "a whole number from 0 (the first layer)");
    const problem = inputFileReason(file);
    if (problem !== null) throw new InputError("file", file, "an existing, readable vector field file", problem);
    const { field, info } = readVectorFieldFile(file, readOpts);
    const notes = info.notes.map(commandLineNote);
    const boundary = (bArg ?? info.boundary ?? "open") as Boundary;
    if (layer >= field.nz)
      throw new InputError("--layer", layerArg, field.nz === 1 ? "0: the field has one layer" : `a whole number from 0 to ${field.nz - 1} (the field has ${field.nz} layers)`);
    const report = analyseTexture(field, { boundary, layer, mode });
    // the command says how to ask for periodic boundaries in its own words
    const assumptions = report.assumptions.map((x) => x.replace("give the boundary as periodic", "give --boundary periodic"));
    const { status: _status, definitions, method, sources, notes: _notes, assumptions: _assumptions, boundary: _b, layer: _l, ...numbers } = report;
    const result = {
      file,
      format: info.format,
      grid: { nx: field.nx, ny: field.ny, nz: field.nz, dx: field.dx, dy: field.dy, dz: field.dz, lattice: field.lattice, unit: "m" },
      boundary,
      layer,
      ...numbers,
      vacuumCells: field.vacuumCells,
      missingCells: info.missingCells,
      method,
      definitions,
      sources,
      assumptions: a.flags.has("--json") ? [...assumptions, "lengths in m, angles in rad"] : assumptions,
      notes,
    };
    if (json) io.stdout(JSON.stringify(result, null, 2) + "\n");
    else io.stdout(summary(result));
    return 0;
  } catch (err) {
    if (err instanceof UsageError || err instanceof InputError) return fail(err, 2);
    // A file that vanished or could not be read between the check and the read: still the user's path.
    if (isFileSystemError(err)) return fail(new InputError("file", file, "an existing, readable vector field file", fileReason(err)), 2);
    if (err instanceof ConvergenceError) return fail(err, 1);
    throw err;
  }
}

function summary(r: Record<string, unknown>): string {
  const g = r.grid as { nx: number; ny: number; nz: number; dx: number; dy: number; dz: number; lattice: string };
  const lines: string[] = [];
  lines.push(`units: lengths in nm, angles in degrees (--json gives SI: m, rad)`);
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
    lines.push(
      `  ${"#".padStart(3)}  ${"kind".padEnd(22)} ${"charge".padStart(8)}  ${"centre (nm)".padEnd(20)} ${"radius (nm)".padStart(11)} ${"vorticity".padStart(9)} ${"helicity (deg)".padStart(14)}`,
    );
    objs.slice(0, 50).forEach((o, k) => {
      lines.push(
        `  ${String(k).padStart(3)}  ${(o.kind + (o.layer !== undefined ? ` (layer ${o.layer})` : "")).padEnd(22)} ${o.charge.toFixed(3).padStart(8)}  ${`(${nm(o.center[0]!)}, ${nm(o.center[1]!)})`.padEnd(20)} ${nm(o.radius).padStart(11)} ${String(o.vorticity ?? "-").padStart(9)} ${deg(o.helicity).padStart(14)}`,
      );
    });
    if (objs.length > 50) lines.push(`  ... ${objs.length - 50} more (use --json)`);
  }
  const v = r.vortices as { vortices: number; antivortices: number };
  lines.push(`in-plane vortices: ${v.vortices}, antivortices: ${v.antivortices}`);
  for (const n of r.notes as string[]) lines.push(`note: ${n}`);
  lines.push(`assumptions: ${(r.assumptions as string[]).join("; ")}`);
  return lines.join("\n") + "\n";
}
