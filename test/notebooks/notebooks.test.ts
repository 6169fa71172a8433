/**
 * Every example notebook executes with no error outputs, twice over:
 * - with Debian's `jupyter-nbconvert --execute` using the installed `helicoid` kernel (real Jupyter
 *   machinery: jupyter_client starts our kernel from its kernelspec over ZeroMQ), and
 * - with our in-process runner `helicoid run`.
 */
import { describe, expect, it } from "vitest";
import { spawnSync } from "node:child_process";
import { mkdtempSync, readdirSync, readFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { installKernelspec } from "../helpers/kernel.js";
import { helicoidBin, repoRoot } from "../helpers/paths.js";

const notebooksDir = join(repoRoot, "notebooks");
const notebooks = readdirSync(notebooksDir).filter((f) => f.endsWith(".ipynb")).sort();

type Output = { output_type: string; ename?: string; evalue?: string; name?: string; text?: string | string[] };

function errorsOf(file: string): string[] {
  const nb = JSON.parse(readFileSync(file, "utf8")) as { cells: Array<{ cell_type: string; outputs?: Output[] }> };
  const problems: string[] = [];
  nb.cells.forEach((c, i) => {
    for (const o of c.outputs ?? []) {
      if (o.output_type === "error") problems.push(`cell ${i + 1}: ${o.ename}: ${o.evalue}`);
    }
  });
  return problems;
}

function codeCellsWithoutCount(file: string): number {
  const nb = JSON.parse(readFileSync(file, "utf8")) as { cells: Array<{ cell_type: string; execution_count?: number | null }> };
  return nb.cells.filter((c) => c.cell_type === "code" && !c.execution_count).length;
}

describe("example notebooks", () => {
  const out = mkdtempSync(join(tmpdir(), "helicoid-notebooks-"));
  const { jupyterPath } = installKernelspec();

  it("there are example notebooks", () => {
    expect(notebooks.length).toBeGreaterThanOrEqual(1);
  });

  for (const name of notebooks) {
    it(`${name} runs with jupyter-nbconvert --execute on the helicoid kernel`, () => {
      const r = spawnSync(
        "jupyter-nbconvert",
        ["--to", "notebook", "--execute", "--ExecutePreprocessor.kernel_name=helicoid", "--ExecutePreprocessor.timeout=600", "--output-dir", out, "--output", `nbconvert-${name}`, join(notebooksDir, name)],
        { encoding: "utf8", env: { ...process.env, JUPYTER_PATH: jupyterPath }, timeout: 900_000 },
      );
      expect(r.status, r.stderr).toBe(0);
      const file = join(out, `nbconvert-${name}`);
      expect(errorsOf(file)).toEqual([]);
      expect(codeCellsWithoutCount(file)).toBe(0);
    });

    it(`${name} runs with helicoid run`, () => {
      const file = join(out, `run-${name}`);
      const r = spawnSync(process.execPath, [helicoidBin, "run", join(notebooksDir, name), "-o", file, "--quiet"], { encoding: "utf8", timeout: 900_000 });
      expect(r.status, r.stderr).toBe(0);
      expect(errorsOf(file)).toEqual([]);
      expect(codeCellsWithoutCount(file)).toBe(0);
    });
  }
});
