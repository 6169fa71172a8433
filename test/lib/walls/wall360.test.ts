import { describe, expect, it } from "vitest";
import {
  makeFilm,
  effectiveAnisotropy,
  wallWidthParameter,
  chiralWallEnergy,
  pairIntegral,
  wall360Angle,
  wall360Magnetization,
  wall360Energy,
  wall360Equilibrium,
  wall360ExactPair,
  wall360MergeField,
  wall360Profile,
  wall360ExactPairEnergy,
  mu0,
  saturationField,
  criticalDmi,
  integrateHalfLine,
  InputError,
  type Film,
} from "@helicoid/lib/internal";
import { runPython } from "../../helpers/python.js";

// Invented film (numbers only).
const film = makeFilm({ Ms: 1.1e6, A: 15e-12, Ku: 1.2e6, D: 1.5e-3, t: 1e-9 });
const K = effectiveAnisotropy(film);
const Delta = wallWidthParameter(film);

/** Numerical energy functional over a magnetization m(x): finite differences + trapezoid rule. */
function energyFunctional(f: Film, m: (x: number) => number[], B: number, span: number, n: number) {
  const h = (2 * span) / n;
  const dh = 1e-5 * Delta;
  let ex = 0,
    an = 0,
    ze = 0,
    dmi = 0;
  for (let i = 0; i <= n; i++) {
    const x = -span + i * h + 1e-3 * h; // avoid sampling exactly at the centre kink-free point
    const wgt = i === 0 || i === n ? 0.5 : 1;
    const v = m(x);
    const a = m(x - 2 * dh),
      b = m(x - dh),
      c = m(x + dh),
      d = m(x + 2 * dh);
    const dv = v.map((_, k) => (a[k]! - 8 * b[k]! + 8 * c[k]! - d[k]!) / (12 * dh));
    ex += wgt * f.A * (dv[0]! ** 2 + dv[1]! ** 2 + dv[2]! ** 2);
    an += wgt * effectiveAnisotropy(f) * (1 - v[2]! ** 2);
    ze += wgt * f.Ms * B * (1 - v[2]!);
    // Interfacial DMI density D [m_z d_x m_x - m_x d_x m_z] (conventions of lib/src/README.md).
    dmi += wgt * f.D * (v[2]! * dv[0]! - v[0]! * dv[2]!);
  }
  return { exchange: ex * h, anisotropy: an * h, zeeman: ze * h, dmi: dmi * h };
}

describe("pair integral J(p)", () => {
  it("matches quadrature of its definition, and its derivative matches finite differences", () => {
    for (const p of [1e-6, 0.01, 0.3, 0.96, 0.999, 1, 1.02, 1.2, 7, 1e4, 1e12]) {
      // Source: tanh-sinh quadrature of the defining integral (independent of the closed form).
      const q = integrateHalfLine((u) => 1 / (Math.sinh(u) ** 2 + p), 0, 1, { relTol: 1e-14 }).value;
      const { J, dJ } = pairIntegral(p);
      expect(Math.abs(J / q - 1)).toBeLessThan(1e-11);
      const dq = integrateHalfLine((u) => -1 / (Math.sinh(u) ** 2 + p) ** 2, 0, 1, { relTol: 1e-14 }).value;
      expect(Math.abs(dJ / dq - 1)).toBeLessThan(1e-9);
    }
  });
});

describe("360-degree wall ansatz energy", () => {
  it("closed form equals numerical integration of the energy functional (with DMI, both helicities)", () => {
    for (const [R, w, B] of [
      [2 * Delta, Delta, 0.05],
      [0.4 * Delta, 0.5 * Delta, 0.3],
      [6 * Delta, 1.3 * Delta, 0.01],
    ] as const) {
      for (const g of [0, Math.PI]) {
        const ours = wall360Energy(film, R, w, B, g);
        const num = energyFunctional(film, (x) => wall360Magnetization(x, R, w, g), B, R + 40 * w, 40000);
        // Source: the ansatz of H.-B. Braun, PRB 50, 16501 (1994); closed form derived in wall360.ts,
        // checked here against direct quadrature of the energy densities of lib/src/walls/README.md.
        expect(Math.abs(ours.exchange / num.exchange - 1)).toBeLessThan(1e-6);
        expect(Math.abs(ours.anisotropy / num.anisotropy - 1)).toBeLessThan(1e-6);
        expect(Math.abs(ours.zeeman / num.zeeman - 1)).toBeLessThan(1e-6);
        expect(Math.abs(ours.dmi - num.dmi)).toBeLessThan(1e-6 * Math.abs(ours.dmi));
      }
    }
    // D > 0 favours helicity 0 (the skyrmion convention): -2 pi D.
    expect(wall360Energy(film, Delta, Delta, 0.1).dmi).toBeCloseTo(-2 * Math.PI * film.D, 15);
  });

  it("at large R the energy approaches two free 180-degree walls, 2 sigma", () => {
    // Source: Hubert and Schaefer (1998), Thiaville et al. (2012): sigma = 4 sqrt(A K_eff) - pi |D| per wall.
    const e = wall360Energy(film, 40 * Delta, Delta, 0);
    expect(Math.abs(e.total / (2 * chiralWallEnergy(film)) - 1)).toBeLessThan(1e-12);
    const eq = wall360Equilibrium(film, 1e-7);
    expect(eq.radius).toBeGreaterThan(5 * Delta);
    expect(Math.abs(eq.energy / (2 * chiralWallEnergy(film)) - 1)).toBeLessThan(1e-3);
  });
});

