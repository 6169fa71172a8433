import type { CalculatorSpec } from "./spec.js";

/** Calculator specs of the topology domain (filled by its issue). */
export const topologyCalculators: CalculatorSpec[] = [];
