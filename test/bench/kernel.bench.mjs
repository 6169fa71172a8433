// Kernel benchmarks, side by side in one run:
// - comm round trip on loopback: a front-end `update` of a slider to the kernel's `echo_update`;
// - kernel start to the first kernel_info_reply: ours against tslab's own kernel;
// - stdout throughput: a cell writing 20,000 lines of 1 KB, request sent -> kernel idle with every
//   stream byte received; ours against Debian's ipykernel, interleaved;
// - 10,000 widget updates sent by the front end as fast as the client can, first sent -> kernel idle
//   after the last (each one echoed and applied, the observer run); ours (a slider with an observer)
//   against Debian's ipykernel with a comm target that does what ipywidgets 8 does for an update
//   (echo_update, apply, call the observer). ipywidgets itself is not installed here (Debian has only
//   ipywidgets 6, protocol 1), so the reference leaves out traitlets' validation: it is a floor.
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import client from "../../kernel-ext/dist/comm/client.js";

const root = fileURLToPath(new URL("../..", import.meta.url));
const helicoid = [process.execPath, join(root, "kernel-ext", "bin", "helicoid.js"), "kernel", "--connection-file", "{connection_file}"];
const tslab = [process.execPath, join(root, "node_modules", "tslab", "bin", "tslab"), "kernel", "--config-path", "{connection_file}"];
const median = (a) => [...a].sort((x, y) => x - y)[Math.floor(a.length / 2)];
const python = process.env.HELICOID_PYTHON ?? "/usr/bin/python3";
const ipykernel = [python, "-m", "ipykernel_launcher", "-f", "{connection_file}"];

const LINES = 20_000;
const stdoutCode = {
  ours: `const line = "x".repeat(1023);\nfor (let i = 0; i < ${LINES}; i++) console.log(line);`,
  ipykernel: `line = "x" * 1023\nfor i in range(${LINES}):\n    print(line)`,
};

/** ms from execute_request to idle, with every stream byte checked. */
async function streamMs(k, code) {
  const from = k.client.iopubMessages.length;
  const t0 = performance.now();
  const { reply } = await k.client.execute(code);
  const ms = performance.now() - t0;
  if (reply.content.status !== "ok") throw new Error(`stdout cell failed: ${JSON.stringify(reply.content)}`);
  const bytes = k.client.iopubMessages
    .slice(from)
    .filter((m) => m.header.msg_type === "stream" && m.parent_header.msg_id === reply.requestId)
    .reduce((n, m) => n + m.content.text.length, 0);
  if (bytes !== LINES * 1024) throw new Error(`stdout: got ${bytes} characters, expected ${LINES * 1024}`);
  k.client.iopubMessages.length = 0;
  return ms;
}

const UPDATES = 10_000;
const pythonTarget = [
  "from IPython import get_ipython",
  "bench_seen = []",
  "def bench_open(comm, msg):",
  "    state = dict(value=0)",
  "    def on_msg(m):",
  "        data = m['content']['data']",
  "        if data.get('method') == 'update':",
  "            comm.send({'method': 'echo_update', 'state': data['state'], 'buffer_paths': []})",
  "            state.update(data['state'])",
  "            bench_seen.append(state['value'])",
  "    comm.on_msg(on_msg)",
  "get_ipython().kernel.comm_manager.register_target('bench.slider', bench_open)",
].join("\n");

/** ms from the first update sent to idle after the last one; checks that every update was applied. */
async function updatesMs(k, commId, countExpr) {
  const before = Number((await k.client.execute(countExpr)).outputs.find((m) => m.header.msg_type === "execute_result").content.data["text/plain"]);
  k.client.iopubMessages.length = 0;
  const t0 = performance.now();
  let last = "";
  for (let i = 1; i <= UPDATES; i++) last = await k.client.send("comm_msg", { comm_id: commId, data: { method: "update", state: { value: (i % 997) + 1 }, buffer_paths: [] } });
  await k.client.idleAfter(last, 600_000);
  const ms = performance.now() - t0;
  const echoes = k.client.iopubMessages.filter((m) => m.header.msg_type === "comm_msg" && m.content.data?.method === "echo_update").length;
  k.client.iopubMessages.length = 0;
  const after = Number((await k.client.execute(countExpr)).outputs.find((m) => m.header.msg_type === "execute_result").content.data["text/plain"]);
  if (after - before !== UPDATES || echoes !== UPDATES) throw new Error(`updates: observer ran ${after - before} times, ${echoes} echoes; expected ${UPDATES}`);
  k.client.iopubMessages.length = 0;
  return ms;
}

