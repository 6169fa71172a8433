/**
 * The Helicoid kernel server: tslab's ZeroMQ server and handlers, extended with
 * - the comm protocol (comm_open / comm_msg / comm_close / comm_info) in both directions, and the
 *   widget targets `jupyter.widget` and `jupyter.widget.control` (request_states);
 * - rich `execute_result`s and proper `error` messages (tslab prints both as text);
 * - a `kernel_info_reply` that passes the message schema (tslab's lacks `status`);
 * - robustness: a message with a bad signature or bad JSON, an unknown comm id or bad widget state is
 *   logged (or answered) and never ends the kernel; `interrupt_request` and shutdown work.
 *
 * Sockets are bound by tslab's `init()` to exactly the transport, ip and ports of the connection file.
 * Message types this file does not take (is_complete, inspect, complete) go to tslab unchanged.
 */
import { readFileSync } from "node:fs";
import { join } from "node:path";
import { fork, type ChildProcess } from "node:child_process";
import { JupyterHandlerImpl, ZmqServer } from "tslab/dist/jupyter";
import { printQuickInfo } from "tslab/dist/inspect";
import { versions as tslabVersions } from "tslab";
import * as zmq from "zeromq";
import { comms, type Buffers, type CommMsgType } from "./comms.js";
import { makeHeader, parseMessage, ReplayGuard, serializeMessage, WireError, type Header, type Message } from "./wire.js";
import type { ControlProcessData, FromControl, ToControl } from "./controlProcess.js";
import {
  currentContext,
  describeError,
  hookConsole,
  hookProcessStreams,
  hookTimers,
  interruptibly,
  isInterruption,
  realStderr,
  realTimers,
  reportError,
  runInContext,
  setFallbackContext,
  setInterruptHandler,
  Work,
  type MimeBundle,
  type OutputContext,
  type OutputSink,
} from "../display/output.js";
import { helpTarget, isCompleteCode } from "../notebook/completeness.js";
import { SessionHistory } from "../notebook/history.js";
import { resetPlotlyEmbedding } from "../display/figure.js";
import { ExecutionSession } from "../notebook/session.js";
import { registerWidgetTargets } from "../widgets/targets.js";
import { Output } from "../widgets/controls.js";
import { openWidgets, type Widget } from "../widgets/widget.js";
import { KERNEL_VERSION } from "../version.js";

type Socket = zmq.Router | zmq.Publisher;

/** Stream text waiting to be published: one message per (parent, stream name), sent in order. */
interface PendingStream {
  parent: Header;
  name: string;
  text: string[];
  size: number;
}
/** Stream text is sent at the latest when this much is waiting (bytes, roughly). */
const STREAM_FLUSH_BYTES = 1 << 20;

function shortJson(v: unknown): string {
  let t: string;
  try {
    t = JSON.stringify(v) ?? String(v);
  } catch {
    t = String(v);
  }
  return t.length > 80 ? `${t.slice(0, 77)}...` : t;
}

/** The widget front end's version check (`jupyter.widget.version`), answered as ipywidgets does. */
export const VERSION_TARGET = "jupyter.widget.version";
/** The semver range of the widget front end (protocol 2, @jupyter-widgets/base 2.x state) we speak. */
export const WIDGET_FRONTEND_RANGE = "~2.0.0";

function registerVersionTarget(log: (text: string) => void): void {
  comms.registerTarget(VERSION_TARGET, (comm) => {
    comm.onMessage((msg) => {
      if (msg.data.validated === false) log(`the widget front end (version ${String(msg.data.frontend_version)}) reports it does not match ${WIDGET_FRONTEND_RANGE}`);
    });
    comm.send({ version: WIDGET_FRONTEND_RANGE });
  });
}

