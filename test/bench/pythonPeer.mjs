// A long-lived Debian python3 process for interleaved benchmarks: the bench defines Python functions
// once, then calls them one at a time between its own runs (A B A B ...), so both sides see the same
// machine load in the same period. Python times each call itself (time.perf_counter around the call
// only), so the pipe's latency is not counted. Both sides report wall time and CPU time: on a shared,
// loaded machine (2 cores here, other jobs running) the CPU time of the one computing thread is the
// steadier figure, and the bench rows use it; the wall-time ratio is printed beside it.
import { spawn } from "node:child_process";
import { createInterface } from "node:readline";
import { systemPython } from "./util.mjs";

const SERVER = `
import json, sys, time, traceback
ns = {}
out = sys.stdout
for line in sys.stdin:
    req = json.loads(line)
    try:
        if "code" in req:
            exec(req["code"], ns)
            res = {"ok": True}
        else:
            f = ns[req["fn"]]
            c0 = time.thread_time()
            t0 = time.perf_counter()
            v = f(*req.get("args", []))
            ms = (time.perf_counter() - t0) * 1e3
            cpu = (time.thread_time() - c0) * 1e3
            res = {"ok": True, "ms": ms, "cpu_ms": cpu, "value": v}
    except Exception:
        res = {"ok": False, "error": traceback.format_exc()}
    out.write(json.dumps(res) + "\\n")
    out.flush()
`;

/**
 * Start the peer. `define(code)` runs Python code in its namespace; `call(fn, ...args)` runs
 * fn(*args) and resolves to { ms, value } (ms timed inside Python); `close()` ends it.
 */
export function pythonPeer() {
  const child = spawn(systemPython, ["-c", SERVER], {
    stdio: ["pipe", "pipe", "inherit"],
    env: { ...process.env, OMP_NUM_THREADS: "1", OPENBLAS_NUM_THREADS: "1", MKL_NUM_THREADS: "1" },
  });
  const lines = createInterface({ input: child.stdout });
  const waiting = [];
  lines.on("line", (l) => {
    const w = waiting.shift();
    if (w) w(JSON.parse(l));
  });
  const send = (req) =>
    new Promise((resolve, reject) => {
      waiting.push((res) => (res.ok ? resolve(res) : reject(new Error(`python peer: ${res.error}`))));
      child.stdin.write(JSON.stringify(req) + "\n");
    });
  return {
    define: (code) => send({ code }),
    call: (fn, ...args) => send({ fn, args }),
    close: () => {
      child.stdin.end();
      return new Promise((r) => child.once("exit", r));
    },
  };
}

/**
 * Interleave ours (a synchronous or async function, timed here) with a Python function of the peer
 * (timed there): warm-up calls of each, then `runs` pairs A B A B. Returns the CPU times (ours, ref)
 * and wall times (oursWall, refWall) of each run in ms, and the last values of each side. Our CPU
 * time is the process's (process.cpuUsage), so it includes V8's own helper threads (GC, compiler).
 */
export async function interleavedWithPython(peer, ours, fn, args, { runs = 11, warmup = 2 } = {}) {
  let oursValue, refValue;
  for (let i = 0; i < warmup; i++) {
    oursValue = await ours();
    refValue = (await peer.call(fn, ...args)).value;
  }
  const o = [],
    r = [],
    ow = [],
    rw = [];
  for (let i = 0; i < runs; i++) {
    const c0 = process.cpuUsage();
    const t0 = performance.now();
    oursValue = await ours();
    ow.push(performance.now() - t0);
    const c = process.cpuUsage(c0);
    o.push((c.user + c.system) / 1e3);
    const res = await peer.call(fn, ...args);
    r.push(res.cpu_ms);
    rw.push(res.ms);
    refValue = res.value;
  }
  return { ours: o, ref: r, oursWall: ow, refWall: rw, oursValue, refValue };
}
