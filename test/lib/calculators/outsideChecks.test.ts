/**
 * Headline outputs of calculators checked against values from outside the project: published
 * closed forms evaluated here or by Debian's numpy/scipy (runPython), and numpy diagonalizations.
 * Each test is registered in `outsideChecks` (contract.test.ts) for its calculator.
 */
import { describe, expect, it } from "vitest";
import { getCalculator, makeFilm, runCalculator, solveSkyrmionExact } from "@helicoid/lib";
import { runPython } from "../../helpers/python.js";

// The radial skyrmion boundary-value problem for scipy (as in test/lib/walls/skyrmionExact.test.ts).
const SCIPY_BVP = `
import json, sys, numpy as np
from scipy.integrate import solve_bvp
from scipy.optimize import brentq
out = []
for c in json.load(sys.stdin):
    d, b, L = c["d"], c["b"], c["L"]
    x0 = 1e-3
    def f(x, y):
        s, co = np.sin(y[0]), np.cos(y[0])
        return np.vstack([y[1], -y[1] / x + s * co / x**2 + s * co - d * s**2 / x + b * s])
    def bc(ya, yb):
        return np.array([ya[0] - np.pi - x0 * ya[1], yb[0]])
    x = np.array(c["x"]); x[0] = x0
    th = np.array(c["theta"]); dth = np.gradient(th, x)
    sol = solve_bvp(f, bc, x, np.vstack([th, dth]), tol=c["tol"], max_nodes=100000)
    g = lambda z: sol.sol(z)[0] - np.pi / 2
    xs = sol.x
    i = np.where((sol.y[0][:-1] >= np.pi / 2) & (sol.y[0][1:] < np.pi / 2))[0][0]
    out.append({"status": int(sol.status), "radius": brentq(g, xs[i], xs[i + 1], xtol=1e-14)})
print(json.dumps(out))
`;

const num = (r: ReturnType<typeof runCalculator>, name: string): number => r.outputs[name]!.value as number;
const arr = (r: ReturnType<typeof runCalculator>, name: string): number[] => r.outputs[name]!.value as number[];

/** CODATA 2018 constants from scipy (independent of lib/src/quantity/constants.ts). */
const codata = runPython<{ muB: number; kB: number; e: number; mu0: number; gamma: number; ge: number }>(
  "import json, scipy.constants as c\nprint(json.dumps({'muB': c.physical_constants['Bohr magneton'][0], 'kB': c.k, 'e': c.e, 'mu0': c.mu_0, 'gamma': c.physical_constants['electron gyromag. ratio'][0], 'ge': abs(c.physical_constants['electron g factor'][0])}))",
);

