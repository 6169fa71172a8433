/**
 * `helicoid run` loses no work (issue 11): asynchronous errors after a cell returned, rejected
 * promises, a throw shortly after the last cell, `process.exit()` in a cell, endless synchronous
 * loops and never-ending awaits each end with exit 1, one line naming the cell, and an output
 * notebook holding what ran with the failing cell marked; bad output paths and links to the input
 * are refused before any cell runs, and the input bytes never change. Spawns the built command.
 */
import { afterAll, describe, expect, it } from "vitest";
import { spawn, spawnSync } from "node:child_process";
import { createHash } from "node:crypto";
import { existsSync, linkSync, mkdtempSync, readFileSync, rmSync, symlinkSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { helicoidBin } from "../helpers/paths.js";

const dir = mkdtempSync(join(tmpdir(), "helicoid-hostile-run-"));
afterAll(() => rmSync(dir, { recursive: true, force: true }));
const sha = (f: string) => createHash("sha256").update(readFileSync(f)).digest("hex");

function notebook(name: string, ...cells: string[]): string {
  const path = join(dir, `${name}.ipynb`);
  const nb = { nbformat: 4, nbformat_minor: 5, metadata: {}, cells: cells.map((source) => ({ cell_type: "code", source, metadata: {}, outputs: [], execution_count: null })) };
  writeFileSync(path, JSON.stringify(nb, null, 1));
  return path;
}

function run(args: string[]) {
  return spawnSync(process.execPath, [helicoidBin, "run", ...args, "--quiet"], { encoding: "utf8", cwd: dir, timeout: 90_000 });
}

interface Out {
  output_type: string;
  ename?: string;
  evalue?: string;
  text?: string[];
}
function outputsOf(path: string): Out[][] {
  const nb = JSON.parse(readFileSync(path, "utf8")) as { cells: Array<{ outputs?: Out[] }> };
  return nb.cells.map((c) => c.outputs ?? []);
}
function runInfo(path: string): { status: string; cell: number; reason: string } | undefined {
  return (JSON.parse(readFileSync(path, "utf8")) as { metadata: { helicoid_run?: { status: string; cell: number; reason: string } } }).metadata.helicoid_run;
}
const oneLine = (s: string) =>
  s
    .trim()
    .split("\n")
    .filter((l) => !/^partial output written/.test(l));

describe("helicoid run keeps the work of a notebook that fails in hostile ways", () => {
  it.each([
    ["late", 'setTimeout(() => { throw new Error("late") }, 5); 1', /late \(thrown after the cell returned\)/],
    ["rejected", 'Promise.reject(new Error("nobody caught me")); 1', /nobody caught me \(a promise was rejected and nothing handled it\)/],
  ])("an asynchronous error (%s) is shown under its cell; the notebook is written; exit 1", (name, source, message) => {
    const nb = notebook(name, source as string, 'console.log("second")');
    const before = sha(nb);
    const out = join(dir, `${name}-out.ipynb`);
    const r = run([nb, "-o", out]);
    expect(r.status).toBe(1);
    expect(oneLine(r.stderr)).toHaveLength(1);
    expect(r.stderr).toMatch(/cell 1 failed/);
    expect(r.stderr).not.toMatch(/\n\s+at /);
    const outputs = outputsOf(out);
    const err = outputs[0]!.find((o) => o.output_type === "error")!;
    expect(err.evalue).toMatch(message as RegExp);
    expect(runInfo(out)?.cell).toBe(1);
    expect(sha(nb)).toBe(before);
  });

  it("a throw one second after the last cell is not lost: it is shown under the last cell (exit 1)", () => {
    const nb = notebook("after-last", 'console.log("a")', 'setTimeout(() => { throw new Error("after the end") }, 1000); 2');
    const out = join(dir, "after-last-out.ipynb");
    const r = run([nb, "-o", out]);
    expect(r.status).toBe(1);
    expect(r.stderr).toMatch(/cell 2 failed: Error: after the end/);
    expect(outputsOf(out)[1]!.some((o) => o.output_type === "error" && /after the end/.test(o.evalue!))).toBe(true);
  });

  it("process.exit() in a cell does not end the run silently: the error is under the cell, later cells do not run", () => {
    const nb = notebook("exit", 'console.log("before")\nprocess.exit(0)', 'console.log("never")');
    const out = join(dir, "exit-out.ipynb");
    const r = run([nb, "-o", out]);
    expect(r.status).toBe(1);
    expect(oneLine(r.stderr)[0]).toMatch(/cell 1 failed: ProcessExitCalled: process\.exit called/);
    const outputs = outputsOf(out);
    expect(outputs[0]!.map((o) => o.output_type)).toEqual(["stream", "error"]);
    expect(outputs[0]![1]!.evalue).toMatch(/^process\.exit called/);
    expect(outputs[1]).toEqual([]);
  });

  it.each([
    ["sync-loop", 'console.log("before")\nwhile (true) {}', /it was interrupted and the run stopped/],
    ["await-forever", 'console.log("before")\nawait new Promise(() => {})', /it was interrupted and the run stopped/],
    ["timer-loop", 'console.log("before")\nsetTimeout(() => { while (true) {} }, 10)\nawait new Promise(() => {})', /could not be interrupted .*its process was stopped/],
  ])("--timeout stops %s: what the cell printed and the reason are in the notebook (exit 1)", (name, source, reason) => {
    const nb = notebook(name, "const x = 1", source as string, 'console.log("never")');
    const out = join(dir, `${name}-out.ipynb`);
    const r = run([nb, "-o", out, "--timeout", "2"]);
    expect(r.status).toBe(1);
    expect(oneLine(r.stderr)).toHaveLength(1);
    expect(r.stderr).toMatch(/cell 2 failed: TimeoutError: cell 2 did not finish within 2 s/);
    const outputs = outputsOf(out);
    expect(outputs[1]![0]).toMatchObject({ output_type: "stream", text: ["before\n"] });
    const err = outputs[1]!.find((o) => o.output_type === "error")!;
    expect(err.ename).toBe("TimeoutError");
    expect(err.evalue).toMatch(reason as RegExp);
    expect(outputs[2]).toEqual([]);
    expect(runInfo(out)).toMatchObject({ status: "stopped", cell: 2 });
  });

  it("Ctrl-C (SIGINT to the process group) stops the running cell, writes the notebook, and is not called a timeout", async () => {
    const nb = notebook("ctrl-c", "const a = 1", 'console.log("looping")\nwhile (true) {}', 'console.log("never")');
    const out = join(dir, "ctrl-c-out.ipynb");
    // Its own process group, as a terminal gives a command; SIGINT goes to the group as Ctrl-C does.
    const p = spawn(process.execPath, [helicoidBin, "run", nb, "-o", out, "--timeout", "60"], { cwd: dir, detached: true, stdio: ["ignore", "ignore", "pipe"] });
    // Whatever happens, the group is ended with the test.
    const stop = setTimeout(() => process.kill(-p.pid!, "SIGKILL"), 100_000);
    let stderr = "";
    p.stderr.on("data", (d) => (stderr += d));
    const code = await new Promise<number | null>((res) => {
      p.stderr.on("data", () => {
        if (/cell 2\/3/.test(stderr) && !stderr.includes("sent")) {
          stderr += "sent";
          setTimeout(() => process.kill(-p.pid!, "SIGINT"), 1500);
        }
      });
      p.on("exit", (c) => res(c));
    });
    clearTimeout(stop);
    expect(code).toBe(1);
    const outputs = outputsOf(out);
    expect(outputs[1]![0]).toMatchObject({ output_type: "stream", text: ["looping\n"] });
    const err = outputs[1]!.find((o) => o.output_type === "error")!;
    expect(err.ename).not.toBe("TimeoutError");
    expect(err.evalue).toMatch(/interrupted/i);
    expect(outputs[2]).toEqual([]);
  });

  it("--timeout takes seconds only", () => {
    const nb = notebook("t", "1");
    for (const bad of ["-1", "abc", "1e999", "Infinity", "0x10"]) {
      const r = run([nb, "--timeout", bad]);
      expect(r.status).toBe(2);
      expect(r.stderr).toMatch(/--timeout is .* expected a number of seconds/);
    }
  });

  it("an unwritable -o is refused before any cell runs", () => {
    const marker = join(dir, "ran.txt");
    const nb = notebook("marker", `require("node:fs").writeFileSync(${JSON.stringify(marker)}, "ran")`);
    for (const bad of ["/proc/helicoid-out.ipynb", join(dir, "missing-dir", "out.ipynb"), join(dir, "marker.ipynb", "x.ipynb"), dir]) {
      const r = run([nb, "-o", bad]);
      expect(r.status).toBe(2);
      expect(r.stderr.trim().split("\n")).toHaveLength(1);
      expect(r.stderr).toMatch(/cannot write .*nothing was run/);
      expect(existsSync(marker)).toBe(false);
    }
  });

  it("an output that is the input through a symbolic or hard link is refused; the input bytes are unchanged", () => {
    const nb = notebook("linked", 'console.log("x")');
    const before = sha(nb);
    const soft = join(dir, "soft.ipynb");
    const hard = join(dir, "hard.ipynb");
    symlinkSync(nb, soft);
    linkSync(nb, hard);
    for (const o of [nb, soft, hard]) {
      const r = run([nb, "-o", o]);
      expect(r.status).toBe(2);
      expect(r.stderr).toMatch(/the output path is the input notebook \(the same file, or a link to it\)/);
    }
    expect(sha(nb)).toBe(before);
  });

  it("a deeply nested JSON notebook and a thrown object whose toString throws each get one line", () => {
    const deep = join(dir, "deep.ipynb");
    writeFileSync(deep, `{"nbformat":4,"cells":[],"metadata":${"[".repeat(200_000)}${"]".repeat(200_000)}}`);
    const r1 = run([deep]);
    expect(r1.status).toBe(2);
    expect(r1.stderr.trim()).toMatch(/^\S*deep\.ipynb: .*nested too deeply/);
    expect(r1.stderr.trim().split("\n")).toHaveLength(1);
    const nb = notebook("tostring", 'throw { toString() { throw new Error("no") }, toJSON() { throw new Error("no") } }');
    const out = join(dir, "tostring-out.ipynb");
    const r2 = run([nb, "-o", out]);
    expect(r2.status).toBe(1);
    expect(oneLine(r2.stderr)).toEqual([expect.stringMatching(/cell 1 failed: Error: a thrown object that cannot be shown/)]);
    expect(outputsOf(out)[0]![0]!.output_type).toBe("error");
  });
});
