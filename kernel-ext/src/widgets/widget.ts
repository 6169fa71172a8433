/**
 * Kernel-side widget models speaking the Jupyter widget message protocol 2.1.
 *
 * A `Widget` owns a state (a plain object whose `_model_*`/`_view_*` keys name the front-end
 * model and view), opens a comm to target `jupyter.widget` with that state, and keeps it in sync:
 * `set()` sends `update`; an `update` from the front end is answered at once with an `echo_update`
 * of the received keys (protocol 2.1), then applied, then observers run. A value an observer or a
 * validator changes is sent back as a normal `update`. `request_state` gets the full state.
 * Custom messages go both ways. Binary values (typed arrays, ArrayBuffer) travel as buffers.
 * Widget values inside a state (children, layout, link targets) travel as "IPY_MODEL_<id>".
 *
 * An exception in an observer or custom handler is shown in the notebook (below the widget, in the
 * callback output the kernel attaches when it displays the widget) and never ends the kernel.
 */
import { comms, type Comm, type IncomingComm } from "../comm/comms.js";
import { mimeBundle, type Displayable } from "../display/bundle.js";
import { currentContext, reportError, runInContext, type MimeBundle, type OutputSink } from "../display/output.js";
import { putBuffers, removeBuffers, safeKey } from "./buffers.js";

export const WIDGET_PROTOCOL_VERSION = "2.1.0";
export const WIDGET_TARGET = "jupyter.widget";

export interface ModelRef {
  name: string;
  module: string;
  version: string;
}

export type WidgetState = Record<string, unknown>;
export type ChangeCallback<V = unknown> = (value: V, old: V, widget: Widget) => void;
export type CustomCallback = (content: unknown, buffers: DataView[], widget: Widget) => void;

const registryKey = Symbol.for("helicoid.widgets");
const g = globalThis as unknown as Record<symbol, Map<string, Widget>>;
/** Every open widget of this process, by model id. */
export const openWidgets: Map<string, Widget> = (g[registryKey] ??= new Map());

const REF_PREFIX = "IPY_MODEL_";

export class Widget<S extends WidgetState = WidgetState> implements Displayable {
  readonly id: string;
  protected readonly comm: Comm;
  private state: WidgetState;
  private listeners = new Map<string, Set<ChangeCallback<never>>>();
  private customListeners = new Set<CustomCallback>();
  /** Values the front end just sent, not to be sent back unless changed (echo semantics). */
  private lockedValues: Record<string, string> | null = null;
  /** Where output of this widget's callbacks is shown (set by the kernel when it is displayed). */
  callbackOutput: { sink: OutputSink } | null = null;

  constructor(init: { model: ModelRef; view?: ModelRef | null; state: S; id?: string }) {
    this.state = {
      _model_name: init.model.name,
      _model_module: init.model.module,
      _model_module_version: init.model.version,
      _view_name: init.view?.name ?? null,
      _view_module: init.view?.module ?? null,
      _view_module_version: init.view?.version ?? "",
      ...init.state,
    };
    const { state, buffer_paths, buffers } = removeBuffers(serializeValue(this.state) as WidgetState);
    this.comm = comms.open(WIDGET_TARGET, { state, buffer_paths }, { version: WIDGET_PROTOCOL_VERSION }, buffers, init.id);
    this.id = this.comm.id;
    openWidgets.set(this.id, this as Widget);
    this.comm.onMessage((msg) => this.handleMessage(msg));
    this.comm.onClose(() => openWidgets.delete(this.id));
  }

  get<K extends keyof S & string>(key: K): S[K] {
    return this.state[key] as S[K];
  }

  /** A copy of the whole state (widget references as widgets, binary values as given). */
  getState(): S {
    return { ...this.state } as S;
  }

  /** Change state keys: the changed ones are sent to the front end and observers run. */
  set(changes: Partial<S>): this {
    this.applyChanges(changes as WidgetState);
    return this;
  }

  /** Observe one key, several keys, or "*" (every key). Returns a function that stops observing. */
  onChange<K extends keyof S & string>(keys: K | K[] | "*", callback: ChangeCallback<S[K]>): () => void {
    const list = Array.isArray(keys) ? keys : [keys];
    for (const k of list) {
      let set = this.listeners.get(k);
      if (!set) this.listeners.set(k, (set = new Set()));
      set.add(callback as ChangeCallback<never>);
    }
    return () => list.forEach((k) => this.listeners.get(k)?.delete(callback as ChangeCallback<never>));
  }

