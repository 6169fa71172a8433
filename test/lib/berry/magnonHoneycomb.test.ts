import { describe, expect, it } from "vitest";
import { honeycombMagnonHall, honeycombMagnonHallConverged, honeycombMagnonBands, honeycombMagnonModel, c2Weight } from "../../../lib/src/berry/magnonHoneycomb.js";
import { getCalculator, runCalculator } from "../../../lib/src/calculators/index.js";
import { chernNumbers } from "../../../lib/src/berry/chernNumbers.js";
import { kB } from "../../../lib/src/quantity/constants.js";
import { InputError } from "../../../lib/src/errors.js";
import { runPython } from "../../helpers/python.js";

// Test values of our own (no material): J/k_B = 20 K, D/J = 0.15, S = 3/2.
const J = 20 * kB,
  S = 1.5;
const p = { J, D: 0.15 * J, S, zeeman: 0.02 * J * S };

describe("honeycomb ferromagnet magnons with DMI", () => {
  it("bands: closed form (Owerre 2016) vs the tight-binding matrix; gap 6 sqrt3 |D| S at K", () => {
    // Source: S. A. Owerre, J. Phys.: Condens. Matter 28, 386001 (2016): E+- = 3JS + h +- sqrt(J^2S^2|f|^2 + 4D^2S^2 (sum sin)^2).
    const m = honeycombMagnonModel(p);
    const re = new Float64Array(4),
      im = new Float64Array(4);
    for (const [k1, k2] of [
      [0, 0],
      [0.1, 0.27],
      [1 / 3, 2 / 3],
      [0.5, 0],
    ] as const) {
      m.fill(k1, k2, re, im);
      const tr = (re[0]! + re[3]!) / 2,
        dz = (re[0]! - re[3]!) / 2;
      const r = Math.sqrt(dz * dz + re[1]! ** 2 + im[1]! ** 2);
      const [lo, hi] = honeycombMagnonBands(p, k1, k2);
      expect(Math.abs(tr - r - lo) / J).toBeLessThan(1e-13);
      expect(Math.abs(tr + r - hi) / J).toBeLessThan(1e-13);
    }
    const [a, b] = honeycombMagnonBands(p, 1 / 3, 2 / 3);
    expect((b - a) / (6 * Math.sqrt(3) * p.D * S)).toBeCloseTo(1, 12);
    // Goldstone-like band bottom at Gamma: E = Zeeman energy
    expect(honeycombMagnonBands(p, 0, 0)[0] / p.zeeman!).toBeCloseTo(1, 12);
  });

  it("Chern numbers of opposite sign for the two bands when D != 0, flipping with D; D = 0 gapless with zero curvature", () => {
    // Source: Owerre (2016); Kim et al., PRL 117, 227201 (2016): topological magnon bands C = -+ sgn(D).
    const r = honeycombMagnonHall(p, [5], 50);
    const rm = honeycombMagnonHall({ ...p, D: -p.D }, [5], 50);
    expect(r.chern).not.toBeNull();
    expect(r.chern![0]).toBe(-r.chern![1]!);
    expect(Math.abs(r.chern![0])).toBe(1);
    expect(rm.chern).toEqual([-r.chern![0], -r.chern![1]]);
    const z = honeycombMagnonHall({ ...p, D: 0 }, [5], 50);
    expect(z.status).toBe("gapless");
    expect(z.chern).toBeNull();
    // curvature vanishes identically away from the node plaquettes
    const flux = chernNumbers(honeycombMagnonModel({ ...p, D: 0 }), { n1: 50, onUnresolved: "report", map: true }).flux!;
    let offNode = 0;
    for (const f of flux[0]!) if (Math.abs(f) < 1) offNode = Math.max(offNode, Math.abs(f));
    expect(offNode).toBeLessThan(1e-12);
    expect(Math.abs(z.kappaXYReduced[0]!)).toBeLessThan(1e-12);
  });

  it("c2 agrees with scipy.special.spence (Li2 itself: test/lib/numeric/dilogarithm.test.ts)", () => {
    // Source: scipy.special.spence (Debian scipy 1.10): Li2(x) = spence(1 - x).
    const es = [0.05, 0.5, 1, 3, 8];
    const ref = runPython<{ c2: number[] }>(
      `
import json, sys, numpy as np
from scipy.special import spence
d = json.load(sys.stdin)
def c2(x):
    r = 1 / np.expm1(x)
    return (1 + r) * np.log((1 + r) / r) ** 2 - np.log(r) ** 2 - 2 * spence(1 + r)
print(json.dumps({"c2": [float(c2(x)) for x in d["es"]]}))`,
      { es },
    );
    es.forEach((x, i) => expect(Math.abs(c2Weight(x) - ref.c2[i]!)).toBeLessThan(1e-12));
    // Source: limit c2(rho -> infinity) = pi^2 / 3 (Matsumoto & Murakami 2011), from memory.
    expect(c2Weight(1e-9)).toBeCloseTo((Math.PI * Math.PI) / 3, 4);
    expect(c2Weight(0)).toBe((Math.PI * Math.PI) / 3);
  });

  it("kappa_xy(T) agrees with an independent numpy evaluation (Kubo Berry curvature, scipy c2); odd in D", () => {
    // Source: Matsumoto & Murakami, PRL 106, 197202 (2011) formula; oracle: numpy/scipy with
    // Omega_n = -2 Im sum_m <n|dH/dkx|m><m|dH/dky|n> / (E_n - E_m)^2 (D. Xiao et al., RMP 82, 1959 (2010)).
    const Ts = [3, 10, 30];
    // Richardson extrapolation of our O(1/n^2) grid error from n = 120 and 240.
    const r120 = honeycombMagnonHall(p, Ts, 120),
      r240 = honeycombMagnonHall(p, Ts, 240);
    const r = { kappaXYReduced: Ts.map((_, i) => (4 * r240.kappaXYReduced[i]! - r120.kappaXYReduced[i]!) / 3), kappaXY: r240.kappaXY };
    const ref = runPython<number[]>(
      `
import json, sys, numpy as np
from scipy.special import spence
d = json.load(sys.stdin); J, D, S, h, Ts = d["J"], d["D"], d["S"], d["h"], d["Ts"]
kB = 1.380649e-23
s3 = np.sqrt(3.0)
dl = np.array([[0, 1], [-s3 / 2, -0.5], [s3 / 2, -0.5]])
bb = np.array([[-s3, 0], [s3 / 2, -1.5], [s3 / 2, 1.5]])
a1 = np.array([s3 / 2, 1.5]); a2 = np.array([-s3 / 2, 1.5])
A = np.array([a1, a2]); B = 2 * np.pi * np.linalg.inv(A).T
N = 400
u = (np.arange(N) + 0.5) / N
U, V = np.meshgrid(u, u, indexing="ij")
K = U[..., None] * B[0] + V[..., None] * B[1]
kd = K @ dl.T; kb = K @ bb.T
f = np.exp(1j * kd).sum(-1); dfx = (1j * dl[:, 0] * np.exp(1j * kd)).sum(-1); dfy = (1j * dl[:, 1] * np.exp(1j * kd)).sum(-1)
ss = np.sin(kb).sum(-1); dsx = (bb[:, 0] * np.cos(kb)).sum(-1); dsy = (bb[:, 1] * np.cos(kb)).sum(-1)
e0 = 3 * J * S + h
H = np.zeros(K.shape[:2] + (2, 2), complex)
H[..., 0, 0] = e0 - 2 * D * S * ss; H[..., 1, 1] = e0 + 2 * D * S * ss
H[..., 0, 1] = -J * S * f; H[..., 1, 0] = np.conj(-J * S * f)
def dH(df, ds):
    M = np.zeros(K.shape[:2] + (2, 2), complex)
    M[..., 0, 0] = -2 * D * S * ds; M[..., 1, 1] = 2 * D * S * ds
    M[..., 0, 1] = -J * S * df; M[..., 1, 0] = np.conj(-J * S * df)
    return M
Hx = dH(dfx, dsx); Hy = dH(dfy, dsy)
E, W = np.linalg.eigh(H)
Wh = np.conj(np.swapaxes(W, -1, -2))
X = Wh @ Hx @ W; Y = Wh @ Hy @ W
Om = np.zeros(E.shape)
for n in range(2):
    m = 1 - n
    Om[..., n] = -2 * np.imag(X[..., n, m] * Y[..., m, n]) / (E[..., n] - E[..., m]) ** 2
area = abs(np.linalg.det(B)) / N ** 2
out = []
for T in Ts:
    x = E / (kB * T); r = 1 / np.expm1(x)
    c2 = (1 + r) * np.log((1 + r) / r) ** 2 - np.log(r) ** 2 - 2 * spence(1 + r)
    out.append(float(-(c2 * Om).sum() * area / (4 * np.pi ** 2)))
print(json.dumps(out))`,
      { J, D: p.D, S, h: p.zeeman, Ts },
    );
    Ts.forEach((_, i) => expect(Math.abs(r.kappaXYReduced[i]! / ref[i]! - 1), `T=${Ts[i]}`).toBeLessThan(1e-3));
    const rm = honeycombMagnonHall({ ...p, D: -p.D }, Ts, 60);
    const r60 = honeycombMagnonHall(p, Ts, 60);
    Ts.forEach((_, i) => expect(rm.kappaXY[i]! / r60.kappaXY[i]!).toBeCloseTo(-1, 12));
    expect(r.kappaXY[1]).not.toBe(0);
  });

  it("rejects an antiferromagnetic J, a negative field and S not a multiple of 1/2", () => {
    expect(() => honeycombMagnonModel({ J: -1, D: 0.1, S: 1 })).toThrow(InputError);
    expect(() => honeycombMagnonModel({ J: 1, D: 0.1, S: 1, zeeman: -1 })).toThrow(/Zeeman/);
    expect(() => honeycombMagnonModel({ J: 1, D: 0.1, S: 0.8 })).toThrow(/multiple of 1\/2/);
  });
});

