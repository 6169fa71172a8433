import type { CalculatorSpec } from "./spec.js";

/** Calculator specs of the walls domain (filled by its issue). */
export const wallCalculators: CalculatorSpec[] = [];
