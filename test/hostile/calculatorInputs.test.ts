/**
 * Hostile inputs against every catalogue calculator (property test, fast-check).
 *
 * For every spec and every input, values drawn from a hostile distribution (NaN, +-Infinity,
 * +-1e+-300, zero, negative, huge integers, strings that are not numbers, numbers typed as
 * strings beyond the double range, quantities of the wrong dimension) must end in one of two
 * answers, and never in a third:
 *   - an InputError naming a parameter of the request (bad input, exit 2 on the command line), or
 *     a ConvergenceError / ComputationError (a computation that failed, exit 1);
 *   - a result with status "ok" or "warning" whose every scalar and array output is finite.
 * A TypeError, RangeError or any other exception (a stack trace for the user) fails the test, and
 * so does a non-finite output with a status. Requests beyond the work and memory budget are
 * refused by the cost estimate before anything is allocated, so no run here can exhaust memory.
 * Common practice, no source: the contract is the project's own (DEVELOPERS.md, "Errors are answers").
 */
import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { catalogue, runCalculator, InputError, ConvergenceError, COMPUTE_BUDGET, type CalculatorSpec } from "@helicoid/lib/internal";

const hostileNumbers = [NaN, Infinity, -Infinity, 1e300, -1e300, 1e-300, -1e-300, 0, -0, -1, 1e9, 2 ** 53, -(2 ** 31), 2.5, 1e-9];
const hostileStrings = ["abc", "", "  ", "1e309", "-1e309", "NaN", "Infinity", "5 kg", "3 s", "1e-400 m", "0x10", "1,5", "2e2e2", "12 pJ/m pJ"];

const hostileValue = fc.oneof(fc.constantFrom<number | string>(...hostileNumbers, ...hostileStrings), fc.double({ noNaN: false }), fc.integer({ min: -(2 ** 40), max: 2 ** 40 }));

/** Which inputs to spoil in one request: one to three of them, each with a hostile value. */
function hostileRequest(spec: CalculatorSpec) {
  const names = spec.inputs.map((i) => i.name);
  return fc.dictionary(fc.constantFrom(...names), hostileValue, { minKeys: 1, maxKeys: Math.min(3, names.length) });
}

/** Run one request and classify the answer; throws (fails the property) on a forbidden one. */
function answerOf(spec: CalculatorSpec, raw: Record<string, number | string>): "refused" | "failed" | "ok" {
  let result;
  try {
    result = runCalculator(spec, raw);
  } catch (err) {
    if (err instanceof InputError) {
      // the refusal names a parameter of the request (an input, or the request's own budget)
      expect(typeof err.parameter).toBe("string");
      expect(err.message).toContain(err.parameter);
      return "refused";
    }
    if (err instanceof ConvergenceError) return "failed";
    throw new Error(`${spec.id} ${JSON.stringify(raw)}: ${(err as Error)?.name}: ${(err as Error)?.message}`);
  }
  expect(["ok", "warning"]).toContain(result.status);
  for (const [name, o] of Object.entries(result.outputs)) {
    const v = o.value;
    if (typeof v === "number") expect(Number.isFinite(v), `${spec.id}.${name} = ${v} for ${JSON.stringify(raw)}`).toBe(true);
    else if (Array.isArray(v)) {
      // a declared gap (no state at that point) is NaN and makes the status "warning"; never Infinity
      const gaps = spec.outputs.find((x) => x.name === name)?.gaps === true;
      const fine = (x: unknown) => typeof x === "number" && (Number.isFinite(x) || (gaps && Number.isNaN(x)));
      expect(v.every(fine), `${spec.id}.${name} for ${JSON.stringify(raw)}`).toBe(true);
      if (v.some((x) => Number.isNaN(x))) expect(result.status).toBe("warning");
    } else expect(typeof v).toBe("string");
  }
  return "ok";
}

// Slow calculators (nested minimizations, profile solves) get fewer random requests.
const runsFor = (id: string) => (["skyrmion", "skyrmion-profile", "wall360"].includes(id) ? 12 : 40);

describe("hostile inputs: every calculator answers with a refusal, a failure or finite numbers", () => {
  for (const spec of catalogue) {
    it(`${spec.id}: each input alone, every fixed hostile value`, () => {
      const seen = { refused: 0, failed: 0, ok: 0 };
      for (const input of spec.inputs) {
        for (const h of [NaN, Infinity, -Infinity, 1e300, -1e300, 1e-300, "1e309", "abc", "5 kg"]) {
          seen[answerOf(spec, { [input.name]: h })]++;
        }
      }
      // Non-finite and non-numeric values are always refused: at least those 6 per input.
      expect(seen.refused).toBeGreaterThanOrEqual(6 * spec.inputs.length);
    });

    it(`${spec.id}: random hostile requests (fast-check)`, () => {
      fc.assert(
        fc.property(hostileRequest(spec), (raw) => void answerOf(spec, raw)),
        { numRuns: runsFor(spec.id), seed: 20261202 },
      );
    });
  }

  it("the budget is stated and bounded (2 GB, about a minute of work)", () => {
    expect(COMPUTE_BUDGET.bytes).toBe(2e9);
    expect(COMPUTE_BUDGET.steps).toBeLessThanOrEqual(1e10);
  });
});
