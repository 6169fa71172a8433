/**
 * Every output of every calculator is named in some test (test/helpers/unnamedOutputs.ts says what
 * "named" means: a test file that names the calculator also names the output as a whole word).
 * A calculator added with outputs that no test looks at fails here. The allow-list below holds the
 * outputs that still have no test, each with the reason; it may only shrink: an entry that a test
 * names now fails too, so the list cannot go stale. This file is left out of the scan (its list
 * names the outputs without checking them).
 */
import { describe, expect, it } from "vitest";
import { catalogue } from "@helicoid/lib";
import { testFiles, unnamedOutputs, unnamedReport } from "../../helpers/unnamedOutputs.js";

/** Outputs no test names yet, by calculator id, with the reason (keep it short and honest). */
const notYetNamed: Record<string, { outputs: string[]; why: string }> = {};

describe("every calculator output is named in a test", () => {
  const files = testFiles().filter((f) => !f.path.endsWith("outputsNamed.test.ts"));
  const missing = unnamedOutputs(files);

  it("no output outside the allow-list goes unnamed", () => {
    const unexpected: string[] = [];
    for (const [id, names] of Object.entries(missing)) {
      const allowed = new Set(notYetNamed[id]?.outputs ?? []);
      for (const n of names) if (!allowed.has(n)) unexpected.push(`${id}: ${n}`);
    }
    expect(unexpected, `outputs never named in a test file that names their calculator:\n${unnamedReport(missing)}`).toEqual([]);
  });

  it("the allow-list holds only real, still unnamed outputs", () => {
    const stale: string[] = [];
    for (const [id, entry] of Object.entries(notYetNamed)) {
      const spec = catalogue.find((s) => s.id === id);
      for (const n of entry.outputs) {
        if (!spec?.outputs.some((o) => o.name === n)) stale.push(`${id}: ${n} is not an output`);
        else if (!(missing[id] ?? []).includes(n)) stale.push(`${id}: ${n} is named in a test now (remove it from the list)`);
      }
      expect(entry.why.length, `${id}: a reason`).toBeGreaterThan(10);
    }
    expect(stale).toEqual([]);
  });
});
