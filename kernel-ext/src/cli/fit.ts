/**
 * `helicoid fit FILE --model ID [--json]` and `helicoid fit --list`.
 * Reads a CSV line profile (position, signal, optional sigma; units in the header such as "x (nm)"
 * or by --x-unit / --y-unit), fits a catalogue model and prints a table or JSON:
 * {"model", "status", "message", "parameters": {name: {"value", "stderr", "unit", "interval"}},
 *  "chiSquareReduced", "residualRms", "aic", "bic", "correlation": {"names", "matrix"},
 *  "curve": {"x", "y", "fitted", "residual", "sigma", "xUnit", "yUnit"} (SI), "notes"}.
 * Options: --start name=value (SI number or a quantity such as "12 nm"), --fix name[=value],
 * --free name, --drop-nan, --x-unit U, --y-unit U, --profile (profile-likelihood intervals).
 * `helicoid fit --series FILE[@FIELD] ... --film ...` fits A, D (Ku) to profiles at several fields
 * (fitSeries.ts).
 * Exit codes (both modes): 0 success, 1 a fit that failed (the message says why), 2 bad input.
 */
import { readFileSync, statSync } from "node:fs";
import { seriesUsage, fitSeriesCommand } from "./fitSeries.js";
import { fileReason, parseStrict, UsageError, type StrictSpec } from "./args.js";
import {
  readProfileCsv,
  fitProfile,
  profileModels,
  getProfileModel,
  parseQuantity,
  formatQuantity,
  formatWithError,
  isPlainNumber,
  InputError,
  ConvergenceError,
} from "@helicoid/lib";

export interface FitIo {
  stdout: (s: string) => void;
  stderr: (s: string) => void;
}

const usage = `usage: helicoid fit FILE --model ID [--json] [--start name=value ...] [--fix name[=value] ...] [--free name ...]
                    [--drop-nan] [--x-unit U] [--y-unit U] [--profile]
       helicoid fit --list [--json]
${seriesUsage}

The profile file (CSV, or TSV / whitespace-separated text):
  # comment lines start with '#'; a line "# field: 5 mT" gives the field of a --series profile
  x (nm), mz, sigma             a header row names the columns; units in ( ) or [ ] after a name
  nm, , mT                      or (optional) a units row right under the header, one unit per column
  -40.0, 0.98, 0.02             then one row per point: position, signal, and optionally sigma
  ...
  Columns: 1st position, 2nd signal, 3rd (optional) the standard deviation of each signal value.
  Units: from the header or the units row, else --x-unit / --y-unit; a position without a unit is read in m (said in
  the output), a field signal (T, mT, G, Oe) is converted to T, other signals keep their label.
  Without sigma the errors are scaled by the reduced chi-square and the fit quality is the residual
  RMS (a reduced chi-square needs known sigmas); both are said in the output.
  Numbers are decimal (1.5, -2e-3); empty or NaN cells are refused with their line unless --drop-nan;
  rows may come in any order (they are sorted, with a note). The file is never modified.
  Models: helicoid fit --list (what each fits, its parameters with units and meanings).
  Start values not given with --start are guessed from the data by the library: the command makes
  the same call as fitProfile(readProfileCsv(text), ID) in a notebook, and gives the same numbers.`;

/** Largest profile CSV read (bytes): a line profile of a million points is about 40 MB. */
export const PROFILE_FILE_LIMIT = 256e6;

/** The text of a profile CSV, refused before reading when it is larger than PROFILE_FILE_LIMIT. */
export function readProfileText(file: string): string {
  const size = statSync(file).size;
  if (size > PROFILE_FILE_LIMIT) {
    throw new InputError(
      "FILE",
      file,
      `a profile CSV of at most ${PROFILE_FILE_LIMIT / 1e6} MB`,
      `This file has ${(size / 1e6).toFixed(0)} MB; reading it as text would need about ${((6 * size) / 1e9).toFixed(1)} GB of memory (budget 2 GB)`,
    );
  }
  return readFileSync(file, "utf8");
}

const FIT_OPTIONS: StrictSpec = {
  flags: ["--json", "--list", "--drop-nan", "--profile", "--help", "-h"],
  valued: {
    "--model": "a model id (helicoid fit --list)",
    "-m": "a model id (helicoid fit --list)",
    "--x-unit": "a length unit such as nm",
    "--y-unit": "a unit of the signal",
    "--start": "name=value",
    "--fix": "name or name=value",
    "--free": "a parameter name",
  },
  repeatable: ["--start", "--fix", "--free"],
  aliases: [["--model", "-m"]],
};