describe("outside checks of headline outputs", () => {
  it("berry-loop: the top-state phase is -S times the cone's solid angle", () => {
    // Source: M. V. Berry, Proc. R. Soc. A 392, 45 (1984) (gamma_m = -m Omega for a spin along the
    // loop); solid angle of the geodesic polygon by A. van Oosterom, J. Strackee, IEEE Trans. Biomed.
    // Eng. 30, 125 (1983), summed over the triangles (pole, v_k, v_k+1) in numpy.
    const r = runCalculator(getCalculator("berry-loop"), { twoS: 3, theta: 1, segments: 200 }, { noSweep: true });
    const omega = runPython<{ polygon: number; cap: number }>(`
import json, numpy as np
th, N = 1.0, 200
phi = 2*np.pi*np.arange(N)/N
v = np.stack([np.sin(th)*np.cos(phi), np.sin(th)*np.sin(phi), np.cos(th)*np.ones(N)], 1)
a = np.array([0., 0., 1.])
tot = 0.0
for k in range(N):
    b, c = v[k], v[(k+1) % N]
    tot += 2*np.arctan2(np.dot(a, np.cross(b, c)), 1 + a@b + b@c + c@a)
print(json.dumps({'polygon': abs(tot), 'cap': 2*np.pi*(1-np.cos(th))}))`);
    expect(Math.abs(num(r, "solidAngle") / omega.polygon - 1)).toBeLessThan(1e-10);
    expect(Math.abs(num(r, "capSolidAngle") / omega.cap - 1)).toBeLessThan(1e-12);
    const wrap = (x: number) => x - 2 * Math.PI * Math.round(x / (2 * Math.PI));
    expect(Math.abs(wrap(num(r, "gammaTop") - -1.5 * omega.polygon))).toBeLessThan(1e-9);
  });

  it("chern: Haldane's phase diagram (C = +-1 inside |M| < 3 sqrt3 t2 |sin phi|)", () => {
    // Source: F. D. M. Haldane, Phys. Rev. Lett. 61, 2015 (1988): the gap closes at M = +-3 sqrt(3) t2 sin(phi);
    // inside, the lower band has |C| = 1; outside C = 0.
    const spec = getCalculator("chern");
    for (const [t2, phi] of [
      [0.1, Math.PI / 2],
      [0.2, 0.6],
    ] as const) {
      const Mc = 3 * Math.sqrt(3) * t2 * Math.abs(Math.sin(phi));
      const inside = runCalculator(spec, { t2, phi, M: 0.4 * Mc }, { noSweep: true });
      const outside = runCalculator(spec, { t2, phi, M: 1.6 * Mc }, { noSweep: true });
      expect(Math.abs(num(inside, "criticalMass") / Mc - 1)).toBeLessThan(1e-12);
      expect(Math.abs(num(inside, "chernLower"))).toBe(1);
      expect(num(inside, "chernLower") + num(inside, "chernUpper")).toBe(0);
      expect(num(outside, "chernLower")).toBe(0);
    }
  });

  it("magnon-hall: band edges of the honeycomb ferromagnet against numpy", () => {
    // Source: linear spin waves of the honeycomb ferromagnet with next-nearest-neighbour DMI,
    // S. A. Owerre, J. Phys.: Condens. Matter 28, 386001 (2016): H_k = S [3J + b/S - J f_k; ...] +- 2 D S sum sin(k.a);
    // diagonalized by numpy on a k grid; b = g muB B with g = 2 (CODATA constants from scipy).
    const r = runCalculator(getCalculator("magnon-hall"), {}, { noSweep: true });
    const [J, D, S, B] = [14, 2.2, 2, 0.5];
    const ref = runPython<{ bottom: number; top: number; gapK: number }>(`
import json, numpy as np, scipy.constants as c
J, D, S, B = ${J}, ${D}, ${S}, ${B}
b = 2*c.physical_constants['Bohr magneton'][0]*B/c.k
d = np.array([[0, 1], [np.sqrt(3)/2, -0.5], [-np.sqrt(3)/2, -0.5]])
a = np.array([d[1]-d[2], d[2]-d[0], d[0]-d[1]])
def bands(k):
    f = np.sum(np.exp(1j*(d@k)))
    g = 2*D*S*np.sum(np.sin(a@k))
    h = np.array([[3*J*S + b + g, -J*S*f], [-J*S*np.conj(f), 3*J*S + b - g]])
    return np.linalg.eigvalsh(h)
ks = np.linspace(-2*np.pi, 2*np.pi, 121)
E = np.array([bands(np.array([x, y])) for x in ks for y in ks])
K = np.array([4*np.pi/(3*np.sqrt(3)), 0])
eK = bands(K)
print(json.dumps({'bottom': E[:, 0].min(), 'top': E[:, 1].max(), 'gapK': eK[1]-eK[0]}))`);
    expect(Math.abs(num(r, "bandBottom") / ref.bottom - 1)).toBeLessThan(1e-9);
    expect(Math.abs(num(r, "bandTop") / ref.top - 1)).toBeLessThan(1e-9);
    expect(Math.abs(num(r, "gapAtK") / ref.gapK - 1)).toBeLessThan(1e-9);
  });

  it("spin-tunnel: Garg's period of the quenched splittings", () => {
    // Source: A. Garg, Europhys. Lett. 22, 205 (1993); in the D, E form of W. Wernsdorfer, R. Sessoli,
    // Science 284, 133 (1999): Delta B = (2 k_B / g muB) sqrt(2 E (E + D)), g = 2.
    const r = runCalculator(getCalculator("spin-tunnel"), { D: "0.42 K", E: "0.04 K" });
    const period = ((2 * codata.kB) / (2 * codata.muB)) * Math.sqrt(2 * 0.04 * (0.04 + 0.42));
    expect(Math.abs(num(r, "gargPeriod") / period - 1)).toBeLessThan(1e-9);
    // the splittings computed by diagonalization vanish about one period apart
    expect(Math.abs(num(r, "meanPeriod") / period - 1)).toBeLessThan(0.05);
  });

  it("easy-plane: the ground state's S_z against numpy diagonalization", () => {
    // Source: H = D Sz^2 - g muB B Sz (the spec's Hamiltonian, diagonal in m); Boltzmann average by numpy,
    // CODATA constants from scipy.
    for (const [twoS, D, B, T] of [
      [20, 1, 2, 0.5],
      [7, 0.5, 3.3, 1.5],
    ] as const) {
      const r = runCalculator(getCalculator("easy-plane"), { twoS, D, B, T }, { noSweep: true });
      const ref = runPython<{ ground: number; sz: number }>(`
import json, numpy as np, scipy.constants as c
twoS, D, B, T = ${twoS}, ${D}, ${B}, ${T}
m = np.arange(-twoS, twoS + 1, 2)/2
E = D*m**2 - 2*c.physical_constants['Bohr magneton'][0]*B/c.k*m
w = np.exp(-(E - E.min())/T)
print(json.dumps({'ground': float(m[np.argmin(E)]), 'sz': float((w*m).sum()/w.sum())}))`);
      expect(num(r, "groundM")).toBe(ref.ground);
      expect(Math.abs(num(r, "szExact") - ref.sz)).toBeLessThan(1e-9 * Math.max(1, Math.abs(ref.sz)));
    }
  });

  it("wall-current: below the Walker current v = (beta / alpha) u", () => {
    // Source: A. Thiaville, Y. Nakatani, J. Miltat, Y. Suzuki, Europhys. Lett. 69, 990 (2005): with
    // adiabatic and non-adiabatic spin-transfer torque the steady wall moves at (beta / alpha) u,
    // u = j P g muB / (2 e Ms) with the electron's g = 2.0023 (CODATA constants from scipy).
    const r = runCalculator(getCalculator("wall-current"), { j: "1e11 A/m^2", P: 0.5, beta: 0.1, alpha: 0.3, thetaSH: 0, Ms: "1.1 MA/m" }, { noSweep: true });
    const u = (1e11 * 0.5 * codata.ge * codata.muB) / (2 * codata.e * 1.1e6);
    expect(r.outputs.regime!.value).toMatch(/steady/);
    expect(Math.abs(Math.abs(num(r, "velocity")) / ((0.1 / 0.3) * u) - 1)).toBeLessThan(1e-6);
  });

  it("wall-trace: the mean velocity above Walker breakdown against the closed form", () => {
    // Source: A. Mougin et al., Europhys. Lett. 78, 57007 (2007): <v> = (gamma Delta / alpha) [B - sqrt(B^2 - B_W^2) / (1 + alpha^2)];
    // B_W = alpha mu0 Ms N_x Ms / 2 with N_x = t ln2 / (pi Delta) (S. V. Tarasenko et al., JMMM 189, 19 (1998)),
    // Delta = sqrt(A / K_eff), K_eff = Ku - mu0 Ms^2 / 2; gamma from scipy (CODATA).
    const [Ms, A, Ku, t, alpha, B] = [1.1e6, 1.5e-11, 1.2e6, 1e-9, 0.3, 0.15];
    const r = runCalculator(getCalculator("wall-trace"), { Ms, A, Ku, D: 0, t, alpha, Bz: B, duration: "2 ns", j: 0, thetaSH: 0 });
    const Delta = Math.sqrt(A / (Ku - (codata.mu0 * Ms * Ms) / 2));
    const BW = (alpha * codata.mu0 * Ms * ((t * Math.LN2) / (Math.PI * Delta))) / 2;
    const v = ((codata.gamma * Delta) / alpha) * (B - Math.sqrt(B * B - BW * BW) / (1 + alpha * alpha));
    expect(Math.abs(num(r, "width") / Delta - 1)).toBeLessThan(1e-9);
    expect(Math.abs(num(r, "walkerField") / BW - 1)).toBeLessThan(1e-6);
    expect(Math.abs(num(r, "traceVelocity") / v - 1)).toBeLessThan(1e-5);
  });

  it("chain-dynamics: <S^x> of a small ring against numpy diagonalization", () => {
    // Source: exact diagonalization by numpy of H = sum Jz Sz Sz + Jperp (Sx Sx + Sy Sy) - hx sum Sx on a
    // periodic ring of 8 spins 1/2 (Kronecker products, numpy.linalg.eigh); the chiral weight obeys
    // the sum rule int C = -<S^x> (derived in lib/src/chains/dynamics.ts).
    const r = runCalculator(getCalculator("chain-dynamics"), { N: 8, Jz: 10, Jperp: 2, hx: 1, hz: 0, T: 0 });
    const ref = runPython<number>(`
import json, numpy as np
N, Jz, Jp, hx = 8, 10, 2, 1
sx = np.array([[0, .5], [.5, 0]]); sy = np.array([[0, -.5j], [.5j, 0]]); sz = np.diag([.5, -.5])
def op(o, i):
    m = np.array([[1.]])
    for k in range(N): m = np.kron(m, o if k == i else np.eye(2))
    return m
Sx = [op(sx, i) for i in range(N)]; Sy = [op(sy, i) for i in range(N)]; Sz = [op(sz, i) for i in range(N)]
H = sum(Jz*Sz[i]@Sz[(i+1) % N] + Jp*(Sx[i]@Sx[(i+1) % N] + Sy[i]@Sy[(i+1) % N]).real for i in range(N)) - hx*sum(Sx)
w, v = np.linalg.eigh(H)
g = v[:, 0]
print(json.dumps(float(g@sum(Sx)@g/N)))`);
    expect(Math.abs(num(r, "magnetizationX") - ref)).toBeLessThan(1e-10);
    expect(Math.abs(num(r, "chiralWeight") + ref)).toBeLessThan(1e-8);
  });

  it("wall-fit: the fit recovers the profile it was generated from, within its errors", () => {
    // Source: scipy.optimize.curve_fit (Levenberg-Marquardt of MINPACK) on the same data with the
    // 360-degree wall profile tan(theta/2) = sinh(R/w) / sinh(|x - x0|/w) (the spec's model).
    const r = runCalculator(getCalculator("wall-fit"), {});
    const ref = runPython<{ R: number; w: number } | { error: string }>(
      `
import json, sys, numpy as np
from scipy.optimize import curve_fit
d = json.load(sys.stdin)
x, y = np.array(d['x']), np.array(d['y'])
def mz(x, x0, R, w, off, con):
    t = np.sinh(R/w)/np.sinh(np.maximum(np.abs(x - x0), 1e-30)/w)
    return off + con*(1 - t**2)/(1 + t**2)
p, _ = curve_fit(mz, x, y, p0=[0, d['R0'], d['w0'], 0, 1], maxfev=20000)
print(json.dumps({'R': abs(p[1]), 'w': abs(p[2])}))`,
      { x: arr(r, "x"), y: arr(r, "data"), R0: num(r, "Rfit") * 0.8, w0: num(r, "wfit") * 1.2 },
    );
    if ("error" in ref) throw new Error(ref.error);
    expect(Math.abs(num(r, "Rfit") - ref.R)).toBeLessThan(0.05 * num(r, "RStderr"));
    expect(Math.abs(num(r, "wfit") - ref.w)).toBeLessThan(0.05 * num(r, "wStderr"));
    // and the truth it was generated from (R = 30 nm, w = 8 nm) lies within 3 standard errors
    expect(Math.abs(num(r, "Rfit") - 30e-9)).toBeLessThan(3 * num(r, "RStderr"));
    expect(Math.abs(num(r, "wfit") - 8e-9)).toBeLessThan(3 * num(r, "wStderr"));
  });
});

