/**
 * Gauss-Legendre quadrature nodes and weights on [-1, 1] (cached per order), and composite rules
 * on a list of panel breakpoints. Nodes by Newton iteration on the Legendre recurrence.
 * Source: G. Golub, J. Welsch, Math. Comp. 23, 221 (1969) (the rule); A&S 25.4.29. Verified against
 * numpy.polynomial.legendre.leggauss in test/lib/numeric/gaussLegendre.test.ts.
 */
import { InputError } from "../errors.js";

const cache = new Map<number, { x: Float64Array; w: Float64Array }>();

/** n-point Gauss-Legendre rule on [-1, 1]: nodes ascending and weights. */
export function gaussLegendre(n: number): { x: Float64Array; w: Float64Array } {
  if (!Number.isInteger(n) || n < 1 || n > 1000) throw new InputError("n", n, "a whole number of nodes from 1 to 1000");
  const hit = cache.get(n);
  if (hit) return hit;
  const x = new Float64Array(n);
  const w = new Float64Array(n);
  const m = Math.floor((n + 1) / 2);
  for (let i = 0; i < m; i++) {
    let z = Math.cos((Math.PI * (i + 0.75)) / (n + 0.5));
    let dp = 0;
    for (let it = 0; it < 100; it++) {
      let p0 = 1;
      let p1 = z;
      for (let k = 2; k <= n; k++) {
        const p2 = ((2 * k - 1) * z * p1 - (k - 1) * p0) / k;
        p0 = p1;
        p1 = p2;
      }
      if (n === 1) {
        p1 = z;
        p0 = 1;
      }
      dp = (n * (z * p1 - p0)) / (z * z - 1);
      const dz = p1 / dp;
      z -= dz;
      if (Math.abs(dz) < 1e-16) break;
    }
    // recompute derivative at the converged node
    let p0 = 1;
    let p1 = z;
    for (let k = 2; k <= n; k++) {
      const p2 = ((2 * k - 1) * z * p1 - (k - 1) * p0) / k;
      p0 = p1;
      p1 = p2;
    }
    dp = n === 1 ? 1 : (n * (z * p1 - p0)) / (z * z - 1);
    x[i] = -z;
    x[n - 1 - i] = z;
    const wi = 2 / ((1 - z * z) * dp * dp);
    w[i] = wi;
    w[n - 1 - i] = wi;
  }
  if (n % 2 === 1) x[m - 1] = 0;
  const rule = { x, w };
  cache.set(n, rule);
  return rule;
}

/**
 * Composite Gauss-Legendre rule: `order` nodes on each panel [breaks[i], breaks[i+1]].
 * Returns nodes and weights (Float64Arrays); breakpoints must increase.
 */
export function compositeGaussLegendre(breaks: ArrayLike<number>, order: number): { x: Float64Array; w: Float64Array } {
  const nPanels = breaks.length - 1;
  if (nPanels < 1) throw new InputError("breaks", breaks, "at least two increasing breakpoints");
  const { x: gx, w: gw } = gaussLegendre(order);
  const x = new Float64Array(nPanels * order);
  const w = new Float64Array(nPanels * order);
  for (let p = 0; p < nPanels; p++) {
    const a = breaks[p]!;
    const b = breaks[p + 1]!;
    if (!(b > a)) throw new InputError("breaks", breaks, "strictly increasing breakpoints");
    const c = 0.5 * (a + b);
    const h = 0.5 * (b - a);
    for (let i = 0; i < order; i++) {
      x[p * order + i] = c + h * gx[i]!;
      w[p * order + i] = h * gw[i]!;
    }
  }
  return { x, w };
}
