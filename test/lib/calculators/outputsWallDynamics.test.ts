/**
 * Every output of wall-motion, wall-current and wall-trace against an independent scipy oracle of
 * the one-dimensional (q, phi) wall model, at inputs away from the defaults.
 *
 * Source of the model: A. Thiaville, S. Rohart, E. Jue, V. Cros, A. Fert, EPL 100, 57002 (2012),
 * eqs. (2)-(3) (q-phi equations with the DMI field H_D = D / (mu0 Ms Delta) and the Neel shape
 * field H_K), with the spin-transfer terms of S. Zhang, Z. Li, PRL 93, 127204 (2004) and
 * A. Thiaville, Y. Nakatani, J. Miltat, Y. Suzuki, EPL 69, 990 (2005) (u = g muB P j / (2 e Ms),
 * Walker current u_W = alpha Delta max|T| / |beta - alpha|), intrinsic pinning of G. Tatara,
 * H. Kohno, PRL 92, 086601 (2004) (u_c = Delta max|T| for beta = 0), the damping-like spin-orbit
 * field hbar theta_SH j / (2 e Ms t) and saturation speed (pi/2) gamma D / Ms of Thiaville et al.
 * (2012), and the thin-film wall demagnetizing factor N_x = t ln2 / (pi Delta) of S. V. Tarasenko
 * et al., JMMM 189, 19 (1998). Constants: CODATA 2018 from scipy.constants.
 * The oracle integrates the equations with scipy's solve_ivp (steady states and time traces) and
 * scipy quad (period of the precession); Walker thresholds by a dense grid refined with
 * minimize_scalar.
 */
import { describe, expect, it } from "vitest";
import { getCalculator, runCalculator } from "@helicoid/lib";
import { runPython } from "../../helpers/python.js";

type R = ReturnType<typeof runCalculator>;
const num = (r: R, name: string): number => r.outputs[name]!.value as number;
const arr = (r: R, name: string): number[] => r.outputs[name]!.value as number[];
const rel = (a: number, b: number): number => Math.abs(a - b) / Math.max(Math.abs(b), 1e-300);

