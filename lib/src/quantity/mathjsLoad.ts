/**
 * Node (CommonJS): mathjs instances built on first use from mathjs's own factory functions
 * (`create(factories, config)`), never its default instance. `require("mathjs")` evaluates the
 * whole library and builds every typed function eagerly (about 1 s of CPU and 70 MB here); the
 * two instances below build only what is asked for:
 *
 * - units (`unit`, `createUnit`): the 39 factories their dependency tree holds, required one file
 *   each (about 0.05 s), typed functions built on the first unit (about 0.1 s);
 * - everything else (`compile`, `parse`, `complex`, `sqrt`, `eigs`): every factory (a formula may
 *   call any mathjs function), required from mathjs's factory index (about 0.13 s) and built
 *   lazily by `create`: a function is made when a formula or the library first touches it.
 *
 * mathjs's package "exports" map opens no deep path, so the factory files are required by their
 * absolute path under the resolved entry (lib/cjs). test/lib/quantity/mathjs.test.ts checks the
 * units list against mathjs's own `unitDependencies` and `createUnitDependencies`.
 * Bundles for the browser use `mathjsLoad.browser.ts` instead (the "browser" field of
 * lib/package.json).
 */
import type * as MathJs from "mathjs";

// CommonJS output: `require` is Node's; lib is compiled with no ambient types.
declare const require: { (id: string): unknown; resolve(id: string): string };

export type MathUnits = Pick<typeof MathJs, "unit" | "createUnit">;
export type MathExpressions = Pick<typeof MathJs, "compile" | "parse" | "unit" | "createUnit">;
export type MathComplex = Pick<typeof MathJs, "complex" | "sqrt" | "eigs">;

/**
 * The factories of mathjs's `unit` and `createUnit` with everything they depend on (the closure of
 * their `dependencies`), by file under mathjs/lib/cjs.
 */
export const UNIT_FACTORIES: ReadonlyArray<readonly [string, string]> = [
  ["createTyped", "core/function/typed.js"],
  ["createAbs", "function/arithmetic/abs.js"],
  ["createAddScalar", "function/arithmetic/addScalar.js"],
  ["createCeil", "function/arithmetic/ceil.js"],
  ["createDivideScalar", "function/arithmetic/divideScalar.js"],
  ["createFix", "function/arithmetic/fix.js"],
  ["createFloor", "function/arithmetic/floor.js"],
  ["createMultiply", "function/arithmetic/multiply.js"],
  ["createMultiplyScalar", "function/arithmetic/multiplyScalar.js"],
  ["createPow", "function/arithmetic/pow.js"],
  ["createRound", "function/arithmetic/round.js"],
  ["createSubtractScalar", "function/arithmetic/subtractScalar.js"],
  ["createUnaryMinus", "function/arithmetic/unaryMinus.js"],
  ["createConj", "function/complex/conj.js"],
  ["createDet", "function/matrix/det.js"],
  ["createDot", "function/matrix/dot.js"],
  ["createIdentity", "function/matrix/identity.js"],
  ["createInv", "function/matrix/inv.js"],
  ["createSize", "function/matrix/size.js"],
  ["createZeros", "function/matrix/zeros.js"],
  ["createEqual", "function/relational/equal.js"],
  ["createEqualScalar", "function/relational/equalScalar.js"],
  ["createFormat", "function/string/format.js"],
  ["createIsNumeric", "function/utils/isNumeric.js"],
  ["createIsZero", "function/utils/isZero.js"],
  ["createNumeric", "function/utils/numeric.js"],
  ["createBigNumberClass", "type/bignumber/BigNumber.js"],
  ["createBignumber", "type/bignumber/function/bignumber.js"],
  ["createComplexClass", "type/complex/Complex.js"],
  ["createFractionClass", "type/fraction/Fraction.js"],
  ["createFraction", "type/fraction/function/fraction.js"],
  ["createDenseMatrixClass", "type/matrix/DenseMatrix.js"],
  ["createMatrix", "type/matrix/function/matrix.js"],
  ["createMatrixClass", "type/matrix/Matrix.js"],
  ["createSparseMatrixClass", "type/matrix/SparseMatrix.js"],
  ["createNumber", "type/number.js"],
  ["createCreateUnit", "type/unit/function/createUnit.js"],
  ["createUnitFunction", "type/unit/function/unit.js"],
  ["createUnitClass", "type/unit/Unit.js"],
];

type Create = (factories: Record<string, unknown>, config?: Record<string, unknown>) => typeof MathJs;

/** mathjs/lib/cjs, where `require("mathjs")` would start (resolving it loads nothing). */
function mathjsDir(): string {
  return require.resolve("mathjs").replace(/[\\/]index\.js$/, "");
}

function mathjsFile(rel: string): Record<string, unknown> {
  return require(`${mathjsDir()}/${rel}`) as Record<string, unknown>;
}

function create(factories: Record<string, unknown>): typeof MathJs {
  return (mathjsFile("core/create.js").create as Create)(factories, {});
}

let unitsInstance: MathUnits | undefined;
let fullInstance: typeof MathJs | undefined;

/** A units-only mathjs: `unit` and `createUnit` from the factories in UNIT_FACTORIES. */
export function loadMathUnits(): MathUnits {
  if (!unitsInstance) {
    const factories: Record<string, unknown> = {};
    for (const [name, rel] of UNIT_FACTORIES) {
      const f = mathjsFile(rel)[name];
      if (typeof f !== "function") throw new Error(`mathjs: no factory ${name} in ${rel} (mathjs changed its layout: update UNIT_FACTORIES)`);
      factories[name] = f;
    }
    const m = create(factories);
    unitsInstance = { unit: m.unit, createUnit: m.createUnit };
  }
  return unitsInstance;
}

/** Every mathjs function, each built on first use (`create` with all factories is lazy). */
function loadFull(): typeof MathJs {
  fullInstance ??= create(mathjsFile("factoriesAny.js"));
  return fullInstance;
}

export function loadMathExpressions(): MathExpressions {
  return loadFull();
}
export function loadMathComplex(): MathComplex {
  return loadFull();
}
