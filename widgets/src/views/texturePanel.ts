/**
 * The texture panel of an explorer: for a calculator whose outputs carry a field preview
 * (`fieldPreview`: mx, my, mz interleaved, x fastest; `previewSize` cells along x and y;
 * `previewCell` in m), the explorer shows the texture itself (views/texturePicture.ts: m_z with
 * in-plane arrows, the topological charge density in its own panel, axes in nm, colour bars) and,
 * when the outputs also have `objectX`, `objectY` (m) and `objectCharge`, the found objects marked
 * on the picture and listed in a table.
 */
import type { CalculatorResult } from "@helicoid/lib";
import { TexturePicture, richText } from "./texturePicture.js";
import { el } from "./dom.js";

interface SpecLike {
  outputs: Array<{ name: string }>;
}

export interface TexturePanel {
  el: HTMLElement;
  /** Draw the preview of a result (null: no result, the panel hides). */
  show(result: CalculatorResult | null): void;
}

/** A panel for specs with fieldPreview, previewSize and previewCell outputs; null otherwise. */
export function texturePanelFor(spec: SpecLike): TexturePanel | null {
  const names = new Set(spec.outputs.map((o) => o.name));
  if (!["fieldPreview", "previewSize", "previewCell"].every((n) => names.has(n))) return null;
  const root = el("div", { class: "hx-texture hx-explorer-texture" });
  const title = el("div", { class: "hx-plot-title", text: "texture" });
  const picture = new TexturePicture();
  const note = el("div", { class: "hx-legend" });
  const problem = el("div", { class: "hx-error" });
  problem.hidden = true;
  root.append(title, picture.el, note, problem);
  const num = (r: CalculatorResult, n: string) => (n in r.outputs ? r.outputs[n]!.value : undefined);
  return {
    el: root,
    show(result) {
      root.hidden = !result;
      if (!result) return;
      const m = num(result, "fieldPreview"),
        size = num(result, "previewSize"),
        cell = num(result, "previewCell");
      if (!Array.isArray(m) || typeof size !== "number" || typeof cell !== "number" || !(size >= 2) || m.length !== 3 * size * size || !(cell > 0)) {
        problem.textContent = "Texture: the result carries no usable field preview (fieldPreview, previewSize, previewCell)";
        problem.hidden = false;
        picture.el.hidden = true;
        return;
      }
      problem.hidden = true;
      picture.el.hidden = false;
      const x = num(result, "objectX"),
        y = num(result, "objectY"),
        q = num(result, "objectCharge");
      const objects = Array.isArray(x) && Array.isArray(y) && Array.isArray(q) ? { x, y, charge: q } : null;
      picture.draw({ field: Float32Array.from(m), nx: size, ny: size, dx: cell, dy: cell, objects, arrows: true, charge: true, displaySize: 360 });
      root.dataset.previewSize = String(size);
      title.textContent = `texture (preview: ${size} × ${size} cells of ${(cell * 1e9).toPrecision(3)} nm)`;
      richText(
        note,
        "m_z: diverging map after K. Moreland (2009), blue −1, grey 0, red +1; arrows: in-plane m, length ∝ |m_{xy}|; " +
          "ρ_Q: charge per plaquette of the preview / area, green < 0 < purple; rings and table: objects found on the full grid (charge, centre).",
      );
    },
  };
}
