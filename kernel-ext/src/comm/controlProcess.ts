/**
 * The kernel's control and heartbeat sockets, served by a small helper process (forked by the
 * kernel, with an IPC channel) so that they answer while the kernel's thread is busy (a cell or a
 * widget callback in a tight loop), as ipykernel serves them from threads of their own. (A worker
 * thread would do, but zeromq.js does not shut down cleanly inside one: the process can abort on exit.)
 *
 * - heartbeat: every ping is echoed at once;
 * - control `interrupt_request`: the helper first hands the interrupt to the kernel's thread as a
 *   message; when that thread is free (a cell awaiting, timers pending) it interrupts at once and
 *   says so. Only when no answer comes within INTERRUPT_BY_MESSAGE_MS (the thread is busy in
 *   synchronous code, which runs under `breakOnSigint`) is the kernel sent SIGINT. A signal is not
 *   sent to a free kernel because Node briefly restores SIGINT's default action (end the process)
 *   around every `breakOnSigint` run, and a kernel with many short timers or callbacks opens that
 *   window often: a signal landing in it would end the kernel. The helper replies itself;
 * - every other control message (shutdown, kernel_info, ...) is handed to the kernel, whose replies
 *   come back here to be sent. Signatures are checked here too; replays are dropped.
 * The helper ignores SIGINT (Jupyter signals the whole process group) and ends with the kernel.
 */
import * as zmq from "zeromq";
import { makeHeader, parseMessage, ReplayGuard, serializeMessage, WireError } from "./wire.js";

export interface ControlProcessData {
  controlUrl: string;
  hbUrl: string;
  key: string;
}

/** Messages from the control process to the kernel. */
export type FromControl =
  { kind: "ready" } | { kind: "message"; frames: Uint8Array[] } | { kind: "log"; text: string } | { kind: "bind-error"; text: string } | { kind: "interrupt"; id: number };
/** Messages from the kernel to the control process. */
export type ToControl = { kind: "send"; frames: Uint8Array[] } | { kind: "close" } | { kind: "interrupt-ack"; id: number };

/**
 * How long the kernel's thread gets to take an interrupt by message before it is sent SIGINT (ms).
 * A kernel whose thread is free answers within a few milliseconds; one that is not is running
 * synchronous code, which SIGINT stops.
 */
export const INTERRUPT_BY_MESSAGE_MS = 300;

async function main(): Promise<void> {
  const data = JSON.parse(process.env.HELICOID_CONTROL ?? "{}") as ControlProcessData;
  const kernelPid = process.ppid;
  process.on("SIGINT", () => {});
  process.on("disconnect", () => process.exit(0));
  const port = {
    postMessage: (m: FromControl) => process.send?.(m),
    on: (_: "message", h: (m: ToControl) => void) => process.on("message", h as (m: unknown) => void),
    close: () => process.disconnect?.(),
  };
  const control = new zmq.Router();
  const hb = new zmq.Reply();
  const replay = new ReplayGuard();
  const post = (m: FromControl) => port.postMessage(m);
  let sending: Promise<unknown> = Promise.resolve();
  const send = (frames: Buffer[]) => {
    sending = sending.then(() => control.send(frames)).catch((err) => post({ kind: "log", text: `control send failed: ${String(err)}` }));
  };
  const pendingInterrupts = new Map<number, NodeJS.Timeout>();
  let interruptIds = 0;
  port.on("message", (m: ToControl) => {
    if (m.kind === "interrupt-ack") {
      clearTimeout(pendingInterrupts.get(m.id));
      pendingInterrupts.delete(m.id);
    } else if (m.kind === "send") send(m.frames.map((f) => Buffer.from(f.buffer, f.byteOffset, f.byteLength)));
    else if (m.kind === "close") {
      // Let the last replies go, then close the sockets before the thread ends (the process exits next).
      void sending.finally(() => {
        control.linger = 200;
        control.close();
        hb.close();
        setTimeout(() => process.exit(0), 0);
      });
    }
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
  try {
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
        const id = ++interruptIds;
        pendingInterrupts.set(
          id,
          setTimeout(() => {
            pendingInterrupts.delete(id);
            try {
              process.kill(kernelPid, "SIGINT");
            } catch {
              // the kernel has ended
            }
          }, INTERRUPT_BY_MESSAGE_MS),
        );
        post({ kind: "interrupt", id });
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
  } catch {
    // the socket was closed: the kernel is shutting down
  }
}

void main();
