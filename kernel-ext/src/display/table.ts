/**
 * `table(result)`: a calculator result (or any name -> {value, unit} record) as a table with units,
 * in Markdown, LaTeX, HTML and plain text, with the result's assumptions, method and sources below
 * it, so a notebook documents an analysis with no extra typing.
 */
import {
  catalogue,
  formatQuantity,
  formatWithError,
  isDocumentedResult,
  symbolHtml as libSymbolHtml,
  type CalculatorResult,
  type CalculatorSpec,
  type DocumentedResult,
} from "@helicoid/lib";
import { mimeBundle, type Displayable } from "./bundle.js";
import type { MimeBundle } from "./output.js";

type Entry = { value: number | number[] | string; unit: string; /** one standard deviation, SI */ uncertainty?: number };
/**
 * What `table()` shows: a calculator result, any documented result (a fit, a field-series fit, a
 * charge analysis: its inputs, parameters with standard errors, and story), or a record of
 * {value, unit}.
 */
export type TableInput = CalculatorResult<string, object> | DocumentedResult | Record<string, Entry>;

/** A documented result's fitted parameters, when it has them (fits, field-series fits). */
type WithParameters = DocumentedResult & { title?: string; model?: string; parameters?: Record<string, { value: number; stderr: number | null; unit: string; fixed?: boolean }> };

interface Row {
  section: string;
  name: string;
  symbol: string;
  meaning: string;
  value: string;
}

/** The groups of a result table, in order: what was given, what a reader looks at first, the rest. */
export const TABLE_GROUPS = ["Inputs", "Results", "Other results"] as const;

function isResult(x: TableInput): x is CalculatorResult {
  return typeof (x as CalculatorResult).id === "string" && typeof (x as CalculatorResult).outputs === "object";
}

/** The notes below a table: status, message, notes, assumptions, method, sources. */
function storyOf(r: DocumentedResult): string[] {
  return [
    ...(r.status !== "ok" ? [`Status: ${r.status}${r.message ? ` (${r.message})` : ""}`] : r.message ? [r.message] : []),
    ...r.notes.map((n) => `Note: ${n}`),
    ...(r.assumptions ?? []).map((a) => `Assumption: ${a}`),
    `Method: ${r.method}`,
    ...r.sources.map((s) => `Source: ${s}`),
  ];
}

export function formatEntry(e: Entry): string {
  if (typeof e.value === "string") return e.value;
  if (Array.isArray(e.value)) {
    const finite = e.value.filter(Number.isFinite);
    if (finite.length === 0) return `${e.value.length} values`;
    const lo = Math.min(...finite);
    const hi = Math.max(...finite);
    return `${e.value.length} values, ${formatQuantity(lo, e.unit, 3)} to ${formatQuantity(hi, e.unit, 3)}`;
  }
  // a value with its standard uncertainty: the uncertainty to two significant digits, the value to the same place
  if (typeof e.uncertainty === "number" && Number.isFinite(e.uncertainty) && e.uncertainty > 0) return formatWithError(e.value, e.uncertainty, e.unit);
  return formatQuantity(e.value, e.unit);
}

/** The headline outputs of a spec: its own list, or its first four numbers. */
export function headlineOutputs(spec: CalculatorSpec, outputs: Record<string, Entry>): string[] {
  if (spec.headline?.length) return spec.headline.filter((n) => n in outputs);
  const uncertainties = new Set(spec.outputs.map((o) => o.uncertainty).filter(Boolean));
  return spec.outputs
    .filter((o) => !uncertainties.has(o.name))
    .filter((o) => (o.kind ?? "scalar") === "scalar" && o.name in outputs && typeof outputs[o.name]?.value === "number")
    .slice(0, 4)
    .map((o) => o.name);
}

/**
 * A result in three groups (inputs, headline results, other results) of rows with symbol, meaning
 * and value with its unit; statements in words (text outputs) are returned apart, to be shown as
 * sentences below the table rather than in a cell.
 */
