/**
 * Stray-field models (Fourier space + closed-form step) against a direct real-space sum of 2D
 * dipole fields of the same magnetization: relative agreement 1e-3 of the peak field.
 * Source: the field of a line dipole p (per unit length) in 2D, H = (2 (p.r^) r^ - p) / (2 pi r^2)
 * (J. D. Jackson, Classical Electrodynamics, 3rd ed., problem 5.x in its 2D form; derived from the
 * potential phi = p.r / (2 pi r^2)); an independent route from the surface/volume-charge kernel.
 */
import { describe, it, expect } from "vitest";
import { getProfileModel } from "../../../lib/src/fit/profileModels.js";
import { mu0 } from "../../../lib/src/quantity/constants.js";

const nm = 1e-9;

/** Non-uniform cell edges: fine within +-fine, geometric growth to +-far. */
function edges(center: number, fine: number, dxFine: number, far: number): number[] {
  const e: number[] = [];
  for (let x = -fine; x <= fine + 1e-18; x += dxFine) e.push(center + x);
  let step = dxFine;
  let x = fine;
  const right: number[] = [];
  while (x < far) { step *= 1.04; x += step; right.push(x); }
  return [...right.map((v) => center - v).reverse(), ...e, ...right.map((v) => center + v)];
}

function directField(
  mag: (x: number) => [number, number, number],
  sensors: number[],
  Ms: number,
  h: number,
  t: number,
  center: number,
): { bz: number[]; bx: number[] } {
  const ex = edges(center, 400 * nm, 0.25 * nm, 1);
  const nz = 12;
  const cells: Array<[number, number, number, number]> = []; // x, width, mx, mz
  for (let i = 0; i + 1 < ex.length; i++) {
    const xc = 0.5 * (ex[i] + ex[i + 1]);
    const m = mag(xc);
    cells.push([xc, ex[i + 1] - ex[i], m[0], m[2]]);
  }
  const bz: number[] = [];
  const bx: number[] = [];
  for (const s of sensors) {
    let hz = 0;
    let hx = 0;
    for (let k = 0; k < nz; k++) {
      const zc = -t + (k + 0.5) * (t / nz);
      const dz0 = h - zc;
      for (const [xc, wdt, mx, mz] of cells) {
        const rx = s - xc;
        const rz = dz0;
        const r2 = rx * rx + rz * rz;
        const px = Ms * mx * wdt * (t / nz);
        const pz = Ms * mz * wdt * (t / nz);
        const pr = (px * rx + pz * rz) / r2;
        hx += (2 * pr * rx - px) / (2 * Math.PI * r2);
        hz += (2 * pr * rz - pz) / (2 * Math.PI * r2);
      }
    }
    bz.push(mu0 * hz);
    bx.push(mu0 * hx);
  }
  return { bz, bx };
}

function ours(id: string, x: number[], p: number[]) {
  const model = getProfileModel(id);
  const xs = Float64Array.from(x);
  const pp = Float64Array.from(p);
  const out = new Float64Array(x.length);
  model.bind(xs, pp).model(pp, out);
  return Array.from(out);
}

function maxRel(a: number[], b: number[]) {
  const peak = Math.max(...b.map(Math.abs));
  return Math.max(...a.map((v, i) => Math.abs(v - b[i]))) / peak;
}

const sensors = Array.from({ length: 61 }, (_, i) => (-150 + 5 * i) * nm);
// a data window wider than the sensors so the model grid is representative of a scan
const Ms = 8e5;
const h = 30 * nm;
const t = 2 * nm;

describe("stray field of walls: Fourier model vs direct dipole sum", () => {
  for (const helicity of [0, Math.PI / 2, Math.PI]) {
    it(`180-degree wall, helicity ${helicity.toFixed(3)}: B_z and B_x`, () => {
      const x0 = 4 * nm;
      const Delta = 10 * nm;
      const mag = (x: number): [number, number, number] => {
        const u = (x - x0) / Delta;
        const s = 1 / Math.cosh(u);
        return [-s * Math.cos(helicity), -s * Math.sin(helicity), -Math.tanh(u)];
      };
      const d = directField(mag, sensors, Ms, h, t, x0);
      const p = [x0, Delta, Math.cos(helicity), h, t, Ms, 0, 0];
      expect(maxRel(ours("wall180-bz", sensors, p), d.bz)).toBeLessThan(1e-3);
      expect(maxRel(ours("wall180-bx", sensors, p), d.bx)).toBeLessThan(1e-3);
    });
  }
  for (const helicity of [0, Math.PI / 2]) {
    it(`360-degree wall, helicity ${helicity.toFixed(3)}: B_z and B_x`, () => {
      const x0 = -3 * nm;
      const R = 35 * nm;
      const w = 8 * nm;
      const mag = (x: number): [number, number, number] => {
        const tt = Math.sinh(R / w) / Math.sinh(Math.abs(x - x0) / w);
        const mz = Number.isFinite(tt) ? (1 - tt * tt) / (1 + tt * tt) : -1;
        const s = Number.isFinite(tt) ? Math.sign(x - x0) * (2 * tt) / (1 + tt * tt) : 0;
        return [s * Math.cos(helicity), s * Math.sin(helicity), mz];
      };
      const d = directField(mag, sensors, Ms, h, t, x0);
      const p = [x0, R, w, Math.cos(helicity), h, t, Ms, 0, 0];
      expect(maxRel(ours("wall360-bz", sensors, p), d.bz)).toBeLessThan(1e-3);
      expect(maxRel(ours("wall360-bx", sensors, p), d.bx)).toBeLessThan(1e-3);
    });
  }
  it("Gaussian blur: equals the direct field convolved numerically with the Gaussian", () => {
    const x0 = 0;
    const Delta = 10 * nm;
    const s = 15 * nm;
    const mag = (x: number): [number, number, number] => {
      const u = (x - x0) / Delta;
      return [-1 / Math.cosh(u), 0, -Math.tanh(u)];
    };
    const fine = Array.from({ length: 601 }, (_, i) => (-300 + i) * nm);
    const d = directField(mag, fine, Ms, h, t, x0);
    const targets = Array.from({ length: 41 }, (_, i) => (-100 + 5 * i) * nm);
    // Common practice, no source: trapezoid convolution with a normalized Gaussian (1 nm steps, +-8 s)
    const blurred = targets.map((xt) => {
      let num = 0;
      let den = 0;
      fine.forEach((xf, i) => {
        const g = Math.exp(-0.5 * ((xf - xt) / s) ** 2);
        num += g * d.bz[i];
        den += g;
      });
      return num / den;
    });
    const p = [x0, Delta, 1, h, t, Ms, s, 0];
    expect(maxRel(ours("wall180-bz", targets, p), blurred)).toBeLessThan(1e-3);
  });
});
