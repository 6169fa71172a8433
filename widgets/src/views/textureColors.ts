/**
 * Colours and topological charge density of a 2D unit-vector field m(x, y), for the texture view.
 *
 * Field layout: Float32Array (or Float64Array), components interleaved (mx, my, mz), x fastest:
 * index of cell (i, j) = 3 * (j * nx + i).
 *
 * Colour: hue = in-plane angle atan2(my, mx), lightness = (1 + mz) / 2 (white up, black down),
 * full saturation (common practice in the trade, no source).
 */
export type Field = Float32Array | Float64Array;

/** Fill `out` (RGBA, nx * ny * 4 bytes, row j at the top when `flipY` is false) with the colours. */
export function fillColours(field: Field, nx: number, ny: number, out: Uint8ClampedArray, flipY = true): void {
  for (let j = 0; j < ny; j++) {
    const row = flipY ? ny - 1 - j : j;
    let p = row * nx * 4;
    let k = j * nx * 3;
    for (let i = 0; i < nx; i++, k += 3, p += 4) {
      const mx = field[k]!, my = field[k + 1]!, mz = field[k + 2]!;
      // HSL -> RGB with s = 1: chroma c = 1 - |2L - 1| = 1 - |mz|.
      let L = 0.5 * (1 + mz);
      if (L < 0) L = 0; else if (L > 1) L = 1;
      const c = 1 - Math.abs(2 * L - 1);
      let h = Math.atan2(my, mx) * (3 / Math.PI); // in sextants, -3..3
      if (h < 0) h += 6;
      const x = c * (1 - Math.abs((h % 2) - 1));
      const m = L - c / 2;
      let r = 0, g = 0, b = 0;
      if (h < 1) { r = c; g = x; } else if (h < 2) { r = x; g = c; } else if (h < 3) { g = c; b = x; }
      else if (h < 4) { g = x; b = c; } else if (h < 5) { r = x; b = c; } else { r = c; b = x; }
      out[p] = (r + m) * 255;
      out[p + 1] = (g + m) * 255;
      out[p + 2] = (b + m) * 255;
      out[p + 3] = 255;
    }
  }
}

/** Signed solid angle of the spherical triangle (a, b, c) of unit vectors. */
function solidAngle(f: Field, a: number, b: number, c: number): number {
  const ax = f[a]!, ay = f[a + 1]!, az = f[a + 2]!;
  const bx = f[b]!, by = f[b + 1]!, bz = f[b + 2]!;
  const cx = f[c]!, cy = f[c + 1]!, cz = f[c + 2]!;
  const triple = ax * (by * cz - bz * cy) + ay * (bz * cx - bx * cz) + az * (bx * cy - by * cx);
  const denom = 1 + (ax * bx + ay * by + az * bz) + (bx * cx + by * cy + bz * cz) + (cx * ax + cy * ay + cz * az);
  return 2 * Math.atan2(triple, denom);
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
      const a = 3 * (j * nx + i), b = a + 3, d = a + 3 * nx, c = d + 3;
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

/** Overlay the charge density on RGBA colours: red for positive, blue for negative, alpha ~ |q|. */
export function overlayCharge(density: Float32Array, nx: number, ny: number, out: Uint8ClampedArray, flipY = true): void {
  let peak = 0;
  for (let i = 0; i < density.length; i++) peak = Math.max(peak, Math.abs(density[i]!));
  if (peak === 0) return;
  const w = nx - 1;
  for (let j = 0; j + 1 < ny; j++) {
    const row = flipY ? ny - 1 - j : j;
    for (let i = 0; i < w; i++) {
      const q = density[j * w + i]! / peak;
      const a = Math.min(1, Math.abs(q)) * 0.85;
      if (a < 0.02) continue;
      const p = (row * nx + i) * 4;
      const tr = q > 0 ? 220 : 30, tg = 30, tb = q > 0 ? 30 : 220;
      out[p] = out[p]! * (1 - a) + tr * a;
      out[p + 1] = out[p + 1]! * (1 - a) + tg * a;
      out[p + 2] = out[p + 2]! * (1 - a) + tb * a;
    }
  }
}

/** Arrow step for a decimated arrow overlay: about `target` arrows along the longer side. */
export function arrowStep(nx: number, ny: number, target = 24): number {
  return Math.max(1, Math.round(Math.max(nx, ny) / target));
}
