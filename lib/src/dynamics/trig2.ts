/**
 * Trigonometric polynomials of degree two, p(phi) = c0 + c1 cos phi + s1 sin phi + c2 cos 2phi +
 * s2 sin 2phi: the form every rate of the collective-coordinate wall takes. Values, derivatives, and
 * the exact extreme values over a period (all critical points: sampling at 96 points brackets
 * every extremum of a degree-two polynomial, which has at most four critical points; each is then
 * refined by safeguarded Newton steps on p' to machine precision).
 */

/** Coefficients [c0, c1, s1, c2, s2]. */
export type Trig2 = readonly [number, number, number, number, number];

export function trig2(p: Trig2, phi: number): number {
  const c = Math.cos(phi);
  const s = Math.sin(phi);
  return p[0] + p[1] * c + p[2] * s + p[3] * (c * c - s * s) + p[4] * 2 * s * c;
}

export function trig2Derivative(p: Trig2, phi: number): number {
  const c = Math.cos(phi);
  const s = Math.sin(phi);
  return -p[1] * s + p[2] * c - 2 * p[3] * 2 * s * c + 2 * p[4] * (c * c - s * s);
}

function trig2Second(p: Trig2, phi: number): number {
  const c = Math.cos(phi);
  const s = Math.sin(phi);
  return -p[1] * c - p[2] * s - 4 * p[3] * (c * c - s * s) - 4 * p[4] * 2 * s * c;
}

/** a * p + b * q. */
export function trig2Combine(a: number, p: Trig2, b: number, q: Trig2): Trig2 {
  return [a * p[0] + b * q[0], a * p[1] + b * q[1], a * p[2] + b * q[2], a * p[3] + b * q[3], a * p[4] + b * q[4]];
}

export interface Trig2Extremes {
  max: number;
  argMax: number;
  min: number;
  argMin: number;
}

const SAMPLES = 96;

/** Refine an extremum near phi by Newton on p' (bisection-safeguarded within one sample spacing). */
function refine(p: Trig2, phi: number): number {
  const hw = Math.PI / SAMPLES; // half the sample spacing
  let lo = phi - 2 * hw;
  let hi = phi + 2 * hw;
  let x = phi;
  for (let it = 0; it < 60; it++) {
    const d = trig2Derivative(p, x);
    const dd = trig2Second(p, x);
    let xn = dd !== 0 ? x - d / dd : NaN;
    if (!(xn > lo && xn < hi)) xn = 0.5 * (lo + hi);
    // keep the bracket around a sign change of p' when we have one
    const dn = trig2Derivative(p, xn);
    if (Math.sign(dn) === Math.sign(trig2Derivative(p, lo))) lo = xn;
    else hi = xn;
    if (Math.abs(xn - x) < 1e-15 * Math.max(1, Math.abs(x))) return xn;
    x = xn;
  }
  return x;
}

/** Largest and smallest value of p over a period, with where they are. */
export function trig2Extremes(p: Trig2): Trig2Extremes {
  const vals = new Float64Array(SAMPLES);
  for (let i = 0; i < SAMPLES; i++) vals[i] = trig2(p, (2 * Math.PI * i) / SAMPLES);
  let max = -Infinity, argMax = 0, min = Infinity, argMin = 0;
  for (let i = 0; i < SAMPLES; i++) {
    const prev = vals[(i + SAMPLES - 1) % SAMPLES]!;
    const next = vals[(i + 1) % SAMPLES]!;
    const v = vals[i]!;
    const phi = (2 * Math.PI * i) / SAMPLES;
    if (v >= prev && v >= next) {
      const x = refine(p, phi);
      const fx = Math.max(trig2(p, x), v);
      if (fx > max) {
        max = fx;
        argMax = trig2(p, x) >= v ? x : phi;
      }
    }
    if (v <= prev && v <= next) {
      const x = refine(p, phi);
      const fx = Math.min(trig2(p, x), v);
      if (fx < min) {
        min = fx;
        argMin = trig2(p, x) <= v ? x : phi;
      }
    }
  }
  return { max, argMax, min, argMin };
}
