/**
 * The picture of a 2D texture, shared by the texture view (widgets/src/texture.ts) and the explorer
 * of the `texture` calculator: two panels side by side,
 * - m_z in Moreland's "cool to warm" diverging map with in-plane arrows on top,
 * - the topological charge density rho_Q = q / (dx dy) per plaquette in its own diverging map,
 *   symmetric about zero,
 * each with axes in nm and ticks, a colour bar with ticks and unit, a scale bar, and the found
 * objects marked (ring + number); the objects are also listed in a table (charge, x, y in nm).
 *
 * Cells are crisp: the cell colours are drawn at one pixel per cell and copied with image smoothing
 * off at a whole-number scale (every cell is an s x s block of one colour), and the canvas has CSS
 * `image-rendering: pixelated`. Colour maps: views/textureColors.ts.
 *
 * Positions: cell (i, j) sits at x = i dx, y = j dy (as in @helicoid/lib's textures and object
 * centres), so the image spans x from -dx/2 to (nx - 1/2) dx.
 */
import { fillColours, fillCharge, chargeDensity, peakAbs, arrowStep, niceTicks, scaleBarLength, MZ_TABLE, CHARGE_TABLE, type Field } from "./textureColors.js";
import { el } from "./dom.js";

const SVG = "http://www.w3.org/2000/svg";

export interface TextureObjects {
  /** Centres in m. */
  x: ArrayLike<number>;
  y: ArrayLike<number>;
  /** Charge of each object. */
  charge: ArrayLike<number>;
}

export interface PictureInput {
  field: Field;
  nx: number;
  ny: number;
  /** Cell size in m. */
  dx: number;
  dy: number;
  /** Charge per plaquette ((nx - 1)(ny - 1)); computed when absent. */
  density?: Float32Array | null;
  objects?: TextureObjects | null;
  arrows?: boolean;
  /** Show the charge-density panel (default true). */
  charge?: boolean;
  /** Without a density: draw the charge panel later (drawCharge) instead of computing it now. */
  deferCharge?: boolean;
  /** Side of the larger image in CSS pixels (rounded to whole pixels per cell). */
  displaySize?: number;
}

/** Margins of a panel (CSS px): left (y ticks), top (title), right (colour bar), bottom (x ticks). */
const ML = 50,
  MT = 26,
  MR = 86,
  MB = 40;

function svg(tag: string, attrs: Record<string, string | number> = {}, text?: string): SVGElement {
  const n = document.createElementNS(SVG, tag);
  for (const [k, v] of Object.entries(attrs)) n.setAttribute(k, String(v));
  if (text !== undefined) richText(n, text);
  return n;
}

/** Pieces of a label: "m_z" and "ρ_{Q}" give a subscript piece. */
export function labelPieces(text: string): Array<{ text: string; sub: boolean }> {
  const out: Array<{ text: string; sub: boolean }> = [];
  const re = /_(\{[^}]*\}|[^\s(])/g;
  let last = 0;
  for (let m = re.exec(text); m; m = re.exec(text)) {
    if (m.index > last) out.push({ text: text.slice(last, m.index), sub: false });
    out.push({ text: m[1]!.replace(/^\{|\}$/g, ""), sub: true });
    last = m.index + m[0].length;
  }
  if (last < text.length) out.push({ text: text.slice(last), sub: false });
  return out;
}

/** Write a label with real subscripts (SVG tspans or HTML <sub>), never raw "_" markup. */
export function richText(node: Element, text: string): void {
  node.replaceChildren();
  const svgNode = node.namespaceURI === SVG;
  for (const p of labelPieces(text)) {
    if (!p.sub) {
      node.append(document.createTextNode(p.text));
      continue;
    }
    const sub = svgNode ? document.createElementNS(SVG, "tspan") : document.createElement("sub");
    if (svgNode) {
      sub.setAttribute("baseline-shift", "sub");
      sub.setAttribute("font-size", "75%");
    }
    sub.textContent = p.text;
    node.append(sub);
  }
}

/** A number with a fixed count of decimals, a real minus sign and no "-0". */
export function fixed(v: number, decimals: number): string {
  const s = v.toFixed(decimals);
  return (Number(s) === 0 ? s.replace("-", "") : s).replace("-", "−");
}

/** Short number for tick labels: no "-0", no long tails. */
export function tickLabel(v: number): string {
  if (v === 0) return "0";
  const a = Math.abs(v);
  const s = a >= 1e5 || a < 1e-4 ? v.toExponential(1) : String(Number(v.toPrecision(4)));
  return s.replace("-", "−");
}