export class HelicoidServer extends ZmqServer {
  private executionCount = 0;
  private queue: Promise<void> = Promise.resolve();
  /** Bumped when a cell fails: executes queued before the failure are aborted (stop_on_error). */
  private generation = 0;
  private sendQueues = new Map<Socket, Promise<void>>();
  private lastParent: Header | null = null;
  private readonly replay = new ReplayGuard();
  readonly history = new SessionHistory();
  private controlProcess: ChildProcess | null = null;
  private pendingStream: PendingStream | null = null;
  private streamFlushScheduled = false;
  closing = false;

  constructor(
    readonly session: ExecutionSession,
    configPath: string,
    private readonly log: (text: string) => void = (t) => realStderr(`[helicoid] ${t}\n`),
  ) {
    super(new JupyterHandlerImpl(session.executor, false), configPath);
    comms.log = (t) => this.log(t);
    comms.channel = {
      send: (type: CommMsgType, content, metadata, buffers) => this.publishComm(type, content, metadata, buffers),
    };
    registerWidgetTargets();
    registerVersionTarget((t) => this.log(t));
    hookProcessStreams();
    hookConsole();
    hookTimers();
    setInterruptHandler(() => session.interrupt());
    resetPlotlyEmbedding();
  }

  override async handleShellMessage(sock: zmq.Router, ...frames: Buffer[]): Promise<void> {
    let msg: Message;
    try {
      msg = parseMessage(this.connInfo.key, frames);
    } catch (err) {
      this.log(`message dropped: ${err instanceof WireError ? err.message : String(err)}`);
      return;
    }
    // A signed message seen before is a replay (ipykernel drops them the same way).
    if (sock !== this.controlProxy && !this.replay.admit(msg.signature ?? "")) {
      this.log(`message dropped: replayed signature (msg_id ${msg.header.msg_id}, ${msg.header.msg_type})`);
      return;
    }
    const type = msg.header.msg_type;
    try {
      switch (type) {
        case "execute_request":
          return await this.withStatus(msg, () => this.execute(sock, msg));
        case "kernel_info_request":
          return await this.withStatus(msg, () => this.reply(sock, msg, "kernel_info_reply", this.kernelInfo()));
        case "comm_info_request":
          return await this.withStatus(msg, () => {
            const target = typeof msg.content.target_name === "string" ? msg.content.target_name : undefined;
            this.reply(sock, msg, "comm_info_reply", { status: "ok", comms: comms.info(target) });
          });
        case "comm_open":
        case "comm_msg":
        case "comm_close":
          return await this.withStatus(msg, () => this.handleComm(msg));
        case "interrupt_request":
          this.session.interrupt();
          return this.reply(sock, msg, "interrupt_reply", { status: "ok" });
        case "shutdown_request":
          return await this.shutdown(sock, msg);
        case "history_request":
          return await this.withStatus(msg, () => this.reply(sock, msg, "history_reply", this.answerHistory(msg.content)));
        case "is_complete_request":
          return await this.withStatus(msg, () => this.reply(sock, msg, "is_complete_reply", this.answerIsComplete(msg.content)));
        case "inspect_request":
          return await this.withStatus(msg, () => this.reply(sock, msg, "inspect_reply", this.answerInspect(msg.content)));
        case "complete_request":
          return await this.withStatus(msg, () => this.reply(sock, msg, "complete_reply", this.answerComplete(msg.content)));
        default:
          this.log(`unknown message type '${type}' ignored`);
          if (type.endsWith("_request")) {
            await this.withStatus(msg, () =>
              this.reply(sock, msg, type.replace(/_request$/, "_reply"), {
                status: "error",
                ename: "UnknownRequest",
                evalue: `this kernel does not handle '${type}'`,
                traceback: [],
              }),
            );
          }
      }
    } catch (err) {
      this.log(`error while handling ${type}: ${(err as Error)?.stack ?? String(err)}`);
    }
  }

  /** Stands for the control socket (served by the control process) in replies. */
  private readonly controlProxy = { send: async (frames: Buffer[]) => this.controlProcess?.send({ kind: "send", frames } satisfies ToControl) } as unknown as zmq.Router;

