/**
 * The Gram matrix A^T A of selected columns of a tall column-major matrix, in row blocks so each
 * block of the columns is read from cache once for all column pairs (for m = 1e5 rows and 5
 * columns this reads the matrix once instead of 15 times). Common practice, no source.
 */

const BLOCK = 512;

/**
 * G = A_S^T A_S for the columns S = `cols` (default 0..n-1) of A (m rows, column-major), as a
 * full symmetric n x n column-major matrix.
 */
export function gramMatrix(a: Float64Array, m: number, n: number, cols?: ArrayLike<number>): Float64Array {
  const off = new Int32Array(n);
  for (let c = 0; c < n; c++) off[c] = (cols ? cols[c] : c) * m;
  const G = new Float64Array(n * n);
  for (let i0 = 0; i0 < m; i0 += BLOCK) {
    const i1 = Math.min(m, i0 + BLOCK);
    for (let p = 0; p < n; p++) {
      const op = off[p];
      for (let q = 0; q <= p; q++) {
        const oq = off[q];
        let s = 0;
        for (let i = i0; i < i1; i++) s += a[op + i] * a[oq + i];
        G[p + q * n] += s;
      }
    }
  }
  for (let p = 0; p < n; p++) for (let q = 0; q < p; q++) G[q + p * n] = G[p + q * n];
  return G;
}
