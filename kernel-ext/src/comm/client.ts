/**
 * A Jupyter client in Node: connects to a kernel's shell, control and iopub sockets, signs its
 * messages like a front end, and collects replies and iopub messages. Used by our tests and
 * benchmarks to talk to a real kernel process, and usable for scripting a kernel.
 */
import { spawn, type ChildProcess } from "node:child_process";
import { randomUUID } from "node:crypto";
import { mkdtempSync, writeFileSync } from "node:fs";
import { createServer } from "node:net";
import { tmpdir } from "node:os";
import { join } from "node:path";
import * as zmq from "zeromq";
import { parseMessage, serializeMessage, type Header } from "./wire.js";

export interface ConnectionInfo {
  ip: string;
  transport: "tcp";
  shell_port: number;
  iopub_port: number;
  stdin_port: number;
  control_port: number;
  hb_port: number;
  key: string;
  signature_scheme: "hmac-sha256";
  kernel_name: string;
}

/* eslint-disable @typescript-eslint/no-explicit-any -- raw Jupyter message fields of any shape */
export interface ClientMessage {
  header: Record<string, any>;
  parent_header: Record<string, any>;
  metadata: Record<string, any>;
  content: Record<string, any>;
  /* eslint-enable @typescript-eslint/no-explicit-any */
  buffers: Buffer[];
  /** For replies: the msg_id of the request. */
  requestId?: string;
}

export async function freePort(): Promise<number> {
  return new Promise((res, rej) => {
    const s = createServer();
    s.once("error", rej);
    s.listen(0, "127.0.0.1", () => {
      const p = (s.address() as { port: number }).port;
      s.close(() => res(p));
    });
  });
}

export async function newConnectionInfo(kernelName = "helicoid"): Promise<ConnectionInfo> {
  return {
    ip: "127.0.0.1",
    transport: "tcp",
    shell_port: await freePort(),
    iopub_port: await freePort(),
    stdin_port: await freePort(),
    control_port: await freePort(),
    hb_port: await freePort(),
    key: randomUUID(),
    signature_scheme: "hmac-sha256",
    kernel_name: kernelName,
  };
}

/** Write a connection file in a fresh temporary folder; returns its path. */
export function writeConnectionFile(conn: ConnectionInfo): string {
  const file = join(mkdtempSync(join(tmpdir(), "helicoid-conn-")), "connection.json");
  writeFileSync(file, JSON.stringify(conn));
  return file;
}

export class KernelClient {
  readonly session = randomUUID();
  private shell = new zmq.Dealer();
  private control = new zmq.Dealer();
  private iopub = new zmq.Subscriber();
  readonly iopubMessages: ClientMessage[] = [];
  private replies = new Map<string, (m: ClientMessage) => void>();
  private waiters: Array<() => void> = [];
  private closed = false;

  constructor(readonly conn: ConnectionInfo) {}

  connect(): void {
    const url = (p: number) => `tcp://${this.conn.ip}:${p}`;
    this.shell.connect(url(this.conn.shell_port));
    this.control.connect(url(this.conn.control_port));
    // Keep every iopub message (a benchmark sends thousands quickly; the default high-water mark drops).
    this.iopub.receiveHighWaterMark = 0;
    this.iopub.connect(url(this.conn.iopub_port));
    this.iopub.subscribe();
    void this.pump(this.shell, (m) => this.replies.get(m.parent_header.msg_id)?.(m));
    void this.pump(this.control, (m) => this.replies.get(m.parent_header.msg_id)?.(m));
    void this.pump(this.iopub, (m) => {
      this.iopubMessages.push(m);
      for (const w of this.waiters.splice(0)) w();
    });
  }

  private async pump(sock: zmq.Dealer | zmq.Subscriber, onMessage: (m: ClientMessage) => void): Promise<void> {
    try {
      for await (const frames of sock) {
        const m = parseMessage(this.conn.key, frames as Buffer[]); // throws on a bad signature
        onMessage({ header: m.header, parent_header: m.parent_header, metadata: m.metadata, content: m.content, buffers: m.buffers });
      }
    } catch (err) {
      if (!this.closed) throw err;
    }
  }

  /** Signed frames of a message; `tamper` breaks the signature on purpose (for robustness tests). */
  frames(msgType: string, content: unknown, opts: { buffers?: Buffer[]; tamper?: boolean } = {}): { frames: Buffer[]; msgId: string } {
    const header: Header = { msg_id: randomUUID(), msg_type: msgType, session: this.session, username: "client", date: new Date().toISOString(), version: "5.3" };
    const frames = serializeMessage(opts.tamper ? "wrong-key" : this.conn.key, { header, parent_header: {}, content, buffers: opts.buffers });
    return { frames, msgId: header.msg_id };
  }

