/**
 * Profile-likelihood intervals of the field-series fit (fitFieldSeries, option `profile`).
 * Checks: in a nearly linear problem the profile interval contains the estimate and matches the
 * Wald interval; it matches an independent profile computed by scipy from the energy model's
 * R(B), w(B) on a grid (interpolation, conditional minimization and root finding all scipy's, the
 * chi-square from the stage-1 covariances built in numpy); the global method agrees with the
 * two-stage one; an interval cut by the energy model's domain is reported open with a note;
 * bad requests give InputError naming the parameter and the allowed names.
 * The synthetic series are invented (film QF-like, seeded noise).
 */
import { describe, it, expect } from "vitest";
import { makeFilm } from "../../../lib/src/material/film.js";
import { fitFieldSeries, type FieldSeriesProfile } from "../../../lib/src/fit/fieldSeries.js";
import { syntheticFieldSeries } from "../../../lib/src/fit/syntheticProfiles.js";
import { filmWith, skyrmionSensitivity } from "../../../lib/src/fit/skyrmionSensitivity.js";
import { InputError } from "../../../lib/src/errors.js";
import { runPython } from "../../helpers/python.js";

const truth = { A: 15e-12, D: 1.55e-3, Ku: 0.35e6 };
const film = makeFilm({ Ms: 0.6e6, ...truth, dmi: "interfacial", t: 1.5e-9 });
const start = filmWith(film, { A: 12e-12, D: 1.45e-3 });

function series(fields: number[], seed: number, noise: number, withSigma: boolean): FieldSeriesProfile[] {
  return syntheticFieldSeries(film, fields, { noise, seed, points: 161, span: 260e-9, local: { x0: 3e-9, offset: 0.05, contrast: 0.9 } }).map((p) => ({
    B: p.B,
    data: { x: p.x, y: p.y, sigma: withSigma ? p.sigma : null },
  }));
}

const PROFILE_PY = String.raw`
import sys, json
import numpy as np
from scipy.interpolate import RectBivariateSpline
from scipy.optimize import minimize_scalar, brentq
from scipy.stats import chi2
d = json.load(sys.stdin)
A = np.array(d["A"]); D = np.array(d["D"])
prof = d["profiles"]
# chi-square of the stage-1 (R, w) estimates against the model, full 2 x 2 covariance per field
splR = [RectBivariateSpline(A, D, np.array(p["Rgrid"]), kx=3, ky=3) for p in prof]
splW = [RectBivariateSpline(A, D, np.array(p["wgrid"]), kx=3, ky=3) for p in prof]
Cinv = []
for p in prof:
    c = p["corr"] * p["sR"] * p["sW"]
    Cinv.append(np.linalg.inv(np.array([[p["sR"]**2, c], [c, p["sW"]**2]])))
def chi(a, b):
    s = 0.0
    for i, p in enumerate(prof):
        r = np.array([p["R"] - splR[i](a, b)[0, 0], p["w"] - splW[i](a, b)[0, 0]])
        s += r @ Cinv[i] @ r
    return s
def profA(a):
    return minimize_scalar(lambda b: chi(a, b), bounds=(D[0], D[-1]), method="bounded", options={"xatol": 1e-10 * abs(d["D0"])}).fun
def profD(b):
    return minimize_scalar(lambda a: chi(a, b), bounds=(A[0], A[-1]), method="bounded", options={"xatol": 1e-10 * abs(d["A0"])}).fun
a0, b0 = d["A0"], d["D0"]
chimin = chi(a0, b0)
thr = chimin + chi2.ppf(d["confidence"], 1)
out = {"chimin": chimin, "threshold": thr}
# brentq's default xtol (2e-12) is absolute: scale it to the parameter
ta, tb = 1e-10 * abs(a0), 1e-10 * abs(b0)
out["A"] = [brentq(lambda a: profA(a) - thr, A[0], a0, xtol=ta), brentq(lambda a: profA(a) - thr, a0, A[-1], xtol=ta)]
out["D"] = [brentq(lambda b: profD(b) - thr, D[0], b0, xtol=tb), brentq(lambda b: profD(b) - thr, b0, D[-1], xtol=tb)]
print(json.dumps(out))
`;

