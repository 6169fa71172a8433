import { describe, expect, it } from "vitest";
import {
  easyPlaneLevels,
  easyPlaneCrossings,
  easyPlaneGroundM,
  easyPlaneMagnetization,
  rotorMagnetization,
  rotorMagnetizationDirect,
  rotorTruncation,
} from "../../../lib/src/berry/easyPlaneSpin.js";
import { kB, muB } from "../../../lib/src/quantity/constants.js";
import { getCalculator, runCalculator } from "../../../lib/src/calculators/index.js";
import { runPython } from "../../helpers/python.js";
import { InputError } from "../../../lib/src/errors.js";

const D = 1.2 * kB;

describe("easy-plane spin in a hard-axis field", () => {
  it("level crossings at b = D (2m + 1); ground m steps there; integer vs half-integer offset", () => {
    // Source: E_m = D m^2 - b m (textbook); crossings E_m = E_{m+1} at b = D (2m + 1).
    expect(easyPlaneCrossings(2, D).map((b) => b / D)).toEqual([-3, -1, 1, 3]);
    expect(easyPlaneCrossings(1.5, D).map((b) => b / D)).toEqual([-2, 0, 2]);
    for (const b of easyPlaneCrossings(3, D)) {
      const L = easyPlaneLevels(3, D, b);
      const sorted = Array.from(L).sort((x, y) => x - y);
      expect(Math.abs(sorted[0]! - sorted[1]!) / D).toBeLessThan(1e-12);
      expect(easyPlaneGroundM(3, D, b + 1e-9 * D) - easyPlaneGroundM(3, D, b - 1e-9 * D)).toBe(1);
    }
    // steps of <Sz> at low T: plateaus at the ground m, integer plateaus for S = 3, half-odd for S = 5/2
    const T = 0.01;
    expect(easyPlaneMagnetization(3, D, 1.5 * D, T)).toBeCloseTo(1, 12);
    expect(easyPlaneMagnetization(3, D, 2.5 * D, T)).toBeCloseTo(1, 12);
    expect(easyPlaneMagnetization(2.5, D, 0.5 * D, T)).toBeCloseTo(0.5, 12);
    expect(easyPlaneMagnetization(2.5, D, 2.5 * D, T)).toBeCloseTo(1.5, 12);
    // at a crossing the two levels are equally populated: <Sz> is the mid value
    expect(easyPlaneMagnetization(3, D, 3 * D, T)).toBeCloseTo(1.5, 12);
    expect(easyPlaneMagnetization(2.5, D, 0, T)).toBeCloseTo(0, 12);
    // saturation beyond the last crossing
    expect(easyPlaneMagnetization(3, D, 7 * D, T)).toBeCloseTo(3, 12);
  });

  it("rotor (theta-function) form equals the exact sum to 1e-12 in the rotor limit, integer and half-integer S", () => {
    // Source: Jacobi imaginary transformation (Whittaker & Watson 1927, ch. 21); derivation in easyPlaneSpin.ts.
    for (const [S, half] of [
      [40, false],
      [40.5, true],
    ] as const) {
      for (const T of [0.2, 1, 3, 10]) {
        for (const bOverD of [0, 0.3, 1, 1.7, 4.2, -6.5]) {
          const b = bOverD * D;
          expect(rotorTruncation(S, D, b, T)).toBeLessThan(1e-14);
          const exact = easyPlaneMagnetization(S, D, b, T);
          const rotor = rotorMagnetization(D, b, T, half).value;
          expect(Math.abs(exact - rotor), `S=${S} T=${T} b/D=${bOverD}`).toBeLessThan(1e-12);
          expect(Math.abs(rotorMagnetizationDirect(D, b, T, half) - rotor)).toBeLessThan(1e-12);
        }
      }
    }
  });

  it("outside the rotor limit (small S, high T) the finite spin differs, and the truncation weight says so", () => {
    // Common practice, no source: the unrestricted rotor has no saturation.
    const S = 2,
      T = 10,
      b = 3 * D;
    expect(rotorTruncation(S, D, b, T)).toBeGreaterThan(1e-2);
    expect(Math.abs(easyPlaneMagnetization(S, D, b, T) - rotorMagnetization(D, b, T, false).value)).toBeGreaterThan(1e-3);
  });

  it("rejects bad S, D and T", () => {
    expect(() => easyPlaneLevels(1.25, D, 0)).toThrow(InputError);
    expect(() => easyPlaneMagnetization(2, -D, 0, 1)).toThrow(/positive easy-plane/);
    expect(() => rotorMagnetization(D, 0, 0, false)).toThrow(/positive temperature/);
  });
});

