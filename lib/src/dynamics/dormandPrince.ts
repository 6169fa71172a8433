/**
 * Adaptive explicit Runge-Kutta integrator: the Dormand-Prince 5(4) pair with local error control,
 * the free fourth-order dense output of the pair (continuous solution between steps), and event
 * location on the dense output (sign changes of user functions, located by Brent's method).
 *
 * Sources: J. Dormand, P. Prince, J. Comput. Appl. Math. 6, 19 (1980) (the pair, FSAL); E. Hairer,
 * S. Norsett, G. Wanner, *Solving Ordinary Differential Equations I* (Springer 1993), sec. II.4-II.6
 * (error norm, step-size control with the PI controller of Gustafsson, initial step, dense output
 * coefficients of the routine DOPRI5). Checked against scipy.integrate.solve_ivp in
 * test/lib/dynamics/dormandPrince.test.ts.
 *
 * Why our own and not a package: the npm registry has no maintained Dormand-Prince integrator with
 * dense output and events (ode45-cash-karp is a different pair without dense output or events;
 * odex is a Gragg-Bulirsch-Stoer extrapolation code whose next major version has stayed a release
 * candidate), and the library must stay dependency-light and run in the page's Web Worker.
 *
 * Work is bounded: `maxSteps` (default 200 000) accepted-or-rejected steps, then a ConvergenceError
 * with the time reached; a step size below 1e-14 |t| is reported the same way.
 */
import { ConvergenceError, InputError } from "../errors.js";
import { brentRoot } from "../numeric/brentRoot.js";

/** Right-hand side dy/dt = f(t, y), written into `dydt`. */
export type OdeRhs = (t: number, y: Float64Array, dydt: Float64Array) => void;

/** An event: a scalar function of (t, y) whose sign changes are located. */
export interface OdeEvent {
  g: (t: number, y: ArrayLike<number>) => number;
  /** +1: only rising crossings, -1: only falling, 0 (default): both. */
  direction?: number;
  /** Stop the integration at the first crossing (default false). */
  terminal?: boolean;
}

export interface OdeOptions {
  /** Relative tolerance (default 1e-8). */
  rtol?: number;
  /** Absolute tolerance, one number or one per component (default 1e-10). */
  atol?: number | ArrayLike<number>;
  /** First step (default: Hairer's estimate). */
  firstStep?: number;
  /** Largest step (default: the whole interval). */
  maxStep?: number;
  /** Bound on the number of steps (default 200 000). */
  maxSteps?: number;
  /** Times at which to report the solution (must lie in [t0, t1], increasing); else every step. */
  tEval?: ArrayLike<number>;
  events?: OdeEvent[];
}

export interface OdeSolution {
  /** Reported times and states (rows). */
  t: number[];
  y: Float64Array[];
  /** Event times and states, one list per event. */
  tEvents: number[][];
  yEvents: Float64Array[][];
  /** Time where the integration ended (t1, or a terminal event). */
  tEnd: number;
  /** State at tEnd. */
  yEnd: Float64Array;
  /** Accepted and rejected steps, right-hand-side evaluations. */
  accepted: number;
  rejected: number;
  evaluations: number;
  /** "done" (reached t1) or "event" (stopped by a terminal event). */
  status: "done" | "event";
}

// Dormand-Prince 5(4) tableau (Hairer, Norsett, Wanner, table II.5.2).
const C2 = 1 / 5,
  C3 = 3 / 10,
  C4 = 4 / 5,
  C5 = 8 / 9;
const A21 = 1 / 5;
const A31 = 3 / 40,
  A32 = 9 / 40;
const A41 = 44 / 45,
  A42 = -56 / 15,
  A43 = 32 / 9;
const A51 = 19372 / 6561,
  A52 = -25360 / 2187,
  A53 = 64448 / 6561,
  A54 = -212 / 729;
const A61 = 9017 / 3168,
  A62 = -355 / 33,
  A63 = 46732 / 5247,
  A64 = 49 / 176,
  A65 = -5103 / 18656;
