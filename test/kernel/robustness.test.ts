/**
 * Hostile and odd requests to a real `helicoid kernel` process over ZeroMQ (the project's Node
 * client signs like a Jupyter front end). After each case the kernel is alive and answers 1 + 1.
 * Expected answers follow ipykernel's behaviour (the reference kernel) and the Jupyter messaging
 * and widget protocol documents; each case says which.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { startKernel, type JupyterMessage, type RunningKernel } from "../helpers/kernel.js";

let k: RunningKernel;
beforeAll(async () => {
  k = await startKernel();
}, 90_000);
afterAll(async () => {
  await k?.stop();
});

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));
const resultText = (outputs: JupyterMessage[]) => outputs.find((m) => m.header.msg_type === "execute_result")?.content.data["text/plain"];
const since = (from: number, type?: string) => k.client.iopubMessages.slice(from).filter((m) => !type || m.header.msg_type === type);

async function alive(): Promise<void> {
  const { reply, outputs } = await k.client.execute("1 + 1");
  expect(reply.content.status).toBe("ok");
  expect(resultText(outputs)).toBe("2");
  expect(k.proc.exitCode).toBeNull();
}

async function value(expr: string): Promise<string | undefined> {
  const { reply, outputs } = await k.client.execute(expr);
  expect(reply.content.status, JSON.stringify(reply.content)).toBe("ok");
  return resultText(outputs);
}

/** Open a slider in the kernel; returns its comm id. */
async function slider(name: string, opts = "{ min: 0, max: 10, value: 1 }"): Promise<string> {
  const from = k.client.iopubMessages.length;
  await value(`import { slider } from "@helicoid/kernel";\nconst ${name} = slider(${opts});\n${name}.id`);
  const open = since(from, "comm_open").find((m) => m.content.data.state._model_name === "FloatSliderModel");
  expect(open).toBeDefined();
  return open!.content.comm_id;
}

async function update(commId: string, state: Record<string, unknown>, opts: { buffer_paths?: unknown; buffers?: Buffer[] } = {}): Promise<JupyterMessage[]> {
  const from = k.client.iopubMessages.length;
  const id = await k.client.send("comm_msg", { comm_id: commId, data: { method: "update", state, buffer_paths: opts.buffer_paths ?? [] } }, { buffers: opts.buffers });
  await k.client.idleAfter(id, 20_000);
  return since(from).filter((m) => m.parent_header.msg_id === id && m.header.msg_type !== "status");
}

describe("widget callbacks run interruptibly, like cells", () => {
  let cid = "";
  it("interrupt_request stops a callback that loops forever", async () => {
    cid = await slider("spin");
    await value('let spins = 0; spin.onChange("value", () => { spins++; while (true) {} }); spins');
    const from = k.client.iopubMessages.length;
    const id = await k.client.send("comm_msg", { comm_id: cid, data: { method: "update", state: { value: 3 }, buffer_paths: [] } });
    await sleep(800);
    // The control channel answers although the kernel's thread is busy in the loop.
    const ir = await k.client.request("interrupt_request", {}, "control", 10_000);
    expect(ir.header.msg_type).toBe("interrupt_reply");
    expect(ir.content.status).toBe("ok");
    await k.client.idleAfter(id, 20_000);
    const err = since(from, "error").find((m) => m.parent_header.msg_id === id);
    expect(err?.content.evalue).toMatch(/interrupted/i);
    await alive();
    expect(await value("spins")).toBe("1");
  });

  it("SIGINT stops it too", async () => {
    const from = k.client.iopubMessages.length;
    const id = await k.client.send("comm_msg", { comm_id: cid, data: { method: "update", state: { value: 5 }, buffer_paths: [] } });
    await sleep(800);
    k.proc.kill("SIGINT");
    await k.client.idleAfter(id, 20_000);
    expect(since(from, "error").some((m) => m.parent_header.msg_id === id && /interrupted/i.test(m.content.evalue))).toBe(true);
    await alive();
    expect(await value("spins")).toBe("2");
  });

  it("the heartbeat answers while the kernel is busy", async () => {
    const { Request } = await import("zeromq");
    const hb = new Request();
    hb.connect(`tcp://${k.conn.ip}:${k.conn.hb_port}`);
    hb.receiveTimeout = 5_000;
    const busy = k.client.execute("const t0 = Date.now(); while (Date.now() - t0 < 3000) {}");
    await sleep(500);
    await hb.send("ping");
    const [pong] = await hb.receive();
    hb.close();
    expect(pong!.toString()).toBe("ping");
    expect((await busy).reply.content.status).toBe("ok");
  });
});

