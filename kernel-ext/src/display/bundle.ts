/**
 * The display protocol: an object that knows how to show itself returns a MIME bundle from its
 * `[mimeBundle]()` method. Widgets, figures and result tables implement it; `display(x)` and a
 * cell's last expression use it.
 */
import type { MimeBundle } from "./output.js";

export const mimeBundle: unique symbol = Symbol.for("helicoid.mimeBundle") as never;

export interface Displayable {
  [mimeBundle](): { data: MimeBundle; metadata?: Record<string, unknown> };
}

export function isDisplayable(v: unknown): v is Displayable {
  return !!v && (typeof v === "object" || typeof v === "function") && typeof (v as Record<symbol, unknown>)[mimeBundle] === "function";
}
