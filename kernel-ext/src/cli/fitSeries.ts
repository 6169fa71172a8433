/**
 * `helicoid fit --series FILE[@FIELD] ... --film Ms=..,t=..,A=..,D=..,Ku=.. [--json]`: A, D (and Ku
 * when the data allow) of a thin film from line profiles across isolated skyrmions (or 360-degree
 * walls) measured at several applied fields, with `fitFieldSeries` of @helicoid/lib.
 * Each FILE is a CSV profile as `helicoid fit FILE` reads it. Its field (mu0 H along +z) is given as
 * FILE@<quantity> (`cut.csv@5mT`) or, if absent, by a comment line of the file containing
 * "field: <quantity>" (up to the next ";" or the line end).
 * Options: --film (Ms, t and start values of A, D, Ku, with units), --dmi interfacial|bulk,
 * --fit-ku auto|yes|no, --method two-stage|global, --texture skyrmion|wall360, --model ID (a
 * profile model with R and w, default wall360-mz), --profile (profile-likelihood intervals),
 * --confidence P, --drop-nan, --x-unit U, --y-unit U, --json.
 * JSON: {"mode": "series", "status", "message", "method", "parameters": {name: {"value", "stderr",
 * "unit", "interval", "profileInterval", "fixed"}}, "kuDecision", "chiSquare", "dof",
 * "chiSquareReduced", "profiles": [{"file", "B", "R", "w", ..., "pullR", "pullW"}], "film",
 * "confidence", "assumptions", "notes", "sources"} in SI; an open interval side is null.
 * Exit codes: 0 success, 1 a fit that failed (the message says why), 2 bad input (the parameter,
 * the value and what was expected).
 */

import {
  readProfileCsv,
  profileField,
  fitFieldSeries,
  makeFilm,
  parseQuantity,
  formatQuantity,
  formatWithError,
  isPlainNumber,
  InputError,
  ConvergenceError,
  type FieldSeriesProfile,
  type FieldSeriesResult,
} from "@helicoid/lib";
import { readProfileText } from "./fit.js";
import { fileReason, parseStrict, UsageError, type StrictSpec } from "./args.js";

export interface FitSeriesIo {
  stdout: (s: string) => void;
  stderr: (s: string) => void;
}

export const seriesUsage = `       helicoid fit --series FILE[@FIELD] ... --film Ms=..,t=..,A=..,D=..,Ku=.. [--json] [--dmi interfacial|bulk]
                    [--fit-ku auto|yes|no] [--method two-stage|global] [--texture skyrmion|wall360] [--model ID]
                    [--profile] [--confidence P] [--drop-nan] [--x-unit U] [--y-unit U]
         (FIELD such as 5mT; without it, a header line "# ... field: 5 mT" in the file)`;

const FILM_KEYS = { Ms: "A/m", t: "m", A: "J/m", D: "J/m^2", Ku: "J/m^3" } as const;
type FilmKey = keyof typeof FILM_KEYS;

