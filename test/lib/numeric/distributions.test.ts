// erfc, the standard normal quantile and Student's t quantile against mpmath at 40 digits (Debian's
// python3-mpmath as the outside oracle). The bounds below are the measured worst errors rounded up
// (the true accuracy, as stated in lib/src/numeric/distributions.ts), not loose tolerances.
import { describe, expect, it } from "vitest";
import { erfc, normalQuantile, studentTQuantile } from "../../../lib/src/numeric/distributions.js";
import { runPython } from "../../helpers/python.js";

const MP = `
import json, sys, mpmath as mp
mp.mp.dps = 40
d = json.load(sys.stdin)
erfc = [float(mp.erfc(mp.mpf(x))) for x in d["erfc"]]
# quantiles: roots of the mpmath CDF minus p (started from the value under test; findroot converges
# to the true root at 40 digits wherever it starts nearby)
def nq(p, z0):
    return float(mp.findroot(lambda z: mp.erfc(-z / mp.sqrt(2)) / 2 - mp.mpf(p), mp.mpf(z0)))
def tcdf(t, v):
    tail = mp.betainc(v / 2, mp.mpf(1) / 2, 0, v / (v + t * t), regularized=True) / 2
    return 1 - tail if t > 0 else tail
def tq(p, v, t0):
    v = mp.mpf(v)
    return float(mp.findroot(lambda t: tcdf(t, v) - mp.mpf(p), mp.mpf(t0)))
norm = [nq(p, z0) for p, z0 in d["norm"]]
t = [tq(p, v, t0) for p, v, t0 in d["t"]]
print(json.dumps({"erfc": erfc, "norm": norm, "t": t}))
`;

describe("erfc, normal and Student t quantiles against mpmath", () => {
  const ex: number[] = [];
  for (let i = 0; i <= 1600; i++) ex.push(-6 + (33 * i) / 1600);
  // both sides of each Taylor centre k / 8 and the switch to the continued fraction at 6
  for (let k = 0; k <= 48; k++) ex.push(k / 8 + 1e-9, k / 8 - 1e-9 + (k === 0 ? 2e-9 : 0), k / 8 + 0.0624);
  ex.push(5.999999, 6, 6.000001, 26.5);
  const ps: number[] = [];
  for (const e of [1e-300, 1e-100, 1e-20, 1e-8, 1e-4, 0.001, 0.01, 0.02425, 0.1, 0.3]) ps.push(e, 1 - e);
  ps.push(0.5, 0.6, 0.84, 0.975);
  const nus = [1, 2, 2.5, 5, 30, 117, 1000, 1e6];
  const tps = [1e-10, 1e-6, 0.001, 0.025, 0.1, 0.3, 0.5, 0.7, 0.9, 0.975, 0.999, 1 - 1e-6];
  const tcases: [number, number, number][] = [];
  for (const nu of nus) for (const p of tps) tcases.push([p, nu, studentTQuantile(p, nu)]);
  const ref = runPython<{ erfc: number[]; norm: number[]; t: number[] }>(MP, {
    erfc: ex,
    norm: ps.filter((p) => p < 1).map((p) => [p, normalQuantile(p)]),
    t: tcases,
  });

  it("erfc: relative error below 3e-16 for x < 6 and 1.5e-15 up to 26.5", () => {
    // Source: mpmath.erfc (arbitrary precision), Debian's python3-mpmath.
    let worstLow = 0,
      worstHigh = 0;
    ex.forEach((x, i) => {
      const e = Math.abs(erfc(x) - ref.erfc[i]!) / ref.erfc[i]!;
      if (x < 6) worstLow = Math.max(worstLow, e);
      else if (x < 26.55) worstHigh = Math.max(worstHigh, e); // beyond: ours is 0, the true value below 1e-306
    });
    expect(worstLow).toBeLessThan(3e-16);
    expect(worstHigh).toBeLessThan(1.5e-15);
    expect(erfc(27)).toBe(0);
    expect(erfc(-30)).toBe(2);
  });

  it("normal quantile: error below 2e-15 relative to max(|z|, 1) from p = 1e-300 to 1 - 1e-20", () => {
    // Source: root of mpmath's normal CDF, 0.5 erfc(-z / sqrt 2) = p.
    const pp = ps.filter((p) => p < 1);
    let worst = 0;
    pp.forEach((p, i) => {
      worst = Math.max(worst, Math.abs(normalQuantile(p) - ref.norm[i]!) / Math.max(1, Math.abs(ref.norm[i]!)));
    });
    expect(worst).toBeLessThan(2e-15);
  });

  it("Student t quantile: error relative to max(|t|, 1) below 1e-12 (nu <= 1000), 1e-9 (nu = 1e6)", () => {
    // Source: root of mpmath's t CDF through the regularized incomplete beta function (A&S 26.7.1).
    const worst = new Map<number, number>();
    tcases.forEach(([p, nu], i) => {
      const e = Math.abs(studentTQuantile(p, nu) - ref.t[i]!) / Math.max(1, Math.abs(ref.t[i]!));
      worst.set(nu, Math.max(worst.get(nu) ?? 0, e));
    });
    for (const [nu, e] of worst) expect(e, `nu = ${nu}`).toBeLessThan(nu <= 1000 ? 1e-12 : 1e-9);
  });
});
