import type { CalculatorSpec } from "./spec.js";

/** Calculator specs of isolated skyrmions (filled by its issue). */
export const skyrmionCalculators: CalculatorSpec[] = [];
