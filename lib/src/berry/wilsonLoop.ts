/**
 * Discrete Berry phase and Wilson loop of a family of Hermitian matrices H(lambda) along a closed
 * path lambda in [from, to] with H(to) = H(from), for one band or a group of bands (degenerate or
 * not): gamma = -Im ln prod_j det M_j, M_j = U_j^H U_j+1 (k x k overlaps of the group's eigenvectors
 * at consecutive points, U_N = U_0). The result is gauge invariant (any phases or unitary mixing
 * of the eigenvectors at each point cancel) and converges to the continuum Berry phase as the path
 * is refined. The Wilson loop W = M_0 M_1 ... M_N-1 also gives its eigenphases -arg(w_a), the
 * non-Abelian Berry phases of the group (their sum is gamma mod 2 pi).
 * Sources: R. Resta, Rev. Mod. Phys. 66, 899 (1994); R. King-Smith, D. Vanderbilt, PRB 47, 1651
 * (1993); F. Wilczek, A. Zee, PRL 52, 2111 (1984) (non-Abelian phases of degenerate groups).
 *
 * H(lambda) is a TypeScript function returning a matrix (number[][], nested {re, im}, mathjs
 * Matrix, or planar { re, im }), or a mathjs expression string such as
 * "[[cos(t), sin(t) * exp(-i * p)], [sin(t) * exp(i * p), -cos(t)]]" compiled with mathjs (its own
 * sandboxed parser; no JavaScript eval) and evaluated with the loop variable and `parameters`.
 * Sign convention as in spinBerryPhase.ts: gamma = i oint <u|d u>, reported in (-pi, pi].
 */
import type { Complex, EvalFunction } from "mathjs";
import { mathComplex, mathExpressions } from "../quantity/mathjs.js";
import { InputError } from "../errors.js";
import { HermitianEigenSolver, assertHermitian } from "../numeric/eigenHermitian.js";
import { toPlanarMatrix, maxAbsDifference, maxAbsEntry, complexDeterminant, type PlanarMatrix } from "../numeric/complexMatrix.js";
import { wrapBerryPhase } from "./spinBerryPhase.js";

export type MatrixFamily = ((lambda: number) => unknown) | string;

export interface WilsonLoopOptions {
  from?: number;
  to?: number;
  /** Number of points on the loop (edges); default 400. */
  points?: number;
  /** Band indices of the group, ascending by energy from 0 (default [0], the lowest band). */
  bands?: number[];
  /** Name of the loop variable in a formula (default "lambda"). */
  variable?: string;
  /** Extra named numbers for a formula. */
  parameters?: Record<string, number>;
  hermitianTolerance?: number;
  closureTolerance?: number;
  /** Gap to the other bands below which the phase is ill-defined (relative to the matrix scale). */
  gapTolerance?: number;
}

export interface WilsonLoopResult {
  berryPhase: number;
  wilsonEigenphases: number[];
  /** |det W|: 1 for a well-resolved loop, smaller when the states change a lot between points. */
  wilsonMagnitude: number;
  /** Smallest energy gap between the group and the other bands along the loop. */
  minGap: number;
  status: "ok" | "gap-closed";
  notes: string[];
  bands: number[];
  points: number;
  method: string;
  sources: string[];
}

/** Turn a function or formula into lambda -> planar matrix, with checks. */
export function compileMatrixFamily(family: MatrixFamily, variable = "lambda", parameters: Record<string, number> = {}): (x: number) => PlanarMatrix {
  if (typeof family === "string") {
    let code: EvalFunction;
    try {
      code = mathExpressions().compile(family) as EvalFunction;
    } catch (err) {
      throw new InputError("H", family, 'a mathjs matrix expression such as "[[cos(lambda), sin(lambda)], [sin(lambda), -cos(lambda)]]"', (err as Error).message);
    }
    return (x: number) => {
      let value: unknown;
      try {
        value = code.evaluate({ ...parameters, [variable]: x });
      } catch (err) {
        throw new InputError(
          "H",
          family,
          `an expression that evaluates with ${variable} = ${x}${Object.keys(parameters).length ? " and " + Object.keys(parameters).join(", ") : ""}`,
          (err as Error).message,
        );
      }
      return toPlanarMatrix(value, "H");
    };
  }
  if (typeof family !== "function") throw new InputError("H", family, "a function lambda -> matrix, or a mathjs matrix expression string");
  return (x: number) => toPlanarMatrix(family(x), "H");
}

