/**
 * The catalogue: every interactive calculator, by id. Each domain registers its specs in its own
 * file (walls.ts, topology.ts, berry.ts, fit.ts) and lists them here.
 */
import type { CalculatorSpec } from "./spec.js";
import { InputError } from "../errors.js";
import { wallCalculators } from "./walls.js";
import { topologyCalculators } from "./topology.js";
import { berryCalculators } from "./berry.js";
import { skyrmionCalculators } from "./skyrmions.js";
import { fitCalculators } from "./fit.js";
import { dynamicsCalculators } from "./dynamics.js";
import { chainCalculators } from "./chains.js";
import { ionCalculators } from "./ions.js";
import { latticeCalculators } from "./lattices.js";

export const catalogue: readonly CalculatorSpec[] = [
  ...wallCalculators,
  ...skyrmionCalculators,
  ...topologyCalculators,
  ...berryCalculators,
  ...fitCalculators,
  ...dynamicsCalculators,
  ...chainCalculators,
  ...ionCalculators,
  ...latticeCalculators,
];

export function getCalculator(id: string): CalculatorSpec {
  const spec = catalogue.find((s) => s.id === id);
  if (!spec) throw new InputError("calculator", id, `one of the catalogue ids: ${catalogue.map((s) => s.id).join(", ")}`);
  return spec;
}
