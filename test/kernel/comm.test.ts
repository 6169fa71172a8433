/**
 * A real comm round trip over ZeroMQ: a Node client that signs messages like a Jupyter front end
 * talks to a real `helicoid kernel` process. Checks the comm protocol and the widget message
 * protocol 2.1 (echo_update semantics, request_state, request_states, buffers, custom messages)
 * and the kernel's robustness (throwing callbacks, bad signatures, unknown comm ids, bad state).
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { readdirSync, readFileSync, readlinkSync } from "node:fs";
import { startKernel, type JupyterMessage, type RunningKernel } from "../helpers/kernel.js";

let k: RunningKernel;
beforeAll(async () => {
  k = await startKernel();
});
afterAll(async () => {
  await k?.stop();
});

const resultText = (outputs: JupyterMessage[]) => outputs.find((m) => m.header.msg_type === "execute_result")?.content.data["text/plain"];

async function openSlider(): Promise<{ commId: string; open: JupyterMessage }> {
  const from = k.client.iopubMessages.length;
  const { reply, outputs } = await k.client.execute(
    'import { slider } from "@helicoid/kernel";\nconst s = slider({ min: 0, max: 10, value: 1, description: "x" });\nconst seen: number[] = [];\ns.onChange("value", (v) => seen.push(v));\ns',
  );
  expect(reply.content.status).toBe("ok");
  const open = k.client.iopubMessages.slice(from).find((m) => m.header.msg_type === "comm_open" && m.content.data.state._model_name === "FloatSliderModel")!;
  expect(open).toBeDefined();
  const view = outputs.find((m) => m.header.msg_type === "execute_result")!;
  expect(view.content.data["application/vnd.jupyter.widget-view+json"]).toEqual({ version_major: 2, version_minor: 0, model_id: open.content.comm_id });
  return { commId: open.content.comm_id, open };
}

describe("comm and widget protocol over ZeroMQ", () => {
  let commId = "";

  it("opens a slider with its full state (protocol 2.1 metadata)", async () => {
    const r = await openSlider();
    commId = r.commId;
    // Source: jupyter-widgets/ipywidgets packages/schema/messages.md (comm_open with state and buffer_paths).
    expect(r.open.content.target_name).toBe("jupyter.widget");
    expect(r.open.metadata.version).toBe("2.1.0");
    expect(r.open.content.data.state).toMatchObject({
      _model_module: "@jupyter-widgets/controls",
      _model_module_version: "2.0.0",
      _view_name: "FloatSliderView",
      value: 1,
      min: 0,
      max: 10,
      description: "x",
    });
    expect(r.open.content.data.buffer_paths).toEqual([]);
  });

  it("applies a front-end update, echoes it, and runs the kernel-side observer", async () => {
    const from = k.client.iopubMessages.length;
    const id = await k.client.send("comm_msg", { comm_id: commId, data: { method: "update", state: { value: 7.5 }, buffer_paths: [] } });
    const echo = await k.client.waitFor((m) => m.header.msg_type === "comm_msg" && m.content.data.method === "echo_update", 10_000, from);
    // Source: ipywidgets protocol 2.1: the kernel echoes received state with the update as parent.
    expect(echo.parent_header.msg_id).toBe(id);
    expect(echo.content.data.state).toEqual({ value: 7.5 });
    await k.client.idleAfter(id);
    // The value the front end sent is not sent back as an update (it already has it).
    const updates = k.client.iopubMessages.slice(from).filter((m) => m.header.msg_type === "comm_msg" && m.content.data.method === "update");
    expect(updates).toEqual([]);
    const { outputs } = await k.client.execute("seen");
    expect(resultText(outputs)).toBe("[ 7.5 ]");
  });

  it("sends back a value the kernel had to change (clamped to max)", async () => {
    const from = k.client.iopubMessages.length;
    const id = await k.client.send("comm_msg", { comm_id: commId, data: { method: "update", state: { value: 20 }, buffer_paths: [] } });
    await k.client.idleAfter(id);
    const msgs = k.client.iopubMessages.slice(from).filter((m) => m.header.msg_type === "comm_msg");
    expect(msgs.map((m) => m.content.data.method)).toEqual(["echo_update", "update"]);
    expect(msgs[1]!.content.data.state).toEqual({ value: 10 });
  });

  it("sends kernel-side changes to the front end", async () => {
    const from = k.client.iopubMessages.length;
    await k.client.execute("s.value = 3");
    const upd = await k.client.waitFor((m) => m.header.msg_type === "comm_msg" && m.content.data.method === "update" && m.content.comm_id === commId, 5_000, from);
    expect(upd.content.data.state).toEqual({ value: 3 });
  });

  it("answers request_state with the full state", async () => {
    const from = k.client.iopubMessages.length;
    const id = await k.client.send("comm_msg", { comm_id: commId, data: { method: "request_state" } });
    const upd = await k.client.waitFor((m) => m.header.msg_type === "comm_msg" && m.parent_header.msg_id === id, 5_000, from);
    expect(upd.content.data.method).toBe("update");
    expect(upd.content.data.state).toMatchObject({ value: 3, min: 0, max: 10, _model_name: "FloatSliderModel" });
  });

  it("shows an exception thrown in a callback, and the kernel stays alive", async () => {
    await k.client.execute('s.onChange("value", () => { throw new Error("callback failed on purpose"); })');
    const from = k.client.iopubMessages.length;
    const id = await k.client.send("comm_msg", { comm_id: commId, data: { method: "update", state: { value: 4 }, buffer_paths: [] } });
    const err = await k.client.waitFor((m) => m.header.msg_type === "error" && m.parent_header.msg_id === id, 10_000, from);
    expect(err.content.evalue).toBe("callback failed on purpose");
    // It also lands in the output area under the widget (an Output widget's outputs state).
    const shown = await k.client.waitFor(
      (m) => m.header.msg_type === "comm_msg" && m.content.data.method === "update" && JSON.stringify(m.content.data.state.outputs ?? "").includes("callback failed on purpose"),
      10_000,
      from,
    );
    expect(shown.content.data.state.outputs[0].output_type).toBe("error");
    const { outputs } = await k.client.execute("1 + 1");
    expect(resultText(outputs)).toBe("2");
    expect(k.proc.exitCode).toBeNull();
  });

  it("survives a bad signature, an unknown comm id and a malformed state", async () => {
    await k.client.send("execute_request", { code: "process.exit(3)", silent: false }, { tamper: true });
    await k.client.send("comm_msg", { comm_id: "no-such-comm", data: { method: "update", state: { value: 1 } } });
    const from = k.client.iopubMessages.length;
    const bad = await k.client.send("comm_msg", { comm_id: commId, data: { method: "update", state: "not an object" } });
    const err = await k.client.waitFor((m) => m.header.msg_type === "error" && m.parent_header.msg_id === bad, 10_000, from);
    expect(err.content.evalue).toMatch(/without a state object/);
    const { outputs } = await k.client.execute("2 + 3");
    expect(resultText(outputs)).toBe("5");
    expect(k.proc.exitCode).toBeNull();
    expect(k.stderr()).toMatch(/invalid message signature/);
    expect(k.stderr()).toMatch(/unknown comm id 'no-such-comm'/);
  });

  it("carries binary buffers both ways and custom messages", async () => {
    const from = k.client.iopubMessages.length;
    await k.client.execute(
      'import { Widget } from "@helicoid/kernel";\n' +
        'const w = new Widget({ model: { name: "ProbeModel", module: "probe", version: "1.0.0" }, state: { data: new Float64Array([1, 2, 3]) } });\n' +
        "let got: number[] = []; let custom: unknown = null;\n" +
        'w.onChange("data", (v) => { const d = v as unknown as DataView; got = [0, 1].map((i) => d.getFloat64(8 * i, true)); });\n' +
        "w.onCustom((c, b) => { custom = { c, n: b.length, first: b[0]?.getUint8(0) }; w.send({ pong: true }, [new Uint8Array([9, 8])]); });\n" +
        "w.id",
    );
    const open = k.client.iopubMessages.slice(from).find((m) => m.header.msg_type === "comm_open" && m.content.data.state._model_name === "ProbeModel")!;
    expect(open.content.data.buffer_paths).toEqual([["data"]]);
    expect(open.content.data.state.data).toBeUndefined();
    expect([...new Float64Array(new Uint8Array(open.buffers[0]!).buffer)]).toEqual([1, 2, 3]);
    const wid = open.content.comm_id;
    const buf = Buffer.from(new Float64Array([5, 6]).buffer);
    const id = await k.client.send("comm_msg", { comm_id: wid, data: { method: "update", state: {}, buffer_paths: [["data"]] } }, { buffers: [buf] });
    await k.client.idleAfter(id);
    expect(resultText((await k.client.execute("got")).outputs)).toBe("[ 5, 6 ]");
    const from2 = k.client.iopubMessages.length;
    const cid = await k.client.send("comm_msg", { comm_id: wid, data: { method: "custom", content: { ping: 1 } } }, { buffers: [Buffer.from([7])] });
    const pong = await k.client.waitFor((m) => m.header.msg_type === "comm_msg" && m.content.data.method === "custom" && m.parent_header.msg_id === cid, 5_000, from2);
    expect(pong.content.data.content).toEqual({ pong: true });
    expect([...pong.buffers[0]!]).toEqual([9, 8]);
    expect(resultText((await k.client.execute("JSON.stringify(custom)")).outputs)).toBe(`'{"c":{"ping":1},"n":1,"first":7}'`);
  });

  it("answers request_states on jupyter.widget.control and lists comms by target", async () => {
    const from = k.client.iopubMessages.length;
    await k.client.send("comm_open", { comm_id: "control-1", target_name: "jupyter.widget.control", data: {} });
    const id = await k.client.send("comm_msg", { comm_id: "control-1", data: { method: "request_states" } });
    const states = await k.client.waitFor((m) => m.header.msg_type === "comm_msg" && m.parent_header.msg_id === id, 5_000, from);
    expect(states.content.data.method).toBe("update_states");
    expect(states.content.data.states[commId]).toMatchObject({ model_name: "FloatSliderModel", model_module: "@jupyter-widgets/controls", state: { value: 4 } });
    expect(states.content.data.buffer_paths.some((p: unknown[]) => p[1] === "data")).toBe(true);
    const info = await k.client.request("comm_info_request", { target_name: "jupyter.widget.control" });
    expect(info.header.msg_type).toBe("comm_info_reply");
    expect(info.content.comms).toEqual({ "control-1": { target_name: "jupyter.widget.control" } });
    // A comm for a target the kernel does not have is closed at once.
    const from3 = k.client.iopubMessages.length;
    await k.client.send("comm_open", { comm_id: "stray", target_name: "no.such.target", data: {} });
    const closed = await k.client.waitFor((m) => m.header.msg_type === "comm_close" && m.content.comm_id === "stray", 5_000, from3);
    expect(closed).toBeDefined();
  });

  it("clicks a button and links two widgets", async () => {
    const from = k.client.iopubMessages.length;
    await k.client.execute(
      'import { button, intSlider, link } from "@helicoid/kernel";\nconst b = button({ description: "go" }); let clicks = 0; b.onClick(() => clicks++);\nconst a1 = intSlider({ max: 50 }); const a2 = intSlider({ max: 50 }); link([a1, "value"], [a2, "value"]);\nb',
    );
    const bopen = k.client.iopubMessages.slice(from).find((m) => m.header.msg_type === "comm_open" && m.content.data.state._model_name === "ButtonModel")!;
    const sliders = k.client.iopubMessages.slice(from).filter((m) => m.header.msg_type === "comm_open" && m.content.data.state._model_name === "IntSliderModel");
    const id = await k.client.send("comm_msg", { comm_id: bopen.content.comm_id, data: { method: "custom", content: { event: "click" } } });
    await k.client.idleAfter(id);
    const id2 = await k.client.send("comm_msg", { comm_id: sliders[0]!.content.comm_id, data: { method: "update", state: { value: 17 }, buffer_paths: [] } });
    await k.client.idleAfter(id2);
    expect(resultText((await k.client.execute("[clicks, a2.value]")).outputs)).toBe("[ 1, 17 ]");
  });

  it("interrupts a running cell (interrupt_request and SIGINT)", async () => {
    const pending = k.client.execute("await new Promise((r) => setTimeout(r, 60_000))");
    await new Promise((r) => setTimeout(r, 1_500));
    const ir = await k.client.request("interrupt_request", {}, "control");
    expect(ir.header.msg_type).toBe("interrupt_reply");
    const { reply } = await pending;
    expect(reply.content.status).toBe("error");
    const busy = k.client.execute("let i = 0; while (true) { i++; }");
    await new Promise((r) => setTimeout(r, 1_500));
    k.proc.kill("SIGINT");
    const { reply: r2 } = await busy;
    expect(r2.content.status).toBe("error");
    expect(resultText((await k.client.execute("40 + 2")).outputs)).toBe("42");
  });

  it("binds only to the addresses of its connection file", () => {
    // The kernel and its control/heartbeat helper process (a child of the kernel).
    const pid = k.proc.pid!;
    const children = readFileSync(`/proc/${pid}/task/${pid}/children`, "utf8").trim().split(/\s+/).filter(Boolean).map(Number);
    expect(children.length).toBeGreaterThanOrEqual(1);
    const inodes = new Set(
      [pid, ...children]
        .flatMap((p) =>
          readdirSync(`/proc/${p}/fd`).map((fd) => {
            try {
              return /socket:\[(\d+)\]/.exec(readlinkSync(`/proc/${p}/fd/${fd}`))?.[1];
            } catch {
              return undefined;
            }
          }),
        )
        .filter(Boolean),
    );
    const listening: string[] = [];
    for (const table of ["/proc/net/tcp", "/proc/net/tcp6"]) {
      for (const line of readFileSync(table, "utf8").split("\n").slice(1)) {
        const f = line.trim().split(/\s+/);
        if (f.length < 10 || f[3] !== "0A" || !inodes.has(f[9])) continue;
        const [hexIp, hexPort] = f[1]!.split(":");
        const ip =
          hexIp!.length === 8
            ? hexIp!
                .match(/../g)!
                .reverse()
                .map((h) => parseInt(h, 16))
                .join(".")
            : `v6:${hexIp}`;
        listening.push(`${ip}:${parseInt(hexPort!, 16)}`);
      }
    }
    const c = k.conn;
    const expected = [c.shell_port, c.iopub_port, c.stdin_port, c.control_port, c.hb_port].map((p) => `127.0.0.1:${p}`).sort();
    expect(listening.sort()).toEqual(expected);
  });

  it("shuts down on shutdown_request", async () => {
    const r = await k.client.request("shutdown_request", { restart: false }, "control");
    expect(r.content).toMatchObject({ status: "ok", restart: false });
    await new Promise<void>((res) => (k.proc.exitCode !== null ? res() : k.proc.once("exit", () => res())));
    expect(k.proc.exitCode, `${k.proc.signalCode}\n${k.stderr()}`).toBe(0);
  });
});