describe("replayed messages", () => {
  it("runs a signed execute_request replayed three times once (ipykernel drops replays)", async () => {
    await value("globalThis.replayHits = 0");
    const { frames } = k.client.frames("execute_request", { code: "globalThis.replayHits++", silent: false, store_history: false });
    const shell = (k.client as unknown as { shell: { send(f: Buffer[]): Promise<void> } }).shell;
    for (let i = 0; i < 3; i++) await shell.send(frames);
    await sleep(1_500);
    expect(await value("globalThis.replayHits")).toBe("1");
    expect(k.stderr()).toMatch(/replayed signature/);
    await alive();
  });
});

describe("widget state from the front end is validated", () => {
  let cid = "";
  it("refuses a slider value of the wrong kind and answers with the kernel's value", async () => {
    cid = await slider("v", "{ min: 0, max: 10, value: 4 }");
    for (const bad of ["abc", null, [1, 2], true]) {
      const msgs = await update(cid, { value: bad });
      // Source: ipywidgets answers a refused value with the kernel's state of that key.
      const upd = msgs.find((m) => m.header.msg_type === "comm_msg" && m.content.data.method === "update");
      expect(upd?.content.data.state, JSON.stringify(bad)).toEqual({ value: 4 });
      expect(msgs.some((m) => m.header.msg_type === "comm_msg" && m.content.data.method === "echo_update")).toBe(false);
      const err = msgs.find((m) => m.header.msg_type === "error");
      expect(err?.content.evalue).toMatch(/value = .*expected a number/);
      expect(await value("v.value")).toBe("4");
    }
    await alive();
  });

  it("refuses min > max, step 0 and step -1", async () => {
    for (const bad of [{ min: 20 }, { min: 5, max: 2 }, { step: 0 }, { step: -1 }]) {
      const msgs = await update(cid, bad);
      const upd = msgs.find((m) => m.header.msg_type === "comm_msg" && m.content.data.method === "update");
      expect(upd, JSON.stringify(bad)).toBeDefined();
      expect(Object.keys(upd!.content.data.state).sort()).toEqual(Object.keys(bad).sort());
      expect(msgs.find((m) => m.header.msg_type === "error")?.content.evalue).toMatch(/min = .* > max|step = .*expected a number > 0/);
    }
    expect(await value("[v.get('min'), v.get('max'), v.get('step'), v.value]")).toBe("[ 0, 10, 0.1, 4 ]");
    // A good update still works.
    await update(cid, { min: 1, max: 8, step: 0.5 });
    expect(await value("[v.get('min'), v.get('max'), v.get('step')]")).toBe("[ 1, 8, 0.5 ]");
    await alive();
  });

  it("refuses a dropdown index outside its options and a text value that is not text", async () => {
    const from = k.client.iopubMessages.length;
    await value(
      'import { dropdown, textBox } from "@helicoid/kernel";\nconst dd = dropdown({ options: ["Bloch", "Neel", "mixed"], value: "Neel" });\nconst tb = textBox({ value: "film" });\n[dd.id, tb.id]',
    );
    const opens = since(from, "comm_open");
    const ddId = opens.find((m) => m.content.data.state._model_name === "DropdownModel")!.content.comm_id;
    const tbId = opens.find((m) => m.content.data.state._model_name === "TextModel")!.content.comm_id;
    for (const bad of [3, -1, 1.5, "1"]) {
      const msgs = await update(ddId, { index: bad });
      expect(msgs.find((m) => m.header.msg_type === "comm_msg" && m.content.data.method === "update")?.content.data.state, JSON.stringify(bad)).toEqual({ index: 1 });
    }
    await update(ddId, { index: 2 });
    expect(await value("dd.value")).toBe("'mixed'");
    for (const bad of [5, null, { a: 1 }]) {
      const msgs = await update(tbId, { value: bad });
      expect(msgs.find((m) => m.header.msg_type === "comm_msg" && m.content.data.method === "update")?.content.data.state, JSON.stringify(bad)).toEqual({ value: "film" });
    }
    // A key the model does not have is refused, not added.
    await update(tbId, { not_an_attribute: 1 });
    expect(await value("'not_an_attribute' in tb.getState()")).toBe("false");
    await alive();
  });

  it("never follows a buffer path through __proto__, constructor or prototype", async () => {
    for (const path of [["__proto__", "toString"], ["constructor", "prototype", "polluted"], ["__proto__"], ["value", "__proto__", "x"]]) {
      const msgs = await update(cid, {}, { buffer_paths: [path], buffers: [Buffer.from([1, 2, 3])] });
      expect(msgs.find((m) => m.header.msg_type === "error")?.content.evalue, JSON.stringify(path)).toMatch(/refused|not an attribute|does not lead/);
    }
    expect(await value("[typeof Object.prototype.toString, String({}), 'polluted' in Object.prototype, ({} as any).x === undefined]")).toBe(
      "[ 'function', '[object Object]', false, true ]",
    );
    // A state key named __proto__ is refused as data, never applied as a prototype.
    await update(cid, JSON.parse('{"__proto__": {"polluted": 1}}'));
    expect(await value("[Object.getPrototypeOf(v.getState()) === Object.prototype, 'polluted' in ({} as any)]")).toBe("[ true, false ]");
    await alive();
  });
});

