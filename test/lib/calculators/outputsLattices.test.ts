/**
 * The outputs of dipolar-lattice and field-tuned-order against independent oracles.
 *
 * dipolar-lattice: J^{ab}_{ij}(q) = sum'_R (delta_ab - 3 r_a r_b / r^2) / r^3 e^{i q.r}, r = R + tau_j - tau_i,
 * summed directly in numpy over a disc of radius 250 d (the 2D dipolar sum converges absolutely; at
 * q = 0 the continuum tail 2 pi n / R_c (zz) and -pi n / R_c (in-plane) is added), Luttinger-Tisza
 * energy lambda_min / 2 per moment (J. Luttinger, L. Tisza, Phys. Rev. 70, 954 (1946)); CODATA 2018
 * constants from scipy for the unit mu0 mu^2 / (4 pi d^3).
 * field-tuned-order: the product-state (site-decoupled) energy of the easy-plane antiferromagnet,
 * E = D <Sz^2> - h <Sz> + (zJ/2)(Delta <Sz>^2 - <Sx>^2) per site (T. Matsubara, H. Matsuda, Prog.
 * Theor. Phys. 16, 569 (1956)), minimized by scipy over every normalized site state; the Mott-lobe
 * boundary of the Bose-Hubbard decoupling mean field (M. Fisher et al., PRB 40, 546 (1989);
 * D. van Oosten, P. van der Straten, H. Stoof, PRA 63, 053601 (2001)) found in numpy as the zt/U where
 * the curvature of the lowest eigenvalue of the site Hamiltonian at psi = 0 changes sign.
 */
import { describe, expect, it } from "vitest";
import { getCalculator, runCalculator } from "@helicoid/lib";
import { runPython } from "../../helpers/python.js";

type R = ReturnType<typeof runCalculator>;
const num = (r: R, name: string): number => r.outputs[name]!.value as number;
const arr = (r: R, name: string): number[] => r.outputs[name]!.value as number[];
const txt = (r: R, name: string): string => r.outputs[name]!.value as unknown as string;

const DIPOLAR = `
import json, sys, numpy as np
import scipy.constants as sc
c = json.load(sys.stdin)
a1, a2, basis = np.array(c['a1']), np.array(c['a2']), np.array(c['basis'])
area = abs(a1[0]*a2[1] - a1[1]*a2[0]); nb = len(basis)
dens = nb/area
Rc = 250.0
f = 2*np.pi/(a1[0]*a2[1] - a1[1]*a2[0])
b1 = np.array([f*a2[1], -f*a2[0]]); b2 = np.array([-f*a1[1], f*a1[0]])
M = int(Rc/min(np.linalg.norm(a1), np.linalg.norm(a2))*2) + 4
i, j = np.meshgrid(np.arange(-M, M + 1), np.arange(-M, M + 1))
L = i.reshape(-1, 1)*a1 + j.reshape(-1, 1)*a2
blocks = {}
for s in range(nb):
    for t in range(nb):
        r = L + basis[t] - basis[s]
        d = np.hypot(r[:, 0], r[:, 1])
        keep = (d > 1e-9) & (d < Rc)
        r, d = r[keep], d[keep]
        blocks[(s, t)] = (r, d)
def J(q, gamma=False):
    H = np.zeros((3*nb, 3*nb), complex)
    for (s, t), (r, d) in blocks.items():
        ph = np.exp(1j*(r@q))/d**3
        x, y = r[:, 0]/d, r[:, 1]/d
        m = np.zeros((3, 3), complex)
        m[0, 0] = np.sum(ph*(1 - 3*x*x)); m[1, 1] = np.sum(ph*(1 - 3*y*y)); m[2, 2] = np.sum(ph)
        m[0, 1] = m[1, 0] = np.sum(ph*(-3*x*y))
        if gamma:
            m[0, 0] += -np.pi*dens/nb/Rc; m[1, 1] += -np.pi*dens/nb/Rc; m[2, 2] += 2*np.pi*dens/nb/Rc
        H[3*s:3*s+3, 3*t:3*t+3] = m
    return np.linalg.eigvalsh((H + H.conj().T)/2)
fr = lambda u, v: u*b1 + v*b2
out = {}
out['path'] = [J(fr(*p), gamma=(abs(p[0]) + abs(p[1]) < 1e-12)).tolist() for p in c['pathFrac']]
qm = c['qMin']
lam = J(fr(*qm), gamma=(abs(qm[0]) + abs(qm[1]) < 1e-12))
out['atMin'] = lam.tolist()
g = np.linspace(0, 1, 16, endpoint=False)
out['gridMin'] = float(min(J(fr(u, v), gamma=(u == 0 and v == 0))[0] for u in g for v in g if (u == 0 and v == 0) or np.linalg.norm(fr(((u + .5) % 1) - .5, ((v + .5) % 1) - .5)) > 0.2))
out['unit'] = sc.mu_0*(c['moment']*sc.physical_constants['Bohr magneton'][0])**2/(4*np.pi*c['d']**3)/sc.k
out['b'] = [b1.tolist(), b2.tolist()]
print(json.dumps(out))
`;