export function groupedRows(result: CalculatorResult): { rows: Row[]; statements: Array<{ name: string; meaning: string; text: string }> } {
  const spec: CalculatorSpec | undefined = catalogue.find((s) => s.id === result.id);
  const rows: Row[] = [];
  const statements: Array<{ name: string; meaning: string; text: string }> = [];
  const def = (list: ReadonlyArray<{ name: string; symbol: string; meaning: string }> | undefined, n: string) => list?.find((d) => d.name === n);
  for (const [name, e] of Object.entries(result.inputs)) {
    const d = def(spec?.inputs, name);
    // a choice by its label ("honeycomb"), not its number
    const choice = spec?.inputs.find((i) => i.name === name)?.choices?.find((c) => c.value === e.value);
    rows.push({ section: "Inputs", name, symbol: d?.symbol ?? "", meaning: d?.meaning ?? name, value: choice ? choice.label : formatEntry(e) });
  }
  const headlineList = spec ? headlineOutputs(spec, result.outputs) : [];
  const headline = new Set(headlineList);
  const top: Row[] = [];
  const other: Row[] = [];
  // an output that is another's uncertainty is shown with it ("11.022 ± 0.036 nm"), not on its own row
  const uncertaintyOf = new Map<string, string>();
  for (const o of spec?.outputs ?? []) {
    const outs = result.outputs as Record<string, { value: unknown } | undefined>;
    const u = o.uncertainty && o.uncertainty in outs ? outs[o.uncertainty] : undefined;
    if (u && typeof u.value === "number" && o.name in outs && typeof outs[o.name]?.value === "number") uncertaintyOf.set(o.uncertainty!, o.name);
  }
  for (const [name, e] of Object.entries(result.outputs)) {
    if (uncertaintyOf.has(name)) continue;
    const d = def(spec?.outputs, name);
    const u = spec?.outputs.find((o) => o.name === name)?.uncertainty;
    if (u && uncertaintyOf.get(u) === name) {
      const row = {
        section: headline.has(name) ? "Results" : "Other results",
        name,
        symbol: d?.symbol ?? "",
        meaning: d?.meaning ?? name,
        value: formatWithError(e.value as number, result.outputs[u]!.value as number, e.unit),
      };
      (headline.has(name) ? top : other).push(row);
      continue;
    }
    if (typeof e.value === "string") {
      statements.push({ name, meaning: d?.meaning ?? name, text: e.value });
      continue;
    }
    const row = { section: headline.has(name) ? "Results" : "Other results", name, symbol: d?.symbol ?? "", meaning: d?.meaning ?? name, value: formatEntry(e) };
    (headline.has(name) ? top : other).push(row);
  }
  // headline rows in the order the spec lists them
  top.sort((a, b) => headlineList.indexOf(a.name) - headlineList.indexOf(b.name));
  return { rows: [...rows, ...top, ...other], statements };
}

/** A symbol as plain text with Unicode sub- and superscripts where they exist ("μ₀H", "K_eff"). */
export function symbolPlain(tex: string): string {
  if (!tex) return "";
  const sub: Record<string, string> = {
    "0": "₀",
    "1": "₁",
    "2": "₂",
    "3": "₃",
    "4": "₄",
    "5": "₅",
    "6": "₆",
    "7": "₇",
    "8": "₈",
    "9": "₉",
    "+": "₊",
    "−": "₋",
    "-": "₋",
    "(": "₍",
    ")": "₎",
    a: "ₐ",
    e: "ₑ",
    o: "ₒ",
    x: "ₓ",
    h: "ₕ",
    k: "ₖ",
    l: "ₗ",
    m: "ₘ",
    n: "ₙ",
    p: "ₚ",
    s: "ₛ",
    t: "ₜ",
    i: "ᵢ",
    r: "ᵣ",
    u: "ᵤ",
    v: "ᵥ",
  };
  const sup: Record<string, string> = {
    "0": "⁰",
    "1": "¹",
    "2": "²",
    "3": "³",
    "4": "⁴",
    "5": "⁵",
    "6": "⁶",
    "7": "⁷",
    "8": "⁸",
    "9": "⁹",
    "+": "⁺",
    "−": "⁻",
    "-": "⁻",
    "(": "⁽",
    ")": "⁾",
    n: "ⁿ",
    i: "ⁱ",
    "*": "*",
    "′": "′",
  };
  const map = (t: string, table: Record<string, string>, mark: string) =>
    [...t].every((c) => c in table) ? [...t].map((c) => table[c]).join("") : `${mark}${t.length > 1 ? `{${t}}` : t}`;
  return libSymbolHtml(tex)
    .replace(/<sub>(.*?)<\/sub>/g, (_m, t: string) => map(t, sub, "_"))
    .replace(/<sup>(.*?)<\/sup>/g, (_m, t: string) => map(t, sup, "^"))
    .replace(/<[^>]+>/g, "")
    .replace(/&lt;/g, "<")
    .replace(/&gt;/g, ">")
    .replace(/&amp;/g, "&");
}

