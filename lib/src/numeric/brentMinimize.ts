/**
 * Brent's derivative-free minimization of a function of one variable on a bracket [a, b]
 * (golden section with parabolic interpolation). Returns the abscissa, value and evaluation count.
 * Source: R. Brent, Algorithms for Minimization without Derivatives (Prentice-Hall 1973), ch. 5.
 * Checked against scipy.optimize.minimize_scalar(method="bounded") in test/lib/numeric/brentMinimize.test.ts.
 */
import { InputError } from "../errors.js";

export interface ScalarMinimum {
  x: number;
  f: number;
  evaluations: number;
  /** True when the tolerance was met within maxEvaluations. */
  converged: boolean;
}

/** Minimize f on [a, b] to absolute tolerance xtol (plus relative 1.5e-8). */
export function brentMinimize(f: (x: number) => number, a: number, b: number, xtol = 1e-10, maxEvaluations = 200): ScalarMinimum {
  if (!(b > a)) throw new InputError("bracket", [a, b], "an interval [a, b] with b > a");
  const golden = 0.3819660112501051;
  let x = a + golden * (b - a);
  let w = x;
  let v = x;
  let fx = f(x);
  let fw = fx;
  let fv = fx;
  let d = 0;
  let e = 0;
  let n = 1;
  let lo = a;
  let hi = b;
  while (n < maxEvaluations) {
    const m = 0.5 * (lo + hi);
    const tol = 1.5e-8 * Math.abs(x) + xtol / 3;
    const t2 = 2 * tol;
    if (Math.abs(x - m) <= t2 - 0.5 * (hi - lo)) return { x, f: fx, evaluations: n, converged: true };
    let useGolden = true;
    if (Math.abs(e) > tol) {
      const r = (x - w) * (fx - fv);
      let q = (x - v) * (fx - fw);
      let p = (x - v) * q - (x - w) * r;
      q = 2 * (q - r);
      if (q > 0) p = -p;
      else q = -q;
      if (Math.abs(p) < Math.abs(0.5 * q * e) && p > q * (lo - x) && p < q * (hi - x)) {
        e = d;
        d = p / q;
        const u = x + d;
        if (u - lo < t2 || hi - u < t2) d = x < m ? tol : -tol;
        useGolden = false;
      }
    }
    if (useGolden) {
      e = (x < m ? hi : lo) - x;
      d = golden * e;
    }
    const u = Math.abs(d) >= tol ? x + d : x + (d > 0 ? tol : -tol);
    const fu = f(u);
    n++;
    if (fu <= fx) {
      if (u < x) hi = x;
      else lo = x;
      v = w;
      fv = fw;
      w = x;
      fw = fx;
      x = u;
      fx = fu;
    } else {
      if (u < x) lo = u;
      else hi = u;
      if (fu <= fw || w === x) {
        v = w;
        fv = fw;
        w = u;
        fw = fu;
      } else if (fu <= fv || v === x || v === w) {
        v = u;
        fv = fu;
      }
    }
  }
  return { x, f: fx, evaluations: n, converged: false };
}
