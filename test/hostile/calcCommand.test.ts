/**
 * `helicoid calc` with nonsense: each case of the hostile-input audit as a regression test. Bad or
 * meaningless input exits 2 with one line naming the parameter, the value and what was expected;
 * a request beyond the work and memory budget exits 2 with the estimate, before any allocation;
 * nothing prints a stack trace, and nothing non-finite leaves with status "ok".
 * Common practice, no source: the exit-code contract of the command (README, "The helicoid command").
 */
import { describe, expect, it } from "vitest";
import { spawnSync } from "node:child_process";
import { helicoidBin } from "../helpers/paths.js";
import { calcCommand } from "../../kernel-ext/src/cli/calc.js";

/** The built command in its own process: exit status and both streams as the user sees them. */
function calcProcess(...args: string[]) {
  const r = spawnSync(process.execPath, [helicoidBin, "calc", ...args], { encoding: "utf8", timeout: 90_000 });
  return { status: r.status, stdout: r.stdout, stderr: r.stderr };
}

/** The same command in this process (same code path, no process start per case). */
async function calc(...args: string[]) {
  let stdout = "",
    stderr = "";
  const status = await calcCommand(args, {
    stdout: (s) => {
      stdout += s;
    },
    stderr: (s) => {
      stderr += s;
    },
  });
  return { status, stdout, stderr };
}

const refused: Array<[string[], string, RegExp]> = [
  [["easy-plane", "B=1e309", "--si"], "B", /finite number/],
  [["easy-plane", "T=1e-300K"], "T", /usual range/],
  [["magnon-hall", "T=1e300K"], "T", /usual range/],
  [["magnon-hall", "J=1e300K"], "J", /usual range/],
  [["spin-tunnel", "D=-1K"], "D", /> 0 K/],
  [["texture", "a=1e309", "--si"], "a", /finite number/],
  [["wall", "A=1e300", "--si"], "A", /usual range/],
  [["wall", "t=1e-300nm"], "t", /usual range/],
  [["wall-fit", "R=-1nm"], "R", /> 0/],
  [["texture", "kind=3", "a=1pm"], "a", /budget.*Estimate: a skyrmion lattice/],
  [["berry-loop", "segments=1e9"], "segments", /GB of memory/],
  [["easy-plane", "twoS=1e9"], "twoS", /usual range/],
  [["berry-loop", "twoS=1e9"], "twoS", /usual range/],
  [["wall-fit", "points=1e9"], "points", /budget/],
  [["texture", "n=1e9"], "n", /usual range/],
  [["texture", "n=40000"], "n", /budget/],
  [["easy-plane", "--si", "--sweep", "B=0:1e309:10"], "B", /finite number/],
];

describe("helicoid calc refuses nonsense with one line (exit 2)", () => {
  for (const [args, parameter, expected] of refused) {
    it(args.join(" "), async () => {
      const r = await calc(...args);
      expect(r.status, r.stdout + r.stderr).toBe(2);
      const lines = r.stderr.trim().split("\n");
      expect(lines, r.stderr).toHaveLength(1);
      expect(lines[0]).toMatch(new RegExp(`^helicoid calc: ${parameter} = `));
      expect(lines[0]).toMatch(expected);
      expect(r.stderr).not.toMatch(/\n\s+at /); // no stack trace
      expect(r.stdout).toBe("");
    });
  }

  it("as a process: one line on stderr, no stack trace, for a refusal and for a budget refusal", () => {
    for (const args of [
      ["wall", "A=1e300", "--si"],
      ["texture", "kind=3", "a=1pm"],
    ]) {
      const r = calcProcess(...args);
      expect(r.status, r.stderr).toBe(2);
      expect(r.stderr.trim().split("\n"), r.stderr).toHaveLength(1);
      expect(r.stderr).not.toMatch(/\n\s+at /);
    }
  });

  it("a JSON request gets a JSON error, never a status ok with a null value", () => {
    const r = calcProcess("wall", "A=1e300", "--si", "--json");
    expect(r.status).toBe(2);
    const j = JSON.parse(r.stdout);
    expect(j.status).toBe("error");
    expect(r.stdout).not.toMatch(/null|NaN|Infinity/);
  });
});