/** "Ms=0.6MA/m,t=1.5nm,..." -> SI numbers, every key required. */
export function parseFilmOption(raw: string): Record<FilmKey, number> {
  const out: Partial<Record<FilmKey, number>> = {};
  for (const part of raw
    .split(",")
    .map((s) => s.trim())
    .filter((s) => s !== "")) {
    const k = part.indexOf("=");
    if (k < 1) throw new InputError("--film", part, "name=value pairs separated by commas, e.g. Ms=0.6MA/m,t=1.5nm,A=12pJ/m,D=1.45mJ/m^2,Ku=0.35MJ/m^3");
    const name = part.slice(0, k).trim();
    if (!(name in FILM_KEYS)) throw new InputError("--film", name, `one of the film parameters ${Object.keys(FILM_KEYS).join(", ")}`);
    const value = part.slice(k + 1).trim();
    // Film parameters span many decades in SI (Ms ~ 1e6 A/m, A ~ 1e-11 J/m): a bare number is
    // almost always a unit left out, so it is refused rather than read as SI.
    if (isPlainNumber(value)) {
      throw new InputError(
        `--film ${name}`,
        value,
        `a quantity with its unit, e.g. ${name}=${{ Ms: "0.6MA/m", t: "1.5nm", A: "12pJ/m", D: "1.45mJ/m^2", Ku: "0.35MJ/m^3" }[name as FilmKey]} (a bare number would be ${value} ${FILM_KEYS[name as FilmKey]})`,
      );
    }
    out[name as FilmKey] = parseQuantity(`--film ${name}`, value, FILM_KEYS[name as FilmKey]);
  }
  const missing = (Object.keys(FILM_KEYS) as FilmKey[]).filter((n) => out[n] === undefined);
  if (missing.length > 0) throw new InputError("--film", raw, `all of Ms, t, A, D, Ku (A, D, Ku are start values of the fit); missing: ${missing.join(", ")}`);
  return out as Record<FilmKey, number>;
}

/** The field of a profile: FILE@<quantity>, else a "field: <quantity>" comment line (the library's profileField). */
export function fieldOf(file: string, suffix: string | null, text: string): number {
  return profileField(text, { source: file, field: suffix });
}

function splitFileArg(arg: string): { file: string; suffix: string | null } {
  const k = arg.lastIndexOf("@");
  if (k > 0 && k < arg.length - 1) return { file: arg.slice(0, k), suffix: arg.slice(k + 1) };
  return { file: arg, suffix: null };
}

const finiteOrNull = (v: number | null | undefined) => (v === null || v === undefined || !Number.isFinite(v) ? null : v);
const pairOrNull = (p: [number, number] | null | undefined) => (p ? [finiteOrNull(p[0]), finiteOrNull(p[1])] : null);

/** The JSON document of a series fit (SI; open interval sides and undefined numbers as null). */
export function seriesJson(r: FieldSeriesResult, files: string[]) {
  const parameters: Record<string, unknown> = {};
  for (const [name, p] of Object.entries(r.parameters)) {
    parameters[name] = {
      value: p.value,
      stderr: finiteOrNull(p.stderr),
      unit: p.unit,
      interval: pairOrNull(p.interval),
      profileInterval: p.profileInterval === undefined ? null : pairOrNull(p.profileInterval),
      ...(p.fixed ? { fixed: true } : {}),
    };
  }
  return {
    mode: "series",
    status: r.status,
    message: r.message,
    method: r.approach,
    parameters,
    kuDecision: { ...r.kuDecision, conditionNumber: finiteOrNull(r.kuDecision.conditionNumber) },
    chiSquare: r.chiSquare,
    dof: r.dof,
    chiSquareReduced: finiteOrNull(r.chiSquareReduced),
    profiles: r.profiles.map((p, i) => ({
      file: files[i],
      B: p.B,
      R: p.R,
      w: p.w,
      stderrR: p.stderrR,
      stderrW: p.stderrW,
      correlationRw: p.correlationRw,
      modelR: p.modelR,
      modelW: p.modelW,
      pullR: finiteOrNull(p.pullR),
      pullW: finiteOrNull(p.pullW),
    })),
    film: r.film,
    confidence: r.confidence,
    assumptions: r.assumptions,
    notes: r.notes,
    sources: r.sources,
  };
}