interface Panel {
  root: HTMLElement;
  canvas: HTMLCanvasElement;
  frame: SVGSVGElement;
  overlay: SVGSVGElement;
}

export class TexturePicture {
  readonly el: HTMLElement;
  readonly mz: Panel;
  readonly charge: Panel;
  readonly table: HTMLElement;
  /** Whole CSS pixels per cell of the last drawing. */
  scale = 1;
  private off: HTMLCanvasElement | null = null;
  private last: { geo: Geo; objects: TextureObjects | null; showCharge: boolean } | null = null;

  constructor() {
    this.el = el("div", { class: "hx-texture-picture" });
    const row = el("div", { class: "hx-texture-panels" });
    this.mz = this.panel("mz", "hx-texture-canvas");
    this.charge = this.panel("charge", "hx-charge-canvas");
    row.append(this.mz.root, this.charge.root);
    this.table = el("div", { class: "hx-objects-box" });
    this.el.append(row, this.table);
  }

  private panel(kind: string, canvasClass: string): Panel {
    const root = el("div", { class: "hx-texture-panel", "data-panel": kind });
    const canvas = el("canvas", { class: canvasClass }) as HTMLCanvasElement;
    const frame = document.createElementNS(SVG, "svg") as SVGSVGElement;
    frame.setAttribute("class", "hx-texture-frame");
    const overlay = document.createElementNS(SVG, "svg") as SVGSVGElement;
    overlay.setAttribute("class", kind === "mz" ? "hx-texture-arrows" : "hx-charge-overlay");
    root.append(canvas, frame, overlay);
    return { root, canvas, frame, overlay };
  }

  /** Draw everything; returns the charge density used (computed here when not given, null when deferred). */
  draw(p: PictureInput): Float32Array | null {
    const { field, nx, ny, dx, dy } = p;
    const size = p.displaySize && p.displaySize > 0 ? p.displaySize : 420;
    const s = (this.scale = Math.max(1, Math.round(size / Math.max(nx, ny))));
    const W = nx * s,
      H = ny * s;
    const geo = { nx, ny, dx, dy, s, W, H };
    this.last = { geo, objects: p.objects ?? null, showCharge: p.charge !== false && nx > 1 && ny > 1 };
    // m_z cells, frame, axes, colour bar, arrows, scale bar, markers
    const rgba = new Uint8ClampedArray(4 * nx * ny);
    fillColours(field, nx, ny, rgba);
    this.blit(this.mz.canvas, rgba, nx, ny, s, ML, MT);
    this.frame(this.mz, geo, "m_z (colour) and in-plane m (arrows)", MZ_TABLE, -1, 1, "m_z", "", [-1, -0.5, 0, 0.5, 1]);
    this.placeOverlay(this.mz.overlay, geo);
    this.mz.overlay.replaceChildren();
    if (p.arrows !== false) this.arrows(field, geo);
    this.scaleBar(this.mz.overlay, geo);
    this.markers(this.mz.overlay, this.last.objects, geo, false);
    this.objectTable(this.last.objects, Math.min(dx, dy) * 1e9);
    this.el.dataset.scale = String(s);
    // charge density: given, computed now, or (deferCharge) left to drawCharge
    this.charge.root.hidden = !this.last.showCharge;
    let density = p.density && p.density.length === (nx - 1) * (ny - 1) ? p.density : null;
    if (!density && !p.deferCharge) density = chargeDensity(field, nx, ny);
    if (density) this.drawCharge(density);
    else this.charge.root.dataset.pending = "1";
    return density;
  }

  /** The charge-density panel of the last drawing, for this density (one value per plaquette). */
  drawCharge(density: Float32Array): void {
    if (!this.last) return;
    const { geo, objects, showCharge } = this.last;
    const { nx, ny, dx, dy, s } = geo;
    // Charge per plaquette, as density per area (nm^-2), on a range symmetric about zero.
    const areaNm2 = dx * 1e9 * (dy * 1e9);
    const peakRho = peakAbs(density) / areaNm2;
    // The whole map is used: its ends are +- the largest |rho_Q| (ticks at round values inside).
    const rhoTop = peakRho > 0 ? peakRho : 1;
    this.el.dataset.peakDensity = String(peakRho);
    delete this.charge.root.dataset.pending;
    if (!showCharge) return;
    const crgba = new Uint8ClampedArray(4 * (nx - 1) * (ny - 1));
    fillCharge(density, nx - 1, ny - 1, rhoTop * areaNm2, crgba);
    // Plaquette (i, j) spans the centres of cells i..i+1 and j..j+1: half a cell in from the edge.
    this.blit(this.charge.canvas, crgba, nx - 1, ny - 1, s, ML + Math.round(s / 2), MT + Math.round(s / 2));
    this.frame(
      this.charge,
      geo,
      `topological charge density ρ_Q (colour ends: ±${tickLabel(Number(rhoTop.toPrecision(2)))} nm⁻²)`,
      CHARGE_TABLE,
      -rhoTop,
      rhoTop,
      "ρ_Q",
      "nm⁻²",
      niceTicks(-rhoTop, rhoTop, 4),
    );
    this.placeOverlay(this.charge.overlay, geo);
    this.charge.overlay.replaceChildren();
    this.markers(this.charge.overlay, objects, geo, true);
  }

