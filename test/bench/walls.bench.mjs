// Benchmarks of the walls domain: the 360-degree wall minimization, its B sweep, and the wall
// calculators as a slider would call them. Reference: scipy.optimize.minimize (Nelder-Mead) on the
// same closed-form ansatz energy, in the system Python, interleaved call by call (pythonPeer.mjs).
// The calculator rows have no reference (the slider budget).
import lib from "../../lib/dist/internal.js";
import { medianMs, summary } from "./util.mjs";
import { pythonPeer, interleavedWithPython } from "./pythonPeer.mjs";

export default async () => {
  const film = lib.demoFilmHX1.film;
  const rows = [];

  const K = lib.effectiveAnisotropy(film);
  const peer = pythonPeer();
  try {
    await peer.define(`import numpy as np
from scipy.optimize import minimize
def J(p):
    if p<1:
        f=np.arccos(np.sqrt(p)); g=np.sqrt(p*(1-p)); return f/g, -(g+f*(1-2*p))/(2*g**3)
    f=np.arccosh(np.sqrt(p)); g=np.sqrt(p*(p-1)); return f/g, (g-f*(2*p-1))/(2*g**3)
def wall(A, K, Ms, B):
    Dl=np.sqrt(A/K)
    def E(x):
        R=Dl*np.exp(x[0]); w=Dl*np.exp(x[1]); p=np.sinh(R/w)**2
        j,dj=J(p)
        return (8*A*p*(j+(p-1)*dj)/w + 8*K*w*p*(j+p*dj) + 4*Ms*B*w*p*j)/np.sqrt(A*K)
    r=minimize(E,[np.log(2),0.0],method='Nelder-Mead',options=dict(xatol=1e-11,fatol=1e-15,maxiter=4000))
    return float(Dl*np.exp(r.x[0]))
`);
    const r = await interleavedWithPython(peer, () => lib.wall360Equilibrium(film, 0.05), "wall", [film.A, K, film.Ms, 0.05], { runs: 21, warmup: 3 });
    const o = summary(r.ours),
      q = summary(r.ref);
    const R = r.oursValue.radius ?? r.oursValue.R;
    const rel = typeof R === "number" ? Math.abs(R - r.refValue) / r.refValue : NaN;
    rows.push({
      group: "walls",
      name: `wall360 equilibrium (one field, closed-form energy, 2D minimization), warm on both sides (3 calls each first), CPU time, interleaved x21 (R relative difference ${rel.toExponential(1)}; scipy at xatol 1e-11)`,
      ours_ms: o.median,
      ours_spread: o.spread,
      reference: "scipy Nelder-Mead, same energy",
      reference_ms: q.median,
      reference_spread: q.spread,
      ratio: o.median / q.median,
      goal: "live slider (< 1 ms)",
    });
  } finally {
    await peer.close();
  }

  const spec360 = lib.getCalculator("wall360");
  const sweep = await medianMs(() => lib.runCalculator(spec360, {}, { sweep: { over: "B", from: 1e-3, to: 1, points: 200 } }), { runs: 11 });
  rows.push({ group: "walls", name: "wall360 calculator with a 200-point B sweep", ours_ms: sweep, goal: "< 200 ms (slider stays live)" });

  for (const id of ["wall", "wall-type"]) {
    const spec = lib.getCalculator(id);
    const ms = await medianMs(() => lib.runCalculator(spec, {}), { runs: 21 });
    rows.push({ group: "walls", name: `${id} calculator on its defaults`, ours_ms: ms, goal: "< 16 ms (one frame)" });
  }
  return rows;
};
