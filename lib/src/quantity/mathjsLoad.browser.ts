/**
 * Browser bundles (esbuild, through the "browser" field of lib/package.json): static named imports,
 * one loader per group, so that a bundle keeps only the mathjs functions (and their dependencies)
 * of the groups it uses; a `require` of mathjs would keep all of it (0.6 MB instead of 0.16 MB in
 * the page's worker).
 */
import { unit, createUnit, compile, parse, complex, sqrt, eigs } from "mathjs";
import type { MathUnits, MathExpressions, MathComplex } from "./mathjsLoad.js";

export function loadMathUnits(): MathUnits {
  return { unit, createUnit };
}
export function loadMathExpressions(): MathExpressions {
  return { compile, parse, unit, createUnit };
}
export function loadMathComplex(): MathComplex {
  return { complex, sqrt, eigs };
}
