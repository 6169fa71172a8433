/**
 * Seeded case-resampling bootstrap of a least-squares fit: the data rows are drawn with replacement,
 * the fit repeated from the estimate, and each parameter's draws give a bootstrap standard deviation
 * and a percentile interval (linear interpolation between order statistics). Source: B. Efron,
 * R. Tibshirani, *An Introduction to the Bootstrap* (Chapman & Hall 1993), ch. 6 and 13.
 */
import { InputError } from "../errors.js";
import { seededRandom } from "../numeric/prng.js";
import type { FitOptions, LeastSquaresProblem, ParameterResult } from "./leastSquares.js";
import { minimize } from "./leastSquaresMinimize.js";

export function bootstrap(
  problem: LeastSquaresProblem,
  xhat: Float64Array,
  free: number[],
  lo: Float64Array,
  hi: Float64Array,
  options: FitOptions,
  parameters: Record<string, ParameterResult>,
  confidence: number,
  notes: string[],
) {
  const { samples, seed } = options.bootstrap!;
  if (!Number.isInteger(samples) || samples < 10) throw new InputError("bootstrap.samples", samples, "a whole number >= 10");
  const rng = seededRandom(seed);
  const m = problem.m;
  const fullModel = new Float64Array(m);
  const draws: number[][] = free.map(() => []);
  let failed = 0;
  for (let b = 0; b < samples; b++) {
    if (options.signal?.aborted) {
      notes.push(`bootstrap stopped on request after ${b} resamples`);
      break;
    }
    const idx = new Int32Array(m);
    for (let i = 0; i < m; i++) idx[i] = rng.integer(m);
    const y = new Float64Array(m);
    const sg = problem.sigma ? new Float64Array(m) : null;
    for (let i = 0; i < m; i++) {
      y[i] = problem.y[idx[i]!]!;
      if (sg) sg[i] = problem.sigma![idx[i]!]!;
    }
    const sub: LeastSquaresProblem = {
      parameters: problem.parameters,
      m,
      y,
      sigma: sg,
      model(p, out) {
        problem.model(p, fullModel);
        for (let i = 0; i < m; i++) out[i] = fullModel[idx[i]!]!;
      },
    };
    if (problem.modelJacobian) {
      const nAll = xhat.length;
      const fj = new Float64Array(m * nAll);
      sub.modelJacobian = (p, out) => {
        problem.modelJacobian!(p, fj);
        for (let c = 0; c < nAll; c++) for (let i = 0; i < m; i++) out[c * m + i] = fj[c * m + idx[i]!]!;
      };
    }
    const r = minimize(sub, xhat, free, lo, hi, { ftol: 1e-10, xtol: 1e-10, gtol: 1e-10 });
    if (r.status !== "converged") {
      failed++;
      continue;
    }
    free.forEach((j, c) => draws[c]!.push(r.x[j]!));
  }
  if (failed > 0) notes.push(`${failed} bootstrap refits did not converge and were left out`);
  free.forEach((j, c) => {
    const d = draws[c]!.slice().sort((a, b) => a - b);
    if (d.length < 2) return;
    const mean = d.reduce((s, v) => s + v, 0) / d.length;
    const sd = Math.sqrt(d.reduce((s, v) => s + (v - mean) ** 2, 0) / (d.length - 1));
    const pick = (p: number) => {
      const h = (d.length - 1) * p;
      const l = Math.floor(h);
      return d[l]! + (h - l) * ((d[Math.min(l + 1, d.length - 1)] ?? d[l]!) - d[l]!);
    };
    const name = problem.parameters[j]!.name;
    parameters[name]!.bootstrapStderr = sd;
    parameters[name]!.bootstrapInterval = [pick((1 - confidence) / 2), pick((1 + confidence) / 2)];
  });
}