  /** Observe custom messages from the front end. */
  onCustom(callback: CustomCallback): () => void {
    this.customListeners.add(callback);
    return () => this.customListeners.delete(callback);
  }

  /** Send a custom message to the front-end model. */
  send(content: unknown, buffers: Array<ArrayBuffer | ArrayBufferView> = []): void {
    this.comm.send({ method: "custom", content }, {}, buffers);
  }

  close(): void {
    openWidgets.delete(this.id);
    this.comm.close();
  }

  get closed(): boolean {
    return this.comm.closed;
  }

  /** Values (widgets, binary) in the protocol's form. */
  private serializedFrom(values: WidgetState): ReturnType<typeof removeBuffers> {
    return removeBuffers(serializeValue(values) as WidgetState);
  }

  /** The state as the protocol carries it: JSON part, buffer paths and buffers. */
  serializedState(keys?: string[]): ReturnType<typeof removeBuffers> {
    const picked: WidgetState = {};
    for (const k of keys ?? Object.keys(this.state)) picked[k] = this.state[k];
    return removeBuffers(serializeValue(picked) as WidgetState);
  }

  /** Validate/coerce an incoming or new value (subclasses clamp, round...). */
  protected coerce(_key: string, value: unknown): unknown {
    return value;
  }

  /** Widgets directly referenced from this widget's state (children, layout...). */
  referencedWidgets(): Widget[] {
    const out: Widget[] = [];
    const walk = (v: unknown) => {
      if (v instanceof Widget) out.push(v);
      else if (Array.isArray(v)) v.forEach(walk);
      else if (v && typeof v === "object" && (v as object).constructor === Object) Object.values(v).forEach(walk);
    };
    Object.values(this.state).forEach(walk);
    return out;
  }

  [mimeBundle](): { data: MimeBundle } {
    currentContext()?.onWidgetDisplayed?.(this.id);
    return {
      data: {
        "application/vnd.jupyter.widget-view+json": { version_major: 2, version_minor: 0, model_id: this.id },
        "text/plain": this.describe(),
      },
    };
  }

  /** A one-line text form for plain-text front ends. */
  describe(): string {
    const name = String(this.state._model_name).replace(/Model$/, "");
    const v = this.state.value;
    return v === undefined || typeof v === "object" ? `${name}()` : `${name}(value=${JSON.stringify(v)})`;
  }

  private applyChanges(changes: WidgetState): void {
    const changed: Array<[string, unknown, unknown]> = [];
    for (const [k, raw] of Object.entries(changes)) {
      const v = this.coerce(k, raw);
      const old = this.state[k];
      if (sameValue(old, v)) continue;
      this.state[k] = v;
      changed.push([k, v, old]);
    }
    if (changed.length === 0) return;
    const toSend = changed.map(([k]) => k).filter((k) => !(this.lockedValues && k in this.lockedValues && this.lockedValues[k] === fingerprint(this.state[k])));
    if (toSend.length > 0 && !this.comm.closed) {
      const { state, buffer_paths, buffers } = this.serializedState(toSend);
      this.comm.send({ method: "update", state, buffer_paths }, {}, buffers);
    }
    for (const [k, v, old] of changed) {
      for (const key of [k, "*"]) {
        for (const cb of this.listeners.get(key) ?? []) this.runCallback(() => (cb as ChangeCallback)(v, old, this as Widget));
      }
    }
  }

  /** Run user code of this widget: errors are shown (below the widget) and never propagate. */
  private runCallback(fn: () => void): void {
    const ctx = currentContext();
    const out = this.callbackOutput;
    const sink = out && ctx ? teeSink(ctx.sink, out.sink) : out ? out.sink : ctx?.sink;
    const run = () => {
      try {
        fn();
      } catch (err) {
        reportError(err, sink);
      }
    };
    if (sink && ctx) runInContext({ ...ctx, sink }, run);
    else run();
  }