describe("every request gets a reply", () => {
  const cases: Array<[string, Record<string, unknown>, string]> = [
    ["complete_request", {}, "error"],
    ["complete_request", { code: 42, cursor_pos: 0 }, "error"],
    ["complete_request", { code: "Math.ab", cursor_pos: 99 }, "error"],
    ["complete_request", { code: "Math.ab", cursor_pos: -1 }, "error"],
    ["complete_request", { code: "Math.ab", cursor_pos: "7" }, "error"],
    ["complete_request", { code: "Math.ab" }, "ok"],
    ["inspect_request", { code: "Math", cursor_pos: 1e9 }, "error"],
    ["inspect_request", { code: null }, "error"],
    ["is_complete_request", {}, "unknown"],
    ["is_complete_request", { code: 7 }, "unknown"],
    ["is_complete_request", { code: ["1"] }, "unknown"],
    ["history_request", { hist_access_type: "nonsense" }, "error"],
    ["history_request", { hist_access_type: "tail", n: -3 }, "error"],
    ["execute_request", { code: { not: "text" } }, "error"],
    ["execute_request", { silent: false }, "error"],
  ];
  for (const [type, content, status] of cases) {
    it(`${type} ${JSON.stringify(content)} -> ${status}`, async () => {
      const r = await k.client.request(type, content, "shell", 10_000);
      expect(r.header.msg_type).toBe(type.replace("_request", "_reply"));
      expect(r.content.status).toBe(status);
      if (status === "error") expect(r.content.evalue).toMatch(/expected/);
    });
  }
  it("is alive afterwards", alive);
});

describe("is_complete from the TypeScript parser", () => {
  // Source: Jupyter messaging spec, is_complete_request (complete / incomplete / invalid).
  const cases: Array<[string, string]> = [
    ["const 1x = 2", "invalid"],
    ["let = 7q", "invalid"],
    ["}", "invalid"],
    ['const s = "abc', "invalid"],
    ["function f() {", "incomplete"],
    ["const xs = [1,\n", "incomplete"],
    ["if (a) {\n  b();", "incomplete"],
    ["const y = `line", "incomplete"],
    ["1 + 1", "complete"],
    ["const a = 1;", "complete"],
    ["Math.max?", "complete"],
  ];
  for (const [code, status] of cases) {
    it(`${JSON.stringify(code)} is ${status}`, async () => {
      const r = await k.client.request("is_complete_request", { code });
      expect(r.content.status).toBe(status);
      if (status === "incomplete") expect(typeof r.content.indent).toBe("string");
    });
  }
});

