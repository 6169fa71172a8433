/**
 * Film files: the user's own film as a small JSON document of our own design, with values in any
 * unit, optional standard uncertainties and optional correlations (README.md, "Film files").
 *
 *   {
 *     "format": "helicoid-film", "version": 1,
 *     "name": "Film ZX-3 (invented)",
 *     "notes": ["sputtered, 2 nm cap", "A from spin-wave data"],
 *     "values": {
 *       "Ms": "1.1 MA/m",
 *       "A": "15 ± 1 pJ/m",
 *       "Ku": { "value": "1.2 MJ/m^3", "uncertainty": "0.05 MJ/m^3" },
 *       "D": "2.9 +- 0.1 mJ/m^2",
 *       "t": "1 nm",
 *       "dmi": "interfacial"
 *     },
 *     "correlations": [{ "between": ["A", "D"], "coefficient": 0.4 }]
 *   }
 *
 * The film parameters (Ms, A, Ku, D, t, alpha, gamma) are read in their SI units (filmUnits); other
 * names (a field B, a lattice constant a) are kept as written and read by the calculator that
 * takes them. Numbers without a unit are refused for dimensional film parameters (a unit left out
 * is the common slip). Parsing is pure (text in, object out); loadFilm/saveFilm (filmFileSystem.ts)
 * read and write files in Node.
 */
import { InputError } from "../errors.js";
import { isPlainNumber, parseQuantity } from "../quantity/units.js";
import { splitUncertainInput, type InputCorrelation, type UncertainInput } from "../calculators/uncertainty.js";
import type { CalculatorSpec } from "../calculators/spec.js";
import type { UncertaintyOptions } from "../calculators/uncertainty.js";
import { filmUnits, makeFilm, type Film } from "./film.js";

export const FILM_FORMAT = "helicoid-film";
export const FILM_FORMAT_VERSION = 1;
/** Largest film file read (bytes): a film is a few hundred bytes. */
export const FILM_FILE_LIMIT = 1e6;

/** One value of a film file, read: SI value and uncertainty for film parameters, the text as written. */
export interface FilmFileValue {
  /** SI value (film parameters), or null for a name that is not a film parameter (kept as written). */
  value: number | null;
  /** SI standard uncertainty, or null. */
  uncertainty: number | null;
  /** SI unit ("" for dimensionless or unknown). */
  unit: string;
  /** As written in the file (a string, a number, or {value, uncertainty}). */
  given: string | number | UncertainInput;
}

/** A film file, read and checked. */
export interface FilmRecord {
  name: string;
  notes: string[];
  values: Record<string, FilmFileValue>;
  /** DMI symmetry ("interfacial" unless the file says "bulk"). */
  dmi: "interfacial" | "bulk";
  correlations: InputCorrelation[];
  /** The film at the central values (makeFilm), when Ms, A, Ku, D and t are all given; else null. */
  film: Film | null;
  /** Inputs for runCalculator: the values as written (uncertainties included), without dmi. */
  inputs: Record<string, string | number | UncertainInput>;
  /** Where it was read from (a path), when known. */
  source?: string;
}

/** What saveFilm / filmFileText accept: a read film, a Film from makeFilm, or name + values. */
export type FilmToSave =
  FilmRecord | Film | { name?: string; notes?: string | string[]; values: Record<string, string | number | UncertainInput>; correlations?: InputCorrelation[]; dmi?: string };

const filmKeys = Object.keys(filmUnits) as Array<keyof typeof filmUnits>;
const isFilmKey = (k: string): k is keyof typeof filmUnits => (filmKeys as string[]).includes(k);

