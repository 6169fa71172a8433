import { describe, expect, it } from "vitest";
import {
  makeFilm,
  effectiveAnisotropy,
  wallWidthParameter,
  wallAngle,
  wallMagnetization,
  wallWidths,
  wallProfile,
  dmiWallEnergy,
  dmiFavouredHelicity,
  chiralWallEnergy,
  neelWallChargeEnergy,
  wallEnergyOfHelicity,
  equilibriumWall,
  helicities,
  InputError,
  mu0,
  type Film,
} from "@helicoid/lib/internal";
import { runPython } from "../../helpers/python.js";

// Invented film (numbers only).
const film = makeFilm({ Ms: 1.1e6, A: 15e-12, Ku: 1.2e6, D: 1.5e-3, t: 1e-9 });
const Keff = effectiveAnisotropy(film);
const Delta = wallWidthParameter(film);

/** 5-point central difference of a vector function of x. */
function derivative(m: (x: number) => number[], x: number, h: number): number[] {
  const a = m(x - 2 * h),
    b = m(x - h),
    c = m(x + h),
    d = m(x + 2 * h);
  return a.map((_, i) => (a[i]! - 8 * b[i]! + 8 * c[i]! - d[i]!) / (12 * h));
}

/**
 * Numerical 1D energy per unit wall area (J/m^2): exchange A |m'|^2 + K_eff (1 - m_z^2) + DMI density,
 * with derivatives by finite differences of the magnetization (independent of the library's formulas)
 * and the trapezoid rule (spectrally accurate for these smooth, exponentially decaying integrands).
 */
function energyFunctional(f: Film, m: (x: number) => number[], span: number, n: number) {
  const K = effectiveAnisotropy(f);
  const h = (2 * span) / n;
  const dh = span * 1e-5;
  let ex = 0,
    an = 0,
    dmi = 0;
  for (let i = 0; i <= n; i++) {
    const x = -span + i * h;
    const w = i === 0 || i === n ? 0.5 : 1;
    const v = m(x);
    const dv = derivative(m, x, dh);
    ex += w * f.A * (dv[0]! ** 2 + dv[1]! ** 2 + dv[2]! ** 2);
    an += w * K * (1 - v[2]! ** 2);
    // Interfacial: D [m_z div m - (m . grad) m_z] with div m = d_x m_x and (m . grad) m_z = m_x d_x m_z.
    // Bulk: D m . curl m with curl m = (0, -d_x m_z, d_x m_y).
    dmi += w * f.D * (f.dmi === "interfacial" ? v[2]! * dv[0]! - v[0]! * dv[2]! : -v[1]! * dv[2]! + v[2]! * dv[1]!);
  }
  return { exchange: ex * h, anisotropy: an * h, dmi: dmi * h, total: (ex + an + dmi) * h };
}

