/**
 * A Bloch model (blochModel.ts) from a TypeScript function (k1, k2) -> matrix, or from a mathjs
 * matrix formula in k1, k2 (compiled by mathjs, no eval), for chernNumbers and the Berry-curvature
 * maps. Kept apart from chernNumbers.ts so that the grid kernels load without mathjs (worker threads).
 */
import type { EvalFunction } from "mathjs";
import { mathExpressions } from "../quantity/mathjs.js";
import { InputError } from "../errors.js";
import { toPlanarMatrix } from "../numeric/complexMatrix.js";
import type { BlochModel } from "./blochModel.js";

/** A Bloch model from a function (k1, k2) -> matrix or a mathjs formula in k1, k2. */
export function blochModelFromFunction(h: ((k1: number, k2: number) => unknown) | string, parameters: Record<string, number> = {}): BlochModel {
  let f: (k1: number, k2: number) => unknown;
  if (typeof h === "string") {
    f = compileFormula(h, parameters);
  } else f = h;
  const m0 = toPlanarMatrix(f(0.1234, 0.3456), "H");
  const n = m0.n;
  return {
    bands: n,
    fill(k1, k2, re, im) {
      const m = toPlanarMatrix(f(k1, k2), "H");
      if (m.n !== n) throw new InputError("H", `${m.n} x ${m.n} at k = (${k1}, ${k2})`, `${n} x ${n} everywhere`);
      re.set(m.re);
      im.set(m.im);
    },
  };
}

const formulaCache = new Map<string, EvalFunction>();
function compileFormula(h: string, parameters: Record<string, number>): (k1: number, k2: number) => unknown {
  let code = formulaCache.get(h);
  if (!code) {
    try {
      code = mathExpressions().compile(h) as EvalFunction;
    } catch (err) {
      throw new InputError("H", h, "a mathjs matrix expression in k1, k2", (err as Error).message);
    }
    formulaCache.set(h, code);
  }
  const c = code;
  return (k1, k2) => c.evaluate({ ...parameters, k1, k2 });
}
