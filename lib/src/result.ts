/**
 * The documented result: what every answer of the library carries besides its numbers, so that a
 * number is never shown without the assumptions it rests on. Calculator results
 * (`CalculatorResult`), fits (`FitResult`, `ProfileFitResult`, `GlobalFitResult`), field-series
 * fits (`FieldSeriesResult`) and the charge analysis extend it; `table()` and the reports take any
 * of them.
 */

/** A value with its SI unit ("" for a dimensionless number). */
export interface Quantity<V = number> {
  value: V;
  unit: string;
  /** One standard deviation (SI), when the value was computed from or given with uncertainties. */
  uncertainty?: number;
}

export interface DocumentedResult {
  /**
   * "ok", or a word saying why the numbers need care ("warning"; a fit's "converged",
   * "max-iterations", "singular", ...). Each result type narrows it.
   */
  status: string;
  /** One line on the outcome, when the result has one (fits do; a calculator says it in notes). */
  message?: string;
  /** Remarks on this particular run (regime, validity, how inputs were read). */
  notes: string[];
  /** The method, in a few words. */
  method: string;
  /** Published sources of the formulas and methods. */
  sources: string[];
  /** The model assumptions the numbers rest on. */
  assumptions: string[];
  /** What the computation was given, each value with its SI unit. */
  inputs?: Record<string, Quantity>;
}

/** Whether `x` has the fields of a documented result (status, notes, method, sources). */
export function isDocumentedResult(x: unknown): x is DocumentedResult {
  if (!x || typeof x !== "object") return false;
  const r = x as Partial<DocumentedResult>;
  return typeof r.status === "string" && Array.isArray(r.notes) && typeof r.method === "string" && Array.isArray(r.sources) && Array.isArray(r.assumptions);
}
