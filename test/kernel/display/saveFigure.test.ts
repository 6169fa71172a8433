/**
 * Figure export for papers without a browser: `saveFigure` (kernel-ext/src/display/saveFigure.ts,
 * SVG by lib/src/plot/paperSvg.ts) and `helicoid calc ... --plot FILE.svg`. The files are parsed by
 * an XML parser outside the project (Debian's Python, xml.etree) and must hold one path per curve,
 * with as many vertices as the curve has points, at one journal column's size with text >= 8 pt.
 */
import { describe, it, expect } from "vitest";
import { spawnSync } from "node:child_process";
import { mkdtempSync, readFileSync, existsSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { getCalculator, runCalculator } from "@helicoid/lib";
import { helicoidBin } from "../../helpers/paths.js";
import { runPython } from "../../helpers/python.js";
import { saveFigure, figureToSvg } from "../../../kernel-ext/src/display/saveFigure.js";

interface Parsed {
  root: string;
  width: string;
  fontSize: string;
  curves: Array<{ trace: string; vertices: number }>;
  texts: string[];
}

/** Parse an SVG file with Python's xml.etree (an outside parser) and list its curves and texts. */
function parseSvg(path: string): Parsed {
  return runPython<Parsed>(
    `
import json, sys, re, xml.etree.ElementTree as ET
path = json.load(sys.stdin)
root = ET.parse(path).getroot()
ns = "{http://www.w3.org/2000/svg}"
curves = [{"trace": p.get("data-trace"), "vertices": len(re.findall(r"[ML]", p.get("d")))} for p in root.iter(ns + "path") if p.get("class") == "curve"]
texts = ["".join(t.itertext()) for t in root.iter(ns + "text")]
print(json.dumps({"root": root.tag, "width": root.get("width"), "fontSize": root.get("font-size"), "curves": curves, "texts": texts}))
`,
    path,
  );
}

const dir = mkdtempSync(join(tmpdir(), "helicoid-figures-"));

describe("saveFigure", () => {
  it("writes a calculator's plot as SVG: one path per curve, every point, symbols and units as text", async () => {
    const spec = getCalculator("wall360");
    const r = runCalculator(spec, {}, { sweep: { over: "B", from: 0.01, to: 0.3, points: 25 } });
    const out = join(dir, "r-vs-b.svg");
    await saveFigure(r, out, { plot: "size", width: "8.5cm", height: "6.4cm" });
    const svg = parseSvg(out);
    expect(svg.root).toBe("{http://www.w3.org/2000/svg}svg");
    // Common practice, no source: 8.5 cm at 96 px per inch = 321 px; 9 pt = 12 px (>= 8 pt).
    expect(svg.width).toBe("321px");
    expect(Number(svg.fontSize)).toBeGreaterThanOrEqual((8 * 96) / 72);
    const plot = spec.plots.find((p) => p.id === "size")!;
    expect(svg.curves.length).toBe(plot.y.length);
    plot.y.forEach((name, i) => {
      const finite = (r.outputs[name]!.value as number[]).filter((v) => Number.isFinite(v) && v > 0).length;
      expect(svg.curves[i]!.vertices, name).toBe(finite);
    });
    const texts = svg.texts.join(" | ");
    expect(texts).toContain("R, w (nm)");
    expect(texts).toMatch(/μ0 ?H \(mT\)/);
    expect(texts).not.toMatch(/[\\{}]/);
  });

  it("writes a plain {data, layout} figure, and refuses a bad size or file type with the value given", async () => {
    const fig = {
      data: [
        { type: "scatter", x: [0, 1, 2, 3], y: [0, 1, 4, 9], name: "a" },
        { type: "scatter", x: [0, 1, 2, 3], y: [1, null, 3, 2], name: "b", mode: "lines+markers" },
      ],
      layout: { xaxis: { title: { text: "x (nm)" } } },
    };
    const out = join(dir, "plain.svg");
    await saveFigure(fig, out);
    const svg = parseSvg(out);
    expect(svg.curves.map((c) => c.vertices)).toEqual([4, 3]);
    expect(readFileSync(out, "utf8")).toContain("<circle");
    await expect(saveFigure(fig, join(dir, "x.pdf"))).rejects.toThrow(/\.svg or \.png/);
    expect(() => figureToSvg(fig, { width: "2m" } as never)).toThrow(/width = "2m"/);
    expect(() => figureToSvg({ data: [{ type: "heatmap", z: [[1]] }] })).toThrow(/heatmap/);
  });

  it("helicoid calc skyrmion ... --plot out.svg writes the first plot; a wrong extension exits 2", () => {
    const out = join(dir, "skyrmion.svg");
    const r = spawnSync(process.execPath, [helicoidBin, "calc", "skyrmion", "B=50mT", "D=2.5mJ/m^2", "--demo", "--plot", out], { encoding: "utf8", timeout: 120_000 });
    expect(r.status, r.stderr).toBe(0);
    expect(r.stderr).toContain(`wrote ${out}`);
    expect(existsSync(out)).toBe(true);
    const svg = parseSvg(out);
    expect(svg.curves.length).toBe(getCalculator("skyrmion").plots[0]!.y.length);
    for (const c of svg.curves) expect(c.vertices).toBeGreaterThan(5);
    const bad = spawnSync(process.execPath, [helicoidBin, "calc", "skyrmion", "--plot", join(dir, "x.pdf")], { encoding: "utf8", timeout: 60_000 });
    expect(bad.status).toBe(2);
    expect(bad.stderr).toContain("--plot");
  });
});
