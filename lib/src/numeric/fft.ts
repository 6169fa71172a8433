/**
 * Complex discrete Fourier transforms on Float64Arrays (planar real/imaginary parts), in place.
 *
 * Convention (the same as numpy.fft): forward X_k = sum_n x_n exp(-2 pi i k n / N), inverse with
 * exp(+2 pi i k n / N) and a factor 1/N. Lengths that are powers of two use an iterative radix-2
 * Cooley-Tukey transform; other lengths use Bluestein's chirp-z algorithm (a power-of-two
 * convolution). Hand-written because no TypeScript FFT library is installed in the workspace and
 * `lib` must stay free of Node and DOM dependencies. Verified against numpy.fft in
 * test/lib/numeric/fft.test.ts.
 * Sources: J. Cooley, J. Tukey, Math. Comp. 19, 297 (1965); L. Bluestein, IEEE Trans. Audio
 * Electroacoust. 18, 451 (1970).
 */
import { InputError } from "../errors.js";

interface Radix2Plan {
  n: number;
  rev: Uint32Array;
  cos: Float64Array;
  sin: Float64Array;
}

const radix2Plans = new Map<number, Radix2Plan>();

function isPowerOfTwo(n: number): boolean {
  return n > 0 && (n & (n - 1)) === 0;
}

function radix2Plan(n: number): Radix2Plan {
  let p = radix2Plans.get(n);
  if (p) return p;
  const bits = Math.round(Math.log2(n));
  const rev = new Uint32Array(n);
  for (let i = 0; i < n; i++) {
    let r = 0;
    for (let b = 0; b < bits; b++) r |= ((i >> b) & 1) << (bits - 1 - b);
    rev[i] = r;
  }
  const half = n >> 1;
  const cos = new Float64Array(Math.max(half, 1));
  const sin = new Float64Array(Math.max(half, 1));
  for (let i = 0; i < half; i++) {
    cos[i] = Math.cos((2 * Math.PI * i) / n);
    sin[i] = Math.sin((2 * Math.PI * i) / n);
  }
  p = { n, rev, cos, sin };
  radix2Plans.set(n, p);
  return p;
}

/** In-place radix-2 transform; sign = -1 forward, +1 inverse (unnormalized). */
function radix2(re: Float64Array, im: Float64Array, offset: number, stride: number, n: number, sign: number): void {
  const { rev, cos, sin } = radix2Plan(n);
  for (let i = 0; i < n; i++) {
    const j = rev[i]!;
    if (j > i) {
      const a = offset + i * stride;
      const b = offset + j * stride;
      const tr = re[a]!;
      re[a] = re[b]!;
      re[b] = tr;
      const ti = im[a]!;
      im[a] = im[b]!;
      im[b] = ti;
    }
  }
  for (let size = 2; size <= n; size <<= 1) {
    const halfSize = size >> 1;
    const step = n / size;
    for (let start = 0; start < n; start += size) {
      for (let k = 0; k < halfSize; k++) {
        const wr = cos[k * step]!;
        const wi = sign * sin[k * step]!;
        const a = offset + (start + k) * stride;
        const b = a + halfSize * stride;
        const xr = re[b]! * wr - im[b]! * wi;
        const xi = re[b]! * wi + im[b]! * wr;
        re[b] = re[a]! - xr;
        im[b] = im[a]! - xi;
        re[a] = re[a]! + xr;
        im[a] = im[a]! + xi;
      }
    }
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