/** Read a film file's text (JSON). `source` names the file in messages. */
export function parseFilmFile(text: string, source = "film file"): FilmRecord {
  if (typeof text !== "string") throw new InputError(source, text, "the text of a film file (JSON)");
  if (text.length > FILM_FILE_LIMIT) throw new InputError(source, `${text.length} characters`, `a film file of at most ${FILM_FILE_LIMIT / 1e6} MB`);
  let doc: unknown;
  try {
    doc = JSON.parse(text);
  } catch (err) {
    throw new InputError(source, text.slice(0, 80), "a JSON film file", (err as Error).message);
  }
  if (typeof doc !== "object" || doc === null || Array.isArray(doc)) throw new InputError(source, text.slice(0, 80), 'a JSON object with "format", "name" and "values"');
  const d = doc as Record<string, unknown>;
  const known = new Set(["format", "version", "name", "notes", "values", "correlations"]);
  for (const k of Object.keys(d)) if (!known.has(k)) throw new InputError(`${source}: ${k}`, d[k], `one of the fields ${[...known].join(", ")}`);
  if (d.format !== FILM_FORMAT) throw new InputError(`${source}: format`, d.format, `"${FILM_FORMAT}"`);
  if (d.version !== undefined && d.version !== FILM_FORMAT_VERSION)
    throw new InputError(`${source}: version`, d.version, `${FILM_FORMAT_VERSION} (this program reads version ${FILM_FORMAT_VERSION})`);
  if (typeof d.name !== "string" || d.name.trim() === "") throw new InputError(`${source}: name`, d.name, "a non-empty name of the film");
  const notes = d.notes === undefined ? [] : typeof d.notes === "string" ? [d.notes] : d.notes;
  if (!Array.isArray(notes) || notes.some((n) => typeof n !== "string")) throw new InputError(`${source}: notes`, d.notes, "a text or a list of texts");
  if (typeof d.values !== "object" || d.values === null || Array.isArray(d.values))
    throw new InputError(`${source}: values`, d.values, 'an object of name: value, such as {"A": "15 ± 1 pJ/m"}');
  const values: Record<string, FilmFileValue> = {};
  const inputs: FilmRecord["inputs"] = {};
  let dmi: "interfacial" | "bulk" = "interfacial";
  for (const [name, given] of Object.entries(d.values as Record<string, unknown>)) {
    const where = `${source}: values.${name}`;
    if (name === "dmi") {
      if (given !== "interfacial" && given !== "bulk") throw new InputError(where, given, '"interfacial" or "bulk"');
      dmi = given;
      continue;
    }
    const ok = typeof given === "string" || typeof given === "number" || (typeof given === "object" && given !== null && !Array.isArray(given) && "value" in given);
    if (!ok) throw new InputError(where, JSON.stringify(given), 'a quantity ("15 pJ/m", "15 ± 1 pJ/m") or {"value": ..., "uncertainty": ...}');
    if (typeof given === "object") {
      for (const k of Object.keys(given as object))
        if (k !== "value" && k !== "uncertainty") throw new InputError(`${where}.${k}`, (given as Record<string, unknown>)[k], '"value" or "uncertainty"');
    }
    const g = given as string | number | UncertainInput;
    if (isFilmKey(name)) {
      const unit = filmUnits[name];
      const s = splitUncertainInput(where, g, unit);
      if (unit && ((typeof s.value === "string" && isPlainNumber(s.value)) || typeof s.value === "number")) {
        throw new InputError(where, typeof g === "object" ? JSON.stringify(g) : g, `a quantity with its unit (a bare number would be read in ${unit}), e.g. "${example[name]}"`);
      }
      if (s.value === undefined) throw new InputError(where, JSON.stringify(g), "a value");
      values[name] = { value: parseQuantity(where, s.value, unit), uncertainty: s.uncertainty, unit, given: g };
    } else {
      values[name] = { value: null, uncertainty: null, unit: "", given: g };
    }
    inputs[name] = g;
  }
  const correlations = readCorrelations(d.correlations, values, source);
  let film: Film | null = null;
  if (["Ms", "A", "Ku", "D", "t"].every((k) => values[k] !== undefined)) {
    const central: Record<string, number | string> = { dmi };
    for (const k of filmKeys) if (values[k]) central[k] = values[k]!.value!;
    try {
      film = makeFilm(central);
    } catch (err) {
      if (err instanceof InputError) throw new InputError(`${source}: values.${err.parameter}`, err.value, err.expected, err.detail);
      throw err;
    }
  }
  return { name: d.name, notes: notes as string[], values, dmi, correlations, film, inputs };
}

const example: Record<keyof typeof filmUnits, string> = {
  Ms: "1.1 MA/m",
  A: "15 ± 1 pJ/m",
  Ku: "1.2 MJ/m^3",
  D: "2.9 mJ/m^2",
  t: "1 nm",
  alpha: "0.3",
  gamma: "1.76e11 s^-1 T^-1",
};

function readCorrelations(raw: unknown, values: Record<string, FilmFileValue>, source: string): InputCorrelation[] {
  if (raw === undefined) return [];
  if (!Array.isArray(raw)) throw new InputError(`${source}: correlations`, JSON.stringify(raw), 'a list of {"between": [name, name], "coefficient": r}');
  const seen = new Set<string>();
  return raw.map((c, i) => {
    const where = `${source}: correlations[${i}]`;
    const pair = (c as { between?: unknown })?.between;
    const r = (c as { coefficient?: unknown })?.coefficient;
    if (!Array.isArray(pair) || pair.length !== 2 || typeof pair[0] !== "string" || typeof pair[1] !== "string" || pair[0] === pair[1]) {
      throw new InputError(where, JSON.stringify(c), '{"between": [name, name], "coefficient": r} with two different names');
    }
    for (const p of pair as string[]) {
      const v = values[p];
      const uncertain = v && (v.uncertainty !== null ? v.uncertainty > 0 : typeof v.given === "object" || (typeof v.given === "string" && /±|\+-|\+\/-/.test(v.given)));
      if (!uncertain)
        throw new InputError(
          where,
          p,
          `a value of the file that carries an uncertainty: ${
            Object.keys(values)
              .filter((k) => values[k]!.uncertainty)
              .join(", ") || "(none)"
          }`,
        );
    }
    if (typeof r !== "number" || !(Math.abs(r) <= 1)) throw new InputError(`${where}.coefficient`, r, "a correlation coefficient from -1 to 1");
    const key = [...(pair as string[])].sort().join(" ");
    if (seen.has(key)) throw new InputError(where, pair.join(", "), "each pair once");
    seen.add(key);
    return { between: [pair[0], pair[1]] as [string, string], coefficient: r };
  });
}

