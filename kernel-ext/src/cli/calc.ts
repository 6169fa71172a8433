/**
 * `helicoid calc ID name=value ... [--json] [--sweep NAME=FROM:TO:POINTS]` runs any catalogue
 * calculator from the shell; values take units (`A=15pJ/m`, `B=50mT`, `t=1nm`).
 * `helicoid calc --list [--json]` lists the ids with their inputs and outputs.
 * `--film FILE` takes inputs from a film file (lib/src/material/filmFile.ts; name=value overrides);
 * inputs may carry uncertainties ("15 ± 1 pJ/m"), propagated to first order or, with
 * `--monte-carlo N [--seed S]`, by Monte Carlo (lib/src/calculators/uncertainty.ts).
 * JSON: {"id", "status", "inputs": {name: {"value", "unit"}}, "outputs": {name: {"value", "unit"}}, ...}
 * with SI values and SI unit strings; a sweep output's value is an array.
 * Errors: exit 2 for bad input or usage (an unknown option, an input given twice, a --sweep of a
 * calculator that has none), 1 when a computation failed; with --json the error is also a JSON
 * object on stdout: {"id", "status": "error", "error": {"type", "message", "parameter", "value", "expected"}}.
 */
import {
  catalogue,
  filmInputNames,
  coerceInputs,
  customaryUnit,
  formatQuantity,
  getCalculator,
  InputError,
  inUncertainForm,
  isPlainNumber,
  parseQuantity,
  runCalculator,
  ConvergenceError,
  loadFilm,
  filmInputsFor,
  MC_MAX_SAMPLES,
  type CalculatorSpec,
  type ComputeOptions,
  type UncertaintyOptions,
} from "@helicoid/lib";
import { groupedRows, textRows } from "../display/table.js";
import type * as SaveFigure from "../display/saveFigure.js";
import { errorJson, parseStrict, UsageError, type CommandIO } from "./args.js";

export const calcUsage = [
  "usage: helicoid calc ID name=value ... [--sweep NAME=FROM:TO:POINTS] [--si] [--demo] [--json]",
  "       helicoid calc --list [--json]",
  "       helicoid calc ID --help      what ID computes: its inputs (unit, default, range, meaning) and outputs",
  "  name=value            an input of the calculator with its unit (A=15pJ/m, B=50mT); each at most once;",
  '                        with a standard uncertainty: A=15+-1pJ/m or A="15 ± 1 pJ/m"',
  "                        a film calculator needs the film: Ms, A, Ku, D and t (those it takes) are required,",
  "                        as name=value or from --film FILE",
  "  --film FILE           inputs from a film file (JSON: name, notes, values with units and optional",
  "                        uncertainties, optional correlations; lib/src/material/README.md); name=value",
  "                        arguments override the file's values",
  "  --monte-carlo N       propagate input uncertainties by N seeded Monte Carlo draws (10 to 20000)",
  "                        instead of first order (the default); --seed S sets the seed (default 1)",
  "  --si                  read bare numbers as SI values (A=1.5e-11 is 15 pJ/m); without it a bare number",
  "                        for a quantity with a unit is refused",
  "  --demo                fill film values not given from the calculator's invented demo film (not a real",
  "                        material); the result says which values were filled in",
  "  --sweep NAME=FROM:TO:POINTS   sweep a sweepable input (B=0mT:200mT:200); --list shows which",
  "  --plot FILE.svg|.png  write the calculator's first plot (one journal column, 8.5 cm wide)",
  '  --json                SI JSON on stdout (on an error too: {id, status: "error", error})',
  "  --progress            progress of long computations on stderr (drawn in place on a terminal, where it is",
  "                        on by default; as lines otherwise); stdout and --json are unaffected",
  "  --list                the calculators with their inputs and outputs",
  "Outputs computed from uncertain inputs print as value ± uncertainty (one standard deviation, two",
  "significant digits); --json gives outputs.NAME.uncertainty (SI) and the method and flags under",
  '"uncertainty". An output whose uncertainty is not trustworthy (nonlinear within the uncertainty,',
  'or no state at some input within it) is flagged in a note and the status is "warning".',
  "Exit status: 0 done, 2 bad input or usage, 1 a computation that failed.",
  "Examples:",
  "  helicoid calc wall Ms=1.1MA/m A=15pJ/m Ku=0.8MJ/m^3 D=1.5mJ/m^2 t=1nm",
  "  helicoid calc wall360 Ms=1.1MA/m A=15pJ/m Ku=1.2MJ/m^3 D=1.5mJ/m^2 t=1nm B=20mT --json",
  "  helicoid calc skyrmion B=50mT --demo",
  "  helicoid calc easy-plane --sweep B=0mT:200mT:40",
  "  helicoid calc skyrmion --help",
].join("\n");

