/**
 * The catalogue: every interactive calculator, by id. Each domain registers its specs in its own
 * file (walls.ts, topology.ts, berry.ts, fit.ts) and lists them here.
 */
import { setCatalogueLookup, type CalculatorId, type CalculatorSpec, type SpecById } from "./spec.js";
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

const typedCatalogue = [
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

/** Every calculator of the catalogue, with its id, inputs and outputs as types (a union). */
export type CatalogueSpec = (typeof typedCatalogue)[number];

export const catalogue: readonly CalculatorSpec[] = typedCatalogue;

/** The spec of a calculator by id (typed for a literal id of the catalogue). */
export function getCalculator<Id extends CalculatorId>(id: Id): SpecById<Id>;
/** An id held in a `string` variable (a literal id must be one of the catalogue's). */
export function getCalculator<T extends string>(id: string extends T ? T : never): CalculatorSpec;
export function getCalculator(id: string): CalculatorSpec {
  const spec = catalogue.find((s) => s.id === id);
  if (!spec) throw new InputError("calculator", id, `one of the catalogue ids: ${catalogue.map((s) => s.id).join(", ")}`);
  return spec;
}

setCatalogueLookup(getCalculator);