export function wilsonLoop(family: MatrixFamily, options: WilsonLoopOptions = {}): WilsonLoopResult {
  const from = options.from ?? 0;
  const to = options.to ?? 2 * Math.PI;
  const N = options.points ?? 400;
  if (!Number.isInteger(N) || N < 3) throw new InputError("points", N, "a whole number >= 3");
  if (!Number.isFinite(from) || !Number.isFinite(to) || to === from) throw new InputError("to", to, `a finite end of the loop different from from = ${from}`);
  const H = compileMatrixFamily(family, options.variable ?? "lambda", options.parameters ?? {});
  const h0 = H(from);
  const n = h0.n;
  const bands = options.bands ?? [0];
  if (bands.length === 0 || bands.some((b, i) => !Number.isInteger(b) || b < 0 || b >= n || (i > 0 && b !== bands[i - 1]! + 1))) {
    throw new InputError("bands", bands, `consecutive band indices in 0..${n - 1} (ascending energy), e.g. [0] or [1, 2]`);
  }
  const hTol = options.hermitianTolerance ?? 1e-10;
  assertHermitian(n, h0.re, h0.im, hTol, `H(${from})`);
  const hEnd = H(to);
  if (hEnd.n !== n) throw new InputError(`H(${to})`, `${hEnd.n} x ${hEnd.n}`, `the same size as H(${from}), ${n} x ${n}`);
  const scale = Math.max(maxAbsEntry(h0), 1e-300);
  const closure = maxAbsDifference(h0, hEnd) / scale;
  if (closure > (options.closureTolerance ?? 1e-9)) {
    throw new InputError(
      "H",
      `H(${to}) - H(${from}) of relative size ${closure.toExponential(3)}`,
      "a closed loop: H(to) equal to H(from) (an open path has no gauge-invariant Berry phase)",
    );
  }
  const k = bands.length;
  const lo = bands[0]!;
  const hi = bands[k - 1]!;
  const solver = new HermitianEigenSolver(n);
  const take = (m: PlanarMatrix) => {
    solver.solve(m.re, m.im, true);
    const ur = new Float64Array(n * k);
    const ui = new Float64Array(n * k);
    for (let i = 0; i < n; i++)
      for (let b = 0; b < k; b++) {
        ur[i * k + b] = solver.vectorsRe[i * n + lo + b]!;
        ui[i * k + b] = solver.vectorsIm[i * n + lo + b]!;
      }
    let gap = Infinity;
    if (lo > 0) gap = Math.min(gap, solver.values[lo]! - solver.values[lo - 1]!);
    if (hi < n - 1) gap = Math.min(gap, solver.values[hi + 1]! - solver.values[hi]!);
    return { ur, ui, gap };
  };
  const first = take(h0);
  let prev = first;
  let minGap = first.gap;
  let phase = 0;
  let logMag = 0;
  // Wilson matrix product (k x k)
  let wr = new Float64Array(k * k);
  let wi = new Float64Array(k * k);
  for (let a = 0; a < k; a++) wr[a * k + a] = 1;
  const mr = new Float64Array(k * k);
  const mi = new Float64Array(k * k);
  for (let j = 1; j <= N; j++) {
    let cur = first;
    if (j < N) {
      const hj = H(from + ((to - from) * j) / N);
      if (hj.n !== n) throw new InputError(`H(${from + ((to - from) * j) / N})`, `${hj.n} x ${hj.n}`, `${n} x ${n} at every point`);
      assertHermitian(n, hj.re, hj.im, hTol, `H(${from + ((to - from) * j) / N})`);
      cur = take(hj);
      minGap = Math.min(minGap, cur.gap);
    }
    // M = U_prev^H U_cur
    for (let a = 0; a < k; a++)
      for (let b = 0; b < k; b++) {
        let sr = 0;
        let si = 0;
        for (let i = 0; i < n; i++) {
          const xr = prev.ur[i * k + a]!,
            xi = prev.ui[i * k + a]!;
          const yr = cur.ur[i * k + b]!,
            yi = cur.ui[i * k + b]!;
          sr += xr * yr + xi * yi;
          si += xr * yi - xi * yr;
        }
        mr[a * k + b] = sr;
        mi[a * k + b] = si;
      }
    const [dr, di] = complexDeterminant(k, mr, mi);
    phase += Math.atan2(di, dr);
    logMag += Math.log(Math.hypot(dr, di) || 1e-300);
    const nr = new Float64Array(k * k);
    const ni = new Float64Array(k * k);
    for (let a = 0; a < k; a++)
      for (let b = 0; b < k; b++) {
        let sr = 0;
        let si = 0;
        for (let c = 0; c < k; c++) {
          sr += wr[a * k + c]! * mr[c * k + b]! - wi[a * k + c]! * mi[c * k + b]!;
          si += wr[a * k + c]! * mi[c * k + b]! + wi[a * k + c]! * mr[c * k + b]!;
        }
        nr[a * k + b] = sr;
        ni[a * k + b] = si;
      }
    wr = nr;
    wi = ni;
    prev = cur;
  }
  const notes: string[] = [];
  const gapTol = (options.gapTolerance ?? 1e-9) * scale;
  let status: WilsonLoopResult["status"] = "ok";
  if (minGap < gapTol) {
    status = "gap-closed";
    notes.push(`the group touches another band along the loop (minimum gap ${minGap.toExponential(3)}): its Berry phase is not defined; widen the group or move the loop`);
  }
  return {
    berryPhase: wrapBerryPhase(-phase),
    wilsonEigenphases: wilsonPhases(k, wr, wi),
    wilsonMagnitude: Math.exp(logMag),
    minGap,
    status,
    notes,
    bands: bands.slice(),
    points: N,
    method: "discrete gauge-invariant product of overlap determinants (Wilson loop) of the eigenvectors of H(lambda)",
    sources: ["R. Resta, Rev. Mod. Phys. 66, 899 (1994)", "R. King-Smith, D. Vanderbilt, PRB 47, 1651 (1993)"],
  };
}

