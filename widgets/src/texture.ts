/**
 * Texture view: a 2D unit-vector field m(x, y) as colours (hue = in-plane angle, lightness = m_z;
 * common practice in the trade, no source), optional decimated arrows, an optional topological
 * charge density overlay, and a hover readout of position and m. Drawn into canvas ImageData at
 * one pixel per cell (scaled by CSS), so 1024 x 1024 fields stay interactive.
 *
 * State: nx, ny, field (binary Float32 interleaved mx,my,mz, x fastest), dx, dy (m), title,
 * arrows (bool), overlay ("none" | "charge"), density (optional binary Float32 of (nx-1)(ny-1)
 * charges per plaquette; computed here when absent).
 */
import { DOMWidgetModel, DOMWidgetView, type ISerializers } from "@jupyter-widgets/base";
import { formatQuantity } from "@helicoid/lib";
import { MODULE_NAME, MODULE_VERSION } from "./version.js";
import { float32Serializer, asFloat32 } from "./views/buffers.js";
import { fillColours, chargeDensity, overlayCharge, arrowStep, total } from "./views/textureColors.js";
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
      overlay: "none",
      display_size: 480,
    };
  }
}

export class TextureView extends DOMWidgetView {
  private canvas!: HTMLCanvasElement;
  private arrowCanvas!: HTMLCanvasElement;
  private readout!: HTMLElement;
  private summary!: HTMLElement;
  private messageEl!: HTMLElement;
  private density: Float32Array | null = null;
  private imageData: ImageData | null = null;
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
    const charge = el("label", { text: " charge density" });
    const chargeBox = el("input", { type: "checkbox", class: "hx-charge-toggle" }) as HTMLInputElement;
    charge.prepend(chargeBox);
    controls.append(arrows, charge);
    header.append(controls);
    this.el.append(header);
    const stage = el("div", { class: "hx-stage" });
    this.canvas = el("canvas", { class: "hx-texture-canvas" }) as HTMLCanvasElement;
    this.arrowCanvas = el("canvas", { class: "hx-texture-arrows" }) as HTMLCanvasElement;
    stage.append(this.canvas, this.arrowCanvas);
    this.el.append(stage);
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
    arrowsBox.addEventListener("change", () => { this.model.set("arrows", arrowsBox.checked); this.touch(); });
    chargeBox.addEventListener("change", () => { this.model.set("overlay", chargeBox.checked ? "charge" : "none"); this.touch(); });
    this.canvas.addEventListener("mousemove", (e) => this.hover(e));
    this.arrowCanvas.addEventListener("mousemove", (e) => this.hover(e));
    this.listenTo(this.model, "change:field change:nx change:ny change:density", () => { this.density = null; this.draw(); });
    this.listenTo(this.model, "change:arrows change:overlay change:display_size", () => { sync(); this.draw(); });
    this.listenTo(this.model, "change:title", sync);
    sync();
    this.draw();
  }

  private legend(): HTMLElement {
    return el("div", {
      class: "hx-legend",
      text: "colour: hue = in-plane angle of m, lightness = m_z (white +1, black -1); overlay: red q > 0, blue q < 0",
    });
  }

  private fieldOrNull(): { field: Float32Array; nx: number; ny: number } | null {
    const nx = this.model.get("nx") as number, ny = this.model.get("ny") as number;
    const field = asFloat32(this.model.get("field"));
    if (!field || !(nx > 0) || !(ny > 0)) { this.fail("no field in the widget state"); return null; }
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

  /** Draw colours (and overlays). Marks hx-texture-render for the benchmark. */
  draw(): void {
    performance.mark("hx-texture-start");
    const f = this.fieldOrNull();
    if (!f) return;
    const { field, nx, ny } = f;
    this.canvas.width = nx;
    this.canvas.height = ny;
    const size = (this.model.get("display_size") as number) || 480;
    const scale = size / Math.max(nx, ny);
    const cssW = Math.round(nx * scale), cssH = Math.round(ny * scale);
    for (const c of [this.canvas, this.arrowCanvas]) { c.style.width = `${cssW}px`; c.style.height = `${cssH}px`; }
    const ctx = this.canvas.getContext("2d")!;
    if (!this.imageData || this.imageData.width !== nx || this.imageData.height !== ny) this.imageData = ctx.createImageData(nx, ny);
    fillColours(field, nx, ny, this.imageData.data);
    const showCharge = this.model.get("overlay") === "charge";
    const given = asFloat32(this.model.get("density"));
    if (!this.density && given && given.length === (nx - 1) * (ny - 1)) this.density = given;
    if (showCharge && !this.density) this.density = chargeDensity(field, nx, ny);
    if (showCharge && this.density) overlayCharge(this.density, nx, ny, this.imageData.data);
    ctx.putImageData(this.imageData, 0, 0);
    this.drawArrows(field, nx, ny, cssW, cssH);
    const dx = this.model.get("dx") as number, dy = this.model.get("dy") as number;
    const cells = `${nx} × ${ny} cells of ${formatQuantity(dx, "m")} × ${formatQuantity(dy, "m")}`;
    const showTotal = () => {
      const Q = total(this.density!);
      this.summary.textContent = `${cells}; topological charge Q = ${Q.toFixed(3)}`;
      this.el.dataset.charge = String(Q);
    };
    if (this.density) showTotal();
    else {
      // The charge is not needed for the first picture: compute it right after.
      this.summary.textContent = `${cells}; topological charge: computing…`;
      const token = (this.chargeToken = {});
      setTimeout(() => {
        if (token !== this.chargeToken) return;
        performance.mark("hx-charge-start");
        this.density = chargeDensity(field, nx, ny);
        showTotal();
        performance.mark("hx-charge-end");
        try { performance.measure("hx-texture-charge", "hx-charge-start", "hx-charge-end"); } catch { /* ignore */ }
      }, 0);
    }
    performance.mark("hx-texture-end");
    try { performance.measure("hx-texture-render", "hx-texture-start", "hx-texture-end"); } catch { /* ignore */ }
  }

  private drawArrows(field: Float32Array, nx: number, ny: number, w: number, h: number): void {
    const c = this.arrowCanvas;
    const dpr = (globalThis.devicePixelRatio as number) || 1;
    c.width = Math.round(w * dpr);
    c.height = Math.round(h * dpr);
    const ctx = c.getContext("2d")!;
    ctx.clearRect(0, 0, c.width, c.height);
    if (!this.model.get("arrows")) return;
    ctx.scale(dpr, dpr);
    const step = arrowStep(nx, ny);
    const sx = w / nx, sy = h / ny;
    const len = 0.8 * step * Math.min(sx, sy);
    ctx.strokeStyle = "rgba(40,40,40,0.85)";
    ctx.fillStyle = "rgba(40,40,40,0.85)";
    ctx.lineWidth = 1.2;
    for (let j = Math.floor(step / 2); j < ny; j += step) {
      for (let i = Math.floor(step / 2); i < nx; i += step) {
        const k = 3 * (j * nx + i);
        const mx = field[k]!, my = field[k + 1]!;
        const inPlane = Math.hypot(mx, my);
        if (inPlane < 0.05) continue;
        const cx = (i + 0.5) * sx, cy = h - (j + 0.5) * sy;
        const ux = (mx * len) / 2, uy = (-my * len) / 2;
        ctx.beginPath();
        ctx.moveTo(cx - ux, cy - uy);
        ctx.lineTo(cx + ux, cy + uy);
        ctx.stroke();
        const a = Math.atan2(uy, ux), hs = Math.max(2, len * 0.3 * inPlane);
        ctx.beginPath();
        ctx.moveTo(cx + ux, cy + uy);
        ctx.lineTo(cx + ux - hs * Math.cos(a - 0.45), cy + uy - hs * Math.sin(a - 0.45));
        ctx.lineTo(cx + ux - hs * Math.cos(a + 0.45), cy + uy - hs * Math.sin(a + 0.45));
        ctx.fill();
      }
    }
  }

  /** Hover readout: position and m of the cell under the pointer. */
  hover(e: MouseEvent): void {
    performance.mark("hx-hover-start");
    const nx = this.model.get("nx") as number, ny = this.model.get("ny") as number;
    const field = asFloat32(this.model.get("field"));
    if (!field || field.length !== 3 * nx * ny) return;
    const rect = this.canvas.getBoundingClientRect();
    const i = Math.min(nx - 1, Math.max(0, Math.floor(((e.clientX - rect.left) / rect.width) * nx)));
    const jTop = Math.min(ny - 1, Math.max(0, Math.floor(((e.clientY - rect.top) / rect.height) * ny)));
    const j = ny - 1 - jTop;
    const k = 3 * (j * nx + i);
    const dx = this.model.get("dx") as number, dy = this.model.get("dy") as number;
    const q = this.density && i < nx - 1 && j < ny - 1 ? this.density[j * (nx - 1) + i]! : NaN;
    this.readout.textContent =
      `cell (${i}, ${j})  x = ${formatQuantity((i + 0.5) * dx, "m")}, y = ${formatQuantity((j + 0.5) * dy, "m")}  ` +
      `m = (${field[k]!.toFixed(3)}, ${field[k + 1]!.toFixed(3)}, ${field[k + 2]!.toFixed(3)})` +
      (Number.isFinite(q) ? `  q = ${q.toExponential(2)}` : "");
    this.readout.dataset.cell = `${i},${j}`;
    performance.mark("hx-hover-end");
    try { performance.measure("hx-hover", "hx-hover-start", "hx-hover-end"); } catch { /* ignore */ }
  }
}