const s3 = Math.sqrt(3);
const lattices = {
  triangular: {
    lattice: 1,
    a1: [1, 0],
    a2: [0.5, s3 / 2],
    basis: [[0, 0]],
    path: [
      [0, 0],
      [0.5, 0],
      [2 / 3, 1 / 3],
      [0, 0],
    ],
  },
  honeycomb: {
    lattice: 2,
    a1: [s3, 0],
    a2: [s3 / 2, 1.5],
    basis: [
      [0, 0],
      [0, 1],
    ],
    path: [
      [0, 0],
      [0.5, 0],
      [2 / 3, 1 / 3],
      [0, 0],
    ],
  },
};

describe("dipolar-lattice: bands, Luttinger-Tisza minimum, energies and path against a numpy lattice sum", () => {
  for (const [name, lat] of Object.entries(lattices)) {
    it(`${name} lattice, 5.5 muB at d = 0.55 nm`, () => {
      const inputs = { lattice: lat.lattice, moment: 5.5, d: 5.5e-10, grid: 16 };
      const r = runCalculator(getCalculator("dipolar-lattice"), inputs);
      const dist = arr(r, "pathDistance");
      expect(dist.length).toBe(61);
      // the path G-M-K-G in fractional coordinates, 20 points per segment (the calculator's sampling)
      const pathFrac: number[][] = [];
      for (let seg = 0; seg < 3; seg++)
        for (let k = 0; k < 20 + (seg === 2 ? 1 : 0); k++) {
          const [p0, p1] = [lat.path[seg]!, lat.path[seg + 1]!];
          pathFrac.push([p0[0]! + (k / 20) * (p1[0]! - p0[0]!), p0[1]! + (k / 20) * (p1[1]! - p0[1]!)]);
        }
      const qMin = arr(r, "qMinFractional");
      const o = runPython<{ path: number[][]; atMin: number[]; gridMin: number; unit: number; b: number[][] }>(DIPOLAR, {
        ...inputs,
        a1: lat.a1,
        a2: lat.a2,
        basis: lat.basis,
        pathFrac,
        qMin,
      });
      // distances along the path: |GM| = |b1| / 2, |MK| and |KG| from the reciprocal vectors (1/d)
      const [b1, b2] = o.b as [number[], number[]];
      const at = (u: number, v: number) => [u * b1[0]! + v * b2[0]!, u * b1[1]! + v * b2[1]!];
      const len = (p: number[], q: number[]) => Math.hypot(p[0]! - q[0]!, p[1]! - q[1]!);
      const [G, Mp, K] = [at(0, 0), at(0.5, 0), at(2 / 3, 1 / 3)];
      expect(Math.abs(dist[20]! - len(G, Mp))).toBeLessThan(1e-9);
      expect(Math.abs(dist[40]! - len(G, Mp) - len(Mp, K))).toBeLessThan(1e-9);
      expect(Math.abs(dist[60]! - len(G, Mp) - len(Mp, K) - len(K, G))).toBeLessThan(1e-9);
      const bands = ["band1", "band2", "band3", "band4", "band5", "band6"];
      const nb = 3 * lat.basis.length;
      for (let b = 0; b < 6; b++) {
        if (b >= nb) {
          expect(bands[b]! in r.outputs, `${bands[b]} absent for ${name}`).toBe(false);
          continue;
        }
        const band = arr(r, bands[b]!);
        for (let i = 0; i <= 60; i += 4) expect(Math.abs(band[i]! - o.path[i]![b]!), `${bands[b]} at path point ${i}`).toBeLessThan(3e-3);
      }
      const lam = num(r, "lambdaMin");
      expect(Math.abs(lam - o.atMin[0]!)).toBeLessThan(3e-3);
      expect(o.gridMin).toBeGreaterThan(lam - 3e-3);
      const deg = o.atMin.filter((x) => x < o.atMin[0]! + 1e-3).length;
      expect(num(r, "degeneracy")).toBe(deg);
      expect(Math.abs(num(r, "energyPerSite") - lam / 2)).toBeLessThan(1e-12);
      expect(Math.abs(num(r, "energyPerSiteK") / ((lam / 2) * o.unit) - 1)).toBeLessThan(1e-9);
      expect(txt(r, "summary")).toContain(`${name}: LT minimum lambda = ${lam.toPrecision(7)} D`);
    });
  }
});