/**
 * Principal square root of re + i im (real part >= 0; on the negative real axis +i sqrt|re|), by
 * the half-angle formulas with the cancellation-free branch. Common practice, no source (the
 * formula complex.js, behind mathjs's sqrt, uses too).
 */
function principalSqrt(re: number, im: number): { re: number; im: number } {
  if (re === 0 && im === 0) return { re: 0, im: 0 };
  const r = Math.hypot(re, im);
  if (re >= 0) {
    const t = Math.sqrt(0.5 * (r + re));
    return { re: t, im: im / (2 * t) };
  }
  const t = Math.sqrt(0.5 * (r - re));
  return { re: Math.abs(im) / (2 * t), im: im < 0 ? -t : t };
}

/** -arg of the eigenvalues of the k x k Wilson matrix, wrapped to (-pi, pi], ascending. */
function wilsonPhases(k: number, wr: Float64Array, wi: Float64Array): number[] {
  if (k === 1) return [wrapBerryPhase(-Math.atan2(wi[0]!, wr[0]!))];
  if (k === 2) {
    // lambda^2 - tr lambda + det = 0
    const tr = [wr[0]! + wr[3]!, wi[0]! + wi[3]!];
    const det = complexDeterminant(2, wr, wi);
    // principal square root of the discriminant, in plain arithmetic (no mathjs for two bands)
    const sq = principalSqrt(tr[0]! * tr[0]! - tr[1]! * tr[1]! - 4 * det[0], 2 * tr[0]! * tr[1]! - 4 * det[1]);
    const l1 = [(tr[0]! + sq.re) / 2, (tr[1]! + sq.im) / 2];
    const l2 = [(tr[0]! - sq.re) / 2, (tr[1]! - sq.im) / 2];
    return [wrapBerryPhase(-Math.atan2(l1[1]!, l1[0]!)), wrapBerryPhase(-Math.atan2(l2[1]!, l2[0]!))].sort((a, b) => a - b);
  }
  const { complex, eigs } = mathComplex();
  const rows: Complex[][] = [];
  for (let a = 0; a < k; a++) {
    const row: Complex[] = [];
    for (let b = 0; b < k; b++) row.push(complex(wr[a * k + b]!, wi[a * k + b]!));
    rows.push(row);
  }
  const res = eigs(rows as unknown as Complex[][], { eigenvectors: false } as never) as unknown as { values: unknown };
  const vals = res.values as { toArray?: () => unknown[] } | unknown[];
  const list = (Array.isArray(vals) ? vals : (vals as { toArray: () => unknown[] }).toArray()) as Array<number | Complex>;
  return list.map((z) => (typeof z === "number" ? wrapBerryPhase(-Math.atan2(0, z)) : wrapBerryPhase(-Math.atan2(z.im, z.re)))).sort((a, b) => a - b);
}