  /**
   * Bind the sockets to exactly the connection file's addresses. Shell, iopub and stdin live in
   * the kernel's thread (as in tslab); control and heartbeat in a helper process
   * (`controlProcess.ts`) that answers while the kernel is busy and passes `interrupt_request` on (as a
   * message when the kernel's thread is free, as SIGINT when it is busy in synchronous code).
   */
  override async init(): Promise<void> {
    const cinfo = JSON.parse(readFileSync(this.configPath, "utf8"));
    this.connInfo = cinfo;
    const url = (port: number) => `${cinfo.transport}://${cinfo.ip}:${port}`;
    // A publisher drops messages for a subscriber whose queue is full (zeromq's default: 1000
    // messages). Bursts (thousands of widget echoes, many streams) must not be lost: a larger, still
    // bounded queue.
    this.iopub = new zmq.Publisher({ sendHighWaterMark: 100_000 });
    this.shell = new zmq.Router();
    this.stdin = new zmq.Router();
    const data: ControlProcessData = { controlUrl: url(cinfo.control_port), hbUrl: url(cinfo.hb_port), key: cinfo.key };
    const worker = fork(join(__dirname, "controlProcess.js"), [], {
      env: { ...process.env, HELICOID_CONTROL: JSON.stringify(data) },
      serialization: "advanced",
      stdio: ["ignore", "inherit", "inherit", "ipc"],
      execArgv: [],
    });
    this.controlProcess = worker;
    const ready = new Promise<void>((resolve, reject) => {
      worker.on("message", (m: FromControl) => {
        if (m.kind === "ready") resolve();
        else if (m.kind === "bind-error") reject(new Error(`control/heartbeat sockets: ${m.text}`));
        else if (m.kind === "log") this.log(m.text);
        else if (m.kind === "interrupt") {
          // The kernel's thread is free (this handler runs): interrupt here, without a signal.
          this.session.interrupt();
          worker.send({ kind: "interrupt-ack", id: m.id } satisfies ToControl);
        } else if (m.kind === "message") {
          void this.handleShellMessage(this.controlProxy, ...m.frames.map((f) => Buffer.from(f.buffer, f.byteOffset, f.byteLength)));
        }
      });
      worker.on("error", (err) => {
        this.log(`control process failed: ${err?.stack ?? String(err)}`);
        reject(err);
      });
      worker.on("exit", (code, signal) => {
        if (!this.closing) this.log(`control process ended (${code ?? signal}); control and heartbeat no longer answer`);
      });
    });
    void (async () => {
      for await (const frames of this.shell) void this.handleShellMessage(this.shell, ...(frames as Buffer[]));
    })();
    await Promise.all([this.iopub.bind(url(cinfo.iopub_port)), this.shell.bind(url(cinfo.shell_port)), this.stdin.bind(url(cinfo.stdin_port)), ready]);
  }

  override close(): void {
    this.handler.close();
    this.iopub.close();
    this.shell.close();
    this.stdin.close();
  }

  /** Ask the control process to close its sockets and wait (at most a second) until it has ended. */
  private stopControlThread(): Promise<void> {
    const w = this.controlProcess;
    if (!w) return Promise.resolve();
    return new Promise<void>((resolve) => {
      const t = realTimers.setTimeout(resolve, 1000);
      w.once("exit", () => {
        realTimers.clearTimeout(t);
        resolve();
      });
      if (w.exitCode !== null || w.signalCode !== null) return resolve();
      w.send({ kind: "close" } satisfies ToControl);
    });
  }

