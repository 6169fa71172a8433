/**
 * computeInWorker in a real kernel: the result equals runCalculator's on the kernel's own thread,
 * the cell shows the elapsed time while it runs, a bad input is the same InputError, and an
 * interrupt stops the worker while the kernel lives on.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { startKernel, type JupyterMessage, type RunningKernel } from "../../helpers/kernel.js";

let k: RunningKernel;
beforeAll(async () => {
  k = await startKernel();
}, 90_000);
afterAll(async () => {
  await k?.stop();
});
const resultText = (outputs: JupyterMessage[]) => outputs.find((m) => m.header.msg_type === "execute_result")?.content.data["text/plain"];

describe("computeInWorker", () => {
  it("gives runCalculator's result, with an elapsed-time line updated in place", async () => {
    const { reply, outputs } = await k.client.execute(
      'import { computeInWorker } from "@helicoid/kernel";\nimport { getCalculator, runCalculator } from "@helicoid/lib";\n' +
        'const inWorker = await computeInWorker("wall", { A: "15 pJ/m", Ku: "1.2 MJ/m^3" });\n' +
        'JSON.stringify(inWorker) === JSON.stringify(runCalculator(getCalculator("wall"), { A: "15 pJ/m", Ku: "1.2 MJ/m^3" }))',
    );
    expect(reply.content.status).toBe("ok");
    expect(resultText(outputs)).toBe("true");
    const shown = outputs.filter((m) => m.header.msg_type === "display_data" || m.header.msg_type === "update_display_data");
    expect(shown[0]?.content.data["text/plain"]).toMatch(/^wall: computing/);
    const id = shown[0]?.content.transient.display_id;
    expect(shown.every((m) => m.content.transient.display_id === id)).toBe(true);
    expect(shown.at(-1)?.content.data["text/plain"]).toMatch(/^wall: done in \d/);
  });

  it("raises the calculator's InputError for a bad input", async () => {
    const { reply, outputs } = await k.client.execute('await computeInWorker("wall", { A: "50 mT" })');
    expect(reply.content.status).toBe("error");
    const err = outputs.find((m) => m.header.msg_type === "error")!;
    expect(err.content.ename).toBe("InputError");
    expect(err.content.evalue).toMatch(/A = "50 mT"/);
  });

  it("stops on interrupt; the kernel answers afterwards", async () => {
    // 2000 sweep points (the most the skyrmion calculator takes), twenty times over: far more work
    // than the 1.5 s before the interrupt on any machine (one alone can finish first on a fast one)
    const pending = k.client.execute('for (let i = 0; i < 20; i++) await computeInWorker("skyrmion", {}, { sweep: { over: "B", from: 0.01, to: 0.3, points: 2000 } })');
    await new Promise((r) => setTimeout(r, 1_500));
    const ir = await k.client.request("interrupt_request", {}, "control", 10_000);
    expect(ir.content.status).toBe("ok");
    const { reply, outputs } = await pending;
    expect(reply.content.status).toBe("error");
    expect(outputs.some((m) => m.header.msg_type === "update_display_data" && /interrupted after/.test(m.content.data["text/plain"]))).toBe(true);
    const { outputs: o2 } = await k.client.execute("1 + 1");
    expect(resultText(o2)).toBe("2");
  });
});