describe("360-degree wall equilibrium", () => {
  it("the exact pair solves the 1D Euler-Lagrange equation with field", () => {
    // Source: our derivation (double sine-Gordon pair), cf. Braun (1994).
    for (const B of [0.02, 0.2, 2]) {
      const { radius: R, width: w } = wall360ExactPair(film, B)!;
      const h = (film.Ms * B) / (2 * K);
      const dx = 1e-3 * w;
      let worst = 0;
      for (let x = 0.05 * w; x < R + 10 * w; x += w / 9) {
        const th = (y: number) => wall360Angle(y, R, w);
        const d2 = (-th(x + 2 * dx) + 16 * th(x + dx) - 30 * th(x) + 16 * th(x - dx) - th(x - 2 * dx)) / (12 * dx * dx);
        const res = Delta * Delta * d2 - (Math.sin(th(x)) * Math.cos(th(x)) + h * Math.sin(th(x)));
        worst = Math.max(worst, Math.abs(res) / (1 + h));
      }
      expect(worst).toBeLessThan(1e-6);
    }
  });

  it("minimization finds the exact pair over four decades of field", () => {
    for (const B of [1e-4, 1e-3, 0.01, 0.1, 1, 10]) {
      const eq = wall360Equilibrium(film, B);
      expect(eq.status).toBe("bound");
      expect(eq.minimizer!.success).toBe(true);
      expect(Math.abs(eq.radius / eq.exact!.radius - 1)).toBeLessThan(1e-6);
      expect(Math.abs(eq.width / eq.exact!.width - 1)).toBeLessThan(1e-6);
    }
  });

  it("agrees with scipy minimizing its own quadrature of the ansatz energy", () => {
    const B = 0.08;
    const ours = wall360Equilibrium(film, B);
    // Source: scipy.integrate.quad + scipy.optimize.minimize (Nelder-Mead), run as an oracle.
    const ref = runPython<number[]>(
      `import json,sys,numpy as np
from scipy.integrate import quad
from scipy.optimize import minimize
d=json.load(sys.stdin); A=d['A']; K=d['K']; Ms=d['Ms']; B=d['B']; Dl=np.sqrt(A/K)
def E(p):
    R=Dl*np.exp(p[0]); w=Dl*np.exp(p[1]); S=np.sinh(R/w)
    def f(u):
        s=np.sinh(u); th=2*np.arctan2(S,s); dth=-2*S*np.cosh(u)/(s*s+S*S)
        return A*dth**2/w + w*(K*np.sin(th)**2 + Ms*B*(1-np.cos(th)))
    return 2*quad(f,0,R/w+40,limit=400,epsabs=0,epsrel=1e-12)[0]/np.sqrt(A*K)
r=minimize(E,[np.log(2),0.0],method='Nelder-Mead',options=dict(xatol=1e-10,fatol=1e-14,maxiter=4000))
print(json.dumps([float(Dl*np.exp(r.x[0])), float(Dl*np.exp(r.x[1]))]))`,
      { A: film.A, K, Ms: film.Ms, B },
    );
    expect(Math.abs(ours.radius / ref[0]! - 1)).toBeLessThan(1e-6);
    expect(Math.abs(ours.width / ref[1]! - 1)).toBeLessThan(1e-6);
  });

  it("is compressed continuously by the field: R -> arsinh(1) Delta / sqrt(h) -> 0 (collapse as B grows)", () => {
    let prev = Infinity;
    for (const B of [0.001, 0.01, 0.1, 1, 10, 100]) {
      const r = wall360Equilibrium(film, B).radius;
      expect(r).toBeLessThan(prev);
      prev = r;
    }
    const B = 1000;
    const h = (film.Ms * B) / (2 * K);
    expect(wall360Equilibrium(film, B).radius / ((Math.asinh(1) * Delta) / Math.sqrt(h))).toBeCloseTo(1, 3);
    const Bm = wall360MergeField(film);
    const atMerge = wall360ExactPair(film, Bm)!;
    expect(atMerge.radius / atMerge.width).toBeCloseTo(1, 12);
  });

  it("has no bound pair at B <= 0 and refuses bad input", () => {
    expect(wall360Equilibrium(film, 0).status).toBe("unbound");
    expect(wall360Equilibrium(film, 0).energy).toBeCloseTo(2 * chiralWallEnergy(film), 15);
    expect(wall360Equilibrium(film, -0.01).status).toBe("unbound");
    expect(() => wall360Energy(film, -1, Delta, 0.1)).toThrow(InputError);
    expect(() => wall360Equilibrium(makeFilm({ ...film, Ku: 0.5e6 }), 0.1)).toThrow(/K_eff/);
    const p = wall360Profile(2 * Delta, Delta, 0, 10 * Delta, 101);
    expect(p.mz[50]).toBeCloseTo(-1, 12);
    expect(p.mz[0]).toBeGreaterThan(0.99);
  });
});

