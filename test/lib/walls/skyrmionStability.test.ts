import { describe, expect, it } from "vitest";
import {
  makeFilm,
  criticalDmi,
  saturationField,
  solveSkyrmionExact,
  skyrmionStability,
  skyrmionModeVector,
  stripOutField,
  wallWidthParameter,
  InputError,
} from "@helicoid/lib/internal";
import { runPython } from "../../helpers/python.js";

const base = { Ms: 1.1e6, A: 15e-12, Ku: 1.2e6, t: 1e-9 };
const Dc = criticalDmi(makeFilm({ ...base, D: 1e-3 }));

// numpy: the 2D energy of the local model on a square grid (forward-difference exchange, central-difference
// interfacial DMI, pointwise anisotropy and Zeeman), in units Delta = 1, K_eff = 1 (A = 1, Ms B -> 2 b,
// D -> d), of the skyrmion theta_0(rho) moved along the geodesic m(eps) = m0 cos(eps |delta|) +
// delta / |delta| sin(eps |delta|), delta = u cos(m chi) e_theta + v sin(m chi) e_Phi (m = 0: u e_theta +
// v e_Phi). The second difference in eps over 2 Int |delta|^2 dA is the eigenvalue the mode has in the
// 2D energy, computed without the radial operator.
const NUMPY_2D = `
import json, sys, numpy as np
inp = json.load(sys.stdin)
d, b, h, Lb = inp["d"], inp["b"], inp["h"], inp["L"]
xs = (np.arange(int(round(2 * Lb / h))) + 0.5) * h - Lb
X, Y = np.meshgrid(xs, xs, indexing="ij")
r = np.hypot(X, Y); chi = np.arctan2(Y, X)
th = np.interp(r, inp["x"], inp["theta"], right=0.0)
def energy(m):
    mx, my, mz = m
    ex = sum(np.sum(np.diff(c, axis=0)**2) + np.sum(np.diff(c, axis=1)**2) for c in m)
    dmx = np.gradient(mx, h, axis=0); dmy = np.gradient(my, h, axis=1)
    dzx = np.gradient(mz, h, axis=0); dzy = np.gradient(mz, h, axis=1)
    dmi = np.sum(mz * (dmx + dmy) - (mx * dzx + my * dzy)) * h * h
    loc = np.sum((1 - mz**2) + 2 * b * (1 - mz)) * h * h
    return ex + d * dmi + loc
st, ct = np.sin(th), np.cos(th)
m0 = np.array([st * np.cos(chi), st * np.sin(chi), ct])
eth = np.array([ct * np.cos(chi), ct * np.sin(chi), -st])
eph = np.array([-np.sin(chi), np.cos(chi), 0 * chi])
out = []
for md in inp["modes"]:
    m = md["m"]
    u = np.interp(r, md["x"], md["u"], right=0.0); v = np.interp(r, md["x"], md["v"], right=0.0)
    if m == 0:
        dl = u * eth + v * eph
    else:
        dl = u * np.cos(m * chi) * eth + v * np.sin(m * chi) * eph
    n = np.sqrt(np.sum(dl**2, axis=0)); nn = np.where(n > 0, n, 1)
    def moved(eps):
        return m0 * np.cos(eps * n) + dl / nn * np.sin(eps * n)
    eps = 1e-3
    e2 = (energy(moved(eps)) + energy(moved(-eps)) - 2 * energy(m0)) / eps**2
    out.append(e2 / (2 * np.sum(n**2) * h * h))
print(json.dumps(out))
`;

