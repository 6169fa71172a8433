/**
 * Must compile under `strict`: typed reads of calculator results with no casts, a film as inputs,
 * ids in string variables, and each misspelling below marked as an expected error (an unused
 * `@ts-expect-error` is itself an error, so a misspelling that compiled would fail this file).
 */
import { defineCalculator, getCalculator, makeFilm, runCalculator, table, type CalculatorId } from "./entry";

const film = makeFilm({ Ms: "1.1 MA/m", A: "15 pJ/m", Ku: "1.4 MJ/m^3", D: "2 mJ/m^2", t: "1 nm" });
const sk = runCalculator("skyrmion", { ...film, B: "50 mT" }, { noSweep: true });
export const radius: number = sk.outputs.radius.value;
export const radii: number[] = sk.outputs.radiusSweep.value;
export const states: string = sk.outputs.states.value;
export const width: number = runCalculator("wall", film).outputs.width.value;
export const profile: number[] = runCalculator(getCalculator("skyrmion-profile"), { B: 0.05 }).outputs.mzExact.value;
export const inputUnit: string = sk.inputs.Ms.unit;
const someId: string = "wall";
export const untyped = runCalculator(someId, {}).outputs["width"]?.value;
export const id: CalculatorId = "skyrmion";

const spec = defineCalculator({
  id: "optional-demo",
  title: "Demo",
  summary: "",
  inputs: [{ name: "x", symbol: "x", unit: "", default: 1, min: 0, max: 2, scale: "linear", meaning: "" }],
  outputs: [
    { name: "y", symbol: "y", unit: "", meaning: "" },
    { name: "z", symbol: "z", unit: "", meaning: "", optional: true },
    { name: "curve", symbol: "c", unit: "", meaning: "", kind: "array" },
  ],
  plots: [],
  assumptions: [],
  sources: [],
  method: "",
  compute: (v) => ({ values: { y: v.x!, curve: [v.x!] } }),
});
const r = runCalculator(spec, { x: 2 });
export const y: number = r.outputs.y.value;
export const z: number | undefined = r.outputs.z?.value;
export const curve: number[] = r.outputs.curve.value;
// @ts-expect-error an optional output may be absent
export const zStrict: number = r.outputs.z.value;
// @ts-expect-error a misspelt input
runCalculator(spec, { xx: 2 });
// @ts-expect-error a misspelt calculator id
runCalculator("skyrmon", {});
// @ts-expect-error a misspelt input of a catalogue calculator
runCalculator("skyrmion", { Kuu: 1e6 });
// @ts-expect-error an array output is not a number
export const notScalar: number = sk.outputs.radiusSweep.value;
export const shown = table(sk);