function printTable(r: FieldSeriesResult, files: string[], io: FitSeriesIo) {
  const q = (v: number | null, unit: string) => (v === null || !Number.isFinite(v) ? (v === null ? "n/a" : v > 0 ? "+inf" : "-inf") : formatQuantity(v, unit));
  io.stdout(
    `Field series (${r.approach}), ${r.profiles.length} profiles; film Ms = ${formatQuantity(r.film.Ms, "A/m")}, t = ${formatQuantity(r.film.t, "m")}, ${r.film.dmi} DMI\n`,
  );
  io.stdout(`status: ${r.status} (${r.message})\n`);
  const pct = `${+(100 * r.confidence).toPrecision(4)} %`;
  for (const [name, p] of Object.entries(r.parameters)) {
    // value and error in one unit, the value's digits following the error's
    const ve = p.stderr === null ? `${q(p.value, p.unit)} ${p.fixed ? "(held)" : "(no error)"}` : formatWithError(p.value, p.stderr, p.unit);
    let line = `  ${name.padEnd(3)} ${ve.padStart(24)}`;
    if (p.interval) line += `  ${pct} [${q(p.interval[0], p.unit)}, ${q(p.interval[1], p.unit)}]`;
    if (p.profileInterval) line += `  profile [${q(p.profileInterval[0], p.unit)}, ${q(p.profileInterval[1], p.unit)}]`;
    io.stdout(line + "\n");
  }
  io.stdout(`Ku: ${r.kuDecision.reason}\n`);
  io.stdout(
    `chi-square ${r.chiSquare.toPrecision(4)} for ${r.dof} degrees of freedom (reduced ${Number.isFinite(r.chiSquareReduced) ? r.chiSquareReduced.toPrecision(4) : "n/a"})${r.approach === "two-stage" ? ", energy model against the stage-1 R, w" : ""}\n`,
  );
  const width = Math.max(4, ...files.map((f) => f.length));
  io.stdout(`  ${"file".padEnd(width)}  ${"B".padStart(8)}  ${"R".padStart(20)}  ${"w".padStart(20)}  pull R  pull w\n`);
  r.profiles.forEach((p, i) => {
    io.stdout(
      `  ${files[i].padEnd(width)}  ${formatQuantity(p.B, "T").padStart(8)}  ${formatWithError(p.R, p.stderrR, "m").padStart(20)}  ${formatWithError(p.w, p.stderrW, "m").padStart(20)}  ${p.pullR.toFixed(2).padStart(6)}  ${p.pullW.toFixed(2).padStart(6)}\n`,
    );
  });
  for (const a of r.assumptions) io.stdout(`assumption: ${a}\n`);
  for (const n of r.notes) io.stdout(`note: ${n}\n`);
}

function oneOf<T extends string>(option: string, v: string, allowed: readonly T[]): T {
  if (!(allowed as readonly string[]).includes(v)) throw new InputError(option, v, `one of ${allowed.join(", ")}`);
  return v as T;
}

const SERIES_OPTIONS: StrictSpec = {
  flags: ["--series", "--json", "--profile", "--drop-nan", "--help", "-h"],
  valued: {
    "--film": "Ms=..,t=..,A=..,D=..,Ku=..",
    "--dmi": "interfacial or bulk",
    "--fit-ku": "auto, yes or no",
    "--method": "two-stage or global",
    "--texture": "skyrmion or wall360",
    "--model": "a model id",
    "-m": "a model id",
    "--confidence": "a level such as 0.95",
    "--x-unit": "a length unit such as nm",
    "--y-unit": "a unit of the signal",
  },
  aliases: [["--model", "-m"]],
};

