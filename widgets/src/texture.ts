/**
 * Texture view: a 2D unit-vector field m(x, y) as two panels (views/texturePicture.ts): m_z in
 * K. Moreland's "cool to warm" diverging colour map (Diverging Color Maps for Scientific
 * Visualization, ISVC 2009) with in-plane arrows on top, and the topological charge density in its
 * own diverging map symmetric about zero; axes in nm, colour bars with ticks and units, a scale bar,
 * crisp cells (whole pixels per cell, no smoothing), found objects marked and listed, and a hover
 * readout of position and m.
 *
 * State: nx, ny, field (binary Float32 interleaved mx,my,mz, x fastest), dx, dy (m), title,
 * arrows (bool), overlay ("charge" shows the charge-density panel, "none" hides it), density
 * (optional binary Float32 of (nx-1)(ny-1) charges per plaquette; computed here when absent),
 * objects (optional {x, y, charge}: centres in m and charges, marked on the picture and listed).
 */
import { DOMWidgetModel, DOMWidgetView, type ISerializers } from "@jupyter-widgets/base";
import { formatQuantity } from "@helicoid/lib";
import { MODULE_NAME, MODULE_VERSION } from "./version.js";
import { float32Serializer, asFloat32 } from "./views/buffers.js";
import { total, chargeDensity } from "./views/textureColors.js";
import { TexturePicture, richText, type TextureObjects } from "./views/texturePicture.js";
import { el } from "./views/dom.js";

export class TextureModel extends DOMWidgetModel {
  static override serializers: ISerializers = {
    ...DOMWidgetModel.serializers,
    field: float32Serializer,
    density: float32Serializer,
  };
  override defaults() {
    return {
      ...super.defaults(),
      _model_name: "TextureModel",
      _model_module: MODULE_NAME,
      _model_module_version: MODULE_VERSION,
      _view_name: "TextureView",
      _view_module: MODULE_NAME,
      _view_module_version: MODULE_VERSION,
      nx: 0,
      ny: 0,
      field: null,
      density: null,
      dx: 1e-9,
      dy: 1e-9,
      title: "",
      arrows: true,
      overlay: "charge",
      objects: null,
      display_size: 480,
    };
  }
}

export class TextureView extends DOMWidgetView {
  private picture!: TexturePicture;
  private readout!: HTMLElement;
  private summary!: HTMLElement;
  private messageEl!: HTMLElement;
  private density: Float32Array | null = null;
  private chargeToken: object | null = null;

  override render(): void {
    this.el.classList.add("hx-texture");
    const header = el("div", { class: "hx-header" });
    const title = el("span", { class: "hx-title" });
    header.append(title);
    const controls = el("span", { class: "hx-texture-controls" });
    const arrows = el("label", { text: " arrows" });
    const arrowsBox = el("input", { type: "checkbox", class: "hx-arrows-toggle" }) as HTMLInputElement;
    arrows.prepend(arrowsBox);
    const charge = el("label", { text: " charge density panel" });
    const chargeBox = el("input", { type: "checkbox", class: "hx-charge-toggle" }) as HTMLInputElement;
    charge.prepend(chargeBox);
    controls.append(arrows, charge);
    header.append(controls);
    this.el.append(header);
    this.picture = new TexturePicture();
    this.el.append(this.picture.el);
    this.readout = el("div", { class: "hx-readout", text: "hover for m(x, y)" });
    this.summary = el("div", { class: "hx-summary" });
    this.messageEl = el("div", { class: "hx-error" });
    this.messageEl.hidden = true;
    this.el.append(this.readout, this.summary, this.messageEl, this.legend());

    const sync = () => {
      title.textContent = (this.model.get("title") as string) || "Texture";
      arrowsBox.checked = !!this.model.get("arrows");
      chargeBox.checked = this.model.get("overlay") === "charge";
    };
    arrowsBox.addEventListener("change", () => {
      this.model.set("arrows", arrowsBox.checked);
      this.touch();
    });
    chargeBox.addEventListener("change", () => {
      this.model.set("overlay", chargeBox.checked ? "charge" : "none");
      this.touch();
    });
    this.picture.mz.canvas.addEventListener("mousemove", (e) => this.hover(e));
    this.listenTo(this.model, "change:field change:nx change:ny change:density", () => {
      this.density = null;
      this.draw();
    });
    this.listenTo(this.model, "change:arrows change:overlay change:display_size change:objects change:dx change:dy", () => {
      sync();
      this.draw();
    });
    this.listenTo(this.model, "change:title", sync);
    sync();
    this.draw();
  }

