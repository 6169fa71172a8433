/**
 * Errors are answers: every error names what went wrong in terms the user can act on.
 *
 * - `InputError`: a parameter had a bad value. Names the parameter, the value given and what was
 *   expected (range, unit, shape). The value is kept as given (never coerced or truncated); the
 *   message shows a long value shortened (`shortText`).
 * - `ConvergenceError`: a solver did not converge. Carries its diagnostics (iterations, residual,
 *   last estimate) so the user can judge what happened.
 */

export class InputError extends Error {
  override readonly name = "InputError";
  constructor(
    /** The parameter (input name, file, column ...) the problem is about. */
    readonly parameter: string,
    /** The value as given by the user, unchanged. */
    readonly value: unknown,
    /** What was expected, in words: "a positive length", "shape (ny, nx, 3)". */
    readonly expected: string,
    /** More about the problem, if anything. */
    readonly detail?: string,
  ) {
    super(`${parameter} = ${describeValue(value)} is not valid: expected ${expected}` + (detail ? `. ${detail}` : ""));
  }
}

export class ConvergenceError extends Error {
  override readonly name: string = "ConvergenceError";
  constructor(
    /** Which solver (and for what) failed. */
    readonly solver: string,
    message: string,
    /** Counts, residuals and last estimates of the failed attempt. */
    readonly diagnostics: Record<string, unknown> = {},
  ) {
    super(`${solver} did not converge: ${message}` + formatDiagnostics(diagnostics));
  }
}

/**
 * A computation that ended without a trustworthy answer although its inputs were valid: a result
 * that is not a finite number, or a request whose estimated work or memory exceeds the budget.
 * A kind of ConvergenceError, so every caller that treats a failed solver as "the computation
 * failed" (exit status 1 on the command line) treats this the same way.
 */
export class ComputationError extends ConvergenceError {
  override readonly name: string = "ComputationError";
  constructor(what: string, message: string, diagnostics: Record<string, unknown> = {}) {
    super(what, message, diagnostics);
    this.message = `${what}: ${message}` + formatDiagnostics(diagnostics);
  }
}

/** Short, faithful rendering of a user's value for an error message. */
export function describeValue(value: unknown): string {
  if (typeof value === "string") return shortText(JSON.stringify(value));
  if (typeof value === "number") return Number.isNaN(value) ? "NaN" : String(value);
  if (value === undefined) return "(missing)";
  if (value === null) return "null";
  if (Array.isArray(value)) return `array of length ${value.length}`;
  if (ArrayBuffer.isView(value)) return `${value.constructor.name} of length ${(value as unknown as ArrayLike<number>).length}`;
  try {
    const s = JSON.stringify(value);
    return s.length > 80 ? s.slice(0, 77) + "..." : s;
  } catch {
    return String(value);
  }
}

/**
 * A long text for a one-line message: over 200 characters it is cut to its first 80 and last 20
 * characters with the full length said (the error's `value` keeps the whole value).
 */
export function shortText(text: string, max = 200): string {
  return text.length <= max ? text : `${text.slice(0, 80)}…${text.slice(-20)} (${text.length} characters)`;
}

function formatDiagnostics(d: Record<string, unknown>): string {
  const keys = Object.keys(d);
  if (keys.length === 0) return "";
  return " (" + keys.map((k) => `${k}: ${describeValue(d[k])}`).join(", ") + ")";
}