describe("180-degree wall energy", () => {
  it("integrating the energy functional over the exact profile gives 4 sqrt(A K_eff) - pi |D|", () => {
    const m = (x: number) => wallMagnetization(x, Delta, helicities.neelTowardUp);
    const e = energyFunctional(film, m, 40 * Delta, 8000);
    // Source: Hubert and Schaefer (1998): exchange = anisotropy = 2 sqrt(A K_eff) for the exact profile;
    // Thiaville et al., EPL 100, 57002 (2012): sigma = 4 sqrt(A K_eff) - pi |D| for the DMI-favoured Neel wall.
    const sigma = 4 * Math.sqrt(film.A * Keff) - Math.PI * Math.abs(film.D);
    expect(Math.abs(e.exchange / (2 * Math.sqrt(film.A * Keff)) - 1)).toBeLessThan(1e-8);
    expect(Math.abs(e.anisotropy / (2 * Math.sqrt(film.A * Keff)) - 1)).toBeLessThan(1e-8);
    expect(Math.abs(e.total / sigma - 1)).toBeLessThan(1e-8);
    expect(Math.abs(chiralWallEnergy(film) / sigma - 1)).toBeLessThan(1e-14);
  });

  it("the sign of D selects the chirality: numerical DMI density for both helicities (interfacial and bulk)", () => {
    const cases: Array<[Film, number, number]> = [];
    for (const D of [1.5e-3, -1.5e-3]) {
      for (const dmi of ["interfacial", "bulk"] as const) {
        const f = makeFilm({ Ms: 1.1e6, A: 15e-12, Ku: 1.2e6, D, dmi, t: 1e-9 });
        for (const g of [0, Math.PI, Math.PI / 2, -Math.PI / 2, 0.7]) cases.push([f, g, 0]);
      }
    }
    for (const [f, g] of cases) {
      const e = energyFunctional(f, (x) => wallMagnetization(x, Delta, g), 40 * Delta, 4000);
      // Source: our derivation (module comment): interfacial -pi D cos(gamma), bulk -pi D sin(gamma);
      // here checked against the energy densities of lib/src/walls/README.md evaluated numerically.
      expect(e.dmi).toBeCloseTo(dmiWallEnergy(f, g), 12);
    }
    // D > 0, interfacial: the favoured Neel wall's central moment points toward the up domain (x < 0).
    const fav = dmiFavouredHelicity(film)!;
    expect(fav).toBe(0);
    expect(wallMagnetization(0, Delta, fav)[0]).toBeCloseTo(-1, 15);
    expect(wallMagnetization(-10 * Delta, Delta, fav)[2]).toBeGreaterThan(0.999);
    const e0 = energyFunctional(film, (x) => wallMagnetization(x, Delta, 0), 40 * Delta, 4000).dmi;
    const ePi = energyFunctional(film, (x) => wallMagnetization(x, Delta, Math.PI), 40 * Delta, 4000).dmi;
    expect(e0).toBeLessThan(0);
    expect(ePi).toBeGreaterThan(0);
    const neg = makeFilm({ ...film, D: -film.D });
    expect(dmiFavouredHelicity(neg)).toBe(Math.PI);
    expect(dmiFavouredHelicity(makeFilm({ ...film, dmi: "bulk" }))).toBe(Math.PI / 2);
    expect(dmiFavouredHelicity(makeFilm({ ...film, D: 0 }))).toBeNull();
  });

  it("the profile solves the 1D Euler-Lagrange equation 2A theta'' = 2 K_eff sin theta cos theta", () => {
    // Source: Landau and Lifshitz (1935); Hubert and Schaefer (1998), the 1D wall equation.
    const h = Delta * 1e-3;
    let worst = 0;
    for (let x = -8 * Delta; x <= 8 * Delta; x += Delta / 7) {
      const th = (y: number) => wallAngle(y, Delta);
      const d2 = (-th(x + 2 * h) + 16 * th(x + h) - 30 * th(x) + 16 * th(x - h) - th(x - 2 * h)) / (12 * h * h);
      const residual = 2 * film.A * d2 - 2 * Keff * Math.sin(th(x)) * Math.cos(th(x));
      worst = Math.max(worst, Math.abs(residual) / (2 * Keff));
    }
    expect(worst).toBeLessThan(1e-6);
  });

  it("the equilibrium width minimizes the energy of trial profiles", () => {
    // Trial family theta = 2 arctan(exp(x / delta)): golden-section search of the numerical energy.
    const E = (delta: number) => energyFunctional(film, (x) => wallMagnetization(x, delta, 0), 40 * Math.max(delta, Delta), 6000).total;
    let a = 0.3 * Delta,
      b = 3 * Delta;
    const gr = (Math.sqrt(5) - 1) / 2;
    for (let i = 0; i < 60; i++) {
      const c = b - gr * (b - a),
        d = a + gr * (b - a);
      if (E(c) < E(d)) b = d;
      else a = c;
    }
    // Source: Hubert and Schaefer (1998): E(delta) = 2A/delta + 2 K_eff delta - pi D, minimal at delta = Delta.
    expect((a + b) / 2 / Delta).toBeCloseTo(1, 5);
    // A different family (erf ramp) cannot beat the exact profile.
    const erf = (z: number) => {
      // erf by the midpoint rule: any smooth ramp serves as a trial profile, exactness is not needed.
      let s = 0;
      const n = 400;
      for (let i = 0; i < n; i++) {
        const u = ((i + 0.5) * z) / n;
        s += Math.exp(-u * u);
      }
      return ((2 / Math.sqrt(Math.PI)) * s * z) / n;
    };
    let bestErf = Infinity;
    for (const delta of [0.8, 1, 1.2, 1.4, 1.6].map((k) => k * Delta)) {
      const mErf = (x: number) => {
        const th = (Math.PI / 2) * (1 + erf(x / delta));
        return [-Math.sin(th), 0, Math.cos(th)];
      };
      bestErf = Math.min(bestErf, energyFunctional(film, mErf, 12 * Delta, 1500).total);
    }
    expect(bestErf).toBeGreaterThan(chiralWallEnergy(film));
    expect(bestErf).toBeLessThan(1.1 * chiralWallEnergy(film));
  });
});

