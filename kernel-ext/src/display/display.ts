/**
 * `display(...values)`: show values in the current cell (or widget output). Objects that know how
 * to show themselves (widgets, figures, tables) give their MIME bundle; other values are shown as
 * text the way Node's REPL prints them.
 */
import { inspect } from "node:util";
import { isDisplayable, mimeBundle } from "./bundle.js";
import { consoleSink, currentContext, type MimeBundle } from "./output.js";

/** The bundle of a value; `asResult` shows strings quoted, as a cell's last expression (Node's REPL style). */
export function bundleOf(value: unknown, opts: { asResult?: boolean } = {}): { data: MimeBundle; metadata: Record<string, unknown> } {
  if (isDisplayable(value)) {
    const b = value[mimeBundle]();
    return { data: b.data, metadata: b.metadata ?? {} };
  }
  if (typeof value === "string" && !opts.asResult) return { data: { "text/plain": value }, metadata: {} };
  return { data: { "text/plain": inspect(value, { depth: 4, colors: false, maxArrayLength: 50 }) }, metadata: {} };
}

export function display(...values: unknown[]): void {
  const sink = currentContext()?.sink ?? consoleSink;
  for (const v of values) {
    const b = bundleOf(v);
    sink.display(b.data, b.metadata);
  }
}

/** Raw display of a MIME bundle (e.g. `displayData({"text/markdown": "# Title"})`). */
export function displayData(data: MimeBundle, metadata: Record<string, unknown> = {}): void {
  (currentContext()?.sink ?? consoleSink).display(data, metadata);
}

export function markdown(text: string): { [mimeBundle](): { data: MimeBundle } } {
  return { [mimeBundle]: () => ({ data: { "text/markdown": text, "text/plain": text } }) };
}

/** Clear the output of the current cell (or output area); with `wait`, when new output arrives. */
export function clearOutput(wait = false): void {
  currentContext()?.sink.clear(wait);
}
