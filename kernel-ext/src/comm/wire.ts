/**
 * The Jupyter wire protocol (messaging spec 5.3): parse and sign multipart ZeroMQ messages,
 * including the raw binary buffers that follow the four JSON frames (the widget protocol's buffers).
 *
 * Frames: [identities..., "<IDS|MSG>", hmac, header, parent_header, metadata, content, ...buffers].
 * The HMAC (hmac-sha256 with the connection key) covers the four JSON frames only.
 */
import { createHmac, createSecretKey, randomUUID, timingSafeEqual, type KeyObject } from "node:crypto";

export const DELIMITER = Buffer.from("<IDS|MSG>");
export const PROTOCOL_VERSION = "5.3";

export interface Header {
  msg_id: string;
  msg_type: string;
  session: string;
  username: string;
  date: string;
  version: string;
  [extra: string]: unknown;
}

export interface Message<C = Record<string, unknown>> {
  identities: Buffer[];
  header: Header;
  parent_header: Header | Record<string, never>;
  metadata: Record<string, unknown>;
  content: C;
  buffers: Buffer[];
  /** The HMAC signature it arrived with (received messages only). */
  signature?: string;
}

/** A message that could not be read: bad framing, bad JSON or a bad signature. */
export class WireError extends Error {
  override readonly name = "WireError";
}

/** The connection key as a key object, made once per key (not once per message). */
let cachedKey: { text: string; key: KeyObject } | null = null;
function keyObject(key: string): KeyObject {
  if (cachedKey?.text !== key) cachedKey = { text: key, key: createSecretKey(Buffer.from(key, "utf8")) };
  return cachedKey.key;
}

export function sign(key: string, frames: Array<Buffer | string>): string {
  if (!key) return "";
  const h = createHmac("sha256", keyObject(key));
  for (const f of frames) h.update(f);
  return h.digest("hex");
}

/** Parse and verify raw frames. Throws WireError (never anything else) on bad input. */
export function parseMessage(key: string, frames: Buffer[]): Message {
  const d = frames.findIndex((f) => f.equals(DELIMITER));
  if (d < 0) throw new WireError("message has no <IDS|MSG> delimiter");
  if (frames.length < d + 6) throw new WireError(`message has ${frames.length - d - 1} frames after the delimiter; expected at least 5`);
  const signature = frames[d + 1]!.toString("ascii");
  const body = frames.slice(d + 2, d + 6);
  if (key) {
    const expected = sign(key, body);
    const a = Buffer.from(signature, "utf8");
    const b = Buffer.from(expected, "utf8");
    if (a.length !== b.length || !timingSafeEqual(a, b)) throw new WireError("invalid message signature");
  }
  let parsed: unknown[];
  try {
    parsed = body.map((f) => JSON.parse(f.toString("utf8")));
  } catch (err) {
    throw new WireError(`message frame is not JSON: ${(err as Error).message}`);
  }
  const [header, parent, metadata, content] = parsed as [Header, Header, Record<string, unknown>, Record<string, unknown>];
  if (!header || typeof header !== "object" || typeof header.msg_type !== "string" || typeof header.msg_id !== "string") {
    throw new WireError("message header has no msg_type or msg_id");
  }
  return {
    identities: frames.slice(0, d),
    header,
    parent_header: parent && typeof parent === "object" ? parent : {},
    metadata: metadata && typeof metadata === "object" ? metadata : {},
    content: content && typeof content === "object" ? content : {},
    buffers: frames.slice(d + 6),
    signature,
  };
}

/**
 * Replay protection, as ipykernel does it: the signatures of the last `capacity` messages are
 * remembered and a message whose signature was already seen is dropped. A signed message copied
 * off the wire and sent again therefore runs once. Bounded: the oldest signature is forgotten first.
 */
export class ReplayGuard {
  private seen = new Set<string>();
  constructor(readonly capacity = 4096) {}

  /** True the first time a signature is seen; false for a replay. Empty signatures (no key) always pass. */
  admit(signature: string): boolean {
    if (!signature) return true;
    if (this.seen.has(signature)) return false;
    this.seen.add(signature);
    if (this.seen.size > this.capacity) {
      const oldest = this.seen.values().next().value as string;
      this.seen.delete(oldest);
    }
    return true;
  }
}

/** The signature frame of raw frames (empty when there is none). */
export function signatureOf(frames: Buffer[]): string {
  const d = frames.findIndex((f) => f.equals(DELIMITER));
  return d >= 0 && frames.length > d + 1 ? frames[d + 1]!.toString("ascii") : "";
}

/** The session id of this kernel process, used in the headers of the messages it sends. */
export const kernelSession = randomUUID();

export function makeHeader(msgType: string, parent?: Partial<Header>): Header {
  return {
    msg_id: randomUUID(),
    msg_type: msgType,
    session: kernelSession,
    username: typeof parent?.username === "string" ? parent.username : "helicoid",
    date: new Date().toISOString(),
    version: PROTOCOL_VERSION,
  };
}

export interface OutgoingMessage {
  identities?: Buffer[];
  header: Header;
  parent_header: Header | Record<string, never>;
  metadata?: Record<string, unknown>;
  content: unknown;
  buffers?: Array<ArrayBuffer | ArrayBufferView | Buffer>;
}

/** Serialize and sign a message into frames. Buffers are appended raw, unsigned, as the spec says. */
export function serializeMessage(key: string, msg: OutgoingMessage): Buffer[] {
  const body = [JSON.stringify(msg.header), JSON.stringify(msg.parent_header ?? {}), JSON.stringify(msg.metadata ?? {}), JSON.stringify(msg.content ?? {})].map((s) =>
    Buffer.from(s, "utf8"),
  );
  const frames: Buffer[] = [...(msg.identities ?? []), DELIMITER, Buffer.from(sign(key, body), "ascii"), ...body];
  for (const b of msg.buffers ?? []) frames.push(toBuffer(b));
  return frames;
}

export function toBuffer(b: ArrayBuffer | ArrayBufferView | Buffer): Buffer {
  if (Buffer.isBuffer(b)) return b;
  if (b instanceof ArrayBuffer) return Buffer.from(b);
  return Buffer.from(b.buffer, b.byteOffset, b.byteLength);
}