const A71 = 35 / 384,
  A73 = 500 / 1113,
  A74 = 125 / 192,
  A75 = -2187 / 6784,
  A76 = 11 / 84;
// Error estimate: fifth-order minus embedded fourth-order weights.
const E1 = 71 / 57600,
  E3 = -71 / 16695,
  E4 = 71 / 1920,
  E5 = -17253 / 339200,
  E6 = 22 / 525,
  E7 = -1 / 40;
// Dense output (routine DOPRI5 of Hairer and Wanner).
const D1 = -12715105075 / 11282082432,
  D3 = 87487479700 / 32700410799,
  D4 = -10690763975 / 1880347072;
const D5 = 701980252875 / 199316789632,
  D6 = -1453857185 / 822651844,
  D7 = 69997945 / 29380423;

/** Continuous solution on one step [t0, t0 + h] (Hairer's five coefficient vectors). */
class DenseStep {
  constructor(
    readonly t0: number,
    readonly h: number,
    readonly r: Float64Array[],
  ) {}
  at(t: number, out: Float64Array): Float64Array {
    const s = (t - this.t0) / this.h;
    const s1 = 1 - s;
    const [r1, r2, r3, r4, r5] = this.r as [Float64Array, Float64Array, Float64Array, Float64Array, Float64Array];
    for (let i = 0; i < out.length; i++) out[i] = r1[i]! + s * (r2[i]! + s1 * (r3[i]! + s * (r4[i]! + s1 * r5[i]!)));
    return out;
  }
}

/**
 * Integrate dy/dt = f(t, y) from t0 to t1 (t1 > t0) with the Dormand-Prince 5(4) pair.
 * Throws InputError for a bad interval or tolerance, ConvergenceError when the step bound is spent
 * or the step size underflows (with the time reached).
 */
