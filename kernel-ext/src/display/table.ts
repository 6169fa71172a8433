/**
 * `table(result)`: a calculator result (or any name -> {value, unit} record) as a table with units,
 * in Markdown, LaTeX, HTML and plain text, with the result's assumptions, method and sources below
 * it, so a notebook documents an analysis with no extra typing.
 */
import { catalogue, formatQuantity, formatWithError, isDocumentedResult, type CalculatorResult, type CalculatorSpec, type DocumentedResult } from "@helicoid/lib";
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

export class ResultTable implements Displayable {
  readonly rows: Row[];
  readonly notes: string[];
  readonly title: string;
  constructor(readonly input: TableInput) {
    if (!input || typeof input !== "object") throw new TypeError(`table: got ${typeof input}; expected a calculator result, a documented result (a fit ...) or a record of {value, unit}`);
    this.rows = [];
    if (isResult(input)) {
      const spec: CalculatorSpec | undefined = catalogue.find((s) => s.id === input.id);
      this.title = input.title;
      for (const [section, entries, defs] of [
        ["Inputs", input.inputs, spec?.inputs],
        ["Results", input.outputs, spec?.outputs],
      ] as const) {
        for (const [name, e] of Object.entries(entries as Record<string, Entry>)) {
          const def = (defs as ReadonlyArray<{ name: string; symbol: string; meaning: string }> | undefined)?.find((d) => d.name === name);
          this.rows.push({ section, name, symbol: def?.symbol ?? "", meaning: def?.meaning ?? "", value: formatEntry(e) });
        }
      }
      this.notes = storyOf(input);
    } else if (isDocumentedResult(input)) {
      const r = input as WithParameters;
      this.title = r.title ?? r.model ?? "";
      for (const [name, e] of Object.entries(r.inputs ?? {})) this.rows.push({ section: "Inputs", name, symbol: "", meaning: "", value: formatEntry(e) });
      for (const [name, p] of Object.entries(r.parameters ?? {})) {
        this.rows.push({ section: "Results", name, symbol: "", meaning: p.fixed ? "fixed" : "", value: p.fixed ? formatQuantity(p.value, p.unit) : formatWithError(p.value, p.stderr, p.unit) });
      }
      this.notes = storyOf(r);
    } else {
      this.title = "";
      for (const [name, e] of Object.entries(input as Record<string, Entry>)) this.rows.push({ section: "", name, symbol: "", meaning: "", value: formatEntry(e) });
      this.notes = [];
    }
  }

  markdown(): string {
    const lines: string[] = [];
    if (this.title) lines.push(`**${this.title}**`, "");
    lines.push("| | Quantity | Symbol | Value |", "|---|---|---|---|");
    for (const r of this.rows) lines.push(`| ${r.section} | ${esc(r.meaning || r.name)} (\`${r.name}\`) | ${r.symbol ? `$${r.symbol}$` : ""} | ${esc(r.value)} |`);
    if (this.notes.length) lines.push("", ...this.notes.map((n) => `- ${esc(n)}`));
    return lines.join("\n");
  }

  latex(): string {
    const body = this.rows.map((r) => `${texText(r.section)} & ${texText(r.name)} & ${r.symbol ? `$${r.symbol}$` : ""} & ${texText(r.value)} \\\\`).join("\n");
    return `\\begin{tabular}{llll}\n\\hline\n & Quantity & Symbol & Value \\\\\n\\hline\n${body}\n\\hline\n\\end{tabular}`;
  }

  html(): string {
    const rows = this.rows
      .map((r) => `<tr><td>${html(r.section)}</td><td title="${html(r.meaning)}">${html(r.meaning || r.name)} <code>${html(r.name)}</code></td><td>${r.symbol ? symbolHtml(r.symbol) : ""}</td><td>${html(r.value)}</td></tr>`)
      .join("");
    const notes = this.notes.length ? `<ul>${this.notes.map((n) => `<li>${html(n)}</li>`).join("")}</ul>` : "";
    return `<div class="helicoid-table">${this.title ? `<b>${html(this.title)}</b>` : ""}<table><thead><tr><th></th><th>Quantity</th><th>Symbol</th><th>Value</th></tr></thead><tbody>${rows}</tbody></table>${notes}</div>`;
  }

  text(): string {
    const w1 = Math.max(...this.rows.map((r) => r.section.length), 0);
    const w2 = Math.max(...this.rows.map((r) => r.name.length), 0);
    const lines = this.rows.map((r) => `${r.section.padEnd(w1)}  ${r.name.padEnd(w2)}  ${r.value}`);
    return [...(this.title ? [this.title] : []), ...lines, ...this.notes].join("\n");
  }

  [mimeBundle](): { data: MimeBundle } {
    return { data: { "text/markdown": this.markdown(), "text/latex": this.latex(), "text/html": this.html(), "text/plain": this.text() } };
  }
}

export function table(result: TableInput): ResultTable {
  return new ResultTable(result);
}

const greek: Record<string, string> = {
  alpha: "α", beta: "β", gamma: "γ", delta: "δ", epsilon: "ε", theta: "θ", kappa: "κ", lambda: "λ", mu: "μ", nu: "ν", pi: "π", rho: "ρ",
  sigma: "σ", tau: "τ", phi: "φ", chi: "χ", psi: "ψ", omega: "ω", Delta: "Δ", Gamma: "Γ", Theta: "Θ", Lambda: "Λ", Sigma: "Σ", Phi: "Φ", Psi: "Ψ", Omega: "Ω",
  parallel: "∥", perp: "⊥", hbar: "ħ", infty: "∞", cdot: "·", times: "×",
};

/**
 * A symbol given in LaTeX as HTML, for pages without a math typesetter (the exported page, plain
 * HTML front ends): Greek letters, sub- and superscripts ("K_{eff}", "\\mu_0 H", "m^2").
 */
export function symbolHtml(tex: string): string {
  let s = html(tex).replace(/\\(?:mathrm|text|mathit)\{([^}]*)\}/g, "$1");
  s = s.replace(/\\([A-Za-z]+)/g, (m, name: string) => greek[name] ?? name);
  s = s.replace(/_\{([^}]*)\}|_(.)/g, (_m, a?: string, b?: string) => `<sub>${a ?? b}</sub>`);
  s = s.replace(/\^\{([^}]*)\}|\^(.)/g, (_m, a?: string, b?: string) => `<sup>${a ?? b}</sup>`);
  return `<i>${s.replace(/[{}]/g, "").replace(/\\[,;! ]/g, " ")}</i>`;
}

function esc(s: string): string {
  return s.replace(/\|/g, "\\|");
}
function html(s: string): string {
  return s.replace(/&/g, "&amp;").replace(/</g, "&lt;").replace(/>/g, "&gt;").replace(/"/g, "&quot;");
}
function texText(s: string): string {
  return s.replace(/([&%$#_{}])/g, "\\$1").replace(/µ/g, "$\\mu$").replace(/²/g, "$^2$").replace(/³/g, "$^3$");
}
