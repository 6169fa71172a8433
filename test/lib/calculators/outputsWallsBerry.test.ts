/**
 * The remaining outputs of wall, wall360, wall-type, berry-loop, chern, spin-tunnel, easy-plane and
 * wall-fit against outside sources (each named beside its check): closed forms evaluated here or in
 * Python, numpy diagonalizations and a scipy least-squares fit of the same synthetic data.
 */
import { describe, expect, it } from "vitest";
import { getCalculator, runCalculator } from "@helicoid/lib";
import { runPython } from "../../helpers/python.js";

type R = ReturnType<typeof runCalculator>;
const num = (r: R, name: string): number => r.outputs[name]!.value as number;
const arr = (r: R, name: string): number[] => r.outputs[name]!.value as number[];
const rel = (a: number, b: number): number => Math.abs(a - b) / Math.max(Math.abs(b), 1e-300);
const wrap = (x: number): number => x - 2 * Math.PI * Math.round(x / (2 * Math.PI));

/** mu0 from scipy (CODATA 2018), shared by the wall checks. */
const mu0 = runPython<number>("import json, scipy.constants as c\nprint(json.dumps(c.mu_0))");

const film = { Ms: 8.5e5, A: 1.8e-11, Ku: 9.5e5, D: 0.9e-3, t: 1.6e-9 };
const Keff = film.Ku - (mu0 * film.Ms ** 2) / 2;
const Delta = Math.sqrt(film.A / Keff);

/**
 * The Neel volume-charge energy of the sech wall with the film kernel, in Fourier space (scipy quad):
 * C = (mu0 Ms^2 / 2) int dk/2pi |m_x(k)|^2 (1 - (1 - e^{-|k| t}) / (|k| t)), m_x(k) = pi Delta sech(pi k Delta / 2)
 * (the Fourier pair of sech: I. Gradshteyn, I. Ryzhik, Table of Integrals, 3.981.3; the thin-film
 * charge kernel: A. Hubert, R. Schaefer, Magnetic Domains (Springer 1998), sec. 3.2.5).
 */
const NEEL_C = `
import json, sys, numpy as np
from scipy.integrate import quad
c = json.load(sys.stdin)
Ms, De, mu0 = c['Ms'], c['Delta'], c['mu0']
def C(t):
    # in the variable u = pi k Delta / 2 (even integrand: twice the half line)
    def f(u):
        k = 2*u/(np.pi*De)
        return (np.pi*De/np.cosh(u))**2*(1 - (-np.expm1(-k*t))/(k*t))*2/(np.pi*De)
    return mu0*Ms**2/2*2*quad(f, 0, 50, epsabs=0, epsrel=1e-12, limit=400)[0]/(2*np.pi)
print(json.dumps([C(t) for t in c['ts']]))
`;

