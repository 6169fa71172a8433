/**
 * A small, robust minimizer of a smooth function of two variables: Nelder-Mead simplex with
 * restarts (a fresh, small simplex around the best point until a restart no longer improves it).
 *
 * Method: J. Nelder, R. Mead, Comput. J. 7, 308 (1965), with the adaptive-free standard
 * coefficients (reflection 1, expansion 2, contraction 1/2, shrink 1/2); restarting is the usual
 * remedy for premature collapse of the simplex (e.g. Numerical Recipes, 3rd ed., 10.5).
 * Hand-written because mathjs has no minimizer; checked against scipy.optimize.minimize in
 * test/lib/numeric/minimize2d.test.ts. Returns a scipy-like result with status and counts.
 */
import { InputError } from "../errors.js";

export interface Minimize2dOptions {
  /** Initial step sizes along each variable (default 0.1 * max(|x0|, 1)). */
  step?: [number, number];
  /** Absolute tolerance on the variables (default 1e-10). */
  xTol?: number;
  /** Absolute tolerance on the spread of function values in the simplex (default 1e-15 * (1 + |f|)). */
  fTol?: number;
  /** Maximum function evaluations (default 4000). */
  maxEvaluations?: number;
}

export interface Minimize2dResult {
  x: [number, number];
  fun: number;
  /** "converged" or "max-evaluations" (the best point is still returned). */
  status: "converged" | "max-evaluations";
  success: boolean;
  message: string;
  evaluations: number;
  restarts: number;
}

type P = [number, number];

/** Minimize f(x, y) from (x0, y0). Non-finite function values count as +Infinity (a wall). */
export function minimize2d(f: (x: number, y: number) => number, x0: P, opts: Minimize2dOptions = {}): Minimize2dResult {
  if (!Number.isFinite(x0[0]) || !Number.isFinite(x0[1])) throw new InputError("x0", x0, "two finite starting values");
  const xTol = opts.xTol ?? 1e-10;
  const maxEval = opts.maxEvaluations ?? 4000;
  let evaluations = 0;
  const F = (p: P): number => {
    evaluations++;
    const v = f(p[0], p[1]);
    return Number.isFinite(v) ? v : Infinity;
  };
  const step0: P = opts.step ?? [0.1 * Math.max(Math.abs(x0[0]), 1), 0.1 * Math.max(Math.abs(x0[1]), 1)];

  const run = (start: P, step: P): { x: P; f: number; done: boolean } => {
    let pts: P[] = [start, [start[0] + step[0], start[1]], [start[0], start[1] + step[1]]];
    let vals = pts.map(F);
    for (;;) {
      // order
      const idx = [0, 1, 2].sort((i, j) => vals[i]! - vals[j]!);
      pts = idx.map((i) => pts[i]!);
      vals = idx.map((i) => vals[i]!);
      const [b, m, w] = pts as [P, P, P];
      const fTol = opts.fTol ?? 1e-15 * (1 + Math.abs(vals[0]!));
      const size = Math.max(Math.abs(m[0] - b[0]), Math.abs(w[0] - b[0]), Math.abs(m[1] - b[1]), Math.abs(w[1] - b[1]));
      if (size <= xTol || vals[2]! - vals[0]! <= fTol) {
        return { x: b, f: vals[0]!, done: true };
      }
      if (evaluations >= maxEval) return { x: b, f: vals[0]!, done: false };
      const c: P = [(b[0] + m[0]) / 2, (b[1] + m[1]) / 2];
      const r: P = [2 * c[0] - w[0], 2 * c[1] - w[1]];
      const fr = F(r);
      if (fr < vals[0]!) {
        const e: P = [3 * c[0] - 2 * w[0], 3 * c[1] - 2 * w[1]];
        const fe = F(e);
        if (fe < fr) {
          pts[2] = e;
          vals[2] = fe;
        } else {
          pts[2] = r;
          vals[2] = fr;
        }
        continue;
      }
      if (fr < vals[1]!) {
        pts[2] = r;
        vals[2] = fr;
        continue;
      }
      const outside = fr < vals[2]!;
      const k: P = outside ? [(c[0] + r[0]) / 2, (c[1] + r[1]) / 2] : [(c[0] + w[0]) / 2, (c[1] + w[1]) / 2];
      const fk = F(k);
      if (fk < (outside ? fr : vals[2]!)) {
        pts[2] = k;
        vals[2] = fk;
        continue;
      }
      // shrink toward the best point
      for (const i of [1, 2]) {
        pts[i] = [(pts[i]![0] + b[0]) / 2, (pts[i]![1] + b[1]) / 2];
        vals[i] = F(pts[i]!);
      }
    }
  };

  let best = run([x0[0], x0[1]], step0);
  let restarts = 0;
  while (best.done && restarts < 8) {
    const s: P = [Math.max(1e3 * xTol, 1e-3 * Math.abs(best.x[0])), Math.max(1e3 * xTol, 1e-3 * Math.abs(best.x[1]))];
    const again = run(best.x, s);
    restarts++;
    const moved = Math.max(Math.abs(again.x[0] - best.x[0]), Math.abs(again.x[1] - best.x[1]));
    const improved = again.f < best.f;
    if (improved) best = again;
    if (!again.done) {
      best = { ...best, done: false };
      break;
    }
    if (moved <= 10 * xTol || !improved) break;
  }
  return {
    x: best.x,
    fun: best.f,
    status: best.done ? "converged" : "max-evaluations",
    success: best.done,
    message: best.done ? "simplex converged (and a restart agreed)" : `stopped after ${evaluations} evaluations`,
    evaluations,
    restarts,
  };
}