describe("saturation field above D_c", () => {
  it("B_sat: the exact pair energy vanishes there; scipy (quad of the 1D energy, brentq) agrees; 28.09 mT at D = 1.10 D_c", () => {
    // Source: A. Bogdanov, A. Hubert, JMMM 138, 255 (1994): above D_c the uniform state returns above
    // the field where an isolated 360-degree wall costs no energy. Oracle: scipy.integrate.quad of the
    // 1D energy along the exact pair (first integral A theta'^2 = K_eff sin^2 theta + Ms B (1 - cos theta),
    // E = 2 Int_0^pi 2 sqrt(A (K_eff sin^2 theta + Ms B (1 - cos theta))) d theta - 2 pi |D|) and
    // scipy.optimize.brentq; and the independent audit value 28.09 mT for the demo film at D = 3.6 mJ/m^2.
    const films = [
      { Ms: 1.1e6, A: 15e-12, Ku: 1.2e6, D: 3.6e-3, t: 1e-9 },
      { Ms: 0.8e6, A: 10e-12, Ku: 1.0e6, D: -4.5e-3, t: 1e-9 },
      { Ms: 1.3e6, A: 20e-12, Ku: 1.5e6, D: 7e-3, t: 1e-9 },
    ].map((p) => makeFilm(p));
    const ref = runPython<number[]>(
      `
import json, sys, numpy as np
from scipy.integrate import quad
from scipy.optimize import brentq
inp = json.load(sys.stdin)
mu0 = inp["mu0"]  # CODATA 2018, as the library
out = []
for f in inp["films"]:
    K = f["Ku"] - 0.5 * mu0 * f["Ms"]**2
    def E(B):
        g = lambda th: 2 * np.sqrt(f["A"] * (K * np.sin(th)**2 + f["Ms"] * B * (1 - np.cos(th))))
        return 2 * quad(g, 0, np.pi, epsabs=0, epsrel=1e-13, limit=200)[0] - 2 * np.pi * abs(f["D"])
    out.append(brentq(E, 1e-12, 20.0, xtol=1e-15, rtol=1e-14))
print(json.dumps(out))
`,
      { mu0, films: films.map((f) => ({ Ms: f.Ms, A: f.A, Ku: f.Ku, D: f.D })) },
    );
    films.forEach((f, i) => {
      expect(Math.abs(f.D)).toBeGreaterThan(criticalDmi(f));
      const Bs = saturationField(f);
      expect(Math.abs(Bs / ref[i]! - 1), `film ${i}`).toBeLessThan(1e-9);
      expect(wall360ExactPairEnergy(f, 0.999 * Bs)).toBeLessThan(0);
      expect(wall360ExactPairEnergy(f, 1.001 * Bs)).toBeGreaterThan(0);
      // the minimized ansatz (which contains the exact pair) changes sign there too
      expect(wall360Equilibrium(f, 0.99 * Bs).energy).toBeLessThan(0);
      expect(wall360Equilibrium(f, 1.01 * Bs).energy).toBeGreaterThan(0);
    });
    expect(saturationField(films[0]!) * 1e3).toBeCloseTo(28.09, 2);
    expect(saturationField(film)).toBe(0); // |D| < D_c
  });
  it("wall360 says when |D| > D_c whether the pair is an excitation of the uniform film", () => {
    // Source: A. Bogdanov, A. Hubert, JMMM 138, 255 (1994).
    const f = makeFilm({ Ms: 1.1e6, A: 15e-12, Ku: 1.2e6, D: 3.6e-3, t: 1e-9 });
    const lo = wall360Equilibrium(f, 0.02);
    expect(lo.energy).toBeLessThan(0);
    expect(lo.notes.join(" ")).toMatch(/not a metastable excitation/);
    const hi = wall360Equilibrium(f, 0.05);
    expect(hi.energy).toBeGreaterThan(0);
    expect(hi.notes.join(" ")).toMatch(/B > B_sat/);
    expect(wall360Equilibrium(film, 0.05).notes.join(" ")).not.toMatch(/D_c/);
  });
});
