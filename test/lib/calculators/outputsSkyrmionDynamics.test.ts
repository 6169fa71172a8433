/**
 * Every output of skyrmion-drift and precessing-skyrmion against independent scipy oracles, at
 * inputs away from the defaults.
 *
 * skyrmion-drift: the Thiele equation F + G (v - u) - D (alpha v - beta u) = 0 (A. Thiele, PRL 30,
 * 230 (1973); with Zhang-Li torques as in J. Iwasaki, M. Mochizuki, N. Nagaosa, Nat. Nanotechnol. 8,
 * 742 (2013)), gyrocoupling G = 4 pi Q Ms t / gamma and dissipation (Ms t / gamma) pi I, solved as
 * a 2x2 linear system by numpy; the exact profile from scipy solve_bvp of the radial Euler-Lagrange
 * equation (A. Bogdanov, A. Hubert, JMMM 138, 255 (1994)), its integrals by scipy quad; the
 * radius sweep on the 360-degree-wall ansatz tan(theta/2) = sinh(R/w) / sinh(rho/w) (H.-B. Braun,
 * PRB 50, 16501 (1994)) with w = Delta; Q = (cos theta(0) - cos theta(inf)) / 2 (A. Belavin,
 * A. Polyakov, JETP Lett. 22, 245 (1975)).
 * precessing-skyrmion: the collective coordinates (R, Phi) of a reversed disc in a nanocontact
 * (M. Hoefer, T. Silva, M. Keller, PRB 82, 054432 (2010)): omega(R) = gamma E'(R) / (Ms t N'(R)),
 * balance torque alpha omega I_PP / I_c, Slonczewski rate gamma hbar P j / (2 e Ms t) (J. Slonczewski,
 * JMMM 159, L1 (1996)), thin-wall limit gamma B + gamma sigma_w / (2 Ms R) with sigma_w = 4 sqrt(A K_eff);
 * integrals by composite Gauss-Legendre (numpy), R-derivatives by a five-point stencil, R(t) by solve_ivp.
 */
import { describe, expect, it } from "vitest";
import { getCalculator, makeFilm, runCalculator, solveSkyrmionExact } from "@helicoid/lib";
import { runPython } from "../../helpers/python.js";

type R = ReturnType<typeof runCalculator>;
const num = (r: R, name: string): number => r.outputs[name]!.value as number;
const arr = (r: R, name: string): number[] => r.outputs[name]!.value as number[];
const rel = (a: number, b: number): number => Math.abs(a - b) / Math.max(Math.abs(b), 1e-300);