describe("history, as ipykernel keeps it", () => {
  it("answers tail, range and search (glob, unique, n) with and without output", async () => {
    await value("const hx = 6 * 7; hx");
    await value("hx + 1");
    await value("hx + 1");
    const tail = await k.client.request("history_request", { hist_access_type: "tail", n: 3, output: false, raw: true });
    expect(tail.content.status).toBe("ok");
    const entries = tail.content.history as Array<[number, number, string]>;
    expect(entries.map((e) => e[2])).toEqual(["const hx = 6 * 7; hx", "hx + 1", "hx + 1"]);
    const [session, line] = entries[0]!;
    const withOut = await k.client.request("history_request", { hist_access_type: "tail", n: 3, output: true, raw: true });
    expect(withOut.content.history[0][2]).toEqual(["const hx = 6 * 7; hx", "42"]);
    const range = await k.client.request("history_request", { hist_access_type: "range", session, start: line, stop: line + 2, output: false, raw: true });
    expect(range.content.history.map((e: unknown[]) => e[1])).toEqual([line, line + 1]);
    const search = await k.client.request("history_request", { hist_access_type: "search", pattern: "hx ?*", output: false, raw: true });
    expect(search.content.history.map((e: unknown[]) => e[2])).toEqual(["hx + 1", "hx + 1"]);
    const unique = await k.client.request("history_request", { hist_access_type: "search", pattern: "hx ?*", unique: true, output: false, raw: true });
    expect(unique.content.history.map((e: unknown[]) => e[1])).toEqual([line + 2]);
    const lastOne = await k.client.request("history_request", { hist_access_type: "search", pattern: "*6 [*] 7*", n: 1, output: false, raw: true });
    expect(lastOne.content.history.map((e: unknown[]) => e[2])).toEqual(["const hx = 6 * 7; hx"]);
    await alive();
  });
});

describe("the pager", () => {
  it("answers X? with a page payload of the inspection, without running anything", async () => {
    await value("/** How far the wall moves. */\nconst wallShift = 3;");
    const { reply, outputs } = await k.client.execute("wallShift?");
    expect(reply.content.status).toBe("ok");
    // Source: Jupyter messaging spec, execute_reply payloads ("page" with a mime bundle).
    expect(reply.content.payload).toHaveLength(1);
    expect(reply.content.payload[0].source).toBe("page");
    expect(reply.content.payload[0].data["text/plain"]).toMatch(/wallShift/);
    expect(reply.content.payload[0].data["text/plain"]).toMatch(/How far the wall moves/);
    expect(outputs.filter((m) => m.header.msg_type === "error")).toEqual([]);
    const math = await k.client.execute("Math.max?");
    expect(math.reply.content.payload[0].data["text/plain"]).toMatch(/max/);
    await alive();
  });
});

describe("names that begin with two underscores", () => {
  it("are kept between statements and cells (TypeScript's escaped names do not leak)", async () => {
    expect(await value("const __k = 1; __k + 1")).toBe("2");
    expect(await value("__k + 2")).toBe("3");
    expect(await value("let ___t = 10; function __f() { return ___t * 2; }\n__f()")).toBe("20");
    expect(await value("__f() + ___t")).toBe("30");
    await alive();
  });
});

describe("object shorthand for a variable of an earlier cell", () => {
  // Common practice, no source: `{ a }` is JavaScript's shorthand for `{ a: a }` (ECMAScript 2015).
  it("reads and assigns the variable, with and without a default", async () => {
    await value("const shJz = 3; let shJp = 1; 0");
    expect(await value("const shO = { shJz, shJp };\nconst shF = () => ({ shJz });\n[shO, shF()]")).toBe("[ { shJz: 3, shJp: 1 }, { shJz: 3 } ]");
    expect(await value("({ shJp = 9 } = { shJp: undefined } as any);\nshJp")).toBe("9");
    expect(await value("({ shJp } = { shJp: 5 });\n[shJp, { shJz }]")).toBe("[ 5, { shJz: 3 } ]");
    await alive();
  });
});