async function throughputRows() {
  const rows = [];
  const ours = await client.launchKernel(helicoid, { cwd: root });
  const ref = await client.launchKernel(ipykernel, { cwd: root });
  try {
    const o = [];
    const r = [];
    for (let round = 0; round < 3; round++) {
      o.push(await streamMs(ours, stdoutCode.ours));
      r.push(await streamMs(ref, stdoutCode.ipykernel));
    }
    rows.push({
      group: "kernel",
      name: `stdout: a cell writing ${LINES} lines of 1 KB, request -> idle, median of 3`,
      ours_ms: median(o),
      reference: "ipykernel (Debian), same lines",
      reference_ms: median(r),
      ratio: median(o) / median(r),
      goal: "ratio <= 1.5",
    });

    await ours.client.execute('import { slider } from "@helicoid/kernel"; const bs = slider({ min: 0, max: 1000 }); let bseen = 0; bs.onChange("value", () => { bseen++; });');
    const open = ours.client.iopubMessages.find((m) => m.header.msg_type === "comm_open" && m.content.data.state._model_name === "FloatSliderModel");
    await ref.client.execute(pythonTarget);
    await ref.client.send("comm_open", { comm_id: "bench-slider", target_name: "bench.slider", data: {} });
    const uo = [];
    const ur = [];
    for (let round = 0; round < 3; round++) {
      uo.push(await updatesMs(ours, open.content.comm_id, "bseen"));
      ur.push(await updatesMs(ref, "bench-slider", "len(bench_seen)"));
    }
    rows.push({
      group: "kernel",
      name: `${UPDATES} widget updates from the front end (echo, apply, observer), first sent -> idle, median of 3`,
      ours_ms: median(uo),
      reference: "ipykernel (Debian), comm target doing an ipywidgets update",
      reference_ms: median(ur),
      ratio: median(uo) / median(ur),
      goal: "ratio <= 1.5",
    });
  } finally {
    await ours.stop();
    await ref.stop();
  }
  return rows;
}

async function startupMs(argv) {
  const t0 = performance.now();
  const k = await client.launchKernel(argv, { cwd: root });
  const ms = performance.now() - t0;
  await k.stop();
  return ms;
}

export default async function () {
  const rows = await throughputRows();
  if (process.env.HELICOID_BENCH_ONLY === "throughput") return rows;
  const k = await client.launchKernel(helicoid, { cwd: root });
  await k.client.execute('import { slider } from "@helicoid/kernel"; const s = slider({ min: 0, max: 1000 }); s.onChange("value", () => {});');
  const open = k.client.iopubMessages.find((m) => m.header.msg_type === "comm_open" && m.content.data.state._model_name === "FloatSliderModel");
  const times = [];
  for (let i = 0; i < 300; i++) {
    const from = k.client.iopubMessages.length;
    const t0 = performance.now();
    const id = await k.client.send("comm_msg", { comm_id: open.content.comm_id, data: { method: "update", state: { value: i % 1000 }, buffer_paths: [] } });
    await k.client.waitFor((m) => m.parent_header.msg_id === id && m.content?.data?.method === "echo_update", 5000, from);
    if (i >= 20) times.push(performance.now() - t0);
  }
  await k.stop();
  rows.push({ group: "kernel", name: "comm round trip (update -> echo_update), median of 280", ours_ms: median(times), goal: "median < 5 ms" });

  const ours = [];
  const theirs = [];
  for (let i = 0; i < 5; i++) {
    ours.push(await startupMs(helicoid));
    theirs.push(await startupMs(tslab));
  }
  const o = median(ours);
  const t = median(theirs);
  rows.push({
    group: "kernel",
    name: "start to first kernel_info_reply, median of 5",
    ours_ms: o,
    reference: "tslab 1.0.22 kernel",
    reference_ms: t,
    ratio: o / t,
    goal: "ratio <= 1.5",
  });
  return rows;
}
