/**
 * Calculators of the fitting domain: `wall-fit`, a built-in synthetic skyrmion / 360-degree-wall
 * line cut (the ansatz at chosen R and w plus seeded Gaussian noise) fitted back with
 * offset + contrast * m_z, so the precision of R and w and their correlation can be explored against
 * noise, sampling and size. The data are invented (synthetic) by construction.
 */
import type { ComputeOutput, InputValues } from "./spec.js";
import { defineCalculator } from "./spec.js";
import { fitProfile } from "../fit/fitProfile.js";
import { parameterOf } from "../fit/leastSquares.js";
import { at } from "../numeric/indexing.js";
import { guessStart } from "../fit/startGuess.js";
import { getProfileModel } from "../fit/profileModels.js";
import { syntheticProfile } from "../fit/syntheticProfiles.js";

const nm = 1e-9;

function computeWallFit(v: InputValues): ComputeOutput {
  const R = v.R!;
  const w = v.w!;
  const points = Math.round(v.points!);
  const span = 2 * (R + 8 * w);
  const truth = { x0: 0.1 * w, R, w, offset: 0.05, contrast: 0.9 };
  const data = syntheticProfile("wall360-mz", truth, { points, span, noise: v.noise!, seed: Math.round(v.seed!) });
  const model = getProfileModel("wall360-mz");
  const start = { ...guessStart(model, data.x, data.y) };
  const r = fitProfile({ x: data.x, y: data.y, sigma: data.sigma }, model, { start });
  const notes = [...r.notes];
  const pR = parameterOf(r, "R");
  const pw = parameterOf(r, "w");
  const ok = r.status === "converged" && pR.stderr !== null && pw.stderr !== null && r.correlation !== null;
  const values: ComputeOutput["values"] = {
    status: r.status === "converged" ? "converged" : `${r.status}: ${r.message}`,
    x: data.x,
    data: data.y,
    model: r.fitted,
    residual: r.residuals,
    chiSquareReduced: r.chiSquareReduced,
  };
  if (ok) {
    const iR = r.freeNames.indexOf("R");
    const iw = r.freeNames.indexOf("w");
    values.Rfit = pR.value;
    values.RStderr = pR.stderr!;
    values.wfit = pw.value;
    values.wStderr = pw.stderr!;
    values.correlationRw = at(at(r.correlation!, iR, "correlation"), iw, "correlation row");
    values.Rpull = (pR.value - R) / pR.stderr!;
    values.wpull = (pw.value - w) / pw.stderr!;
  } else {
    notes.push(`the fit gave no standard errors (${r.status}: ${r.message}); R and w are not reported`);
  }
  return { values, status: ok ? "ok" : "warning", notes };
}

export const wallFitCalculator = defineCalculator({
  id: "wall-fit",
  title: "Fit a synthetic skyrmion line cut",
  summary:
    "A synthetic (invented) m_z line cut through a skyrmion or 360-degree wall, the ansatz tan(theta/2) = sinh(R/w)/sinh(|x - x0|/w) plus seeded Gaussian noise of known sigma, fitted back by Levenberg-Marquardt: how precisely do R and w come out, and how strongly are they correlated, for a given noise and sampling?",
  inputs: [
    { name: "R", symbol: "R", unit: "m", default: 30 * nm, min: 10 * nm, max: 100 * nm, scale: "log", meaning: "true radius of the synthetic cut (m_z = 0)" },
    { name: "w", symbol: "w", unit: "m", default: 8 * nm, min: 2 * nm, max: 20 * nm, scale: "log", meaning: "true wall width of the ansatz" },
    { name: "noise", symbol: "\\sigma", unit: "", default: 0.03, min: 0.001, max: 0.1, scale: "log", meaning: "standard deviation of the Gaussian noise (signal contrast 0.9)" },
    {
      name: "points",
      symbol: "N",
      unit: "",
      default: 301,
      min: 200,
      max: 2000,
      scale: "log",
      kind: "integer",
      meaning: "number of points over 2 (R + 8 w) (at least 200, so the thinnest wall is sampled)",
    },
    { name: "seed", symbol: "s", unit: "", default: 1, min: 1, max: 1000, scale: "linear", kind: "integer", meaning: "seed of the noise" },
  ],
  outputs: [
    { name: "status", symbol: "", unit: "", kind: "text", meaning: "how the fit ended" },
    { name: "Rfit", symbol: "\\hat R", unit: "m", meaning: "fitted radius", uncertainty: "RStderr" },
    { name: "RStderr", symbol: "\\sigma_R", unit: "m", meaning: "standard error of the radius (sigma known)" },
    { name: "wfit", symbol: "\\hat w", unit: "m", meaning: "fitted wall width", uncertainty: "wStderr" },
    { name: "wStderr", symbol: "\\sigma_w", unit: "m", meaning: "standard error of the wall width" },
    { name: "correlationRw", symbol: "r_{Rw}", unit: "", meaning: "correlation of R and w" },
    { name: "Rpull", symbol: "(\\hat R - R)/\\sigma_R", unit: "", meaning: "error of R in units of its standard error" },
    { name: "wpull", symbol: "(\\hat w - w)/\\sigma_w", unit: "", meaning: "error of w in units of its standard error" },
    { name: "chiSquareReduced", symbol: "\\chi^2_\\nu", unit: "", meaning: "reduced chi-square (about 1 for a good fit)" },
    { name: "x", symbol: "x", unit: "m", kind: "array", meaning: "position along the cut" },
    { name: "data", symbol: "y", unit: "", kind: "array", meaning: "synthetic signal (invented data)" },
    { name: "model", symbol: "f", unit: "", kind: "array", meaning: "fitted model" },
    { name: "residual", symbol: "y - f", unit: "", kind: "array", meaning: "residual" },
  ],
  plots: [
    { id: "cut", title: "Synthetic cut and fit", x: "x", y: ["data", "model"] },
    { id: "residual", title: "Residual", x: "x", y: ["residual"], mode: "markers" },
  ],
  assumptions: [
    "Synthetic (invented) data: the 360-degree-wall ansatz with offset 0.05 and contrast 0.9 plus Gaussian noise of known sigma.",
    "The fitted model is the generating one (no model error): the spread of the pulls shows the statistics alone.",
    "Continuum profile, T = 0; the signal is linear in m_z.",
  ],
  sources: [
    "H.-B. Braun, PRB 50, 16501 (1994); F. Buettner, I. Lemesh, G. Beach, Sci. Rep. 8, 4464 (2018): the ansatz",
    "J. More, Lecture Notes in Mathematics 630, 105 (1978): Levenberg-Marquardt",
  ],
  method: "Seeded synthetic data, Levenberg-Marquardt with analytic Jacobian, covariance (J^T W J)^-1 with the known sigma.",
  limits: {
    R: { above: 0, why: "a skyrmion radius" },
    w: { above: 0, why: "a wall width" },
    noise: { above: 0, why: "a noise standard deviation (it weights the fit)" },
  },
  cost: (v) => {
    // Levenberg-Marquardt: a Jacobian of points x 5 and some tens of iterations over it
    const n = v.points!;
    return { bytes: 8 * n * 20, steps: 5 * 200 * 40 * n, parameter: "points", what: `${n} points, 5 parameters, up to ~200 iterations` };
  },
  compute: computeWallFit,
});

/** Calculator specs of the fitting domain. */
export const fitCalculators = [wallFitCalculator];