describe("rotor form against mpmath at 40 digits (every beta D)", () => {
  // Source: the rotor model's Boltzmann sum over m in Z + nu and its Jacobi-theta form (Whittaker &
  // Watson 1927, ch. 21), evaluated by mpmath (Debian python3-mpmath) at 40 digits: the direct sum and
  // mpmath's own jtheta (for beta D < 2, where its q-series converges).
  const oracle = `
import json, sys
import mpmath as mp
mp.mp.dps = 40
kB = mp.mpf('1.380649e-23'); muB = mp.mpf('9.2740100783e-24')
out = []
for c in json.load(sys.stdin):
    twoS, Dk, B, T = c
    S = mp.mpf(twoS) / 2; nu = mp.mpf(twoS % 2) / 2
    bD = mp.mpf(Dk) / T; x = 2 * muB * mp.mpf(B) / (2 * mp.mpf(Dk) * kB)
    m0 = mp.floor(x - nu + mp.mpf(1) / 2) + nu
    E = lambda m: bD * ((m - x) ** 2 - (m0 - x) ** 2)
    z = zm = mp.mpf(0); j = 0
    while True:
        ms = [m0] if j == 0 else [m0 + j, m0 - j]
        ws = [mp.exp(-E(m)) for m in ms]
        z += sum(ws); zm += sum(m * w for m, w in zip(ms, ws))
        if j > 3 and max(ws) < mp.mpf(10) ** -45: break
        j += 1
    rot = zm / z
    inside = sum(mp.exp(-E(S - i)) for i in range(twoS + 1))
    fin = sum((S - i) * mp.exp(-E(S - i)) for i in range(twoS + 1)) / inside
    theta = None
    if bD < 2:
        q = mp.exp(-mp.pi ** 2 / bD); k = 3 if nu == 0 else 4
        theta = x + mp.pi / (2 * bD) * mp.jtheta(k, mp.pi * x, q, 1) / mp.jtheta(k, mp.pi * x, q)
    out.append([float(rot), float(fin), float((z - inside) / z), None if theta is None else float(theta)])
print(json.dumps(out))
`;
  const cases: [number, number, number, number][] = [[7, 5, 7.4, 0.02]]; // the low-temperature case: exact 0.55060
  for (const twoS of [1, 2, 7, 20, 41]) for (const Dk of [0.1, 1, 5]) for (const B of [0, 0.37, 2, 7.4, 20]) for (const T of [0.02, 0.3, 2, 20]) cases.push([twoS, Dk, B, T]);
  const ref = runPython<[number, number, number, number | null][]>(oracle, cases);

  it("the rotor form (both series) and the truncation weight agree with mpmath to 1e-12 on a grid of 301 cases", () => {
    expect(ref[0]![0]).toBeCloseTo(0.5506049, 7);
    let worst = 0,
      worstT = 0,
      thetaChecked = 0;
    cases.forEach(([twoS, Dk, B, T], i) => {
      const [rot, fin, trunc, theta] = ref[i]!;
      const D = Dk * kB,
        b = 2 * muB * B;
      const r = rotorMagnetization(D, b, T, twoS % 2 === 1);
      expect(r.series).toBe(Dk / T >= Math.PI ? "direct" : "dual");
      const scale = 1 + Math.abs(b / (2 * D));
      worst = Math.max(worst, Math.abs(r.value - rot) / scale);
      if (theta !== null) {
        expect(Math.abs(theta - rot) / scale).toBeLessThan(1e-13); // the two mpmath evaluations agree
        thetaChecked++;
      }
      expect(Math.abs(easyPlaneMagnetization(twoS / 2, D, b, T) - fin)).toBeLessThan(1e-12);
      const t = rotorTruncation(twoS / 2, D, b, T);
      if (Math.abs(t - trunc) > Math.max(1e-9 * trunc, 1e-15)) worstT++;
    });
    expect(worst).toBeLessThan(1e-12);
    expect(worstT).toBe(0);
    expect(thetaChecked).toBeGreaterThan(50);
  });

  it("the calculator gives the exact rotor value at twoS = 7, D = 5 K, B = 7.4 T, T = 0.02 K", () => {
    const r = runCalculator(getCalculator("easy-plane"), { twoS: 7, D: 5, B: 7.4, T: 0.02 });
    expect(Math.abs((r.outputs.szRotor!.value as number) - ref[0]![0])).toBeLessThan(1e-12);
    expect(Math.abs((r.outputs.szExact!.value as number) - ref[0]![1])).toBeLessThan(1e-12);
    expect(Math.abs(r.outputs.rotorDifference!.value as number)).toBeLessThan(1e-12);
    expect(r.status).toBe("ok");
  });
});
