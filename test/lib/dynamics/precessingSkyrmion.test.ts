import { describe, expect, it } from "vitest";
import { makeFilm, InputError } from "@helicoid/lib";
import {
  dropletModel,
  dropletRates,
  dropletStableRadius,
  dropletState,
  dropletThreshold,
  dropletTrace,
  slonczewskiRate,
  thinWallFrequency,
} from "../../../lib/src/dynamics/precessingSkyrmion.js";
import { runPython } from "../../helpers/python.js";

// An invented DMI-free film (not a real material).
const film = makeFilm({ Ms: 0.8e6, A: 13e-12, Ku: 0.65e6, D: 0, t: 3e-9, alpha: 0.05 });
const m = dropletModel(film, { B: 0.1, contactRadius: 40e-9 });
const rel = (a: number, b: number): number => Math.abs(a - b) / Math.abs(b);

describe("precessing skyrmion in a nanocontact", () => {
  it("omega(R) from the Euler-Lagrange equations equals gamma dE/dN from finite differences of the ansatz energy", () => {
    // Common practice, no source: omega = dE / d(hbar n) (conservative precession of a reversed domain,
    // M. Hoefer, T. Silva, M. Keller, PRB 82, 054432 (2010)); E and N from walls/skyrmionAnsatz.ts
    // (ansatzLocalIntegrals), differentiated numerically, against our analytic derivative integrals.
    for (const R of [3e-9, 10e-9, 40e-9, 150e-9]) {
      const h = 1e-4 * R;
      const s = dropletState(m, R);
      const p = dropletState(m, R + h);
      const q = dropletState(m, R - h);
      const fd = (m.gamma * (p.energy - q.energy)) / (m.Ms * m.t * (p.reversedArea - q.reversedArea));
      expect(rel(s.omega, fd), `R=${R}`).toBeLessThan(1e-6);
    }
  });

  it("omega(R) tends to the thin-wall limit gamma B + gamma sigma_w / (2 Ms R) for R >> w (the form gamma sigma_w / (4 pi Ms R) is off by 2 pi)", () => {
    // Source: our derivation (file header): E ~ 2 pi R t sigma_w + Ms B t N, N ~ 2 pi R^2, so
    // omega = gamma E' / (Ms t N') -> gamma B + gamma sigma_w / (2 Ms R); sigma_w = 4 sqrt(A K_eff)
    // (Landau and Lifshitz 1935). The differences shrink like (w / R)^2 (curvature of the wall).
    let prev = Infinity;
    for (const k of [5, 10, 20, 40, 80]) {
      const R = k * m.w;
      const e = rel(dropletState(m, R).omega, thinWallFrequency(m, R));
      expect(e).toBeLessThan(prev);
      if (k >= 10) expect(e).toBeLessThan((1.5 * prev) / 4 + 1e-12);
      prev = e;
    }
    expect(prev).toBeLessThan(1e-4);
    const R = 80 * m.w;
    const wrong = (m.gamma * 4 * Math.sqrt(m.A * m.Keff)) / (4 * Math.PI * m.Ms * R) + m.gamma * m.B;
    expect(rel(dropletState(m, R).omega, wrong)).toBeGreaterThan(0.01);
  });

  it("threshold: the balance torque has its minimum there; above it R(t) settles on the stable radius with dPhi/dt = omega(R*), below it the disc collapses", () => {
    // Common practice, no source: consistency of the closed conditions with the time integration.
    const th = dropletThreshold(m);
    expect(th.status).toBe("ok");
    for (const f of [0.9, 0.97, 1.03, 1.1]) expect(dropletState(m, f * th.radius).balanceTorque).toBeGreaterThan(th.torque);
    const sigma = 1.5 * th.torque;
    const Rs = dropletStableRadius(m, sigma, th);
    expect(Rs).toBeGreaterThan(th.radius);
    expect(rel(dropletState(m, Rs).balanceTorque, sigma)).toBeLessThan(1e-10);
    const tr = dropletTrace(m, sigma, 0.6 * th.radius, 30e-9, 31);
    expect(tr.status).toBe("running");
    expect(rel(tr.R[tr.R.length - 1]!, Rs)).toBeLessThan(1e-6);
    const r = dropletRates(m, Rs, sigma);
    expect(Math.abs(r.dR)).toBeLessThan(1e-6);
    expect(rel(r.dPhi, dropletState(m, Rs).omega)).toBeLessThan(1e-9);
    const dead = dropletTrace(m, 0.9 * th.torque, th.radius, 30e-9, 31);
    expect(dead.status).toBe("collapsed");
    // the current for a torque rate: sigma = gamma hbar P j / (2 e Ms t), j = I / (pi rho_c^2)
    // Source: J. Slonczewski, JMMM 159, L1 (1996) (torque magnitude with efficiency P; from memory).
    const perAmp = slonczewskiRate(1, 0.4, m.rhoC, m.Ms, m.t);
    expect(rel(perAmp, (1.76085963023e11 * 1.054571817e-34 * 0.4) / (Math.PI * m.rhoC ** 2) / (2 * 1.602176634e-19 * m.Ms * m.t))).toBeLessThan(1e-9);
  });

  it("R(t) and Phi(t) agree with scipy solve_ivp on the Euler-Lagrange equations coded independently (energy by quadrature, derivatives by finite differences)", () => {
    // Source: scipy.integrate.solve_ivp and numpy Gauss-Legendre (Debian) as the reference; the Python side
    // builds E(R), N(R), I_RR, I_PP, I_c from the profile alone and differentiates numerically.
    const th = dropletThreshold(m);
    const sigma = 1.3 * th.torque;
    const R0 = 20e-9;
    const T = 4e-9;
    const ours = dropletTrace(m, sigma, R0, T, 9, 1e-10);
    const py = runPython<{ R: number[]; Phi: number[] }>(
      `
import json, sys, math
import numpy as np
from scipy.integrate import solve_ivp
p = json.load(sys.stdin)
Ms, A, K, t, B, al, g, w, rc, sig = [p[k] for k in ["Ms","A","Keff","t","B","alpha","gamma","w","rhoC","sigma"]]
xg, wg = np.polynomial.legendre.leggauss(16)
def nodes(a):
    xc = rc/w
    br = sorted(set([0.0] + [min(a, 1.0)*1.5**(-k) for k in range(1, 30)] + list(np.arange(1.0, a + 40, 0.25)) + [a + 40] + ([xc] if xc < a + 40 else [])))
    br = np.array(br)
    lo, hi = br[:-1], br[1:]
    x = (0.5*(lo + hi)[:, None] + 0.5*(hi - lo)[:, None]*xg[None, :]).ravel()
    ww = (0.5*(hi - lo)[:, None]*wg[None, :]).ravel()
    return x, ww
def theta(x, a):
    return 2*np.arctan2(np.sinh(a), np.sinh(x))
def parts(a, x, ww):
    h = 1e-6
    th = theta(x, a)
    thx = (theta(x + h, a) - theta(x - h, a))/(2*h)
    Iex = np.sum(ww*(thx**2*x + np.sin(th)**2/x))
    IK = np.sum(ww*np.sin(th)**2*x)
    IZ = np.sum(ww*(1 - np.cos(th))*x)
    return Iex, IK, IZ
def E_N(a, x, ww):
    Iex, IK, IZ = parts(a, x, ww)
    return 2*math.pi*t*(A*Iex + (K*IK + Ms*B*IZ)*w*w), 2*math.pi*w*w*IZ
def rhs(_, y):
    a = y[0]
    x, ww = nodes(a)
    d = 1e-3
    st = [E_N(a + k*d, x, ww) for k in (-2, -1, 1, 2)]
    dE = (st[0][0] - 8*st[1][0] + 8*st[2][0] - st[3][0])/(12*d)/w
    dN = (st[0][1] - 8*st[1][1] + 8*st[2][1] - st[3][1])/(12*d)/w
    th = theta(x, a)
    tha = (theta(x, a + 1e-6) - theta(x, a - 1e-6))/(2e-6)
    IRR = 2*math.pi*np.sum(ww*tha**2*x)
    IPP = 2*math.pi*w*w*np.sum(ww*np.sin(th)**2*x)
    Ic = 2*math.pi*w*w*np.sum(ww*np.sin(th)**2*x*(x < rc/w))
    # N' Phi' - (g / Ms t) E' = al IRR R';  N' R' = -al IPP Phi' + sig Ic
    M = np.array([[-al*IRR, dN], [dN, al*IPP]])
    rhs_ = np.array([g*dE/(Ms*t), sig*Ic])
    Rd, Pd = np.linalg.solve(M, rhs_)
    return [Rd/w*1e-9, Pd*1e-9]
ts = [p["T"]*1e9*i/8 for i in range(9)]
s = solve_ivp(rhs, [0, ts[-1]], [p["R0"]/w, 0.0], method="RK45", rtol=1e-9, atol=1e-11, t_eval=ts)
print(json.dumps({"R": (s.y[0]*w).tolist(), "Phi": s.y[1].tolist()}))
`,
      { Ms: m.Ms, A: m.A, Keff: m.Keff, t: m.t, B: m.B, alpha: m.alpha, gamma: m.gamma, w: m.w, rhoC: m.rhoC, sigma, R0, T },
    );
    for (let i = 0; i < 9; i++) {
      expect(rel(ours.R[i]!, py.R[i]!), `R at ${i}`).toBeLessThan(1e-6);
      if (i > 0) expect(rel(ours.Phi[i]!, py.Phi[i]!), `Phi at ${i}`).toBeLessThan(1e-6);
    }
  });

  it("refuses DMI, a missing contact and non-positive damping by name", () => {
    // Common practice, no source.
    expect(() => dropletModel(makeFilm({ Ms: 0.8e6, A: 13e-12, Ku: 0.65e6, D: 1e-3, t: 3e-9 }), { contactRadius: 40e-9, alpha: 0.1 })).toThrow(InputError);
    expect(() => dropletModel(film, { contactRadius: -1 })).toThrow(/contactRadius/);
    expect(() => dropletModel(film, { contactRadius: 40e-9, alpha: 0 })).toThrow(/alpha/);
  });
});
