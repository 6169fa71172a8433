/**
 * Root of a continuous function on a bracket [a, b] with f(a) f(b) <= 0, by Brent's method
 * (inverse quadratic interpolation, secant and bisection), and all sign changes of f on a grid.
 * Source: R. P. Brent, *Algorithms for Minimization without Derivatives* (Prentice-Hall 1973), ch. 4.
 * Returns a result object with status (scipy.optimize style) rather than throwing on slow progress.
 */
import { InputError } from "../errors.js";

export interface BrentRootResult {
  root: number;
  value: number;
  iterations: number;
  evaluations: number;
  status: "converged" | "max-iterations";
}

export function brentRoot(
  f: (x: number) => number,
  a: number,
  b: number,
  options: { xtol?: number; rtol?: number; maxIterations?: number; fa?: number; fb?: number } = {},
): BrentRootResult {
  const xtol = options.xtol ?? 1e-14;
  const rtol = options.rtol ?? 4 * 2 ** -52;
  const maxIt = options.maxIterations ?? 200;
  let fa = options.fa ?? f(a);
  let fb = options.fb ?? f(b);
  let evals = (options.fa === undefined ? 1 : 0) + (options.fb === undefined ? 1 : 0);
  if (!Number.isFinite(fa) || !Number.isFinite(fb)) throw new InputError("bracket", [a, b], "end points where the function is finite");
  if (fa === 0) return { root: a, value: 0, iterations: 0, evaluations: evals, status: "converged" };
  if (fb === 0) return { root: b, value: 0, iterations: 0, evaluations: evals, status: "converged" };
  if (fa * fb > 0) throw new InputError("bracket", [a, b], `a bracket with a sign change (f(a) = ${fa}, f(b) = ${fb})`);
  let c = a;
  let fc = fa;
  let d = b - a;
  let e = d;
  for (let it = 1; it <= maxIt; it++) {
    if (fb * fc > 0) {
      c = a;
      fc = fa;
      d = b - a;
      e = d;
    }
    if (Math.abs(fc) < Math.abs(fb)) {
      a = b;
      b = c;
      c = a;
      fa = fb;
      fb = fc;
      fc = fa;
    }
    const tol = 2 * rtol * Math.abs(b) + 0.5 * xtol;
    const m = 0.5 * (c - b);
    if (Math.abs(m) <= tol || fb === 0) return { root: b, value: fb, iterations: it, evaluations: evals, status: "converged" };
    if (Math.abs(e) >= tol && Math.abs(fa) > Math.abs(fb)) {
      const s = fb / fa;
      let p: number;
      let q: number;
      if (a === c) {
        p = 2 * m * s;
        q = 1 - s;
      } else {
        const qq = fa / fc;
        const r = fb / fc;
        p = s * (2 * m * qq * (qq - r) - (b - a) * (r - 1));
        q = (qq - 1) * (r - 1) * (s - 1);
      }
      if (p > 0) q = -q;
      else p = -p;
      if (2 * p < Math.min(3 * m * q - Math.abs(tol * q), Math.abs(e * q))) {
        e = d;
        d = p / q;
      } else {
        d = m;
        e = m;
      }
    } else {
      d = m;
      e = m;
    }
    a = b;
    fa = fb;
    b += Math.abs(d) > tol ? d : m > 0 ? tol : -tol;
    fb = f(b);
    evals++;
  }
  return { root: b, value: fb, iterations: maxIt, evaluations: evals, status: "max-iterations" };
}

/** Roots of f on [from, to]: sign changes on a grid of `points` samples, each refined by Brent. */
export function rootsOnGrid(f: (x: number) => number, from: number, to: number, points: number, options: { xtol?: number } = {}): number[] {
  if (!(to > from)) throw new InputError("range", [from, to], "from < to");
  if (!Number.isInteger(points) || points < 2) throw new InputError("points", points, "a whole number >= 2");
  const roots: number[] = [];
  let x0 = from;
  let f0 = f(x0);
  for (let i = 1; i < points; i++) {
    const x1 = from + ((to - from) * i) / (points - 1);
    const f1 = f(x1);
    if (f0 === 0) roots.push(x0);
    else if (f0 * f1 < 0) roots.push(brentRoot(f, x0, x1, { fa: f0, fb: f1, xtol: options.xtol }).root);
    x0 = x1;
    f0 = f1;
  }
  if (f0 === 0) roots.push(x0);
  return roots;
}
