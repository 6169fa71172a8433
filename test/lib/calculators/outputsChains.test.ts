/**
 * The outputs of chain-spectrum, chain-dynamics and wall-band against independent oracles:
 * dense numpy diagonalization of the ring H = sum [Jz S^z S^z + Jperp (S^x S^x + S^y S^y)]
 * - hx sum S^x - hz sum S^z in the full 2^N space (momentum blocks from the translation projector),
 * the dynamic structure factor by the double sum over eigenstates (L. Van Hove, Phys. Rev. 95, 249
 * (1954); chiral part C = i (S^yz - S^zy) of M. Blume, Phys. Rev. 130, 1670 (1963)), the spinon gap
 * of the XXZ chain (J. des Cloizeaux, M. Gaudin, J. Math. Phys. 7, 1384 (1966); J. Johnson,
 * S. Krinsky, B. McCoy, Phys. Rev. A 8, 2526 (1973)) by mpmath elliptic integrals, and the
 * first-order domain-wall band of J. Villain, Physica B 79, 1 (1975) and S. Ishimura, H. Shiba,
 * Prog. Theor. Phys. 63, 743 (1980), E(K) = Jz/2 + Jperp cos 2K, split by hx, hz through the 2 x 2
 * Bloch Hamiltonian, diagonalized by numpy.
 */
import { describe, expect, it } from "vitest";
import { getCalculator, runCalculator } from "@helicoid/lib";
import { runPython } from "../../helpers/python.js";

type R = ReturnType<typeof runCalculator>;
const num = (r: R, name: string): number => r.outputs[name]!.value as number;
const arr = (r: R, name: string): number[] => r.outputs[name]!.value as number[];
const txt = (r: R, name: string): string => r.outputs[name]!.value as unknown as string;

/** Dense ED of the ring: spin operators, H, translation, eigen-decomposition per momentum. */
const RING = `
import json, sys, numpy as np
c = json.load(sys.stdin)
N, Jz, Jp, hx, hz = c['N'], c['Jz'], c['Jperp'], c['hx'], c['hz']
sx = np.array([[0, .5], [.5, 0]]); sy = np.array([[0, -.5j], [.5j, 0]]); sz = np.diag([.5, -.5])
def site(o, j):
    m = np.array([[1.0]])
    for k in range(N):
        m = np.kron(m, o if k == j else np.eye(2))
    return m
Sx = [site(sx, j) for j in range(N)]; Sy = [site(sy, j) for j in range(N)]; Sz = [site(sz, j) for j in range(N)]
H = sum(Jz*Sz[j]@Sz[(j+1) % N] + Jp*(Sx[j]@Sx[(j+1) % N] + Sy[j]@Sy[(j+1) % N]).real for j in range(N)) - hx*sum(Sx) - hz*sum(Sz)
H = np.real(H)
# translation by one site: basis state bits (b_0 ... b_{N-1}) -> (b_{N-1}, b_0, ...)
dim = 2**N
T = np.zeros((dim, dim))
for s in range(dim):
    bits = [(s >> (N - 1 - k)) & 1 for k in range(N)]
    nb = [bits[(k - 1) % N] for k in range(N)]
    t = 0
    for b in nb: t = 2*t + b
    T[t, s] = 1
`;

const SPECTRUM = `${RING}
out = {'k': [], 'lowest': [], 'second': []}
allE = []
for m in range(N//2 + 1):
    k = 2*np.pi*m/N
    P = sum(np.exp(-1j*k*r)*np.linalg.matrix_power(T, r) for r in range(N))/N
    w, U = np.linalg.eigh((P + P.conj().T)/2)
    V = U[:, w > 0.5]
    E = np.linalg.eigvalsh(V.conj().T@H@V)
    out['k'].append(k); out['lowest'].append(E[0]); out['second'].append(E[1])
    allE += list(E)
allE = np.sort(allE)
e0 = allE[0]
out['e0'] = e0
out['gap'] = float(allE[allE > e0 + 1e-9*max(1, abs(e0))][0] - e0)
print(json.dumps(out))
`;