const OPTIONS = {
  flags: ["--json", "--list", "--help", "-h", "--progress", "--si", "--demo"],
  valued: {
    "--sweep": "NAME=FROM:TO:POINTS, such as B=0mT:200mT:200",
    "--plot": "a file name ending in .svg or .png, such as r-vs-b.svg",
    "--film": "a film file (JSON), such as my-film.json",
    "--monte-carlo": "a number of draws, such as 400",
    "--seed": "a whole number, such as 7",
  },
};

export async function calcCommand(args: string[], io: CommandIO): Promise<number> {
  const json = args.includes("--json");
  let id: string | undefined;
  const fail = (err: Error, status: number): number => {
    if (json) io.stdout(errorJson(id, err));
    io.stderr(`helicoid calc: ${err.message}\n`);
    if (err instanceof UsageError) io.stderr(`${calcUsage}\n`);
    return status;
  };
  let a: ReturnType<typeof parseStrict>;
  try {
    a = parseStrict(args, OPTIONS);
  } catch (err) {
    if (err instanceof UsageError) return fail(err, 2);
    throw err;
  }
  if (a.flags.has("--list")) {
    const list = catalogue.map((s) => ({
      id: s.id,
      title: s.title,
      summary: s.summary,
      inputs: s.inputs.map((i) => ({ name: i.name, unit: i.unit, default: i.default, min: i.min, max: i.max, scale: i.scale, meaning: i.meaning })),
      outputs: s.outputs.map((o) => ({ name: o.name, unit: o.unit, kind: o.kind ?? "scalar", meaning: o.meaning })),
      sweep: s.sweep ?? null,
    }));
    if (json) io.stdout(JSON.stringify(list, null, 2) + "\n");
    else
      for (const s of list)
        io.stdout(
          `${s.id.padEnd(18)} ${s.title}\n${"".padEnd(19)}inputs: ${s.inputs.map((i) => `${i.name} [${i.unit || "-"}]`).join(", ")}${s.sweep?.over.length ? `; sweepable: ${s.sweep.over.join(", ")}` : ""}\n`,
        );
    return 0;
  }
  if (a.flags.has("--help") || a.flags.has("-h")) {
    if (a.positional.length === 0) {
      io.stdout(`${calcUsage}\n`);
      return 0;
    }
    id = a.positional[0];
    try {
      io.stdout(calculatorHelp(getCalculator(id!)));
      return 0;
    } catch (err) {
      if (err instanceof InputError) return fail(err, 2);
      throw err;
    }
  }
  if (a.positional.length === 0) return fail(new UsageError("no calculator given (helicoid calc --list shows them)"), 2);
  const [first, ...pairs] = a.positional;
  id = first;
  try {
    const spec = getCalculator(first!);
    const raw: Record<string, string> = {};
    for (const p of pairs) {
      const eq = p.indexOf("=");
      if (eq <= 0) throw new InputError("argument", p, "name=value, such as A=15pJ/m");
      const name = p.slice(0, eq);
      if (Object.prototype.hasOwnProperty.call(raw, name)) {
        throw new InputError(name, p.slice(eq + 1), `each input once (${name} given twice: ${name}=${raw[name]} and ${p})`);
      }
      raw[name] = p.slice(eq + 1);
    }
    const si = a.flags.has("--si");
    if (!si) for (const [name, value] of Object.entries(raw)) refuseBareNumber(spec, name, value);
    const options: ComputeOptions = {};
    const sweep = a.options.get("--sweep");
    if (sweep !== undefined) {
      const sweepable = spec.sweep?.over ?? [];
      if (sweepable.length === 0) {
        throw new InputError("--sweep", sweep, `no --sweep: '${id}' has no sweepable input (run it once per value)`);
      }
      const m = /^([A-Za-z_]\w*)=([^:]+):([^:]+):(\d+)$/.exec(sweep);
      if (!m) throw new InputError("--sweep", sweep, `NAME=FROM:TO:POINTS, such as ${sweepable[0]}=FROM:TO:100 (sweepable inputs of '${id}': ${sweepable.join(", ")})`);
      const input = spec.inputs.find((i) => i.name === m[1]);
      if (!input || !sweepable.includes(m[1]!)) {
        throw new InputError("--sweep", sweep, `a sweepable input of '${id}': ${sweepable.join(", ")}`);
      }
      if (!si) for (const end of [m[2]!, m[3]!]) refuseBareNumber(spec, m[1]!, end, "--sweep");
      const points = Number(m[4]);
      if (points < 2 || points > 100000) throw new InputError("--sweep", sweep, "POINTS a whole number from 2 to 100000");
      options.sweep = { over: m[1]!, from: parseQuantity(m[1]!, m[2]!, input.unit), to: parseQuantity(m[1]!, m[3]!, input.unit), points: Number(m[4]) };
    }
    const plotPath = a.options.get("--plot");
    if (plotPath !== undefined && !/\.(svg|png)$/i.test(plotPath)) throw new InputError("--plot", plotPath, "a file name ending in .svg or .png");
    if (plotPath !== undefined && spec.plots.length === 0) throw new InputError("--plot", plotPath, `no --plot: '${id}' has no plots`);
    const filmPath = a.options.get("--film");
    const uncertainty: UncertaintyOptions = {};
    const mc = a.options.get("--monte-carlo");
    if (mc !== undefined) {
      const n = /^\d+$/.test(mc.trim()) ? Number(mc) : NaN;
      if (!(n >= 10 && n <= MC_MAX_SAMPLES)) throw new InputError("--monte-carlo", mc, `a whole number of draws from 10 to ${MC_MAX_SAMPLES}`);
      uncertainty.method = "monte-carlo";
      uncertainty.samples = n;
    }
    const seed = a.options.get("--seed");
    if (seed !== undefined) {
      if (mc === undefined) throw new InputError("--seed", seed, "a seed only together with --monte-carlo N");
      if (!/^\d+$/.test(seed.trim())) throw new InputError("--seed", seed, "a whole number >= 0");
      uncertainty.seed = Number(seed);
    }
    // Given values are checked first (a bad value is named before a missing one); values with an
    // uncertainty are read by the propagation.
    coerceInputs(spec, Object.fromEntries(Object.entries(raw).filter(([, v]) => !inUncertainForm(v))));
    let inputs: Parameters<typeof runCalculator>[1] = raw;
    const filmNotes: string[] = [];
    if (filmPath !== undefined) {
      const film = filmInputsFor(spec, loadFilm(filmPath), raw);
      inputs = film.inputs;
      Object.assign(uncertainty, film.uncertainty);
      filmNotes.push(...film.notes);
    }
    const given = inputs as Record<string, unknown>;
    const film = filmInputNames(spec);
    const missing = film.filter((n) => given[n] === undefined && !(options.sweep?.over === n));
    if (missing.length && !a.flags.has("--demo")) throw missingFilm(spec, film, missing);
    const progress = a.flags.has("--progress") || io.stderrIsTTY === true ? progressWriter(id!, io) : null;
    if (progress) options.onProgress = progress.update;
    let result: ReturnType<typeof runCalculator>;
    try {
      result = runCalculator(spec, inputs, { ...options, ...(Object.keys(uncertainty).length ? { uncertainty } : {}) });
    } finally {
      progress?.end();
    }
    result.notes.unshift(...filmNotes);
    // Every input not given (film values under --demo, other inputs always) is named in the result.
    const defaults = spec.inputs.map((i) => i.name).filter((n) => given[n] === undefined && options.sweep?.over !== n);
    // the library's own note on demo values is replaced by the command's (which names --demo)
    result.notes = result.notes.filter((n) => !n.startsWith("demo values: "));
    if (missing.length) {
      result.status = "warning";
      result.notes.unshift(
        `demo values (--demo): ${missing.map((n) => `${n} = ${showInput(spec, n, result.inputs[n]!.value)}`).join(", ")} are the invented demo film's, not a real material's`,
      );
    }
    if (plotPath !== undefined) {
      try {
        // loaded for --plot only (figures, child_process): a plain calc does not pay for it
        const { saveFigure } = require("../display/saveFigure.js") as typeof SaveFigure;
        await saveFigure(result, plotPath);
      } catch (err) {
        if (err instanceof InputError) throw err;
        return fail(err as Error, 1);
      }
      io.stderr(`helicoid calc: wrote ${plotPath} (${spec.plots[0]!.title})\n`);
    }
    if (json) io.stdout(JSON.stringify({ ...result, defaults, demo: missing }) + "\n");
    else {
      io.stdout(`${result.title} (${result.id}): ${result.status}${missing.length ? " (demo film values used)" : ""}\n`);
      // grouped: inputs, headline results, other results; each row symbol, value (± uncertainty) with unit, meaning
      const { rows, statements } = groupedRows(result);
      const flagged = result.uncertainty?.flagged ?? {};
      const marked = rows.map((r) =>
        r.section === "Inputs" && defaults.includes(r.name)
          ? { ...r, meaning: `${r.meaning} (${missing.includes(r.name) ? "demo value" : "default"})` }
          : r.section !== "Inputs" && flagged[r.name]
            ? { ...r, meaning: `${r.meaning} (!)` }
            : r,
      );
      for (const line of textRows(marked)) io.stdout(`${line}\n`);
      for (const st of statements) io.stdout(`${st.meaning.charAt(0).toUpperCase()}${st.meaning.slice(1)}: ${st.text}\n`);
      if (Object.keys(flagged).length) io.stdout(`  (!) uncertainty not trustworthy: ${Object.keys(flagged).join(", ")} (see the notes)\n`);
      for (const note of result.notes) io.stdout(`  note: ${note}\n`);
      for (const s of result.assumptions) io.stdout(`  assumes: ${s}\n`);
    }
    return 0;
  } catch (err) {
    // Bad input exits 2; a solver that did not converge is a computation that failed: 1.
    if (err instanceof InputError) return fail(err, 2);
    if (err instanceof ConvergenceError) return fail(err, 1);
    throw err;
  }
}

