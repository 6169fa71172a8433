/**
 * Our fits of wall profiles against Debian's scipy.optimize.least_squares (method "lm", MINPACK)
 * on the same data and start: the same optimum to 1e-8 relative and the same covariance to 1e-4.
 * Source: scipy 1.10 (Debian python3-scipy) as an independent oracle; covariance there computed as
 * inv(J^T J) * chi2 / (n - k) from its Jacobian at the optimum.
 */
import { describe, it, expect } from "vitest";
import { runPython } from "../../helpers/python.js";
import { fitProfile } from "../../../lib/src/fit/fitProfile.js";
import { seededRandom } from "../../../lib/src/numeric/prng.js";

const nm = 1e-9;

function synth(kind: "180" | "360", n: number, seed: number) {
  const rng = seededRandom(seed);
  const x: number[] = [];
  const y: number[] = [];
  for (let i = 0; i < n; i++) {
    const xi = (-150 + (300 * i) / (n - 1)) * nm;
    let mz: number;
    if (kind === "180") mz = -Math.tanh((xi - 3 * nm) / (12 * nm));
    else {
      const t = Math.sinh((40 * nm) / (9 * nm)) / Math.sinh(Math.abs(xi - 2 * nm) / (9 * nm));
      mz = (1 - t * t) / (1 + t * t);
    }
    x.push(xi);
    y.push(0.1 + 0.8 * mz + 0.03 * rng.normal());
  }
  return { x, y };
}

const script = `
import sys, json, numpy as np
from scipy.optimize import least_squares
d = json.load(sys.stdin)
x = np.array(d["x"]) * 1e9   # fit in nm (scipy's lm uses unit-agnostic scaling, but keep numbers O(1))
y = np.array(d["y"])
p0 = np.array(d["p0"]); p0[:d["nlen"]] *= 1e9
def f180(p):
    return p[2] + p[3] * -np.tanh((x - p[0]) / p[1])
def f360(p):
    x0, R, w, off, c = p
    a = np.abs(x - x0) / w
    with np.errstate(divide="ignore", over="ignore"):
        L = np.log(np.sinh(R / w)) - np.log(np.sinh(a))
    return off + c * -np.tanh(L)
f = f180 if d["kind"] == "180" else f360
res = least_squares(lambda p: f(p) - y, p0, method="lm", xtol=1e-15, ftol=1e-15, gtol=1e-15, max_nfev=20000)
# Jacobian at the optimum by a careful central difference, then the covariance
p = res.x
J = np.empty((len(x), len(p)))
for j in range(len(p)):
    h = 1e-6 * max(abs(p[j]), 1e-3)
    e = np.zeros(len(p)); e[j] = h
    J[:, j] = (f(p + e) - f(p - e)) / (2 * h)
s2 = np.sum(res.fun ** 2) / (len(x) - len(p))
cov = np.linalg.inv(J.T @ J) * s2
scale = np.array([1e-9] * d["nlen"] + [1.0] * (len(p) - d["nlen"]))
print(json.dumps({"x": (p * scale).tolist(), "cov": (cov * np.outer(scale, scale)).tolist(), "status": int(res.status)}))
`;

describe("wall-profile fits agree with scipy.optimize.least_squares", () => {
  it("180-degree wall (offset + contrast m_z), 301 noisy points", () => {
    const d = synth("180", 301, 11);
    const start = { x0: 0, Delta: 8 * nm, offset: 0, contrast: 1 };
    const r = fitProfile(d, "wall180-mz", { start });
    expect(r.status).toBe("converged");
    const py = runPython<{ x: number[]; cov: number[][] }>(script, { ...d, kind: "180", p0: [0, 8 * nm, 0, 1], nlen: 2 });
    const names = ["x0", "Delta", "offset", "contrast"];
    names.forEach((nmn, j) => {
      // Source: scipy least_squares(method="lm") optimum
      expect(Math.abs(r.parameters[nmn].value - py.x[j]) / Math.abs(py.x[j])).toBeLessThan(1e-8);
    });
    for (let a = 0; a < 4; a++)
      for (let b = 0; b < 4; b++) {
        const ref = py.cov[a][b];
        const tol = 1e-4 * Math.sqrt(py.cov[a][a] * py.cov[b][b]);
        expect(Math.abs(r.covariance![a][b] - ref)).toBeLessThan(tol);
      }
  });
  it("360-degree wall (ansatz of Braun / Buettner et al.), 401 noisy points", () => {
    const d = synth("360", 401, 5);
    const r = fitProfile(d, "wall360-mz", { start: { x0: 0, R: 30 * nm, w: 12 * nm, offset: 0, contrast: 1 } });
    expect(r.status).toBe("converged");
    const py = runPython<{ x: number[]; cov: number[][] }>(script, { ...d, kind: "360", p0: [0, 30 * nm, 12 * nm, 0, 1], nlen: 3 });
    ["x0", "R", "w", "offset", "contrast"].forEach((nmn, j) => {
      // Source: scipy least_squares(method="lm") optimum
      expect(Math.abs(r.parameters[nmn].value - py.x[j]) / Math.abs(py.x[j])).toBeLessThan(1e-8);
    });
    for (let a = 0; a < 5; a++)
      for (let b = 0; b < 5; b++) {
        const tol = 1e-4 * Math.sqrt(py.cov[a][a] * py.cov[b][b]);
        expect(Math.abs(r.covariance![a][b] - py.cov[a][b])).toBeLessThan(tol);
      }
  });
});
