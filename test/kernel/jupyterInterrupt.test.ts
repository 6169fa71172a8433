/**
 * Interrupting the kernel the way Jupyter does it: Debian's jupyter_client starts the installed
 * kernelspec and calls `KernelManager.interrupt_kernel()`, which follows the spec's
 * `interrupt_mode` (source: the Jupyter client documentation, "Kernel specs" and "Kernel interrupt").
 * A cell that awaits forever while its intervals tick many times a second must end with an error
 * reply, its timers must stop, and the kernel must live on, every time.
 */
import { describe, expect, it } from "vitest";
import { installKernelspec } from "../helpers/kernel.js";
import { runPython } from "../helpers/python.js";

const SCRIPT = String.raw`
import json, sys, time, queue
from jupyter_client.manager import KernelManager
km = KernelManager(kernel_name="helicoid")
km.start_kernel()
kc = km.client()
kc.start_channels()
kc.wait_for_ready(timeout=120)
out = {"mode": km.kernel_spec.interrupt_mode, "rounds": []}

def run(code, timeout=60):
    msg_id = kc.execute(code)
    reply = kc.get_shell_msg(timeout=timeout)
    while reply["parent_header"].get("msg_id") != msg_id:
        reply = kc.get_shell_msg(timeout=timeout)
    result = None
    while True:
        m = kc.get_iopub_msg(timeout=timeout)
        if m["parent_header"].get("msg_id") != msg_id: continue
        if m["msg_type"] == "execute_result": result = m["content"]["data"]["text/plain"]
        if m["msg_type"] == "status" and m["content"]["execution_state"] == "idle": break
    return reply["content"]["status"], result

for i in range(5):
    run("globalThis.late = 0")
    msg_id = kc.execute("setInterval(() => (globalThis as any).late++, 5); setTimeout(() => {}, 7); await new Promise(() => {})")
    time.sleep(0.3 + 0.1 * i)
    km.interrupt_kernel()
    reply = kc.get_shell_msg(timeout=60)
    while reply["parent_header"].get("msg_id") != msg_id:
        reply = kc.get_shell_msg(timeout=60)
    time.sleep(0.1)
    a = run("globalThis.late")[1]
    time.sleep(0.3)
    b = run("globalThis.late")[1]
    out["rounds"].append({"status": reply["content"]["status"], "ename": reply["content"].get("ename"), "a": a, "b": b, "alive": km.is_alive()})
out["last"] = run("1 + 1")
kc.stop_channels()
km.shutdown_kernel(now=False)
print(json.dumps(out))
`;

describe("interrupt from jupyter_client", () => {
  it("ends an awaiting cell with busy timers by interrupt_request, five times in a row, and the kernel lives", () => {
    const { jupyterPath } = installKernelspec();
    const prev = process.env.JUPYTER_PATH;
    process.env.JUPYTER_PATH = jupyterPath;
    try {
      const r = runPython<{ mode: string; rounds: { status: string; ename: string; a: string; b: string; alive: boolean }[]; last: [string, string] }>(SCRIPT, null, 240_000);
      expect(r.mode).toBe("message");
      expect(r.rounds).toHaveLength(5);
      for (const round of r.rounds) {
        expect(round.status, JSON.stringify(round)).toBe("error");
        expect(round.alive).toBe(true);
        // The interval stopped: the counter rests.
        expect(round.b, JSON.stringify(round)).toBe(round.a);
      }
      expect(r.last).toEqual(["ok", "2"]);
    } finally {
      if (prev === undefined) delete process.env.JUPYTER_PATH;
      else process.env.JUPYTER_PATH = prev;
    }
  }, 300_000);
});