describe("fitFieldSeries profile intervals", () => {
  const data = series([0.005, 0.01, 0.02, 0.04, 0.06], 11, 0.04, false);
  const r = fitFieldSeries(data, { film: start, fitKu: false, profile: true, curvePoints: 0 });

  it("nearly linear problem: the profile interval contains the estimate and matches the Wald interval", () => {
    expect(r.status).toBe("converged");
    expect(r.method).toMatch(/profile-likelihood intervals of A, D/);
    for (const k of ["A", "D"] as const) {
      const p = r.parameters[k];
      const [lo, hi] = p.profileInterval!;
      const [wlo, whi] = p.interval!;
      // Common practice, no source: the profile interval brackets the estimate (the Wald centre)
      expect(lo).toBeLessThan(p.value);
      expect(hi).toBeGreaterThan(p.value);
      // Source: D. Bates, D. Watts, Nonlinear Regression Analysis and Its Applications (Wiley 1988),
      // ch. 6: for a model linear near the optimum the profile interval equals the Wald interval
      // (here a few percent of relative error, so within 20 % in each half-width)
      const half = (whi - wlo) / 2;
      expect(Math.abs((p.value - lo) / half - 1)).toBeLessThan(0.2);
      expect(Math.abs((hi - p.value) / half - 1)).toBeLessThan(0.2);
    }
    expect(r.parameters.Ku.profileInterval).toBeUndefined(); // held: not profiled
  });

  it("matches a profile computed by scipy from the energy model's R(B), w(B) on a grid", () => {
    // the energy model's R, w on an (A, D) grid around the estimate; the rest is done in Python
    const A0 = r.parameters.A.value;
    const D0 = r.parameters.D.value;
    const sA = r.parameters.A.stderr!;
    const sD = r.parameters.D.stderr!;
    const nA = 15;
    const nD = 21;
    const Ag = Array.from({ length: nA }, (_, i) => A0 + sA * (-3.5 + (7 * i) / (nA - 1)));
    const Dg = Array.from({ length: nD }, (_, j) => D0 + sD * (-4.5 + (9 * j) / (nD - 1)));
    const profiles = r.profiles.map((p) => {
      const Rgrid: number[][] = [];
      const wgrid: number[][] = [];
      for (const A of Ag) {
        const rowR: number[] = [];
        const rowW: number[] = [];
        let warm: number | undefined;
        for (const D of Dg) {
          const s = skyrmionSensitivity(filmWith(start, { A, D }), p.B, [], { nonlocal: true, startRadius: warm });
          expect(s.status).toBe("ok");
          warm = s.R;
          rowR.push(s.R);
          rowW.push(s.w);
        }
        Rgrid.push(rowR);
        wgrid.push(rowW);
      }
      return { R: p.R, w: p.w, sR: p.stderrR, sW: p.stderrW, corr: p.correlationRw, Rgrid, wgrid };
    });
    // Source: scipy 1.10 (Debian python3-scipy) RectBivariateSpline, minimize_scalar, brentq and
    // chi2.ppf as the independent profile-likelihood computation
    const py = runPython<{ chimin: number; threshold: number; A: [number, number]; D: [number, number] }>(PROFILE_PY, { A: Ag, D: Dg, profiles, A0, D0, confidence: 0.95 });
    expect(Math.abs(py.chimin - r.chiSquare)).toBeLessThan(1e-4 * Math.max(1, r.chiSquare));
    for (const k of ["A", "D"] as const) {
      const ours = r.parameters[k].profileInterval!;
      const half = (r.parameters[k].interval![1] - r.parameters[k].interval![0]) / 2;
      // bisection tolerance and spline interpolation: a few 1e-4 of the half-width
      expect(Math.abs(ours[0] - py[k][0]) / half).toBeLessThan(3e-3);
      expect(Math.abs(ours[1] - py[k][1]) / half).toBeLessThan(3e-3);
    }
  }, 60_000);

  it("the global method gives the same profile intervals as the two-stage method", () => {
    const d2 = series([0.005, 0.02, 0.06], 14, 0.04, true);
    const two = fitFieldSeries(d2, { film: start, fitKu: false, profile: ["A"], curvePoints: 0 });
    const glob = fitFieldSeries(d2, { film: start, fitKu: false, method: "global", profile: ["A"], curvePoints: 0 });
    expect(glob.approach).toBe("global");
    expect(glob.method).toMatch(/global chi-square/);
    const t = two.parameters.A.profileInterval!;
    const g = glob.parameters.A.profileInterval!;
    const half = (two.parameters.A.interval![1] - two.parameters.A.interval![0]) / 2;
    // Common practice, no source: the profiled global chi-square equals the stage-2 one to second
    // order in the noise (see the header of fieldSeries.ts), so the intervals agree closely
    expect(Math.abs(g[0] - t[0]) / half).toBeLessThan(0.1);
    expect(Math.abs(g[1] - t[1]) / half).toBeLessThan(0.1);
    expect(glob.parameters.D.profileInterval).toBeUndefined();
  }, 60_000);

  it("reports a side cut by the energy model's domain as open, with a note", () => {
    // two fields and very large noise (invented): the D profile runs into D values with no skyrmion
    // minimum inside the ansatz window (since the skyrmion model also holds above D_c, above B_sat, the
    // domain is no longer cut at D_c; here both sides end at the window of the energy model)
    const d3 = series([0.04, 0.06], 3, 0.45, true);
    const res = fitFieldSeries(d3, { film, fitKu: true, profile: ["D"], curvePoints: 0 });
    expect(res.status).toBe("converged");
    const [lo, hi] = res.parameters.D.profileInterval!;
    expect(lo === -Infinity || hi === Infinity).toBe(true);
    const notes = res.notes.join(" ");
    if (hi === Infinity) expect(notes).toMatch(/profile of D: the model is not finite just above D = .* interval open on that side/);
    else expect(hi).toBeGreaterThan(res.parameters.D.value);
    if (lo === -Infinity) expect(notes).toMatch(/profile of D: the model is not finite just below D = .* interval open on that side/);
    else expect(lo).toBeLessThan(res.parameters.D.value);
  }, 60_000);

  it("a requested Ku that the 'auto' rule holds gets no interval and a note saying why", () => {
    const res = fitFieldSeries(series([0.005, 0.02, 0.06], 15, 0.04, true), { film: start, maxKuRelativeError: 1e-6, profile: ["A", "Ku"], curvePoints: 0 });
    expect(res.kuDecision.fitted).toBe(false);
    expect(res.parameters.Ku.profileInterval).toBeUndefined();
    expect(res.notes.join(" ")).toMatch(/no profile interval of Ku: Ku held/);
    expect(res.parameters.A.profileInterval![0]).toBeLessThan(res.parameters.A.value);
  }, 60_000);

  describe("bad input", () => {
    const d = series([0.005, 0.06], 16, 0.04, true);
    it("a parameter that is not a series parameter", () => {
      const call = () => fitFieldSeries(d, { film: start, profile: ["Ms"] });
      expect(call).toThrow(InputError);
      expect(call).toThrow(/profile = "Ms" is not valid: expected names of free series parameters: A, D, Ku/);
    });
    it("a held parameter", () => {
      expect(() => fitFieldSeries(d, { film: start, fitKu: false, profile: ["Ku"] })).toThrow(/profile = "Ku" .* A, D\. Ku is held/);
      expect(() => fitFieldSeries(d, { film: start, texture: "wall360", profile: ["D"] })).toThrow(/profile = "D" .* A, Ku\. D is held/);
    });
    it("not a boolean or a list", () => {
      expect(() => fitFieldSeries(d, { film: start, profile: "A" as never })).toThrow(/profile = "A" is not valid: expected true, false or a list/);
    });
  });
});
