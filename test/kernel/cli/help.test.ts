/** Every `helicoid` command answers --help with its usage and does nothing else; a closed pipe ends output quietly. */
import { describe, expect, it } from "vitest";
import { spawn, spawnSync } from "node:child_process";
import { existsSync, mkdtempSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { helicoidBin } from "../../helpers/paths.js";
import { commandNames } from "../../../kernel-ext/src/cli/main.js";

const helicoid = (args: string[], env: NodeJS.ProcessEnv = {}) =>
  spawnSync(process.execPath, [helicoidBin, ...args], { encoding: "utf8", timeout: 20_000, env: { ...process.env, ...env } });

describe("helicoid --help", () => {
  it("prints each command's usage, exits 0, and does not act (no install, no server, no run)", () => {
    // Common practice, no source: the conventions of command-line tools (--help, -h).
    const prefix = mkdtempSync(join(tmpdir(), "helicoid-help-"));
    const home = mkdtempSync(join(tmpdir(), "helicoid-help-home-"));
    const env = { HOME: home, JUPYTER_DATA_DIR: join(home, "jupyter-data") };
    // the commands come from the command table itself, so a command added there is checked here
    const names = commandNames();
    expect(names.length).toBeGreaterThanOrEqual(10);
    const overview = helicoid(["--help"], env);
    expect(overview.status).toBe(0);
    for (const cmd of names) expect(overview.stdout, `the overview lists ${cmd}`).toMatch(new RegExp(`^  ${cmd}\\b`, "m"));
    for (const cmd of names) {
      for (const flag of ["--help", "-h"]) {
        const args = cmd === "install" || cmd === "uninstall" ? [cmd, "--prefix", prefix, flag] : [cmd, flag];
        const r = helicoid(args, env);
        expect(r.status, `${cmd} ${flag}: ${r.stderr}`).toBe(0);
        expect(r.stdout, `${cmd} ${flag}`).toMatch(new RegExp(`usage: helicoid ${cmd}\\b`));
        expect(r.stdout.split("\n").length, `${cmd} ${flag}: a usage text, not a run`).toBeLessThanOrEqual(40); // a help text, however full, is no run
        expect(r.stdout).not.toMatch(/^(installed|removed|running) |serving|http:\/\//m);
      }
    }
    expect(existsSync(join(prefix, "share", "jupyter", "kernels", "helicoid"))).toBe(false);
    expect(existsSync(join(home, "jupyter-data", "kernels", "helicoid"))).toBe(false);
  });

  it("stops quietly when the reader closes the pipe early (helicoid calc --list | head -1)", async () => {
    // Common practice, no source: a writer to a closed pipe exits without a trace (EPIPE).
    const child = spawn(process.execPath, [helicoidBin, "calc", "--list"], { stdio: ["ignore", "pipe", "pipe"] });
    let err = "";
    child.stderr.on("data", (d) => (err += d));
    const first = await new Promise<string>((resolve) => child.stdout.once("data", (d) => resolve(String(d))));
    child.stdout.destroy(); // the reader goes away after the first chunk
    const code = await new Promise<number | null>((resolve) => child.on("close", (c) => resolve(c)));
    expect(first).toMatch(/wall/);
    expect(err).not.toMatch(/EPIPE|Unhandled/);
    expect(code).toBe(0);
  });
});
