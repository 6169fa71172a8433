/**
 * Colours and topological charge of the texture view (widgets/src/views/textureColors.ts): the
 * m_z map is K. Moreland's "cool to warm" diverging map (ISVC 2009), checked at its published
 * ends and midpoint, for lightness (CIELAB L*, computed by an independent numpy implementation)
 * rising monotonically to the middle and falling after it, symmetric about the middle; the charge
 * map made by the same method is symmetric about q = 0. The charge density is checked against a
 * numpy finite-difference integral.
 */
import { describe, it, expect } from "vitest";
import {
  fillColours,
  fillCharge,
  chargeDensity,
  total,
  arrowStep,
  divergingMsh,
  divergingTable,
  niceTicks,
  scaleBarLength,
  COOL_WARM_ENDS,
  CHARGE_ENDS,
  MZ_TABLE,
  CHARGE_TABLE,
} from "../../../widgets/src/views/textureColors";
import { labelPieces, tickLabel, fixed } from "../../../widgets/src/views/texturePicture";
import { runPython } from "../../helpers/python";
import { skyrmionField } from "../fixtures/notebook";

/** CIELAB L* (D65) of sRGB byte triples by numpy: IEC 61966-2-1 linearisation, CIE 1976 L*. */
function lightness(table: Uint8ClampedArray): number[] {
  // Source: IEC 61966-2-1 (sRGB transfer function and Y row 0.2126, 0.7152, 0.0722); CIE 15:2004 (L* = 116 f(Y/Yn) - 16).
  return runPython<number[]>(
    `import sys, json, numpy as np
c = np.array(json.load(sys.stdin), dtype=float).reshape(-1, 3) / 255.0
lin = np.where(c <= 0.04045, c / 12.92, ((c + 0.055) / 1.055) ** 2.4)
Y = lin @ np.array([0.2126, 0.7152, 0.0722])
f = np.where(Y > (6/29)**3, np.cbrt(Y), Y / (3 * (6/29)**2) + 4/29)
print(json.dumps((116 * f - 16).tolist()))`,
    Array.from(table),
  );
}

