// Shared timing helpers for benchmarks. Timings are medians over repeated runs after warm-up.
import { spawnSync } from "node:child_process";
export const systemPython = process.env.HELICOID_PYTHON ?? "/usr/bin/python3";

/** Median wall time in ms of fn() over `runs` runs after `warmup` runs. */
export async function medianMs(fn, { runs = 21, warmup = 3 } = {}) {
  for (let i = 0; i < warmup; i++) await fn();
  const t = [];
  for (let i = 0; i < runs; i++) {
    const t0 = performance.now();
    await fn();
    t.push(performance.now() - t0);
  }
  t.sort((a, b) => a - b);
  return t[Math.floor(t.length / 2)];
}

/**
 * Run a Python timing script with the system interpreter. The script reads JSON from stdin and
 * prints JSON with at least {"ms": median milliseconds}.
 */
export function pythonTiming(script, input = null) {
  const r = spawnSync(systemPython, ["-c", script], { input: JSON.stringify(input), encoding: "utf8", maxBuffer: 1 << 30 });
  if (r.status !== 0) throw new Error(`python timing failed: ${r.stderr}`);
  return JSON.parse(r.stdout);
}

/**
 * Run ours and the reference alternately (A B A B ...) `runs` times each, so both see the same
 * machine load in the same period; returns the results of each side in order.
 */
export function interleaved(ours, reference, runs) {
  const o = [];
  const r = [];
  for (let i = 0; i < runs; i++) {
    o.push(ours(i));
    r.push(reference(i));
  }
  return { ours: o, ref: r };
}

/** Median and spread (min and max) of a list of figures. */
export function summary(values) {
  const s = [...values].sort((a, b) => a - b);
  const n = s.length;
  const median = n % 2 ? s[(n - 1) / 2] : (s[n / 2 - 1] + s[n / 2]) / 2;
  return { median, min: s[0], max: s[n - 1], spread: [s[0], s[n - 1]], n };
}

/** A goal's verdict as the bench prints it: "MET: goal" or "MISSED: goal". */
export function verdict(met, goal) {
  return `${met ? "MET" : "MISSED"}: ${goal}`;
}

/**
 * Two JavaScript functions (sync or async) timed alternately A B A B in one period, after `warmup`
 * calls of each: per call the wall time and the process CPU time (process.cpuUsage, which counts
 * V8's helper threads and, for worker threads, the workers too). Returns the lists and the last values.
 */
export async function interleavedJs(a, b, { runs = 11, warmup = 2 } = {}) {
  let aValue, bValue;
  for (let i = 0; i < warmup; i++) {
    aValue = await a();
    bValue = await b();
  }
  const out = { a: [], b: [], aCpu: [], bCpu: [] };
  const time = async (f, wall, cpu) => {
    const c0 = process.cpuUsage();
    const t0 = performance.now();
    const v = await f();
    wall.push(performance.now() - t0);
    const c = process.cpuUsage(c0);
    cpu.push((c.user + c.system) / 1e3);
    return v;
  };
  for (let i = 0; i < runs; i++) {
    aValue = await time(a, out.a, out.aCpu);
    bValue = await time(b, out.b, out.bCpu);
  }
  return { ...out, aValue, bValue };
}

/** Median and spread of one function's runs (no reference), after `warmup` calls. */
export async function runsOf(f, { runs = 11, warmup = 2 } = {}) {
  for (let i = 0; i < warmup; i++) await f();
  const t = [];
  for (let i = 0; i < runs; i++) {
    const t0 = performance.now();
    await f();
    t.push(performance.now() - t0);
  }
  return summary(t);
}
