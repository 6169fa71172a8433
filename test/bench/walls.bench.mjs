// Benchmarks of the walls domain: the 360-degree wall minimization, its B sweep, and the wall
// calculators as a slider would call them. Reference: scipy.optimize.minimize (Nelder-Mead) on the
// same closed-form ansatz energy, in the system Python.
import lib from "../../lib/dist/index.js";
import { medianMs, pythonTiming } from "./util.mjs";

export default async () => {
  const film = lib.demoFilmHX1.film;
  const rows = [];

  const one = await medianMs(() => lib.wall360Equilibrium(film, 0.05), { runs: 51 });
  const K = lib.effectiveAnisotropy(film);
  const ref = pythonTiming(
    `import json,sys,time,numpy as np
from scipy.optimize import minimize
d=json.load(sys.stdin); A=d['A']; K=d['K']; Ms=d['Ms']; B=d['B']; Dl=np.sqrt(A/K)
def J(p):
    if p<1:
        f=np.arccos(np.sqrt(p)); g=np.sqrt(p*(1-p)); return f/g, -(g+f*(1-2*p))/(2*g**3)
    f=np.arccosh(np.sqrt(p)); g=np.sqrt(p*(p-1)); return f/g, (g-f*(2*p-1))/(2*g**3)
def E(x):
    R=Dl*np.exp(x[0]); w=Dl*np.exp(x[1]); p=np.sinh(R/w)**2
    j,dj=J(p)
    return (8*A*p*(j+(p-1)*dj)/w + 8*K*w*p*(j+p*dj) + 4*Ms*B*w*p*j)/np.sqrt(A*K)
ts=[]
for i in range(21):
    t0=time.perf_counter(); r=minimize(E,[np.log(2),0.0],method='Nelder-Mead',options=dict(xatol=1e-11,fatol=1e-15,maxiter=4000)); ts.append((time.perf_counter()-t0)*1e3)
ts.sort(); print(json.dumps({'ms':ts[len(ts)//2],'R':float(Dl*np.exp(r.x[0]))}))`,
    { A: film.A, K, Ms: film.Ms, B: 0.05 },
  );
  rows.push({
    group: "walls",
    name: "wall360 equilibrium (one field, closed-form energy, 2D minimization)",
    ours_ms: one,
    reference: "scipy Nelder-Mead, same energy",
    reference_ms: ref.ms,
    ratio: one / ref.ms,
    goal: "live slider (< 1 ms)",
  });

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
