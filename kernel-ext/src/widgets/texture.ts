/**
 * `textureView(field, options?)`: a vector field (`VectorField`: readFieldFile, vectorFieldFrom...,
 * the texture generators) shown in the page, with its size and cell sizes; of a 3D field one layer
 * (`layer`, default 0). The older `textureView(m, nx, ny, options?)` with the interleaved array
 * still works.
 *
 * A 2D unit-vector field m(x, y) in the page: m_z in
 * K. Moreland's "cool to warm" diverging colour map (ISVC 2009) with in-plane arrows, the
 * topological charge density in its own panel (diverging, symmetric about zero; `overlay: "none"`
 * hides it), axes in nm, colour bars, a scale bar, optional object markers with a table, and a
 * hover readout.
 *
 * `field`: mx, my, mz interleaved, x fastest (length 3 * nx * ny), any numeric array; it is
 * copied into a Float32Array sent as one binary buffer (never modified).
 */
import { InputError, type VectorField } from "@helicoid/lib";
import { Widget, type WidgetState } from "./widget.js";
import { ourModel } from "./ourModel.js";

export interface TextureOptions {
  /** Cell size along x and y (m); default 1 nm. */
  dx?: number;
  dy?: number;
  title?: string;
  arrows?: boolean;
  overlay?: "none" | "charge";
  /** Charge per plaquette ((nx - 1) * (ny - 1) values), if computed in the kernel. */
  density?: ArrayLike<number> | null;
  /** Objects to mark and list: findObjects' objects ({center: [x, y], charge}), or centres x, y (m) and charges. */
  objects?: { x: ArrayLike<number>; y: ArrayLike<number>; charge: ArrayLike<number> } | ReadonlyArray<{ center: readonly number[]; charge: number }> | null;
  /** Side of the larger image in CSS pixels (default 480; whole pixels per cell). */
  displaySize?: number;
}

/** Options of `textureView(field, options)`: the cell sizes come from the field. */
export interface FieldTextureOptions extends Omit<TextureOptions, "dx" | "dy"> {
  /** Layer of a 3D field (0 .. nz - 1), default 0. */
  layer?: number;
}

function isVectorField(v: unknown): v is VectorField {
  return typeof v === "object" && v !== null && !ArrayBuffer.isView(v) && !Array.isArray(v) && "m" in v && "nx" in v && "ny" in v;
}

/** The interleaved components of one layer of a field, and its size and cell sizes. */
function layerOf(field: VectorField, layer: number | undefined): { m: ArrayLike<number>; nx: number; ny: number; dx: number; dy: number } {
  const nz = field.nz ?? 1;
  const k = layer ?? 0;
  if (!Number.isInteger(k) || k < 0 || k >= nz) throw new InputError("layer", layer, `a layer of the field from 0 to ${nz - 1}`);
  const n = 3 * field.nx * field.ny;
  return { m: nz === 1 ? field.m : field.m.subarray(k * n, (k + 1) * n), nx: field.nx, ny: field.ny, dx: field.dx, dy: field.dy };
}

export interface TextureState extends WidgetState {
  nx: number;
  ny: number;
  field: Float32Array;
  density: Float32Array | null;
  dx: number;
  dy: number;
  title: string;
  arrows: boolean;
  overlay: "none" | "charge";
  objects: { x: number[]; y: number[]; charge: number[] } | null;
  display_size: number;
}

type ObjectList = ReadonlyArray<{ center: readonly number[]; charge: number }>;
const isObjectList = (o: unknown): o is ObjectList => Array.isArray(o);

function objectsOf(o: TextureOptions["objects"]): TextureState["objects"] {
  if (!o) return null;
  if (isObjectList(o)) {
    const list = o;
    list.forEach((q, i) => {
      if (!q || !Array.isArray(q.center) || q.center.length < 2 || typeof q.charge !== "number")
        throw new InputError(`objects[${i}]`, JSON.stringify(q), "an object with center: [x, y] (m) and charge, as findObjects gives");
    });
    return objectsOf({ x: list.map((q) => q.center[0]!), y: list.map((q) => q.center[1]!), charge: list.map((q) => q.charge) });
  }
  const n = o.x?.length;
  if (typeof n !== "number" || o.y?.length !== n || o.charge?.length !== n) {
    throw new InputError("objects", o, "{ x, y, charge }: three arrays of the same length (centres in m, charges)");
  }
  const pick = (name: string, a: ArrayLike<number>) =>
    Array.from(a, (v, i) => {
      if (!Number.isFinite(v)) throw new InputError(`objects.${name}[${i}]`, v, "a finite number");
      return v;
    });
  return { x: pick("x", o.x), y: pick("y", o.y), charge: pick("charge", o.charge) };
}

