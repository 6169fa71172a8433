/**
 * Markdown reports of fits: a parameter table (value +- standard error and the confidence interval
 * in the trade's customary units), the goodness of fit, status, notes, assumptions, method and
 * sources, so a notebook documents a fit with one call. Works for single-profile and global fits
 * (FitResult) and for field series (FieldSeriesResult). Common practice, no source.
 */
import { customaryUnit, displayUnit, formatNumber } from "../quantity/units.js";
import type { FitResult, ParameterResult } from "./leastSquares.js";
import { at } from "../numeric/indexing.js";
import type { FieldSeriesResult } from "./fieldSeries.js";

/**
 * "value ± uncertainty unit" in one customary unit chosen from the value: the uncertainty rounded
 * to two significant digits and the value to the same decimal place ("11.022 ± 0.036 nm").
 * Source: JCGM 100:2008 (GUM) §7.2.6 (at most two significant digits of an uncertainty) and §7.2.2
 * (value and uncertainty in the same unit, to the same place). No "-0": a value that rounds to zero
 * is "0".
 */
export function formatWithError(value: number, stderr: number | null, siUnit: string, digits = 4): string {
  if (!Number.isFinite(value)) return String(value);
  if (value === 0 && !stderr) return `0${siUnit ? " " + displayUnit(siUnit) : ""}`;
  const [u, f] = customaryUnit(value !== 0 ? value : (stderr ?? 0), siUnit);
  const unit = u && u !== "1" ? " " + displayUnit(u) : "";
  if (stderr === null || !Number.isFinite(stderr)) return `${formatNumber(value / f, digits)}${unit}`;
  return `${valueErrorPair(value / f, stderr / f)}${unit}`;
}

/** Value and uncertainty (same unit) to the uncertainty's two significant digits: ["11.022", "0.036"]. */
export function roundToUncertainty(value: number, uncertainty: number): [string, string] {
  const e = Math.abs(uncertainty);
  if (!(e > 0) || !Number.isFinite(e)) return [formatNumber(value, 4), String(uncertainty)];
  // the place of the second significant digit, after rounding (0.0995 -> 0.10, not 0.100)
  let place = Math.floor(Math.log10(e)) - 1;
  if (Math.round(e / 10 ** place) >= 100) place += 1;
  const unsign = (t: string) => (/^-0(\.0*)?$/.test(t) ? t.slice(1) : t);
  if (place >= 0) {
    const step = 10 ** place;
    return [unsign(String(Math.round(value / step) * step)), String(Math.round(e / step) * step)];
  }
  const d = Math.min(-place, 20);
  return [unsign(value.toFixed(d)), e.toFixed(d)];
}

function valueErrorPair(value: number, uncertainty: number): string {
  const a = Math.abs(value),
    e = Math.abs(uncertainty);
  // very large or small numbers in one shared power of ten: "(1.234 ± 0.056)e-7"
  const big = Math.max(a, e);
  if (big > 0 && (big >= 1e6 || big < 1e-3)) {
    const p = Math.floor(Math.log10(big));
    const [v, u] = roundToUncertainty(value / 10 ** p, e / 10 ** p);
    return `(${v} ± ${u})e${p}`;
  }
  const [v, u] = roundToUncertainty(value, e);
  return `${v} ± ${u}`;
}

function rangeText(lo: number, hi: number, value: number, siUnit: string): string {
  const [u, f] = customaryUnit(value !== 0 ? value : Number.isFinite(hi) ? hi : lo, siUnit);
  const unit = u && u !== "1" ? " " + displayUnit(u) : "";
  const end = (v: number) => (Number.isFinite(v) ? formatNumber(v / f, 4) : v > 0 ? "∞ (open)" : "−∞ (open)");
  return `[${end(lo)}, ${end(hi)}]${unit}`;
}

function intervalText(p: ParameterResult): string {
  if (!p.interval) return p.fixed ? "fixed" : p.atBound ? "on its bound" : "—";
  const text = rangeText(p.interval[0], p.interval[1], p.value, p.unit);
  return p.clipped?.length ? `${text} (clipped at the physical limit: ${p.clipped.join(" and ")} end)` : text;
}

function profileText(p: ParameterResult): string {
  if (!p.profileInterval) return p.fixed ? "fixed" : "—";
  return rangeText(p.profileInterval[0], p.profileInterval[1], p.value, p.unit);
}

function esc(s: string): string {
  return s.replace(/\|/g, "\\|");
}

