// Benchmarks of wall dynamics: a 200-point velocity-field curve with the period integrals above
// breakdown (what the wall-motion slider recomputes), and one precession period by time integration.
// Reference: numpy/scipy doing the same work (vectorized periodic trapezoid with doubling, brentq for
// the steady angle; scipy solve_ivp RK45 with an event for the period), in the system Python.
// Ours and the reference are interleaved call by call (A B A B) through a long-lived Python peer
// (pythonPeer.mjs), warm on both sides (two warm-up calls each), CPU-time medians with [min-max].
import lib from "../../lib/dist/internal.js";
import { medianMs, summary, verdict } from "./util.mjs";
import { pythonPeer, interleavedWithPython } from "./pythonPeer.mjs";

const film = lib.makeFilm({ Ms: 1.1e6, A: 15e-12, Ku: 1.2e6, D: 1.5e-3, t: 1e-9, alpha: 0.3 });

const curvePy = `
import json, sys, time, math
import numpy as np
from scipy.optimize import brentq
def setup_curve(p):
    global Ms, De, al, g, D, C, pol, BD, BK, phi0, Bs
    Ms, De, al, g, D, C, pol = p["Ms"], p["Delta"], p["alpha"], p["gamma"], p["D"], p["C"], p["p"]
    BD = D/(Ms*De); BK = C/(Ms*De); phi0 = p["phi0"]
    Bs = np.linspace(0, 0.3, 200)
def coeffs(Bz):
    k = 1/(1 + al*al)
    # A1 = g Bz; A2 = (pi/2) g (-p BD) sin phi - (g BK / 2) sin 2 phi
    return k, g*Bz, -0.5*math.pi*g*pol*BD, -0.5*g*BK
def gfun(phi, k, a1, s1, s2):
    return k*(a1 - al*(s1*np.sin(phi) + s2*np.sin(2*phi)))
def hfun(phi, k, a1, s1, s2):
    return pol*De*k*(al*a1 + s1*np.sin(phi) + s2*np.sin(2*phi))
def curve():
    out = []
    fine = np.linspace(0, 2*math.pi, 4097)
    for Bz in Bs:
        k, a1, s1, s2 = coeffs(Bz)
        gv = gfun(fine, k, a1, s1, s2)
        if gv.min() <= 0 <= gv.max():
            g0 = gfun(phi0, k, a1, s1, s2)
            if g0 == 0:
                out.append(hfun(phi0, k, a1, s1, s2)); continue
            d = math.copysign(1, g0); step = 2*math.pi/256; a = phi0
            for i in range(1, 257):
                b = phi0 + d*step*i
                if np.sign(gfun(b, k, a1, s1, s2)) != np.sign(g0):
                    r = brentq(lambda x: gfun(x, k, a1, s1, s2), min(a, b), max(a, b), xtol=1e-15)
                    out.append(hfun(r, k, a1, s1, s2)); break
                a = b
        else:
            n = 64; T = Q = None
            while True:
                x = np.arange(n)*2*math.pi/n
                gi = np.abs(gfun(x, k, a1, s1, s2))
                Tn = 2*math.pi*np.mean(1/gi); Qn = 2*math.pi*np.mean(hfun(x, k, a1, s1, s2)/gi)
                if T is not None and abs(Tn - T) <= 1e-13*Tn and abs(Qn - Q) <= 1e-13*abs(Qn): break
                T, Q, n = Tn, Qn, 2*n
            out.append(Qn/Tn)
    return [float(v) for v in out]
`;

const periodPy = `
import json, sys, time, math
from scipy.integrate import solve_ivp
def period(p):
  Ms, De, al, g, D, C, pol, Bz, phi0 = p["Ms"], p["Delta"], p["alpha"], p["gamma"], p["D"], p["C"], p["p"], p["Bz"], p["phi0"]
  BD = D/(Ms*De); BK = C/(Ms*De); k = 1/(1 + al*al)
  def f(t, y):
    s = -0.5*math.pi*g*pol*BD*math.sin(y[1]) - 0.5*g*BK*math.sin(2*y[1])
    return [pol*k*(al*g*Bz + s)*1e-9, k*(g*Bz - al*s)*1e-9]
  up = lambda t, y: y[1] - phi0 - 2*math.pi
  up.terminal = True
  s = solve_ivp(f, [0, 1e3], [0.0, phi0], method="RK45", rtol=1e-10, atol=1e-12, events=up)
  T = s.t_events[0][0]*1e-9
  return float(s.y_events[0][0][0]*De/T)
`;

export default async () => {
  const m = lib.wallMotionModel(film);
  const phi0 = lib.wallEquilibriumAngle(m);
  const fields = Array.from({ length: 200 }, (_, i) => (0.3 * i) / 199);
  const input = { Ms: m.Ms, Delta: m.Delta, alpha: m.alpha, gamma: m.gamma, D: m.D, C: m.C, p: m.polarity, phi0, Bz: 0.2 };
  const peer = pythonPeer();
  let curve, per;
  try {
    await peer.define(curvePy);
    await peer.define(periodPy);
    await peer.call("setup_curve", input);
    curve = await interleavedWithPython(peer, () => lib.velocityFieldCurve(m, {}, fields).velocity, "curve", [], { runs: 15, warmup: 2 });
    per = await interleavedWithPython(peer, () => lib.wallMotionByIntegration(m, { Bz: 0.2 }, phi0, 1e-10), "period", [input], { runs: 15, warmup: 2 });
  } finally {
    await peer.close();
  }
  const check = Math.max(...curve.oursValue.map((v, i) => Math.abs(v - curve.refValue[i]) / Math.max(Math.abs(curve.refValue[i]), 1e-30)));
  const checkP = Math.abs(lib.wallMotion(m, { Bz: 0.2 }).velocity / per.refValue - 1);
  const co = summary(curve.ours);
  const cr = summary(curve.ref);
  const po = summary(per.ours);
  const pr = summary(per.ref);
  const calcRows = [];
  for (const id of ["wall-motion", "wall-current", "wall-trace", "skyrmion-drift", "precessing-skyrmion"]) {
    const spec = lib.getCalculator(id);
    const ms = await medianMs(() => lib.runCalculator(spec, {}), { runs: 7, warmup: 1 });
    calcRows.push({ group: "dynamics", name: `${id} calculator on its defaults (what the explorer recomputes)`, ours_ms: ms, goal: "< 200 ms (slider stays live)" });
  }
  return [
    ...calcRows,
    {
      group: "dynamics",
      name: `wall velocity-field curve, 200 points with period integrals, warm, interleaved x15, CPU time (max rel. diff to numpy ${check.toExponential(1)})`,
      ours_ms: co.median,
      ours_spread: co.spread,
      reference: "numpy trapezoid + scipy brentq, same work",
      reference_ms: cr.median,
      reference_spread: cr.spread,
      ratio: co.median / cr.median,
      goal: verdict(co.median < 20 && check < 1e-9, "< 20 ms (slider feels instant), same curve within 1e-9"),
    },
    {
      group: "dynamics",
      name: `one precession period by Dormand-Prince with event, warm, interleaved x15, CPU time (rel. diff of the mean velocity to scipy ${checkP.toExponential(1)}; both at rtol 1e-10)`,
      ours_ms: po.median,
      ours_spread: po.spread,
      reference: "scipy solve_ivp RK45 with event, rtol 1e-10, atol 1e-12",
      reference_ms: pr.median,
      reference_spread: pr.spread,
      ratio: po.median / pr.median,
      goal: "reported (no goal set)",
    },
  ];
};
