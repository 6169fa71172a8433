/**
 * mathjs, loaded on first use. Importing mathjs costs about 1 s of CPU and 40-80 MB (its
 * typed-function setup for every function), so @helicoid/lib never imports it eagerly: plain SI
 * numbers and numeric strings never load it; a string with a unit, a formula or a matrix
 * expression loads it once. Every module of the library that needs mathjs calls `mathjs()`.
 * The customary CGS units of the trade are added to the (shared, default) mathjs instance at load.
 */
import type * as MathJs from "mathjs";

// CommonJS output: `require` is Node's (or the bundler's); lib is compiled with no ambient types.
declare const require: (id: string) => unknown;

let loaded: typeof MathJs | undefined;

/** The mathjs module, loaded (and given the CGS units) the first time it is asked for. */
export function mathjs(): typeof MathJs {
  if (!loaded) {
    const m = require("mathjs") as typeof MathJs;
    defineCgsUnits(m);
    loaded = m;
  }
  return loaded;
}

/** True once mathjs has been loaded by `mathjs()` (for tests and diagnostics). */
export function mathjsLoaded(): boolean {
  return loaded !== undefined;
}

/**
 * Customary CGS units of the trade, added to mathjs once: oersted (Oe, with short prefixes: kOe),
 * gauss (with long prefixes: kilogauss), emu (so that "800 emu/cm^3" is a magnetization).
 * 1 Oe = 1000 / (4 pi) A/m, 1 G = 1e-4 T, 1 emu = 1e-3 A m^2 (1 emu/cm^3 = 1 kA/m).
 * "G" alone is not defined (it would clash with the giga prefix). erg is built into mathjs.
 * Source: NIST SP 811 (2008), appendix B.9 (CGS conversion factors).
 */
function defineCgsUnits(m: typeof MathJs): void {
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