function showInput(spec: CalculatorSpec, name: string, v: number): string {
  const unit = spec.inputs.find((i) => i.name === name)?.unit ?? "";
  return unit ? formatQuantity(v, unit) : String(v);
}

/** The input as one would type it: a value in the customary unit glued to its unit ("15pJ/m"). */
function typed(value: number, unit: string): string {
  const [u, f] = customaryUnit(value, unit);
  return `${Number((value / f).toPrecision(4))}${u === "1" ? "" : u}`;
}

function missingFilm(spec: CalculatorSpec, film: string[], missing: string[]): InputError {
  const example = film.map((n) => `${n}=${typed(spec.inputs.find((i) => i.name === n)!.default, spec.inputs.find((i) => i.name === n)!.unit)}`).join(" ");
  return new InputError(
    "film",
    `not given: ${missing.join(", ")}`,
    `every film input of '${spec.id}' (${film.join(", ")}) with its unit`,
    `Give them with units (such as ${example}), read them from a film file (--film FILE), or add --demo to use the calculator's invented demo film (not a real material)`,
  );
}

/**
 * A bare number for an input with a unit is refused unless --si: "A=10" meant as pJ/m is a common
 * slip that SI reading turns into 10 J/m. Whole-number and choice inputs and unitless inputs take
 * bare numbers. An angle (unit rad) is refused too: "90" may mean degrees.
 */
