/**
 * The process that executes a notebook for `helicoid run` (started by cli/run.ts with an IPC
 * channel). It tells its parent when each cell starts and what each cell printed, so the parent
 * can stop a cell that runs past its time limit (SIGINT, then SIGKILL) and still write everything
 * the run produced. Messages: {t: "cell", index, count}, {t: "outputs", index, outputs},
 * {t: "done", notebook, failure, cellsRun, seconds}, {t: "fatal", message}.
 */
import { readFileSync } from "node:fs";
import { dirname, resolve } from "node:path";
import { parseNotebook } from "./nbformat.js";
import { pendingTimers, runNotebook, type Output } from "./runner.js";

const realExit = process.exit.bind(process);
const send = (m: unknown): Promise<void> => new Promise((r) => (process.send ? process.send(m, undefined, {}, () => r()) : r()));

async function main(): Promise<void> {
  const [input, timeout, settle] = process.argv.slice(2);
  const file = resolve(input!);
  const nb = parseNotebook(readFileSync(file, "utf8"), input!);
  const dir = dirname(file);
  process.chdir(dir);
  // What a cell printed goes to the parent at once, then at most once a second while the cell runs
  // (a cell printing a lot does not pay for copies), and in full when the cell ends.
  let pending: { index: number; outputs: Output[] } | null = null;
  let lastSent = 0;
  let timer: NodeJS.Timeout | null = null;
  const flush = () => {
    timer = null;
    if (!pending) return;
    lastSent = performance.now();
    void send({ t: "outputs", index: pending.index, outputs: pending.outputs });
    pending = null;
  };
  // The parent says "timeout" before its SIGINT, so an interrupt can be told from a Ctrl-C.
  const timedOut = new Set<number>();
  process.on("message", (m: { t?: string; index?: number }) => {
    if (m?.t === "timeout" && typeof m.index === "number") timedOut.add(m.index);
  });
  const r = await runNotebook(nb, dir, {
    timeoutSeconds: Number(timeout) || 0,
    wasTimedOut: async (index) => {
      for (let k = 0; k < 50 && !timedOut.has(index); k++) await new Promise((res) => setTimeout(res, 10));
      return timedOut.has(index);
    },
    settleMs: Number(settle) || 0,
    cellStarted: (index, count) => {
      flush();
      void send({ t: "cell", index, count });
    },
    outputsChanged: (index, outputs) => {
      if (pending && pending.index !== index) flush();
      pending = { index, outputs };
      if (performance.now() - lastSent > 1000) flush();
      else timer ??= setTimeout(flush, 1000);
    },
  });
  if (timer) clearTimeout(timer);
  flush();
  const stillPending = pendingTimers();
  await send({ t: "done", notebook: r.notebook, failure: r.failure, cellsRun: r.cellsRun, seconds: r.seconds, pendingTimers: stillPending });
  realExit(0);
}

main().catch(async (err) => {
  await send({ t: "fatal", message: String((err as Error)?.message ?? "the notebook could not be run").slice(0, 2000) });
  realExit(2);
});
