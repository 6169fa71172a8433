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

/** Put buffers back into a received state at their paths (mutates `state`, which is ours). */
export function putBuffers(state: Record<string, unknown>, paths: unknown, buffers: Buffer[]): void {
  if (!Array.isArray(paths)) return;
  paths.forEach((path, i) => {
    if (!Array.isArray(path) || path.length === 0 || i >= buffers.length) return;
    let obj: Record<string | number, unknown> = state;
    for (let j = 0; j < path.length - 1; j++) {
      const next = obj[path[j] as string];
      if (!next || typeof next !== "object") return;
      obj = next as Record<string | number, unknown>;
    }
    const b = buffers[i]!;
    obj[path[path.length - 1] as string] = new DataView(b.buffer, b.byteOffset, b.byteLength);
  });
}