  kernelInfo(): Record<string, unknown> {
    const base = this.handler.handleKernel();
    return {
      status: "ok",
      protocol_version: "5.3",
      implementation: "helicoid",
      implementation_version: KERNEL_VERSION,
      language_info: { ...base.language_info, version: tslabVersions.typescript, pygments_lexer: "typescript" },
      banner: `Helicoid ${KERNEL_VERSION}: TypeScript (tslab ${tslabVersions.tslab}, TypeScript ${tslabVersions.typescript}, Node ${process.version}) with Jupyter widgets`,
      help_links: [],
    };
  }

  private answerHistory(content: Record<string, unknown>): Record<string, unknown> {
    try {
      return { status: "ok", history: this.history.query(content) };
    } catch (err) {
      return { status: "error", ...describeError(err), history: [] };
    }
  }

  /** Code and cursor of a complete/inspect request, checked; a RangeError names what is wrong. */
  private codeAndCursor(content: Record<string, unknown>): { code: string; cursor: number } {
    const code = content.code;
    if (typeof code !== "string") throw new RangeError(`code = ${shortJson(code)}: expected the code as text`);
    const raw = content.cursor_pos;
    if (raw === undefined || raw === null) return { code, cursor: code.length };
    if (typeof raw !== "number" || !Number.isInteger(raw) || raw < 0 || raw > code.length) {
      throw new RangeError(`cursor_pos = ${shortJson(raw)}: expected a whole number from 0 to ${code.length} (the length of the code)`);
    }
    return { code, cursor: raw };
  }

  private answerIsComplete(content: Record<string, unknown>): Record<string, unknown> {
    if (typeof content.code !== "string") return { status: "unknown" };
    try {
      const r = isCompleteCode(content.code);
      return r.status === "incomplete" ? { status: "incomplete", indent: r.indent ?? "" } : { status: r.status };
    } catch {
      return { status: "unknown" };
    }
  }

  private answerComplete(content: Record<string, unknown>): Record<string, unknown> {
    try {
      const { code, cursor } = this.codeAndCursor(content);
      const r = this.handler.handleComplete({ code, cursor_pos: cursor });
      return { ...r, status: "ok" };
    } catch (err) {
      return { status: "error", ...describeError(err) };
    }
  }

  private answerInspect(content: Record<string, unknown>): Record<string, unknown> {
    try {
      const { code, cursor } = this.codeAndCursor(content);
      const r = this.handler.handleInspect({ code, cursor_pos: cursor, detail_level: content.detail_level === 1 ? 1 : 0 });
      return { ...r, status: "ok" };
    } catch (err) {
      return { status: "error", ...describeError(err) };
    }
  }

  /** The help page for `name` (the pager's `X?`), from the same quick info as inspection. */
  private helpPage(name: string): string {
    let text = "";
    try {
      const info = this.session.executor.inspect(name, name.length);
      if (info) text = printQuickInfo(info);
    } catch (err) {
      text = `No help for ${name}: ${(err as Error)?.message ?? String(err)}`;
    }
    return text || `No help found for ${name}.`;
  }

  private async withStatus(parent: Message, fn: () => unknown): Promise<void> {
    this.publish("status", { execution_state: "busy" }, parent.header);
    try {
      await fn();
    } finally {
      this.publish("status", { execution_state: "idle" }, parent.header);
    }
  }

