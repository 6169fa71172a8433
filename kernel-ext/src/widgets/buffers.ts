/**
 * Binary buffers of the widget protocol 2: any ArrayBuffer or typed array anywhere in a state is
 * taken out and sent as a raw frame; its path is listed in `buffer_paths` (a removed object key, or
 * null at a list index). The reverse puts received buffers back at their paths.
 */
export type Path = Array<string | number>;

function isBinary(v: unknown): v is ArrayBuffer | ArrayBufferView {
  return v instanceof ArrayBuffer || ArrayBuffer.isView(v);
}

export function removeBuffers(state: Record<string, unknown>): {
  state: Record<string, unknown>;
  buffer_paths: Path[];
  buffers: Array<ArrayBuffer | ArrayBufferView>;
} {
  const buffer_paths: Path[] = [];
  const buffers: Array<ArrayBuffer | ArrayBufferView> = [];
  const walk = (v: unknown, path: Path): unknown => {
    if (isBinary(v)) {
      buffer_paths.push(path);
      buffers.push(v);
      return undefined;
    }
    if (Array.isArray(v)) {
      return v.map((x, i) => {
        const r = walk(x, [...path, i]);
        return r === undefined && isBinary(x) ? null : r;
      });
    }
    if (v && typeof v === "object" && (v as object).constructor === Object) {
      const out: Record<string, unknown> = {};
      for (const [k, x] of Object.entries(v as Record<string, unknown>)) {
        const r = walk(x, [...path, k]);
        if (!(r === undefined && isBinary(x))) out[k] = r;
      }
      return out;
    }
    return v;
  };
  const out = walk(state, []) as Record<string, unknown>;
  return { state: out, buffer_paths, buffers };
}

/** Path segments never followed or written: they reach prototypes instead of the state's own data. */
const FORBIDDEN = new Set(["__proto__", "constructor", "prototype"]);

/** Is `seg` a key we may follow in a received state (an own-data key, not a prototype route)? */
export function safeKey(seg: unknown): seg is string | number {
  if (typeof seg === "number") return Number.isInteger(seg) && seg >= 0;
  return typeof seg === "string" && !FORBIDDEN.has(seg);
}

/**
 * Put buffers back into a received state at their paths (mutates `state`, which is ours).
 * Only own properties are followed, never `__proto__`, `constructor` or `prototype`; a path that
 * does not lead to an own object of the state is skipped and listed in the returned problems.
 */
export function putBuffers(state: Record<string, unknown>, paths: unknown, buffers: Buffer[]): string[] {
  const problems: string[] = [];
  if (paths === undefined || paths === null) return problems;
  if (!Array.isArray(paths)) return ["buffer_paths is not a list"];
  paths.forEach((path, i) => {
    if (!Array.isArray(path) || path.length === 0) return void problems.push(`buffer path ${i} is not a non-empty list`);
    if (i >= buffers.length) return void problems.push(`buffer path ${JSON.stringify(path)} has no buffer`);
    if (!path.every(safeKey)) return void problems.push(`buffer path ${JSON.stringify(path)} refused (only own keys and list indices are followed)`);
    let obj: Record<string | number, unknown> = state;
    for (let j = 0; j < path.length - 1; j++) {
      const seg = path[j] as string | number;
      const next = Object.prototype.hasOwnProperty.call(obj, seg) ? obj[seg] : undefined;
      if (!next || typeof next !== "object" || ArrayBuffer.isView(next)) return void problems.push(`buffer path ${JSON.stringify(path)} does not lead into the state`);
      obj = next as Record<string | number, unknown>;
    }
    const b = buffers[i]!;
    Object.defineProperty(obj, path[path.length - 1] as string, {
      value: new DataView(b.buffer, b.byteOffset, b.byteLength),
      enumerable: true,
      writable: true,
      configurable: true,
    });
  });
  return problems;
}