  private placeOverlay(o: SVGSVGElement, g: Geo): void {
    o.setAttribute("width", String(g.W));
    o.setAttribute("height", String(g.H));
    o.setAttribute("viewBox", `0 0 ${g.W} ${g.H}`);
    o.style.left = `${ML}px`;
    o.style.top = `${MT}px`;
  }

  /** Copy RGBA (w x h, one pixel per cell) to `canvas` at s CSS px per cell, smoothing off. */
  private blit(canvas: HTMLCanvasElement, rgba: Uint8ClampedArray<ArrayBuffer>, w: number, h: number, s: number, left: number, top: number): void {
    const off = (this.off ??= document.createElement("canvas"));
    off.width = w;
    off.height = h;
    off.getContext("2d")!.putImageData(new ImageData(rgba, w, h), 0, 0);
    canvas.width = w * s;
    canvas.height = h * s;
    canvas.style.width = `${w * s}px`;
    canvas.style.height = `${h * s}px`;
    canvas.style.left = `${left}px`;
    canvas.style.top = `${top}px`;
    const ctx = canvas.getContext("2d")!;
    ctx.imageSmoothingEnabled = false;
    ctx.drawImage(off, 0, 0, w * s, h * s);
  }

  private frame(panel: Panel, g: Geo, title: string, table: Uint8ClampedArray, lo: number, hi: number, symbol: string, unit: string, ticks: number[]): void {
    const { W, H } = g;
    const f = panel.frame;
    const totalW = ML + W + MR,
      totalH = MT + H + MB;
    panel.root.style.width = `${totalW}px`;
    panel.root.style.height = `${totalH}px`;
    f.setAttribute("width", String(totalW));
    f.setAttribute("height", String(totalH));
    f.setAttribute("viewBox", `0 0 ${totalW} ${totalH}`);
    f.replaceChildren();
    f.append(svg("text", { x: ML, y: 16, class: "hx-panel-title" }, title));
    f.append(svg("rect", { x: ML - 0.5, y: MT - 0.5, width: W + 1, height: H + 1, fill: "none", stroke: "#333", "stroke-width": 1 }));
    // x axis (nm)
    const xLo = -0.5 * g.dx * 1e9,
      xHi = (g.nx - 0.5) * g.dx * 1e9;
    const yLo = -0.5 * g.dy * 1e9,
      yHi = (g.ny - 0.5) * g.dy * 1e9;
    const ax = svg("g", { class: "hx-axis", "data-axis": "x" });
    for (const t of niceTicks(xLo, xHi, Math.max(2, Math.round(W / 80)))) {
      const X = ML + ((t - xLo) / (xHi - xLo)) * W;
      ax.append(svg("line", { x1: X, x2: X, y1: MT + H, y2: MT + H + 5, stroke: "#333" }));
      ax.append(svg("text", { x: X, y: MT + H + 17, "text-anchor": "middle", class: "hx-tick" }, tickLabel(t)));
    }
    ax.append(svg("text", { x: ML + W / 2, y: MT + H + 34, "text-anchor": "middle", class: "hx-axis-title" }, "x (nm)"));
    const ay = svg("g", { class: "hx-axis", "data-axis": "y" });
    for (const t of niceTicks(yLo, yHi, Math.max(2, Math.round(H / 80)))) {
      const Y = MT + H - ((t - yLo) / (yHi - yLo)) * H;
      ay.append(svg("line", { x1: ML - 5, x2: ML, y1: Y, y2: Y, stroke: "#333" }));
      ay.append(svg("text", { x: ML - 8, y: Y + 4, "text-anchor": "end", class: "hx-tick" }, tickLabel(t)));
    }
    ay.append(svg("text", { x: 12, y: MT + H / 2, "text-anchor": "middle", transform: `rotate(-90 12 ${MT + H / 2})`, class: "hx-axis-title" }, "y (nm)"));
    f.append(ax, ay);
    // colour bar: 64 bands of the map (crisp steps), ticks and the unit
    const bx = ML + W + 14,
      bw = 14;
    const bar = svg("g", { class: "hx-colourbar", "data-symbol": symbol, "data-unit": unit });
    const bands = 64,
      n = table.length / 3;
    for (let k = 0; k < bands; k++) {
      const idx = Math.round(((k + 0.5) / bands) * (n - 1));
      const y0 = MT + H - ((k + 1) / bands) * H;
      bar.append(svg("rect", { x: bx, y: y0, width: bw, height: H / bands + 0.5, fill: `rgb(${table[3 * idx]},${table[3 * idx + 1]},${table[3 * idx + 2]})` }));
    }
    bar.append(svg("rect", { x: bx - 0.5, y: MT - 0.5, width: bw + 1, height: H + 1, fill: "none", stroke: "#333" }));
    for (const t of ticks) {
      const Y = MT + H - ((t - lo) / (hi - lo)) * H;
      bar.append(svg("line", { x1: bx + bw, x2: bx + bw + 4, y1: Y, y2: Y, stroke: "#333" }));
      bar.append(svg("text", { x: bx + bw + 6, y: Y + 4, class: "hx-tick" }, tickLabel(t)));
    }
    bar.append(svg("text", { x: bx, y: MT - 8, class: "hx-axis-title" }, unit ? `${symbol} (${unit})` : symbol));
    f.append(bar);
  }

