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
const SAMPLE_COS = new Float64Array(SAMPLES);
const SAMPLE_SIN = new Float64Array(SAMPLES);
for (let i = 0; i < SAMPLES; i++) {
  SAMPLE_COS[i] = Math.cos((2 * Math.PI * i) / SAMPLES);
  SAMPLE_SIN[i] = Math.sin((2 * Math.PI * i) / SAMPLES);
}

/** Refine an extremum near phi by Newton on p' (bisection-safeguarded within two sample spacings). */
function refine(p: Trig2, phi: number): number {
  const hw = Math.PI / SAMPLES; // half the sample spacing
  let lo = phi - 2 * hw;
  let hi = phi + 2 * hw;
  let x = phi;
  const dlo = trig2Derivative(p, lo);
  for (let it = 0; it < 60; it++) {
    const d = trig2Derivative(p, x);
    const dd = trig2Second(p, x);
    let xn = dd !== 0 ? x - d / dd : NaN;
    if (!(xn > lo && xn < hi)) xn = 0.5 * (lo + hi);
    const dn = trig2Derivative(p, xn);
    if (Math.sign(dn) === Math.sign(dlo)) lo = xn;
    else hi = xn;
    if (Math.abs(xn - x) < 1e-15 * Math.max(1, Math.abs(x))) return xn;
    x = xn;
  }
  return x;
}

/** A critical point of p: angle in [0, 2 pi) (approximately), value, and whether it is a maximum. */
export interface Trig2Critical {
  phi: number;
  value: number;
  max: boolean;
}

/**
 * All local extrema of p over a period, in increasing angle (at most four for degree two). Sampling at
 * 96 tabulated angles brackets each of them; each is refined by Newton on p'. A constant p has none.
 */
export function trig2Critical(p: Trig2): Trig2Critical[] {
  const vals = new Float64Array(SAMPLES);
  for (let i = 0; i < SAMPLES; i++) {
    const c = SAMPLE_COS[i]!;
    const s = SAMPLE_SIN[i]!;
    vals[i] = p[0] + p[1] * c + p[2] * s + p[3] * (c * c - s * s) + p[4] * 2 * s * c;
  }
  const out: Trig2Critical[] = [];
  if (p[1] === 0 && p[2] === 0 && p[3] === 0 && p[4] === 0) return out;
  for (let i = 0; i < SAMPLES; i++) {
    const prev = vals[(i + SAMPLES - 1) % SAMPLES]!;
    const next = vals[(i + 1) % SAMPLES]!;
    const v = vals[i]!;
    const isMax = v >= prev && v > next;
    const isMin = v <= prev && v < next;
    if (!isMax && !isMin) continue;
    const phi = (2 * Math.PI * i) / SAMPLES;
    const x = refine(p, phi);
    const fx = trig2(p, x);
    const better = isMax ? fx >= v : fx <= v;
    out.push({ phi: better ? x : phi, value: better ? fx : v, max: isMax });
  }
  return out;
}

/** Largest and smallest value of p over a period, with where they are. */
export function trig2Extremes(p: Trig2, critical: Trig2Critical[] = trig2Critical(p)): Trig2Extremes {
  if (critical.length === 0) return { max: p[0], argMax: 0, min: p[0], argMin: 0 };
  let max = -Infinity,
    argMax = 0,
    min = Infinity,
    argMin = 0;
  for (const c of critical) {
    if (c.value > max) {
      max = c.value;
      argMax = c.phi;
    }
    if (c.value < min) {
      min = c.value;
      argMin = c.phi;
    }
  }
  return { max, argMax, min, argMin };
}
