/**
 * `helicoid kernel --connection-file FILE`: the process Jupyter starts (see the kernelspec written
 * by `helicoid install`). Assembles tslab's executor and our server directly.
 */
import { HelicoidServer } from "../comm/server.js";
import { currentContext, realStderr, reportError } from "../display/output.js";
import { ExecutionSession } from "../notebook/session.js";
import { parseStrict, UsageError, type CommandIO } from "./args.js";

export async function kernelCommand(args: string[], io: CommandIO): Promise<number> {
  let file: string | undefined;
  try {
    const a = parseStrict(args, {
      flags: [],
      valued: { "--connection-file": "the connection file Jupyter wrote", "-f": "the connection file Jupyter wrote" },
      aliases: [["--connection-file", "-f"]],
    });
    if (a.positional.length > 1) throw new UsageError(`one connection file expected, ${a.positional.length} given`);
    file = a.options.get("--connection-file") ?? a.options.get("-f") ?? a.positional[0];
    if (file !== undefined && a.positional.length > 0 && (a.options.has("--connection-file") || a.options.has("-f")))
      throw new UsageError("the connection file given twice: give it once");
  } catch (err) {
    if (!(err instanceof UsageError)) throw err;
    io.stderr(`helicoid kernel: ${err.message}\n`);
    return 2;
  }
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
