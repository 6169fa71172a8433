/**
 * The remaining outputs of skyrmion, skyrmion-profile and skyrmion-stability against independent
 * oracles: the numpy/scipy ansatz energy with thin-film magnetostatics of test/helpers/ansatzEnergyPython.ts
 * (ansatz of H.-B. Braun, PRB 50, 16501 (1994); energy terms of F. Buettner, I. Lemesh, G. Beach,
 * Sci. Rep. 8, 4464 (2018)), minimized by scipy; the exact radial profile by scipy solve_bvp of the
 * Euler-Lagrange equation (A. Bogdanov, A. Hubert, JMMM 138, 255 (1994)); closed forms named beside
 * each check.
 */
import { describe, expect, it } from "vitest";
import { getCalculator, makeFilm, runCalculator, solveSkyrmionExact } from "@helicoid/lib";
import { runPython } from "../../helpers/python.js";
import { ANSATZ_ENERGY_PY } from "../../helpers/ansatzEnergyPython.js";

type R = ReturnType<typeof runCalculator>;
const num = (r: R, name: string): number => r.outputs[name]!.value as number;
const arr = (r: R, name: string): number[] => r.outputs[name]!.value as number[];
const txt = (r: R, name: string): string => r.outputs[name]!.value as unknown as string;
const rel = (a: number, b: number): number => Math.abs(a - b) / Math.max(Math.abs(b), 1e-300);

/** The oracle energy with its non-local (surface + volume charge) part returned beside the total. */
const PARTS_PY = ANSATZ_ENERGY_PY.replace("return local + X * c + Es + V * c * c", "return (local + X * c + Es + V * c * c, Es + V * c * c)");

const codata = runPython<{ mu0: number }>("import json, scipy.constants as c\nprint(json.dumps({'mu0': c.mu_0}))");
const film = { Ms: 1.0e6, A: 1.4e-11, Ku: 1.1e6, D: 1.6e-3, t: 1.0e-9 };
const Keff = film.Ku - (codata.mu0 * film.Ms ** 2) / 2;

