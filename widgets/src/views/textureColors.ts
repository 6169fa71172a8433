/**
 * Colours and topological charge density of a 2D unit-vector field m(x, y), for the texture view.
 *
 * Field layout: Float32Array (or Float64Array), components interleaved (mx, my, mz), x fastest:
 * index of cell (i, j) = 3 * (j * nx + i).
 *
 * Colour code (ours): m_z is drawn with the "cool to warm" diverging colour map of K. Moreland,
 * "Diverging Color Maps for Scientific Visualization", in Advances in Visual Computing (ISVC 2009),
 * LNCS 5876, pp. 92-103: blue (59, 76, 192) at m_z = -1, a light grey at m_z = 0 and red
 * (180, 4, 38) at m_z = +1, interpolated in his Msh space (polar CIELAB) through an unsaturated
 * midpoint of M = 88, so that lightness rises monotonically from either end to the middle.
 * The in-plane direction is not coded in colour: the view draws arrows on top.
 * The topological charge density has its own panel with a second diverging map made by the same
 * published method between a green and a purple end of our choosing (symmetric about q = 0).
 */
import { triangleSolidAngle } from "@helicoid/lib";
export type Field = Float32Array | Float64Array;
export type RGB = [number, number, number];

// ----- sRGB <-> CIELAB <-> Msh (Moreland 2009, section 4 and appendix) -----

/** D65 reference white, as in Moreland's reference implementation. */
const WHITE: RGB = [0.9505, 1.0, 1.089];

function toLinear(c: number): number {
  return c > 0.04045 ? ((c + 0.055) / 1.055) ** 2.4 : c / 12.92;
}
function fromLinear(c: number): number {
  return c > 0.0031308 ? 1.055 * c ** (1 / 2.4) - 0.055 : 12.92 * c;
}

/** sRGB (0..255) to CIELAB (D65). Source: IEC 61966-2-1 (sRGB) and CIE 15 (CIELAB). */
export function rgbToLab(rgb: RGB): RGB {
  const [r, g, b] = rgb.map((c) => toLinear(c / 255)) as RGB;
  const X = 0.4124 * r + 0.3576 * g + 0.1805 * b;
  const Y = 0.2126 * r + 0.7152 * g + 0.0722 * b;
  const Z = 0.0193 * r + 0.1192 * g + 0.9505 * b;
  const f = (t: number) => (t > 0.008856 ? Math.cbrt(t) : 7.787 * t + 16 / 116);
  const fx = f(X / WHITE[0]),
    fy = f(Y / WHITE[1]),
    fz = f(Z / WHITE[2]);
  return [116 * fy - 16, 500 * (fx - fy), 200 * (fy - fz)];
}

/** CIELAB (D65) to sRGB (0..255, unclamped). */
export function labToRgb(lab: RGB): RGB {
  const [L, a, bb] = lab;
  const fy = (L + 16) / 116,
    fx = fy + a / 500,
    fz = fy - bb / 200;
  const finv = (t: number) => (t ** 3 > 0.008856 ? t ** 3 : (t - 16 / 116) / 7.787);
  const X = WHITE[0] * finv(fx),
    Y = WHITE[1] * finv(fy),
    Z = WHITE[2] * finv(fz);
  const r = 3.2406 * X - 1.5372 * Y - 0.4986 * Z;
  const g = -0.9689 * X + 1.8758 * Y + 0.0415 * Z;
  const b = 0.0557 * X - 0.204 * Y + 1.057 * Z;
  return [fromLinear(r) * 255, fromLinear(g) * 255, fromLinear(b) * 255];
}

function labToMsh([L, a, b]: RGB): RGB {
  const M = Math.hypot(L, a, b);
  return [M, M > 0 ? Math.acos(L / M) : 0, Math.atan2(b, a)];
}
function mshToLab([M, s, h]: RGB): RGB {
  return [M * Math.cos(s), M * Math.sin(s) * Math.cos(h), M * Math.sin(s) * Math.sin(h)];
}

