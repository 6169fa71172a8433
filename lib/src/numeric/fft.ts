/**
 * Complex discrete Fourier transforms on Float64Arrays (planar real/imaginary parts), in place.
 *
 * Convention (the same as numpy.fft): forward X_k = sum_n x_n exp(-2 pi i k n / N), inverse with
 * exp(+2 pi i k n / N) and a factor 1/N. Lengths that are powers of two use fft.js (npm, MIT,
 * radix-4, 5 kB minified, no dependencies, pure JavaScript); other lengths use Bluestein's chirp-z
 * algorithm (hand-written here, a power-of-two convolution through the same fft.js transform).
 * Library or hand-written, by measurement (test/bench/libraries.bench.mjs, interleaved, same
 * accuracy against numpy.fft: max error / sqrt(n) about 5e-16 at n = 1024 and 1e-15 at 65536 for
 * both): our earlier iterative radix-2 Cooley-Tukey (kept in the bench file) took 1.2-1.5 times the
 * time of fft() through fft.js, the copies to and from fft.js's interleaved arrays that our planar,
 * strided API needs included (n = 1024 and 65536, CPU time, two runs on a loaded 2-core machine; a
 * first run through the old lib build measured 2.1-2.8), so the power-of-two path switched to fft.js. Verified against numpy.fft in test/lib/numeric/fft.test.ts.
 * Sources: J. Cooley, J. Tukey, Math. Comp. 19, 297 (1965) (the method of fft.js); L. Bluestein, IEEE Trans. Audio
 * Electroacoust. 18, 451 (1970).
 */
import FFT from "fft.js";
import { InputError } from "../errors.js";

interface Radix2Plan {
  n: number;
  fft: FFT;
  /** interleaved (re, im) input and output of fft.js */
  input: Float64Array;
  output: Float64Array;
}

const radix2Plans = new Map<number, Radix2Plan>();

function isPowerOfTwo(n: number): boolean {
  return n > 0 && (n & (n - 1)) === 0;
}

function radix2Plan(n: number): Radix2Plan {
  let p = radix2Plans.get(n);
  if (p) return p;
  p = { n, fft: new FFT(n), input: new Float64Array(2 * n), output: new Float64Array(2 * n) };
  radix2Plans.set(n, p);
  return p;
}

/**
 * In-place power-of-two transform (n >= 2) of the strided planar data; sign = -1 forward, +1 inverse
 * (unnormalized). fft.js computes the forward transform on interleaved arrays; the inverse is
 * conj(FFT(conj x)), done by negating the imaginary parts on the way in and out (no scaling).
 */
function radix2(re: Float64Array, im: Float64Array, offset: number, stride: number, n: number, sign: number): void {
  const { fft: f, input, output } = radix2Plan(n);
  const s = sign < 0 ? 1 : -1;
  for (let k = 0, a = offset; k < n; k++, a += stride) {
    input[2 * k] = re[a]!;
    input[2 * k + 1] = s * im[a]!;
  }
  f.transform(output, input);
  for (let k = 0, a = offset; k < n; k++, a += stride) {
    re[a] = output[2 * k]!;
    im[a] = s * output[2 * k + 1]!;
  }
}

interface BluesteinPlan {
  n: number;
  m: number;
  /** chirp w_k = exp(-i pi k^2 / n) */
  wr: Float64Array;
  wi: Float64Array;
  /** FFT of the conjugate chirp, padded to m */
  br: Float64Array;
  bi: Float64Array;
  ar: Float64Array;
  ai: Float64Array;
}

const bluesteinPlans = new Map<number, BluesteinPlan>();

function bluesteinPlan(n: number): BluesteinPlan {
  let p = bluesteinPlans.get(n);
  if (p) return p;
  let m = 1;
  while (m < 2 * n - 1) m <<= 1;
  const wr = new Float64Array(n);
  const wi = new Float64Array(n);
  for (let k = 0; k < n; k++) {
    // k^2 mod 2n keeps the angle small and exact for large k.
    const k2 = (k * k) % (2 * n);
    const ang = (Math.PI * k2) / n;
    wr[k] = Math.cos(ang);
    wi[k] = -Math.sin(ang);
  }
  const br = new Float64Array(m);
  const bi = new Float64Array(m);
  br[0] = wr[0]!;
  bi[0] = -wi[0]!;
  for (let k = 1; k < n; k++) {
    br[k] = wr[k]!;
    bi[k] = -wi[k]!;
    br[m - k] = wr[k]!;
    bi[m - k] = -wi[k]!;
  }
  radix2(br, bi, 0, 1, m, -1);
  p = { n, m, wr, wi, br, bi, ar: new Float64Array(m), ai: new Float64Array(m) };
  bluesteinPlans.set(n, p);
  return p;
}

