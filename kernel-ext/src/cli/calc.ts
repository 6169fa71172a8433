/**
 * `helicoid calc ID name=value ... [--json] [--sweep NAME=FROM:TO:POINTS]` runs any catalogue
 * calculator from the shell; values take units (`A=15pJ/m`, `B=50mT`, `t=1nm`).
 * `helicoid calc --list [--json]` lists the ids with their inputs and outputs.
 * JSON: {"id", "status", "inputs": {name: {"value", "unit"}}, "outputs": {name: {"value", "unit"}}, ...}
 * with SI values and SI unit strings; a sweep output's value is an array.
 * Errors: exit 2 for bad input or usage (an unknown option, an input given twice, a --sweep of a
 * calculator that has none), 1 when a computation failed; with --json the error is also a JSON
 * object on stdout: {"id", "status": "error", "error": {"type", "message", "parameter", "value", "expected"}}.
 */
import { catalogue, formatQuantity, getCalculator, InputError, parseQuantity, runCalculator, ConvergenceError, type ComputeOptions } from "@helicoid/lib";
import { formatEntry } from "../display/table.js";
import { saveFigure } from "../display/saveFigure.js";
import { errorJson, parseStrict, UsageError, type CommandIO } from "./args.js";

export const calcUsage = [
  "usage: helicoid calc ID name=value ... [--sweep NAME=FROM:TO:POINTS] [--json]",
  "       helicoid calc --list [--json]",
  "       helicoid calc ID --help      what ID computes: its inputs (unit, default, range, meaning) and outputs",
  "  name=value            an input of the calculator with its unit (A=15pJ/m, B=50mT); each at most once",
  "  --sweep NAME=FROM:TO:POINTS   sweep a sweepable input (B=0mT:200mT:200); --list shows which",
  "  --plot FILE.svg|.png  write the calculator's first plot (one journal column, 8.5 cm wide)",
  "  --json                SI JSON on stdout (on an error too: {id, status: \"error\", error})",
  "  --list                the calculators with their inputs and outputs",
  "Exit status: 0 done, 2 bad input or usage, 1 a computation that failed.",
  "Examples:",
  "  helicoid calc wall A=15pJ/m Ku=0.8MJ/m^3 D=1.5mJ/m^2",
  "  helicoid calc wall360 B=20mT --json",
  "  helicoid calc easy-plane --sweep B=0mT:200mT:40",
  "  helicoid calc skyrmion --help",
].join("\n");

const OPTIONS = { flags: ["--json", "--list", "--help", "-h"], valued: { "--sweep": "NAME=FROM:TO:POINTS, such as B=0mT:200mT:200", "--plot": "a file name ending in .svg or .png, such as r-vs-b.svg" } };

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
    else for (const s of list) io.stdout(`${s.id.padEnd(18)} ${s.title}\n${"".padEnd(19)}inputs: ${s.inputs.map((i) => `${i.name} [${i.unit || "-"}]`).join(", ")}${s.sweep?.over.length ? `; sweepable: ${s.sweep.over.join(", ")}` : ""}\n`);
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
      const points = Number(m[4]);
      if (points < 2 || points > 100000) throw new InputError("--sweep", sweep, "POINTS a whole number from 2 to 100000");
      options.sweep = { over: m[1]!, from: parseQuantity(m[1]!, m[2]!, input.unit), to: parseQuantity(m[1]!, m[3]!, input.unit), points: Number(m[4]) };
    }
    const plotPath = a.options.get("--plot");
    if (plotPath !== undefined && !/\.(svg|png)$/i.test(plotPath)) throw new InputError("--plot", plotPath, "a file name ending in .svg or .png");
    if (plotPath !== undefined && spec.plots.length === 0) throw new InputError("--plot", plotPath, `no --plot: '${id}' has no plots`);
    const result = runCalculator(spec, raw, options);
    if (plotPath !== undefined) {
      try { await saveFigure(result, plotPath); } catch (err) { if (err instanceof InputError) throw err; return fail(err as Error, 1); }
      io.stderr(`helicoid calc: wrote ${plotPath} (${spec.plots[0]!.title})\n`);
    }
    if (json) io.stdout(JSON.stringify(result) + "\n");
    else {
      io.stdout(`${result.title} (${result.id}): ${result.status}\n`);
      // each line ends with what the quantity means (from the spec), so a number never stands alone
      const meaning = (list: Array<{ name: string; meaning: string }>, n: string) => list.find((x) => x.name === n)?.meaning ?? "";
      const line = (tag: string, n: string, text: string, m: string) => io.stdout(`  ${tag} ${n.padEnd(16)} ${text.padEnd(24)}${m ? `  ${m}` : ""}\n`);
      for (const [n, e] of Object.entries(result.inputs)) line("in  ", n, formatQuantity(e.value, e.unit), meaning(spec.inputs, n));
      for (const [n, e] of Object.entries(result.outputs)) line("out ", n, formatEntry(e), meaning(spec.outputs, n));
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

/** `helicoid calc ID --help`: what the calculator computes, from its spec. */
function calculatorHelp(spec: ReturnType<typeof getCalculator>): string {
  const q = (v: number, unit: string) => (unit ? formatQuantity(v, unit) : String(v));
  const lines = [`${spec.id}: ${spec.title}`, "", spec.summary, "", "inputs (name=value with a unit; defaults in brackets):"];
  for (const i of spec.inputs) {
    const range = i.kind === "choice" && i.choices ? `one of ${i.choices.map((c) => `${c.value} (${c.label})`).join(", ")}` : `usual range ${q(i.min, i.unit)} to ${q(i.max, i.unit)}`;
    lines.push(`  ${i.name.padEnd(12)} [${q(i.default, i.unit)}]  ${i.meaning}; ${range}`);
  }
  lines.push("", "outputs:");
  for (const o of spec.outputs) lines.push(`  ${o.name.padEnd(16)} ${o.unit ? `[${o.unit}] ` : ""}${o.kind && o.kind !== "scalar" ? `(${o.kind}) ` : ""}${o.meaning}`);
  if (spec.sweep?.over.length) lines.push("", `sweepable: ${spec.sweep.over.join(", ")} (--sweep NAME=FROM:TO:POINTS; default ${spec.sweep.points} points over the usual range)`);
  lines.push("", `method: ${spec.method}`, "assumptions:", ...spec.assumptions.map((x) => `  - ${x}`), "sources:", ...spec.sources.map((x) => `  - ${x}`));
  return lines.join("\n") + "\n";
}
