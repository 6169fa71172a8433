/**
 * Brute-force magnetostatic energy of a texture on a 2D grid in a film of thickness t, by FFT.
 * Independent of the axisymmetric Hankel route of magnetostatics.ts: works on Cartesian components
 * of any texture, sampled on a periodic grid, and is used to verify it.
 *
 * Method: thickness-averaged kernel in Fourier space (derivation in magnetostatics.ts):
 *   E_d = (mu0 Ms^2 t / 2) Integral d^2k/(2 pi)^2 [ |m_z(k)|^2 g(kt) + |khat . m_par(k)|^2 (1 - g(kt)) ],
 * discretized on an nx x ny grid of square cells of side h with the DFT (m(k) ~ h^2 FFT(m),
 * d^2k/(2 pi)^2 ~ 1 / (nx ny h^2)):
 *   E_d = (mu0 Ms^2 t / 2) (h^2 / (nx ny)) Sum_k [ |Mz_k|^2 g + |khat . M_k|^2 (1 - g) ].
 * The grid is periodic: choose it several times larger than the texture (the dipolar interaction
 * with periodic images decays as 1 / L^3). Cell-size errors are O(h^2) for smooth textures.
 * Assumptions: continuum magnetization sampled at cell centres, uniform through the thickness.
 */
import { InputError } from "../errors.js";
import { mu0 } from "../quantity/constants.js";
import { fft2 } from "../numeric/fft.js";
import { thinFilmKernel } from "./magnetostatics.js";

/** A texture on a grid: planar components, row-major with x fastest, cell centres at ((i - nx/2 + 1/2) h, ...). */
export interface GridTexture {
  nx: number;
  ny: number;
  /** Cell side h (m). */
  cell: number;
  mx: Float64Array;
  my: Float64Array;
  mz: Float64Array;
}

/** Magnetostatic energy on a grid (J), split as in the Hankel route. */
export interface GridMagnetostaticEnergy {
  /** Full thin-film magnetostatic energy (J). */
  total: number;
  /** Local part (mu0 Ms^2 / 2) t Integral m_z^2 d^2r (J), the part inside K_eff. */
  local: number;
  /** Surface-charge correction beyond the local term (J), <= 0. */
  surface: number;
  /** Volume-charge energy (J), >= 0. */
  volume: number;
  /** surface + volume (J): the non-local correction. */
  nonlocal: number;
}

/** Sample an axisymmetric texture theta(rho), helicity psi (vorticity 1), centred on the grid. */
export function sampleAxisymmetricTexture(theta: (rho: number) => number, psi: number, nx: number, ny: number, cell: number): GridTexture {
  checkGrid(nx, ny, cell);
  const n = nx * ny;
  const mx = new Float64Array(n);
  const my = new Float64Array(n);
  const mz = new Float64Array(n);
  for (let j = 0; j < ny; j++) {
    const y = (j - ny / 2 + 0.5) * cell;
    for (let i = 0; i < nx; i++) {
      const x = (i - nx / 2 + 0.5) * cell;
      const rho = Math.hypot(x, y);
      const th = theta(rho);
      const phi = Math.atan2(y, x) + psi;
      const s = Math.sin(th);
      const k = j * nx + i;
      mx[k] = s * Math.cos(phi);
      my[k] = s * Math.sin(phi);
      mz[k] = Math.cos(th);
    }
  }
  return { nx, ny, cell, mx, my, mz };
}

function checkGrid(nx: number, ny: number, cell: number): void {
  if (!Number.isInteger(nx) || nx < 2) throw new InputError("nx", nx, "a whole number of cells >= 2");
  if (!Number.isInteger(ny) || ny < 2) throw new InputError("ny", ny, "a whole number of cells >= 2");
  if (!(cell > 0)) throw new InputError("cell", cell, "a positive cell size in m");
}

/** Magnetostatic energy of a grid texture (Ms in A/m, t in m) by FFT. The texture is not modified. */
export function gridMagnetostaticEnergy(tex: GridTexture, Ms: number, t: number): GridMagnetostaticEnergy {
  const { nx, ny, cell } = tex;
  checkGrid(nx, ny, cell);
  if (!(Ms > 0)) throw new InputError("Ms", Ms, "a positive saturation magnetization in A/m");
  if (!(t > 0)) throw new InputError("t", t, "a positive thickness in m");
  const n = nx * ny;
  for (const [name, arr] of [
    ["mx", tex.mx],
    ["my", tex.my],
    ["mz", tex.mz],
  ] as const) {
    if (!(arr instanceof Float64Array) || arr.length !== n) throw new InputError(name, arr, `a Float64Array of length nx * ny = ${n}`);
  }
  const zr = Float64Array.from(tex.mz);
  const zi = new Float64Array(n);
  const xr = Float64Array.from(tex.mx);
  const xi = new Float64Array(n);
  const yr = Float64Array.from(tex.my);
  const yi = new Float64Array(n);
  fft2(zr, zi, nx, ny);
  fft2(xr, xi, nx, ny);
  fft2(yr, yi, nx, ny);
  let sumG = 0;
  let sumZ2 = 0;
  let sumS = 0;
  let sumV = 0;
  const dkx = (2 * Math.PI) / (nx * cell);
  const dky = (2 * Math.PI) / (ny * cell);
  for (let j = 0; j < ny; j++) {
    const ky = (j < ny / 2 ? j : j - ny) * dky;
    for (let i = 0; i < nx; i++) {
      const kx = (i < nx / 2 ? i : i - nx) * dkx;
      const idx = j * nx + i;
      const k = Math.hypot(kx, ky);
      const g = thinFilmKernel(k * t);
      const z2 = zr[idx]! * zr[idx]! + zi[idx]! * zi[idx]!;
      sumZ2 += z2;
      sumG += z2 * g;
      sumS += z2 * (g - 1);
      if (k > 0) {
        const pr = (kx * xr[idx]! + ky * yr[idx]!) / k;
        const pi = (kx * xi[idx]! + ky * yi[idx]!) / k;
        const p2 = pr * pr + pi * pi;
        sumG += p2 * (1 - g);
        sumV += p2 * (1 - g);
      }
    }
  }
  const pref = ((mu0 * Ms * Ms * t) / 2) * ((cell * cell) / n);
  return {
    total: pref * sumG,
    local: pref * sumZ2,
    surface: pref * sumS,
    volume: pref * sumV,
    nonlocal: pref * (sumS + sumV),
  };
}
