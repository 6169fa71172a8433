/**
 * Node (CommonJS): mathjs is required on first use, so a process that never parses a unit, a
 * formula or a matrix expression never loads it. Bundles for the browser use
 * `mathjsLoad.browser.ts` instead (the "browser" field of lib/package.json): static named imports,
 * one loader per group, so that the bundler keeps only the groups a page uses.
 */
import type * as MathJs from "mathjs";

// CommonJS output: `require` is Node's; lib is compiled with no ambient types.
declare const require: (id: string) => unknown;

export type MathUnits = Pick<typeof MathJs, "unit" | "createUnit">;
export type MathExpressions = Pick<typeof MathJs, "compile" | "parse">;
export type MathComplex = Pick<typeof MathJs, "complex" | "sqrt" | "eigs">;

export function loadMathUnits(): MathUnits {
  return require("mathjs") as typeof MathJs;
}
export function loadMathExpressions(): MathExpressions {
  return require("mathjs") as typeof MathJs;
}
export function loadMathComplex(): MathComplex {
  return require("mathjs") as typeof MathJs;
}