export class ResultTable implements Displayable {
  readonly rows: Row[];
  readonly notes: string[];
  readonly title: string;
  /** Text outputs, shown as sentences under the table. */
  readonly statements: Array<{ name: string; meaning: string; text: string }> = [];
  constructor(readonly input: TableInput) {
    if (!input || typeof input !== "object")
      throw new TypeError(`table: got ${typeof input}; expected a calculator result, a documented result (a fit ...) or a record of {value, unit}`);
    this.rows = [];
    if (isResult(input)) {
      this.title = `${input.title}${input.status !== "ok" ? ` (${input.status})` : ""}`;
      const g = groupedRows(input);
      this.rows.push(...g.rows);
      this.statements = g.statements;
      this.notes = storyOf({ ...input, status: "ok" });
    } else if (isDocumentedResult(input)) {
      const r = input as WithParameters;
      this.title = r.title ?? r.model ?? "";
      for (const [name, e] of Object.entries(r.inputs ?? {})) this.rows.push({ section: "Inputs", name, symbol: "", meaning: "", value: formatEntry(e) });
      for (const [name, p] of Object.entries(r.parameters ?? {})) {
        this.rows.push({
          section: "Results",
          name,
          symbol: "",
          meaning: p.fixed ? "fixed" : "",
          value: p.fixed ? formatQuantity(p.value, p.unit) : formatWithError(p.value, p.stderr, p.unit),
        });
      }
      this.notes = storyOf(r);
    } else {
      this.title = "";
      for (const [name, e] of Object.entries(input as Record<string, Entry>)) this.rows.push({ section: "", name, symbol: "", meaning: "", value: formatEntry(e) });
      this.notes = [];
    }
  }

  /** Rows with a header row before each group. */
  private grouped<T>(header: (section: string) => T, row: (r: Row) => T): T[] {
    const out: T[] = [];
    let last = "";
    for (const r of this.rows) {
      if (r.section && r.section !== last) out.push(header(r.section));
      last = r.section;
      out.push(row(r));
    }
    return out;
  }

