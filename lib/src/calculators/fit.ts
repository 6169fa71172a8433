import type { CalculatorSpec } from "./spec.js";

/** Calculator specs of the fitting domain, if any (filled by its issue). */
export const fitCalculators: CalculatorSpec[] = [];