function isSeries(r: FitResult | FieldSeriesResult): r is FieldSeriesResult {
  return (r as FieldSeriesResult).kuDecision !== undefined;
}

/** Markdown of the parameter table alone. */
export function fitParameterTable(result: FitResult | FieldSeriesResult, meanings: Record<string, string> = {}): string {
  const conf = Math.round(100 * result.confidence);
  // A profile-likelihood column appears when some parameter was profiled (option profile).
  const profiled = Object.values(result.parameters).some((p) => p.profileInterval);
  const lines = profiled
    ? [`| parameter | meaning | value ± standard error | ${conf} % interval (linearized) | ${conf} % interval (profile likelihood) |`, "|---|---|---|---|---|"]
    : [`| parameter | meaning | value ± standard error | ${conf} % interval |`, "|---|---|---|---|"];
  for (const [name, p] of Object.entries(result.parameters)) {
    const status = p.fixed ? " (fixed)" : p.atBound ? " (on bound)" : "";
    const row = `| ${esc(name)}${status} | ${esc(meanings[name] ?? "")} | ${formatWithError(p.value, p.stderr, p.unit)} | ${intervalText(p)} |`;
    lines.push(profiled ? `${row} ${profileText(p)} |` : row);
  }
  return lines.join("\n");
}

/** A full Markdown report of a fit. */
export function fitReport(result: FitResult | FieldSeriesResult, options: { title?: string; meanings?: Record<string, string> } = {}): string {
  const out: string[] = [];
  if (options.title) out.push(`### ${options.title}`, "");
  out.push(`**Status:** ${result.status} — ${result.message}`, "");
  out.push(fitParameterTable(result, options.meanings), "");
  const gof: string[] = [`chi² = ${formatNumber(result.chiSquare, 4)}`, `degrees of freedom = ${result.dof}`, `reduced chi² = ${formatNumber(result.chiSquareReduced, 4)}`];
  if (isSeries(result)) {
    out.push(`**Goodness of fit (${result.approach === "two-stage" ? "energy model against the per-profile R, w" : "all profiles"}):** ${gof.join(", ")}`, "");
    out.push(`**Ku:** ${result.kuDecision.reason}.`, "");
    out.push("| B | R (profile fit) | w (profile fit) | corr(R, w) | R (energy model) | w (energy model) | pull R | pull w |", "|---|---|---|---|---|---|---|---|");
    for (const p of result.profiles) {
      out.push(
        `| ${formatNumber(p.B * 1e3, 4)} mT | ${formatWithError(p.R, p.stderrR, "m")} | ${formatWithError(p.w, p.stderrW, "m")} | ${p.correlationRw.toFixed(2)} | ${formatWithError(p.modelR, null, "m")} | ${formatWithError(p.modelW, null, "m")} | ${p.pullR.toFixed(2)} | ${p.pullW.toFixed(2)} |`,
      );
    }
    out.push("");
  } else {
    const extra = [
      `AIC = ${formatNumber(result.aic, 6)}`,
      `BIC = ${formatNumber(result.bic, 6)}`,
      `${result.points} points`,
      result.sigmaKnown ? "sigmas given (errors unscaled)" : "sigmas unknown (errors scaled by the reduced chi²)",
    ];
    out.push(`**Goodness of fit:** ${[...gof, ...extra].join(", ")}`, "");
  }
  if (result.correlation && result.freeNames.length > 1) {
    const names = result.freeNames;
    let worst = { a: "", b: "", r: 0 };
    result.correlation.forEach((row, i) =>
      row.forEach((r, j) => {
        if (j > i && Math.abs(r) > Math.abs(worst.r)) worst = { a: at(names, i, "freeNames"), b: at(names, j, "freeNames"), r };
      }),
    );
    out.push(`**Strongest correlation:** ${worst.a} – ${worst.b}: ${worst.r.toFixed(3)}`, "");
  }
  if (result.notes.length) out.push("**Notes:**", ...result.notes.map((n) => `- ${n}`), "");
  const assumptions = isSeries(result) ? result.assumptions : ((result as FitResult & { assumptions?: string[] }).assumptions ?? []);
  if (assumptions.length) out.push("**Assumptions:**", ...assumptions.map((a) => `- ${a}`), "");
  out.push(`**Method:** ${result.method}`, "");
  const sources = [...result.sources, ...(((result as FitResult & { modelSources?: string[] }).modelSources ?? []) as string[])];
  if (sources.length) out.push("**Sources:**", ...sources.map((s) => `- ${s}`));
  return out.join("\n");
}
