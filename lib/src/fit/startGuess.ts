/**
 * Start values for the catalogue models guessed from the data (center, width, offset, contrast),
 * so a fit from the command line converges without hand-set starts. Common practice, no source.
 */
import type { ProfileModel } from "./profileModels.js";

export function guessStart(model: ProfileModel, x: ArrayLike<number>, y: ArrayLike<number>): Record<string, number> {
  const n = x.length;
  let ymin = Infinity;
  let ymax = -Infinity;
  let imin = 0;
  let imax = 0;
  for (let i = 0; i < n; i++) {
    if (y[i]! < ymin) {
      ymin = y[i]!;
      imin = i;
    }
    if (y[i]! > ymax) {
      ymax = y[i]!;
      imax = i;
    }
  }
  const span = x[n - 1]! - x[0]!;
  const mid = 0.5 * (ymin + ymax);
  const half = 0.5 * (ymax - ymin) || 1;
  const names = new Set(model.parameters.map((p) => p.name));
  const out: Record<string, number> = {};
  const k = Math.max(1, Math.floor(n / 10));
  const mean = (a: number, b: number) => {
    let s = 0;
    for (let i = a; i < b; i++) s += y[i]!;
    return s / (b - a);
  };
  const left = mean(0, k);
  const right = mean(n - k, n);
  if (model.signalUnit === "") {
    if (model.id.startsWith("wall180")) {
      // crossing of the midpoint
      let ic = Math.floor(n / 2);
      for (let i = 1; i < n; i++)
        if ((y[i - 1]! - mid) * (y[i]! - mid) <= 0) {
          ic = i;
          break;
        }
      out.x0 = x[ic]!;
      out.offset = mid;
      out.contrast = left >= right ? half : -half;
      // 10-90 % distance ~ 2.2 Delta
      const lo = mid - 0.8 * half * Math.sign(left - right || 1);
      const hi = mid + 0.8 * half * Math.sign(left - right || 1);
      let a = x[0]!;
      let b = x[n - 1]!;
      for (let i = 0; i < n; i++) {
        if ((y[i]! - hi) * Math.sign(left - right || 1) >= 0) a = x[i]!;
      }
      for (let i = n - 1; i >= 0; i--) {
        if ((y[i]! - lo) * Math.sign(left - right || 1) <= 0) b = x[i]!;
      }
      out.Delta = Math.max(Math.abs(b - a) / 2.2, span / (5 * n), span / 1000);
    } else {
      const edge = 0.5 * (left + right);
      const dip = Math.abs(ymin - edge) > Math.abs(ymax - edge);
      const ic = dip ? imin : imax;
      out.x0 = x[ic]!;
      const depth = (dip ? ymin : ymax) - edge;
      out.offset = edge - (Math.abs(depth) / 2) * (dip ? 1 : -1) * 0 + 0;
      out.contrast = dip ? Math.abs(depth) / 2 : -Math.abs(depth) / 2;
      out.offset = edge - out.contrast;
      // half width at the half depth
      const level = edge + depth / 2;
      let a = ic;
      let b = ic;
      while (a > 0 && (y[a]! - level) * Math.sign(depth) > 0) a--;
      while (b < n - 1 && (y[b]! - level) * Math.sign(depth) > 0) b++;
      const R = Math.max(0.5 * (x[b]! - x[a]!), span / n);
      out.R = R;
      out.w = R / 3;
    }
  } else {
    // fields: center at the largest deviation from the median
    const sorted = Array.from(y).sort((p, q) => p - q);
    const med = sorted[Math.floor(n / 2)]!;
    let ic = 0;
    for (let i = 0; i < n; i++) if (Math.abs(y[i]! - med) > Math.abs(y[ic]! - med)) ic = i;
    out.x0 = x[ic]!;
  }
  if (names.has("blur") && model.signalUnit === "") {
    // Blurred contrast: the observed width is the wall's and the blur's together (Gaussian-equivalent
    // widths add in quadrature). Start inside that valley, blur = 0.4 of the observed width and the
    // wall narrowed to match, not at the default blur (a start wider than the data sends a free step
    // of both widths onto their lower bounds, where the Jacobian vanishes). Common practice, no source.
    const key = out.Delta !== undefined ? "Delta" : "w";
    const wObs = out[key];
    if (wObs !== undefined && wObs > 0) {
      const gaussEquivalent = Math.sqrt(2 / Math.PI); // tanh(u / W) has the slope of a Gaussian step of width W sqrt(2 / pi)
      out.blur = 0.4 * wObs * gaussEquivalent;
      out[key] = wObs * Math.sqrt(1 - 0.16);
    }
  }
  for (const key of Object.keys(out)) if (!names.has(key) || !Number.isFinite(out[key])) delete out[key];
  return out;
}
