import type { CalculatorSpec } from "./spec.js";

/** Calculator specs of the berry domain (filled by its issue). */
export const berryCalculators: CalculatorSpec[] = [];