/** Moreland's hue spin when interpolating from a saturated colour to an unsaturated one. */
function adjustHue([M, s, h]: RGB, Munsat: number): number {
  if (M >= Munsat) return h;
  const spin = (s * Math.sqrt(Munsat * Munsat - M * M)) / (M * Math.sin(s));
  return h > -Math.PI / 3 ? h + spin : h - spin;
}

/** Moreland's diverging interpolation between two sRGB end colours, t in [0, 1]; returns sRGB 0..255. */
export function divergingMsh(c1: RGB, c2: RGB, t: number): RGB {
  let m1 = labToMsh(rgbToLab(c1)),
    m2 = labToMsh(rgbToLab(c2));
  let u = t;
  if (m1[1] > 0.05 && m2[1] > 0.05 && Math.abs(angleDiff(m1[2], m2[2])) > Math.PI / 3) {
    const Mmid = Math.max(m1[0], m2[0], 88);
    if (u < 0.5) {
      m2 = [Mmid, 0, 0];
      u = 2 * u;
    } else {
      m1 = [Mmid, 0, 0];
      u = 2 * u - 1;
    }
  }
  if (m1[1] < 0.05 && m2[1] > 0.05) m1 = [m1[0], m1[1], adjustHue(m2, m1[0])];
  else if (m2[1] < 0.05 && m1[1] > 0.05) m2 = [m2[0], m2[1], adjustHue(m1, m2[0])];
  const m: RGB = [(1 - u) * m1[0] + u * m2[0], (1 - u) * m1[1] + u * m2[1], (1 - u) * m1[2] + u * m2[2]];
  return labToRgb(mshToLab(m));
}

function angleDiff(a: number, b: number): number {
  let d = a - b;
  while (d > Math.PI) d -= 2 * Math.PI;
  while (d < -Math.PI) d += 2 * Math.PI;
  return d;
}

/** End colours of Moreland's published "cool to warm" map (his Table / figure of the map). */
export const COOL_WARM_ENDS: [RGB, RGB] = [
  [59, 76, 192],
  [180, 4, 38],
];
/** End colours (ours) of the charge-density map: green for q < 0, purple for q > 0. */
export const CHARGE_ENDS: [RGB, RGB] = [
  [18, 119, 44],
  [137, 78, 165],
];

/** A 256-entry lookup table (RGB bytes, 3 per entry) of a diverging map. */
export function divergingTable(ends: [RGB, RGB], n = 256): Uint8ClampedArray {
  const out = new Uint8ClampedArray(3 * n);
  for (let k = 0; k < n; k++) {
    const c = divergingMsh(ends[0], ends[1], k / (n - 1));
    out[3 * k] = Math.round(c[0]);
    out[3 * k + 1] = Math.round(c[1]);
    out[3 * k + 2] = Math.round(c[2]);
  }
  return out;
}

export const MZ_TABLE = divergingTable(COOL_WARM_ENDS);
export const CHARGE_TABLE = divergingTable(CHARGE_ENDS);

/** Colour of a value v in [lo, hi] from a table (clamped). */
export function tableColour(table: Uint8ClampedArray, v: number, lo: number, hi: number): RGB {
  const n = table.length / 3;
  let k = Math.round(((v - lo) / (hi - lo)) * (n - 1));
  if (!(k >= 0)) k = 0;
  else if (k > n - 1) k = n - 1;
  return [table[3 * k]!, table[3 * k + 1]!, table[3 * k + 2]!];
}

/** Fill `out` (RGBA, nx * ny * 4 bytes, row j at the top when `flipY` is false) with m_z colours. */
export function fillColours(field: Field, nx: number, ny: number, out: Uint8ClampedArray, flipY = true): void {
  const T = MZ_TABLE;
  for (let j = 0; j < ny; j++) {
    const row = flipY ? ny - 1 - j : j;
    let p = row * nx * 4;
    let k = j * nx * 3;
    for (let i = 0; i < nx; i++, k += 3, p += 4) {
      let t = Math.round(((field[k + 2]! + 1) / 2) * 255);
      if (!(t >= 0)) t = 0;
      else if (t > 255) t = 255;
      out[p] = T[3 * t]!;
      out[p + 1] = T[3 * t + 1]!;
      out[p + 2] = T[3 * t + 2]!;
      out[p + 3] = 255;
    }
  }
}