const ORACLE = `
import json, sys, numpy as np
import scipy.constants as sc
from scipy.integrate import solve_ivp, quad
from scipy.optimize import minimize_scalar
cfg = json.load(sys.stdin)
mu0 = sc.mu_0
gam = sc.physical_constants['electron gyromag. ratio'][0]
muB = sc.physical_constants['Bohr magneton'][0]
ge = abs(sc.physical_constants['electron g factor'][0])
out = []
for c in cfg:
    Ms, A, Ku, D, t, al = c['Ms'], c['A'], c['Ku'], c['D'], c['t'], c['alpha']
    p, Bx, beta, P, th, xi = c['polarity'], c['Bx'], c['beta'], c['P'], c['thetaSH'], c['fieldLike']
    Keff = Ku - mu0*Ms**2/2
    De = np.sqrt(A/Keff)
    BK = t*np.log(2)/(np.pi*De)*mu0*Ms          # N_x mu0 Ms
    BD = D/(Ms*De)
    uPerJ = ge*muB*P/(2*sc.e*Ms)
    BdlPerJ = sc.hbar*th/(2*sc.e*Ms*t)
    def T(ph):  # the restoring torque per (gamma) of eq. (3) without drives
        return (np.pi/2)*gam*(Bx - p*BD)*np.sin(ph) - gam*BK/2*np.sin(2*ph)
    def rates(ph, Bz, j):
        u, Bdl = uPerJ*j, BdlPerJ*j
        A1 = gam*Bz + p*beta*u/De + (np.pi/2)*gam*Bdl*np.cos(ph)
        A2 = p*u/De + T(ph) - (np.pi/2)*gam*xi*Bdl*np.cos(ph)
        return (A1 - al*A2)/(1 + al**2), p*De*(al*A1 + A2)/(1 + al**2)
    grid = np.linspace(-np.pi, np.pi, 20001)
    def extreme(f, sign):
        k = np.argmax(sign*f(grid))
        r = minimize_scalar(lambda x: -sign*f(x), bounds=(grid[max(k-1, 0)], grid[min(k+1, len(grid)-1)]), method='bounded', options={'xatol': 1e-13})
        return f(r.x)
    # Walker fields: (1 + alpha^2) phi-dot = gamma Bz + R(phi), R with the current's drives; steady iff it has a zero
    Rf = lambda ph: (1 + al**2)*rates(ph, 0.0, c['j'])[0]
    walkerUpper = -extreme(Rf, -1)/gam
    walkerLower = -extreme(Rf, +1)/gam
    Tmax = max(abs(extreme(T, 1)), abs(extreme(T, -1)))
    # rest angle: minimum of sigma(phi) = p pi D cos + C cos^2 - pi Delta Ms Bx cos
    C = BK*Ms*De
    sig = lambda ph: p*np.pi*D*np.cos(ph) + C*np.cos(ph)**2 - np.pi*De*Ms*Bx*np.cos(ph)
    ph0 = grid[np.argmin(sig(grid))]
    ph0 = minimize_scalar(sig, bounds=(ph0-1e-3, ph0+1e-3), method='bounded', options={'xatol': 1e-14}).x
    def motion(Bz, j):
        f = lambda ph: rates(ph, Bz, j)[0]
        # steady if phi-dot has a zero: integrate phi from rest long enough to settle
        vals = f(grid)
        if vals.min() < 0 < vals.max():
            sol = solve_ivp(lambda s, y: [f(y[0])], (0, 1e-6), [ph0], rtol=1e-12, atol=1e-14, method='LSODA')
            ph = sol.y[0, -1]
            return {'v': rates(ph, Bz, j)[1], 'f': 0.0, 'phi': float(ph)}
        Tp = quad(lambda ph: 1/abs(f(ph)), 0, 2*np.pi, epsabs=0, epsrel=1e-13, limit=400)[0]
        Dq = quad(lambda ph: rates(ph, Bz, j)[1]/abs(f(ph)), 0, 2*np.pi, epsabs=0, epsrel=1e-13, limit=400)[0]
        return {'v': Dq/Tp, 'f': 1/Tp, 'phi': None}
    res = {'width': De, 'shapeField': BK, 'dmiField': BD, 'drift': uPerJ*c['j'], 'sot': BdlPerJ*c['j'],
           'sat': (np.pi/2)*gam*abs(D)/Ms, 'walkerUpper': walkerUpper, 'walkerLower': walkerLower,
           'walkerVelocity': None,
           'pinningCurrent': De*Tmax/uPerJ if uPerJ > 0 else None,
           'walkerCurrent': al*De*Tmax/abs(beta - al)/uPerJ if uPerJ > 0 and beta != al else None,
           'here': motion(c['Bz'], c['j']),
           'sweep': [motion(c['Bz'] if c['over'] == 'j' else x, x if c['over'] == 'j' else c['j']) for x in c['sweepAt']]}
    if 'time' in c:
        f2 = lambda s, y: list(rates(y[1], c['Bz'], c['j']))[::-1]
        sol = solve_ivp(f2, (0, c['time'][-1]), [0.0, ph0], t_eval=c['time'], rtol=1e-11, atol=1e-20, method='DOP853', dense_output=True)
        res['q'] = sol.y[0].tolist(); res['phi'] = sol.y[1].tolist()
        # first full turn of phi: |phi - phi0| = 2 pi
        turn = None
        tt = np.linspace(0, c['time'][-1], 200001)
        yy = sol.sol(tt)
        k = np.where(np.abs(yy[1] - ph0) >= 2*np.pi)[0]
        if len(k):
            from scipy.optimize import brentq
            i = k[0]
            tp = brentq(lambda s: abs(sol.sol(s)[1] - ph0) - 2*np.pi, tt[i-1], tt[i], xtol=1e-22)
            res['period'] = tp; res['advance'] = float(sol.sol(tp)[0])
            res['turns'] = int(np.floor(abs(yy[1, -1] - ph0)/(2*np.pi)))
        res['phi0'] = float(ph0)
    res['walkerVelocity'] = motion(walkerUpper*(1 - 1e-12), c['j'])['v']
    out.append(res)
print(json.dumps(out))
`;