const DRIFT = `
import json, sys, numpy as np
import scipy.constants as sc
from scipy.integrate import solve_bvp, quad
from scipy.optimize import brentq
c = json.load(sys.stdin)
mu0 = sc.mu_0
gam = sc.physical_constants['electron gyromag. ratio'][0]
muB = sc.physical_constants['Bohr magneton'][0]
ge = abs(sc.physical_constants['electron g factor'][0])
Ms, A, Ku, D, t, al, B = c['Ms'], c['A'], c['Ku'], c['D'], c['t'], c['alpha'], c['B']
P, beta, th, h = c['P'], c['beta'], c['thetaSH'], c['helicity']
K = Ku - mu0*Ms**2/2
De = np.sqrt(A/K)
d, b = D/np.sqrt(A*K), Ms*B/(2*K)
x0 = 1e-4
def f(x, y):
    s, co = np.sin(y[0]), np.cos(y[0])
    return np.vstack([y[1], -y[1]/x + s*co/x**2 + s*co - d*s**2/x + b*s])
def bc(ya, yb):
    return np.array([ya[0] - np.pi - x0*ya[1], yb[0]])
x = np.array(c['x']); x[0] = x0
th0 = np.array(c['theta'])
sol = solve_bvp(f, bc, x, np.vstack([th0, np.gradient(th0, x)]), tol=1e-9, max_nodes=200000)
L = x[-1]
theta = lambda z: sol.sol(z)[0]
dtheta = lambda z: sol.sol(z)[1]
pts = np.linspace(x0, L, 60)
def integ(g):
    return sum(quad(g, pts[i], pts[i+1], epsabs=0, epsrel=1e-12, limit=200)[0] for i in range(len(pts)-1))
I = integ(lambda z: (dtheta(z)**2 + np.sin(theta(z))**2/z**2)*z)
ID = De*integ(lambda z: (dtheta(z) + np.sin(theta(z))*np.cos(theta(z))/z)*z)
Q = (np.cos(theta(x0)) - np.cos(theta(L)))/2
radius = De*brentq(lambda z: theta(z) - np.pi/2, x0, L)
def thiele(Iv, IDv, j, force=None):
    pre = Ms*t/gam
    G = 4*np.pi*round(Q)*pre
    Dis = pre*np.pi*Iv
    u = ge*muB*P*j/(2*sc.e*Ms)
    Bdl = sc.hbar*th*j/(2*sc.e*Ms*t)
    F = np.pi*Ms*t*Bdl*IDv*np.array([np.cos(h), -np.sin(h)]) if force is None else np.array(force)
    Gm = np.array([[0, G], [-G, 0]])
    uv = np.array([u, 0.0]) if force is None else np.zeros(2)
    v = np.linalg.solve(Gm - al*Dis*np.eye(2), Gm@uv - beta*Dis*uv - F)
    return v, G, Dis
def parts(Iv, IDv, j):
    v, G, Dis = thiele(Iv, IDv, j)
    return v
vj, G, Dis = thiele(I, ID, c['j'])
out = {'I': I, 'ID': ID, 'Q': Q, 'radius': radius, 'G': G, 'Dis': Dis, 'vx': vj[0], 'vy': vj[1],
       'speed': float(np.hypot(*vj)), 'hall': float(np.arctan2(vj[1], vj[0])),
       'currents': [list(parts(I, ID, j)) for j in c['currents']]}
# STT alone (thetaSH = 0) and SOT alone (P = 0)
P0, th0_ = P, th
th = 0.0; v = parts(I, ID, c['j']); out['hallStt'] = float(np.arctan2(v[1], v[0]))
th = th0_; P = 0.0; v = parts(I, ID, c['j']); out['hallSot'] = float(np.arctan2(v[1], v[0]))
P = P0
# the radius sweep: the ansatz tan(theta/2) = sinh(a)/sinh(x) with w = Delta
def ansatz(a):
    th_ = lambda z: 2*np.arctan(np.sinh(a)/np.sinh(z))
    dth = lambda z: -np.sin(th_(z))/np.tanh(z)
    up = a + 40
    br = [1e-12, a/2, a, a + 2, a + 8, up]
    g1 = lambda z: (dth(z)**2 + np.sin(th_(z))**2/z**2)*z
    g2 = lambda z: (dth(z)*z + np.sin(th_(z))*np.cos(th_(z)))
    Iex = sum(quad(g1, br[i], br[i+1], epsabs=0, epsrel=1e-12, limit=200)[0] for i in range(5))
    IDa = sum(quad(g2, br[i], br[i+1], epsabs=0, epsrel=1e-12, limit=200)[0] for i in range(5))
    return Iex, De*IDa
rs = []
for i in c['radiusIndex']:
    Rr = De*0.5*60**(i/59)
    Iex, IDa = ansatz(Rr/De)
    v = parts(Iex, IDa, c['j'])
    vf, _, _ = thiele(Iex, IDa, 0.0, force=[1e-15, 0.0])
    rs.append({'R': Rr, 'hall': float(np.arctan2(v[1], v[0])), 'speed': float(np.hypot(*v)), 'force': float(np.arctan2(vf[1], vf[0]))})
out['radii'] = rs
print(json.dumps(out))
`;