const DYNAMICS = `${RING}
E, V = np.linalg.eigh(H)
Tk = c['T']; eta = c['eta']; om = np.array(c['omega'])
p = np.exp(-(E - E[0])/Tk); p /= p.sum()
dE = E[:, None] - E[None, :]          # E_n - E_m (row n, column m)
L = lambda x: eta/np.pi/(x**2 + eta**2)
res = {'zz': [], 'xx': [], 'yy': [], 'chiral': []}
for m in range(N//2 + 1):
    q = 2*np.pi*m/N
    ph = np.exp(1j*q*np.arange(N))/np.sqrt(N)      # S^a_{-q} = N^-1/2 sum_j e^{iqj} S^a_j
    A = {a: V.conj().T@sum(ph[j]*ops[j] for j in range(N))@V for a, ops in (('x', Sx), ('y', Sy), ('z', Sz))}
    W = {'xx': p[None, :]*np.abs(A['x'])**2, 'yy': p[None, :]*np.abs(A['y'])**2, 'zz': p[None, :]*np.abs(A['z'])**2,
         'yz': p[None, :]*np.conj(A['y'])*A['z']}
    Lw = L(om[:, None, None] - dE[None, :, :])
    for ch in ('xx', 'yy', 'zz'):
        res[ch].append(np.real(np.einsum('wnm,nm->w', Lw, W[ch])).tolist())
    res['chiral'].append((-2*np.imag(np.einsum('wnm,nm->w', Lw, W['yz']))).tolist())
res['mx'] = float(np.real(sum(p[i]*(V[:, i].conj()@Sx[0]@V[:, i]) for i in range(len(E)))))
print(json.dumps(res))
`;

/** The first-order wall band of Villain and Ishimura-Shiba: 2 x 2 Bloch Hamiltonian (index 0: up-up wall). */
const WALLS = `
import json, sys, numpy as np
from scipy.integrate import quad
from scipy.optimize import brentq
c = json.load(sys.stdin)
Jz, Jp, hx, hz = c['Jz'], c['Jperp'], c['hx'], c['hz']
def Hk(K, hx=hx, phi=0.0):
    # a twist phi of the transverse bonds turns Jperp cos 2K into Jperp cos(2K - sigma phi) (sigma = +1 up-up)
    return np.array([[Jz/2 + Jp*np.cos(2*K - phi) - hz/2, -hx*np.cos(K)], [-hx*np.cos(K), Jz/2 + Jp*np.cos(2*K + phi) + hz/2]])
band = lambda K, hx=hx: np.linalg.eigvalsh(Hk(K, hx))
out = {}
Ks = np.array(c['K'])
out['lower'] = [band(K)[0] for K in Ks]; out['upper'] = [band(K)[1] for K in Ks]
# chirality kappa^z = (1/Jperp) dE/dphi at phi = 0 (Hellmann-Feynman under a twist of the bonds)
h = 1e-6
out['chir'] = [(np.linalg.eigvalsh(Hk(K, phi=h))[0] - np.linalg.eigvalsh(Hk(K, phi=-h))[0])/(2*h)/Jp for K in Ks]
out['chirUpUp'] = [(Hk(K, 0.0, h)[0, 0] - Hk(K, 0.0, -h)[0, 0])/(2*h)/Jp for K in Ks]
grid = np.linspace(0, 2*np.pi, 4001)
B = np.array([band(K) for K in grid])
i0 = int(B[:, 0].argmin()); dK = grid[1] - grid[0]
from scipy.optimize import minimize_scalar
out['gap'] = float(minimize_scalar(lambda K: band(K)[0], bounds=(grid[i0] - dK, grid[i0] + dK), method='bounded', options={'xatol': 1e-12}).fun)
lo, hi, ve = [], [], []
for q in c['q']:
    Bq = np.array([band(q - K) for K in grid])
    lo.append(float((B[:, 0] + Bq[:, 0]).min())); hi.append(float((B[:, 1] + Bq[:, 1]).max()))
    ve.append(float(np.abs(B[:, 0] - Bq[:, 0]).max()))
out['clo'], out['chi'], out['edge'] = lo, hi, ve
def density(T, hx=hx):
    z = 0.5*quad(lambda K: np.sum(np.exp(-band(K, hx)/T)), 0, 2*np.pi, epsabs=0, epsrel=1e-12, limit=200)[0]/(2*np.pi)
    return z/(1 + z)
def mx(T, hx=hx):
    m = hx/(2*Jz)          # Neel state: a flipped spin costs Jz
    if T > 0:
        d = 1e-6
        num = quad(lambda K: np.sum(-(band(K, hx + d) - band(K, hx - d))/(2*d)*np.exp(-band(K, hx)/T)), 0, 2*np.pi, epsabs=0, epsrel=1e-12, limit=200)[0]
        den = quad(lambda K: np.sum(np.exp(-band(K, hx)/T)), 0, 2*np.pi, epsabs=0, epsrel=1e-12, limit=200)[0]
        m += density(T, hx)*num/den
    return m
T = c['T']
out['density'] = density(T); out['mx'] = mx(T)
out['sweep'] = [{'w': -mx(x), 'n': density(x)} if c['over'] == 'T' else {'w': -mx(T, x), 'n': density(T, x)} for x in c['sweepAt']]
# Villain line shape at zero field: n_w / (4 cos^2(q/2)) int dK/2pi p(K) delta(w - E(K - q) + E(K)), p = e^{-E/T} / <e^{-E/T}>
# (a wall of initial momentum K ends at K - q; w = final - initial energy, the neutron's energy loss)
q = c['qV']
E0 = lambda K: Jz/2 + Jp*np.cos(2*K)
nw = 0.5*quad(lambda K: 2*np.exp(-E0(K)/T), 0, 2*np.pi, epsabs=0, epsrel=1e-12)[0]/(2*np.pi); nw = nw/(1 + nw)
norm = quad(lambda K: np.exp(-E0(K)/T), 0, 2*np.pi, epsabs=0, epsrel=1e-12)[0]/(2*np.pi)
wK = lambda K: E0(K - q) - E0(K)
shape = []
Kg = np.linspace(0, 2*np.pi, 20001)
for w in c['omegaV']:
    s = 0.0
    f = wK(Kg) - w
    for i in np.where(np.sign(f[:-1]) != np.sign(f[1:]))[0]:
        Kr = brentq(lambda K: wK(K) - w, Kg[i], Kg[i+1], xtol=1e-15)
        dw = abs(2*Jp*np.sin(2*Kr) - 2*Jp*np.sin(2*(Kr - q)))
        s += np.exp(-E0(Kr)/T)/norm/(2*np.pi*dw)
    shape.append(nw/(4*np.cos(q/2)**2)*s)
out['shape'] = shape
print(json.dumps(out))
`;

