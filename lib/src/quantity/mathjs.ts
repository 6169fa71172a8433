/**
 * mathjs, loaded on first use. Importing mathjs whole costs about 1 s of CPU and 70 MB (its
 * typed-function setup for every function), so @helicoid/lib never imports it eagerly: plain SI
 * numbers and numeric strings never load it; a string with a unit loads a units-only instance
 * (about 0.15 s), a formula or a matrix expression a lazily built full one (`./mathjsLoad.ts`).
 * Every module of the library that needs mathjs asks here, by group: units (`mathUnits`),
 * expressions (`mathExpressions`), complex numbers and eigenvalues (`mathComplex`). The customary
 * CGS units of the trade are added to every instance that parses units before it is handed out
 * (in Node the units and the expressions are two instances; in a browser bundle one).
 */
import { loadMathComplex, loadMathExpressions, loadMathUnits, type MathComplex, type MathExpressions, type MathUnits } from "./mathjsLoad.js";

let units: MathUnits | undefined;
let expressions: MathExpressions | undefined;
let complexes: MathComplex | undefined;

/** mathjs's unit and createUnit, with the CGS units defined. */
export function mathUnits(): MathUnits {
  if (!units) {
    const m = loadMathUnits();
    defineCgsUnits(m);
    units = m;
  }
  return units;
}

/** mathjs's compile and parse (expressions may hold units: the CGS units are defined first). */
export function mathExpressions(): MathExpressions {
  if (!expressions) {
    const m = loadMathExpressions();
    defineCgsUnits(m);
    expressions = m;
  }
  return expressions;
}

/** mathjs's complex, sqrt and eigs. */
export function mathComplex(): MathComplex {
  complexes ??= loadMathComplex();
  return complexes;
}

/**
 * Customary CGS units of the trade, added to mathjs once: oersted (Oe, with short prefixes: kOe),
 * gauss (with long prefixes: kilogauss), emu (so that "800 emu/cm^3" is a magnetization).
 * 1 Oe = 1000 / (4 pi) A/m, 1 G = 1e-4 T, 1 emu = 1e-3 A m^2 (1 emu/cm^3 = 1 kA/m).
 * "G" alone is not defined (it would clash with the giga prefix). erg is built into mathjs.
 * Source: NIST SP 811 (2008), appendix B.9 (CGS conversion factors).
 */
function defineCgsUnits(m: MathUnits): void {
  const defs: Array<[string, { definition: string; aliases?: string[]; prefixes?: string }]> = [
    ["oersted", { definition: `${1000 / (4 * Math.PI)} A/m`, aliases: ["Oe"], prefixes: "short" }],
    ["gauss", { definition: "1e-4 T", prefixes: "long" }],
    ["emu", { definition: "1e-3 A m^2" }],
  ];
  for (const [name, def] of defs) {
    try {
      m.unit(`1 ${name}`);
    } catch {
      m.createUnit(name, def);
    }
  }
}
