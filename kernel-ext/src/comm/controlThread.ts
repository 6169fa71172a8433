/**
 * The kernel's control and heartbeat sockets, served from a worker thread so that they answer
 * while the main thread is busy (a cell or a widget callback in a tight loop), as ipykernel
 * serves them from threads of their own.
 *
 * - heartbeat: every ping is echoed at once;
 * - control `interrupt_request`: the thread sends SIGINT to its own process (which stops the
 *   synchronous code running under `breakOnSigint`, or, when the main thread is idle, reaches the
 *   kernel's SIGINT handler that interrupts the cell's asynchronous work) and replies itself;
 * - every other control message (shutdown, kernel_info, ...) is handed to the main thread, whose
 *   replies come back here to be sent. Signatures are checked here too; replays are dropped.
 */
import { parentPort, workerData } from "node:worker_threads";
import * as zmq from "zeromq";
import { makeHeader, parseMessage, ReplayGuard, serializeMessage, WireError } from "./wire.js";

export interface ControlThreadData {
  controlUrl: string;
  hbUrl: string;
  key: string;
}

/** Messages from the control thread to the main thread. */
export type FromControl = { kind: "ready" } | { kind: "message"; frames: Uint8Array[] } | { kind: "log"; text: string } | { kind: "bind-error"; text: string };
/** Messages from the main thread to the control thread. */
export type ToControl = { kind: "send"; frames: Uint8Array[] };

async function main(): Promise<void> {
  const data = workerData as ControlThreadData;
  const port = parentPort!;
  const control = new zmq.Router();
  const hb = new zmq.Reply();
  const replay = new ReplayGuard();
  const post = (m: FromControl) => port.postMessage(m);
  let sending: Promise<unknown> = Promise.resolve();
  const send = (frames: Buffer[]) => {
    sending = sending.then(() => control.send(frames)).catch((err) => post({ kind: "log", text: `control send failed: ${String(err)}` }));
  };
  port.on("message", (m: ToControl) => {
    if (m.kind === "send") send(m.frames.map((f) => Buffer.from(f.buffer, f.byteOffset, f.byteLength)));
  });
  try {
    await Promise.all([control.bind(data.controlUrl), hb.bind(data.hbUrl)]);
  } catch (err) {
    post({ kind: "bind-error", text: String(err) });
    return;
  }
  post({ kind: "ready" });
  void (async () => {
    for await (const frames of hb) await hb.send(frames);
  })().catch(() => {});
  for await (const frames of control) {
    let msg;
    try {
      msg = parseMessage(data.key, frames as Buffer[]);
    } catch (err) {
      post({ kind: "log", text: `control message dropped: ${err instanceof WireError ? err.message : String(err)}` });
      continue;
    }
    if (!replay.admit(msg.signature ?? "")) {
      post({ kind: "log", text: `control message dropped: replayed signature (msg_id ${msg.header.msg_id}, ${msg.header.msg_type})` });
      continue;
    }
    if (msg.header.msg_type === "interrupt_request") {
      process.kill(process.pid, "SIGINT");
      send(
        serializeMessage(data.key, {
          identities: msg.identities,
          header: makeHeader("interrupt_reply", msg.header),
          parent_header: msg.header,
          content: { status: "ok" },
        }),
      );
      continue;
    }
    post({ kind: "message", frames: frames as Buffer[] });
  }
}

void main();