describe("field-tuned-order: product-state mean field and Mott lobes", () => {
  it("spin 1: m_z along the field grid and the ordered window against a scipy minimization over site states; lobes 1-3", () => {
    const inputs = { S: 1, D: 8, zJ: 1.5, Delta: 0.6, g: 2.1, Bmax: 12 };
    const r = runCalculator(getCalculator("field-tuned-order"), inputs);
    const fields = arr(r, "fieldGrid");
    const idx = [0, 15, 30, 45, 60, 75, 90, 105, 120];
    const o = runPython<{ mz: number[]; mperp: number[]; lobes: { x: number; n: number; zt: number }[] }>(
      `
import json, sys, numpy as np, scipy.constants as sc
from scipy.optimize import minimize, brentq
c = json.load(sys.stdin)
S = 1; Sz = np.diag([1., 0., -1.]); Sx = np.array([[0, 1, 0], [1, 0, 1], [0, 1, 0]])/np.sqrt(2)
D, zJ, De = c['D'], c['zJ'], c['Delta']
hK = c['g']*sc.physical_constants['Bohr magneton'][0]/sc.k
def E(v, h):
    p = v/np.linalg.norm(v)
    mz, mx = p@Sz@p, p@Sx@p
    return D*(p@Sz@Sz@p) - h*mz + zJ/2*(De*mz**2 - mx**2)
mz, mp = [], []
rng = np.random.default_rng(3)
for B in c['B']:
    h = hK*B
    best = None
    for s in [np.array([1., 0, 0]), np.array([0, 1., 0]), np.array([.5, .7, .3])] + [rng.normal(size=3) for _ in range(6)]:
        rr = minimize(E, s, args=(h,), method='BFGS', options={'gtol': 1e-12})
        if best is None or rr.fun < best.fun: best = rr
    p = best.x/np.linalg.norm(best.x)
    mz.append(float(p@Sz@p)); mp.append(float(abs(p@Sx@p)))
# Bose-Hubbard site Hamiltonian (units U): H = n(n-1)/2 - x n - zt psi (b + b^+) + zt psi^2, Fock space 0..12
nmax = 12
b = np.diag(np.sqrt(np.arange(1, nmax + 1)), 1); nn = np.diag(np.arange(nmax + 1))
def curv(zt, x):
    e = lambda ps: np.linalg.eigvalsh(nn@(nn - np.eye(nmax + 1))/2 - x*nn - zt*ps*(b + b.T) + zt*ps**2 + 0*nn)[0]
    h = 1e-3
    return (e(h) - 2*e(0) + e(-h))/h**2
lobes = []
for n, x in c['lobePoints']:
    lobes.append({'x': x, 'n': n, 'zt': brentq(lambda zt: curv(zt, x), 1e-6, 1.0, xtol=1e-14)})
print(json.dumps({'mz': mz, 'mperp': mp, 'lobes': lobes}))`,
      {
        ...inputs,
        B: idx.map((i) => fields[i]!),
        lobePoints: [
          [1, 0.3],
          [1, 0.56],
          [2, 1.4],
          [2, 1.8],
          [3, 2.2],
          [3, 2.7],
        ],
      },
    );
    idx.forEach((i, k) => {
      expect(Math.abs(arr(r, "mz")[i]! - o.mz[k]!), `m_z at B = ${fields[i]} T`).toBeLessThan(1e-6);
      expect(Math.abs(arr(r, "mPerp")[i]! - o.mperp[k]!), `m_perp at B = ${fields[i]} T`).toBeLessThan(1e-5);
    });
    // the ordered window named in the text holds the oracle's ordered grid points
    const m = /([\d.]+) T to ([\d.]+) T/.exec(txt(r, "windows"));
    expect(m, txt(r, "windows")).not.toBeNull();
    const [lo, hi] = [Number(m![1]), Number(m![2])];
    idx.forEach((i, k) => {
      if (o.mperp[k]! > 1e-4) expect(fields[i]! >= lo - 1e-9 && fields[i]! <= hi + 1e-9, `ordered at ${fields[i]} T`).toBe(true);
      if (o.mperp[k]! < 1e-9) expect(fields[i]! < lo || fields[i]! > hi, `disordered at ${fields[i]} T`).toBe(true);
    });
    const xs = arr(r, "muOverU");
    expect(xs.length).toBe(151);
    for (const l of o.lobes) {
      const i = xs.findIndex((x) => Math.abs(x - l.x) < 1e-9);
      expect(i, `mu/U = ${l.x} on the grid`).toBeGreaterThanOrEqual(0);
      const lobe = arr(r, ["lobe1", "lobe2", "lobe3"][l.n - 1]!);
      expect(Math.abs(lobe[i]! - l.zt), `lobe ${l.n} at mu/U = ${l.x}`).toBeLessThan(1e-5);
    }
  });
});
