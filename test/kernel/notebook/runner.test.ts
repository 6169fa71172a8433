/**
 * `helicoid run`: executes a notebook in process through the same executor as the kernel, captures
 * outputs as nbformat, saves widget state the way Jupyter does, reports the failing cell, never
 * modifies its input, and names the file when the notebook is not valid.
 */
import { describe, expect, it } from "vitest";
import { spawnSync } from "node:child_process";
import { mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { helicoidBin } from "../../helpers/paths.js";
import { systemPython } from "../../helpers/python.js";

const cell = (source: string) => ({ cell_type: "code", metadata: {}, source, outputs: [], execution_count: null });
const notebook = (cells: unknown[]) => ({ nbformat: 4, nbformat_minor: 5, metadata: {}, cells });

function run(args: string[], cwd?: string) {
  return spawnSync(process.execPath, [helicoidBin, "run", ...args], { encoding: "utf8", cwd, timeout: 120_000 });
}

describe("helicoid run", () => {
  const dir = mkdtempSync(join(tmpdir(), "helicoid-run-"));

  it("executes cells in order with stream, display, result outputs and saved widget state", () => {
    const input = join(dir, "ok.ipynb");
    const nb = notebook([
      { cell_type: "markdown", metadata: {}, source: "# A title" },
      cell('import { slider, vbox, label, figure, display } from "@helicoid/kernel";\nconsole.log("line one");\nconsole.log("line two");\nconst n: number = 21;'),
      cell("n * 2"),
      cell('const s = slider({ min: 0, max: 5, value: 2, description: "D" });\nvbox([label("Field"), s])'),
      cell('display(figure({ data: [{ x: [1, 2], y: [3, 4], type: "scatter" }], layout: { title: "t" } }));\nconsole.error("to stderr")'),
    ]);
    const text = JSON.stringify(nb);
    writeFileSync(input, text);
    const out = join(dir, "ok.out.ipynb");
    const r = run([input, "-o", out]);
    expect(r.status, r.stderr).toBe(0);
    expect(readFileSync(input, "utf8")).toBe(text); // never modified
    const res = JSON.parse(readFileSync(out, "utf8"));
    const [, c1, c2, c3, c4] = res.cells;
    expect(c1.outputs).toEqual([{ output_type: "stream", name: "stdout", text: ["line one\n", "line two\n"] }]);
    expect(c1.execution_count).toBe(1);
    expect(c2.outputs[0]).toMatchObject({ output_type: "execute_result", execution_count: 2, data: { "text/plain": ["42"] } });
    const view = c3.outputs[0].data["application/vnd.jupyter.widget-view+json"];
    expect(view).toMatchObject({ version_major: 2, version_minor: 0 });
    const state = res.metadata.widgets["application/vnd.jupyter.widget-state+json"];
    expect(state).toMatchObject({ version_major: 2, version_minor: 0 });
    const box = state.state[view.model_id];
    expect(box.model_name).toBe("VBoxModel");
    const [labelRef, sliderRef] = box.state.children as string[];
    expect(labelRef).toMatch(/^IPY_MODEL_/);
    expect(state.state[sliderRef!.slice(10)].state).toMatchObject({ _model_name: "FloatSliderModel", value: 2, max: 5, description: "D" });
    const fig = c4.outputs.find((o: { output_type: string }) => o.output_type === "display_data");
    expect(fig.data["application/vnd.plotly.v1+json"].data[0].y).toEqual([3, 4]);
    expect(fig.data["text/html"].join("")).toMatch(/<script type="text\/javascript">/);
    expect(c4.outputs.find((o: { name?: string }) => o.name === "stderr").text).toEqual(["to stderr\n"]);
    // nbformat's own validator accepts the result (Debian's python3-nbformat).
    const v = spawnSync(systemPython, ["-c", "import nbformat,sys; nbformat.validate(nbformat.read(sys.argv[1], as_version=4)); print('valid')", out], { encoding: "utf8" });
    expect(v.stdout.trim(), v.stderr).toBe("valid");
  });

  it("stops at the failing cell and reports its number and message", () => {
    const input = join(dir, "fail.ipynb");
    writeFileSync(input, JSON.stringify(notebook([cell("const a = 1;"), cell('throw new RangeError("field too large")'), cell("a")])));
    const out = join(dir, "fail.out.ipynb");
    const r = run([input, "-o", out]);
    expect(r.status).toBe(1);
    expect(r.stderr).toMatch(/cell 2 failed: RangeError: field too large/);
    const res = JSON.parse(readFileSync(out, "utf8"));
    expect(res.cells[1].outputs[0]).toMatchObject({ output_type: "error", ename: "RangeError", evalue: "field too large" });
    expect(res.cells[2].execution_count).toBeNull();
  });

  it("names the file when the notebook is not valid JSON or nbformat, and refuses to overwrite its input", () => {
    const bad = join(dir, "bad.ipynb");
    writeFileSync(bad, "{ not json");
    let r = run([bad]);
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/bad\.ipynb: not valid JSON/);
    const v3 = join(dir, "old.ipynb");
    writeFileSync(v3, JSON.stringify({ nbformat: 3, worksheets: [] }));
    r = run([v3]);
    expect(r.stderr).toMatch(/old\.ipynb: nbformat is 3; expected 4/);
    const same = join(dir, "same.ipynb");
    const text = JSON.stringify(notebook([cell("1")]));
    writeFileSync(same, text);
    r = run([same, "-o", same]);
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/output path is the input notebook/);
    expect(readFileSync(same, "utf8")).toBe(text);
    r = run([join(dir, "missing.ipynb")]);
    expect(r.stderr).toMatch(/missing\.ipynb: no such file/);
  });
});