export function integrateDormandPrince(f: OdeRhs, t0: number, y0: ArrayLike<number>, t1: number, options: OdeOptions = {}): OdeSolution {
  if (!Number.isFinite(t0) || !Number.isFinite(t1) || !(t1 > t0)) throw new InputError("t1", t1, `a finite end time larger than t0 = ${t0}`);
  const n = y0.length;
  if (n < 1) throw new InputError("y0", y0, "a state with at least one component");
  const rtol = options.rtol ?? 1e-8;
  if (!(rtol > 0 && rtol < 1)) throw new InputError("rtol", rtol, "a relative tolerance in (0, 1)");
  const atolIn = options.atol ?? 1e-10;
  const atol = new Float64Array(n);
  for (let i = 0; i < n; i++) atol[i] = typeof atolIn === "number" ? atolIn : atolIn[i]!;
  if (!atol.every((a) => a >= 0)) throw new InputError("atol", atolIn, "non-negative absolute tolerances");
  const maxSteps = options.maxSteps ?? 200000;
  const maxStep = options.maxStep ?? t1 - t0;
  const tEval = options.tEval;
  if (tEval) {
    for (let i = 0; i < tEval.length; i++) {
      if (!(tEval[i]! >= t0 && tEval[i]! <= t1) || (i > 0 && !(tEval[i]! >= tEval[i - 1]!))) {
        throw new InputError("tEval", tEval, `increasing times within [${t0}, ${t1}]`);
      }
    }
  }
  const events = options.events ?? [];

  let y = Float64Array.from(y0);
  if (!y.every(Number.isFinite)) throw new InputError("y0", y0, "finite initial values");
  const k1 = new Float64Array(n),
    k2 = new Float64Array(n),
    k3 = new Float64Array(n),
    k4 = new Float64Array(n);
  const k5 = new Float64Array(n),
    k6 = new Float64Array(n),
    k7 = new Float64Array(n);
  const ys = new Float64Array(n);
  const yNew = new Float64Array(n);
  let evaluations = 0;
  const rhs = (t: number, yy: Float64Array, out: Float64Array): void => {
    f(t, yy, out);
    evaluations++;
  };
  let t = t0;
  rhs(t, y, k1);

  const norm = (v: Float64Array, ref: Float64Array, ref2: Float64Array): number => {
    let s = 0;
    for (let i = 0; i < n; i++) {
      const sc = atol[i]! + rtol * Math.max(Math.abs(ref[i]!), Math.abs(ref2[i]!));
      const q = v[i]! / sc;
      s += q * q;
    }
    return Math.sqrt(s / n);
  };

  // Initial step (Hairer, Norsett, Wanner, sec. II.4).
  let h = options.firstStep ?? 0;
  if (!(h > 0)) {
    const d0 = norm(y, y, y);
    const d1 = norm(k1, y, y);
    let h0 = d0 < 1e-5 || d1 < 1e-5 ? 1e-6 : (0.01 * d0) / d1;
    h0 = Math.min(h0, maxStep, t1 - t0);
    for (let i = 0; i < n; i++) ys[i] = y[i]! + h0 * k1[i]!;
    rhs(t + h0, ys, k2);
    for (let i = 0; i < n; i++) k3[i] = k2[i]! - k1[i]!;
    const d2 = norm(k3, y, y) / h0;
    const h1 = Math.max(d1, d2) <= 1e-15 ? Math.max(1e-6, h0 * 1e-3) : Math.pow(0.01 / Math.max(d1, d2), 1 / 5);
    h = Math.min(100 * h0, h1, maxStep, t1 - t0);
  }

  const out: OdeSolution = {
    t: [],
    y: [],
    tEvents: events.map(() => []),
    yEvents: events.map(() => []),
    tEnd: t0,
    yEnd: y,
    accepted: 0,
    rejected: 0,
    evaluations: 0,
    status: "done",
  };
  let evalIndex = 0;
  if (tEval) {
    while (evalIndex < tEval.length && tEval[evalIndex] === t0) {
      out.t.push(t0);
      out.y.push(Float64Array.from(y));
      evalIndex++;
    }
  } else {
    out.t.push(t0);
    out.y.push(Float64Array.from(y));
  }
  const gPrev = events.map((ev) => ev.g(t0, y));
  const errOld = { v: 1e-4 };
  let steps = 0;
  let lastRejected = false;
  const tmp = new Float64Array(n);

  while (t < t1) {
    if (steps++ >= maxSteps) {
      throw new ConvergenceError("Dormand-Prince integrator", `step bound of ${maxSteps} spent before t1`, { tReached: t, t1, accepted: out.accepted, rejected: out.rejected });
    }
    if (t + h > t1) h = t1 - t;
    if (!(h > 1e-14 * Math.max(Math.abs(t), Math.abs(t1 - t0)))) {
      throw new ConvergenceError("Dormand-Prince integrator", "step size underflow (stiff or singular right-hand side?)", { tReached: t, h });
    }
    for (let i = 0; i < n; i++) ys[i] = y[i]! + h * A21 * k1[i]!;
    rhs(t + C2 * h, ys, k2);
    for (let i = 0; i < n; i++) ys[i] = y[i]! + h * (A31 * k1[i]! + A32 * k2[i]!);
    rhs(t + C3 * h, ys, k3);
    for (let i = 0; i < n; i++) ys[i] = y[i]! + h * (A41 * k1[i]! + A42 * k2[i]! + A43 * k3[i]!);
    rhs(t + C4 * h, ys, k4);
    for (let i = 0; i < n; i++) ys[i] = y[i]! + h * (A51 * k1[i]! + A52 * k2[i]! + A53 * k3[i]! + A54 * k4[i]!);
    rhs(t + C5 * h, ys, k5);
    for (let i = 0; i < n; i++) ys[i] = y[i]! + h * (A61 * k1[i]! + A62 * k2[i]! + A63 * k3[i]! + A64 * k4[i]! + A65 * k5[i]!);
    const tn = t + h;
    rhs(tn, ys, k6);
    for (let i = 0; i < n; i++) yNew[i] = y[i]! + h * (A71 * k1[i]! + A73 * k3[i]! + A74 * k4[i]! + A75 * k5[i]! + A76 * k6[i]!);
    rhs(tn, yNew, k7);
    for (let i = 0; i < n; i++) tmp[i] = h * (E1 * k1[i]! + E3 * k3[i]! + E4 * k4[i]! + E5 * k5[i]! + E6 * k6[i]! + E7 * k7[i]!);
    let err = norm(tmp, y, yNew);
    if (!Number.isFinite(err)) err = 1e10;
    if (err <= 1) {
      // Accept. Dense output on [t, tn].
      const r1 = Float64Array.from(y);
      const r2 = new Float64Array(n),
        r3 = new Float64Array(n),
        r4 = new Float64Array(n),
        r5 = new Float64Array(n);
      for (let i = 0; i < n; i++) {
        const dy = yNew[i]! - y[i]!;
        const bspl = h * k1[i]! - dy;
        r2[i] = dy;
        r3[i] = bspl;
        r4[i] = dy - h * k7[i]! - bspl;
        r5[i] = h * (D1 * k1[i]! + D3 * k3[i]! + D4 * k4[i]! + D5 * k5[i]! + D6 * k6[i]! + D7 * k7[i]!);
      }
      const dense = new DenseStep(t, h, [r1, r2, r3, r4, r5]);
      let tStop = tn;
      let stopped = false;
      // Events: sign changes between the step ends, located on the dense output.
      for (let e = 0; e < events.length; e++) {
        const ev = events[e]!;
        const ga = gPrev[e]!;
        const gb = ev.g(tn, yNew);
        const dir = ev.direction ?? 0;
        const crosses = (ga < 0 && gb >= 0 && dir >= 0) || (ga > 0 && gb <= 0 && dir <= 0);
        if (crosses) {
          const yy = new Float64Array(n);
          const root = brentRoot((s) => ev.g(s, dense.at(s, yy)), t, tn, { fa: ga, fb: gb, xtol: 1e-15 * Math.max(1, Math.abs(tn)) }).root;
          if (root > t || ga !== 0) {
            out.tEvents[e]!.push(root);
            out.yEvents[e]!.push(dense.at(root, new Float64Array(n)));
            if (ev.terminal && root <= tStop) {
              tStop = root;
              stopped = true;
            }
          }
        }
        gPrev[e] = gb;
      }
      if (tEval) {
        while (evalIndex < tEval.length && tEval[evalIndex]! <= tStop) {
          const te = tEval[evalIndex]!;
          out.t.push(te);
          out.y.push(te === tn ? Float64Array.from(yNew) : dense.at(te, new Float64Array(n)));
          evalIndex++;
        }
      } else if (!stopped) {
        out.t.push(tn);
        out.y.push(Float64Array.from(yNew));
      }
      out.accepted++;
      if (stopped) {
        const yStop = dense.at(tStop, new Float64Array(n));
        if (!tEval) {
          out.t.push(tStop);
          out.y.push(Float64Array.from(yStop));
        }
        out.tEnd = tStop;
        out.yEnd = yStop;
        out.status = "event";
        out.evaluations = evaluations;
        return out;
      }
      t = tn;
      y = Float64Array.from(yNew);
      k1.set(k7); // FSAL
      // PI step-size control (Gustafsson), as in DOPRI5: beta = 0.04.
      const e = Math.max(err, 1e-10);
      let fac = 0.9 * Math.pow(e, -(0.2 - 0.04 * 0.75)) * Math.pow(errOld.v, 0.04);
      fac = Math.min(10, Math.max(0.2, fac));
      if (lastRejected) fac = Math.min(fac, 1);
      errOld.v = Math.max(err, 1e-4);
      h = Math.min(h * fac, maxStep);
      lastRejected = false;
    } else {
      out.rejected++;
      lastRejected = true;
      h *= Math.max(0.2, 0.9 * Math.pow(err, -1 / 5));
    }
  }
  out.tEnd = t;
  out.yEnd = y;
  out.evaluations = evaluations;
  return out;
}
