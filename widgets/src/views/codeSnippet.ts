/**
 * "Copy as code": a TypeScript cell that reproduces the explorer's current state, so an
 * exploration becomes a documented, rerunnable step of the notebook.
 */
import { customaryUnit, type InputCorrelation, type InputSpec } from "@helicoid/lib";
import type { SweepRequest } from "../compute/job.js";

/** A value as a quantity string in the trade's unit, exact to 12 significant digits. */
export function quantityLiteral(value: number, unit: string): string {
  if (unit === "" || unit === "1") return String(Number(value.toPrecision(12)));
  const [u, f] = customaryUnit(value, unit);
  return JSON.stringify(`${Number((value / f).toPrecision(12))} ${u}`);
}

export function codeSnippet(options: {
  calculator: string;
  functionName?: string;
  inputs: InputSpec[];
  values: Record<string, number>;
  sweep: SweepRequest | null;
  /** "no sweep" chosen: the code must not run the calculator's default sweep either. */
  noSweep?: boolean;
  /** SI standard uncertainties of inputs: written as {value, uncertainty}. */
  uncertainties?: Record<string, number>;
  correlations?: InputCorrelation[];
}): string {
  const { calculator, inputs, values, sweep } = options;
  // a choice is written by its label ("skyrmion lattice"), which the calculators accept, not its number
  const literal = (i: InputSpec, v: number) => {
    const choice = i.kind === "choice" ? i.choices?.find((c) => c.value === v) : undefined;
    if (choice) return JSON.stringify(choice.label);
    const u = options.uncertainties?.[i.name];
    return u ? `{ value: ${quantityLiteral(v, i.unit)}, uncertainty: ${quantityLiteral(u, i.unit)} }` : quantityLiteral(v, i.unit);
  };
  const body = inputs.map((i) => `  ${/^[A-Za-z_$][\w$]*$/.test(i.name) ? i.name : JSON.stringify(i.name)}: ${literal(i, values[i.name] ?? i.default)},`).join("\n");
  const unitOf = (name: string) => inputs.find((i) => i.name === name)?.unit ?? "";
  const entries: string[] = [];
  if (sweep)
    entries.push(
      `sweep: { over: ${JSON.stringify(sweep.over)}, from: ${quantityLiteral(sweep.from, unitOf(sweep.over))}, to: ${quantityLiteral(sweep.to, unitOf(sweep.over))}, points: ${sweep.points} }`,
    );
  else if (options.noSweep) entries.push("noSweep: true");
  if (options.correlations?.length) entries.push(`uncertainty: { correlations: ${JSON.stringify(options.correlations)} }`);
  const sweepText = entries.length === 0 ? "" : sweep ? `, {\n${entries.map((e) => `  ${e},\n`).join("")}}` : `, { ${entries.join(", ")} }`;
  if (calculator) {
    return (
      `import { getCalculator, runCalculator } from "@helicoid/lib";\n` +
      `import { table } from "@helicoid/kernel";\n\n` +
      `const result = runCalculator(getCalculator(${JSON.stringify(calculator)}), {\n${body}\n}${sweepText});\n` +
      `table(result)\n`
    );
  }
  const fn = options.functionName || "myCalculator";
  return `// Inputs of the explored kernel function, as set in the explorer\nconst inputs = {\n${body}\n};\n${fn}(inputs);\n`;
}