function refuseBareNumber(spec: CalculatorSpec, name: string, value: string, parameter = name): void {
  const input = spec.inputs.find((i) => i.name === name);
  if (!input || !input.unit || input.kind === "choice" || input.kind === "integer" || !isPlainNumber(value)) return;
  if (Number(value) === 0) return; // zero is zero in every unit
  const v = Number(value);
  const hint =
    input.unit === "rad"
      ? `${value}deg or ${value}rad`
      : `${typed(Number.isFinite(v) && v !== 0 ? v * customaryUnit(input.default || input.max, input.unit)[1] : input.default, input.unit)}`;
  throw new InputError(
    parameter,
    parameter === name ? value : `${name}: ${value}`,
    `a value with its unit (such as ${name}=${hint})`,
    `A bare number is refused for a quantity with a unit; add --si to read bare numbers in SI (${value} ${input.unit})`,
  );
}

/** `helicoid calc ID --help`: what the calculator computes, from its spec. */
function calculatorHelp(spec: ReturnType<typeof getCalculator>): string {
  const q = (v: number, unit: string) => (unit ? formatQuantity(v, unit) : String(v));
  const film = filmInputNames(spec);
  const lines = [`${spec.id}: ${spec.title}`, "", spec.summary, "", "inputs (name=value with a unit; defaults in brackets):"];
  if (film.length) lines.push(`  required: the film's ${film.join(", ")} (or --demo: the invented demo film's values, in brackets as "demo")`);
  for (const i of spec.inputs) {
    const range =
      i.kind === "choice" && i.choices ? `one of ${i.choices.map((c) => `${c.value} (${c.label})`).join(", ")}` : `usual range ${q(i.min, i.unit)} to ${q(i.max, i.unit)}`;
    lines.push(`  ${i.name.padEnd(12)} [${film.includes(i.name) ? "demo " : ""}${q(i.default, i.unit)}]  ${i.meaning}; ${range}`);
  }
  lines.push("", "outputs:");
  for (const o of spec.outputs) lines.push(`  ${o.name.padEnd(16)} ${o.unit ? `[${o.unit}] ` : ""}${o.kind && o.kind !== "scalar" ? `(${o.kind}) ` : ""}${o.meaning}`);
  if (spec.sweep?.over.length) lines.push("", `sweepable: ${spec.sweep.over.join(", ")} (--sweep NAME=FROM:TO:POINTS; default ${spec.sweep.points} points over the usual range)`);
  lines.push("", `method: ${spec.method}`, "assumptions:", ...spec.assumptions.map((x) => `  - ${x}`), "sources:", ...spec.sources.map((x) => `  - ${x}`));
  return lines.join("\n") + "\n";
}