describe("walls: the remaining outputs against closed forms", () => {
  it("wall: slope width 2 Delta, in-plane FWHM, and the energy with the full-kernel volume charges", () => {
    const r = runCalculator(getCalculator("wall"), film);
    // m_z = -tanh(x / Delta): slope width 2 Delta; m_inplane = sech(x / Delta): FWHM 2 arccosh(2) Delta
    // (A. Hubert, R. Schaefer, Magnetic Domains (Springer 1998), sec. 3.6.1, wall width definitions)
    expect(rel(num(r, "mzSlopeWidth"), 2 * Delta)).toBeLessThan(1e-12);
    expect(rel(num(r, "inPlaneFwhm"), 2 * Math.acosh(2) * Delta)).toBeLessThan(1e-12);
    // sigma(psi) = 4 sqrt(A K_eff) - pi D cos psi + C cos^2 psi minimized over psi (A. Thiaville et al., EPL 100, 57002 (2012), eq. 4)
    const [C] = runPython<number[]>(NEEL_C, { Ms: film.Ms, Delta, mu0, ts: [film.t] });
    const s0 = 4 * Math.sqrt(film.A * Keff);
    let best = Infinity;
    for (let i = 0; i <= 200000; i++) {
      const c = -1 + (2 * i) / 200000;
      best = Math.min(best, s0 - Math.PI * film.D * c + C! * c * c);
    }
    expect(rel(num(r, "energyWithVolumeCharges"), best)).toBeLessThan(1e-9);
  });

  it("wall-type: the Neel threshold D_N(t) = 2 C(t) / pi, full kernel and thin-film limit", () => {
    const r = runCalculator(getCalculator("wall-type"), film);
    const ts = arr(r, "curveT");
    expect(ts.length).toBeGreaterThan(10);
    const C = runPython<number[]>(NEEL_C, { Ms: film.Ms, Delta, mu0, ts });
    ts.forEach((t, i) => {
      expect(rel(arr(r, "curveFullKernel")[i]!, (2 * C[i]!) / Math.PI), `full kernel at t = ${t}`).toBeLessThan(1e-8);
      // thin-film limit C = (ln 2 / pi) mu0 Ms^2 t (N_x = t ln2 / (pi Delta): S. V. Tarasenko et al., JMMM 189, 19 (1998))
      expect(rel(arr(r, "curveThinFilm")[i]!, (2 * Math.LN2 * mu0 * film.Ms ** 2 * t) / Math.PI ** 2)).toBeLessThan(1e-12);
    });
  });

  it("wall360: Braun's exact pair over a field sweep, the merge field and the in-plane profile", () => {
    // Source: H.-B. Braun, PRB 50, 16501 (1994): the exact 1D 360-degree wall in a field,
    // tan(theta/2) = sinh(R/w) / sinh(|x|/w) with w = Delta / sqrt(1 + h), sinh(R/w) = sqrt((1 + h)/h),
    // h = Ms B / (2 K_eff); its energy per area integrated here in scipy from the energy density
    // A theta'^2 + K_eff sin^2 theta + Ms B (1 - cos theta) plus the DMI term -pi D per wall.
    const spec = getCalculator("wall360");
    const r = runCalculator(spec, { ...film, B: 0.07 }, { sweep: { over: "B", from: 0.01, to: 0.5, points: 6 } });
    const fields = arr(r, "fieldSweep");
    expect(fields.length).toBe(6);
    const o = runPython<{ w: number[]; E: number[]; merge: number; prof: number[] }>(
      `
import json, sys, numpy as np
from scipy.integrate import quad
from scipy.optimize import brentq
c = json.load(sys.stdin)
A, K, Ms, D, De = c['A'], c['K'], c['Ms'], c['D'], c['Delta']
def pair(B):
    h = Ms*B/(2*K); w = De/np.sqrt(1 + h); R = w*np.arcsinh(np.sqrt((1 + h)/h))
    return R, w
def energy(B):
    R, w = pair(B)
    th = lambda x: 2*np.arctan(np.sinh(R/w)/np.sinh(x/w))
    dth = lambda x: -np.sin(th(x))/(w*np.tanh(x/w))
    e = lambda x: A*dth(x)**2 + K*np.sin(th(x))**2 + Ms*B*(1 - np.cos(th(x)))
    return 2*(quad(e, 1e-30, R, epsabs=0, epsrel=1e-12, limit=400)[0] + quad(e, R, R + 60*w, epsabs=0, epsrel=1e-12, limit=400)[0]) - 2*np.pi*abs(D)
merge = brentq(lambda B: pair(B)[0] - pair(B)[1], 1e-6, 100, xtol=1e-16)
R, w = pair(c['B'])
prof = [float(np.sign(x)*np.sin(2*np.arctan(np.sinh(R/w)/np.sinh(abs(x)/w)))) if x != 0 else 0.0 for x in c['x']]
print(json.dumps({'w': [pair(B)[1] for B in c['fields']], 'E': [energy(B) for B in c['fields']], 'merge': merge, 'prof': prof}))`,
      { ...film, K: Keff, Delta, B: 0.07, fields, x: arr(r, "x") },
    );
    fields.forEach((B, i) => {
      expect(rel(arr(r, "wallWidthSweep")[i]!, o.w[i]!), `w at B = ${B}`).toBeLessThan(1e-6);
      expect(rel(arr(r, "energySweep")[i]!, o.E[i]!), `energy at B = ${B}`).toBeLessThan(1e-6);
    });
    expect(rel(num(r, "mergeField"), o.merge)).toBeLessThan(1e-9);
    // the in-plane component along the helicity direction: sign(x) sin theta(x) (the two walls turn the same way)
    const m = arr(r, "mInPlane");
    const x = arr(r, "x");
    x.forEach((xi, i) => {
      if (Math.abs(xi) > 1e-15) expect(Math.abs(Math.abs(m[i]!) - Math.abs(o.prof[i]!)), `|m_inplane| at x = ${xi}`).toBeLessThan(1e-5);
    });
    // the sign flips between the two walls (x < 0 and x > 0)
    const left = m[x.findIndex((xi) => xi < -Delta)]!;
    const right = m[x.findLastIndex((xi) => xi > Delta)]!;
    expect(Math.sign(left)).toBe(-Math.sign(right));
  });
});