describe("outside checks of wall and skyrmion profiles", () => {
  it("wall360: the core half-width and its slope against scipy quad of the first integral", () => {
    // Source: the first integral of the 1D wall equation, A theta'^2 = K_eff [sin^2 theta + 2 h (1 - cos theta)],
    // h = Ms B / (2 K_eff) (A. Hubert, R. Schaefer, Magnetic Domains, Springer 1998, the 1D wall by
    // the mechanical analogy), integrated by scipy quad: the core half-width R = x(theta = pi/2)
    // from the centre (theta = pi), and the slope there, |theta'(R)| = sqrt(1 + 2 h) / Delta, which
    // the 2-pi-wall profile gives as coth(R / w) / w.
    for (const B of [0.02, 0.05, 0.2]) {
      const r = runCalculator(getCalculator("wall360"), { B }, { noSweep: true });
      const [Ms, A, Ku] = [1.1e6, 1.5e-11, 1.2e6];
      const ref = runPython<{ R: number; slope: number }>(`
import json, numpy as np, scipy.constants as c
from scipy.integrate import quad
Ms, A, Ku, B = ${Ms}, ${A}, ${Ku}, ${B}
K = Ku - c.mu_0*Ms**2/2
h = Ms*B/(2*K)
D = np.sqrt(A/K)
R, err = quad(lambda t: D/np.sqrt(np.sin(t)**2 + 2*h*(1 - np.cos(t))), np.pi/2, np.pi, epsabs=0, epsrel=1e-13)
print(json.dumps({'R': R, 'slope': np.sqrt(1 + 2*h)/D}))`);
      const R = num(r, "radius");
      const w = num(r, "wallWidth");
      expect(Math.abs(R / ref.R - 1), `B = ${B} T`).toBeLessThan(1e-6);
      expect(Math.abs(1 / (Math.tanh(R / w) * w) / ref.slope - 1), `B = ${B} T`).toBeLessThan(1e-6);
    }
  });
  it("skyrmion-profile: the exact profile solves the Euler-Lagrange equation (scipy solve_bvp)", () => {
    // Source: scipy.integrate.solve_bvp (collocation, tol 1e-8) on the radial Euler-Lagrange equation in
    // units of Delta = sqrt(A / K_eff): theta'' = -theta'/x + sin cos / x^2 + sin cos - d sin^2 / x + b sin,
    // d = D / sqrt(A K_eff), b = Ms B / (2 K_eff), K_eff = Ku - mu0 Ms^2 / 2 (A. Bogdanov, A. Hubert,
    // JMMM 138, 255 (1994)); the radius is where theta = pi / 2.
    const [Ms, A, Ku, D, t] = [1.1e6, 1.5e-11, 1.2e6, 2e-3, 1e-9];
    for (const B of [0.02, 0.1]) {
      const r = runCalculator(getCalculator("skyrmion-profile"), { Ms, A, Ku, D, t, B });
      const K = Ku - (codata.mu0 * Ms * Ms) / 2;
      const Delta = Math.sqrt(A / K);
      // the starting guess for scipy (any reasonable profile): the library's own solution, thinned
      const s = solveSkyrmionExact(makeFilm({ Ms, A, Ku, D, t }), B);
      const x: number[] = [];
      const theta: number[] = [];
      for (let i = 0; i < s.theta.length; i += 10) {
        x.push(s.rho[i]! / Delta);
        theta.push(s.theta[i]!);
      }
      const ref = runPython<Array<{ status: number; radius: number }>>(SCIPY_BVP, [{ d: D / Math.sqrt(A * K), b: (Ms * B) / (2 * K), L: x[x.length - 1]!, x, theta, tol: 1e-8 }]);
      expect(ref[0]!.status).toBe(0);
      expect(Math.abs(num(r, "radiusExact") / (ref[0]!.radius * Delta) - 1), `B = ${B} T`).toBeLessThan(1e-4);
    }
  });
});
