import { describe, expect, it } from "vitest";
import { fft, ifft, fft2, InputError } from "@helicoid/lib/internal";
import { runPython } from "../../helpers/python.js";

function randomArray(n: number, seed: number): number[] {
  let s = seed;
  return Array.from({ length: n }, () => {
    s = (s * 1103515245 + 12345) % 2147483648;
    return s / 2147483648 - 0.5;
  });
}

describe("fft (radix-2 and Bluestein)", () => {
  const lengths = [1, 2, 8, 12, 17, 64, 100, 127];
  const inputs = lengths.map((n, i) => ({ re: randomArray(n, 3 + i), im: randomArray(n, 101 + i) }));
  // Source: numpy.fft.fft / ifft / fft2 (Debian's numpy 1.24) run as an oracle.
  const ref = runPython<{ f: Array<[number[], number[]]>; i: Array<[number[], number[]]>; f2: [number[], number[]] }>(
    `
import json, sys, numpy as np
d = json.load(sys.stdin)
f = []; inv = []
for x in d["inputs"]:
    z = np.array(x["re"]) + 1j * np.array(x["im"])
    F = np.fft.fft(z); I = np.fft.ifft(z)
    f.append([F.real.tolist(), F.imag.tolist()]); inv.append([I.real.tolist(), I.imag.tolist()])
g = np.array(d["g"]).reshape(6, 10)
G = np.fft.fft2(g)
print(json.dumps({"f": f, "i": inv, "f2": [G.real.ravel().tolist(), G.imag.ravel().tolist()]}))
`,
    { inputs, g: randomArray(60, 7) },
  );
  it("agrees with numpy.fft.fft and ifft for power-of-two and other lengths", () => {
    lengths.forEach((n, k) => {
      const re = Float64Array.from(inputs[k]!.re);
      const im = Float64Array.from(inputs[k]!.im);
      fft(re, im);
      const scale = Math.sqrt(n);
      for (let j = 0; j < n; j++) {
        expect(Math.abs(re[j]! - ref.f[k]![0][j]!), `n=${n} re[${j}]`).toBeLessThan(1e-13 * scale);
        expect(Math.abs(im[j]! - ref.f[k]![1][j]!), `n=${n} im[${j}]`).toBeLessThan(1e-13 * scale);
      }
      const re2 = Float64Array.from(inputs[k]!.re);
      const im2 = Float64Array.from(inputs[k]!.im);
      ifft(re2, im2);
      for (let j = 0; j < n; j++) {
        expect(Math.abs(re2[j]! - ref.i[k]![0][j]!)).toBeLessThan(1e-14 * scale);
        expect(Math.abs(im2[j]! - ref.i[k]![1][j]!)).toBeLessThan(1e-14 * scale);
      }
    });
  });
  it("agrees with numpy.fft.fft2 on a 10 x 6 grid and inverts", () => {
    const g = randomArray(60, 7);
    const re = Float64Array.from(g);
    const im = new Float64Array(60);
    fft2(re, im, 10, 6);
    for (let j = 0; j < 60; j++) {
      expect(Math.abs(re[j]! - ref.f2[0][j]!)).toBeLessThan(1e-12);
      expect(Math.abs(im[j]! - ref.f2[1][j]!)).toBeLessThan(1e-12);
    }
    fft2(re, im, 10, 6, true);
    for (let j = 0; j < 60; j++) expect(Math.abs(re[j]! - g[j]!)).toBeLessThan(1e-14);
  });
  it("rejects mismatched arrays", () => {
    expect(() => fft(new Float64Array(4), new Float64Array(3))).toThrow(InputError);
    expect(() => fft2(new Float64Array(6), new Float64Array(6), 4, 2)).toThrow(InputError);
  });
});