/** Fill RGBA with the charge colours of w x h values, symmetric range [-peak, peak]. */
export function fillCharge(density: Float32Array, w: number, h: number, peak: number, out: Uint8ClampedArray, flipY = true): void {
  const T = CHARGE_TABLE;
  const p0 = peak > 0 ? peak : 1;
  for (let j = 0; j < h; j++) {
    const row = flipY ? h - 1 - j : j;
    for (let i = 0; i < w; i++) {
      let t = Math.round(((density[j * w + i]! / p0 + 1) / 2) * 255);
      if (!(t >= 0)) t = 0;
      else if (t > 255) t = 255;
      const p = (row * w + i) * 4;
      out[p] = T[3 * t]!;
      out[p + 1] = T[3 * t + 1]!;
      out[p + 2] = T[3 * t + 2]!;
      out[p + 3] = 255;
    }
  }
}

/** Signed solid angle of the spherical triangle (a, b, c) of unit vectors: the library's formula. */
function solidAngle(f: Field, a: number, b: number, c: number): number {
  return triangleSolidAngle(f[a]!, f[a + 1]!, f[a + 2]!, f[b]!, f[b + 1]!, f[b + 2]!, f[c]!, f[c + 1]!, f[c + 2]!);
}

/**
 * Topological charge per plaquette ((nx - 1) x (ny - 1) values, x fastest): the signed solid angle
 * of its two triangles over 4 pi. Their sum is the skyrmion number Q = (1/4pi) ∫ m·(∂x m × ∂y m).
 * Source: B. Berg and M. Lüscher, Nucl. Phys. B 190, 412 (1981) (lattice definition of the
 * topological charge from solid angles of triangles).
 */
export function chargeDensity(field: Field, nx: number, ny: number): Float32Array {
  const out = new Float32Array(Math.max(0, nx - 1) * Math.max(0, ny - 1));
  const inv = 1 / (4 * Math.PI);
  for (let j = 0; j + 1 < ny; j++) {
    for (let i = 0; i + 1 < nx; i++) {
      const a = 3 * (j * nx + i),
        b = a + 3,
        d = a + 3 * nx,
        c = d + 3;
      out[j * (nx - 1) + i] = (solidAngle(field, a, b, c) + solidAngle(field, a, c, d)) * inv;
    }
  }
  return out;
}

/** Sum of a density. */
export function total(values: Float32Array): number {
  let s = 0;
  for (let i = 0; i < values.length; i++) s += values[i]!;
  return s;
}

/** Largest |value|. */
export function peakAbs(values: ArrayLike<number>): number {
  let p = 0;
  for (let i = 0; i < values.length; i++) {
    const a = Math.abs(values[i]!);
    if (a > p) p = a;
  }
  return p;
}

/** Arrow step for a decimated arrow overlay: about `target` arrows along the longer side. */
export function arrowStep(nx: number, ny: number, target = 16): number {
  return Math.max(1, Math.round(Math.max(nx, ny) / target));
}

/** "Nice" tick values (1, 2, 5 x 10^k steps) covering [lo, hi] with about `count` ticks. */
export function niceTicks(lo: number, hi: number, count = 5): number[] {
  if (!(hi > lo)) return [lo];
  const raw = (hi - lo) / Math.max(1, count);
  const p = 10 ** Math.floor(Math.log10(raw));
  const f = raw / p;
  const step = (f < 1.5 ? 1 : f < 3.5 ? 2 : f < 7.5 ? 5 : 10) * p;
  const out: number[] = [];
  for (let v = Math.ceil(lo / step - 1e-9) * step; v <= hi + step * 1e-9; v += step) out.push(Math.abs(v) < step * 1e-9 ? 0 : v);
  return out;
}

/** A scale-bar length: the largest 1, 2 or 5 x 10^k not above `max`. */
export function scaleBarLength(max: number): number {
  const p = 10 ** Math.floor(Math.log10(max));
  const f = max / p;
  return (f >= 5 ? 5 : f >= 2 ? 2 : 1) * p;
}