describe("Berry phases and spins: the remaining outputs", () => {
  it("berry-loop: discrete phases of every m from numpy spin coherent states; the cone closed form; the theta sweep", () => {
    // Source: M. V. Berry, Proc. R. Soc. A 392, 45 (1984) (gamma_m = -m Omega, the cap Omega = 2 pi (1 - cos theta));
    // discrete (Pancharatnam) phase -arg prod <u_k|u_k+1> of the states R(n_k)|S, m> built in numpy
    // (R. Resta, J. Phys.: Condens. Matter 12, R107 (2000), eq. 4.1).
    const inputs = { twoS: 5, theta: 1.3, segments: 120 };
    const r = runCalculator(getCalculator("berry-loop"), inputs, { sweep: { over: "theta", from: 0.3, to: 2.5, points: 4 } });
    const o = runPython<{ m: number[]; disc: number[]; omega: number; arc: number; sweep: { disc: number; omega: number }[] }>(
      `
import json, sys, numpy as np
from scipy.linalg import expm
c = json.load(sys.stdin)
S = c['twoS']/2; n = c['twoS'] + 1
m = S - np.arange(n)
Jp = np.zeros((n, n))
for k in range(1, n): Jp[k-1, k] = np.sqrt(S*(S + 1) - m[k]*(m[k] + 1))
Jy = (Jp - Jp.T)/(2j); Jz = np.diag(m)
def loop(th, N):
    phis = 2*np.pi*np.arange(N)/N
    U = [expm(-1j*p*Jz)@expm(-1j*th*Jy) for p in phis]
    prod = np.ones(n, complex)
    for k in range(N):
        prod *= np.einsum('ij,ij->j', U[k].conj(), U[(k + 1) % N])
    v = np.stack([np.sin(th)*np.cos(phis), np.sin(th)*np.sin(phis), np.cos(th)*np.ones(N)], 1)
    a = np.array([0., 0., 1.]); om = 0.0
    for k in range(N):
        b, cc = v[k], v[(k + 1) % N]
        om += 2*np.arctan2(np.dot(a, np.cross(b, cc)), 1 + a@b + b@cc + cc@a)
    return -np.angle(prod), abs(om), float(np.arccos(np.clip(v[0]@v[1], -1, 1)))
d, om, arc = loop(c['theta'], c['segments'])
sw = []
for th in c['thetas']:
    dd, oo, _ = loop(th, c['segments'])
    sw.append({'disc': float(dd[0]), 'omega': oo})
print(json.dumps({'m': m.tolist(), 'disc': d.tolist(), 'omega': om, 'arc': arc, 'sweep': sw}))`,
      { ...inputs, thetas: arr(r, "thetaSweep") },
    );
    expect(arr(r, "mValues")).toEqual(o.m);
    expect(Math.abs(num(r, "edgeArc") - o.arc)).toBeLessThan(1e-12);
    const cap = 2 * Math.PI * (1 - Math.cos(inputs.theta));
    o.m.forEach((m, i) => {
      expect(Math.abs(wrap(arr(r, "gammaDiscrete")[i]! - o.disc[i]!)), `discrete, m = ${m}`).toBeLessThan(1e-9);
      expect(Math.abs(wrap(arr(r, "gammaGeometric")[i]! + m * o.omega)), `geometric, m = ${m}`).toBeLessThan(1e-9);
      expect(Math.abs(wrap(arr(r, "gammaCircle")[i]! + m * cap)), `cone, m = ${m}`).toBeLessThan(1e-12);
    });
    expect(Math.abs(wrap(num(r, "gammaTopDiscrete") - o.disc[0]!))).toBeLessThan(1e-9);
    const S = inputs.twoS / 2;
    arr(r, "thetaSweep").forEach((t, k) => {
      const top = arr(r, "gammaTopSweep")[k]!;
      expect(top > -Math.PI - 1e-12 && top <= Math.PI + 1e-12).toBe(true);
      expect(Math.abs(wrap(top + S * o.sweep[k]!.omega)), `geometric at theta = ${t}`).toBeLessThan(1e-9);
      expect(Math.abs(wrap(arr(r, "gammaTopDiscreteSweep")[k]! - o.sweep[k]!.disc))).toBeLessThan(1e-9);
      expect(Math.abs(wrap(arr(r, "gammaTopCircleSweep")[k]! + S * 2 * Math.PI * (1 - Math.cos(t))))).toBeLessThan(1e-12);
    });
  });

  it("chern: the gap at K', the closed-form phase diagram over the sweep (odd in phi) and unresolved masses only near the transition", () => {
    // Source: F. D. M. Haldane, PRL 61, 2015 (1988): Dirac masses M -+ 3 sqrt3 t2 sin phi at K and K'
    // (gaps 2 |M -+ 3 sqrt3 t2 sin phi|); C = 0 for |M| > 3 sqrt3 t2 |sin phi|, |C| = 1 inside, odd in phi.
    const spec = getCalculator("chern");
    const [t2, phi] = [0.15, 1.1];
    const Mc = 3 * Math.sqrt(3) * t2 * Math.sin(phi);
    const sweep = { over: "M", from: -1.5 * Mc, to: 1.5 * Mc, points: 13 };
    const r = runCalculator(spec, { t2, phi, M: 0.3, grid: 30, sweepGrid: 24 }, { sweep });
    const rm = runCalculator(spec, { t2, phi: -phi, M: 0.3, grid: 30, sweepGrid: 24 }, { sweep });
    const gaps = [num(r, "gapK"), num(r, "gapKprime")].sort((a, b) => a - b);
    const ref = [2 * Math.abs(0.3 - Mc), 2 * Math.abs(0.3 + Mc)].sort((a, b) => a - b);
    expect(Math.abs(gaps[0]! - ref[0]!)).toBeLessThan(1e-12);
    expect(Math.abs(gaps[1]! - ref[1]!)).toBeLessThan(1e-12);
    const Ms = arr(r, "MSweep");
    expect(Ms.length).toBe(13);
    Ms.forEach((M, i) => {
      expect(Math.abs(M - (sweep.from + ((sweep.to - sweep.from) * i) / 12))).toBeLessThan(1e-12);
      const c = arr(r, "chernClosedFormSweep")[i]!;
      const cm = arr(rm, "chernClosedFormSweep")[i]!;
      if (Math.abs(M) > Mc * (1 + 1e-9)) expect(c, `C outside at M = ${M}`).toBe(0);
      else if (Math.abs(M) < Mc * (1 - 1e-9)) {
        expect(Math.abs(c), `|C| inside at M = ${M}`).toBe(1);
        expect(cm, "C is odd in phi").toBe(-c);
      }
    });
    // the Chern number is undefined where the gap closes, |M| = Mc (two of the sweep points): those and
    // only those are reported unresolved on the 24 x 24 grid
    const un = arr(r, "MUnresolved");
    expect(un.length).toBe(2);
    for (const M of un) expect(Math.abs(Math.abs(M) - Mc), `unresolved at M = ${M}`).toBeLessThan(1e-9 * Mc);
    const all = new Set([...un, ...arr(r, "MResolved")]);
    expect(all.size).toBe(Ms.length);
  });

  it("spin-tunnel: the three lowest levels against the hard-axis field from numpy diagonalization", () => {
    // Source: the giant-spin Hamiltonian of Fe8, H = -D Sz^2 + E (Sx^2 - Sy^2) + g muB B . S, g = 2
    // (W. Wernsdorfer, R. Sessoli, Science 284, 133 (1999)), diagonalized by numpy; CODATA 2018 muB / k_B (scipy).
    const inputs = { S: 7, D: 0.5, E: 0.07, Bmax: 1.2, C: 0, misalignment: 0.2 };
    const r = runCalculator(getCalculator("spin-tunnel"), inputs);
    const Bs = arr(r, "BSweep");
    const pick = [0, Math.floor(Bs.length / 3), Math.floor((2 * Bs.length) / 3), Bs.length - 1];
    const o = runPython<number[][]>(
      `
import json, sys, numpy as np, scipy.constants as sc
c = json.load(sys.stdin)
S = c['S']; n = int(2*S + 1); m = S - np.arange(n)
Jp = np.zeros((n, n))
for k in range(1, n): Jp[k-1, k] = np.sqrt(S*(S + 1) - m[k]*(m[k] + 1))
Sx, Sy, Sz = (Jp + Jp.T)/2, (Jp - Jp.T)/(2j), np.diag(m)
b = 2*sc.physical_constants['Bohr magneton'][0]/sc.k
out = []
for B in c['B']:
    H = -c['D']*Sz@Sz + c['E']*(Sx@Sx - Sy@Sy) + b*B*(np.cos(c['misalignment'])*Sx + np.sin(c['misalignment'])*Sy)
    out.append(np.linalg.eigvalsh(H)[:3].tolist())
print(json.dumps(out))`,
      { ...inputs, B: pick.map((i) => Bs[i]!) },
    );
    pick.forEach((i, k) => {
      for (const [j, name] of (["level0", "level1", "level2"] as const).entries())
        expect(Math.abs(arr(r, name)[i]! - o[k]![j]!), `${name} at B = ${Bs[i]}`).toBeLessThan(1e-9 * Math.max(1, Math.abs(o[k]![j]!)));
    });
  });

  it("easy-plane: crossing fields D (2m + 1) / (g muB) and the sweep fields", () => {
    // Source: H = D Sz^2 - g muB B Sz: levels m and m + 1 cross at g muB B = D (2m + 1) (A. Abragam,
    // B. Bleaney, Electron Paramagnetic Resonance of Transition Ions (Oxford 1970), ch. 16); CODATA 2018 from scipy.
    const c = runPython<{ muB: number; kB: number }>("import json, scipy.constants as c\nprint(json.dumps({'muB': c.physical_constants['Bohr magneton'][0], 'kB': c.k}))");
    const [twoS, D] = [7, 1.7];
    const r = runCalculator(getCalculator("easy-plane"), { twoS, D, B: 3, T: 0.8 }, { sweep: { over: "B", from: 0, to: 12, points: 7 } });
    const S = twoS / 2;
    const ref: number[] = [];
    for (let m = -S; m <= S - 1; m++) ref.push((D * c.kB * (2 * m + 1)) / (2 * c.muB));
    const got = arr(r, "crossingFields");
    expect(got.length).toBe(ref.length);
    got.forEach((b, i) => expect(Math.abs(b - ref[i]!)).toBeLessThan(1e-9 * Math.max(1, Math.abs(ref[i]!))));
    arr(r, "BSweep").forEach((b, i) => expect(Math.abs(b - 2 * i)).toBeLessThan(1e-12));
    // the rotor's Boltzmann weight beyond |m| = S: levels D (m - x)^2, x = g muB B / (2 D), m in Z (+1/2 for
    // half-integer S) (the planar rotor of a large easy-plane spin; summed in mpmath to |m| = 200)
    const hot = runCalculator(getCalculator("easy-plane"), { twoS: 3, D: 1.7, B: 3, T: 8 });
    const refTrunc = runPython<number>(
      `
import json, sys, mpmath as mp
c = json.load(sys.stdin)
x = mp.mpf(c['b'])/(2*c['D'])
ms = [mp.mpf(k) + (mp.mpf(1)/2 if c['twoS'] % 2 else 0) for k in range(-200, 200)]
w = lambda m: mp.exp(-c['D']*(m - x)**2/c['T'])
S = mp.mpf(c['twoS'])/2
print(json.dumps(float(sum(w(m) for m in ms if abs(m) > S)/sum(w(m) for m in ms))))`,
      { twoS: 3, D: 1.7, T: 8, b: (2 * c.muB * 3) / c.kB },
    );
    expect(refTrunc).toBeGreaterThan(0.01);
    expect(Math.abs(num(hot, "truncation") / refTrunc - 1)).toBeLessThan(1e-9);
  });

  it("wall-fit: scipy curve_fit of the same synthetic cut gives the same correlation, pulls, chi-square and residuals", () => {
    // Source: scipy.optimize.curve_fit (Levenberg-Marquardt, absolute_sigma=True) of offset + contrast cos theta,
    // tan(theta/2) = sinh(R/w) / sinh(|x - x0|/w) (H.-B. Braun, PRB 50, 16501 (1994)); correlation from the covariance.
    const inputs = { R: 4.5e-8, w: 1.1e-8, noise: 0.05, points: 257, seed: 7 };
    const r = runCalculator(getCalculator("wall-fit"), inputs);
    const o = runPython<{ corr: number; R: number; w: number; sw: number; chi2: number; res: number[] }>(
      `
import json, sys, numpy as np
from scipy.optimize import curve_fit
c = json.load(sys.stdin)
x = np.array(c['x']); y = np.array(c['y']); s = c['noise']
def f(x, x0, R, w, off, con):
    u = np.abs(x - x0)/w
    th = 2*np.arctan(np.sinh(R/w)/np.maximum(np.sinh(u), 1e-300))
    return off + con*np.cos(th)
p0 = [0.0, c['R']*1.1, c['w']*0.9, 0.0, 1.0]
p, C = curve_fit(f, x, y, p0=p0, sigma=np.full_like(x, s), absolute_sigma=True, xtol=1e-15, ftol=1e-15, maxfev=100000)
res = y - f(x, *p)
print(json.dumps({'corr': C[1, 2]/np.sqrt(C[1, 1]*C[2, 2]), 'R': p[1], 'w': p[2], 'sw': np.sqrt(C[2, 2]),
                  'chi2': float(np.sum((res/s)**2)/(len(x) - 5)), 'res': res.tolist()}))`,
      { ...inputs, x: arr(r, "x"), y: arr(r, "data") },
    );
    expect(rel(num(r, "wfit"), o.w)).toBeLessThan(1e-6);
    expect(Math.abs(num(r, "correlationRw") - o.corr)).toBeLessThan(1e-5);
    expect(Math.abs(num(r, "wpull") - (o.w - inputs.w) / o.sw)).toBeLessThan(1e-4);
    expect(rel(num(r, "chiSquareReduced"), o.chi2)).toBeLessThan(1e-8);
    arr(r, "residual").forEach((v, i) => expect(Math.abs(v - o.res[i]!)).toBeLessThan(1e-7));
    // the fitted curve: the data minus scipy's residuals
    const data = arr(r, "data");
    arr(r, "model").forEach((v, i) => expect(Math.abs(v - (data[i]! - o.res[i]!))).toBeLessThan(1e-7));
    // with the generating model and known sigma, the reduced chi-square is 1 within a few sqrt(2 / nu)
    expect(Math.abs(num(r, "chiSquareReduced") - 1)).toBeLessThan(4 * Math.sqrt(2 / (inputs.points - 5)));
  });
});
