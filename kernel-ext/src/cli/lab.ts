/**
 * `helicoid lab`: open the user's Jupyter (JupyterLab, else Notebook) on notebooks/ with the kernel
 * installed for this user. Says how to get Jupyter when none is found.
 */
import { spawn, spawnSync } from "node:child_process";
import { join, resolve } from "node:path";
import { install } from "./install.js";
import { parseStrict, UsageError, type CommandIO } from "./args.js";

export function findJupyter(): { cmd: string; args: string[]; kind: "lab" | "notebook" } | null {
  const has = (c: string, a: string[] = ["--version"]) => {
    const r = spawnSync(c, a, { stdio: "ignore" });
    return !r.error && r.status === 0;
  };
  if (has("jupyter-lab")) return { cmd: "jupyter-lab", args: [], kind: "lab" };
  if (has("jupyter", ["lab", "--version"])) return { cmd: "jupyter", args: ["lab"], kind: "lab" };
  if (has("jupyter-notebook")) return { cmd: "jupyter-notebook", args: [], kind: "notebook" };
  if (has("jupyter", ["notebook", "--version"])) return { cmd: "jupyter", args: ["notebook"], kind: "notebook" };
  return null;
}

export async function labCommand(args: string[], io: CommandIO): Promise<number> {
  let a: ReturnType<typeof parseStrict>;
  try {
    a = parseStrict(args, { flags: [], valued: { "--notebook-dir": "a directory of notebooks" } });
  } catch (err) {
    if (!(err instanceof UsageError)) throw err;
    io.stderr(`helicoid lab: ${err.message} (give Jupyter's own options after --)\nusage: helicoid lab [--notebook-dir DIR] [-- JUPYTER OPTIONS]\n`);
    return 2;
  }
  const jupyter = findJupyter();
  if (!jupyter) {
    io.stderr(
      "helicoid lab: no Jupyter found (looked for jupyter-lab, jupyter lab, jupyter-notebook).\n" +
        "Install one, for example `sudo apt-get install jupyter-notebook` (Debian/Ubuntu) or `pipx install jupyterlab`,\n" +
        "then run `helicoid lab` again. Without Jupyter, `npm start` serves the example notebooks as live pages.\n",
    );
    return 1;
  }
  const r = install({ user: true });
  io.stdout(`kernelspec installed in ${r.kernelDir}${r.labExtensionDir ? `; extension in ${r.labExtensionDir}` : ""}\n`);
  const dir = resolve(a.options.get("--notebook-dir") ?? join(__dirname, "..", "..", "..", "notebooks"));
  const child = spawn(jupyter.cmd, [...jupyter.args, `--notebook-dir=${dir}`, "--ServerApp.ip=127.0.0.1", ...a.positional], { stdio: "inherit" });
  return new Promise((res) => child.on("exit", (code) => res(code ?? 0)));
}