function bluestein(re: Float64Array, im: Float64Array, offset: number, stride: number, n: number, sign: number): void {
  const p = bluesteinPlan(n);
  const { m, wr, br, bi, ar, ai } = p;
  // For the inverse (sign +1) use the conjugate chirp: conj(DFT(conj x)).
  const wi = p.wi;
  const s = sign < 0 ? 1 : -1;
  ar.fill(0);
  ai.fill(0);
  for (let k = 0; k < n; k++) {
    const xr = re[offset + k * stride]!;
    const xi = s * im[offset + k * stride]!;
    ar[k] = xr * wr[k]! - xi * wi[k]!;
    ai[k] = xr * wi[k]! + xi * wr[k]!;
  }
  radix2(ar, ai, 0, 1, m, -1);
  for (let k = 0; k < m; k++) {
    const xr = ar[k]! * br[k]! - ai[k]! * bi[k]!;
    const xi = ar[k]! * bi[k]! + ai[k]! * br[k]!;
    ar[k] = xr;
    ai[k] = xi;
  }
  radix2(ar, ai, 0, 1, m, 1);
  for (let k = 0; k < n; k++) {
    const xr = ar[k]! / m;
    const xi = ai[k]! / m;
    re[offset + k * stride] = xr * wr[k]! - xi * wi[k]!;
    im[offset + k * stride] = s * (xr * wi[k]! + xi * wr[k]!);
  }
}

function transform1d(re: Float64Array, im: Float64Array, offset: number, stride: number, n: number, sign: number): void {
  if (n <= 1) return;
  if (isPowerOfTwo(n)) radix2(re, im, offset, stride, n, sign);
  else bluestein(re, im, offset, stride, n, sign);
}

function checkPair(re: Float64Array, im: Float64Array, n: number): void {
  if (!(re instanceof Float64Array) || !(im instanceof Float64Array)) {
    throw new InputError("re/im", re, "two Float64Arrays (real and imaginary parts)");
  }
  if (re.length !== im.length || re.length !== n) {
    throw new InputError("re/im", `${re.length}/${im.length}`, `real and imaginary parts of length ${n}`);
  }
}

/** Forward DFT of length re.length, in place (numpy.fft.fft convention). Any length >= 1. */
export function fft(re: Float64Array, im: Float64Array): void {
  checkPair(re, im, re.length);
  transform1d(re, im, 0, 1, re.length, -1);
}

/** Inverse DFT in place, normalized by 1/N (numpy.fft.ifft convention). */
export function ifft(re: Float64Array, im: Float64Array): void {
  checkPair(re, im, re.length);
  const n = re.length;
  transform1d(re, im, 0, 1, n, 1);
  for (let i = 0; i < n; i++) {
    re[i] = re[i]! / n;
    im[i] = im[i]! / n;
  }
}

/**
 * 2D DFT in place of an ny x nx array stored row-major (x fastest), numpy.fft.fft2 convention;
 * `inverse` applies the 1/(nx ny) normalization of numpy.fft.ifft2.
 */
export function fft2(re: Float64Array, im: Float64Array, nx: number, ny: number, inverse = false): void {
  if (!Number.isInteger(nx) || nx < 1) throw new InputError("nx", nx, "a positive whole number");
  if (!Number.isInteger(ny) || ny < 1) throw new InputError("ny", ny, "a positive whole number");
  checkPair(re, im, nx * ny);
  const sign = inverse ? 1 : -1;
  for (let j = 0; j < ny; j++) transform1d(re, im, j * nx, 1, nx, sign);
  for (let i = 0; i < nx; i++) transform1d(re, im, i, nx, ny, sign);
  if (inverse) {
    const s = 1 / (nx * ny);
    for (let i = 0; i < re.length; i++) {
      re[i] = re[i]! * s;
      im[i] = im[i]! * s;
    }
  }
}
