/**
 * Test helpers for a real Helicoid kernel process over ZeroMQ. The client is the project's own
 * (kernel-ext/src/comm/client.ts), which signs messages like a Jupyter front end.
 */
import { spawnSync } from "node:child_process";
import { mkdtempSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { launchKernel, type ClientMessage, type KernelProcess } from "../../kernel-ext/src/comm/client.js";
import { helicoidBin } from "./paths.js";

export type JupyterMessage = ClientMessage;
export interface RunningKernel extends KernelProcess {
  stderr: () => string;
}

/** Install the kernelspec into a fresh temporary prefix; returns the JUPYTER_PATH to use. */
export function installKernelspec(): { prefix: string; jupyterPath: string } {
  const prefix = mkdtempSync(join(tmpdir(), "helicoid-prefix-"));
  const r = spawnSync(process.execPath, [helicoidBin, "install", "--prefix", prefix], { encoding: "utf8" });
  if (r.status !== 0) throw new Error(`helicoid install failed: ${r.stderr}`);
  return { prefix, jupyterPath: join(prefix, "share", "jupyter") };
}

/** Start `helicoid kernel` on free loopback ports and connect a client (waits for kernel_info). */
export async function startKernel(cwd?: string): Promise<RunningKernel> {
  const k = await launchKernel([process.execPath, helicoidBin, "kernel", "--connection-file", "{connection_file}"], {
    cwd: cwd ?? mkdtempSync(join(tmpdir(), "helicoid-kernel-")),
  });
  return { ...k, stderr: k.output };
}
