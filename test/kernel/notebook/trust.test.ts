/**
 * Notebooks written by `helicoid run` (and so by `helicoid start`, which runs each example through
 * it) are trusted for their user: Jupyter's own notary (Debian's python3-nbformat,
 * nbformat.sign.NotebookNotary, with the same JUPYTER_DATA_DIR: the user's secret and signature
 * database) says so. A notebook written with --no-trust, and one changed after signing, are not.
 */
import { describe, expect, it } from "vitest";
import { spawnSync } from "node:child_process";
import { mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { helicoidBin } from "../../helpers/paths.js";
import { systemPython } from "../../helpers/python.js";

const CHECK =
  "import nbformat, sys\nfrom nbformat.sign import NotebookNotary\nnb = nbformat.read(sys.argv[1], as_version=4)\nprint('trusted' if NotebookNotary().check_signature(nb) else 'untrusted')";

describe("notebooks written by helicoid run are trusted", () => {
  const dir = mkdtempSync(join(tmpdir(), "helicoid-trust-"));
  const env = { ...process.env, JUPYTER_DATA_DIR: join(dir, "jupyter-data") };
  const input = join(dir, "in.ipynb");
  writeFileSync(
    input,
    JSON.stringify({
      nbformat: 4,
      nbformat_minor: 5,
      metadata: {},
      cells: [
        {
          id: "c1",
          cell_type: "code",
          metadata: {},
          execution_count: null,
          outputs: [],
          source: 'import { slider } from "@helicoid/kernel";\nslider({ min: 0, max: 2, value: 1 })',
        },
      ],
    }),
  );
  const check = (f: string) => {
    const r = spawnSync(systemPython, ["-c", CHECK, f], { encoding: "utf8", env });
    expect(r.status, r.stderr).toBe(0);
    return r.stdout.trim();
  };

  it("by Jupyter's notary, with the user's secret; not with --no-trust; not after a change", () => {
    const out = join(dir, "out.ipynb");
    const r = spawnSync(process.execPath, [helicoidBin, "run", input, "-o", out], { encoding: "utf8", env, timeout: 120_000 });
    expect(r.status, r.stderr).toBe(0);
    expect(r.stderr).toMatch(/signed for this user/);
    expect(check(out)).toBe("trusted");
    const plain = join(dir, "plain.ipynb");
    const p = spawnSync(process.execPath, [helicoidBin, "run", input, "-o", plain, "--no-trust"], { encoding: "utf8", env, timeout: 120_000 });
    expect(p.status, p.stderr).toBe(0);
    expect(check(plain)).toBe("untrusted");
    const nb = JSON.parse(readFileSync(out, "utf8"));
    nb.cells[0].outputs.push({ output_type: "stream", name: "stdout", text: ["changed\n"] });
    const changed = join(dir, "changed.ipynb");
    writeFileSync(changed, JSON.stringify(nb));
    expect(check(changed)).toBe("untrusted");
  });

  it("a notebook whose cells have no ids (nbformat 4.5 readers invent random ones) is trusted too", () => {
    const bare = join(dir, "bare.ipynb");
    writeFileSync(
      bare,
      JSON.stringify({
        nbformat: 4,
        nbformat_minor: 5,
        metadata: {},
        cells: [
          { cell_type: "code", metadata: {}, execution_count: null, outputs: [], source: "6 * 7" },
          { cell_type: "markdown", metadata: {}, source: "# t" },
        ],
      }),
    );
    const out = join(dir, "bare.out.ipynb");
    const r = spawnSync(process.execPath, [helicoidBin, "run", bare, "-o", out], { encoding: "utf8", env, timeout: 120_000 });
    expect(r.status, r.stderr).toBe(0);
    expect(JSON.parse(readFileSync(out, "utf8")).cells.map((c: { id: string }) => c.id)).toEqual(["cell-1", "cell-2"]);
    expect(check(out)).toBe("trusted");
  });

  it("says so when no Jupyter is there to sign", () => {
    const out = join(dir, "nojupyter.ipynb");
    const r = spawnSync(process.execPath, [helicoidBin, "run", input, "-o", out], {
      encoding: "utf8",
      env: { ...env, HELICOID_JUPYTER: join(dir, "no-such-jupyter") },
      timeout: 120_000,
    });
    expect(r.status, r.stderr).toBe(0);
    expect(r.stderr).toMatch(/not signed: no `jupyter` command found/);
  });
});
