/**
 * Every output of ion-levels against a numpy oracle that builds the Stevens operator equivalents
 * from the explicit polynomials of M. Hutchings, Solid State Physics 16, 227 (1964), Table VI
 * (O_2^0, O_2^2, O_4^0, O_4^3, O_4^4) and diagonalizes H = sum B O + g_J muB B . J with numpy.
 * Conversions: CODATA 2018 (scipy.constants) for k_B, muB, e, h, c.
 * g-tensor of the ground Kramers doublet from the effective spin 1/2 (A. Abragam, B. Bleaney,
 * Electron Paramagnetic Resonance of Transition Ions (Oxford 1970), sec. 15.3):
 * (g g^T)_ab = 2 g_J^2 Re Tr(P J_a P J_b) with P the projector on the doublet.
 * Schottky heat C/R = (<E^2> - <E>^2) / T^2 (E in K); M = -dF/dB = -g_J <J . n> in muB
 * (J. Jensen, A. Mackintosh, Rare Earth Magnetism (Oxford 1991), ch. 1); neutron dipole intensity
 * (2/3) sum_a |<i|J_a|j>|^2 times the thermal weight of i (Jensen and Mackintosh, sec. 4.2).
 */
import { describe, expect, it } from "vitest";
import { getCalculator, runCalculator } from "@helicoid/lib";
import { runPython } from "../../helpers/python.js";

type R = ReturnType<typeof runCalculator>;
const num = (r: R, name: string): number => r.outputs[name]!.value as number;
const arr = (r: R, name: string): number[] => r.outputs[name]!.value as number[];

const ORACLE = `
import json, sys, numpy as np
import scipy.constants as sc
c = json.load(sys.stdin)
J, gJ = c['J'], c['gJ']
n = int(round(2*J + 1))
m = J - np.arange(n)
Jz = np.diag(m)
Jp = np.zeros((n, n))
for k in range(1, n):
    Jp[k-1, k] = np.sqrt(J*(J + 1) - m[k]*(m[k] + 1))
Jm = Jp.T
Jx, Jy = (Jp + Jm)/2, (Jp - Jm)/(2j)
X = J*(J + 1)*np.eye(n)
I = np.eye(n)
mp = np.linalg.matrix_power
O = {
 'B20': 3*Jz@Jz - X,
 'B22': (mp(Jp, 2) + mp(Jm, 2))/2,
 'B40': 35*mp(Jz, 4) - (30*X - 25*I)@Jz@Jz + 3*X@X - 6*X,
 'B43': (Jz@(mp(Jp, 3) + mp(Jm, 3)) + (mp(Jp, 3) + mp(Jm, 3))@Jz)/4,
 'B44': (mp(Jp, 4) + mp(Jm, 4))/2,
}
H0 = sum(c[k]*O[k] for k in O)
muB_K = sc.physical_constants['Bohr magneton'][0]/sc.k
d = np.array([np.sin(c['theta'])*np.cos(c['phi']), np.sin(c['theta'])*np.sin(c['phi']), np.cos(c['theta'])])
Jn = d[0]*Jx + d[1]*Jy + d[2]*Jz
Hb = lambda B: H0 + gJ*muB_K*B*Jn
E0, V0 = np.linalg.eigh(H0)
out = {}
out['levels'] = (E0 - E0[0]).tolist()
out['meV'] = ((E0 - E0[0])*sc.k/sc.e*1e3).tolist()
out['cm'] = ((E0 - E0[0])*sc.k/(sc.h*sc.c*100)).tolist()
EB = np.linalg.eigvalsh(Hb(c['B']))
out['inField'] = (EB - EB[0]).tolist()
# g-tensor of the lowest two states
P = V0[:, :2]@V0[:, :2].conj().T
Js = [Jx, Jy, Jz]
G = np.array([[2*gJ**2*np.real(np.trace(P@Js[a]@P@Js[b])) for b in range(3)] for a in range(3)])
w, U = np.linalg.eigh(G)
out['g'] = np.sqrt(np.clip(w[::-1], 0, None)).tolist()
out['axes'] = U[:, ::-1].T.tolist()
out['split'] = float(E0[1] - E0[0])
fields = np.linspace(0, c['Bmax'], 41)
out['fields'] = fields.tolist()
out['zeeman'] = [(np.linalg.eigvalsh(Hb(b)) - E0[0]).tolist() for b in fields]
temps = 0.1*3000**(np.arange(41)/40)
out['temps'] = temps.tolist()
def heat(T):
    x = EB - EB[0]
    p = np.exp(-x/T); p /= p.sum()
    return float((p@x**2 - (p@x)**2)/T**2)
out['heat'] = [heat(T) for T in temps]
def M(B, T):
    E, V = np.linalg.eigh(Hb(B))
    x = E - E[0]
    p = np.exp(-x/T); p /= p.sum()
    return float(-gJ*np.real(np.einsum('i,ji,jk,ki->', p, V.conj(), Jn, V)))
out['Mcurve'] = [M(b, c['T']) for b in fields]
out['M'] = M(c['B'], c['T'])
# neutron intensities: sum over state pairs, thermal weight of the initial state (groups with population >= 1e-4)
T = c['T']
x = E0 - E0[0]
wgt = np.exp(-x/T); Z = wgt.sum()
S2 = sum(np.abs(V0.conj().T@A@V0)**2 for A in Js)
lines = {}
tol = 1e-7*max(1.0, x[-1])
for i in range(n):
    grp = np.abs(x - x[i]) < tol
    if wgt[grp].sum()/Z < 1e-4: continue
    for j in range(n):
        de = x[j] - x[i]
        if de <= 1e-9*max(1.0, x[-1]): continue
        key = round(de, 6)
        lines[key] = lines.get(key, 0.0) + (2/3)*S2[i, j]*wgt[i]/Z
out['lines'] = sorted([[k, v] for k, v in lines.items() if v > 1e-12])
print(json.dumps(out))
`;

