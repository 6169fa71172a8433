/**
 * Axis ranges chosen by the explorer instead of plotly's autorange, so that a moving slider keeps
 * the axes still: the range is kept while the new data fit inside it and fill at least a quarter of it;
 * otherwise it is refitted to the data with 5 % padding on each side (about what plotly's own
 * autorange adds), plus half the span of headroom on a side the data outgrew (a slider that
 * keeps moving the same way then refits every few steps instead of every step). Log axes work in log10 units, as plotly's `range` does.
 * Common practice, no source.
 */

/** Finite extent of the values (positive values only on a log axis), in axis units; null if none. */
export function dataExtent(values: ArrayLike<number | null>, log: boolean): [number, number] | null {
  let lo = Infinity,
    hi = -Infinity;
  for (let i = 0; i < values.length; i++) {
    const raw = values[i];
    if (raw === null || raw === undefined || !Number.isFinite(raw)) continue;
    if (log && raw <= 0) continue;
    const v = log ? Math.log10(raw) : raw;
    if (v < lo) lo = v;
    if (v > hi) hi = v;
  }
  return lo <= hi ? [lo, hi] : null;
}

/** Fitted range around an extent: 5 % padding, and a unit-free width for a single value. */
export function paddedRange([lo, hi]: [number, number]): [number, number] {
  const span = hi - lo;
  if (span > 0) return [lo - 0.05 * span, hi + 0.05 * span];
  const half = lo === 0 ? 1 : Math.abs(lo) * 0.05;
  return [lo - half, hi + half];
}

/**
 * The range to show for data of `extent`, given the range shown now (`previous`, null at first):
 * the previous one while the data fit inside and span at least a quarter of it (the range moves
 * when the data leave it, or shrink so far that the curve would look flat), else a refit.
 */
export function stableRange(previous: [number, number] | null, extent: [number, number] | null): [number, number] | null {
  if (!extent) return null;
  if (previous) {
    const [a, b] = previous;
    const fits = extent[0] >= a && extent[1] <= b;
    const fills = extent[1] - extent[0] >= 0.25 * (b - a);
    if (fits && fills) return previous;
    if (fills || extent[1] - extent[0] >= 0.25 * (b - a)) {
      const [lo, hi] = paddedRange(extent);
      const head = 0.5 * (hi - lo);
      return [extent[0] < a ? lo - head : lo, extent[1] > b ? hi + head : hi];
    }
  }
  return paddedRange(extent);
}
