/**
 * Test helpers for talking to a real Helicoid kernel process over ZeroMQ, signing messages the
 * way a Jupyter front end does (jupyter_client's Session: hmac-sha256 over the four JSON frames).
 */
import { spawn, spawnSync, type ChildProcess } from "node:child_process";
import { createHmac, randomUUID } from "node:crypto";
import { mkdtempSync, writeFileSync } from "node:fs";
import { createServer } from "node:net";
import { tmpdir } from "node:os";
import { join } from "node:path";
import * as zmq from "zeromq";
import { helicoidBin } from "./paths.js";

export interface Connection {
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

/** Install the kernelspec into a fresh temporary prefix; returns the JUPYTER_PATH to use. */
export function installKernelspec(): { prefix: string; jupyterPath: string } {
  const prefix = mkdtempSync(join(tmpdir(), "helicoid-prefix-"));
  const r = spawnSync(process.execPath, [helicoidBin, "install", "--prefix", prefix], { encoding: "utf8" });
  if (r.status !== 0) throw new Error(`helicoid install failed: ${r.stderr}`);
  return { prefix, jupyterPath: join(prefix, "share", "jupyter") };
}

export interface JupyterMessage {
  header: Record<string, any>;
  parent_header: Record<string, any>;
  metadata: Record<string, any>;
  content: Record<string, any>;
  buffers: Buffer[];
}

const DELIM = Buffer.from("<IDS|MSG>");

export class TestClient {
  readonly session = randomUUID();
  private shell = new zmq.Dealer();
  private control = new zmq.Dealer();
  private iopub = new zmq.Subscriber();
  readonly iopubMessages: JupyterMessage[] = [];
  private replies = new Map<string, (m: JupyterMessage) => void>();
  private waiters: Array<() => void> = [];
  private closed = false;

  constructor(readonly conn: Connection) {}

  async connect(): Promise<void> {
    const url = (p: number) => `tcp://${this.conn.ip}:${p}`;
    this.shell.connect(url(this.conn.shell_port));
    this.control.connect(url(this.conn.control_port));
    this.iopub.connect(url(this.conn.iopub_port));
    this.iopub.subscribe();
    void this.pump(this.shell);
    void this.pump(this.control);
    void this.pumpIopub();
  }

  private sign(frames: Buffer[]): string {
    const h = createHmac("sha256", this.conn.key);
    for (const f of frames) h.update(f);
    return h.digest("hex");
  }

  parse(frames: Buffer[]): JupyterMessage {
    const d = frames.findIndex((f) => f.equals(DELIM));
    const body = frames.slice(d + 2, d + 6);
    const sig = frames[d + 1]!.toString();
    if (sig !== this.sign(body)) throw new Error("kernel sent a message with a bad signature");
    const [header, parent_header, metadata, content] = body.map((b) => JSON.parse(b.toString()));
    return { header, parent_header, metadata, content, buffers: frames.slice(d + 6) };
  }

  private async pump(sock: zmq.Dealer): Promise<void> {
    try {
      for await (const frames of sock) {
        const m = this.parse(frames as Buffer[]);
        this.replies.get(m.parent_header.msg_id)?.(m);
      }
    } catch (err) {
      if (!this.closed) throw err;
    }
  }

  private async pumpIopub(): Promise<void> {
    try {
      for await (const frames of this.iopub) {
        this.iopubMessages.push(this.parse(frames as Buffer[]));
        for (const w of this.waiters.splice(0)) w();
      }
    } catch (err) {
      if (!this.closed) throw err;
    }
  }

  /** Frames of a message as a front end would sign it; `tamper` breaks the signature on purpose. */
  frames(msgType: string, content: unknown, opts: { buffers?: Buffer[]; tamper?: boolean; msgId?: string } = {}): { frames: Buffer[]; msgId: string } {
    const msgId = opts.msgId ?? randomUUID();
    const header = { msg_id: msgId, msg_type: msgType, session: this.session, username: "test", date: new Date().toISOString(), version: "5.3" };
    const body = [header, {}, {}, content].map((x) => Buffer.from(JSON.stringify(x)));
    const sig = opts.tamper ? "0".repeat(64) : this.sign(body);
    return { frames: [DELIM, Buffer.from(sig), ...body, ...(opts.buffers ?? [])], msgId };
  }

