/**
 * Recompute coalescing (widgets/src/compute/coalescer.ts): while a slider moves, at most one job
 * runs and only the newest waiting one follows, so the last position is always computed.
 * (No Worker in Node: the coalescer runs jobs on the page thread, with the same rules.)
 */
import { describe, it, expect, vi } from "vitest";
vi.mock("helicoid:worker-source", () => ({ default: "" }));
import { Coalescer } from "../../../widgets/src/compute/coalescer";
import type { ComputeOutcome } from "../../../widgets/src/compute/job";
import "../fixtures/testSpecs";

describe("coalescer", () => {
  it("runs the first and the last of a burst of requests, and reports outcomes in order", async () => {
    const outcomes: ComputeOutcome[] = [];
    let resolve!: () => void;
    const done = new Promise<void>((r) => (resolve = r));
    const c = new Coalescer((o) => {
      outcomes.push(o);
      if (!c.busy) resolve();
    });
    expect(c.where).toBe("page");
    const Ku = [1.0e6, 1.1e6, 1.2e6, 1.3e6, 1.4e6, 1.5e6];
    for (const k of Ku) c.submit({ calculator: "test-wall-width", inputs: { Ms: 1.1e6, A: 1.5e-11, Ku: k }, sweep: null });
    await done;
    expect(outcomes.length).toBe(2);
    expect(outcomes[0]!.seq).toBeLessThan(outcomes[1]!.seq);
    const last = outcomes[1]!;
    expect(last.ok).toBe(true);
    if (last.ok) expect(last.result.inputs.Ku!.value).toBe(1.5e6);
    c.dispose();
  });

  it("reports a calculator error as an outcome naming the parameter", async () => {
    const got = await new Promise<ComputeOutcome>((res) => {
      const c = new Coalescer(res);
      c.submit({ calculator: "test-wall-width", inputs: { Ms: 2e6, A: 1.5e-11, Ku: 1e6 }, sweep: null });
    });
    expect(got.ok).toBe(false);
    if (!got.ok) {
      expect(got.parameter).toBe("Ku");
      expect(got.error).toContain("Ku");
    }
  });
});