/** `helicoid fit --series ...` (args without the command name; "--series" may appear anywhere). */
export async function fitSeriesCommand(args: string[], io: FitSeriesIo): Promise<number> {
  const inputs: string[] = [];
  let filmRaw: string | undefined;
  let dmi: "interfacial" | "bulk" = "interfacial";
  let fitKu: boolean | "auto" = "auto";
  let method: "two-stage" | "global" = "two-stage";
  let texture: "skyrmion" | "wall360" = "skyrmion";
  let model: string | undefined;
  let json = false;
  let profile = false;
  let dropNaN = false;
  let confidence = 0.95;
  let xUnit: string | undefined;
  let yUnit: string | undefined;
  try {
    let a: ReturnType<typeof parseStrict>;
    try {
      a = parseStrict(args, SERIES_OPTIONS);
    } catch (err) {
      if (err instanceof UsageError) {
        io.stderr(`helicoid fit --series: ${err.message}\n${"usage:\n" + seriesUsage}\n`);
        return 2;
      }
      throw err;
    }
    if (a.flags.has("--help") || a.flags.has("-h")) {
      io.stdout(`usage:\n${seriesUsage}\n`);
      return 0;
    }
    json = a.flags.has("--json");
    profile = a.flags.has("--profile");
    dropNaN = a.flags.has("--drop-nan");
    filmRaw = a.options.get("--film");
    const opt = (n: string) => a.options.get(n);
    if (opt("--dmi") !== undefined) dmi = oneOf("--dmi", opt("--dmi")!, ["interfacial", "bulk"] as const);
    if (opt("--fit-ku") !== undefined) fitKu = { auto: "auto" as const, yes: true, no: false }[oneOf("--fit-ku", opt("--fit-ku")!, ["auto", "yes", "no"] as const)];
    if (opt("--method") !== undefined) method = oneOf("--method", opt("--method")!, ["two-stage", "global"] as const);
    if (opt("--texture") !== undefined) texture = oneOf("--texture", opt("--texture")!, ["skyrmion", "wall360"] as const);
    model = opt("--model") ?? opt("-m");
    if (opt("--confidence") !== undefined) {
      const v = opt("--confidence")!;
      confidence = /^\s*(0?\.\d+)\s*$/.test(v) ? Number(v) : NaN;
      if (!(confidence > 0 && confidence < 1)) throw new InputError("--confidence", v, "a confidence level between 0 and 1, e.g. 0.95");
    }
    xUnit = opt("--x-unit");
    yUnit = opt("--y-unit");
    inputs.push(...a.positional);
    if (inputs.length === 0) throw new InputError("FILE", "(missing)", 'two or more CSV profiles, each FILE@<field> or with a "field:" header line');
    if (filmRaw === undefined)
      throw new InputError("--film", "(missing)", "Ms=..,t=..,A=..,D=..,Ku=.. (Ms and t held; A, D, Ku start values), e.g. Ms=0.6MA/m,t=1.5nm,A=12pJ/m,D=1.45mJ/m^2,Ku=0.35MJ/m^3");
    const film = makeFilm({ ...parseFilmOption(filmRaw), dmi });
    const files: string[] = [];
    const profiles: FieldSeriesProfile[] = [];
    const readNotes: string[] = [];
    for (const arg of inputs) {
      const { file, suffix } = splitFileArg(arg);
      let text: string;
      try {
        text = readProfileText(file);
      } catch (err) {
        if (err instanceof InputError) throw err;
        throw new InputError("FILE", file, "a readable file", fileReason(err));
      }
      const B = fieldOf(file, suffix, text);
      const csv = readProfileCsv(text, { source: file, dropNaN, xUnit, yUnit });
      readNotes.push(...csv.notes.map((n) => `${file}: ${n}`));
      files.push(file);
      profiles.push({ B, data: { x: csv.x, y: csv.y, sigma: csv.sigma } });
    }
    const r = fitFieldSeries(profiles, { film, fitKu, method, texture, confidence, ...(model ? { model } : {}), ...(profile ? { profile: true } : {}) });
    r.notes.unshift(...readNotes);
    if (json) io.stdout(JSON.stringify(seriesJson(r, files), null, 2) + "\n");
    else printTable(r, files, io);
    if (r.status !== "converged") {
      io.stderr(`helicoid fit --series: the fit failed (status ${r.status}): ${r.message}\n`);
      return 1;
    }
    return 0;
  } catch (err) {
    if (err instanceof InputError) {
      io.stderr(`helicoid fit --series: ${err.message}\n`);
      return 2;
    }
    if (err instanceof ConvergenceError) {
      io.stderr(`helicoid fit --series: ${err.message}\n`);
      return 1;
    }
    throw err;
  }
}
