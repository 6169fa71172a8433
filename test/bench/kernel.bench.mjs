// Kernel benchmarks, side by side in one run:
// - comm round trip on loopback: a front-end `update` of a slider to the kernel's `echo_update`;
// - kernel start to the first kernel_info_reply: ours against tslab's own kernel.
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import client from "../../kernel-ext/dist/comm/client.js";

const root = fileURLToPath(new URL("../..", import.meta.url));
const helicoid = [process.execPath, join(root, "kernel-ext", "bin", "helicoid.js"), "kernel", "--connection-file", "{connection_file}"];
const tslab = [process.execPath, join(root, "node_modules", "tslab", "bin", "tslab"), "kernel", "--config-path", "{connection_file}"];
const median = (a) => [...a].sort((x, y) => x - y)[Math.floor(a.length / 2)];

async function startupMs(argv) {
  const t0 = performance.now();
  const k = await client.launchKernel(argv, { cwd: root });
  const ms = performance.now() - t0;
  await k.stop();
  return ms;
}

export default async function () {
  const rows = [];
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
  rows.push({ group: "kernel", name: "start to first kernel_info_reply, median of 5", ours_ms: o, reference: "tslab 1.0.22 kernel", reference_ms: t, ratio: o / t, goal: "ratio <= 1.5" });
  return rows;
}
