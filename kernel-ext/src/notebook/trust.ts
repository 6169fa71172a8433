/**
 * Notebooks Helicoid executes are trusted for their user, as Jupyter trusts a notebook its user ran
 * and saved: Jupyter signs the notebook's content (HMAC-SHA256 with the user's notebook secret) and
 * keeps the signature in its signature database, and JupyterLab shows the saved widgets, figures and
 * HTML of a trusted notebook instead of text. We ask Jupyter's own notary to do it (the secret, the
 * canonical form and the database are Jupyter's, so its answer is the one that counts): the
 * `jupyter trust` command where there is one, else nbformat's NotebookNotary run by the Python of
 * the user's `jupyter` command (Debian's Jupyter has nbformat but no `jupyter-trust`). With no
 * Jupyter on this machine there is no front end to trust the notebook: nothing is signed and the
 * answer says so.
 */
import { spawnSync } from "node:child_process";
import { closeSync, openSync, readSync } from "node:fs";
import { jupyterCommand, which } from "../cli/jupyterEnv.js";

const SIGN = "import sys, nbformat\nfrom nbformat.sign import NotebookNotary\nnb = nbformat.read(sys.argv[1], as_version=4)\nNotebookNotary().sign(nb)\nprint('signed')";

/** The interpreter named on the first line of a script (`#!/usr/bin/python3`), or null. */
export function shebangInterpreter(path: string): string | null {
  try {
    const fd = openSync(path, "r");
    const buf = Buffer.alloc(256);
    const n = readSync(fd, buf, 0, 256, 0);
    closeSync(fd);
    const m = /^#!\s*(\S+)(?:\s+(\S+))?/.exec(buf.subarray(0, n).toString("utf8"));
    if (!m) return null;
    // `#!/usr/bin/env python3`
    return m[1]!.endsWith("/env") && m[2] ? which(m[2]) : m[1]!;
  } catch {
    return null;
  }
}

export interface TrustOutcome {
  signed: boolean;
  /** What happened, in words (the reason when not signed). */
  message: string;
}

export function trustNotebook(path: string): TrustOutcome {
  const jupyter = jupyterCommand();
  if (!jupyter) return { signed: false, message: "not signed: no `jupyter` command found (Jupyter signs notebooks; none is installed here)" };
  const r = spawnSync(jupyter, ["trust", path], { encoding: "utf8", timeout: 60_000 });
  if (r.error) return { signed: false, message: `not signed: ${r.error.message}` };
  if (r.status === 0) return { signed: true, message: "signed for this user (jupyter trust)" };
  // No `jupyter trust` subcommand: the notary of the Python that runs this `jupyter`.
  const python = shebangInterpreter(jupyter);
  if (!python) return { signed: false, message: `not signed: jupyter trust failed (status ${r.status}) and the Python of ${jupyter} was not found` };
  const p = spawnSync(python, ["-c", SIGN, path], { encoding: "utf8", timeout: 60_000 });
  if (!p.error && p.status === 0 && p.stdout.trim() === "signed") return { signed: true, message: `signed for this user (Jupyter's notary, ${python} nbformat.sign)` };
  return { signed: false, message: `not signed: neither \`jupyter trust\` nor ${python}'s nbformat.sign worked: ${(p.error?.message ?? p.stderr ?? "").trim().split("\n").pop()}` };
}