describe("skyrmion: energies, minima and the sweep against the numpy ansatz energy", () => {
  it("skyrmion: magnetostatic part, minima count, Delta, validity radius, and every state of a field sweep is a minimum", () => {
    const inputs = { ...film, B: 0.02, a: 0.4e-9 };
    const r = runCalculator(getCalculator("skyrmion"), inputs, { sweep: { over: "B", from: 0.006, to: 0.05, points: 4 } });
    // Delta = sqrt(A / K_eff), K_eff = Ku - mu0 Ms^2 / 2 (A. Hubert, R. Schaefer, Magnetic Domains, sec. 3.2)
    expect(rel(num(r, "deltaParameter"), Math.sqrt(film.A / Keff))).toBeLessThan(1e-12);
    // the continuum model's stated limit: 5 lattice spacings
    expect(rel(num(r, "validityRadius"), 5 * inputs.a)).toBeLessThan(1e-12);
    const fields = arr(r, "fieldSweep");
    const Rs = arr(r, "radiusSweep");
    const ws = arr(r, "wallWidthSweep");
    expect(ws.length).toBe(fields.length);
    const all = arr(r, "allFieldSweep");
    const allR = arr(r, "allRadiusSweep");
    expect(all.length).toBe(allR.length);
    const o = runPython<{ here: number[]; sweep: { E: number; ok: boolean }[]; minima: number; allOk: boolean[] }>(
      `${PARTS_PY}
from scipy.optimize import minimize_scalar
c = json.load(sys.stdin)
f = c['film']
def E(B, R, w): return energy(f, B, R, w)[0]
def is_min(B, R, w, h=0.01):
    e0 = E(B, R, w)
    return all(E(B, R*np.exp(i*h), w*np.exp(j*h)) >= e0 - 1e-12*abs(e0) for i in (-1, 0, 1) for j in (-1, 0, 1) if i or j)
def emin_w(B, R):
    r = minimize_scalar(lambda lw: E(B, R, np.exp(lw)), bounds=(np.log(0.2e-9), np.log(60e-9)), method='bounded', options={'xatol': 1e-4})
    return r.fun
here = list(energy(f, c['B'], c['R'], c['w']))
sweep = [{'E': E(B, R, w), 'ok': is_min(B, R, w)} for B, R, w in c['sweep']]
# local minima of min_w E(R) over a log grid of R at the given field
Rg = np.exp(np.linspace(np.log(1e-9), np.log(300e-9), 28))
em = np.array([emin_w(c['B'], R) for R in Rg])
minima = int(np.sum((em[1:-1] < em[:-2]) & (em[1:-1] < em[2:])))
allOk = []
for B, R in c['all']:
    e0 = emin_w(B, R)
    allOk.append(bool(emin_w(B, R*1.01) >= e0 - 1e-12*abs(e0) and emin_w(B, R/1.01) >= e0 - 1e-12*abs(e0)))
print(json.dumps({'here': here, 'sweep': sweep, 'minima': minima, 'allOk': allOk}))`,
      {
        film,
        B: inputs.B,
        R: num(r, "radius"),
        w: num(r, "wallWidth"),
        sweep: fields.map((B, i) => [B, Rs[i], ws[i]]),
        all: all.map((B, i) => [B, allR[i]]).slice(0, 4),
      },
    );
    // the non-local (surface + volume charge) part at the calculator's state
    expect(rel(num(r, "magnetostaticEnergy"), o.here[1]!)).toBeLessThan(1e-4);
    expect(num(r, "minimaCount")).toBe(o.minima);
    fields.forEach((B, i) => {
      expect(rel(arr(r, "energySweep")[i]!, o.sweep[i]!.E), `energy at B = ${B}`).toBeLessThan(1e-6);
      expect(o.sweep[i]!.ok, `(R, w) at B = ${B} is a minimum of the oracle energy`).toBe(true);
    });
    expect(o.allOk.length).toBe(Math.min(4, all.length));
    o.allOk.forEach((ok, i) => expect(ok, `state ${i} (B = ${all[i]}, R = ${allR[i]}) is a minimum of min_w E`).toBe(true));
    const branches = new Set(arr(r, "allBranchSweep"));
    expect(num(r, "branchCount")).toBe(branches.size);
    expect(branches.has(num(r, "principalBranch"))).toBe(true);
  });
});

