// Lattice skyrmion number of a 2048 x 2048 field, one thread, against the best numpy code a competent
// user would write: row blocks (cache-sized), explicit component arithmetic on contiguous planes (no
// np.cross / einsum temporaries, no np.roll of the whole field), and one arctan2 per plaquette where
// both triangle denominators are positive (the same identity our kernel uses), two elsewhere.
// Interleaved A B A B in one period (pythonPeer.mjs), warm on both sides; CPU-time medians and
// [min-max] of 11 pairs (the wall-time ratio is printed in the row's name).
import lib from "../../lib/dist/internal.js";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { summary, verdict } from "./util.mjs";
import { pythonPeer, interleavedWithPython } from "./pythonPeer.mjs";

export const NUMPY_BEST_Q = `
import numpy as np
def load(path):
    global M
    M = np.load(path)
    return M.shape[0]

def q_best(block=8):
    m = M
    ny, nx, _ = m.shape
    total = 0.0
    for j0 in range(0, ny, block):
        j1 = min(j0 + block, ny)
        rows = np.arange(j0, j1 + 1) % ny           # one halo row, wrapping (periodic)
        c = np.ascontiguousarray(np.moveaxis(m[rows], -1, 0))  # (3, B + 1, nx) planes
        ax, ay, az = c[0, :-1], c[1, :-1], c[2, :-1]
        dx, dy, dz = c[0, 1:], c[1, 1:], c[2, 1:]
        bx, by, bz = (np.concatenate((p[:, 1:], p[:, :1]), axis=1) for p in (ax, ay, az))
        cx, cy, cz = (np.concatenate((p[:, 1:], p[:, :1]), axis=1) for p in (dx, dy, dz))
        ab = ax * bx + ay * by + az * bz
        bc = bx * cx + by * cy + bz * cz
        ca = cx * ax + cy * ay + cz * az
        cd = cx * dx + cy * dy + cz * dz
        da = dx * ax + dy * ay + dz * az
        t1 = ax * (by * cz - bz * cy) + ay * (bz * cx - bx * cz) + az * (bx * cy - by * cx)
        t2 = ax * (cy * dz - cz * dy) + ay * (cz * dx - cx * dz) + az * (cx * dy - cy * dx)
        d1 = 1 + ab + bc + ca
        d2 = 1 + ca + cd + da
        # one arctan2 per plaquette: arg((d1 + i t1)(d2 + i t2)), exact where d1, d2 > 0
        om = np.arctan2(t1 * d2 + t2 * d1, d1 * d2 - t1 * t2)
        bad = (d1 <= 0) | (d2 <= 0)
        if bad.any():
            om[bad] = np.arctan2(t1[bad], d1[bad]) + np.arctan2(t2[bad], d2[bad])
        total += om.sum()
    return float(2 * total / (4 * np.pi))
`;

export default async () => {
  const rows = [];
  const dir = mkdtempSync(join(tmpdir(), "helicoid-bench-latticeq-"));
  const peer = pythonPeer();
  try {
    const n = 2048;
    // invented demo texture: a periodic skyrmion lattice (as topology.bench.mjs)
    const field = lib.skyrmionLatticeTexture({ nx: n, ny: n, dx: 1e-9 }, { a: 128e-9, R: 30e-9, w: 8e-9, helicity: 0.3 });
    const path = join(dir, "field.npy");
    writeFileSync(path, lib.writeNpyVectorField(field));
    await peer.define(NUMPY_BEST_Q);
    await peer.call("load", path);
    rmSync(path);
    const r = await interleavedWithPython(peer, () => lib.skyrmionNumber(field, { boundary: "periodic" }).Q, "q_best", [], { runs: 11, warmup: 2 });
    const o = summary(r.ours),
      p = summary(r.ref);
    const ratio = o.median / p.median;
    const wallRatio = summary(r.oursWall).median / summary(r.refWall).median;
    const dq = Math.abs(r.oursValue - r.refValue);
    rows.push({
      group: "topology",
      name: `lattice Q ${n}x${n}, 1 thread, warm, interleaved (Q = ${r.oursValue.toFixed(9)}, numpy ${r.refValue.toFixed(9)}, |dQ| = ${dq.toExponential(1)}; ${((o.median * 1e6) / (n * n)).toFixed(1)} ns/cell CPU; wall-time ratio ${wallRatio.toFixed(3)})`,
      ours_ms: o.median,
      ours_spread: o.spread,
      reference: "numpy, row blocks of 8, explicit arithmetic, one arctan2 a plaquette",
      reference_ms: p.median,
      reference_spread: p.spread,
      ratio,
      goal: verdict(ratio <= 0.25 && dq < 1e-9, "ratio <= 0.25 at |dQ| < 1e-9"),
    });
  } finally {
    await peer.close();
    rmSync(dir, { recursive: true, force: true });
  }
  return rows;
};