  private execute(sock: zmq.Router, msg: Message): Promise<void> {
    const content = msg.content as { code?: unknown; silent?: boolean; store_history?: boolean; stop_on_error?: boolean };
    const arrivedIn = this.generation;
    const task = async () => {
      if (arrivedIn !== this.generation) {
        this.reply(sock, msg, "execute_reply", { status: "aborted", execution_count: this.executionCount });
        return;
      }
      if (typeof content.code !== "string") {
        // A request without code text is answered, not run (ipykernel answers it with an error too).
        const error = { ename: "RangeError", evalue: `code = ${shortJson(content.code)}: expected the code as text`, traceback: [] as string[] };
        this.publish("error", error, msg.header);
        this.reply(sock, msg, "execute_reply", { status: "error", execution_count: this.executionCount, ...error });
        return;
      }
      const silent = content.silent === true;
      if (!silent && content.store_history !== false) this.executionCount++;
      const count = this.executionCount;
      const code = typeof content.code === "string" ? content.code : "";
      if (!silent) this.publish("execute_input", { code, execution_count: count }, msg.header);
      const stored = !silent && content.store_history !== false;
      if (stored) this.history.record(count, code);
      const help = helpTarget(code);
      if (help !== null) {
        const page = { source: "page", data: { "text/plain": this.helpPage(help) }, start: 0 };
        this.reply(sock, msg, "execute_reply", { status: "ok", execution_count: count, payload: [page], user_expressions: {} });
        return;
      }
      const ctx = this.contextFor(msg.header, { count, silent, onResult: stored ? (text) => this.history.recordOutput(count, text) : undefined });
      setFallbackContext(ctx);
      this.lastParent = msg.header;
      const outcome = await this.session.run(code, ctx);
      this.flushStream();
      if (outcome.ok) {
        this.reply(sock, msg, "execute_reply", { status: "ok", execution_count: count, payload: [], user_expressions: {} });
      } else {
        if (content.stop_on_error !== false) this.generation++;
        this.reply(sock, msg, "execute_reply", { status: "error", execution_count: count, ...outcome.error });
      }
    };
    const run = this.queue.then(task, task);
    this.queue = run.catch(() => {});
    return run;
  }

  /** The output context of a request: iopub messages with that request as parent. */
  private contextFor(parent: Header, opts: { count?: number; silent?: boolean; onResult?: (text: string) => void } = {}): OutputContext {
    const pending: string[] = [];
    const flushCompanions = () => {
      for (const id of pending.splice(0)) this.attachCallbackOutput(id, sink);
    };
    const send = (type: string, c: Record<string, unknown>) => {
      if (!opts.silent) this.publish(type, c, parent);
    };
    const sink: OutputSink = {
      stream: (name, text) => {
        if (!opts.silent) this.queueStream(parent, name, text);
      },
      display: (data, metadata = {}, transient = {}, update = false) => {
        send(update ? "update_display_data" : "display_data", { data, metadata, transient });
        flushCompanions();
      },
      result: (data: MimeBundle, metadata = {}) => {
        if (typeof data["text/plain"] === "string") opts.onResult?.(data["text/plain"]);
        if (opts.count !== undefined) send("execute_result", { execution_count: opts.count, data, metadata });
        else send("display_data", { data, metadata, transient: {} });
        flushCompanions();
      },
      error: (ename, evalue, traceback) => send("error", { ename, evalue, traceback }),
      clear: (wait) => send("clear_output", { wait }),
    };
    return { sink, parent, onWidgetDisplayed: (id) => pending.push(id), work: new Work() };
  }

  /**
   * Stream output is coalesced: consecutive writes of one stream for one parent become one
   * message, sent when the event loop is next free, when another message is published (order is
   * kept), or when about a megabyte is waiting. A cell printing 20,000 lines sends a few messages.
   */
  private queueStream(parent: Header, name: string, text: string): void {
    const p = this.pendingStream;
    if (p && p.parent === parent && p.name === name) {
      p.text.push(text);
      p.size += text.length;
    } else {
      this.flushStream();
      this.pendingStream = { parent, name, text: [text], size: text.length };
    }
    if (this.pendingStream!.size >= STREAM_FLUSH_BYTES) this.flushStream();
    else if (!this.streamFlushScheduled) {
      this.streamFlushScheduled = true;
      realTimers.setImmediate(() => {
        this.streamFlushScheduled = false;
        this.flushStream();
      });
    }
  }

  private flushStream(): void {
    const p = this.pendingStream;
    if (!p) return;
    this.pendingStream = null;
    this.sendNow("stream", { name: p.name, text: p.text.join("") }, p.parent);
  }

