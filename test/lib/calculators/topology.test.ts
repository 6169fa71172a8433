import { describe, expect, it } from "vitest";
import { getCalculator, runCalculator, type CalculatorSpec } from "@helicoid/lib";
import { textureSpec, textureFromInputs } from "../../../lib/src/calculators/topology.js";

function check(spec: CalculatorSpec, r: ReturnType<typeof runCalculator>): void {
  for (const o of spec.outputs) {
    const v = o.name in r.outputs ? r.outputs[o.name]!.value : undefined;
    expect(v, o.name).toBeDefined();
    if (o.kind === "text") expect(typeof v).toBe("string");
    else if (o.kind === "array") {
      expect(Array.isArray(v)).toBe(true);
      expect(
        (v as number[]).every((x) => Number.isFinite(x)),
        o.name,
      ).toBe(true);
    } else expect(Number.isFinite(v as number), o.name).toBe(true);
  }
  expect(JSON.stringify(r)).not.toMatch(/null/);
}

describe("texture calculator", () => {
  it("is in the catalogue and computes on its defaults: one Neel skyrmion, Q = -1", () => {
    // Source: sign convention of lib/src/README.md (core-down, v = +1, +z background: Q = -1); Berg-Luescher on a periodic grid.
    expect(getCalculator("texture")).toBe(textureSpec);
    const r = runCalculator(textureSpec);
    check(textureSpec, r);
    expect(Math.abs((r.outputs.Q!.value as number) + 1)).toBeLessThan(1e-9);
    expect(r.outputs.objectCount!.value).toBe(1);
    expect((r.outputs.objectRadius!.value as number[])[0]).toBeCloseTo(20e-9, 9);
    // the outputs stay compact: a 64 x 64 preview (every 2nd cell of the 128 x 128 grid)
    expect(r.outputs.previewSize!.value).toBe(64);
    expect(r.outputs.previewCell!.value).toBeCloseTo(2e-9, 20);
    expect((r.outputs.fieldPreview!.value as number[]).length).toBe(3 * 64 * 64);
    expect(r.assumptions.length).toBeGreaterThan(0);
  });

  it("each kind gives its known charge", () => {
    // Source: closed form Q = (v/2)[cos T(0) - cos T(inf)] (derived in lib/src/topology/objects.ts); meron pair v p / 2 each.
    const expected: Array<[Record<string, number>, number]> = [
      [{ kind: 1 }, 1],
      [{ kind: 2, R: 40e-9 }, 0],
      [{ kind: 3, R: 8e-9, w: 2e-9, a: 32e-9 }, -16],
      [{ kind: 4, vorticity: 3 }, -3],
      [{ kind: 4, vorticity: 2, background: 1 }, 2],
      [{ kind: 0, background: 1 }, 1],
    ];
    for (const [inputs, Q] of expected) {
      const r = runCalculator(textureSpec, inputs);
      expect(Math.abs((r.outputs.Q!.value as number) - Q), JSON.stringify(inputs)).toBeLessThan(1e-9);
    }
    const pair = runCalculator(textureSpec, { kind: 5, boundary: 1, pairPolarity: 1, w: 3e-9 });
    expect(Math.abs((pair.outputs.Q!.value as number) - 1)).toBeLessThan(0.05);
    expect(pair.outputs.vortexCount!.value).toBe(1);
    expect(pair.outputs.antivortexCount!.value).toBe(1);
    const warn = runCalculator(textureSpec, { kind: 5 });
    expect(warn.status).toBe("warning");
    const zero = runCalculator(textureSpec, { kind: 4, vorticity: 0 });
    expect(zero.notes.join(" ")).toMatch(/vorticity 1 was used/);
  });

  it("its field preview samples the generated texture, and the result stays small at n = 512", () => {
    // Common practice, no source: the preview is every k-th cell of the full field, rounded to 1e-4.
    for (const n of [16, 100, 512]) {
      const inputs = { n, kind: 3, R: 8e-9, w: 2e-9, a: 32e-9 };
      const r = runCalculator(textureSpec, inputs);
      const full = textureFromInputs({ ...Object.fromEntries(textureSpec.inputs.map((i) => [i.name, i.default])), ...inputs });
      const k = Math.ceil(n / 64);
      const size = r.outputs.previewSize!.value as number;
      expect(size).toBe(Math.ceil(n / k));
      expect(r.outputs.previewCell!.value as number).toBeCloseTo(k * 1e-9, 20);
      const p = r.outputs.fieldPreview!.value as number[];
      expect(p.length).toBe(3 * size * size);
      for (const [i, j] of [
        [0, 0],
        [size - 1, 0],
        [size >> 1, size >> 1],
        [3, size - 2],
      ] as const) {
        for (let c = 0; c < 3; c++) {
          expect(Math.abs(p[3 * (j * size + i) + c]! - full.m[3 * (j * k * n + i * k) + c]!), `n=${n} (${i},${j}) c${c}`).toBeLessThanOrEqual(5e-5 + 1e-12);
        }
      }
      // JSON of the whole result (what the widget state and an exported page hold)
      expect(JSON.stringify(r).length, `n=${n}`).toBeLessThan(150_000);
    }
  });

  it("computes on every range corner (n at its minimum), and at n = 512 for every kind", () => {
    // Common practice, no source: every spec computes on its defaults and range corners.
    const inputs = textureSpec.inputs.filter((i) => i.name !== "n");
    for (let mask = 0; mask < 1 << inputs.length; mask++) {
      const v: Record<string, number> = { n: 16 };
      inputs.forEach((inp, i) => (v[inp.name] = mask & (1 << i) ? inp.max : inp.min));
      check(textureSpec, runCalculator(textureSpec, v));
    }
    for (let kind = 0; kind <= 5; kind++) {
      for (const side of ["min", "max"] as const) {
        const v: Record<string, number> = { n: 512, kind };
        for (const inp of inputs) if (inp.name !== "kind") v[inp.name] = inp[side];
        check(textureSpec, runCalculator(textureSpec, v));
      }
    }
  });
});