  /**
   * Check one key of a front-end update against the model's declared attributes: the key must be
   * one of the state's own keys (not `_model_*`/`_view_*`), and the value of the kind the state
   * holds (a finite number for a number, a string, a boolean, a list, an object, binary data, a
   * widget reference; null for a structured value). Returns the reason for refusing it, or null.
   * Subclasses add ranges.
   */
  protected checkIncoming(key: string, value: unknown): string | null {
    if (!safeKey(key) || !Object.prototype.hasOwnProperty.call(this.state, key)) return `'${key}' is not an attribute of ${String(this.state._model_name)}`;
    if (/^_(model|view)_/.test(key)) return `'${key}' is fixed by the kernel`;
    const cur = this.state[key];
    const kind = kindOf(cur);
    const got = kindOf(value);
    if (kind === "null" || kind === got) {
      if (got === "number" && !Number.isFinite(value as number)) return `${key} = ${String(value)}: expected a finite number`;
      return null;
    }
    // Structured values may be cleared (a result, a sweep, a layout); numbers, text and flags may not.
    if (got === "null" && (kind === "widget" || kind === "object" || kind === "list" || kind === "binary")) return null;
    return `${key} = ${short(value)}: expected ${kind === "widget" ? "a widget reference" : `a ${kind}`}`;
  }

  /** Cross-attribute checks of the state an update would give (e.g. min <= max). Null when fine. */
  protected checkCombined(_next: WidgetState): string | null {
    return null;
  }

  private handleMessage(msg: IncomingComm): void {
    const data = msg.data;
    const method = data.method;
    if (method === "update") {
      const raw = data.state && typeof data.state === "object" && !Array.isArray(data.state) ? (data.state as WidgetState) : null;
      if (!raw) {
        reportError(new Error(`widget ${this.id}: update without a state object ignored`));
        return;
      }
      // Own keys only, copied into a prototype-free object (a "__proto__" key stays a plain key).
      const incoming: WidgetState = Object.create(null);
      for (const k of Object.keys(raw)) incoming[k] = raw[k];
      const problems = putBuffers(incoming, data.buffer_paths, msg.buffers);
      const accepted: WidgetState = {};
      const rejected: string[] = [];
      for (const k of Object.keys(incoming)) {
        const v = deserializeValue(incoming[k]);
        const why = this.checkIncoming(k, v);
        if (why) {
          problems.push(why);
          if (safeKey(k) && Object.prototype.hasOwnProperty.call(this.state, k)) rejected.push(k);
        } else accepted[k] = v;
      }
      if (Object.keys(accepted).length > 0) {
        const why = this.checkCombined({ ...this.state, ...accepted });
        if (why) {
          problems.push(why);
          for (const k of Object.keys(accepted)) rejected.push(k);
          for (const k of Object.keys(accepted)) delete accepted[k];
        }
      }
      // Protocol 2.1: echo what we accepted, at once, to every front end.
      if (Object.keys(accepted).length > 0) {
        const echo = this.serializedFrom(accepted);
        this.comm.send({ method: "echo_update", state: echo.state, buffer_paths: echo.buffer_paths }, {}, echo.buffers);
      }
      // A refused value is answered with the kernel's state of those keys, as ipywidgets does.
      if (rejected.length > 0) {
        const { state, buffer_paths, buffers } = this.serializedState([...new Set(rejected)]);
        this.comm.send({ method: "update", state, buffer_paths }, {}, buffers);
      }
      if (problems.length > 0) reportError(new WidgetStateError(`widget ${this.id} (${String(this.state._model_name)}): refused from the front end: ${problems.join("; ")}`));
      if (Object.keys(accepted).length === 0) return;
      // A received value is not sent back; if coercion or an observer changes it, the change is sent.
      this.lockedValues = Object.fromEntries(Object.keys(accepted).map((k) => [k, fingerprint(accepted[k])]));
      try {
        this.applyChanges(accepted);
      } finally {
        this.lockedValues = null;
      }
    } else if (method === "request_state") {
      const { state, buffer_paths, buffers } = this.serializedState();
      this.comm.send({ method: "update", state, buffer_paths }, {}, buffers);
    } else if (method === "custom") {
      const views = msg.buffers.map((b) => new DataView(b.buffer, b.byteOffset, b.byteLength));
      for (const cb of this.customListeners) this.runCallback(() => cb(data.content, views, this as Widget));
    } else {
      reportError(new Error(`widget ${this.id}: unknown method ${JSON.stringify(method)} ignored`));
    }
  }
}

/** A widget state update from the front end was refused (wrong kind, out of range, bad buffer path). */
export class WidgetStateError extends Error {
  override readonly name = "WidgetStateError";
}

