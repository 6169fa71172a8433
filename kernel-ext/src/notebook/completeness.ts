/**
 * Is a piece of TypeScript ready to run? The answer of an `is_complete_request`, from the
 * TypeScript parser's own diagnostics (tslab's TypeScript, the one that compiles the cells):
 * - "invalid": a syntax error before the end of the code (`const 1x = 2`, `let = 7q`, `}`), or a
 *   string literal left open on its line (it cannot go on on the next one);
 * - "incomplete": the only errors are at the very end and say something is expected there (an open
 *   block, list, call or template literal), with the indent for the next line;
 * - "complete" otherwise, and for help requests (`Math?`), which the kernel answers with a page.
 * As in tslab, code ending in a blank line is run as it is (the front end's way to force a run),
 * unless it is invalid.
 */
type TS = typeof import("typescript");
let tsModule: TS | null = null;
function ts(): TS {
  // The TypeScript tslab compiles with (its own build), resolved from tslab's folder.
  if (!tsModule) tsModule = require(require.resolve("@tslab/typescript-for-tslab", { paths: [require.resolve("tslab/dist/converter")] })) as TS;
  return tsModule;
}

export interface Completeness {
  status: "complete" | "incomplete" | "invalid";
  indent?: string;
}

/** `X?` or `X??` (an identifier or a dotted name): a request for help on X. Null otherwise. */
export function helpTarget(code: string): string | null {
  const m = /^\s*([A-Za-z_$][\w$]*(?:\s*\.\s*[A-Za-z_$#][\w$]*)*)\s*\?\??\s*$/.exec(code);
  return m ? m[1]!.replace(/\s+/g, "") : null;
}

export function isCompleteCode(code: string): Completeness {
  if (helpTarget(code) !== null) return { status: "complete" };
  const t = ts();
  const src = t.createSourceFile("cell.ts", code, t.ScriptTarget.Latest, false, t.ScriptKind.TSX) as unknown as {
    parseDiagnostics?: Array<{ start: number; length: number; messageText: unknown; code: number }>;
  };
  const diags = src.parseDiagnostics ?? [];
  const end = code.replace(/\s+$/, "").length;
  let atEnd = false;
  for (const d of diags) {
    const text = typeof d.messageText === "string" ? d.messageText : "";
    if (/Unterminated string literal/.test(text)) return { status: "invalid" };
    if (d.length === 0 && d.start >= end && / expected\.$/.test(text)) atEnd = true;
    else if (d.length === 0 && d.start >= end && /Unterminated (template|regular expression)/.test(text)) atEnd = true;
    else return { status: "invalid" };
  }
  if (!atEnd || /(^|\n)\s*\n\s*$/.test(code)) return { status: "complete" };
  return { status: "incomplete", indent: indentFor(code) };
}

/** The indent of the next line: the last line's, two spaces more after an opening bracket. */
function indentFor(code: string): string {
  const line = /[^\n]*$/.exec(code)![0];
  const current = /^\s*/.exec(line)![0];
  return /[{([]\s*$/.test(line) ? current + "  " : current;
}
