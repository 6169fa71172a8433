/**
 * A table entry with a standard uncertainty prints as "value ± uncertainty": the uncertainty to two
 * significant digits and the value to the same decimal place.
 */
import { describe, expect, it } from "vitest";
import { formatEntry } from "../../../kernel-ext/src/display/table.js";

describe("formatEntry with an uncertainty", () => {
  it("rounds as the GUM's example does", () => {
    // Source: JCGM 100:2008 (GUM), 7.2.2: m_s = 100.021 47 g with a combined standard uncertainty
    // u_c = 0.35 mg, written 100.021 47(35) g, that is 100.02147 ± 0.00035 g; kg is kept as the unit here.
    expect(formatEntry({ value: 0.10002147, unit: "kg", uncertainty: 0.35e-6 })).toBe("0.10002147 ± 0.00000035 kg");
  });
  it("keeps two significant digits of the uncertainty in a customary unit, and no ± without one", () => {
    // Common practice, no source.
    expect(formatEntry({ value: 5.840503939726375e-9, unit: "m", uncertainty: 3.3e-10 })).toBe("5.84 ± 0.33 nm");
    expect(formatEntry({ value: 15e-12, unit: "J/m", uncertainty: 1e-12 })).toBe("15.0 ± 1.0 pJ/m");
    expect(formatEntry({ value: 36.25e-9, unit: "m", uncertainty: 80.09e-9 })).toBe("36 ± 80 nm");
    expect(formatEntry({ value: 5.84e-9, unit: "m" })).toBe(formatEntry({ value: 5.84e-9, unit: "m", uncertainty: 0 }));
    expect(formatEntry({ value: 5.84e-9, unit: "m" })).not.toMatch(/±/);
  });
});