const ORACLE =
  'import json, sys, numpy as np\nfrom scipy.special import spence\nJ, D, S, h, Ts, N = d["J"], d["D"], d["S"], d["h"], d["Ts"], d["N"]\nkB = 1.380649e-23\ns3 = np.sqrt(3.0)\ndl = np.array([[0, 1], [-s3 / 2, -0.5], [s3 / 2, -0.5]])\nbb = np.array([[-s3, 0], [s3 / 2, -1.5], [s3 / 2, 1.5]])\na1 = np.array([s3 / 2, 1.5]); a2 = np.array([-s3 / 2, 1.5])\nA = np.array([a1, a2]); B = 2 * np.pi * np.linalg.inv(A).T\nu = (np.arange(N) + 0.5) / N\nU, V = np.meshgrid(u, u, indexing="ij")\nK = U[..., None] * B[0] + V[..., None] * B[1]\nkd = K @ dl.T; kb = K @ bb.T\nf = np.exp(1j * kd).sum(-1); dfx = (1j * dl[:, 0] * np.exp(1j * kd)).sum(-1); dfy = (1j * dl[:, 1] * np.exp(1j * kd)).sum(-1)\nss = np.sin(kb).sum(-1); dsx = (bb[:, 0] * np.cos(kb)).sum(-1); dsy = (bb[:, 1] * np.cos(kb)).sum(-1)\ne0 = 3 * J * S + h\nH = np.zeros(K.shape[:2] + (2, 2), complex)\nH[..., 0, 0] = e0 - 2 * D * S * ss; H[..., 1, 1] = e0 + 2 * D * S * ss\nH[..., 0, 1] = -J * S * f; H[..., 1, 0] = np.conj(-J * S * f)\ndef dH(df, ds):\n    M = np.zeros(K.shape[:2] + (2, 2), complex)\n    M[..., 0, 0] = -2 * D * S * ds; M[..., 1, 1] = 2 * D * S * ds\n    M[..., 0, 1] = -J * S * df; M[..., 1, 0] = np.conj(-J * S * df)\n    return M\nHx = dH(dfx, dsx); Hy = dH(dfy, dsy)\nE, W = np.linalg.eigh(H)\nWh = np.conj(np.swapaxes(W, -1, -2))\nX = Wh @ Hx @ W; Y = Wh @ Hy @ W\nOm = np.zeros(E.shape)\nfor n in range(2):\n    m = 1 - n\n    Om[..., n] = -2 * np.imag(X[..., n, m] * Y[..., m, n]) / (E[..., n] - E[..., m]) ** 2\narea = abs(np.linalg.det(B)) / N ** 2\nout = []\nfor T in Ts:\n    x = E / (kB * T); r = 1 / np.expm1(x)\n    c2 = (1 + r) * np.log((1 + r) / r) ** 2 - np.log(r) ** 2 - 2 * spence(1 + r)\n    out.append(float(-(c2 * Om).sum() * area / (4 * np.pi ** 2)))\nprint(json.dumps(out))';

