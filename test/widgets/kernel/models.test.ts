/**
 * Kernel-side models of our widgets (kernel-ext/src/widgets/{explorer,figureWidget,texture,fitPanel}.ts),
 * in process: the state they open with follows widgets/PROTOCOL.md, page updates reach kernel code,
 * kernel changes are sent as updates, and bad input is refused with InputError.
 */
import { describe, it, expect, beforeEach } from "vitest";
import { comms, type CommChannel } from "../../../kernel-ext/src/comm/comms";
import { explore, figureWidget, textureView, fitPanel } from "../../../kernel-ext/src/widgets/index";
import { InputError, runCalculator, vectorFieldFromInterleaved } from "../../../lib/src/index";
import { testWallSpec } from "../fixtures/testSpecs";

type Sent = { type: string; content: Record<string, any>; buffers: unknown[] };
let sent: Sent[] = [];
const channel: CommChannel = { send: (type, content, _m, buffers) => void sent.push({ type, content: content as Record<string, any>, buffers }) };

beforeEach(() => {
  sent = [];
  comms.channel = channel;
});

/** A message from the page: an `update` of some state keys. */
function pageUpdate(id: string, state: Record<string, unknown>): void {
  comms.handleMessage({ comm_id: id, data: { method: "update", state, buffer_paths: [] } }, { metadata: {}, buffers: [], header: { msg_id: "x" } });
}

describe("explorer (kernel side)", () => {
  it("opens with our model names, the kernel version and a first result", () => {
    const ex = explore("test-wall-width", { A: "20 pJ/m" });
    const open = sent.find((s) => s.type === "comm_open")!;
    const state = open.content.data.state;
    expect(state._model_module).toBe("@helicoid/widgets");
    expect(state._model_module_version).toBe("^0.1.0");
    expect(state._model_name).toBe("ExplorerModel");
    expect(state._view_name).toBe("ExplorerView");
    expect(state.calculator).toBe("test-wall-width");
    expect(state.compute_in).toBe("browser");
    expect(state.kernel_version).toBe("0.1.0");
    expect(state.inputs.A).toBeCloseTo(2e-11, 24);
    expect(state.spec.inputs.map((i: { name: string }) => i.name)).toEqual(["Ms", "A", "Ku"]);
    expect(state.spec.compute).toBeUndefined();
    // Source: closed form Delta = sqrt(A / (Ku - mu0 Ms^2 / 2)) (Hubert & Schäfer, Magnetic Domains, ch. 3).
    const mu0 = 1.25663706212e-6;
    expect(ex.result!.outputs.Delta!.value).toBeCloseTo(Math.sqrt(2e-11 / (1.2e6 - (mu0 * 1.1e6 ** 2) / 2)), 18);
  });

  it("kernel code sees inputs and results set in the page", () => {
    const ex = explore("test-wall-width");
    const seen: number[] = [];
    ex.onInputs((v) => seen.push(v.Ku!));
    const pageResult = runCalculator(testWallSpec, { Ku: 2e6 });
    pageUpdate(ex.id, { inputs: { ...ex.inputs, Ku: 2e6 } });
    pageUpdate(ex.id, { result: pageResult });
    expect(seen).toEqual([2e6]);
    expect(ex.inputs.Ku).toBe(2e6);
    expect(ex.result!.outputs.Delta!.value).toBe(pageResult.outputs.Delta!.value);
    // Protocol 2.1: each page update is echoed.
    expect(sent.filter((s) => s.type === "comm_msg" && s.content.data.method === "echo_update").length).toBe(2);
  });

  it("a kernel-side change is sent to the page and recomputed at once", () => {
    const ex = explore("test-wall-width");
    sent = [];
    ex.setInputs({ Ms: "800 kA/m" });
    const updates = sent.filter((s) => s.type === "comm_msg" && s.content.data.method === "update").map((s) => s.content.data.state);
    expect(updates.some((u) => u.inputs?.Ms === 8e5)).toBe(true);
    expect(updates.some((u) => u.result?.inputs?.Ms?.value === 8e5)).toBe(true);
    expect(() => ex.setInputs({ A: "12 mT" })).toThrow(InputError);
    expect(ex.inputs.A).toBe(1.5e-11);
  });

  it("explores a plain kernel function: computed in the kernel on each page change", () => {
    function area(v: Record<string, number>) {
      return { area: v.w! * v.h! };
    }
    const ex = explore(
      area,
      {},
      {
        describe: {
          inputs: [
            { name: "w", default: 2, unit: "m" },
            { name: "h", default: 3, unit: "m" },
          ],
          outputs: [{ name: "area", unit: "m^2" }],
        },
      },
    );
    expect(ex.get("calculator")).toBe("");
    expect(ex.get("compute_in")).toBe("kernel");
    expect(ex.get("function_name")).toBe("area");
    expect(ex.result!.outputs.area!.value).toBe(6);
    pageUpdate(ex.id, { inputs: { w: 4, h: 3 } });
    expect(ex.result!.outputs.area!.value).toBe(12);
  });

  it("a failing calculation becomes the error state, not an exception", () => {
    const ex = explore("test-wall-width");
    ex.setInputs({ Ms: "2 MA/m" });
    expect(ex.result).toBeNull();
    expect(ex.error).toContain("Ku");
  });
});

