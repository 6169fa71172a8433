/**
 * `helicoid kernel --connection-file FILE`: the process Jupyter starts (see the kernelspec written
 * by `helicoid install`). Assembles tslab's executor and our server directly.
 */
import { HelicoidServer } from "../comm/server.js";
import { currentContext, realStderr, reportError } from "../display/output.js";
import { ExecutionSession } from "../notebook/session.js";
import { parseArgs, type CommandIO } from "./args.js";

export async function kernelCommand(args: string[], io: CommandIO): Promise<number> {
  const a = parseArgs(args, ["--connection-file", "-f"]);
  const file = a.options.get("--connection-file") ?? a.options.get("-f") ?? a.positional[0];
  if (!file) {
    io.stderr("usage: helicoid kernel --connection-file FILE\n");
    return 2;
  }
  const session = new ExecutionSession(process.cwd());
  session.warm();
  const server = new HelicoidServer(session, file);
  process.on("SIGINT", () => session.interrupt());
  // Errors thrown later by a cell's code (a rejected promise, an event handler) are shown as an error
  // output under the current cell; the kernel goes on. (Timer errors are caught in their own cell.)
  process.on("uncaughtException", (err) => showLateError(err, "uncaught exception"));
  process.on("unhandledRejection", (reason) => showLateError(reason, "unhandled promise rejection"));
  await server.init();
  return new Promise<number>(() => {}); // runs until shutdown_request or a signal ends the process
}

function showLateError(err: unknown, what: string): void {
  try {
    const ctx = currentContext();
    if (ctx) reportError(err, ctx.sink);
    else realStderr(`[helicoid] ${what}: ${(err as Error)?.stack ?? String(err)}\n`);
  } catch (e) {
    realStderr(`[helicoid] ${what} (could not be shown: ${String(e)})\n`);
  }
}