describe("width conventions", () => {
  it("each named width matches its definition on the profile", () => {
    const w = wallWidths(film);
    // Source: Hubert and Schaefer (1998): Lilley width pi Delta (tangent of theta at the centre).
    expect(w.lilleyWidth).toBeCloseTo(Math.PI * Delta, 20);
    // Independent checks by bisection / quadrature on the sampled profile. Common practice, no source.
    const bisect = (g: (x: number) => number, lo: number, hi: number) => {
      for (let i = 0; i < 200; i++) {
        const m = (lo + hi) / 2;
        if (g(lo) * g(m) <= 0) hi = m;
        else lo = m;
      }
      return (lo + hi) / 2;
    };
    const mz = (x: number) => wallMagnetization(x, Delta, 0)[2];
    const inPlane = (x: number) => Math.hypot(wallMagnetization(x, Delta, 0)[0], wallMagnetization(x, Delta, 0)[1]);
    expect((2 * bisect((x) => mz(x) + 0.8, 0, 10 * Delta)) / w.mz10to90Width).toBeCloseTo(1, 12);
    expect((2 * bisect((x) => inPlane(x) - 0.5, 0, 10 * Delta)) / w.inPlaneFwhm).toBeCloseTo(1, 12);
    const h = 1e-4 * Delta;
    expect(2 / Math.abs((mz(h) - mz(-h)) / (2 * h)) / w.mzSlopeWidth).toBeCloseTo(1, 7);
    let integral = 0;
    for (let x = -40 * Delta; x <= 40 * Delta; x += Delta / 20) integral += ((1 - mz(x) ** 2) * Delta) / 20;
    expect(integral / w.integralWidth).toBeCloseTo(1, 10);
  });
  it("samples a profile for plots and refuses an in-plane film", () => {
    const p = wallProfile(Delta, 0, 11);
    expect(p.x.length).toBe(11);
    expect(p.mz[5]).toBeCloseTo(0, 15);
    expect(p.mz[0]).toBeCloseTo(Math.tanh(5), 12);
    expect(() => wallWidths(makeFilm({ ...film, Ku: 0.5e6 }))).toThrow(InputError);
  });
});