describe("skyrmion-profile and skyrmion-stability: profiles, the non-local ansatz radius, the continuum edge", () => {
  it("skyrmion-profile: the ansatz minimized by scipy (local and non-local), the exact m_z by solve_bvp, the continuum edge", () => {
    const B = 0.03;
    const r = runCalculator(getCalculator("skyrmion-profile"), { ...film, B, a: 0.3e-9 });
    const Delta = Math.sqrt(film.A / Keff);
    const s = solveSkyrmionExact(makeFilm({ ...film, dmi: "interfacial" }), B);
    const x: number[] = [];
    const theta: number[] = [];
    for (let i = 0; i < s.theta.length; i += 10) {
      x.push(s.rho[i]! / Delta);
      theta.push(s.theta[i]!);
    }
    const rho = arr(r, "rho");
    const o = runPython<{ Rloc: number; wloc: number; Rnl: number; mzExact: number[] }>(
      `${PARTS_PY}
from scipy.optimize import minimize
from scipy.integrate import solve_bvp
c = json.load(sys.stdin)
f = c['film']; B = c['B']
Ms, A, Ku, D, t = f['Ms'], f['A'], f['Ku'], f['D'], f['t']
K = Ku - 0.5*mu0*Ms**2
GX2, GW2 = np.polynomial.legendre.leggauss(40)
def local(R, w):
    # E = 2 pi t [A I_ex + (K I_K + Ms B I_Z) w^2 - |D I_D| w], the local ansatz energy (Buettner et al. 2018)
    a = R/w
    x = np.linspace(1e-9, a + 40, 4001); xm = 0.5*(x[1:] + x[:-1]); h = x[1:] - x[:-1]
    xs = (xm[:, None] + 0.5*h[:, None]*GX2[None, :]).ravel(); ws = (0.5*h[:, None]*GW2[None, :]).ravel()
    th = 2*np.arctan(np.sinh(a)/np.sinh(xs)); dth = -np.sin(th)/np.tanh(xs)
    Iex = np.sum((dth**2 + np.sin(th)**2/xs**2)*xs*ws); IK = np.sum(np.sin(th)**2*xs*ws)
    IZ = np.sum((1 - np.cos(th))*xs*ws); ID = np.sum((dth*xs + np.sin(th)*np.cos(th))*ws)
    return 2*np.pi*t*(A*Iex + (K*IK + Ms*B*IZ)*w*w - abs(D*ID)*w)
p = minimize(lambda v: local(np.exp(v[0]), np.exp(v[1]))/1e-19, [np.log(c['R0']), np.log(c['w0'])], method='Nelder-Mead', options={'xatol': 1e-9, 'fatol': 1e-14, 'maxiter': 4000})
q = minimize(lambda v: energy(f, B, np.exp(v[0]), np.exp(v[1]))[0]/1e-19, [np.log(c['R0']), np.log(c['w0'])], method='Nelder-Mead', options={'xatol': 1e-9, 'fatol': 1e-14, 'maxiter': 4000})
De = np.sqrt(A/K); d, b = D/np.sqrt(A*K), Ms*B/(2*K); x0 = 1e-3
def fb(x, y):
    s_, co = np.sin(y[0]), np.cos(y[0])
    return np.vstack([y[1], -y[1]/x + s_*co/x**2 + s_*co - d*s_**2/x + b*s_])
def bc(ya, yb): return np.array([ya[0] - np.pi - x0*ya[1], yb[0]])
xx = np.array(c['x']); xx[0] = x0; tt = np.array(c['theta'])
sol = solve_bvp(fb, bc, xx, np.vstack([tt, np.gradient(tt, xx)]), tol=1e-8, max_nodes=100000)
rr = np.array(c['rho'])/De
mz = [float(np.cos(sol.sol(max(z, x0))[0])) if z <= xx[-1] else 1.0 for z in rr]
print(json.dumps({'Rloc': float(np.exp(p.x[0])), 'wloc': float(np.exp(p.x[1])), 'Rnl': float(np.exp(q.x[0])), 'mzExact': mz}))`,
      { film, B, R0: num(r, "radiusAnsatz"), w0: Delta, x, theta, rho },
    );
    expect(rel(num(r, "radiusAnsatz"), o.Rloc)).toBeLessThan(1e-4);
    expect(rel(num(r, "wallWidthAnsatz"), o.wloc)).toBeLessThan(1e-4);
    expect(rel(num(r, "radiusAnsatzNonlocal"), o.Rnl)).toBeLessThan(1e-4);
    // the ansatz profile tan(theta/2) = sinh(R/w) / sinh(rho/w) at the oracle's (R, w), and m_z = cos theta
    const th = arr(r, "thetaAnsatz");
    rho.forEach((p, i) => {
      const ref = 2 * Math.atan(Math.sinh(o.Rloc / o.wloc) / Math.sinh(p / o.wloc));
      if (p > 0) expect(Math.abs(th[i]! - ref), `theta at rho = ${p}`).toBeLessThan(1e-3);
      expect(Math.abs(arr(r, "mzAnsatz")[i]! - Math.cos(th[i]!))).toBeLessThan(1e-12);
      expect(Math.abs(arr(r, "mzExact")[i]! - o.mzExact[i]!), `exact m_z at rho = ${p}`).toBeLessThan(1e-3);
    });
    // spin-wave continuum of the saturated film: omega = gamma (2 K_eff / Ms + B), in units of 2 K_eff / Ms:
    // 1 + Ms B / (2 K_eff) (C. Schuette, M. Garst, PRB 90, 094423 (2014), the magnon gap of the polarized state)
    expect(rel(num(r, "continuumEdge"), 1 + (film.Ms * B) / (2 * Keff))).toBeLessThan(1e-12);
    // angular harmonics e^{i m phi} of the radial modes, m = 0..4 (Schuette and Garst 2014)
    expect(arr(r, "modeNumber")).toEqual([0, 1, 2, 3, 4]);
    // the continuum model's stated limit R >= 5 a, said with the numbers of these inputs
    expect(txt(r, "validity")).toContain(`5 a = ${(5 * 0.3).toFixed(3)} nm`);
    expect(txt(r, "validity")).toMatch(/inside the continuum model's validity/);
    expect(txt(r, "branch")).toMatch(/skyrmion/);
  });

  it("skyrmion-stability: the continuum edge, the mode numbers, and the regime and strip-out bracket above D_c", () => {
    const B = 0.025;
    const r = runCalculator(getCalculator("skyrmion-stability"), { ...film, B, a: 0.3e-9, search: 0, Bmin: -0.05 });
    expect(rel(num(r, "continuumEdge"), 1 + (film.Ms * B) / (2 * Keff))).toBeLessThan(1e-12);
    expect(arr(r, "modeNumber")).toEqual([0, 1, 2, 3, 4]);
    expect(txt(r, "validity")).toContain(`5 a = ${(5 * 0.3).toFixed(3)} nm`);
    expect(txt(r, "branch")).toMatch(/skyrmion/);
    // above D_c = 4 sqrt(A K_eff) / pi (A. Bogdanov, A. Hubert 1994) and below B_sat the spiral is the ground
    // state; B_sat is where Braun's exact 360-degree pair energy 8 sqrt(A K_eff)(sqrt(1 + h) + h asinh(1/sqrt h))
    // - 2 pi |D| vanishes (H.-B. Braun, PRB 50, 16501 (1994)), h = Ms B / (2 K_eff), solved by scipy brentq
    const Dc = (4 * Math.sqrt(film.A * Keff)) / Math.PI;
    const D = 1.15 * Dc;
    const Bsat = runPython<number>(
      `
import json, sys, numpy as np
from scipy.optimize import brentq
c = json.load(sys.stdin)
K = c['K']; s = 8*np.sqrt(c['A']*K)
h = brentq(lambda h: s*(np.sqrt(1 + h) + h*np.arcsinh(1/np.sqrt(h))) - 2*np.pi*c['D'], 1e-12, 1e3, xtol=1e-16)
print(json.dumps(2*K*h/c['Ms']))`,
      { A: film.A, K: Keff, D, Ms: film.Ms },
    );
    const below = runCalculator(getCalculator("skyrmion-stability"), { ...film, D, B: 0, a: 0.3e-9, search: 1, Bmin: -0.05 });
    expect(txt(below, "regime")).toContain(`D_c = ${(Dc * 1e3).toPrecision(4)} mJ/m^2`);
    expect(txt(below, "regime")).toContain(`B_sat = ${(Bsat * 1e3).toPrecision(4)} mT`);
    const above = runCalculator(getCalculator("skyrmion-stability"), { ...film, D, B: 0.3, a: 0.3e-9, search: 1, Bmin: -0.05 });
    const res = num(above, "stripOutResolution");
    expect(res).toBeGreaterThan(0);
    expect(res).toBeLessThan(1e-3 * Bsat);
    // the strip-out bracket holds B_sat (the radius diverges there)
    expect(Math.abs(num(above, "stripOutField") - Bsat)).toBeLessThan(res * 1.01 + 1e-9);
  });
});
