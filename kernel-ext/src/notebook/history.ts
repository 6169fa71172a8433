/**
 * The input history of a kernel session, answered as ipykernel answers `history_request`:
 * - "tail": the last `n` entries;
 * - "range": entries `start` <= line < `stop` of a session (0 or this session's number: this one;
 *   a negative number counts back from it; earlier sessions are not kept, so they are empty);
 * - "search": entries whose input matches a glob `pattern` (`*`, `?`, `[...]`), the last `n`,
 *   with `unique` keeping one entry per distinct input (the latest).
 * With `output`, each entry is [session, line, [input, output]] where output is the text form of
 * the cell's result (null without one); otherwise [session, line, input].
 * Bounded: only the last `capacity` entries are kept.
 */
export type HistoryEntry = [number, number, string] | [number, number, [string, string | null]];

export class SessionHistory {
  /** This session's number (ipykernel numbers sessions from 1 in its database). */
  readonly session = 1;
  private entries: Array<{ line: number; input: string; output: string | null }> = [];

  constructor(readonly capacity = 10_000) {}

  record(line: number, input: string): void {
    this.entries.push({ line, input, output: null });
    if (this.entries.length > this.capacity) this.entries.splice(0, this.entries.length - this.capacity);
  }

  recordOutput(line: number, text: string): void {
    for (let i = this.entries.length - 1; i >= 0; i--) {
      if (this.entries[i]!.line === line) {
        this.entries[i]!.output = text;
        return;
      }
      if (this.entries[i]!.line < line) return;
    }
  }

  /** The `history` list of a history_reply for a request's content. Throws RangeError on bad input. */
  query(content: Record<string, unknown>): HistoryEntry[] {
    const output = content.output === true;
    const kind = content.hist_access_type ?? "tail";
    const asEntry = (e: { line: number; input: string; output: string | null }): HistoryEntry =>
      output ? [this.session, e.line, [e.input, e.output]] : [this.session, e.line, e.input];
    const n = content.n === undefined || content.n === null ? null : wholeNumber("n", content.n);
    if (kind === "tail") {
      const k = n ?? 10;
      return k <= 0 ? [] : this.entries.slice(-k).map(asEntry);
    }
    if (kind === "range") {
      const session = content.session === undefined || content.session === null ? 0 : integer("session", content.session);
      if (!(session === 0 || session === this.session)) return [];
      const start = content.start === undefined || content.start === null ? 1 : integer("start", content.start);
      const stop = content.stop === undefined || content.stop === null ? Infinity : integer("stop", content.stop);
      return this.entries.filter((e) => e.line >= start && e.line < stop).map(asEntry);
    }
    if (kind === "search") {
      const pattern = content.pattern === undefined || content.pattern === null ? "*" : content.pattern;
      if (typeof pattern !== "string") throw new RangeError(`pattern = ${JSON.stringify(pattern)}: expected a glob pattern (text)`);
      const re = globToRegExp(pattern);
      let hits = this.entries.filter((e) => re.test(e.input));
      if (content.unique === true) {
        const seen = new Set<string>();
        const kept: typeof hits = [];
        for (let i = hits.length - 1; i >= 0; i--) {
          if (seen.has(hits[i]!.input)) continue;
          seen.add(hits[i]!.input);
          kept.push(hits[i]!);
        }
        hits = kept.reverse();
      }
      if (n !== null) hits = n <= 0 ? [] : hits.slice(-n);
      return hits.map(asEntry);
    }
    throw new RangeError(`hist_access_type = ${JSON.stringify(kind)}: expected "tail", "range" or "search"`);
  }
}

function integer(name: string, v: unknown): number {
  if (typeof v !== "number" || !Number.isInteger(v)) throw new RangeError(`${name} = ${JSON.stringify(v)}: expected a whole number`);
  return v;
}
function wholeNumber(name: string, v: unknown): number {
  const k = integer(name, v);
  if (k < 0) throw new RangeError(`${name} = ${k}: expected a whole number >= 0`);
  return k;
}

/** A glob (as sqlite's GLOB, which IPython's history search uses) as an anchored regular expression. */
export function globToRegExp(glob: string): RegExp {
  let re = "";
  for (let i = 0; i < glob.length; i++) {
    const c = glob[i]!;
    if (c === "*") re += "[\\s\\S]*";
    else if (c === "?") re += "[\\s\\S]";
    else if (c === "[") {
      const close = glob.indexOf("]", i + 2);
      if (close < 0) re += "\\[";
      else {
        let body = glob.slice(i + 1, close);
        const negate = body.startsWith("^") || body.startsWith("!");
        if (negate) body = body.slice(1);
        re += `[${negate ? "^" : ""}${body.replace(/[\\\]]/g, "\\$&")}]`;
        i = close;
      }
    } else re += c.replace(/[.*+?^${}()|[\]\\/]/g, "\\$&");
  }
  return new RegExp(`^${re}$`);
}
