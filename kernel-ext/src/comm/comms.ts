/**
 * The Jupyter comm protocol on the kernel side: comms opened by either side, messages in both
 * directions, targets, and `comm_info` (open comms filtered by target).
 *
 * One `CommManager` per process (kept on globalThis, so the kernel and user code share it even
 * if the module were loaded twice). How comm messages leave the process is a `CommChannel`: the
 * ZeroMQ kernel publishes them on iopub; the in-process notebook runner has none.
 */
import { randomUUID } from "node:crypto";
import { currentContext, reportError, runInContext } from "../display/output.js";

export type CommMsgType = "comm_open" | "comm_msg" | "comm_close";
export type Buffers = Array<ArrayBuffer | ArrayBufferView>;

export interface CommChannel {
  send(msgType: CommMsgType, content: Record<string, unknown>, metadata: Record<string, unknown>, buffers: Buffers): void;
}

/** What arrived with a message from the front end. */
export interface IncomingComm {
  data: Record<string, unknown>;
  metadata: Record<string, unknown>;
  buffers: Buffer[];
  /** The header of the incoming message (its msg_id is the parent of echoes and replies). */
  header: Record<string, unknown>;
}

export type CommMessageHandler = (msg: IncomingComm) => void;
export type CommTargetHandler = (comm: Comm, msg: IncomingComm) => void;

export class Comm {
  private messageHandlers = new Set<CommMessageHandler>();
  private closeHandlers = new Set<CommMessageHandler>();
  closed = false;

  constructor(
    readonly id: string,
    readonly target: string,
    private readonly manager: CommManager,
  ) {}

  send(data: Record<string, unknown>, metadata: Record<string, unknown> = {}, buffers: Buffers = []): void {
    if (this.closed) return;
    this.manager.channel?.send("comm_msg", { comm_id: this.id, data }, metadata, buffers);
  }

  close(data: Record<string, unknown> = {}): void {
    if (this.closed) return;
    this.closed = true;
    this.manager.channel?.send("comm_close", { comm_id: this.id, data }, {}, []);
    this.manager.forget(this.id);
  }

  onMessage(h: CommMessageHandler): () => void {
    this.messageHandlers.add(h);
    return () => this.messageHandlers.delete(h);
  }

  onClose(h: CommMessageHandler): () => void {
    this.closeHandlers.add(h);
    return () => this.closeHandlers.delete(h);
  }

  /** @internal */ dispatch(msg: IncomingComm): void {
    for (const h of this.messageHandlers) guarded(() => h(msg));
  }

  /** @internal */ dispatchClose(msg: IncomingComm): void {
    this.closed = true;
    for (const h of this.closeHandlers) guarded(() => h(msg));
  }
}

/** Run a handler; an exception is shown in the current output context and never escapes. */
function guarded(fn: () => void): void {
  try {
    fn();
  } catch (err) {
    reportError(err);
  }
}

export class CommManager {
  channel: CommChannel | null = null;
  private comms = new Map<string, Comm>();
  private targets = new Map<string, CommTargetHandler>();
  /** Called with a reason when a message cannot be delivered (unknown comm id, unknown target). */
  log: (text: string) => void = (text) => process.emitWarning(text, "HelicoidComm");

  registerTarget(name: string, handler: CommTargetHandler): void {
    this.targets.set(name, handler);
  }

  /** Open a comm from the kernel side. */
  open(target: string, data: Record<string, unknown> = {}, metadata: Record<string, unknown> = {}, buffers: Buffers = [], id: string = randomUUID().replace(/-/g, "")): Comm {
    const comm = new Comm(id, target, this);
    this.comms.set(id, comm);
    this.channel?.send("comm_open", { comm_id: id, target_name: target, data }, metadata, buffers);
    return comm;
  }

  get(id: string): Comm | undefined {
    return this.comms.get(id);
  }

  /** @internal */ forget(id: string): void {
    this.comms.delete(id);
  }

  /** `comm_info_reply` content: open comms, optionally only those of one target. */
  info(targetName?: string): Record<string, { target_name: string }> {
    const out: Record<string, { target_name: string }> = {};
    for (const [id, c] of this.comms) {
      if (!targetName || c.target === targetName) out[id] = { target_name: c.target };
    }
    return out;
  }

  /** A `comm_open` from the front end. Unknown targets are answered with a `comm_close`. */
  handleOpen(content: Record<string, unknown>, incoming: Omit<IncomingComm, "data">): void {
    const id = String(content.comm_id ?? "");
    const target = String(content.target_name ?? "");
    const handler = this.targets.get(target);
    if (!id) {
      this.log(`comm_open without comm_id ignored`);
      return;
    }
    if (!handler) {
      this.log(`comm_open for unknown target '${target}' (comm ${id}); closing it`);
      this.channel?.send("comm_close", { comm_id: id, data: {} }, {}, []);
      return;
    }
    const comm = new Comm(id, target, this);
    this.comms.set(id, comm);
    guarded(() => handler(comm, { ...incoming, data: asRecord(content.data) }));
  }

  /** A `comm_msg` from the front end. Unknown comm ids are logged, never fatal. */
  handleMessage(content: Record<string, unknown>, incoming: Omit<IncomingComm, "data">): void {
    const id = String(content.comm_id ?? "");
    const comm = this.comms.get(id);
    if (!comm) {
      this.log(`comm_msg for unknown comm id '${id}' ignored`);
      return;
    }
    comm.dispatch({ ...incoming, data: asRecord(content.data) });
  }

  handleClose(content: Record<string, unknown>, incoming: Omit<IncomingComm, "data">): void {
    const id = String(content.comm_id ?? "");
    const comm = this.comms.get(id);
    if (!comm) {
      this.log(`comm_close for unknown comm id '${id}' ignored`);
      return;
    }
    this.comms.delete(id);
    comm.dispatchClose({ ...incoming, data: asRecord(content.data) });
  }

  /** Close every comm (kernel shutdown or a notebook run's end), without sending anything. */
  reset(): void {
    for (const c of this.comms.values()) c.closed = true;
    this.comms.clear();
  }
}

function asRecord(v: unknown): Record<string, unknown> {
  return v && typeof v === "object" && !Array.isArray(v) ? (v as Record<string, unknown>) : {};
}

const key = Symbol.for("helicoid.comms");
const g = globalThis as unknown as Record<symbol, CommManager>;
/** The process's comm manager. */
export const comms: CommManager = (g[key] ??= new CommManager());

export { currentContext, runInContext };
