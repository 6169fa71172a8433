/**
 * Linking two widgets' values.
 * - `link`: in the kernel, both ways, with optional transforms; works wherever kernel code runs.
 * - `linkInPage`: in the page (the standard LinkModel), so the link also works in an exported
 *   notebook with no kernel.
 */
import { Widget } from "./widget.js";

export type Endpoint = [Widget, string];

export function link(source: Endpoint, target: Endpoint, transform?: { forward: (v: unknown) => unknown; backward: (v: unknown) => unknown }): () => void {
  const [a, ka] = source;
  const [b, kb] = target;
  const fwd = transform?.forward ?? ((v: unknown) => v);
  const bwd = transform?.backward ?? ((v: unknown) => v);
  let busy = false;
  const guard = (fn: () => void) => {
    if (busy) return;
    busy = true;
    try {
      fn();
    } finally {
      busy = false;
    }
  };
  b.set({ [kb]: fwd(a.get(ka)) });
  const off1 = a.onChange(ka, (v) => guard(() => b.set({ [kb]: fwd(v) })));
  const off2 = b.onChange(kb, (v) => guard(() => a.set({ [ka]: bwd(v) })));
  return () => {
    off1();
    off2();
  };
}

export class PageLink extends Widget {
  constructor(source: Endpoint, target: Endpoint, directional = false) {
    super({
      model: { name: directional ? "DirectionalLinkModel" : "LinkModel", module: "@jupyter-widgets/controls", version: "2.0.0" },
      view: null,
      state: { source: [source[0], source[1]], target: [target[0], target[1]] },
    });
  }
}

/** Link in the page (front end); `directional` links source to target only. */
export function linkInPage(source: Endpoint, target: Endpoint, directional = false): PageLink {
  return new PageLink(source, target, directional);
}