/**
 * Progress of a long computation on stderr: on a terminal one line redrawn in place (at most 5 times
 * a second) and cleared at the end; otherwise (--progress into a file or pipe) a line at most once a
 * second. Nothing is written for computations that end within half a second.
 */
function progressWriter(id: string, io: CommandIO): { update: (fraction: number, what: string) => void; end: () => void } {
  const t0 = Date.now();
  const tty = io.stderrIsTTY === true;
  // Quick runs say nothing; HELICOID_PROGRESS_DELAY_MS changes the 0.5 s (tests set 0).
  const delayEnv = Number(process.env.HELICOID_PROGRESS_DELAY_MS);
  const delay = Number.isFinite(delayEnv) && delayEnv >= 0 ? delayEnv : 500;
  let last = 0;
  let drawn = false;
  let width = 0;
  const line = (fraction: number, what: string): string => {
    const pct = Math.max(0, Math.min(100, Math.round(fraction * 100)));
    return `helicoid calc ${id}: ${String(pct).padStart(3)}% ${what} (${((Date.now() - t0) / 1000).toFixed(1)} s)`;
  };
  return {
    update(fraction, what) {
      const now = Date.now();
      if (now - t0 < delay || now - last < (tty ? 200 : 1000)) return;
      last = now;
      const text = line(fraction, what);
      if (tty) {
        const shown = text.length > 119 ? text.slice(0, 118) + "…" : text;
        io.stderr(`\r${shown.padEnd(width)}`);
        width = shown.length;
      } else io.stderr(`${text}\n`);
      drawn = true;
    },
    end() {
      if (!drawn) return;
      if (tty) io.stderr(`\r${" ".repeat(width)}\r`);
      else io.stderr(`helicoid calc ${id}: done in ${((Date.now() - t0) / 1000).toFixed(1)} s\n`);
    },
  };
}