describe("interrupting asynchronous work", () => {
  it("stops a cell's timers, intervals and awaiting loops", async () => {
    await value(
      "let ticks = 0;\n(async () => { while (true) { await new Promise((r) => setTimeout(r, 10)); ticks++; } })();\nsetInterval(() => { ticks += 1000; }, 30);\nsetTimeout(() => { ticks = -1; }, 5_000);\n'started'",
    );
    await sleep(400);
    expect(Number(await value("ticks"))).toBeGreaterThan(0);
    const ir = await k.client.request("interrupt_request", {}, "control", 10_000);
    expect(ir.content.status).toBe("ok");
    // The interrupt travels control process -> SIGINT -> kernel: on a loaded machine it can take a
    // while to land. Wait until the counter rests (at most 10 s), then check it stays at rest.
    await sleep(1000);
    let a = await value("ticks");
    for (let i = 0; i < 20; i++) {
      await sleep(500);
      const b = await value("ticks");
      if (b === a) break;
      a = b;
    }
    await sleep(800);
    expect(await value("ticks")).toBe(a);
    // New timers of new cells work.
    expect(await value("await new Promise((r) => setTimeout(() => r(7), 20))")).toBe("7");
    await alive();
  });

  it("an interrupted awaiting cell ends with an error reply and its timers stop", async () => {
    await value("let late = 0");
    const pending = k.client.execute("setInterval(() => late++, 20); await new Promise(() => {})");
    await sleep(600);
    // As a front end interrupts this kernel (its kernelspec says interrupt_mode "message"). The
    // interrupt must land even if the cell is still being compiled on a loaded machine.
    const ir = await k.client.request("interrupt_request", {}, "control", 10_000);
    expect(ir.content.status).toBe("ok");
    const { reply } = await pending;
    expect(reply.content.status).toBe("error");
    await sleep(100);
    const a = await value("late");
    await sleep(500);
    expect(await value("late")).toBe(a);
    await alive();
  });
});

describe("errors thrown later by a cell", () => {
  it("are shown under the cell they came from, and the kernel lives on", async () => {
    const { reply } = await k.client.execute(
      'setTimeout(() => { throw new Error("late from a timer"); }, 30);\nPromise.reject(new Error("late rejection"));\nsetImmediate(() => { throw new RangeError("late immediate"); });\n1',
    );
    expect(reply.content.status).toBe("ok");
    await sleep(600);
    const errs = k.client.iopubMessages.filter((m) => m.header.msg_type === "error" && m.parent_header.msg_id === reply.requestId);
    expect(errs.map((m) => m.content.evalue).sort()).toEqual(["late from a timer", "late immediate", "late rejection"]);
    expect(errs.find((m) => m.content.evalue === "late immediate")?.content.ename).toBe("RangeError");
    expect(k.stderr()).not.toMatch(/late from a timer/);
    await alive();
  });
});

describe("the widget front end's version check", () => {
  it("answers a comm on jupyter.widget.version with the expected front-end version", async () => {
    const from = k.client.iopubMessages.length;
    // Source: ipywidgets packages/schema/messages.md, "The jupyter.widget.version comm target".
    await k.client.send("comm_open", { comm_id: "version-1", target_name: "jupyter.widget.version", data: {} });
    const msg = await k.client.waitFor((m) => m.header.msg_type === "comm_msg" && m.content.comm_id === "version-1", 10_000, from);
    expect(msg.content.data.version).toMatch(/^[~^]?2\.\d+\.\d+$/);
    expect(since(from, "comm_close").some((m) => m.content.comm_id === "version-1")).toBe(false);
    await k.client.send("comm_msg", { comm_id: "version-1", data: { frontend_version: "2.0.0", validated: true } });
    await alive();
  });
});

describe("stream output", () => {
  it("coalesces many writes into few messages, in order and complete", async () => {
    const { reply, outputs } = await k.client.execute('for (let i = 0; i < 5000; i++) console.log("line " + i);\nconsole.error("done");\n"end"');
    expect(reply.content.status).toBe("ok");
    const streams = outputs.filter((m) => m.header.msg_type === "stream");
    const out = streams
      .filter((m) => m.content.name === "stdout")
      .map((m) => m.content.text)
      .join("");
    expect(out).toBe(Array.from({ length: 5000 }, (_, i) => `line ${i}\n`).join(""));
    expect(streams.length).toBeLessThan(10);
    // The order of messages is kept: stdout, then stderr, then the result.
    const kinds = outputs.map((m) => (m.header.msg_type === "stream" ? m.content.name : m.header.msg_type));
    expect(kinds.lastIndexOf("stdout")).toBeLessThan(kinds.indexOf("stderr"));
    expect(kinds.indexOf("stderr")).toBeLessThan(kinds.indexOf("execute_result"));
    await alive();
  });
});