function toFloat32(name: string, v: ArrayLike<number>, expected: number, what: string): Float32Array {
  if (!v || typeof (v as ArrayLike<number>).length !== "number") throw new InputError(name, v, what);
  if (v.length !== expected) throw new InputError(name, v, `${what} (length ${expected})`);
  const out = Float32Array.from(v as ArrayLike<number>);
  for (let i = 0; i < out.length; i++) if (!Number.isFinite(out[i]!)) throw new InputError(`${name}[${i}]`, (v as ArrayLike<number>)[i], "a finite number");
  return out;
}

function checkSize(name: string, n: number): number {
  if (!Number.isInteger(n) || n < 2 || n > 8192) throw new InputError(name, n, "a whole number of cells from 2 to 8192");
  return n;
}

function positive(name: string, v: number | undefined, dflt: number): number {
  if (v === undefined) return dflt;
  if (!(v > 0) || !Number.isFinite(v)) throw new InputError(name, v, "a positive length in m");
  return v;
}

export class TextureView extends Widget<TextureState> {
  constructor(field: ArrayLike<number>, nx: number, ny: number, o: TextureOptions = {}) {
    checkSize("nx", nx);
    checkSize("ny", ny);
    super({
      ...ourModel("Texture"),
      state: {
        nx,
        ny,
        field: toFloat32("field", field, 3 * nx * ny, "mx, my, mz interleaved, x fastest"),
        density: o.density ? toFloat32("density", o.density, (nx - 1) * (ny - 1), "one charge per plaquette") : null,
        dx: positive("dx", o.dx, 1e-9),
        dy: positive("dy", o.dy, o.dx ?? 1e-9),
        title: o.title ?? "",
        arrows: o.arrows ?? true,
        overlay: o.overlay ?? "charge",
        objects: objectsOf(o.objects),
        display_size: o.displaySize ?? 480,
      },
    });
  }

  /** Show a new field of the same size (e.g. the next step of a relaxation). */
  setField(field: ArrayLike<number>, density: ArrayLike<number> | null = null): this {
    const nx = this.get("nx"),
      ny = this.get("ny");
    return this.set({
      field: toFloat32("field", field, 3 * nx * ny, "mx, my, mz interleaved, x fastest"),
      density: density ? toFloat32("density", density, (nx - 1) * (ny - 1), "one charge per plaquette") : null,
    });
  }

  /** Mark and list these objects (null clears them). */
  setObjects(objects: TextureOptions["objects"]): this {
    return this.set({ objects: objectsOf(objects) });
  }

  override describe(): string {
    return `TextureView(${this.get("nx")} x ${this.get("ny")})`;
  }
}

/** A vector field in the page: `textureView(field, { title, density, objects })`. */
export function textureView(field: VectorField, options?: FieldTextureOptions): TextureView;
/** The interleaved components (mx, my, mz, x fastest) of an nx x ny field. */
export function textureView(m: ArrayLike<number>, nx: number, ny: number, options?: TextureOptions): TextureView;
export function textureView(field: VectorField | ArrayLike<number>, a?: number | FieldTextureOptions, b?: number, c: TextureOptions = {}): TextureView {
  if (isVectorField(field)) {
    if (typeof a === "number") throw new InputError("textureView", a, "textureView(field, options): the size comes with the vector field");
    const { layer, ...o } = a ?? {};
    const l = layerOf(field, layer);
    return new TextureView(l.m, l.nx, l.ny, { ...o, dx: l.dx, dy: l.dy, ...(o.title === undefined && field.source ? { title: field.source } : {}) });
  }
  if (typeof a !== "number" || typeof b !== "number") throw new InputError("field", typeof field, "a vector field (VectorField), or the components with nx and ny");
  return new TextureView(field, a, b, c);
}