describe("m_z colour map: Moreland's cool to warm diverging map", () => {
  it("has the published end colours and a grey middle of L* = 88", () => {
    // Source: K. Moreland, "Diverging Color Maps for Scientific Visualization", ISVC 2009, LNCS 5876,
    // pp. 92-103: cool-warm ends RGB (59, 76, 192) and (180, 4, 38); midpoint Msh (88, 0, 0).
    const [a, b] = COOL_WARM_ENDS;
    divergingMsh(a, b, 0).forEach((v, k) => expect(Math.abs(v - a[k]!)).toBeLessThan(0.5));
    divergingMsh(a, b, 1).forEach((v, k) => expect(Math.abs(v - b[k]!)).toBeLessThan(0.5));
    expect(Array.from(MZ_TABLE.slice(0, 3))).toEqual([59, 76, 192]);
    expect(Array.from(MZ_TABLE.slice(3 * 255))).toEqual([180, 4, 38]);
    const mid = divergingMsh(a, b, 0.5);
    // From memory: Moreland's table lists (221, 221, 221) at 0.5; numpy below gives L* of that grey.
    mid.forEach((v) => expect(Math.abs(v - 221)).toBeLessThan(1));
    expect(Math.abs(lightness(Uint8ClampedArray.from(mid.map(Math.round)))[0]! - 88)).toBeLessThan(0.3);
    // From memory: Moreland's table rows 0.03125 -> (68, 90, 204) and 0.0625 -> (77, 104, 215).
    divergingMsh(a, b, 0.03125).forEach((v, k) => expect(Math.abs(v - [68, 90, 204][k]!)).toBeLessThanOrEqual(1));
    divergingMsh(a, b, 0.0625).forEach((v, k) => expect(Math.abs(v - [77, 104, 215][k]!)).toBeLessThanOrEqual(1));
  });

  it("lightness rises monotonically to the middle and falls after it, symmetric about the middle (numpy L*)", () => {
    for (const table of [MZ_TABLE, CHARGE_TABLE]) {
      const L = lightness(table);
      expect(L).toHaveLength(256);
      // Bytes round each channel by up to 0.5, so L* may wobble by a few hundredths between neighbours.
      for (let k = 1; k < 128; k++) expect(L[k]! - L[k - 1]!).toBeGreaterThan(-0.15);
      for (let k = 129; k < 256; k++) expect(L[k]! - L[k - 1]!).toBeLessThan(0.15);
      expect(L[127]! - L[0]!).toBeGreaterThan(40);
      for (let k = 0; k < 128; k++) expect(Math.abs(L[k]! - L[255 - k]!)).toBeLessThan(1);
    }
  });

  it("a finer table of the same map is monotonic too (no byte rounding in the way)", () => {
    const t = divergingTable(COOL_WARM_ENDS, 33);
    const L = lightness(t);
    for (let k = 1; k <= 16; k++) expect(L[k]!).toBeGreaterThan(L[k - 1]!);
    for (let k = 17; k < 33; k++) expect(L[k]!).toBeLessThan(L[k - 1]!);
  });

  it("the charge map's ends are of equal lightness and its middle is the same grey (symmetric about q = 0)", () => {
    const ends = lightness(Uint8ClampedArray.from([...CHARGE_ENDS[0], ...CHARGE_ENDS[1]]));
    expect(Math.abs(ends[0]! - ends[1]!)).toBeLessThan(0.5);
    divergingMsh(CHARGE_ENDS[0], CHARGE_ENDS[1], 0.5).forEach((v) => expect(Math.abs(v - 221)).toBeLessThan(1));
  });

  it("fillColours maps m_z = -1, 0, +1 to the first, middle and last colour; the in-plane angle does not change it", () => {
    const out = new Uint8ClampedArray(16);
    fillColours(new Float32Array([0, 0, -1, 1, 0, 0, 0, 1, 0, 0, 0, 1]), 4, 1, out, false);
    expect(Array.from(out.slice(0, 3))).toEqual(Array.from(MZ_TABLE.slice(0, 3)));
    expect(Array.from(out.slice(4, 7))).toEqual(Array.from(MZ_TABLE.slice(3 * 128, 3 * 128 + 3)));
    expect(Array.from(out.slice(8, 11))).toEqual(Array.from(out.slice(4, 7)));
    expect(Array.from(out.slice(12, 15))).toEqual([180, 4, 38]);
    expect(out[3]).toBe(255);
  });

  it("fillCharge puts +q and -q at mirror places of the charge map and 0 at its grey middle", () => {
    const out = new Uint8ClampedArray(12);
    fillCharge(new Float32Array([-0.5, 0, 0.5]), 3, 1, 1, out, false);
    const at = (k: number) => Array.from(CHARGE_TABLE.slice(3 * k, 3 * k + 3));
    const idx = (v: number) => Math.round(((v + 1) / 2) * 255);
    expect(Array.from(out.slice(0, 3))).toEqual(at(idx(-0.5)));
    expect(Array.from(out.slice(8, 11))).toEqual(at(idx(0.5)));
    expect(idx(-0.5) + idx(0.5)).toBe(255);
    expect(Array.from(out.slice(4, 7))).toEqual(at(128));
  });

  it("ticks, scale bars and labels", () => {
    // Common practice, no source: 1-2-5 steps.
    expect(niceTicks(-0.5, 31.5, 5)).toEqual([0, 5, 10, 15, 20, 25, 30]);
    expect(niceTicks(-0.01, 0.01, 4)).toEqual([-0.01, -0.005, 0, 0.005, 0.01]);
    expect(scaleBarLength(8)).toBe(5);
    expect(scaleBarLength(32)).toBe(20);
    expect(labelPieces("ρ_Q (nm⁻²)")).toEqual([
      { text: "ρ", sub: false },
      { text: "Q", sub: true },
      { text: " (nm⁻²)", sub: false },
    ]);
    expect(labelPieces("|m_{xy}|")).toEqual([
      { text: "|m", sub: false },
      { text: "xy", sub: true },
      { text: "|", sub: false },
    ]);
    expect(tickLabel(-0)).toBe("0");
    expect(tickLabel(-0.5)).toBe("−0.5");
    expect(fixed(-0.0001, 3)).toBe("0.000");
    expect(fixed(-1.0099, 3)).toBe("−1.010");
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

  it("decimates arrows to about 16 along the longer side", () => {
    expect(arrowStep(1024, 512)).toBe(64);
    expect(arrowStep(10, 10)).toBe(1);
  });
});
