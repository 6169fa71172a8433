/**
 * Validation of a value typed into an explorer control: parsed with the library's unit parser
 * (so "12 pJ/m", "1.2e-11" and "12e-12 J/m" all work), then checked against the control's range
 * and kind. A refused entry gives the reason; the caller keeps the last good value.
 */
import { parseQuantity, formatNumber, formatQuantity, type InputSpec } from "@helicoid/lib";

export type EntryOutcome = { ok: true; value: number } | { ok: false; reason: string };

export function validateEntry(input: InputSpec, raw: string): EntryOutcome {
  const text = raw.trim();
  if (text === "") return { ok: false, reason: `${input.name}: enter a value` };
  let value: number;
  try {
    value = parseQuantity(input.name, text, input.unit);
  } catch (err) {
    return { ok: false, reason: (err as Error).message };
  }
  if (input.kind === "integer" && !Number.isInteger(value)) {
    return { ok: false, reason: `${input.name} = ${JSON.stringify(raw)} is not valid: expected a whole number` };
  }
  if (input.kind === "choice" && input.choices && !input.choices.some((c) => c.value === value)) {
    return { ok: false, reason: `${input.name} = ${JSON.stringify(raw)} is not valid: expected one of ${input.choices.map((c) => c.label).join(", ")}` };
  }
  if (value < input.min || value > input.max) {
    return {
      ok: false,
      reason:
        `${input.name} = ${JSON.stringify(raw)} is outside this control's range ` +
        `${formatQuantity(input.min, input.unit)} to ${formatQuantity(input.max, input.unit)}` +
        ` (other values can be given from code)`,
    };
  }
  return { ok: true, value };
}

/** The text shown in an entry box for an SI value: customary unit, 4 significant digits. */
export function entryText(input: InputSpec, value: number): string {
  if (input.kind === "choice" && input.choices) {
    return input.choices.find((c) => c.value === value)?.label ?? formatNumber(value);
  }
  return formatQuantity(value, input.unit, 4).replace("µ", "u");
}
