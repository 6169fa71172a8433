/**
 * Binary state: the widget protocol delivers buffers as DataView (from the kernel or from a
 * saved state's base64). Views read them as Float32Array; JSON number arrays are accepted too.
 */
export function asFloat32(value: unknown): Float32Array | null {
  if (value == null) return null;
  if (value instanceof Float32Array) return value;
  if (value instanceof DataView || ArrayBuffer.isView(value)) {
    const v = value as ArrayBufferView;
    if (v.byteOffset % 4 === 0 && v.byteLength % 4 === 0) return new Float32Array(v.buffer, v.byteOffset, v.byteLength / 4);
    return new Float32Array(v.buffer.slice(v.byteOffset, v.byteOffset + v.byteLength));
  }
  if (value instanceof ArrayBuffer) return new Float32Array(value);
  if (Array.isArray(value)) return Float32Array.from(value as number[]);
  return null;
}

export const float32Serializer = {
  deserialize: (value: unknown) => asFloat32(value),
  serialize: (value: unknown) => (value instanceof Float32Array ? new DataView(value.buffer, value.byteOffset, value.byteLength) : value),
};