  /** Send on shell (or control) and resolve with the reply. */
  async request(msgType: string, content: unknown, channel: "shell" | "control" = "shell", timeoutMs = 60_000): Promise<ClientMessage> {
    const { frames, msgId } = this.frames(msgType, content);
    const reply = new Promise<ClientMessage>((res, rej) => {
      const t = setTimeout(() => {
        this.replies.delete(msgId);
        rej(new Error(`no reply to ${msgType} within ${timeoutMs} ms`));
      }, timeoutMs);
      this.replies.set(msgId, (m) => {
        clearTimeout(t);
        this.replies.delete(msgId);
        res({ ...m, requestId: msgId });
      });
    });
    await (channel === "shell" ? this.shell : this.control).send(frames);
    return reply;
  }

  /** Send on shell without waiting for a reply (comm messages have none). Returns the msg_id. */
  async send(msgType: string, content: unknown, opts: { buffers?: Buffer[]; tamper?: boolean } = {}): Promise<string> {
    const { frames, msgId } = this.frames(msgType, content, opts);
    await this.shell.send(frames);
    return msgId;
  }

  /** Wait for an iopub message matching `pred`, among those received from index `from` on. */
  async waitFor(pred: (m: ClientMessage) => boolean, timeoutMs = 30_000, from = 0): Promise<ClientMessage> {
    const deadline = Date.now() + timeoutMs;
    let scanned = from;
    for (;;) {
      for (; scanned < this.iopubMessages.length; scanned++) if (pred(this.iopubMessages[scanned]!)) return this.iopubMessages[scanned]!;
      const left = deadline - Date.now();
      if (left <= 0)
        throw new Error(
          `iopub message not seen within ${timeoutMs} ms; got: ${this.iopubMessages
            .slice(from)
            .map((m) => m.header.msg_type)
            .join(", ")}`,
        );
      await new Promise<void>((res) => {
        const t = setTimeout(res, Math.min(left, 200));
        this.waiters.push(() => {
          clearTimeout(t);
          res();
        });
      });
    }
  }

  /** Wait until the kernel is idle after the request with `msgId`. */
  idleAfter(msgId: string, timeoutMs = 60_000): Promise<ClientMessage> {
    return this.waitFor((m) => m.header.msg_type === "status" && m.content.execution_state === "idle" && m.parent_header.msg_id === msgId, timeoutMs);
  }

  /** Execute code; resolves with the reply and the iopub outputs of that request. */
  async execute(code: string): Promise<{ reply: ClientMessage; outputs: ClientMessage[] }> {
    const reply = await this.request("execute_request", { code, silent: false, store_history: true, user_expressions: {}, allow_stdin: false, stop_on_error: true });
    await this.idleAfter(reply.requestId!);
    const outputs = this.iopubMessages.filter((m) => m.parent_header.msg_id === reply.requestId && !["status", "execute_input"].includes(m.header.msg_type));
    return { reply, outputs };
  }

  /** Ask for kernel_info until the kernel answers (it may still be binding its sockets). */
  async waitReady(timeoutMs = 60_000, alive: () => boolean = () => true): Promise<ClientMessage> {
    const t0 = Date.now();
    for (;;) {
      try {
        return await this.request("kernel_info_request", {}, "shell", 1_000);
      } catch (e) {
        if (!alive()) throw new Error("the kernel process exited before answering");
        if (Date.now() - t0 > timeoutMs) throw e;
      }
    }
  }

  close(): void {
    this.closed = true;
    this.shell.close();
    this.control.close();
    this.iopub.close();
  }
}

export interface KernelProcess {
  conn: ConnectionInfo;
  proc: ChildProcess;
  client: KernelClient;
  output: () => string;
  stop: () => Promise<void>;
}

/** Start a kernel command (`argv` with "{connection_file}" in it) on free loopback ports and connect to it. */
export async function launchKernel(argv: string[], opts: { cwd?: string; kernelName?: string } = {}): Promise<KernelProcess> {
  const conn = await newConnectionInfo(opts.kernelName);
  const file = writeConnectionFile(conn);
  const args = argv.map((a) => a.replace("{connection_file}", file));
  const proc = spawn(args[0]!, args.slice(1), { cwd: opts.cwd, stdio: ["ignore", "pipe", "pipe"] });
  let text = "";
  proc.stderr!.on("data", (d) => (text += d));
  proc.stdout!.on("data", (d) => (text += d));
  const client = new KernelClient(conn);
  client.connect();
  await client.waitReady(60_000, () => proc.exitCode === null);
  return {
    conn,
    proc,
    client,
    output: () => text,
    stop: async () => {
      if (proc.exitCode === null) {
        try {
          await client.request("shutdown_request", { restart: false }, "control", 5_000);
        } catch {
          /* killed below */
        }
        await new Promise((r) => setTimeout(r, 300));
        if (proc.exitCode === null) proc.kill("SIGKILL");
      }
      client.close();
    },
  };
}
