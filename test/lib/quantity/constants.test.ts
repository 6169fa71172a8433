import { describe, expect, it } from "vitest";
import * as c from "../../../lib/src/quantity/constants.js";
import { runPython } from "../../helpers/python.js";

describe("CODATA 2018 constants", () => {
  it("agree with scipy.constants (CODATA 2018 in Debian's scipy 1.10)", () => {
    // Source: scipy.constants.physical_constants, CODATA 2018 table, run as an oracle.
    const ref = runPython<Record<string, number>>(`
import json, scipy.constants as s
p = s.physical_constants
print(json.dumps({
  "mu0": p["vacuum mag. permeability"][0], "muB": p["Bohr magneton"][0], "h": s.h, "hbar": s.hbar,
  "kB": s.k, "e": s.e, "gElectron": p["electron g factor"][0], "gammaElectron": p["electron gyromag. ratio"][0],
}))`);
    for (const [k, v] of Object.entries(ref)) {
      expect(Math.abs((c as Record<string, number>)[k]! / v - 1), k).toBeLessThan(1e-12);
    }
  });
});