interface Oracle {
  width: number;
  shapeField: number;
  dmiField: number;
  drift: number;
  sot: number;
  sat: number;
  walkerUpper: number;
  walkerLower: number;
  walkerVelocity: number;
  pinningCurrent: number | null;
  walkerCurrent: number | null;
  here: { v: number; f: number; phi: number | null };
  sweep: { v: number; f: number }[];
  q?: number[];
  phi?: number[];
  period?: number;
  advance?: number;
  turns?: number;
  phi0?: number;
}

const film = { Ms: 9e5, A: 1.2e-11, Ku: 1.0e6, D: 1.0e-3, t: 0.8e-9, alpha: 0.2, Bx: 0, P: 0.6, beta: 0.05, fieldLike: 0, polarity: 1 };

/** The scalar outputs shared by the three calculators, against the oracle. */
function checkScalars(r: R, o: Oracle): void {
  expect(rel(num(r, "width"), o.width)).toBeLessThan(1e-12);
  expect(rel(num(r, "shapeField"), o.shapeField)).toBeLessThan(1e-12);
  expect(rel(num(r, "dmiField"), o.dmiField)).toBeLessThan(1e-12);
  expect(rel(num(r, "driftVelocity"), o.drift)).toBeLessThan(1e-9);
  if (o.sot === 0) expect(num(r, "spinOrbitField")).toBe(0);
  else expect(rel(num(r, "spinOrbitField"), o.sot)).toBeLessThan(1e-9);
  // gamma: the library uses the free-electron 1.76085963023e11 rad/(s T) (CODATA 2018) like scipy
  expect(rel(num(r, "spinOrbitSaturation"), o.sat)).toBeLessThan(1e-9);
  expect(rel(num(r, "walkerField"), o.walkerUpper)).toBeLessThan(1e-9);
  expect(rel(num(r, "walkerFieldLower"), o.walkerLower)).toBeLessThan(1e-9);
  // the steady velocity just below the Walker field (phi settles near the extreme of R)
  expect(rel(num(r, "walkerVelocity"), o.walkerVelocity)).toBeLessThan(1e-4);
  expect(rel(num(r, "pinningCurrent"), o.pinningCurrent!)).toBeLessThan(1e-8);
  expect(rel(num(r, "walkerCurrent"), o.walkerCurrent!)).toBeLessThan(1e-8);
}

function checkMotion(r: R, o: Oracle): void {
  expect(rel(num(r, "velocity"), o.here.v)).toBeLessThan(1e-7);
  if (o.here.phi === null) {
    expect(num(r, "regime")).toMatch(/precessing/);
    expect(rel(num(r, "precessionFrequency"), o.here.f)).toBeLessThan(1e-8);
  } else {
    expect(num(r, "regime")).toMatch(/steady/);
    expect(num(r, "precessionFrequency")).toBe(0);
    expect(Math.abs(num(r, "wallAngle") - o.here.phi)).toBeLessThan(1e-6);
  }
}

