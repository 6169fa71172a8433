/**
 * How calculators read and explain their inputs: bare numbers for dimensional inputs are read in SI
 * and said so, values far outside the usual range are flagged, and errors raised inside a compute
 * function are restated with the input's own name, the value as typed, and the defaults used.
 * Common practice, no source (error reporting; the physics of each spec is checked in its own tests).
 */
import { describe, expect, it } from "vitest";
import { runCalculator } from "../../../lib/src/calculators/spec.js";
import { getCalculator } from "../../../lib/src/calculators/catalogue.js";
import { InputError } from "../../../lib/src/errors.js";

const wall = getCalculator("wall");

describe("calculator input reading", () => {
  it("a bare number for a dimensional input is read as SI and said so; a far-off value is flagged", () => {
    // 1e-8 J/m: a bare number, read in SI, 333 times the top of the usual range: accepted with notes
    const bare = runCalculator(wall, { A: "1e-8" });
    expect(bare.inputs.A!.value).toBe(1e-8);
    expect(bare.notes.join("\n")).toMatch(/A = 1e-8 was given without a unit: read as 1e-8 J\/m \(SI\)/);
    expect(bare.notes.join("\n")).toMatch(/A = .* is far outside the usual range 5 pJ\/m to 30 pJ\/m/);
    // "A=15" meant as pJ/m is 15 J/m in SI: a million times beyond the usual range, refused
    expect(() => runCalculator(wall, { A: "15" })).toThrow(/A = "15" is not valid: expected a value within a factor 1e\+6 of the usual range 5 pJ\/m to 30 pJ\/m/);
    const typed = runCalculator(wall, { A: "15 pJ/m" });
    expect(typed.inputs.A!.value).toBeCloseTo(15e-12, 24);
    expect(typed.notes.join("\n")).not.toMatch(/without a unit|far outside/);
    // numbers passed from code are SI by contract: no note
    expect(runCalculator(wall, { A: 15e-12 }).notes.join("\n")).not.toMatch(/without a unit/);
  });

  it("errors from inside a compute function name the input, the value as typed, and the defaults used", () => {
    const refused = (id: string, raw: Record<string, string>) => {
      try {
        runCalculator(getCalculator(id), raw);
      } catch (err) {
        expect(err).toBeInstanceOf(InputError);
        return err as InputError;
      }
      throw new Error(`${id} accepted ${JSON.stringify(raw)}`);
    };
    // K_eff < 0: the rejected input (Ku) was not given, so its default and what was given are shown
    const inPlane = refused("wall", { Ms: "5MA/m" });
    expect(inPlane.parameter).toBe("Ku");
    expect(inPlane.message).toMatch(/Ku was not given: its default was used; given: Ms = 5MA\/m/);
    const grid = refused("chern", { grid: "2" });
    expect(grid.parameter).toBe("grid");
    expect(grid.message).toMatch(/grid = "2" is not valid: expected a whole number >= 3/);
    const spin = refused("berry-loop", { twoS: "0" });
    expect(spin.parameter).toBe("twoS");
    expect(refused("easy-plane", { twoS: "0" }).parameter).toBe("twoS");
    const negative = refused("wall", { A: "-15pJ/m" });
    expect(negative.message).toMatch(/A = "-15pJ\/m" is not valid: expected an exchange stiffness: a value > 0 J\/m/);
  });

  it("choices by label and angles with units", () => {
    const texture = getCalculator("texture");
    expect(runCalculator(texture, { kind: "antiskyrmion" }).inputs.kind!.value).toBe(1);
    expect(runCalculator(texture, { kind: "Skyrmion Lattice" }).inputs.kind!.value).toBe(3);
    expect(runCalculator(texture, { kind: "2" }).inputs.kind!.value).toBe(2);
    expect(() => runCalculator(texture, { kind: "sky" })).toThrow(/"sky" starts 3 of the labels/);
    expect(() => runCalculator(texture, { kind: "bubble" })).toThrow(/one of 0 \(skyrmion\)/);
    // Source: 60 degrees = pi/3 rad (definition of the degree)
    const loop = getCalculator("berry-loop");
    const deg = runCalculator(loop, { theta: "60deg" });
    expect(deg.inputs.theta!.value).toBeCloseTo(Math.PI / 3, 15);
    expect(deg.inputs.theta!.unit).toBe("rad");
    expect(deg.outputs.solidAngle!.unit).toBe("sr");
    expect(deg.outputs.gammaTop!.unit).toBe("rad");
    expect(runCalculator(loop, { theta: "1.0" }).notes.join("\n")).not.toMatch(/without a unit/);
    expect(() => runCalculator(loop, { theta: "3mT" })).toThrow(/dimension of rad/);
  });
});
