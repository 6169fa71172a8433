/**
 * R(B) and w(B) of the 1D 360-degree wall pair (walls/wall360.ts) and their derivatives with
 * respect to A and Ku, for field-series fits of 360-degree-wall line profiles.
 *
 * In the local 1D model the 2-pi-wall ansatz tan(theta/2) = sinh(R/w)/sinh(|x - x0|/w) contains the
 * exact pair (derived and verified in walls/wall360.ts, after H.-B. Braun, PRB 50, 16501 (1994)):
 *   w = Delta / sqrt(1 + h),  sinh(R / w) = sqrt((1 + h) / h),  Delta = sqrt(A / K_eff),
 *   h = Ms B / (2 K_eff),  K_eff = Ku - mu0 Ms^2 / 2,
 * so the derivatives follow in closed form (chain rule below). The DMI energy of the pair is
 * topological in 1D (independent of R and w): **D does not enter R(B), w(B)** and cannot be fitted
 * from 360-degree-wall profiles in this model; dR/dD = dw/dD = 0 exactly.
 * Checked against the numerical minimization of walls/wall360.ts and central differences in
 * test/lib/fit/wall360Sensitivity.test.ts.
 */
import { InputError } from "../errors.js";
import { effectiveAnisotropy, type Film } from "../material/film.js";
import type { SeriesParameter, SkyrmionSensitivity } from "./skyrmionSensitivity.js";

/** R, w of the bound pair at B > 0 and their derivatives (same shape as skyrmionSensitivity). */
export function wall360Sensitivity(film: Film, B: number, parameters: SeriesParameter[] = ["A", "Ku"]): SkyrmionSensitivity {
  for (const p of parameters) if (p !== "A" && p !== "D" && p !== "Ku") throw new InputError("parameters", p, `"A", "D" or "Ku"`);
  if (!Number.isFinite(B)) throw new InputError("B", B, "a finite field in T");
  const K = effectiveAnisotropy(film);
  if (!(K > 0)) throw new InputError("Ku", film.Ku, "Ku above the shape anisotropy mu0 Ms^2 / 2 (a perpendicular film)");
  if (!(B > 0)) {
    return {
      status: "expanded",
      B,
      R: NaN,
      w: NaN,
      dR: parameters.map(() => NaN),
      dw: parameters.map(() => NaN),
      parameters,
      notes: ["B <= 0: the two walls of the pair repel and separate (no bound 360-degree wall)"],
    };
  }
  const Delta = Math.sqrt(film.A / K);
  const h = (film.Ms * B) / (2 * K);
  const w = Delta / Math.sqrt(1 + h);
  const s = Math.sqrt(1 + 1 / h); // sinh(R / w)
  const g = Math.asinh(s);
  const R = w * g;
  // derivatives: dh/dK = -h / K; dw/dA = w / (2A); dw/dK = -w / (2K) + (w / 2) (h / K) / (1 + h)
  // g'(h) = (ds/dh) / sqrt(1 + s^2), ds/dh = -1 / (2 s h^2)
  const dgdh = -1 / (2 * s * h * h) / Math.sqrt(1 + s * s);
  const dwdA = w / (2 * film.A);
  const dwdK = -w / (2 * K) + ((w / 2) * (h / K)) / (1 + h);
  const dhdK = -h / K;
  const dR: number[] = [];
  const dw: number[] = [];
  for (const p of parameters) {
    if (p === "A") {
      dw.push(dwdA);
      dR.push(g * dwdA);
    } else if (p === "Ku") {
      dw.push(dwdK);
      dR.push(g * dwdK + w * dgdh * dhdK);
    } else {
      dw.push(0);
      dR.push(0);
    }
  }
  return { status: "ok", B, R, w, dR, dw, parameters, notes: [] };
}