  /**
   * Under each displayed widget, an output area (empty until used) that shows what the widget's
   * callbacks print and the errors they throw, so they appear in the notebook and not only in a log.
   */
  private attachCallbackOutput(modelId: string, sink: OutputSink): void {
    const root = openWidgets.get(modelId);
    if (!root || root.callbackOutput) return;
    const out = new Output();
    const mark = (w: Widget, seen: Set<Widget>) => {
      if (seen.has(w)) return;
      seen.add(w);
      if (!w.callbackOutput) w.callbackOutput = out;
      for (const c of w.referencedWidgets()) mark(c, seen);
    };
    mark(root, new Set());
    out.callbackOutput = out;
    sink.display({ "application/vnd.jupyter.widget-view+json": { version_major: 2, version_minor: 0, model_id: out.id }, "text/plain": "" }, {});
  }

  private handleComm(msg: Message): void {
    const ctx = this.contextFor(msg.header);
    const incoming = { metadata: msg.metadata, buffers: msg.buffers, header: msg.header as unknown as Record<string, unknown> };
    runInContext(ctx, () => {
      try {
        // Callbacks run like cells: SIGINT (or an interrupt_request) stops an endless loop.
        interruptibly(() => {
          if (msg.header.msg_type === "comm_open") comms.handleOpen(msg.content, incoming);
          else if (msg.header.msg_type === "comm_msg") comms.handleMessage(msg.content, incoming);
          else comms.handleClose(msg.content, incoming);
        });
      } catch (err) {
        if (isInterruption(err)) this.session.interrupt();
        reportError(err, ctx.sink);
      }
    });
    this.flushStream();
  }

  private publishComm(type: CommMsgType, content: Record<string, unknown>, metadata: Record<string, unknown>, buffers: Buffers): void {
    const parent = (currentContext()?.parent as Header | undefined) ?? this.lastParent ?? undefined;
    this.publish(type, content, parent, metadata, buffers);
  }

  private async shutdown(sock: zmq.Router, msg: Message): Promise<void> {
    const restart = msg.content.restart === true;
    this.publish("status", { execution_state: "busy" }, msg.header);
    this.reply(sock, msg, "shutdown_reply", { status: "ok", restart });
    this.publish("status", { execution_state: "idle" }, msg.header);
    this.closing = true;
    await Promise.all([...this.sendQueues.values()]);
    await this.stopControlThread();
    realTimers.setTimeout(() => {
      try {
        comms.reset();
        this.close();
      } finally {
        process.exit(0);
      }
    }, 50);
  }

  publish(type: string, content: Record<string, unknown>, parent?: Header | null, metadata: Record<string, unknown> = {}, buffers: Buffers = []): void {
    this.flushStream();
    this.sendNow(type, content, parent, metadata, buffers);
  }

  private sendNow(type: string, content: Record<string, unknown>, parent?: Header | null, metadata: Record<string, unknown> = {}, buffers: Buffers = []): void {
    const frames = serializeMessage(this.connInfo.key, {
      identities: [Buffer.from(`kernel.${type}`)],
      header: makeHeader(type, parent ?? undefined),
      parent_header: parent ?? {},
      metadata,
      content,
      buffers,
    });
    this.enqueue(this.iopub, frames);
  }

  reply(sock: zmq.Router, request: Message, type: string, content: Record<string, unknown>): void {
    const frames = serializeMessage(this.connInfo.key, {
      identities: request.identities,
      header: makeHeader(type, request.header),
      parent_header: request.header,
      metadata: {},
      content,
    });
    this.enqueue(sock, frames);
  }

  /** One send at a time per socket (zeromq.js allows a single pending send). */
  private enqueue(sock: Socket, frames: Buffer[]): void {
    const prev = this.sendQueues.get(sock) ?? Promise.resolve();
    const next = prev.then(() => sock.send(frames)).catch((err) => this.log(`send failed: ${String(err)}`));
    this.sendQueues.set(sock, next);
  }
}