describe("Neel wall volume charges and the wall type", () => {
  it("the full-kernel Neel charge energy reduces to (ln 2 / pi) mu0 Ms^2 t for t << Delta and mu0 Ms^2 Delta for t >> Delta", () => {
    // Source: thin-film limit = demagnetizing factor t ln2 / (pi Delta) of Tarasenko et al., JMMM 189, 19 (1998)
    // (from memory, re-derived in the module); thick limit = bulk Neel wall (1/2) mu0 Ms^2 Integral m_x^2 dx.
    const thin = makeFilm({ ...film, t: 1e-12 });
    const ratio = neelWallChargeEnergy(thin, "full-kernel") / neelWallChargeEnergy(thin, "thin-film");
    expect(ratio).toBeCloseTo(1, 4);
    // Our derivation: next order 1 - g = z/2 - z^2/6 and Integral u^2 sech^2 u du = pi^2/12 give
    // C / C_thin = 1 - pi t / (18 ln2 Delta) + O(t^2).
    expect(Math.abs(ratio - (1 - (Math.PI * thin.t) / (18 * Math.LN2 * Delta)))).toBeLessThan(1e-8);
    const thick = makeFilm({ ...film, t: 0.1 });
    expect(neelWallChargeEnergy(thick, "full-kernel") / (mu0 * film.Ms ** 2 * Delta)).toBeCloseTo(1, 5);
  });

  it("agrees with an FFT of the sampled m_x profile and the thin-film kernel (numpy)", () => {
    const ts = [0.5e-9, 1e-9, 3e-9, 10e-9];
    const ours = ts.map((t) => neelWallChargeEnergy(makeFilm({ ...film, t }), "full-kernel"));
    // Source: numpy FFT of m_x = sech(x/Delta) on a grid; energy (mu0 Ms^2/2) Sum |m_k|^2 (1 - g(|k| t)) dk / 2pi.
    const ref = runPython<number[]>(
      `import json,sys,numpy as np
d=json.load(sys.stdin); D=d['Delta']; Ms=d['Ms']; mu0=d['mu0']
n=2**20; L=16000*D; x=(np.arange(n)-n//2)*(L/n); mx=1/np.cosh(x/D)
mk=np.fft.fft(mx)*(L/n); k=2*np.pi*np.fft.fftfreq(n, L/n)
out=[]
for t in d['ts']:
    z=np.abs(k)*t
    g=np.where(z>0, -np.expm1(-z)/np.where(z>0,z,1), 1.0)
    out.append(float(0.5*mu0*Ms**2*np.sum(np.abs(mk)**2*(1-g))*(2*np.pi/L)/(2*np.pi)))
print(json.dumps(out))`,
      { Delta, Ms: film.Ms, mu0, ts },
    );
    ts.forEach((_, i) => expect(Math.abs(ours[i]! / ref[i]! - 1)).toBeLessThan(1e-6));
  });

  it("minimizing over the helicity: Neel above D_N, intermediate below, Bloch without DMI or with bulk DMI", () => {
    const thinDN = (2 * Math.LN2 * mu0 * film.Ms ** 2 * film.t) / Math.PI ** 2; // From memory (lib/src/material/README.md).
    for (const [D, expected] of [
      [0, "Bloch"],
      [0.5 * thinDN, "intermediate"],
      [1.01 * thinDN, "Neel"],
      [-3 * thinDN, "Neel"],
    ] as const) {
      const f = makeFilm({ ...film, D });
      const w = equilibriumWall(f, "thin-film");
      expect(w.character).toBe(expected);
      expect(w.neelThreshold).toBeCloseTo(thinDN, 15);
      // brute-force scan of sigma(gamma). Common practice, no source.
      let best = Infinity;
      for (let i = 0; i <= 20000; i++) best = Math.min(best, wallEnergyOfHelicity(f, (2 * Math.PI * i) / 20000, "thin-film"));
      expect(w.energy).toBeLessThanOrEqual(best + 1e-15);
      expect(best - w.energy).toBeLessThan(1e-9 * Math.abs(best));
    }
    expect(equilibriumWall(makeFilm({ ...film, D: 0.5 * thinDN })).cosHelicity).toBeCloseTo(0.5, 12);
    expect(equilibriumWall(makeFilm({ ...film, D: 0 })).degenerate).toBe(true);
    const bulk = equilibriumWall(makeFilm({ ...film, dmi: "bulk" }));
    expect(bulk.character).toBe("Bloch");
    expect(bulk.helicity).toBeCloseTo(Math.PI / 2, 15);
    expect(bulk.energy).toBeCloseTo(chiralWallEnergy(film), 15);
  });
});