const DROPLET = `
import json, sys, numpy as np
import scipy.constants as sc
from scipy.integrate import quad, solve_ivp
from scipy.optimize import minimize_scalar, brentq
c = json.load(sys.stdin)
mu0 = sc.mu_0
gam = sc.physical_constants['electron gyromag. ratio'][0]
Ms, A, Ku, t, al, B, rc, P = c['Ms'], c['A'], c['Ku'], c['t'], c['alpha'], c['B'], c['contactRadius'], c['P']
K = Ku - mu0*Ms**2/2
w = np.sqrt(A/K)
xc = rc/w
def theta(x, a): return 2*np.arctan(np.sinh(a)/np.sinh(x))
def dth_dx(x, a): return -np.sin(theta(x, a))/np.tanh(x)
def dth_da(x, a): return 2*np.cosh(a)*np.sinh(x)/(np.sinh(x)**2 + np.sinh(a)**2)
gx, gw = np.polynomial.legendre.leggauss(40)
def q(g, a, lo=0.0, hi=None):
    # composite Gauss-Legendre (numpy leggauss, 40 nodes) on panels of width <= 0.25 between breakpoints
    hi = a + 45 if hi is None else hi
    br = sorted(set([lo] + [z for z in (a/2, a, a + 2, a + 8) if lo < z < hi] + [hi]))
    edges = np.concatenate([np.linspace(br[i], br[i+1], int(np.ceil((br[i+1] - br[i])/0.25)) + 1)[:-1] for i in range(len(br)-1)] + [[hi]])
    lo_, hi_ = edges[:-1, None], edges[1:, None]
    xs = (0.5*(lo_ + hi_) + 0.5*(hi_ - lo_)*gx).ravel()
    ws = (0.5*(hi_ - lo_)*gw).ravel()
    return float(np.sum(ws*g(xs)))
def Iex(a): return q(lambda x: (dth_dx(x, a)**2 + np.sin(theta(x, a))**2/x**2)*x, a)
def IK(a): return q(lambda x: np.sin(theta(x, a))**2*x, a)
def IZ(a): return q(lambda x: (1 - np.cos(theta(x, a)))*x, a)
def Ic(a): return q(lambda x: np.sin(theta(x, a))**2*x, a, hi=xc)
def IRR(a): return q(lambda x: dth_da(x, a)**2*x, a)
def d(fn, a, h=1e-3):
    return (fn(a - 2*h) - 8*fn(a - h) + 8*fn(a + h) - fn(a + 2*h))/(12*h)
def E(a): return A*Iex(a) + (K*IK(a) + Ms*B*IZ(a))*w*w
def omega(a):  # gamma E'(R) / (Ms t N'(R)), N = 2 pi w^2 I_Z, E = 2 pi t (...)
    return gam*d(E, a)/(Ms*w*w*d(IZ, a))
def balance(a): return al*omega(a)*IK(a)/Ic(a)
perAmp = gam*sc.hbar*P/(np.pi*rc**2)/(2*sc.e*Ms*t)
sigma = perAmp*c['current']
out = {'sigma': sigma, 'w': w}
out['radii'] = [{'f': omega(R/w)/(2*np.pi), 'thin': (gam*B + gam*4*np.sqrt(A*K)/(2*Ms*R))/(2*np.pi),
                 'bal': min(balance(R/w)/perAmp, 1e3) if omega(R/w) > 0 else 1e3} for R in c['radii']]
lo, hi = np.log(0.1), np.log(max(10, 4*xc + 10))
g = np.linspace(lo, hi, 200)
vals = [balance(np.exp(z)) if omega(np.exp(z)) > 0 else np.inf for z in g]
k = int(np.argmin(vals))
m = minimize_scalar(lambda z: balance(np.exp(z)), bounds=(g[max(k-1, 0)], g[min(k+1, 199)]), method='bounded', options={'xatol': 1e-10})
aTh = np.exp(m.x)
out['thTorque'] = balance(aTh); out['thRadius'] = aTh*w
if sigma > out['thTorque']:
    aS = brentq(lambda a: balance(a) - sigma, aTh, max(10, 4*xc + 10), xtol=1e-13)
    out['stable'] = aS*w; out['freq'] = omega(aS)/(2*np.pi)
def rhs(s, y):
    a = max(y[0], 1e-3)
    Kv, Zp, RR, om = IK(a), d(IZ, a), IRR(a), omega(a)
    da = (sigma*Ic(a) - al*om*Kv)/(Zp + al*al*Kv*RR/Zp)
    return [da*1e-9, (om + al*RR*da/Zp)*1e-9]
tt = np.array(c['time'])/1e-9
sol = solve_ivp(rhs, (0, tt[-1]), [c['startRadius']/w, 0.0], t_eval=tt, rtol=1e-10, atol=1e-12, method='DOP853')
out['traceR'] = (sol.y[0]*w).tolist(); out['tracePhi'] = sol.y[1].tolist()
print(json.dumps(out))
`;