interface Oracle {
  levels: number[];
  meV: number[];
  cm: number[];
  inField: number[];
  g: number[];
  axes: number[][];
  split: number;
  fields: number[];
  zeeman: number[][];
  temps: number[];
  heat: number[];
  Mcurve: number[];
  M: number;
  lines: [number, number][];
}

const close = (a: number, b: number, tol: number): boolean => Math.abs(a - b) <= tol * Math.max(1, Math.abs(b));

describe("ion-levels: every output against a numpy diagonalization of Hutchings' Stevens operators", () => {
  for (const c of [
    // Kramers ion J = 7/2 with orthorhombic and tetragonal terms, field off the axes
    { J: 3.5, gJ: 8 / 7, B20: -0.8, B22: 0.3, B40: 0.01, B43: 0, B44: 0.05, B: 2.5, theta: 0.7, phi: 0.4, Bmax: 6, T: 5 },
    // J = 4 with a trigonal term, field along a general direction
    { J: 4, gJ: 0.8, B20: 0.6, B22: 0, B40: -0.02, B43: 0.04, B44: 0, B: 4, theta: 1.9, phi: 2.6, Bmax: 12, T: 20 },
  ]) {
    it(`J = ${c.J}, gJ = ${c.gJ.toFixed(3)}, B = ${c.B} T at (${c.theta}, ${c.phi}), T = ${c.T} K`, () => {
      const inputs = { ...c, B60: 0, B63: 0, B64: 0, B66: 0 };
      const r = runCalculator(getCalculator("ion-levels"), inputs);
      const o = runPython<Oracle>(ORACLE, inputs);
      const n = Math.round(2 * c.J + 1);
      const lv = arr(r, "levels");
      expect(lv.length).toBe(n);
      for (let i = 0; i < n; i++) {
        expect(close(lv[i]!, o.levels[i]!, 1e-9), `level ${i}`).toBe(true);
        expect(close(arr(r, "levelsMeV")[i]!, o.meV[i]!, 1e-9)).toBe(true);
        expect(close(arr(r, "levelsWavenumber")[i]!, o.cm[i]!, 1e-9)).toBe(true);
        expect(close(arr(r, "levelsInField")[i]!, o.inField[i]!, 1e-9)).toBe(true);
      }
      expect(Math.abs(num(r, "doubletSplitting") - o.split)).toBeLessThan(1e-9 * Math.max(1, o.split));
      if (o.split < 1e-9) {
        // Kramers doublet: the g-tensor is defined; compare principal values and axes (up to sign)
        expect(close(num(r, "gPrincipal1"), o.g[0]!, 1e-8)).toBe(true);
        expect(close(num(r, "gPrincipal2"), o.g[1]!, 1e-8)).toBe(true);
        expect(close(num(r, "gPrincipal3"), o.g[2]!, 1e-8)).toBe(true);
        const dot = (a: number[], b: number[]) => Math.abs(a[0]! * b[0]! + a[1]! * b[1]! + a[2]! * b[2]!);
        expect(dot(arr(r, "gAxis1"), o.axes[0]!)).toBeGreaterThan(1 - 1e-8);
        expect(dot(arr(r, "gAxis3"), o.axes[2]!)).toBeGreaterThan(1 - 1e-8);
      }
      const fg = arr(r, "fieldGrid");
      expect(fg.length).toBe(41);
      fg.forEach((b, i) => expect(Math.abs(b - o.fields[i]!)).toBeLessThan(1e-12));
      const zeeman = ["zeeman1", "zeeman2", "zeeman3", "zeeman4", "zeeman5", "zeeman6", "zeeman7", "zeeman8"];
      for (let k = 0; k < Math.min(8, n); k++) {
        const z = arr(r, zeeman[k]!);
        for (let i = 0; i < 41; i += 8) expect(close(z[i]!, o.zeeman[i]![k]!, 1e-9), `${zeeman[k]} at ${fg[i]} T`).toBe(true);
      }
      const tg = arr(r, "temperatureGrid");
      tg.forEach((T, i) => expect(close(T, o.temps[i]!, 1e-12)).toBe(true));
      arr(r, "heat").forEach((h, i) => expect(Math.abs(h - o.heat[i]!), `C/R at ${tg[i]} K`).toBeLessThan(1e-9));
      arr(r, "magnetizationCurve").forEach((mm, i) => expect(Math.abs(mm - o.Mcurve[i]!), `M at ${fg[i]} T`).toBeLessThan(1e-9));
      expect(Math.abs(num(r, "magnetization") - o.M)).toBeLessThan(1e-9);
      // neutron lines summed by energy transfer (the grouping of degenerate levels is the calculator's choice)
      const lines = new Map<number, number>();
      arr(r, "transitionEnergy").forEach((e, i) => {
        const key = Math.round(e * 1e6) / 1e6;
        lines.set(key, (lines.get(key) ?? 0) + arr(r, "transitionPowder")[i]!);
      });
      const mine = [...lines.entries()].filter(([, v]) => v > 1e-12).sort((a, b) => a[0] - b[0]);
      expect(mine.length).toBe(o.lines.length);
      mine.forEach(([e, v], i) => {
        expect(Math.abs(e - o.lines[i]![0])).toBeLessThan(1e-5);
        expect(Math.abs(v - o.lines[i]![1]), `intensity at ${e} K`).toBeLessThan(1e-9);
      });
      // the summary names the levels with the ground doublet's g values, at these inputs
      const summary = num(r, "summary") as unknown as string;
      expect(summary).toContain(`${o.levels[n - 1]!.toPrecision(5)} K`);
      expect(summary).toContain(c.J % 1 === 0.5 ? "(Kramers ion)" : "(non-Kramers ion)");
    });
  }
});
