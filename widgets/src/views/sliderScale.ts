/**
 * Slider positions <-> SI values for an input: linear, or logarithmic when the spec says so
 * (and the range is positive). Positions run over 0..STEPS.
 */
import type { InputSpec } from "@helicoid/lib";

export const STEPS = 1000;

export function isLogScale(input: Pick<InputSpec, "scale" | "min" | "max">): boolean {
  return input.scale === "log" && input.min > 0 && input.max > 0;
}

/** Slider position (0..STEPS, fractional) of an SI value, clamped to the range. */
export function toPosition(value: number, input: Pick<InputSpec, "scale" | "min" | "max">): number {
  const { min, max } = input;
  if (!(max > min)) return 0;
  const v = Math.min(max, Math.max(min, value));
  const s = isLogScale(input) ? Math.log(v / min) / Math.log(max / min) : (v - min) / (max - min);
  return s * STEPS;
}

/**
 * SI value at a slider position, rounded to 4 significant digits so that a moved slider gives
 * values a person can read and retype (integer inputs: whole numbers). Stays inside [min, max].
 */
export function fromPosition(position: number, input: Pick<InputSpec, "scale" | "min" | "max" | "kind">): number {
  const { min, max } = input;
  const s = Math.min(1, Math.max(0, position / STEPS));
  let v = isLogScale(input) ? min * Math.pow(max / min, s) : min + s * (max - min);
  if (s === 0) return min;
  if (s === 1) return max;
  v = input.kind === "integer" ? Math.round(v) : Number(v.toPrecision(4));
  return Math.min(max, Math.max(min, v));
}