  /** Send on shell (or control) and resolve with the reply. */
  async request(msgType: string, content: unknown, channel: "shell" | "control" = "shell", timeoutMs = 60_000): Promise<JupyterMessage> {
    const { frames, msgId } = this.frames(msgType, content);
    const reply = new Promise<JupyterMessage>((res, rej) => {
      const t = setTimeout(() => rej(new Error(`no reply to ${msgType} within ${timeoutMs} ms`)), timeoutMs);
      this.replies.set(msgId, (m) => {
        clearTimeout(t);
        this.replies.delete(msgId);
        res(m);
      });
    });
    await (channel === "shell" ? this.shell : this.control).send(frames);
    const r = await reply;
    (r as JupyterMessage & { requestId: string }).requestId = msgId;
    return r;
  }

  /** Send without waiting for a reply (comm messages have none). Returns the msg_id. */
  async send(msgType: string, content: unknown, opts: { buffers?: Buffer[]; tamper?: boolean } = {}): Promise<string> {
    const { frames, msgId } = this.frames(msgType, content, opts);
    await this.shell.send(frames);
    return msgId;
  }

  /** Wait for an iopub message matching `pred` (searching those already received too). */
  async waitFor(pred: (m: JupyterMessage) => boolean, timeoutMs = 30_000, from = 0): Promise<JupyterMessage> {
    const deadline = Date.now() + timeoutMs;
    for (;;) {
      const found = this.iopubMessages.slice(from).find(pred);
      if (found) return found;
      const left = deadline - Date.now();
      if (left <= 0) throw new Error(`iopub message not seen within ${timeoutMs} ms; got: ${this.iopubMessages.slice(from).map((m) => m.header.msg_type).join(", ")}`);
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
  idleAfter(msgId: string, timeoutMs = 60_000): Promise<JupyterMessage> {
    return this.waitFor((m) => m.header.msg_type === "status" && m.content.execution_state === "idle" && m.parent_header.msg_id === msgId, timeoutMs);
  }

  /** Execute code; resolves with the reply and the iopub outputs of that request. */
  async execute(code: string): Promise<{ reply: JupyterMessage; outputs: JupyterMessage[] }> {
    const reply = await this.request("execute_request", { code, silent: false, store_history: true, user_expressions: {}, allow_stdin: false, stop_on_error: true });
    const id = (reply as JupyterMessage & { requestId: string }).requestId;
    await this.idleAfter(id);
    const outputs = this.iopubMessages.filter((m) => m.parent_header.msg_id === id && !["status", "execute_input"].includes(m.header.msg_type));
    return { reply, outputs };
  }

  close(): void {
    this.closed = true;
    this.shell.close();
    this.control.close();
    this.iopub.close();
  }
}

export interface RunningKernel {
  conn: Connection;
  proc: ChildProcess;
  client: TestClient;
  stderr: () => string;
  stop: () => Promise<void>;
}

/** Start `helicoid kernel` on free loopback ports and connect a test client (waits for kernel_info). */
export async function startKernel(cwd?: string): Promise<RunningKernel> {
  const conn: Connection = {
    ip: "127.0.0.1",
    transport: "tcp",
    shell_port: await freePort(),
    iopub_port: await freePort(),
    stdin_port: await freePort(),
    control_port: await freePort(),
    hb_port: await freePort(),
    key: randomUUID(),
    signature_scheme: "hmac-sha256",
    kernel_name: "helicoid",
  };
  const dir = mkdtempSync(join(tmpdir(), "helicoid-kernel-"));
  const file = join(dir, "connection.json");
  writeFileSync(file, JSON.stringify(conn));
  const proc = spawn(process.execPath, [helicoidBin, "kernel", "--connection-file", file], { cwd: cwd ?? dir, stdio: ["ignore", "pipe", "pipe"] });
  let err = "";
  proc.stderr!.on("data", (d) => (err += d));
  proc.stdout!.on("data", (d) => (err += d));
  const client = new TestClient(conn);
  await client.connect();
  // The kernel may not be listening yet: retry kernel_info until it answers.
  const t0 = Date.now();
  for (;;) {
    try {
      await client.request("kernel_info_request", {}, "shell", 2_000);
      break;
    } catch (e) {
      if (proc.exitCode !== null) throw new Error(`kernel exited (${proc.exitCode}): ${err}`);
      if (Date.now() - t0 > 60_000) throw e;
    }
  }
  return {
    conn,
    proc,
    client,
    stderr: () => err,
    stop: async () => {
      if (proc.exitCode === null) {
        try {
          await client.request("shutdown_request", { restart: false }, "control", 5_000);
        } catch {
          /* fall through to kill */
        }
        await new Promise((r) => setTimeout(r, 300));
        if (proc.exitCode === null) proc.kill("SIGKILL");
      }
      client.close();
    },
  };
}