describe("figure, texture and fit panel (kernel side)", () => {
  it("figureWidget sends the figure and updates it in place", () => {
    const f = figureWidget({ data: [{ type: "scatter", y: [1, 2] }] });
    sent = [];
    f.update({ data: [{ type: "scatter", y: [3, 4] }] });
    expect(sent[0]!.content.data.state.figure.data[0].y).toEqual([3, 4]);
    expect(() => figureWidget({} as never)).toThrow(InputError);
  });

  it("textureView sends the field as one Float32 binary buffer and never changes the input", () => {
    const field = new Float64Array(3 * 4 * 3).fill(0);
    for (let k = 2; k < field.length; k += 3) field[k] = 1;
    const copy = Float64Array.from(field);
    const t = textureView(field, 4, 3, { dx: 2e-9 });
    const open = sent.find((s) => s.type === "comm_open")!;
    expect(open.content.data.buffer_paths).toContainEqual(["field"]);
    const buf = open.buffers[open.content.data.buffer_paths.findIndex((p: string[]) => p[0] === "field")] as ArrayBufferView;
    expect(buf.byteLength).toBe(4 * 36);
    expect(new Float32Array(buf.buffer, buf.byteOffset, 36)[2]).toBe(1);
    expect(field).toEqual(copy);
    expect(t.get("dy")).toBe(2e-9);
    expect(() => textureView(new Float32Array(5), 4, 3)).toThrow(InputError);
    // a vector field object brings its size and cell sizes; of a 3D field one layer
    const vf = vectorFieldFromInterleaved(field, { nx: 4, ny: 3, dx: 2e-9, dy: 3e-9, source: "invented.npy" });
    const fromField = textureView(vf, { arrows: false });
    expect([fromField.get("nx"), fromField.get("ny"), fromField.get("dx"), fromField.get("dy"), fromField.get("title")]).toEqual([4, 3, 2e-9, 3e-9, "invented.npy"]);
    const layers = new Float64Array(2 * field.length);
    layers.set(field);
    for (let k = field.length; k < layers.length; k += 3) layers[k] = 1; // layer 1 points along x
    const thick = vectorFieldFromInterleaved(layers, { nx: 4, ny: 3, nz: 2, dx: 1e-9 });
    expect(Array.from(textureView(thick, { layer: 1 }).get("field").slice(0, 3))).toEqual([1, 0, 0]);
    expect(() => textureView(thick, { layer: 2 })).toThrow(/layer/);
    // findObjects' list of objects is read as it is
    const listed = textureView(vf, { objects: [{ center: [1e-9, 2e-9], charge: -1 }] });
    expect(listed.get("objects")).toEqual({ x: [1e-9], y: [2e-9], charge: [-1] });
    expect(() => textureView(vf, { objects: [{ center: [1e-9], charge: 1 }] })).toThrow(/objects\[0\]/);
    expect(() => textureView(new Float32Array(36).fill(NaN), 4, 3)).toThrow(/field\[0\]/);
    // Objects to mark: three arrays of one length, copied as plain numbers; anything else is refused by name.
    const marked = textureView(field, 4, 3, { objects: { x: new Float64Array([1e-9]), y: [2e-9], charge: [-1] } });
    expect(marked.get("objects")).toEqual({ x: [1e-9], y: [2e-9], charge: [-1] });
    expect(marked.get("overlay")).toBe("charge");
    expect(() => textureView(field, 4, 3, { objects: { x: [1e-9], y: [], charge: [1] } })).toThrow(/objects/);
    expect(() => textureView(field, 4, 3, { objects: { x: [NaN], y: [0], charge: [1] } })).toThrow(/objects\.x\[0\]/);
  });

  it("fitPanel relays the page's start and stop buttons", () => {
    const p = fitPanel({ title: "invented", x: new Float32Array([0, 1]), y: [1, 2] });
    expect(p.get("x")).toEqual([0, 1]);
    const events: string[] = [];
    p.onStart(() => events.push("start"));
    p.onStop(() => events.push("stop"));
    comms.handleMessage({ comm_id: p.id, data: { method: "custom", content: { event: "start" } } }, { metadata: {}, buffers: [], header: {} });
    comms.handleMessage({ comm_id: p.id, data: { method: "custom", content: { event: "stop" } } }, { metadata: {}, buffers: [], header: {} });
    expect(events).toEqual(["start", "stop"]);
    p.update({ status: "running", progress: 0.5, modelY: new Float64Array([1, 2]) });
    expect(p.get("modelY")).toEqual([1, 2]);
    // the snake_case names of earlier versions are read as their camelCase ones; an unknown name is refused
    p.update({ model_y: [3, 4], reduced_chi2: 1.2 });
    expect(p.get("modelY")).toEqual([3, 4]);
    expect(p.get("reducedChi2")).toBe(1.2);
    expect(() => p.update({ modelZ: [1] })).toThrow(/modelZ/);
  });
});
