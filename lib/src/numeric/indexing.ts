/**
 * Checked element reads for code compiled with noUncheckedIndexedAccess: an index out of range is a
 * programming error, reported with the array's name, the index and the length instead of an
 * undefined that would turn into NaN further on. Common practice, no source.
 */

/** a[i], or a RangeError naming `what`, the index and the length. */
export function at<T>(a: ArrayLike<T>, i: number, what = "array"): T {
  const v = a[i];
  if (v === undefined) throw new RangeError(`${what}[${i}] is out of range (length ${a.length})`);
  return v;
}

/** [a[idx[0]], a[idx[1]], ...], each read checked as in `at`. */
export function gather<T>(a: ArrayLike<T>, idx: readonly number[], what = "array"): T[] {
  return idx.map((i) => at(a, i, what));
}

/** A tuple type of N elements of T (N a small literal). */
export type Tuple<T, N extends number, R extends T[] = []> = R["length"] extends N ? R : Tuple<T, N, [...R, T]>;

/** `count` zero-filled Float64Arrays of `length` each, typed as a tuple so constant indices need no check. */
export function float64Arrays<N extends number>(count: N, length: number): Tuple<Float64Array, N> {
  return Array.from({ length: count }, () => new Float64Array(length)) as Tuple<Float64Array, N>;
}

/** The first n values of a as a tuple (n a small literal), or a RangeError naming `what` if a is shorter. */
export function unpack<N extends number>(a: ArrayLike<number>, n: N, what = "array"): Tuple<number, N> {
  if (a.length < n) throw new RangeError(`${what}: ${n} values expected, got ${a.length}`);
  return Array.from({ length: n }, (_, i) => a[i]!) as Tuple<number, N>;
}