describe("skyrmion dynamics: every output against scipy oracles", () => {
  it("skyrmion-drift (exact profile): integrals, Thiele velocity, Hall angles, current and radius sweeps", () => {
    // Source: see the file header (Thiele 1973; Bogdanov-Hubert 1994; Braun 1994; Belavin-Polyakov 1975); runPython oracles.
    const film = { Ms: 1.0e6, A: 1.3e-11, Ku: 1.1e6, D: 2.2e-3, t: 0.9e-9 };
    const inputs = { ...film, alpha: 0.15, B: 0.08, j: 3e11, P: 0.55, beta: 0.3, thetaSH: -0.12, profile: 1 };
    const spec = getCalculator("skyrmion-drift");
    const r = runCalculator(spec, inputs, { sweep: { over: "j", from: 0, to: 6e11, points: 4 } });
    const K = inputs.Ku - (4e-7 * Math.PI * film.Ms ** 2) / 2;
    const Delta = Math.sqrt(film.A / K);
    // the starting guess for scipy (any reasonable profile): the library's exact solution, thinned
    const s = solveSkyrmionExact(makeFilm({ ...film, dmi: "interfacial" }), inputs.B);
    const x: number[] = [];
    const theta: number[] = [];
    for (let i = 0; i < s.theta.length; i += 10) {
      x.push(s.rho[i]! / Delta);
      theta.push(s.theta[i]!);
    }
    const helicity = num(r, "helicity");
    // interfacial DMI makes Neel skyrmions: helicity 0 or pi (A. Fert, V. Cros, J. Sampaio, Nat. Nanotechnol. 8, 152 (2013))
    expect(Math.min(Math.abs(helicity), Math.abs(Math.abs(helicity) - Math.PI))).toBeLessThan(1e-12);
    const currents = arr(r, "currents");
    const idx = [0, 13, 37, 59];
    const o = runPython<{
      I: number;
      ID: number;
      Q: number;
      radius: number;
      G: number;
      Dis: number;
      vx: number;
      vy: number;
      speed: number;
      hall: number;
      hallStt: number;
      hallSot: number;
      currents: [number, number][];
      radii: { R: number; hall: number; speed: number; force: number }[];
    }>(DRIFT, { ...inputs, helicity, x, theta, currents, radiusIndex: idx });
    expect(rel(num(r, "radius"), o.radius)).toBeLessThan(1e-4);
    expect(num(r, "charge")).toBe(-1);
    expect(Math.round(o.Q)).toBe(-1);
    expect(rel(num(r, "dissipationIntegral"), o.I)).toBeLessThan(1e-4);
    expect(rel(num(r, "dmiIntegral"), o.ID)).toBeLessThan(1e-4);
    expect(rel(num(r, "gyrocoupling"), o.G)).toBeLessThan(1e-9);
    expect(rel(num(r, "dissipation"), o.Dis)).toBeLessThan(1e-4);
    expect(rel(num(r, "vx"), o.vx)).toBeLessThan(1e-4);
    expect(rel(num(r, "vy"), o.vy)).toBeLessThan(1e-4);
    expect(rel(num(r, "speed"), o.speed)).toBeLessThan(1e-4);
    expect(Math.abs(num(r, "hallAngle") - o.hall)).toBeLessThan(1e-4);
    expect(Math.abs(num(r, "hallAngleStt") - o.hallStt)).toBeLessThan(1e-4);
    expect(Math.abs(num(r, "hallAngleSot") - o.hallSot)).toBeLessThan(1e-4);
    expect(currents.length).toBe(4);
    currents.forEach((_, k) => {
      const [vx, vy] = o.currents[k]!;
      expect(Math.abs(arr(r, "currentVx")[k]! - vx), `v_x at j = ${currents[k]}`).toBeLessThan(1e-4 * (Math.abs(vx) + 1e-3));
      expect(Math.abs(arr(r, "currentVy")[k]! - vy), `v_y at j = ${currents[k]}`).toBeLessThan(1e-4 * (Math.abs(vy) + 1e-3));
    });
    expect(arr(r, "radii").length).toBe(60);
    idx.forEach((i, k) => {
      const ref = o.radii[k]!;
      expect(rel(arr(r, "radii")[i]!, ref.R)).toBeLessThan(1e-12);
      expect(Math.abs(arr(r, "radiusHallAngle")[i]! - ref.hall)).toBeLessThan(1e-7);
      expect(rel(arr(r, "radiusSpeed")[i]!, ref.speed)).toBeLessThan(1e-7);
      expect(Math.abs(arr(r, "radiusForceHallAngle")[i]! - ref.force)).toBeLessThan(1e-7);
    });
  });

  it("precessing-skyrmion: torque rate, omega(R), balance current, threshold, stable state and R(t)", () => {
    // Source: see the file header (Hoefer, Silva, Keller 2010; Slonczewski 1996; Braun 1994); runPython oracle.
    const inputs = { Ms: 7e5, A: 1.1e-11, Ku: 5.5e5, t: 2.5e-9, alpha: 0.08, B: 0.15, contactRadius: 5e-8, P: 0.35, current: 0.004, startRadius: 2.5e-8, duration: 3e-9 };
    const r = runCalculator(getCalculator("precessing-skyrmion"), inputs);
    const radii = arr(r, "radii");
    const idx = [0, 20, 47, 79];
    const time = arr(r, "time");
    const o = runPython<{
      sigma: number;
      w: number;
      radii: { f: number; thin: number; bal: number }[];
      thTorque: number;
      thRadius: number;
      stable?: number;
      freq?: number;
      traceR: number[];
      tracePhi: number[];
    }>(DROPLET, { ...inputs, radii: idx.map((i) => radii[i]!), time });
    expect(rel(num(r, "torqueRate"), o.sigma)).toBeLessThan(1e-9);
    expect(rel(num(r, "width"), o.w)).toBeLessThan(1e-12);
    expect(rel(num(r, "thresholdTorque"), o.thTorque)).toBeLessThan(1e-6);
    expect(rel(num(r, "thresholdRadius"), o.thRadius)).toBeLessThan(1e-3);
    expect(rel(num(r, "thresholdCurrent") * (o.sigma / inputs.current), o.thTorque)).toBeLessThan(1e-6);
    expect(o.stable, "the oracle finds a stable radius").toBeDefined();
    expect(num(r, "state")).toMatch(/precessing skyrmion held/);
    expect(rel(num(r, "stableRadius"), o.stable!)).toBeLessThan(1e-6);
    expect(rel(num(r, "frequency"), o.freq!)).toBeLessThan(1e-6);
    idx.forEach((i, k) => {
      expect(rel(arr(r, "radiusFrequency")[i]!, o.radii[k]!.f), `omega at R = ${radii[i]}`).toBeLessThan(1e-7);
      expect(rel(arr(r, "thinWallFrequency")[i]!, o.radii[k]!.thin)).toBeLessThan(1e-12);
      expect(rel(arr(r, "balanceCurrent")[i]!, o.radii[k]!.bal)).toBeLessThan(1e-6);
    });
    expect(time.length).toBe(301);
    expect(rel(time[300]!, inputs.duration)).toBeLessThan(1e-12);
    for (let i = 0; i < 301; i += 25) {
      expect(rel(arr(r, "traceRadius")[i]!, o.traceR[i]!), `R at ${time[i]}`).toBeLessThan(1e-6);
      expect(Math.abs(arr(r, "traceAngle")[i]! - o.tracePhi[i]!), `Phi at ${time[i]}`).toBeLessThan(1e-5 * (1 + Math.abs(o.tracePhi[i]!)));
    }
    expect(num(r, "traceStatus")).toMatch(/running/);
  });
});