describe("kappa_xy converged to a stated tolerance (numpy Kubo-formula oracle, itself checked for convergence)", () => {
  // Source: Matsumoto & Murakami, PRL 106, 197202 (2011) formula; oracle: numpy/scipy midpoint sum of
  // c2(rho) Omega with the Kubo Berry curvature (D. Xiao et al., RMP 82, 1959 (2010)) on N = 400 and 800,
  // spectrally accurate for this smooth periodic integrand (the two must agree first).
  const kubo = `
import json, sys
results = []
for d in json.load(sys.stdin):
    exec(compile(${JSON.stringify(ORACLE.replace("print(json.dumps(out))", "res = out"))}, "oracle", "exec"), globals())
    results.append(res)
print(json.dumps(results))`;
  const gmuB = 2 * 9.2740100783e-24;
  // calculator inputs (K, T) -> model in J
  const films = [
    { J: 20, D: 3, S: 1.5, B: 0.5, T: 10 },
    { J: 20, D: 3, S: 1.5, B: 0.5, T: 0.5 },
    { J: 20, D: -3, S: 1.5, B: 0.01, T: 2 },
  ];
  const jobs = films.flatMap((f) => [400, 800].map((N) => ({ J: f.J * kB, D: f.D * kB, S: f.S, h: gmuB * f.B, Ts: [f.T], N })));
  const ref = runPython<number[][]>(kubo, jobs, 300_000);

  it("the calculator's kappa_xy (Richardson, doubling grids) agrees with the converged numpy value to the stated 1e-3", () => {
    films.forEach((f, k) => {
      const a = ref[2 * k]![0]!,
        b = ref[2 * k + 1]![0]!;
      expect(Math.abs(a / b - 1), `oracle converged for ${JSON.stringify(f)}`).toBeLessThan(1e-5);
      const r = runCalculator(getCalculator("magnon-hall"), f);
      const red = r.outputs.kappaXYReduced!.value as number;
      expect(Math.abs(red / b - 1), JSON.stringify(f)).toBeLessThan(2e-3);
      expect(r.outputs.kappaXYReducedError!.value as number).toBeLessThan(1e-3 * Math.abs(red) + 1e-9);
      expect(r.notes.join(" ")).toMatch(/Mermin-Wagner/);
    });
  });

  it("no kappa when not converged or unresolved; a warning when k_B T is comparable to the band width", () => {
    const p = { J: 20 * kB, D: 3 * kB, S: 1.5, zeeman: gmuB * 0.5 };
    const c = honeycombMagnonHallConverged(p, [0.5], { n0: 12, maxN: 48, rtol: 1e-9, atol: 0 });
    expect(c.converged[0]).toBe(false);
    expect(c.kappaXYReduced[0]).toBeNull();
    // a tiny DMI gap: the Berry curvature is not resolved on the last grid, so no kappa
    const u = honeycombMagnonHallConverged({ ...p, D: 1e-4 * kB }, [10], { n0: 12, maxN: 48 });
    expect(u.last.status).toBe("unresolved");
    expect(u.kappaXY[0]).toBeNull();
    const hot = runCalculator(getCalculator("magnon-hall"), { T: 100 });
    expect(hot.status).toBe("warning");
    expect(hot.notes.join(" ")).toMatch(/band width/);
  });
});