  markdown(): string {
    const lines: string[] = [];
    if (this.title) lines.push(`**${esc(this.title)}**`, "");
    lines.push("| Quantity | Symbol | Value |", "|---|---|---|");
    lines.push(
      ...this.grouped(
        (s) => `| **${s}** | | |`,
        (r) => `| ${r.meaning ? esc(r.meaning) : `\`${r.name}\``} | ${r.symbol ? `$${r.symbol}$` : ""} | ${esc(r.value)} |`,
      ),
    );
    if (this.statements.length) lines.push("", ...this.statements.map((s) => `- ${esc(capital(s.meaning))}: ${esc(s.text)}`));
    if (this.notes.length) lines.push("", ...this.notes.map((n) => `- ${esc(n)}`));
    return lines.join("\n");
  }

  latex(): string {
    const body = this.grouped(
      (s) => `\\multicolumn{3}{l}{\\textbf{${texText(s)}}} \\\\`,
      (r) => `${texText(r.meaning || r.name)} & ${r.symbol ? `$${r.symbol}$` : ""} & ${texText(r.value)} \\\\`,
    ).join("\n");
    return `\\begin{tabular}{lll}\n\\hline\nQuantity & Symbol & Value \\\\\n\\hline\n${body}\n\\hline\n\\end{tabular}`;
  }

  html(): string {
    const rows = this.grouped(
      (s) => `<tr class="helicoid-group"><th colspan="3" style="text-align:left">${html(s)}</th></tr>`,
      (r) =>
        `<tr data-name="${html(r.name)}"><td title="${html(r.name)}">${html(r.meaning || r.name)}</td><td>${r.symbol ? symbolHtml(r.symbol) : ""}</td><td>${html(r.value)}</td></tr>`,
    ).join("");
    const statements = this.statements.length
      ? `<ul class="helicoid-statements">${this.statements.map((s) => `<li><b>${html(capital(s.meaning))}</b>: ${html(s.text)}</li>`).join("")}</ul>`
      : "";
    const notes = this.notes.length ? `<ul>${this.notes.map((n) => `<li>${html(n)}</li>`).join("")}</ul>` : "";
    return `<div class="helicoid-table">${this.title ? `<b>${html(this.title)}</b>` : ""}<table><thead><tr><th>Quantity</th><th>Symbol</th><th>Value</th></tr></thead><tbody>${rows}</tbody></table>${statements}${notes}</div>`;
  }

  text(): string {
    return [...(this.title ? [this.title] : []), ...textRows(this.rows), ...this.statements.map((s) => `${capital(s.meaning)}: ${s.text}`), ...this.notes].join("\n");
  }

  [mimeBundle](): { data: MimeBundle } {
    return { data: { "text/markdown": this.markdown(), "text/latex": this.latex(), "text/plain": this.text(), "text/html": this.html() } };
  }
}

/** Rows as aligned plain text under group headings: "  μ₀H   50 mT   applied field". */
export function textRows(rows: Row[]): string[] {
  const sym = rows.map((r) => symbolPlain(r.symbol) || r.name);
  const w1 = Math.min(Math.max(0, ...sym.map(visibleLength)), 24);
  const w2 = Math.min(Math.max(0, ...rows.map((r) => visibleLength(r.value))), 36);
  const out: string[] = [];
  let last = "";
  rows.forEach((r, i) => {
    if (r.section && r.section !== last) out.push(r.section);
    last = r.section;
    out.push(`  ${padU(sym[i]!, w1)}  ${padU(r.value, w2)}  ${r.meaning || r.name}`);
  });
  return out;
}

/** Characters a terminal shows (combining accents take no column). */
function visibleLength(s: string): number {
  return [...s.replace(/\p{M}/gu, "")].length;
}

function padU(s: string, w: number): string {
  const n = visibleLength(s);
  return n >= w ? s : s + " ".repeat(w - n);
}

function capital(s: string): string {
  return s ? s[0]!.toUpperCase() + s.slice(1) : s;
}

export function table(result: TableInput): ResultTable {
  return new ResultTable(result);
}

/**
 * A symbol given in LaTeX as HTML, for pages without a math typesetter (the exported page, plain
 * HTML front ends): the library's converter (Greek letters including \\varphi, sub- and
 * superscripts, operators), in italics.
 */
export function symbolHtml(tex: string): string {
  return `<i>${libSymbolHtml(tex)}</i>`;
}

function esc(s: string): string {
  return s.replace(/\|/g, "\\|");
}
function html(s: string): string {
  return s.replace(/&/g, "&amp;").replace(/</g, "&lt;").replace(/>/g, "&gt;").replace(/"/g, "&quot;");
}
function texText(s: string): string {
  return s
    .replace(/([&%$#_{}])/g, "\\$1")
    .replace(/µ/g, "$\\mu$")
    .replace(/²/g, "$^2$")
    .replace(/³/g, "$^3$");
}
