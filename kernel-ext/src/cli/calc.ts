/**
 * `helicoid calc ID name=value ... [--json] [--sweep NAME=FROM:TO:POINTS]` runs any catalogue
 * calculator from the shell; values take units (`A=15pJ/m`, `B=50mT`, `t=1nm`).
 * `helicoid calc --list [--json]` lists the ids with their inputs and outputs.
 * JSON: {"id", "status", "inputs": {name: {"value", "unit"}}, "outputs": {name: {"value", "unit"}}, ...}
 * with SI values and SI unit strings; a sweep output's value is an array.
 */
import { catalogue, formatQuantity, getCalculator, InputError, parseQuantity, runCalculator, ConvergenceError, type ComputeOptions } from "@helicoid/lib";
import { formatEntry } from "../display/table.js";
import { parseArgs, type CommandIO } from "./args.js";

export const calcUsage = "helicoid calc ID name=value ... [--json] [--sweep NAME=FROM:TO:POINTS] | helicoid calc --list [--json]";

export async function calcCommand(args: string[], io: CommandIO): Promise<number> {
  const a = parseArgs(args, ["--sweep"]);
  const json = a.flags.has("--json");
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
    else for (const s of list) io.stdout(`${s.id.padEnd(18)} ${s.title}\n${"".padEnd(19)}inputs: ${s.inputs.map((i) => `${i.name} [${i.unit || "-"}]`).join(", ")}\n`);
    return 0;
  }
  const [id, ...pairs] = a.positional;
  if (!id) {
    io.stderr(`usage: ${calcUsage}\n`);
    return 2;
  }
  try {
    const spec = getCalculator(id);
    const raw: Record<string, string> = {};
    for (const p of pairs) {
      const eq = p.indexOf("=");
      if (eq <= 0) throw new InputError("argument", p, "name=value, such as A=15pJ/m");
      raw[p.slice(0, eq)] = p.slice(eq + 1);
    }
    const options: ComputeOptions = {};
    const sweep = a.options.get("--sweep");
    if (sweep) {
      const m = /^([A-Za-z_]\w*)=([^:]+):([^:]+):(\d+)$/.exec(sweep);
      if (!m) throw new InputError("--sweep", sweep, "NAME=FROM:TO:POINTS, such as B=0mT:200mT:200");
      const input = spec.inputs.find((i) => i.name === m[1]);
      if (!input) throw new InputError("--sweep", sweep, `an input of '${id}': ${spec.inputs.map((i) => i.name).join(", ")}`);
      options.sweep = { over: m[1]!, from: parseQuantity(m[1]!, m[2]!, input.unit), to: parseQuantity(m[1]!, m[3]!, input.unit), points: Number(m[4]) };
    }
    const result = runCalculator(spec, raw, options);
    if (json) io.stdout(JSON.stringify(result) + "\n");
    else {
      io.stdout(`${result.title} (${result.id}): ${result.status}\n`);
      for (const [n, e] of Object.entries(result.inputs)) io.stdout(`  in   ${n.padEnd(16)} ${formatQuantity(e.value, e.unit)}\n`);
      for (const [n, e] of Object.entries(result.outputs)) io.stdout(`  out  ${n.padEnd(16)} ${formatEntry(e)}\n`);
      for (const note of result.notes) io.stdout(`  note: ${note}\n`);
      for (const s of result.assumptions) io.stdout(`  assumes: ${s}\n`);
    }
    return 0;
  } catch (err) {
    if (err instanceof InputError || err instanceof ConvergenceError) {
      if (json) io.stdout(JSON.stringify({ id, status: "error", error: { type: err.name, message: err.message, ...(err instanceof InputError ? { parameter: err.parameter, value: err.value, expected: err.expected } : { diagnostics: err.diagnostics }) } }) + "\n");
      io.stderr(`helicoid calc: ${err.message}\n`);
      return 2;
    }
    throw err;
  }
}
