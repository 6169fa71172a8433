// gramMatrix (lib/src/numeric/gramMatrix.ts) against numpy's A_S^T A_S.
import { describe, expect, it } from "vitest";
import { gramMatrix } from "../../../lib/src/numeric/gramMatrix.js";
import { seededRandom } from "../../../lib/src/numeric/prng.js";
import { runPython } from "../../helpers/python.js";

describe("gramMatrix", () => {
  it("equals numpy's A[:, S].T @ A[:, S] for all columns, a permuted subset and odd and even sizes", () => {
    // Source: numpy.matmul (Debian numpy) as the outside oracle.
    const rng = seededRandom(5);
    const m = 301;
    const nAll = 6;
    const a = Float64Array.from({ length: m * nAll }, () => rng.normal() * 10 ** rng.integer(4));
    const subsets = [[0, 1, 2, 3, 4, 5], [4, 1, 3], [2], [5, 0, 3, 1]];
    const ref = runPython<number[][]>(
      `
import json, sys, numpy as np
d = json.load(sys.stdin)
A = np.array(d["a"]).reshape(d["n"], d["m"]).T  # column-major input
out = []
for S in d["subsets"]:
    B = A[:, S]
    out.append((B.T @ B).flatten(order="F").tolist())
print(json.dumps(out))`,
      { a: Array.from(a), m, n: nAll, subsets },
    );
    subsets.forEach((S, k) => {
      const G = S.length === nAll ? gramMatrix(a, m, nAll) : gramMatrix(a, m, S.length, S);
      const R = ref[k]!;
      expect(G.length).toBe(R.length);
      const scale = Math.max(...R.map(Math.abs));
      G.forEach((g, i) => expect(Math.abs(g - R[i]!)).toBeLessThan(1e-13 * scale));
      // symmetric to the bit (the upper triangle is copied from the lower)
      const n = S.length;
      for (let p = 0; p < n; p++) for (let q = 0; q < n; q++) expect(G[p + q * n]).toBe(G[q + p * n]);
    });
  });
});