describe("spin chains: outputs against dense numpy diagonalization and published closed forms", () => {
  it("chain-spectrum (odd ring in hx, hz): levels per momentum, gap, and the first-order one-wall band", () => {
    const inputs = { N: 9, Jz: 8, Jperp: 1.2, hx: 0.8, hz: 0.3, boundary: 0, levels: 2 };
    const r = runCalculator(getCalculator("chain-spectrum"), inputs);
    const o = runPython<{ k: number[]; lowest: number[]; second: number[]; e0: number; gap: number }>(SPECTRUM, inputs);
    expect(arr(r, "kValues").length).toBe(o.k.length);
    o.k.forEach((k, i) => {
      expect(Math.abs(arr(r, "kValues")[i]! - k)).toBeLessThan(1e-12);
      expect(Math.abs(arr(r, "levelLowest")[i]! - (o.lowest[i]! - o.e0)), `lowest at k = ${k}`).toBeLessThan(1e-7);
      expect(Math.abs(arr(r, "levelSecond")[i]! - (o.second[i]! - o.e0)), `second at k = ${k}`).toBeLessThan(1e-7);
    });
    expect(Math.abs(num(r, "gapED") - o.gap)).toBeLessThan(1e-7);
    expect(Math.abs(num(r, "groundEnergy") - o.e0)).toBeLessThan(1e-8);
    // Villain / Ishimura-Shiba band on the ED scale: Neel energy -N Jz/4 and the second-order background
    // -N (Jperp^2 + hx^2) / (4 Jz) (each bond's virtual flips), relative to the ED ground level
    const ref = (-inputs.N * inputs.Jz) / 4 - (inputs.N * (inputs.Jperp ** 2 + inputs.hx ** 2)) / (4 * inputs.Jz) - o.e0;
    const band = arr(r, "wallBandFirstOrder");
    o.k.forEach((k, i) => {
      const R = Math.sqrt(inputs.hz ** 2 / 4 + inputs.hx ** 2 * Math.cos(k) ** 2);
      expect(Math.abs(band[i]! - (inputs.Jz / 2 + inputs.Jperp * Math.cos(2 * k) - R + ref))).toBeLessThan(1e-9);
      // and the band is the ED one-wall level to first order (errors of order Jperp^2 / Jz)
      expect(Math.abs(band[i]! - (o.lowest[i]! - o.e0))).toBeLessThan((2 * inputs.Jperp ** 2) / inputs.Jz);
    });
    expect(txt(r, "sectors")).toContain("states");
  });

  it("chain-spectrum (even ring, hx = hz = 0): the des Cloizeaux-Gaudin gap and the two-wall continuum", () => {
    const inputs = { N: 10, Jz: 6, Jperp: 1.5, hx: 0, hz: 0, boundary: 0, levels: 2 };
    const r = runCalculator(getCalculator("chain-spectrum"), inputs);
    const o = runPython<{ gap: number }>(
      `
import json, sys, mpmath as mp
c = json.load(sys.stdin)
D = mp.mpf(c['Jz'])/c['Jperp']
phi = mp.acosh(D)
k = mp.kfrom(q=mp.exp(-phi))   # nome q = exp(-pi K'/K) = exp(-phi)
gap = 2*c['Jperp']*mp.sinh(phi)/mp.pi*mp.ellipk(k**2)*mp.sqrt(1 - k**2)
print(json.dumps({'gap': float(gap)}))`,
      inputs,
    );
    expect(Math.abs(num(r, "gapBethe") / o.gap - 1)).toBeLessThan(1e-9);
    // the continuum of two Villain walls of momenta K1 + K2 = k: [Jz - 2 Jperp |cos k|, Jz + 2 Jperp |cos k|]
    arr(r, "kValues").forEach((k, i) => {
      expect(Math.abs(arr(r, "continuumLower")[i]! - (inputs.Jz - 2 * inputs.Jperp * Math.abs(Math.cos(k))))).toBeLessThan(1e-9);
      expect(Math.abs(arr(r, "continuumUpper")[i]! - (inputs.Jz + 2 * inputs.Jperp * Math.abs(Math.cos(k))))).toBeLessThan(1e-9);
    });
  });

  it("chain-dynamics (ED, T > 0): the xx, yy, zz and chiral maps and cuts against the double sum over numpy eigenstates", () => {
    const inputs = { N: 8, Jz: 6, Jperp: 1.5, hx: 1.3, hz: 0.4, T: 4, eta: 0.4, omegaMax: 15, points: 41 };
    const r = runCalculator(getCalculator("chain-dynamics"), inputs);
    const omega = arr(r, "omega");
    const o = runPython<{ zz: number[][]; xx: number[][]; yy: number[][]; chiral: number[][]; mx: number }>(DYNAMICS, { ...inputs, omega });
    const nq = o.zz.length;
    expect(arr(r, "qValues").length).toBe(nq);
    const nw = omega.length;
    const scale = Math.max(...o.xx.flat().map(Math.abs), ...o.zz.flat().map(Math.abs));
    for (const [out, ch] of [
      ["mapZZ", "zz"],
      ["mapXX", "xx"],
      ["mapYY", "yy"],
      ["mapChiral", "chiral"],
    ] as const) {
      const map = arr(r, out);
      expect(map.length).toBe(nq * nw);
      for (let iq = 0; iq < nq; iq++)
        for (let iw = 0; iw < nw; iw += 5) expect(Math.abs(map[iq * nw + iw]! - o[ch][iq]![iw]!) / scale, `${out} at q ${iq}, w ${omega[iw]}`).toBeLessThan(1e-8);
    }
    for (const [out, ch] of [
      ["cutZZ", "zz"],
      ["cutXX", "xx"],
      ["cutChiral", "chiral"],
    ] as const)
      arr(r, out).forEach((v, iw) => expect(Math.abs(v - o[ch][nq - 1]![iw]!) / scale, `${out} at w ${omega[iw]}`).toBeLessThan(1e-8));
    // the chiral channel is not zero here (hx != 0), so the comparison above is not empty
    expect(Math.max(...o.chiral.flat().map(Math.abs)) / scale).toBeGreaterThan(1e-3);
    expect(Math.abs(num(r, "magnetizationX") - o.mx)).toBeLessThan(1e-9);
    // detailed balance S(-q, -w) = e^{-w/T} S(q, w) is exact for the unbroadened lines (S. Lovesey,
    // Theory of Neutron Scattering from Condensed Matter (Oxford 1984), eq. 2.42): the reported violation is small
    expect(num(r, "detailedBalance")).toBeLessThan(1e-6);
    // first-order two-wall continuum with the fields: extremes of E_a(K) + E_b(q - K) of the Villain bands
    const w = runPython<{ clo: number[]; chi: number[] }>(WALLS, {
      ...inputs,
      K: [0],
      q: arr(r, "qValues"),
      over: "T",
      sweepAt: [],
      qV: 1,
      omegaV: [],
    });
    arr(r, "continuumLower").forEach((v, i) => expect(Math.abs(v - w.clo[i]!)).toBeLessThan(1e-3));
    arr(r, "continuumUpper").forEach((v, i) => expect(Math.abs(v - w.chi[i]!)).toBeLessThan(1e-3));
  });

  it("wall-band: band, chirality, spin current, continuum, Villain edge and line shape, density and chiral weight with a T sweep", () => {
    const inputs = { Jz: 7, Jperp: 0.9, hx: 0.7, hz: 0.25, T: 2.5, q: 1.9 };
    const r = runCalculator(getCalculator("wall-band"), inputs, { sweep: { over: "T", from: 1, to: 5, points: 5 } });
    const o = runPython<{
      lower: number[];
      upper: number[];
      chir: number[];
      chirUpUp: number[];
      gap: number;
      clo: number[];
      chi: number[];
      edge: number[];
      density: number;
      mx: number;
      sweep: { w: number; n: number }[];
      shape: number[];
    }>(WALLS, { ...inputs, K: arr(r, "K"), q: arr(r, "q"), over: "T", sweepAt: [1, 3, 5], qV: inputs.q, omegaV: arr(r, "villainOmega") });
    const K = arr(r, "K");
    expect(K.length).toBe(121);
    K.forEach((k, i) => {
      expect(Math.abs(arr(r, "bandLower")[i]! - o.lower[i]!)).toBeLessThan(1e-12);
      expect(Math.abs(arr(r, "bandUpper")[i]! - o.upper[i]!)).toBeLessThan(1e-12);
      expect(Math.abs(arr(r, "chirality")[i]! - o.chir[i]!), `chirality at K = ${k}`).toBeLessThan(1e-7);
      expect(Math.abs(arr(r, "chiralityUpUpWall")[i]! - o.chirUpUp[i]!)).toBeLessThan(1e-7);
      // spin current j^z = Jperp kappa^z (Hellmann-Feynman: dE/dphi of the twisted bonds)
      expect(Math.abs(arr(r, "spinCurrent")[i]! - inputs.Jperp * o.chir[i]!)).toBeLessThan(1e-6);
    });
    // wallGap: the band bottom (scipy minimize_scalar on numpy's eigvalsh, refined from a 4001-point grid)
    expect(Math.abs(num(r, "wallGap") - o.gap)).toBeLessThan(1e-9);
    arr(r, "q").forEach((q, i) => {
      expect(Math.abs(arr(r, "continuumLower")[i]! - o.clo[i]!), `continuum at q = ${q}`).toBeLessThan(1e-3);
      expect(Math.abs(arr(r, "continuumUpper")[i]! - o.chi[i]!)).toBeLessThan(1e-3);
      expect(Math.abs(arr(r, "villainEdge")[i]! - o.edge[i]!)).toBeLessThan(1e-3);
    });
    expect(Math.abs(num(r, "wallDensity") / o.density - 1)).toBeLessThan(1e-9);
    expect(Math.abs(num(r, "magnetizationX") - o.mx)).toBeLessThan(1e-9);
    // the chiral sum rule int C dw = -<S^x> (lib/src/chains/dynamics.ts derivation; M. Blume 1963 for C)
    expect(Math.abs(num(r, "chiralWeight") + o.mx)).toBeLessThan(1e-9);
    const xs = arr(r, "sweepValues");
    [1, 3, 5].forEach((T, k) => {
      const i = xs.findIndex((x) => Math.abs(x - T) < 1e-12);
      expect(Math.abs(arr(r, "sweepChiralWeight")[i]! - o.sweep[k]!.w)).toBeLessThan(1e-9);
      expect(Math.abs(arr(r, "sweepWallDensity")[i]! / o.sweep[k]!.n - 1)).toBeLessThan(1e-9);
    });
    const shape = arr(r, "villainShape");
    const peak = Math.max(...o.shape);
    expect(peak).toBeGreaterThan(0);
    arr(r, "villainOmega").forEach((w, i) => expect(Math.abs(shape[i]! - o.shape[i]!) / peak, `S_V at w = ${w}`).toBeLessThan(1e-6));
    // detailed balance S(q, -w) = e^{-w/T} S(q, w) (S. Lovesey, Theory of Neutron Scattering from
    // Condensed Matter (Oxford 1984), eq. 2.42; S(-q) = S(q) by reflection)
    const om = arr(r, "villainOmega");
    for (let i = 0; i < om.length; i += 7) {
      const j = om.length - 1 - i;
      expect(Math.abs(om[j]! + om[i]!)).toBeLessThan(1e-12);
      if (shape[j]! > 0) expect(Math.abs(shape[i]! / shape[j]! - Math.exp(-om[j]! / inputs.T)), `balance at w = ${om[j]}`).toBeLessThan(1e-9);
    }
    expect(txt(r, "summary")).toContain(num(r, "wallGap").toPrecision(4));
  });
});
