import { afterAll, describe, expect, it } from "vitest";
import { closeChargeWorkers, parallelSkyrmionNumber, toSharedField } from "../../../kernel-ext/src/parallel/parallelSkyrmionNumber.js";
import { skyrmionNumber } from "../../../lib/src/topology/skyrmionNumber.js";
import { vectorFieldFromInterleaved } from "../../../lib/src/topology/field.js";
import { skyrmionLatticeTexture } from "../../../lib/src/topology/textures.js";
import { randomSmoothComponents } from "../../lib/topology/randomFields.js";

afterAll(() => closeChargeWorkers());

describe("parallel lattice skyrmion number (worker threads)", () => {
  it("equals the single-thread result for periodic/open, masked and triangular fields", async () => {
    // Common practice, no source: the same kernels on a split of the rows (oracle: lib's skyrmionNumber,
    // itself checked against numpy in test/lib/topology/skyrmionNumber.test.ts).
    const lattice = skyrmionLatticeTexture({ nx: 128, ny: 96, dx: 1e-9 }, { a: 32e-9, R: 6e-9, w: 2e-9 });
    const raw = randomSmoothComponents(70, 61, 5, 5, 2);
    for (let c = 0; c < 70 * 61; c += 17) raw.fill(0, 3 * c, 3 * c + 3);
    const masked = vectorFieldFromInterleaved(raw, { nx: 70, ny: 61 });
    const tri = vectorFieldFromInterleaved(randomSmoothComponents(50, 40, 9), { nx: 50, ny: 40, lattice: "triangular" });
    for (const f of [lattice, masked, tri]) {
      for (const boundary of ["periodic", "open"] as const) {
        for (const threads of [1, 2, 3]) {
          const p = await parallelSkyrmionNumber(f, { boundary, threads });
          expect(Math.abs(p.Q - skyrmionNumber(f, { boundary }).Q)).toBeLessThan(1e-11);
        }
      }
    }
    expect(Math.abs((await parallelSkyrmionNumber(lattice, { threads: 2 })).Q + lattice.centres.length)).toBeLessThan(1e-9);
    const shared = toSharedField(lattice);
    const r = await parallelSkyrmionNumber(shared, { threads: 2 });
    expect(r.copied).toBe(false);
    expect(r.threads).toBe(2);
  });
  it("rejects bad thread counts", async () => {
    const f = skyrmionLatticeTexture({ nx: 16, ny: 16 }, { a: 8e-9, R: 2e-9, w: 1e-9 });
    await expect(parallelSkyrmionNumber(f, { threads: 0 })).rejects.toThrow(/threads = 0/);
  });
});
