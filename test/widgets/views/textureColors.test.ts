/**
 * Colours and topological charge of the texture view (widgets/src/views/textureColors.ts),
 * checked against Python's colorsys (HLS to RGB) and a numpy finite-difference integral.
 */
import { describe, it, expect } from "vitest";
import { fillColours, chargeDensity, total, arrowStep } from "../../../widgets/src/views/textureColors";
import { runPython } from "../../helpers/python";
import { skyrmionField } from "../fixtures/notebook";

describe("texture colours", () => {
  it("hue = in-plane angle and lightness = (1 + mz)/2 equal colorsys.hls_to_rgb", async () => {
    const n = 200;
    const f = new Float32Array(3 * n);
    let seed = 7;
    const rnd = () => ((seed = (seed * 16807) % 2147483647) / 2147483647) * 2 - 1;
    for (let i = 0; i < n; i++) {
      const v = [rnd(), rnd(), rnd()], r = Math.hypot(...v);
      f[3 * i] = v[0]! / r; f[3 * i + 1] = v[1]! / r; f[3 * i + 2] = v[2]! / r;
    }
    const out = new Uint8ClampedArray(4 * n);
    fillColours(f, n, 1, out, false);
    // Source: Python standard library colorsys.hls_to_rgb (HSL with s = 1) as the reference.
    const ref = await runPython<number[][]>(
      `import sys, json, math, colorsys
f = json.load(sys.stdin)
out = []
for i in range(len(f)//3):
    mx, my, mz = f[3*i:3*i+3]
    h = (math.atan2(my, mx) / (2*math.pi)) % 1.0
    r, g, b = colorsys.hls_to_rgb(h, (1 + mz) / 2, 1.0)
    out.append([r*255, g*255, b*255])
print(json.dumps(out))`,
      Array.from(f),
    );
    for (let i = 0; i < n; i++) for (let c = 0; c < 3; c++) expect(Math.abs(out[4 * i + c]! - ref[i]![c]!)).toBeLessThanOrEqual(1);
    expect(out[3]).toBe(255);
  });

  it("white for m_z = +1, black for m_z = -1, pure red for +x", () => {
    const out = new Uint8ClampedArray(12);
    fillColours(new Float32Array([0, 0, 1, 0, 0, -1, 1, 0, 0]), 3, 1, out, false);
    expect(Array.from(out.slice(0, 3))).toEqual([255, 255, 255]);
    expect(Array.from(out.slice(4, 7))).toEqual([0, 0, 0]);
    expect(Array.from(out.slice(8, 11))).toEqual([255, 0, 0]);
  });
});

describe("topological charge density", () => {
  it("sums to the skyrmion number: -1 for a core-down skyrmion of vorticity 1, as numpy's finite-difference integral", async () => {
    const n = 96;
    const field = skyrmionField(n);
    const Q = total(chargeDensity(field, n, n));
    // Source: Q = (1/4 pi) ∫ m·(∂x m × ∂y m) dx dy evaluated by numpy.gradient on the same field
    // (an independent discretisation); closed form -1 for theta: pi -> 0 with vorticity 1.
    const ref = await runPython<{ Q: number }>(
      `import sys, json, numpy as np
d = json.load(sys.stdin); n = d["n"]
m = np.array(d["f"], dtype=float).reshape(n, n, 3)
dy, dx = np.gradient(m, axis=(0, 1))
q = np.einsum("ijk,ijk->ij", m, np.cross(dx, dy)) / (4*np.pi)
print(json.dumps({"Q": float(q.sum())}))`,
      { n, f: Array.from(field) },
    );
    expect(Math.abs(Q + 1)).toBeLessThan(5e-3);
    expect(Math.abs(ref.Q + 1)).toBeLessThan(2e-2);
    expect(Math.abs(Q - ref.Q)).toBeLessThan(2e-2);
  });

  it("is zero for a uniform field and has (nx-1)(ny-1) plaquettes", () => {
    const f = new Float32Array(3 * 5 * 4);
    for (let k = 2; k < f.length; k += 3) f[k] = 1;
    const q = chargeDensity(f, 5, 4);
    expect(q.length).toBe(12);
    expect(total(q)).toBe(0);
  });

  it("decimates arrows to about 24 along the longer side", () => {
    expect(arrowStep(1024, 512)).toBe(43);
    expect(arrowStep(10, 10)).toBe(1);
  });
});
