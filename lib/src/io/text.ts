/** Bytes -> text without Node or DOM imports (TextDecoder when the runtime has one, else UTF-8 by hand). */
interface Decoder {
  decode(bytes: Uint8Array): string;
}

export function bytesToText(input: Uint8Array | string): string {
  if (typeof input === "string") return input;
  const TD = (globalThis as unknown as { TextDecoder?: new (label: string) => Decoder }).TextDecoder;
  if (TD) return new TD("utf-8").decode(input);
  let s = "";
  for (let k = 0; k < input.length;) {
    const b = input[k]!;
    let cp: number, len: number;
    if (b < 0x80) {
      cp = b;
      len = 1;
    } else if (b >= 0xf0) {
      cp = ((b & 7) << 18) | ((input[k + 1]! & 63) << 12) | ((input[k + 2]! & 63) << 6) | (input[k + 3]! & 63);
      len = 4;
    } else if (b >= 0xe0) {
      cp = ((b & 15) << 12) | ((input[k + 1]! & 63) << 6) | (input[k + 2]! & 63);
      len = 3;
    } else {
      cp = ((b & 31) << 6) | (input[k + 1]! & 63);
      len = 2;
    }
    s += String.fromCodePoint(cp);
    k += len;
  }
  return s;
}
