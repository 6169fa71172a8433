/**
 * Comm targets of the widget protocol on the kernel side:
 * - `jupyter.widget.control`: a front end asks for every widget's state at once (`request_states`,
 *   answered with `update_states`, as @jupyter-widgets/base-manager 1.x expects when it reconnects);
 * - `jupyter.widget`: a widget created by the front end. We accept the comm (so it is listed and
 *   can be closed) and answer `request_state` with the state it was opened with.
 */
import { comms } from "../comm/comms.js";
import { removeBuffers, safeKey, type Path } from "./buffers.js";
import { openWidgets } from "./widget.js";

export const CONTROL_TARGET = "jupyter.widget.control";

export function registerWidgetTargets(): void {
  comms.registerTarget(CONTROL_TARGET, (comm) => {
    comm.onMessage((msg) => {
      if (msg.data.method !== "request_states") {
        comm.send({ method: "error", error: `unknown method ${JSON.stringify(msg.data.method)}; expected "request_states"` });
        return;
      }
      const states: Record<string, unknown> = {};
      const buffer_paths: Path[] = [];
      const buffers: Array<ArrayBuffer | ArrayBufferView> = [];
      for (const [id, w] of openWidgets) {
        const s = w.serializedState();
        states[id] = {
          model_name: s.state._model_name,
          model_module: s.state._model_module,
          model_module_version: s.state._model_module_version,
          state: s.state,
        };
        s.buffer_paths.forEach((p, i) => {
          buffer_paths.push([id, ...p]);
          buffers.push(s.buffers[i]!);
        });
      }
      comm.send({ method: "update_states", states, buffer_paths }, {}, buffers);
    });
  });
  comms.registerTarget("jupyter.widget", (comm, open) => {
    // Own keys only, into a prototype-free object: a "__proto__" key is data, never a prototype.
    const state: Record<string, unknown> = Object.create(null);
    const take = (src: unknown) => {
      if (!src || typeof src !== "object" || Array.isArray(src)) return;
      for (const k of Object.keys(src)) if (safeKey(k)) state[k] = (src as Record<string, unknown>)[k];
    };
    take(open.data.state);
    comm.onMessage((msg) => {
      if (msg.data.method === "update") take(msg.data.state);
      if (msg.data.method === "request_state") {
        const s = removeBuffers(state);
        comm.send({ method: "update", state: s.state, buffer_paths: s.buffer_paths }, {}, s.buffers);
      }
    });
  });
}