type Kind = "null" | "number" | "string" | "boolean" | "list" | "object" | "binary" | "widget" | "other";
function kindOf(v: unknown): Kind {
  if (v === null || v === undefined) return "null";
  if (typeof v === "number") return "number";
  if (typeof v === "string") return "string";
  if (typeof v === "boolean") return "boolean";
  if (Array.isArray(v)) return "list";
  if (v instanceof Widget) return "widget";
  if (ArrayBuffer.isView(v) || v instanceof ArrayBuffer) return "binary";
  if (typeof v === "object") return "object";
  return "other";
}

function short(v: unknown): string {
  let t: string;
  try {
    t = typeof v === "string" ? JSON.stringify(v) : (JSON.stringify(v) ?? String(v));
  } catch {
    t = String(v);
  }
  return t.length > 80 ? `${t.slice(0, 77)}...` : t;
}

function teeSink(a: OutputSink, b: OutputSink): OutputSink {
  return {
    stream: (n, t) => (a.stream(n, t), b.stream(n, t)),
    display: (d, m, tr, u) => (a.display(d, m, tr, u), b.display(d, m, tr, u)),
    result: (d, m) => (a.result(d, m), b.result(d, m)),
    error: (e, v, tb) => (a.error(e, v, tb), b.error(e, v, tb)),
    clear: (w) => (a.clear(w), b.clear(w)),
  };
}

/** Widgets become "IPY_MODEL_<id>" references; everything else is kept. */
export function serializeValue(v: unknown): unknown {
  if (v instanceof Widget) return REF_PREFIX + v.id;
  if (Array.isArray(v)) return v.map(serializeValue);
  if (v && typeof v === "object" && (v as object).constructor === Object) {
    const out: Record<string, unknown> = {};
    for (const [k, x] of Object.entries(v)) out[k] = serializeValue(x);
    return out;
  }
  return v;
}

/** "IPY_MODEL_<id>" of an open widget becomes that widget. */
export function deserializeValue(v: unknown): unknown {
  if (typeof v === "string" && v.startsWith(REF_PREFIX)) return openWidgets.get(v.slice(REF_PREFIX.length)) ?? v;
  if (Array.isArray(v)) return v.map(deserializeValue);
  if (v && typeof v === "object" && (v as object).constructor === Object) {
    const out: Record<string, unknown> = {};
    for (const [k, x] of Object.entries(v)) out[k] = deserializeValue(x);
    return out;
  }
  return v;
}

function fingerprint(v: unknown): string {
  if (ArrayBuffer.isView(v)) return "bin:" + Buffer.from(v.buffer, v.byteOffset, v.byteLength).toString("base64");
  if (v instanceof ArrayBuffer) return "bin:" + Buffer.from(v).toString("base64");
  try {
    return JSON.stringify(serializeValue(v)) ?? "undefined";
  } catch {
    return String(v);
  }
}

function sameValue(a: unknown, b: unknown): boolean {
  if (a === b) return true;
  if (typeof a !== "object" || typeof b !== "object" || a === null || b === null) return Number.isNaN(a) && Number.isNaN(b);
  return fingerprint(a) === fingerprint(b);
}

/** Save form of all open widgets, as Jupyter stores it in notebook metadata. */
export function widgetStateDocument(): {
  version_major: 2;
  version_minor: 0;
  state: Record<
    string,
    {
      model_name: string;
      model_module: string;
      model_module_version: string;
      state: WidgetState;
      buffers?: Array<{ path: Array<string | number>; data: string; encoding: "base64" }>;
    }
  >;
} {
  const state: ReturnType<typeof widgetStateDocument>["state"] = {};
  for (const [id, w] of openWidgets) {
    const s = w.serializedState();
    const entry: (typeof state)[string] = {
      model_name: String(s.state._model_name),
      model_module: String(s.state._model_module),
      model_module_version: String(s.state._model_module_version),
      state: s.state,
    };
    if (s.buffers.length) {
      entry.buffers = s.buffers.map((b, i) => ({
        path: s.buffer_paths[i]!,
        data: (ArrayBuffer.isView(b) ? Buffer.from(b.buffer, b.byteOffset, b.byteLength) : Buffer.from(b)).toString("base64"),
        encoding: "base64" as const,
      }));
    }
    state[id] = entry;
  }
  return { version_major: 2, version_minor: 0, state };
}
