import { afterAll, describe, expect, it } from "vitest";
import { closeChernWorkers, parallelChernNumbers } from "../../../kernel-ext/src/parallel/parallelChernNumbers.js";
import { chernNumbers } from "../../../lib/src/berry/chernNumbers.js";
import { blochModelFromFunction } from "../../../lib/src/berry/blochModelFromFunction.js";
import { haldaneModel, haldaneSpec, haldaneCriticalMass, supercellModel } from "../../../lib/src/berry/blochModel.js";
import { InputError } from "../../../lib/src/errors.js";

afterAll(() => closeChernWorkers());

describe("parallel Chern numbers (worker threads)", () => {
  it("equals the single-thread result: integers, flux maps, energies, checks", async () => {
    // Source: F. D. M. Haldane, PRL 61, 2015 (1988): C = -+1 for |M| < 3 sqrt(3) |t2 sin phi| (here
    // M = 0.1 < 0.52); the 3 x 1 supercell keeps the total Chern number of the filled bands.
    // The oracle for the split itself is lib's chernNumbers on the same model (same kernels).
    const t2 = 0.1,
      phi = Math.PI / 2;
    expect(0.1).toBeLessThan(haldaneCriticalMass(t2, phi));
    const sc = supercellModel(haldaneSpec({ t2, phi, M: 0.1 }), 3, 1);
    const opts = {
      n1: 40,
      n2: 33,
      groups: [
        [0, 1, 2],
        [3, 4, 5],
      ],
      map: true,
      energies: true,
    };
    const single = chernNumbers(sc, opts);
    for (const threads of [1, 2, 3, 5]) {
      const p = await parallelChernNumbers(sc, { ...opts, threads });
      expect(p.threads).toBe(threads);
      expect(p.chern).toEqual([-1, 1]);
      expect(p.resolved).toEqual(single.resolved);
      for (let g = 0; g < 2; g++) {
        expect(Math.abs(p.chernSum[g]! - single.chernSum[g]!)).toBeLessThan(1e-12);
        expect(p.maxFlux[g]).toBe(single.maxFlux[g]);
        expect(p.minGap[g]).toBe(single.minGap[g]);
        expect(Array.from(p.flux![g]!)).toEqual(Array.from(single.flux![g]!));
      }
      expect(Array.from(p.energies!)).toEqual(Array.from(single.energies!));
    }
    // a spec (plain data) works as well as the model built from it; per-band groups of the 2-band model
    const spec = haldaneSpec({ t2, phi, M: 0.6 });
    const outside = await parallelChernNumbers(spec, { n1: 48, threads: 2 });
    expect(outside.chern).toEqual([0, 0]);
    expect(outside.chern).toEqual(chernNumbers(haldaneModel({ t2, phi, M: 0.6 }), { n1: 48 }).chern);
  });

  it("refuses what cannot run in a worker and reports bad input from the calling thread", async () => {
    // Common practice, no source: error reporting.
    const fnModel = blochModelFromFunction((k1: number) => [
      [Math.cos(2 * Math.PI * k1), 0],
      [0, -Math.cos(2 * Math.PI * k1)],
    ]);
    await expect(parallelChernNumbers(fnModel as never, { n1: 10 })).rejects.toThrow(/cannot be sent to worker threads/);
    const sc = supercellModel(haldaneSpec({ t2: 0.1, phi: Math.PI / 2, M: 0.1 }), 3, 1);
    await expect(parallelChernNumbers(sc, { n1: 2, threads: 2 })).rejects.toBeInstanceOf(InputError);
    await expect(parallelChernNumbers(sc, { n1: 20, threads: 0 })).rejects.toThrow(/threads/);
    await expect(parallelChernNumbers(sc, { n1: 20, groups: [[0, 2]], threads: 2 })).rejects.toThrow(/groups\[0\]/);
    // a gap closing (M at the critical mass, on the grid's K point) is reported, not rounded, in every thread count
    const critical = haldaneSpec({ t2: 0.1, phi: Math.PI / 2, M: haldaneCriticalMass(0.1, Math.PI / 2) });
    await expect(parallelChernNumbers(critical, { n1: 60, threads: 2 })).rejects.toThrow(/not resolved/);
  });
});
