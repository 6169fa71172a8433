import { describe, expect, it } from "vitest";
import { gridMagnetostaticEnergy, sampleAxisymmetricTexture, thinFilmKernel, InputError, mu0 } from "@helicoid/lib/internal";

describe("FFT grid magnetostatics", () => {
  it("gives the closed-form energy of a sinusoidal perpendicular stripe pattern", () => {
    // Source: A. Hubert, R. Schaefer, Magnetic Domains (Springer 1998), charge-sheet energy of a
    // periodic surface charge density sigma cos(kx) on a film: E / area = (mu0 Ms^2 t / 4) g(kt).
    const n = 64;
    const cell = 1e-9;
    const t = 2e-9;
    const Ms = 8e5;
    const k = (2 * Math.PI * 4) / (n * cell);
    const mz = new Float64Array(n * n);
    for (let j = 0; j < n; j++) for (let i = 0; i < n; i++) mz[j * n + i] = Math.cos(k * (i + 0.5) * cell);
    const e = gridMagnetostaticEnergy({ nx: n, ny: n, cell, mx: new Float64Array(n * n), my: new Float64Array(n * n), mz }, Ms, t);
    const area = (n * cell) ** 2;
    expect(e.total / area / ((mu0 * Ms * Ms * t * thinFilmKernel(k * t)) / 4)).toBeCloseTo(1, 10);
  });
  it("gives the closed-form energy of an in-plane sinusoidal (charged) modulation", () => {
    // Source: same charge-sheet solution for volume charges -Ms div m uniform in z:
    // m_x = cos(kx) gives E / area = (mu0 Ms^2 t / 4) (1 - g(kt)).
    const n = 64;
    const cell = 1e-9;
    const t = 3e-9;
    const Ms = 8e5;
    const k = (2 * Math.PI * 3) / (n * cell);
    const mx = new Float64Array(n * n);
    for (let j = 0; j < n; j++) for (let i = 0; i < n; i++) mx[j * n + i] = Math.cos(k * (i + 0.5) * cell);
    const e = gridMagnetostaticEnergy({ nx: n, ny: n, cell, mx, my: new Float64Array(n * n), mz: new Float64Array(n * n) }, Ms, t);
    const area = (n * cell) ** 2;
    expect(e.volume / area / ((mu0 * Ms * Ms * t * (1 - thinFilmKernel(k * t))) / 4)).toBeCloseTo(1, 10);
  });
  it("does not modify the texture and rejects bad shapes", () => {
    const tex = sampleAxisymmetricTexture((r) => (r < 5e-9 ? Math.PI : 0), 0, 16, 16, 1e-9);
    const copy = Float64Array.from(tex.mz);
    gridMagnetostaticEnergy(tex, 1e6, 1e-9);
    expect(tex.mz).toEqual(copy);
    expect(() => gridMagnetostaticEnergy({ ...tex, mz: new Float64Array(3) }, 1e6, 1e-9)).toThrow(InputError);
    expect(() => gridMagnetostaticEnergy(tex, 1e6, -1)).toThrow(InputError);
  });
});
