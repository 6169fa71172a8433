/**
 * Profile-likelihood intervals: the parameter is stepped away from its estimate and every other free
 * parameter refitted until chi^2 rises by the threshold (known sigmas: chi^2_min + q^2 with q the
 * normal quantile, i.e. the chi^2_1 quantile; unknown sigmas: the F-based rule
 * S <= S_min (1 + t^2 / (n - k))), then the crossing is found by bisection. Sources: D. Bates,
 * D. Watts, *Nonlinear Regression Analysis and Its Applications* (Wiley 1988), ch. 6; W. Venzon,
 * S. Moolgavkar, Appl. Stat. 37, 87 (1988).
 */
import type { FitOptions, LeastSquaresProblem } from "./leastSquares.js";
import type { LmOptions } from "./levenbergMarquardt.js";
import { minimize } from "./leastSquaresMinimize.js";

/** Profile-likelihood interval of parameter j. */
export function profileInterval(
  problem: LeastSquaresProblem,
  xhat: Float64Array,
  j: number,
  free: number[],
  lo: Float64Array,
  hi: Float64Array,
  chi2min: number,
  sigmaKnown: boolean,
  dof: number,
  q: number,
  se: number | null,
  options: FitOptions,
  notes: string[],
): [number, number] {
  const threshold = sigmaKnown ? chi2min + q * q : chi2min * (1 + (q * q) / dof);
  const others = free.filter((i) => i !== j);
  const lmOpts: LmOptions = { ftol: 1e-10, xtol: 1e-10, gtol: 1e-10, signal: options.signal };
  // Every refit starts from the refit at the last point found inside the interval (below the
  // threshold), never from an outer point: a refit outside can end where the model is undefined
  // for the next, inner trial value (e.g. no metastable texture there), which would stop the
  // search at the estimate itself.
  let inside: Float64Array = Float64Array.from(xhat);
  const chiAt = (v: number): { chi: number; x: Float64Array } => {
    const base = Float64Array.from(inside);
    base[j] = v;
    if (others.length === 0) {
      const f = new Float64Array(problem.m);
      problem.model(base, f);
      let s = 0;
      for (let i = 0; i < problem.m; i++) s += ((f[i]! - problem.y[i]!) / (problem.sigma ? problem.sigma[i]! : 1)) ** 2;
      return { chi: s, x: base };
    }
    const r = minimize(problem, base, others, lo, hi, lmOpts);
    return { chi: r.chiSquare, x: r.x };
  };
  const step0 = se && se > 0 ? se * q : Math.max(Math.abs(xhat[j]!) * 1e-2, 1e-12);
  const name = problem.parameters[j]!.name;
  const side = (dir: number): number => {
    inside = Float64Array.from(xhat);
    let a = xhat[j]!;
    let step = step0;
    let b = a + dir * step;
    let fb = Number.NaN;
    for (let it = 0; it < 40; it++) {
      if (dir > 0 && b >= hi[j]!) b = hi[j]!;
      if (dir < 0 && b <= lo[j]!) b = lo[j]!;
      const r = chiAt(b);
      fb = r.chi;
      if (!(fb < threshold)) break;
      inside = r.x;
      if (b === hi[j] || b === lo[j]) {
        notes.push(`profile of ${name} stays below the threshold up to its bound ${b}: interval open on that side`);
        return b;
      }
      a = b;
      step *= 2;
      b = a + dir * step;
    }
    if (fb < threshold) {
      notes.push(`profile of ${name} did not reach the threshold: interval open on that side`);
      return dir * Infinity;
    }
    // bisection between a (below) and b (above the threshold, or where the model is not finite)
    let bFinite = Number.isFinite(fb);
    for (let it = 0; it < 50; it++) {
      const mid = 0.5 * (a + b);
      const r = chiAt(mid);
      if (r.chi < threshold) {
        a = mid;
        inside = r.x;
      } else {
        b = mid;
        bFinite = Number.isFinite(r.chi);
      }
      if (Math.abs(b - a) <= 1e-7 * Math.max(Math.abs(a), Math.abs(step0))) break;
    }
    if (!bFinite) {
      notes.push(
        `profile of ${name}: the model is not finite just ${dir < 0 ? "below" : "above"} ${name} = ${a.toPrecision(6)} (others refitted) while the chi-square is still below the threshold: interval open on that side (bounded by the model's domain, not by the data)`,
      );
      return dir * Infinity;
    }
    return 0.5 * (a + b);
  };
  return [side(-1), side(+1)];
}
