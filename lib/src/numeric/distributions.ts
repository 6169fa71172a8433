/**
 * Quantiles for confidence intervals: standard normal (P. Acklam's rational approximation refined
 * by one Halley step on erfc) and Student's t (inverse of the regularized incomplete beta function,
 * continued fraction by the modified Lentz method). Sources: M. Abramowitz, I. Stegun, *Handbook of
 * Mathematical Functions* (1964), 26.5.27 and 26.7.1; W. Press et al., *Numerical Recipes* (3rd
 * ed., 2007), section 6.4 (method, our code). Checked against scipy.stats in the tests.
 */

/**
 * Complementary error function. Relative error (against mpmath at 40 digits, 4000 points on [-6, 27]
 * and both sides of every table centre; test/lib/numeric/distributions.test.ts): below 3e-16 for x < 6,
 * below 1.5e-15 for 6 <= x < 26.55, then 0
 * (underflow). Method: for 0 <= x < 6, a Taylor polynomial of degree 17 about the nearest centre
 * x0 = k / 8, with erfc^(n)(x0) = (-1)^n (2 / sqrt pi) H_{n-1}(x0) exp(-x0^2) (Hermite polynomials,
 * A&S 7.1.19 and 7.2.9; coefficients built once, lazily) and the tabulated centre values erfc(x0)
 * (49 constants, correctly rounded, tabulated with mpmath); for x >= 6 the continued fraction
 * (A&S 7.1.14, modified Lentz), which converges there in a few dozen terms, with exp(-x^2) free of
 * the rounding of x^2. Negative x: 2 - erfc(-x).
 * Replaces an erf series used up to x = 2.5 whose 1 - erf cancellation limited erfc to about 1e-12
 * relative near 2.5 (the earlier header claimed 1e-15). Library comparison (test/bench/
 * libraries.bench.mjs): @stdlib/math-base-special-erfc is accurate to 1 ulp but slower, and weighs
 * about 34 kB minified in the page bundle; this one is kept.
 */
const ERFC_STEP = 0.125;
const ERFC_CENTRES = 49; // x0 = 0, 1/8, ..., 6
const ERFC_DEG = 17;
let erfcTable: Float64Array | null = null;
/** erfc(k / 8), k = 0 ... 48, correctly rounded (tabulated with mpmath at 40 digits). */
const ERFC_AT_CENTRES = [
  1.0, 0.8596837951986662, 0.7236736098317631, 0.5958830905651777, 0.4795001221869535, 0.376759117811582, 0.28884436634648486, 0.21592493894014034, 0.15729920705028513,
  0.11161176829829224, 0.07709987174354177, 0.051829927217909674, 0.033894853524689274, 0.021556266760016336, 0.013328328780817557, 0.00800994232988003, 0.004677734981047266,
  0.0026540293594823415, 0.0014627165866811518, 0.0007829382178911192, 0.0004069520174449589, 0.00020537573614121745, 0.00010062192211963683, 4.785483974377341e-5,
  2.209049699858544e-5, 9.89673462524562e-6, 4.302779463675122e-6, 1.8152814274403558e-6, 7.430983723414128e-7, 2.951401925115699e-7, 1.1372725656979665e-7, 4.2513944082491124e-8,
  1.541725790028002e-8, 5.423400799565066e-9, 1.8505741373867425e-9, 6.12483295356936e-10, 1.9661604415428876e-10, 6.121610513034226e-11, 1.8485047721485312e-11,
  5.413406466297941e-12, 1.537459794428035e-12, 4.234563376336224e-13, 1.1310313266887154e-13, 2.9294885544871546e-14, 7.357847917974398e-15, 1.7920200056510066e-15,
  4.232136617425738e-16, 9.691555645277176e-17, 2.1519736712498913e-17,
];

function erfcContinuedFraction(x: number, maxTerms: number): number {
  // A&S 7.1.14: erfc x = exp(-x^2) / sqrt(pi) / (x + (1/2) / (x + 1 / (x + (3/2) / (x + ...)))), modified Lentz
  const tiny = 1e-300;
  let fr = x;
  let C = x;
  let D = 0;
  for (let n = 1; n < maxTerms; n++) {
    const a = n / 2;
    D = x + a * D;
    D = D === 0 ? tiny : D;
    C = x + a / C;
    C = C === 0 ? tiny : C;
    D = 1 / D;
    const delta = C * D;
    fr *= delta;
    if (Math.abs(delta - 1) < 2e-17) break;
  }
  return expMinusSquare(x) / (fr * Math.sqrt(Math.PI));
}

/** exp(-x^2) without the rounding of x^2 (x^2 = hi + lo exactly by Dekker's split; relative error of
 * exp(-hi) alone would be x^2 times an ulp: 7e-14 at x = 25). */
