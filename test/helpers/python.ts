/**
 * Run Debian's system Python (where apt installs python3-numpy, python3-scipy, the Jupyter stack)
 * as an independent oracle. The first `python3` on PATH may be another interpreter without those
 * modules, so we call the system one explicitly (override with HELICOID_PYTHON).
 */
import { spawnSync } from "node:child_process";

export const systemPython = process.env.HELICOID_PYTHON ?? "/usr/bin/python3";

/** Run `script` with JSON `input` on stdin; the script prints one JSON document on stdout. */
export function runPython<T = unknown>(script: string, input: unknown = null, timeoutMs = 120_000): T {
  const r = spawnSync(systemPython, ["-c", script], {
    input: JSON.stringify(input),
    encoding: "utf8",
    maxBuffer: 1 << 30,
    timeout: timeoutMs,
  });
  if (r.error) throw r.error;
  if (r.status !== 0) throw new Error(`python oracle failed (${r.status}): ${r.stderr}`);
  return JSON.parse(r.stdout) as T;
}
