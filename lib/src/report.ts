/**
 * `report(result)`: a Markdown account of any documented result (a calculator result, a fit, a
 * field-series fit, a charge analysis): what was given, what came out, and the story of the numbers
 * (status, notes, assumptions, method, sources). A fit gets the fit report (`fitReport`).
 */
import { fitReport } from "./fit/fitReport.js";
import type { FitResult } from "./fit/leastSquares.js";
import type { FieldSeriesResult } from "./fit/fieldSeries.js";
import { formatQuantity } from "./quantity/units.js";
import type { DocumentedResult, Quantity } from "./result.js";

function isFit(r: DocumentedResult): r is FitResult | FieldSeriesResult {
  const f = r as Partial<FitResult>;
  return typeof f.parameters === "object" && f.parameters !== null && typeof f.chiSquare === "number";
}

function valueText(e: Quantity<number | number[] | string>): string {
  if (typeof e.value === "string") return e.value.replace(/\n/g, "; ");
  if (Array.isArray(e.value)) {
    const finite = e.value.filter(Number.isFinite);
    if (finite.length === 0) return `${e.value.length} values`;
    return `${e.value.length} values, ${formatQuantity(Math.min(...finite), e.unit, 3)} to ${formatQuantity(Math.max(...finite), e.unit, 3)}`;
  }
  return e.unit ? formatQuantity(e.value, e.unit) : String(e.value);
}

const cell = (s: string) => s.replace(/\|/g, "\\|");

/** Markdown of a documented result (options.title overrides the result's own title). */
export function report(result: DocumentedResult, options: { title?: string } = {}): string {
  const titled = result as DocumentedResult & { title?: string; model?: string; outputs?: Record<string, Quantity<number | number[] | string>> };
  const title = options.title ?? titled.title ?? titled.model;
  if (isFit(result)) return fitReport(result, title ? { title } : {});
  const out: string[] = [];
  if (title) out.push(`### ${title}`, "");
  out.push(`**Status:** ${result.status}${result.message ? ` — ${result.message}` : ""}`, "");
  for (const [head, entries] of [
    ["Inputs", result.inputs],
    ["Results", titled.outputs],
  ] as const) {
    const list = Object.entries(entries ?? {});
    if (list.length === 0) continue;
    out.push(`**${head}:**`, "", "| name | value |", "|---|---|", ...list.map(([k, e]) => `| ${cell(k)} | ${cell(valueText(e))} |`), "");
  }
  if (result.notes.length) out.push("**Notes:**", ...result.notes.map((n) => `- ${n}`), "");
  if (result.assumptions.length) out.push("**Assumptions:**", ...result.assumptions.map((a) => `- ${a}`), "");
  out.push(`**Method:** ${result.method}`, "");
  if (result.sources.length) out.push("**Sources:**", ...result.sources.map((s) => `- ${s}`));
  return out.join("\n");
}