describe("stability of the exact skyrmion against angular modes", () => {
  it("m = 1 has the translation zero mode, with eigenvector (-theta', sin theta / x)", () => {
    // Common practice, no source: translation invariance of the film makes -d m / dx a zero mode.
    for (const [r, B] of [
      [0.5, 0.05],
      [0.9, 0.02],
      [1.1009, 0.1],
    ] as const) {
      const f = makeFilm({ ...base, D: r * Dc });
      const s = skyrmionStability(f, B);
      expect(Math.abs(s.modes[1]!.eigenvalues[0]), `D/Dc ${r}`).toBeLessThan(1e-4);
      expect(s.modes[1]!.eigenvalues[1]).toBeGreaterThan(0.1);
      expect(s.stable).toBe(true);
      const Delta = wallWidthParameter(f);
      const vec = skyrmionModeVector(f, s.skyrmion, 1, 0);
      let dot = 0;
      let nt = 0;
      for (let j = 0; j < vec.x.length; j++) {
        const x = vec.x[j]!;
        const ut = -s.skyrmion.profile.dtheta(x * Delta) * Delta;
        const vt = Math.sin(s.skyrmion.profile.theta(x * Delta)) / x;
        dot += (ut * vec.u[j]! + vt * vec.v[j]!) * x;
        nt += (ut * ut + vt * vt) * x;
      }
      const h = vec.x[1]! - vec.x[0]!;
      expect(Math.abs(dot * h) / Math.sqrt(nt * h)).toBeGreaterThan(0.999);
    }
  });
  it("eigenvalues agree with a finite-difference second derivative of the 2D energy on a grid (numpy), m = 0, 1, 2", () => {
    // Source: numpy evaluation of the 2D local-model energy (above), independent of the radial operator.
    for (const [r, B] of [
      [0.9, 0.02],
      [1.1009, 0.05],
    ] as const) {
      const f = makeFilm({ ...base, D: r * Dc });
      const Delta = wallWidthParameter(f);
      const s = skyrmionStability(f, B);
      const sk = s.skyrmion;
      const modes = [0, 1, 2].map((m) => {
        const v = skyrmionModeVector(f, sk, m, s.modes[m]!.eigenvalues[0]);
        return { m, x: Array.from(v.x), u: Array.from(v.u), v: Array.from(v.v) };
      });
      const x: number[] = [];
      const theta: number[] = [];
      for (let i = 0; i < sk.theta.length; i++) {
        x.push(sk.rho[i]! / Delta);
        theta.push(sk.theta[i]!);
      }
      const lam = runPython<number[]>(NUMPY_2D, { d: sk.d, b: sk.b, h: 0.05, L: Math.min(sk.length, sk.radius / Delta + 12), x, theta, modes });
      expect(Math.abs(lam[0]! - s.modes[0]!.eigenvalues[0]), `m=0 D/Dc ${r}: ${lam[0]} vs ${s.modes[0]!.eigenvalues[0]}`).toBeLessThan(0.01);
      expect(Math.abs(lam[1]!), `m=1 D/Dc ${r}: ${lam[1]}`).toBeLessThan(0.01);
      expect(Math.abs(lam[2]! - s.modes[2]!.eigenvalues[0]), `m=2 D/Dc ${r}: ${lam[2]} vs ${s.modes[2]!.eigenvalues[0]}`).toBeLessThan(0.01);
    }
  });
  it("above D_c the elliptic mode softens as B falls to B_sat, where the skyrmion stops existing (strip-out)", () => {
    // Source: A. Bogdanov, A. Hubert, JMMM 138, 255 (1994) (strip-out of isolated skyrmions above D_c
    // as the field approaches the saturation field); B_sat checked against scipy in wall360.test.ts.
    const f = makeFilm({ ...base, D: 3.6e-3 });
    const Bsat = saturationField(f);
    const l2 = [0.2, 0.08, 0.04, 0.03].map((B) => skyrmionStability(f, B).modes[2]!.eigenvalues[0]);
    for (let i = 1; i < l2.length; i++) expect(l2[i]!).toBeLessThan(l2[i - 1]!);
    expect(l2[3]!).toBeLessThan(0.03);
    const so = stripOutField(f, 0.1, 0);
    expect(["ends", "softens"]).toContain(so.kind);
    expect(Math.abs(so.field - Bsat)).toBeLessThan(5e-5 + so.resolution);
    expect(so.lastEigenvalue).toBeLessThan(0.02); // measured 0.014 a few uT above B_sat (the radius diverges there)
    expect(so.resolution).toBeLessThan(1e-5);
  });
  it("refuses bad input and fields without an exact skyrmion", () => {
    const f = makeFilm({ ...base, D: 0.9 * Dc });
    expect(() => skyrmionStability(f, NaN)).toThrow(InputError);
    expect(() => skyrmionStability(f, 0.02, { step: 1 })).toThrow(InputError);
    expect(() => skyrmionStability(makeFilm({ ...base, D: 1.2 * Dc }), 0)).toThrow(/no exact skyrmion/);
    const sk = solveSkyrmionExact(f, 0.02);
    expect(skyrmionStability(f, 0.02, { skyrmion: sk }).skyrmion).toBe(sk);
  });
});
