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
import { JupyterHandlerImpl, ZmqServer } from "tslab/dist/jupyter";
import { versions as tslabVersions } from "tslab";
import type * as zmq from "zeromq";
import { comms, type Buffers, type CommMsgType } from "./comms.js";
import { makeHeader, parseMessage, serializeMessage, WireError, type Header, type Message } from "./wire.js";
import { currentContext, hookProcessStreams, realStderr, runInContext, setFallbackContext, type MimeBundle, type OutputContext, type OutputSink } from "../display/output.js";
import { resetPlotlyEmbedding } from "../display/figure.js";
import { ExecutionSession } from "../notebook/session.js";
import { registerWidgetTargets } from "../widgets/targets.js";
import { Output } from "../widgets/controls.js";
import { openWidgets, type Widget } from "../widgets/widget.js";
import { KERNEL_VERSION } from "../version.js";

type Socket = zmq.Router | zmq.Publisher;

export class HelicoidServer extends ZmqServer {
  private executionCount = 0;
  private queue: Promise<void> = Promise.resolve();
  /** Bumped when a cell fails: executes queued before the failure are aborted (stop_on_error). */
  private generation = 0;
  private sendQueues = new Map<Socket, Promise<void>>();
  private lastParent: Header | null = null;
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
    hookProcessStreams();
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
          return await this.withStatus(msg, () => this.reply(sock, msg, "history_reply", { status: "ok", history: [] }));
        case "is_complete_request":
        case "inspect_request":
        case "complete_request":
          return await super.handleShellMessage(sock, ...frames);
        default:
          this.log(`unknown message type '${type}' ignored`);
      }
    } catch (err) {
      this.log(`error while handling ${type}: ${(err as Error)?.stack ?? String(err)}`);
    }
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
      const silent = content.silent === true;
      if (!silent && content.store_history !== false) this.executionCount++;
      const count = this.executionCount;
      const code = typeof content.code === "string" ? content.code : "";
      if (!silent) this.publish("execute_input", { code, execution_count: count }, msg.header);
      const ctx = this.contextFor(msg.header, { count, silent });
      setFallbackContext(ctx);
      this.lastParent = msg.header;
      const outcome = await this.session.run(code, ctx);
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
  private contextFor(parent: Header, opts: { count?: number; silent?: boolean } = {}): OutputContext {
    const pending: string[] = [];
    const flushCompanions = () => {
      for (const id of pending.splice(0)) this.attachCallbackOutput(id, sink);
    };
    const send = (type: string, c: Record<string, unknown>) => {
      if (!opts.silent) this.publish(type, c, parent);
    };
    const sink: OutputSink = {
      stream: (name, text) => send("stream", { name, text }),
      display: (data, metadata = {}, transient = {}, update = false) => {
        send(update ? "update_display_data" : "display_data", { data, metadata, transient });
        flushCompanions();
      },
      result: (data: MimeBundle, metadata = {}) => {
        if (opts.count !== undefined) send("execute_result", { execution_count: opts.count, data, metadata });
        else send("display_data", { data, metadata, transient: {} });
        flushCompanions();
      },
      error: (ename, evalue, traceback) => send("error", { ename, evalue, traceback }),
      clear: (wait) => send("clear_output", { wait }),
    };
    return { sink, parent, onWidgetDisplayed: (id) => pending.push(id) };
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
      if (msg.header.msg_type === "comm_open") comms.handleOpen(msg.content, incoming);
      else if (msg.header.msg_type === "comm_msg") comms.handleMessage(msg.content, incoming);
      else comms.handleClose(msg.content, incoming);
    });
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
    setTimeout(() => {
      try {
        comms.reset();
        this.close();
      } finally {
        process.exit(0);
      }
    }, 50);
  }

  publish(type: string, content: Record<string, unknown>, parent?: Header | null, metadata: Record<string, unknown> = {}, buffers: Buffers = []): void {
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