  private arrows(field: Field, g: Geo): void {
    const { nx, ny, s, H } = g;
    // About 16 arrows along the longer side, never closer than 14 px.
    const step = Math.max(arrowStep(nx, ny, 16), Math.ceil(14 / s));
    const len = 0.8 * step * s;
    let shafts = "",
      heads = "";
    let count = 0;
    const off = Math.floor(step / 2);
    for (let j = off; j < ny; j += step) {
      for (let i = off; i < nx; i += step) {
        const k = 3 * (j * nx + i);
        const mx = field[k]!,
          my = field[k + 1]!;
        const inPlane = Math.hypot(mx, my);
        if (inPlane < 0.1) continue;
        const cx = (i + 0.5) * s,
          cy = H - (j + 0.5) * s;
        const L = len * Math.min(1, inPlane);
        const ux = (mx / inPlane) * L,
          uy = (-my / inPlane) * L;
        const tx = cx - ux / 2,
          ty = cy - uy / 2,
          hx = cx + ux / 2,
          hy = cy + uy / 2;
        if (L < 5) continue; // shorter than a head: |m_xy| is too small to read a direction
        const hs = Math.min(Math.max(4, 0.35 * L), 0.6 * L),
          a = Math.atan2(uy, ux);
        const bx = hx - hs * Math.cos(a),
          by = hy - hs * Math.sin(a);
        shafts += `M${tx.toFixed(1)} ${ty.toFixed(1)}L${bx.toFixed(1)} ${by.toFixed(1)}`;
        heads +=
          `M${hx.toFixed(1)} ${hy.toFixed(1)}L${(hx - hs * Math.cos(a - 0.5)).toFixed(1)} ${(hy - hs * Math.sin(a - 0.5)).toFixed(1)}` +
          `L${(hx - hs * Math.cos(a + 0.5)).toFixed(1)} ${(hy - hs * Math.sin(a + 0.5)).toFixed(1)}Z`;
        count++;
      }
    }
    const grp = svg("g", { class: "hx-arrow-layer", "data-count": count, "data-step": step });
    grp.append(
      svg("path", { d: shafts, stroke: "white", "stroke-width": 4, "stroke-opacity": 0.75, fill: "none", "stroke-linecap": "round" }),
      svg("path", { d: heads, stroke: "white", "stroke-width": 2.5, "stroke-opacity": 0.75, fill: "white", "stroke-linejoin": "round" }),
      svg("path", { d: shafts, stroke: "#111", "stroke-width": 1.6, fill: "none", "stroke-linecap": "round" }),
      svg("path", { d: heads, fill: "#111" }),
    );
    this.mz.overlay.append(grp);
  }