function expMinusSquare(x: number): number {
  const c = 134217729 * x; // 2^27 + 1
  const xh = c - (c - x);
  const xl = x - xh;
  const hi = x * x;
  const lo = xh * xh - hi + 2 * xh * xl + xl * xl;
  return Math.exp(-hi) * (1 - lo);
}

function buildErfcTable(): Float64Array {
  const t = new Float64Array(ERFC_CENTRES * (ERFC_DEG + 1));
  for (let k = 0; k < ERFC_CENTRES; k++) {
    const x0 = k * ERFC_STEP;
    const base = k * (ERFC_DEG + 1);
    t[base] = ERFC_AT_CENTRES[k]!;
    // c_n = erfc^(n)(x0) / n! = (-1)^n (2 / sqrt pi) exp(-x0^2) H_{n-1}(x0) / n!
    const g = (2 / Math.sqrt(Math.PI)) * Math.exp(-x0 * x0);
    let hPrev = 0; // H_{-1} (unused)
    let h = 1; // H_0
    let fact = 1;
    for (let n = 1; n <= ERFC_DEG; n++) {
      fact *= n;
      t[base + n] = ((n % 2 === 0 ? 1 : -1) * g * h) / fact;
      // H_n = 2 x H_{n-1} - 2 (n - 1) H_{n-2}
      const hNext = 2 * x0 * h - 2 * (n - 1) * hPrev;
      hPrev = h;
      h = hNext;
    }
  }
  return t;
}

/** Complementary error function erfc(x) = 1 - erf(x) (see the notes above). */
export function erfc(x: number): number {
  if (Number.isNaN(x)) return NaN;
  if (x < 0) return 2 - erfc(-x);
  if (x < 6) {
    const t = erfcTable ?? (erfcTable = buildErfcTable());
    const k = Math.round(x / ERFC_STEP);
    const h = x - k * ERFC_STEP;
    const base = k * (ERFC_DEG + 1);
    let s = t[base + ERFC_DEG]!;
    for (let n = ERFC_DEG - 1; n >= 0; n--) s = s * h + t[base + n]!;
    return s;
  }
  if (x > 26.55) return 0;
  return erfcContinuedFraction(x, 300);
}

/** Standard normal quantile z(p). Error below 2e-16 relative to max(|z|, 1) for p from 1e-300 to
 * 1 - 1e-16 (against mpmath, test/lib/numeric/distributions.test.ts). Kept over
 * @stdlib/stats-base-dists-normal-quantile (test/bench/libraries.bench.mjs): that one is faster but
 * returns -Infinity below p of about 1e-100. */
export function normalQuantile(p: number): number {
  if (!(p > 0 && p < 1)) throw new RangeError(`normalQuantile: p = ${p} must be in (0, 1)`);
  // upper half by symmetry: 1 - p is exact there (Sterbenz), while 0.5 erfc(-x / sqrt 2) - p near 1
  // would lose the digits of the tail (error 1e-10 at p = 1 - 1e-8)
  if (p > 0.5) return -normalQuantile(1 - p);
  const a = [-3.969683028665376e1, 2.209460984245205e2, -2.759285104469687e2, 1.38357751867269e2, -3.066479806614716e1, 2.506628277459239];
  const b = [-5.447609879822406e1, 1.615858368580409e2, -1.556989798598866e2, 6.680131188771972e1, -1.328068155288572e1];
  const c = [-7.784894002430293e-3, -3.223964580411365e-1, -2.400758277161838, -2.549732539343734, 4.374664141464968, 2.938163982698783];
  const d = [7.784695709041462e-3, 3.224671290700398e-1, 2.445134137142996, 3.754408661907416];
  const pl = 0.02425;
  let x: number;
  if (p < pl) {
    const q = Math.sqrt(-2 * Math.log(p));
    x = (((((c[0]! * q + c[1]!) * q + c[2]!) * q + c[3]!) * q + c[4]!) * q + c[5]!) / ((((d[0]! * q + d[1]!) * q + d[2]!) * q + d[3]!) * q + 1);
  } else if (p <= 1 - pl) {
    const q = p - 0.5;
    const r = q * q;
    x = ((((((a[0]! * r + a[1]!) * r + a[2]!) * r + a[3]!) * r + a[4]!) * r + a[5]!) * q) / (((((b[0]! * r + b[1]!) * r + b[2]!) * r + b[3]!) * r + b[4]!) * r + 1);
  } else {
    const q = Math.sqrt(-2 * Math.log(1 - p));
    x = -(((((c[0]! * q + c[1]!) * q + c[2]!) * q + c[3]!) * q + c[4]!) * q + c[5]!) / ((((d[0]! * q + d[1]!) * q + d[2]!) * q + d[3]!) * q + 1);
  }
  // one Halley refinement
  const e = 0.5 * erfc(-x / Math.SQRT2) - p;
  const u = e * Math.sqrt(2 * Math.PI) * Math.exp((x * x) / 2);
  return x - u / (1 + (x * u) / 2);
}

