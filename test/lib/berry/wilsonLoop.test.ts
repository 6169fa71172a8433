import { describe, expect, it } from "vitest";
import { wilsonLoop } from "../../../lib/src/berry/wilsonLoop.js";
import { spinBerryPhase, wrapBerryPhase } from "../../../lib/src/berry/spinBerryPhase.js";
import { coneLoop } from "../../../lib/src/berry/loopOnSphere.js";
import { InputError } from "../../../lib/src/errors.js";

const th = 1.1;
const spinHalf = (l: number) => {
  const c = Math.cos(th),
    s = Math.sin(th);
  // H = -n . sigma; ground state = spin up along n (m = +1/2)
  return [
    [-c, { re: -s * Math.cos(l), im: s * Math.sin(l) }],
    [{ re: -s * Math.cos(l), im: -s * Math.sin(l) }, c],
  ];
};

describe("discrete Berry phase and Wilson loop of H(lambda)", () => {
  it("spin 1/2 following a cone: -(1/2) 2 pi (1 - cos theta), function and mathjs formula alike", () => {
    // Source: M. Berry, Proc. R. Soc. A 392, 45 (1984); discretization error O(1/N^2).
    const exact = wrapBerryPhase(-0.5 * 2 * Math.PI * (1 - Math.cos(th)));
    const a = wilsonLoop(spinHalf, { points: 4000 });
    const b = wilsonLoop("[[-cos(th), -sin(th) * exp(-i * lambda)], [-sin(th) * exp(i * lambda), cos(th)]]", { parameters: { th }, points: 4000 });
    expect(Math.abs(a.berryPhase - exact)).toBeLessThan(1e-6);
    expect(Math.abs(b.berryPhase - a.berryPhase)).toBeLessThan(1e-13);
    // the same loop as a spin-1/2 coherent-state loop (independent construction by rotation matrices)
    const c = spinBerryPhase(coneLoop(th, 4000), 0.5, 0.5);
    expect(Math.abs(wrapBerryPhase(c.discrete - a.berryPhase))).toBeLessThan(1e-9);
    // excited band: opposite phase
    expect(Math.abs(wrapBerryPhase(wilsonLoop(spinHalf, { points: 4000, bands: [1] }).berryPhase + exact))).toBeLessThan(1e-6);
  });

  it("a degenerate group (two copies): determinant phase doubles, Wilson eigenphases both equal the single phase", () => {
    // Common practice, no source: a block-diagonal family factorizes the Wilson loop.
    const z = { re: 0, im: 0 };
    const two = (l: number) => {
      const m = spinHalf(l) as unknown as unknown[][];
      return [
        [m[0]![0], m[0]![1], z, z],
        [m[1]![0], m[1]![1], z, z],
        [z, z, m[0]![0], m[0]![1]],
        [z, z, m[1]![0], m[1]![1]],
      ];
    };
    const one = wilsonLoop(spinHalf, { points: 2000 });
    const w = wilsonLoop(two, { points: 2000, bands: [0, 1] });
    expect(Math.abs(wrapBerryPhase(w.berryPhase - 2 * one.berryPhase))).toBeLessThan(1e-12);
    for (const p of w.wilsonEigenphases) expect(Math.abs(wrapBerryPhase(p - one.berryPhase))).toBeLessThan(1e-8);
    expect(w.status).toBe("ok");
  });

  it("reports a closing gap and rejects open loops and non-Hermitian matrices", () => {
    const gapless = (l: number) => [
      [Math.cos(l), 0],
      [0, -Math.cos(l)],
    ];
    expect(wilsonLoop(gapless, { points: 4 }).status).toBe("gap-closed");
    expect(() => wilsonLoop(spinHalf, { from: 0, to: Math.PI })).toThrow(InputError);
    expect(() => wilsonLoop(spinHalf, { from: 0, to: Math.PI })).toThrow(/closed loop/);
    expect(() => wilsonLoop("[[1, 2], [3, 1]]")).toThrow(/Hermitian/);
    expect(() => wilsonLoop(spinHalf, { bands: [0, 2] })).toThrow(/consecutive/);
  });
});