describe("wall dynamics: every output against the scipy q-phi oracle", () => {
  it("wall-motion below and above breakdown, with its field sweep", () => {
    const spec = getCalculator("wall-motion");
    const sweep = { over: "Bz", from: 0, to: 0.2, points: 11 };
    const at = [0.04, 0.12, 0.2];
    for (const Bz of [0.004, 0.09]) {
      const inputs = { ...film, Bz, j: 2e11, thetaSH: 0 };
      const r = runCalculator(spec, inputs, { sweep });
      const [o] = runPython<Oracle[]>(ORACLE, [{ ...inputs, over: "Bz", sweepAt: at }]);
      checkScalars(r, o!);
      checkMotion(r, o!);
      const xs = arr(r, "sweepValues");
      expect(xs.length).toBe(11);
      at.forEach((x, k) => {
        const i = xs.findIndex((y) => Math.abs(y - x) < 1e-12);
        expect(i, `sweep point ${x}`).toBeGreaterThanOrEqual(0);
        expect(rel(arr(r, "sweepVelocity")[i]!, o!.sweep[k]!.v)).toBeLessThan(1e-7);
        if (o!.sweep[k]!.f === 0) expect(arr(r, "sweepFrequency")[i]).toBe(0);
        else expect(rel(arr(r, "sweepFrequency")[i]!, o!.sweep[k]!.f)).toBeLessThan(1e-8);
      });
    }
  });

  it("wall-current with spin-transfer and spin-orbit torques, with its current sweep", () => {
    const spec = getCalculator("wall-current");
    const sweep = { over: "j", from: 0, to: 2e12, points: 5 };
    const at = [5e11, 1.5e12, 2e12];
    const inputs = { ...film, Bz: 0.002, j: 8e11, thetaSH: 0.08 };
    const r = runCalculator(spec, inputs, { sweep });
    const [o] = runPython<Oracle[]>(ORACLE, [{ ...inputs, over: "j", sweepAt: at }]);
    checkScalars(r, o!);
    checkMotion(r, o!);
    const xs = arr(r, "sweepValues");
    at.forEach((x, k) => {
      const i = xs.findIndex((y) => Math.abs(y - x) < 1);
      expect(i, `sweep point ${x}`).toBeGreaterThanOrEqual(0);
      expect(rel(arr(r, "sweepVelocity")[i]!, o!.sweep[k]!.v)).toBeLessThan(1e-7);
      if (o!.sweep[k]!.f === 0) expect(arr(r, "sweepFrequency")[i]).toBe(0);
      else expect(rel(arr(r, "sweepFrequency")[i]!, o!.sweep[k]!.f)).toBeLessThan(1e-8);
    });
  });

  it("wall-trace: position, angle, turns, period against solve_ivp (DOP853) of the same equations", () => {
    const spec = getCalculator("wall-trace");
    const inputs = { ...film, Bz: 0.12, j: 0, thetaSH: 0, duration: 1.5e-9, breathing: 0 };
    const r = runCalculator(spec, inputs);
    const time = arr(r, "time");
    expect(time.length).toBe(401);
    expect(Math.abs(time[400]! - 1.5e-9)).toBeLessThan(1e-21);
    const [o] = runPython<Oracle[]>(ORACLE, [{ ...inputs, over: "Bz", sweepAt: [], time }]);
    checkScalars(r, o!);
    checkMotion(r, o!);
    const q = arr(r, "position");
    const phi = arr(r, "angle");
    const qScale = Math.max(...o!.q!.map(Math.abs));
    for (let i = 0; i < time.length; i += 20) {
      expect(Math.abs(q[i]! - o!.q![i]!) / qScale, `q at ${time[i]}`).toBeLessThan(1e-7);
      expect(Math.abs(phi[i]! - o!.phi![i]!), `phi at ${time[i]}`).toBeLessThan(1e-6);
    }
    // rigid profile: Delta(t) = sqrt(A / K_eff) throughout
    for (const w of arr(r, "widthTrace")) expect(rel(w, o!.width)).toBeLessThan(1e-12);
    expect(num(r, "turns")).toBe(o!.turns);
    expect(rel(num(r, "tracePeriod"), o!.period!)).toBeLessThan(1e-7);
    expect(rel(num(r, "traceVelocity"), o!.advance! / o!.period!)).toBeLessThan(1e-6);
  });
});