function logGamma(x: number): number {
  // Lanczos approximation (g = 7, n = 9)
  const g = 7;
  const coef = [
    0.99999999999980993, 676.5203681218851, -1259.1392167224028, 771.32342877765313, -176.61502916214059, 12.507343278686905, -0.13857109526572012, 9.9843695780195716e-6,
    1.5056327351493116e-7,
  ];
  if (x < 0.5) return Math.log(Math.PI / Math.abs(Math.sin(Math.PI * x))) - logGamma(1 - x);
  x -= 1;
  let a = coef[0]!;
  const t = x + g + 0.5;
  for (let i = 1; i < g + 2; i++) a += coef[i]! / (x + i);
  return 0.5 * Math.log(2 * Math.PI) + (x + 0.5) * Math.log(t) - t + Math.log(a);
}

function betaContinuedFraction(a: number, b: number, x: number): number {
  const tiny = 1e-300;
  let c = 1;
  let d = 1 - ((a + b) * x) / (a + 1);
  if (Math.abs(d) < tiny) d = tiny;
  d = 1 / d;
  let h = d;
  for (let m = 1; m <= 1000; m++) {
    const m2 = 2 * m;
    let aa = (m * (b - m) * x) / ((a + m2 - 1) * (a + m2));
    d = 1 + aa * d;
    if (Math.abs(d) < tiny) d = tiny;
    c = 1 + aa / c;
    if (Math.abs(c) < tiny) c = tiny;
    d = 1 / d;
    h *= d * c;
    aa = (-(a + m) * (a + b + m) * x) / ((a + m2) * (a + m2 + 1));
    d = 1 + aa * d;
    if (Math.abs(d) < tiny) d = tiny;
    c = 1 + aa / c;
    if (Math.abs(c) < tiny) c = tiny;
    d = 1 / d;
    const del = d * c;
    h *= del;
    if (Math.abs(del - 1) < 1e-16) break;
  }
  return h;
}

/** Regularized incomplete beta I_x(a, b). */
export function incompleteBeta(x: number, a: number, b: number): number {
  if (x <= 0) return 0;
  if (x >= 1) return 1;
  const lbt = logGamma(a + b) - logGamma(a) - logGamma(b) + a * Math.log(x) + b * Math.log(1 - x);
  const bt = Math.exp(lbt);
  if (x < (a + 1) / (a + b + 2)) return (bt * betaContinuedFraction(a, b, x)) / a;
  return 1 - (bt * betaContinuedFraction(b, a, 1 - x)) / b;
}

/** Student t cumulative distribution with nu degrees of freedom. */
export function studentTCdf(t: number, nu: number): number {
  const x = nu / (nu + t * t);
  const tail = 0.5 * incompleteBeta(x, nu / 2, 0.5);
  return t > 0 ? 1 - tail : tail;
}

/** Student t quantile t_p(nu) (nu may be fractional; nu = Infinity gives the normal quantile).
 * Error relative to max(|t|, 1), against mpmath (test/lib/numeric/distributions.test.ts): below 1e-12 for
 * nu <= 1000, 7e-10 at nu = 1e6 (the incomplete beta near x = 1 loses digits).
 * @stdlib/stats-base-dists-t-quantile is faster (about 3 times) and accurate to 4e-16, but weighs about
 * 190 kB minified (its dependency tree) in the page bundle, where the fits run; kept ours
 * (test/bench/libraries.bench.mjs). */
export function studentTQuantile(p: number, nu: number): number {
  if (!(p > 0 && p < 1)) throw new RangeError(`studentTQuantile: p = ${p} must be in (0, 1)`);
  if (!(nu > 0)) throw new RangeError(`studentTQuantile: nu = ${nu} must be positive`);
  if (p > 0.5) return -studentTQuantile(1 - p, nu); // symmetry; 1 - p is exact for p > 0.5
  const z = normalQuantile(p);
  if (!Number.isFinite(nu) || nu > 1e7) return z;
  // start from the Cornish-Fisher expansion, then Newton on the CDF (density in closed form)
  let t = z + (z ** 3 + z) / (4 * nu) + (5 * z ** 5 + 16 * z ** 3 + 3 * z) / (96 * nu * nu);
  const logc = logGamma((nu + 1) / 2) - logGamma(nu / 2) - 0.5 * Math.log(nu * Math.PI);
  for (let i = 0; i < 60; i++) {
    const f = studentTCdf(t, nu) - p;
    const dens = Math.exp(logc - ((nu + 1) / 2) * Math.log(1 + (t * t) / nu));
    const step = f / dens;
    t -= Math.abs(step) > 1 + Math.abs(t) ? Math.sign(step) * (1 + Math.abs(t)) * 0.5 : step;
    if (Math.abs(step) < 1e-14 * Math.max(1, Math.abs(t))) break;
  }
  return t;
}
