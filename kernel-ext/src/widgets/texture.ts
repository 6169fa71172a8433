/**
 * `textureView(field, nx, ny, options?)`: a 2D unit-vector field m(x, y) in the page: m_z in
 * K. Moreland's "cool to warm" diverging colour map (ISVC 2009) with in-plane arrows, the
 * topological charge density in its own panel (diverging, symmetric about zero; `overlay: "none"`
 * hides it), axes in nm, colour bars, a scale bar, optional object markers with a table, and a
 * hover readout.
 *
 * `field`: mx, my, mz interleaved, x fastest (length 3 * nx * ny), any numeric array; it is
 * copied into a Float32Array sent as one binary buffer (never modified).
 */
import { InputError } from "@helicoid/lib";
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
  /** Objects to mark and list: centres x, y (m) and charges, e.g. from findObjects. */
  objects?: { x: ArrayLike<number>; y: ArrayLike<number>; charge: ArrayLike<number> } | null;
  /** Side of the larger image in CSS pixels (default 480; whole pixels per cell). */
  displaySize?: number;
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

function objectsOf(o: TextureOptions["objects"]): TextureState["objects"] {
  if (!o) return null;
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

export function textureView(field: ArrayLike<number>, nx: number, ny: number, options: TextureOptions = {}): TextureView {
  return new TextureView(field, nx, ny, options);
}