  private legend(): HTMLElement {
    const legend = el("div", { class: "hx-legend" });
    richText(
      legend,
      "m_z: diverging map after K. Moreland (2009), blue −1, grey 0, red +1; arrows: in-plane direction, length ∝ |m_{xy}|; " +
        "ρ_Q = q / (Δx Δy) per plaquette (Berg–Lüscher solid angles), green < 0 < purple, symmetric about 0; rings: found objects",
    );
    return legend;
  }

  private fieldOrNull(): { field: Float32Array; nx: number; ny: number } | null {
    const nx = this.model.get("nx") as number,
      ny = this.model.get("ny") as number;
    const field = asFloat32(this.model.get("field"));
    if (!field || !(nx > 0) || !(ny > 0)) {
      this.fail("no field in the widget state");
      return null;
    }
    if (field.length !== 3 * nx * ny) {
      this.fail(`field has ${field.length} numbers; expected 3 * nx * ny = ${3 * nx * ny} (mx, my, mz interleaved, x fastest)`);
      return null;
    }
    this.messageEl.hidden = true;
    return { field, nx, ny };
  }

  private fail(message: string): void {
    this.messageEl.textContent = `Texture: ${message}`;
    this.messageEl.hidden = false;
  }

  /** Draw both panels. Marks hx-texture-render for the benchmark. */
  draw(): void {
    performance.mark("hx-texture-start");
    const f = this.fieldOrNull();
    if (!f) return;
    const { field, nx, ny } = f;
    const dx = this.model.get("dx") as number,
      dy = this.model.get("dy") as number;
    const given = asFloat32(this.model.get("density"));
    if (!this.density && given && given.length === (nx - 1) * (ny - 1)) this.density = given;
    const density = this.picture.draw({
      field,
      nx,
      ny,
      dx,
      dy,
      density: this.density,
      objects: (this.model.get("objects") as TextureObjects | null) ?? null,
      arrows: !!this.model.get("arrows"),
      charge: this.model.get("overlay") === "charge",
      displaySize: (this.model.get("display_size") as number) || 480,
      deferCharge: true,
    });
    const cells = `${nx} × ${ny} cells of ${formatQuantity(dx, "m")} × ${formatQuantity(dy, "m")}`;
    const showTotal = (d: Float32Array) => {
      const Q = total(d);
      this.summary.textContent = `${cells}; topological charge Q = ${Q.toFixed(3)}`;
      this.el.dataset.charge = String(Q);
    };
    if (density) showTotal(density);
    else {
      // The charge is not needed for the first picture (m_z): compute it and its panel right after.
      this.summary.textContent = `${cells}; topological charge: computing…`;
      const token = (this.chargeToken = {});
      setTimeout(() => {
        if (token !== this.chargeToken) return;
        performance.mark("hx-charge-start");
        this.density = chargeDensity(field, nx, ny);
        this.picture.drawCharge(this.density);
        showTotal(this.density);
        performance.mark("hx-charge-end");
        try {
          performance.measure("hx-texture-charge", "hx-charge-start", "hx-charge-end");
        } catch {
          /* ignore */
        }
      }, 0);
    }
    performance.mark("hx-texture-end");
    try {
      performance.measure("hx-texture-render", "hx-texture-start", "hx-texture-end");
    } catch {
      /* ignore */
    }
  }

  /** Hover readout: position and m of the cell under the pointer. */
  hover(e: MouseEvent): void {
    performance.mark("hx-hover-start");
    const nx = this.model.get("nx") as number,
      ny = this.model.get("ny") as number;
    const field = asFloat32(this.model.get("field"));
    if (!field || field.length !== 3 * nx * ny) return;
    const cell = this.picture.cellAt(e.clientX, e.clientY, nx, ny);
    if (!cell) return;
    const [i, j] = cell;
    const k = 3 * (j * nx + i);
    const dx = this.model.get("dx") as number,
      dy = this.model.get("dy") as number;
    const q = this.density && i < nx - 1 && j < ny - 1 ? this.density[j * (nx - 1) + i]! : NaN;
    this.readout.textContent =
      `cell (${i}, ${j})  x = ${formatQuantity(i * dx, "m")}, y = ${formatQuantity(j * dy, "m")}  ` +
      `m = (${field[k]!.toFixed(3)}, ${field[k + 1]!.toFixed(3)}, ${field[k + 2]!.toFixed(3)})` +
      (Number.isFinite(q) ? `  q = ${q.toExponential(2)}` : "");
    this.readout.dataset.cell = `${i},${j}`;
    performance.mark("hx-hover-end");
    try {
      performance.measure("hx-hover", "hx-hover-start", "hx-hover-end");
    } catch {
      /* ignore */
    }
  }
}
