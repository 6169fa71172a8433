/**
 * controlPanel's sliders (kernel-ext/src/widgets/panel.ts): a unit given last is shown beside the
 * name, and large or small magnitudes read with an SI prefix ("1.25M") instead of "1250000.00".
 * Source: the readout format is a d3-format specifier (the standard slider's documented
 * `readout_format`); "~s" is d3-format's SI-prefix notation with trailing zeros trimmed.
 */
import { describe, expect, it } from "vitest";
import { controlPanel } from "../../../kernel-ext/src/widgets/panel.js";

describe("controlPanel sliders", () => {
  it("show the unit given last and an SI-prefix readout for large values", () => {
    const p = controlPanel(() => undefined, { Ku: [0.9e6, 1.6e6, "J/m^3"], k: [1, 10], x: [0.5, 2.5] });
    const ku = p.controls.Ku as unknown as { get(k: string): unknown };
    expect(ku.get("description")).toBe("Ku (J/m³)");
    expect(ku.get("readout_format")).toBe(".4~s");
    expect(ku.get("value")).toBeCloseTo(1.25e6, 6);
    const k = p.controls.k as unknown as { get(k: string): unknown };
    expect(k.get("description")).toBe("k");
    expect(k.get("_model_name")).toBe("IntSliderModel");
    const x = p.controls.x as unknown as { get(k: string): unknown };
    expect(x.get("readout_format")).toBe(".4~g");
  });

  it("refuses a range that is not one, naming the parameter", () => {
    expect(() => controlPanel(() => undefined, { Ku: [2, 1, "J/m^3"] })).toThrow(/parameter Ku = \[2, 1, J\/m\^3\]: expected \[min, max\]/);
    expect(() => controlPanel(() => undefined, { Ku: [1, 2, 0, "J/m^3"] })).toThrow(/parameter Ku/);
  });
});
