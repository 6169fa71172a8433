/**
 * Export of a drawn plotly plot for a paper: a small bar under the plot with the size (cm), the
 * resolution (dpi, PNG only) and SVG / PNG buttons. The figure is restyled for print by
 * `paperLayout` (@helicoid/lib: text 9 pt, lines about 1 pt, black axes) and rendered by plotly's
 * own `toImage`, so the file shows exactly the plotted data. Common practice, no source.
 */
import { paperLayout } from "@helicoid/lib";
import { Plotly } from "../plotly.js";
import { el } from "./dom.js";

const PX_PER_CM = 96 / 2.54;

/** Size in CSS px and the PNG scale for a width and height in cm at `dpi`. */
export function exportPixels(widthCm: number, heightCm: number, dpi: number): { width: number; height: number; scale: number } {
  return { width: Math.round(widthCm * PX_PER_CM), height: Math.round(heightCm * PX_PER_CM), scale: dpi / 96 };
}

/** The image of plot `gd` as a data URL ("svg" or "png") at the given size. */
export async function plotImage(gd: HTMLElement, format: "svg" | "png", widthCm: number, heightCm: number, dpi: number): Promise<string> {
  const { width, height, scale } = exportPixels(widthCm, heightCm, dpi);
  const g = gd as unknown as { data: Array<Record<string, unknown>>; layout: Record<string, unknown> };
  const fig = paperLayout(g.data ?? [], g.layout ?? {}, { width, height });
  return (Plotly as unknown as { toImage: (f: unknown, o: unknown) => Promise<string> }).toImage(fig, { format, width, height, scale: format === "png" ? scale : 1 });
}

function download(url: string, name: string): void {
  const a = document.createElement("a");
  a.href = url;
  a.download = name;
  document.body.append(a);
  a.click();
  a.remove();
}

/** Put the export bar after plot element `gd` (once). */
export function addExportButtons(gd: HTMLElement, name: string): void {
  const next = gd.nextElementSibling as HTMLElement | null;
  if (next?.classList.contains("hx-export")) return;
  const bar = el("div", { class: "hx-export", "data-plot": name });
  const num = (label: string, value: string, cls: string, title: string) => {
    const input = el("input", { type: "number", class: cls, value, min: "0.5", step: "0.1", title, "aria-label": label }) as HTMLInputElement;
    input.style.width = "4.2em";
    return input;
  };
  const w = num("export width (cm)", "8.5", "hx-export-w", "width in cm (one journal column: 8.5)");
  const h = num("export height (cm)", "6.4", "hx-export-h", "height in cm");
  const dpi = num("PNG resolution (dpi)", "600", "hx-export-dpi", "PNG resolution in dots per inch");
  dpi.step = "50";
  const message = el("span", { class: "hx-export-msg" });
  const button = (format: "svg" | "png") => {
    const b = el("button", { class: `hx-button hx-export-${format}`, text: format.toUpperCase(), title: `Download this plot as ${format.toUpperCase()} at the size given` });
    b.addEventListener("click", async () => {
      const wc = Number(w.value),
        hc = Number(h.value),
        d = Number(dpi.value);
      if (!(wc >= 1 && wc <= 60 && hc >= 1 && hc <= 60 && d >= 72 && d <= 2400)) {
        message.textContent = `size ${w.value} x ${h.value} cm at ${dpi.value} dpi: expected 1-60 cm and 72-2400 dpi`;
        return;
      }
      message.textContent = "";
      try {
        const url = await plotImage(gd, format, wc, hc, d);
        bar.dataset.lastExport = url.slice(0, 64);
        download(url, `${name}.${format}`);
      } catch (err) {
        message.textContent = `export failed: ${(err as Error).message}`;
      }
    });
    return b;
  };
  bar.append(
    el("span", { text: "Export " }),
    w,
    el("span", { text: " × " }),
    h,
    el("span", { text: " cm, " }),
    dpi,
    el("span", { text: " dpi " }),
    button("svg"),
    button("png"),
    message,
  );
  gd.after(bar);
}
