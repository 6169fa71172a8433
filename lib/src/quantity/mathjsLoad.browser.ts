/**
 * Browser bundles (esbuild, through the "browser" field of lib/package.json): mathjs instances
 * built on first use with `create` from mathjs's own factories, by group, never the default
 * instance. Static imports of mathjs's functions (`import { unit } from "mathjs"`) build each
 * function's typed dispatch, and its dependencies', when the bundle is evaluated: at every start
 * of a page and of its Web Worker, whether or not a unit is ever parsed (0.7 s of CPU for the
 * library bundle here). The dependency objects are plain data, so a bundle still keeps only the
 * factories of the groups it reaches: units (`unitDependencies`, `createUnitDependencies`),
 * complex numbers and eigenvalues; formulas may call any mathjs function, so the expressions
 * group holds every factory (`all`), as the static `compile` kept every function before.
 */
import { all, create, complexDependencies, createUnitDependencies, eigsDependencies, sqrtDependencies, unitDependencies } from "mathjs";
import type { FactoryFunctionMap } from "mathjs";
import type { MathUnits, MathExpressions, MathComplex } from "./mathjsLoad.js";

// mathjs declares its dependency maps through an index signature, so under noUncheckedIndexedAccess
// each reads as possibly undefined; they are module constants that always exist
const deps = (d: Record<string, FactoryFunctionMap | undefined>): FactoryFunctionMap => d as FactoryFunctionMap;

let units: MathUnits | undefined;
let expressions: MathExpressions | undefined;
let complexes: MathComplex | undefined;

export function loadMathUnits(): MathUnits {
  if (!units) {
    const m = create(deps({ unitDependencies, createUnitDependencies }), {});
    units = { unit: m.unit, createUnit: m.createUnit };
  }
  return units;
}
export function loadMathExpressions(): MathExpressions {
  if (!expressions) {
    const m = create(all as FactoryFunctionMap, {});
    expressions = { compile: m.compile, parse: m.parse, unit: m.unit, createUnit: m.createUnit };
  }
  return expressions;
}
export function loadMathComplex(): MathComplex {
  if (!complexes) {
    const m = create(deps({ complexDependencies, sqrtDependencies, eigsDependencies }), {});
    complexes = { complex: m.complex, sqrt: m.sqrt, eigs: m.eigs };
  }
  return complexes;
}