export async function fitCommand(args: string[], io: FitIo): Promise<number> {
  if (args.includes("--series")) return fitSeriesCommand(args, io);
  let file: string | undefined;
  let modelId: string | undefined;
  let json = false;
  let list = false;
  let dropNaN = false;
  let profile = false;
  let xUnit: string | undefined;
  let yUnit: string | undefined;
  const startRaw: Array<[string, string]> = [];
  const fixRaw: Array<[string, string | null]> = [];
  const free: string[] = [];
  try {
    let a: ReturnType<typeof parseStrict>;
    try {
      a = parseStrict(args, FIT_OPTIONS);
    } catch (err) {
      if (err instanceof UsageError) {
        io.stderr(`helicoid fit: ${err.message}\n${usage.split("\n")[0]}\n`);
        return 2;
      }
      throw err;
    }
    if (a.flags.has("--help") || a.flags.has("-h")) {
      io.stdout(usage + "\n");
      return 0;
    }
    json = a.flags.has("--json");
    list = a.flags.has("--list");
    dropNaN = a.flags.has("--drop-nan");
    profile = a.flags.has("--profile");
    modelId = a.options.get("--model") ?? a.options.get("-m");
    xUnit = a.options.get("--x-unit");
    yUnit = a.options.get("--y-unit");
    for (const v of a.lists.get("--start") ?? []) {
      const k = v.indexOf("=");
      if (k < 1) throw new InputError("--start", v, "name=value");
      startRaw.push([v.slice(0, k), v.slice(k + 1)]);
    }
    for (const v of a.lists.get("--fix") ?? []) {
      const k = v.indexOf("=");
      fixRaw.push(k < 0 ? [v, null] : [v.slice(0, k), v.slice(k + 1)]);
    }
    free.push(...(a.lists.get("--free") ?? []));
    if (a.positional.length > 1) throw new InputError("FILE", a.positional.join(", "), "a single input file");
    file = a.positional[0];
    if (list) {
      if (json)
        io.stdout(
          JSON.stringify(
            profileModels.map((m) => ({
              id: m.id,
              title: m.title,
              signalUnit: m.signalUnit,
              parameters: m.parameters.map((p) => ({ name: p.name, unit: p.unit ?? "", default: p.value, fixed: !!p.fixed })),
            })),
            null,
            2,
          ) + "\n",
        );
      else {
        io.stdout("Fit models (helicoid fit FILE --model ID):\n");
        for (const m of profileModels)
          io.stdout(`  ${m.id.padEnd(16)} ${m.title}\n${" ".repeat(19)}parameters: ${m.parameters.map((p) => p.name + (p.fixed ? " (fixed)" : "")).join(", ")}\n`);
      }
      return 0;
    }
    if (!file) throw new InputError("FILE", "(missing)", "a CSV file with position, signal and optional sigma columns");
    if (!modelId) throw new InputError("--model", "(missing)", `one of: ${profileModels.map((m) => m.id).join(", ")}`);
    const model = getProfileModel(modelId);
    let text: string;
    try {
      text = readProfileText(file);
    } catch (err) {
      if (err instanceof InputError) throw err;
      throw new InputError("FILE", file, "a readable file", fileReason(err));
    }
    const csv = readProfileCsv(text, { source: file, dropNaN, xUnit, yUnit });
    const unitOf = (name: string) => model.parameters.find((p) => p.name === name)?.unit ?? "";
    const known = (option: string, name: string) => {
      if (!model.parameters.some((p) => p.name === name)) throw new InputError(option, name, `a parameter of ${model.id}: ${model.parameters.map((p) => p.name).join(", ")}`);
    };
    const inputNotes: string[] = [];
    // A bare number for a dimensional parameter is read in SI units: said in a note, so that
    // "--start Delta=20" (meant as nm) cannot pass unnoticed.
    const quantity = (k: string, v: string) => {
      const unit = unitOf(k);
      const value = parseQuantity(k, v, unit);
      if (unit && isPlainNumber(v)) inputNotes.push(`${k} = ${v.trim()} was given without a unit: read as ${formatQuantity(value, unit)} (SI ${unit})`);
      return value;
    };
    // Start values not given are guessed by the library's fitProfile (as in a notebook).
    const start: Record<string, number> = {};
    for (const [k, v] of startRaw) {
      known("--start", k);
      start[k] = quantity(k, v);
    }
    const fixed: Record<string, boolean | number> = {};
    for (const [k, v] of fixRaw) {
      known("--fix", k);
      fixed[k] = v === null ? true : quantity(k, v);
    }
    for (const k of free) {
      known("--free", k);
      fixed[k] = false;
    }
    // the same call as fitProfile(csv, model) in a notebook (it carries the file's notes and says when there is no sigma column)
    const r = fitProfile(csv, model, { start, fixed, profile });
    const notes = [...inputNotes, ...r.notes];
    const parameters: Record<
      string,
      { value: number; stderr: number | null; unit: string; fixed?: boolean; interval?: [number, number] | null; clipped?: string[]; profileInterval?: [number, number] | null }
    > = {};
    for (const [name, p] of Object.entries(r.parameters)) {
      const unit = p.unit === "" && (name === "offset" || name === "contrast") ? csv.yUnit : p.unit;
      parameters[name] = {
        value: p.value,
        stderr: p.stderr,
        unit,
        ...(p.fixed ? { fixed: true } : { interval: p.interval }),
        ...(p.clipped ? { clipped: p.clipped } : {}),
        ...(p.profileInterval !== undefined ? { profileInterval: p.profileInterval } : {}),
      };
    }
    const residualRms = Math.sqrt(r.residuals.reduce((a, v) => a + v * v, 0) / Math.max(1, r.residuals.length));
    const out = {
      model: r.model,
      status: r.status,
      message: r.message,
      parameters,
      chiSquareReduced: r.sigmaKnown ? r.chiSquareReduced : null,
      residualRms,
      aic: r.aic,
      bic: r.bic,
      correlation: { names: r.freeNames, matrix: r.correlation },
      points: r.points,
      sigmaKnown: r.sigmaKnown,
      evaluations: r.evaluations,
      notes,
      assumptions: r.assumptions,
      // the data with the fitted curve and residuals y - f (SI), for a plot
      curve: { x: csv.x, y: csv.y, fitted: r.fitted, residual: r.residuals, sigma: csv.sigma, xUnit: "m", yUnit: csv.yUnit },
    };
    if (json) io.stdout(JSON.stringify(out, null, 2) + "\n");
    else {
      io.stdout(`model ${r.model}: ${r.title}\nfit status: ${r.status} (${r.message})\n`);
      io.stdout(`parameters (value ± standard error; ${Math.round(100 * r.confidence)} % interval):\n`);
      const fmt = (v: number, unit: string, digits = 6) => (!Number.isFinite(v) ? (v > 0 ? "+inf (open)" : "-inf (open)") : unit ? formatQuantity(v, unit) : v.toPrecision(digits));
      const conf = Math.round(100 * r.confidence);
      for (const [name, p] of Object.entries(parameters)) {
        // value and error in one unit, the value's digits following the error's (two significant)
        const ve = p.stderr === null ? `${fmt(p.value, p.unit)}  ${p.fixed ? "fixed" : "(no error)"}` : formatWithError(p.value, p.stderr, p.unit);
        const wald = p.interval ? `  [${fmt(p.interval[0], p.unit)}, ${fmt(p.interval[1], p.unit)}]${p.clipped ? ` (clipped at the physical limit)` : ""}` : "";
        const iv = wald + (p.profileInterval ? `  ${conf} % profile-likelihood interval [${fmt(p.profileInterval[0], p.unit)}, ${fmt(p.profileInterval[1], p.unit)}]` : "");
        io.stdout(`  ${name.padEnd(10)} ${ve}${iv}\n`);
      }
      const rms = csv.yUnit ? formatQuantity(residualRms, csv.yUnit) : residualRms.toPrecision(3);
      io.stdout(
        r.sigmaKnown
          ? `goodness of fit: reduced chi-square ${r.chiSquareReduced.toPrecision(4)} (about 1 when the sigmas and the model are right), residual RMS ${rms}, AIC ${r.aic.toFixed(2)}, BIC ${r.bic.toFixed(2)}, ${r.points} points\n`
          : `goodness of fit: residual RMS ${rms} (no sigma column: no reduced chi-square), AIC ${r.aic.toFixed(2)}, BIC ${r.bic.toFixed(2)}, ${r.points} points\n`,
      );
      for (const n of notes) io.stdout(`note: ${n}\n`);
      if (r.assumptions.length) io.stdout(`assumptions: ${r.assumptions.join("; ")}\n`);
    }
    if (r.status !== "converged") {
      io.stderr(`helicoid fit: the fit failed (status ${r.status}): ${r.message}\n`);
      return 1;
    }
    return 0;
  } catch (err) {
    if (err instanceof InputError) {
      io.stderr(`helicoid fit: ${err.message}\n`);
      return 2;
    }
    if (err instanceof ConvergenceError) {
      io.stderr(`helicoid fit: ${err.message}\n`);
      return 1;
    }
    throw err;
  }
}