/** A film file as `loadFilm` / `parseFilmFile` read it (not a `Film` from `makeFilm`, nor plain inputs). */
export function isFilmRecord(v: unknown): v is FilmRecord {
  if (typeof v !== "object" || v === null) return false;
  const r = v as Partial<FilmRecord>;
  return (
    typeof r.values === "object" && r.values !== null && typeof r.inputs === "object" && r.inputs !== null && Array.isArray(r.correlations) && Array.isArray(r.notes) && "dmi" in r
  );
}

/** The JSON text of a film file (values as given; SI numbers written with their unit, full precision). */
export function filmFileText(film: FilmToSave, meta: { name?: string; notes?: string | string[] } = {}): string {
  const doc: Record<string, unknown> = { format: FILM_FORMAT, version: FILM_FORMAT_VERSION };
  const si = (v: number, unit: string) => (unit ? `${v} ${unit}` : v);
  if (isFilmRecord(film)) {
    const r = film;
    doc.name = r.name;
    doc.notes = r.notes;
    doc.values = { ...r.inputs, dmi: r.dmi };
    if (r.correlations.length) doc.correlations = r.correlations;
  } else if ("values" in film) {
    const f = film as Exclude<FilmToSave, FilmRecord | Film>;
    doc.name = f.name ?? "film";
    doc.notes = f.notes === undefined ? [] : typeof f.notes === "string" ? [f.notes] : f.notes;
    doc.values = { ...f.values, ...(f.dmi ? { dmi: f.dmi } : {}) };
    if (f.correlations?.length) doc.correlations = f.correlations;
  } else {
    const f = film as Film;
    doc.name = "film";
    doc.notes = [];
    const values: Record<string, unknown> = {};
    for (const k of filmKeys) if (f[k] !== undefined) values[k] = si(f[k] as number, filmUnits[k]);
    values.dmi = f.dmi;
    doc.values = values;
  }
  if (meta.name !== undefined) doc.name = meta.name;
  if (meta.notes !== undefined) doc.notes = typeof meta.notes === "string" ? [meta.notes] : meta.notes;
  const text = JSON.stringify(doc, null, 2) + "\n";
  parseFilmFile(text, "the film to save"); // what is written reads back (a bad value is refused here, before any file is touched)
  return text;
}

/**
 * The inputs a calculator takes from a film file, ready for runCalculator: the file's values that
 * are inputs of `spec` (uncertainties included), explicit `overrides` on top (they replace the
 * file's value and its uncertainty; correlations of a replaced value are dropped), the correlations
 * among what remains, and notes saying what was not used.
 *
 *   const f = loadFilm("my-film.json");
 *   const { inputs, uncertainty } = filmInputsFor(skyrmion, f, { B: "20 mT" });
 *   runCalculator(skyrmion, inputs, { uncertainty });
 */
export function filmInputsFor(
  spec: CalculatorSpec,
  film: FilmRecord,
  overrides: Record<string, string | number | UncertainInput | undefined> = {},
): { inputs: Record<string, string | number | UncertainInput>; uncertainty: UncertaintyOptions; notes: string[] } {
  const names = new Set(spec.inputs.map((i) => i.name));
  const inputs: Record<string, string | number | UncertainInput> = {};
  const unused: string[] = [];
  for (const [k, v] of Object.entries(film.inputs)) {
    if (names.has(k)) inputs[k] = v;
    else unused.push(k);
  }
  const replaced: string[] = [];
  for (const [k, v] of Object.entries(overrides)) {
    if (v === undefined) continue;
    if (k in inputs) replaced.push(k);
    inputs[k] = v;
  }
  const kept = film.correlations.filter((c) => c.between.every((n) => names.has(n) && !replaced.includes(n)));
  const notes: string[] = [
    `inputs from the film file "${film.name}"${film.source ? ` (${film.source})` : ""}${replaced.length ? `; given explicitly instead of the file's: ${replaced.join(", ")}` : ""}`,
  ];
  if (unused.length) notes.push(`values of the film file that '${spec.id}' does not take: ${unused.join(", ")}`);
  const dropped = film.correlations.length - kept.length;
  if (dropped > 0) notes.push(`${dropped} correlation${dropped > 1 ? "s" : ""} of the film file not used (a value not taken by '${spec.id}' or given explicitly)`);
  if (film.dmi === "bulk" && names.has("D")) notes.push(`the film's DMI is bulk; '${spec.id}' takes D as in its own assumptions`);
  return { inputs, uncertainty: kept.length ? { correlations: kept } : {}, notes };
}