  private scaleBar(o: SVGSVGElement, g: Geo): void {
    const widthNm = g.nx * g.dx * 1e9;
    const lenNm = scaleBarLength(widthNm / 4);
    const px = (lenNm / widthNm) * g.W;
    const x0 = 10,
      y0 = g.H - 12;
    const grp = svg("g", { class: "hx-scalebar", "data-length-nm": lenNm });
    grp.append(
      svg("rect", { x: x0 - 4, y: y0 - 17, width: px + 8, height: 24, fill: "white", "fill-opacity": 0.8, rx: 3 }),
      svg("rect", { x: x0, y: y0, width: px, height: 4, fill: "#111" }),
      svg("text", { x: x0 + px / 2, y: y0 - 4, "text-anchor": "middle", class: "hx-tick" }, `${tickLabel(lenNm)} nm`),
    );
    o.append(grp);
  }

  private markers(o: SVGSVGElement, objs: TextureObjects | null, g: Geo, onCharge: boolean): void {
    if (!objs) return;
    const n = Math.min(objs.x.length, objs.y.length, objs.charge.length);
    {
      for (let k = 0; k < n; k++) {
        const X = (objs.x[k]! / g.dx + 0.5) * g.s,
          Y = g.H - (objs.y[k]! / g.dy + 0.5) * g.s;
        const m = svg("g", { class: "hx-object-marker", "data-index": k + 1, "data-charge": objs.charge[k]!, "data-x-nm": objs.x[k]! * 1e9, "data-y-nm": objs.y[k]! * 1e9 });
        m.append(
          svg("circle", { cx: X, cy: Y, r: 7, fill: "none", stroke: "white", "stroke-width": 4 }),
          svg("circle", { cx: X, cy: Y, r: 7, fill: "none", stroke: onCharge ? "#000" : "#ffd400", "stroke-width": 2 }),
          svg(
            "text",
            { ...labelPlace(X, Y, g.W), class: "hx-marker-label", stroke: "white", "stroke-width": 3, "paint-order": "stroke" },
            n > 20 ? String(k + 1) : `${k + 1}: Q = ${fixed(objs.charge[k]!, 2)}`,
          ),
        );
        o.append(m);
      }
    }
  }

  private objectTable(objs: TextureObjects | null, cellNm: number): void {
    this.table.replaceChildren();
    if (!objs) return;
    const n = Math.min(objs.x.length, objs.y.length, objs.charge.length);
    if (n === 0) {
      this.table.append(el("div", { class: "hx-muted", text: "objects: none found" }));
      return;
    }
    // One notation per column: charges to 3 decimals, positions to about a tenth of a cell.
    const d = Math.max(0, Math.min(4, Math.ceil(-Math.log10(cellNm / 10) - 1e-9)));
    const t = el("table", { class: "hx-objects" });
    const head = el("tr");
    for (const h of ["#", "Q_i", "x_c (nm)", "y_c (nm)"]) {
      const th = el("th");
      richText(th, h);
      head.append(th);
    }
    t.append(head);
    for (let k = 0; k < n; k++) {
      const r = el("tr", { "data-index": String(k + 1) });
      r.append(
        el("td", { text: String(k + 1) }),
        el("td", { text: fixed(objs.charge[k]!, 3) }),
        el("td", { text: fixed(objs.x[k]! * 1e9, d) }),
        el("td", { text: fixed(objs.y[k]! * 1e9, d) }),
      );
      t.append(r);
    }
    this.table.append(el("div", { class: "hx-objects-title", text: `objects found (${n}): charge and charge-weighted centre` }), t);
  }

  /** Cell (i, j) under a client position on the m_z canvas, or null. */
  cellAt(clientX: number, clientY: number, nx: number, ny: number): [number, number] | null {
    const rect = this.mz.canvas.getBoundingClientRect();
    if (!(rect.width > 0)) return null;
    const i = Math.min(nx - 1, Math.max(0, Math.floor(((clientX - rect.left) / rect.width) * nx)));
    const jTop = Math.min(ny - 1, Math.max(0, Math.floor(((clientY - rect.top) / rect.height) * ny)));
    return [i, ny - 1 - jTop];
  }
}

interface Geo {
  nx: number;
  ny: number;
  dx: number;
  dy: number;
  s: number;
  W: number;
  H: number;
}

/** Where a marker's label goes: right of and above the ring, or left of / below it near an edge. */
function labelPlace(X: number, Y: number, W: number): Record<string, string | number> {
  // Near the right edge the label goes below-left (a neighbour's label sits above-right at the same height).
  const left = X + 90 > W;
  const below = left || Y - 10 < 12;
  return { x: left ? X - 4 : X + 10, y: below ? Y + 22 : Y - 10, "text-anchor": left ? "end" : "start" };
}
