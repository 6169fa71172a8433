/**
 * `helicoid lab [--dry-run] [--notebook-dir DIR] [--port N]`: open notebooks with the kernel
 * installed for this user, in the best front end this machine has for live widgets:
 *   1. JupyterLab 4 (`jupyter lab`), 2. Notebook 7 (`jupyter notebook`), else
 *   3. Helicoid's own front end built from JupyterLab 4's npm packages (lab-frontend/), served by
 *      the user's `jupyter-server` (its npm packages are installed the first time, and it says so).
 * It prints which one it uses and why. `--dry-run` only reports the choice.
 */
import { spawn, spawnSync } from "node:child_process";
import { randomBytes } from "node:crypto";
import { createServer } from "node:net";
import { rmSync } from "node:fs";
import { join, resolve } from "node:path";
import { install } from "./install.js";
import { parseStrict, UsageError, type CommandIO } from "./args.js";
import { ensureLabFrontend, labFrontendState, prepareLabSite } from "./labFrontend.js";
import { checkoutRoot } from "./places.js";

export interface Tool {
  cmd: string;
  args: string[];
  version: string;
}
export interface LabChoice {
  kind: "lab" | "notebook" | "frontend" | "none";
  tool: Tool | null;
  reason: string;
}

/** `cmd args --version`: the version it prints, or null when it does not run. */
function versionOf(cmd: string, args: string[]): string | null {
  const r = spawnSync(cmd, [...args, "--version"], { encoding: "utf8", stdio: ["ignore", "pipe", "pipe"], timeout: 30_000 });
  if (r.error || r.status !== 0) return null;
  const m = /(\d+)\.(\d+)(?:\.\d+)?\S*/.exec(r.stdout.trim().split("\n").pop() ?? "");
  return m ? m[0] : null;
}

function find(candidates: Array<[string, string[]]>): Tool | null {
  for (const [cmd, args] of candidates) {
    const v = versionOf(cmd, args);
    if (v) return { cmd, args, version: v };
  }
  return null;
}

/** Any Jupyter that can open notebooks with this kernel (used by `helicoid start` to suggest `helicoid lab`). */
export function findJupyter(): { cmd: string; args: string[]; kind: "lab" | "notebook" | "server" } | null {
  const lab = find([
    ["jupyter-lab", []],
    ["jupyter", ["lab"]],
  ]);
  if (lab) return { cmd: lab.cmd, args: lab.args, kind: "lab" };
  const nb = find([
    ["jupyter-notebook", []],
    ["jupyter", ["notebook"]],
  ]);
  if (nb) return { cmd: nb.cmd, args: nb.args, kind: "notebook" };
  const server = find([
    ["jupyter-server", []],
    ["jupyter", ["server"]],
  ]);
  return server ? { cmd: server.cmd, args: server.args, kind: "server" } : null;
}

const major = (v: string) => Number(v.split(".")[0]);

/** Decide which front end to use on this machine, with the reason in a sentence. */
export function chooseFrontEnd(): LabChoice {
  const lab = find([
    ["jupyter-lab", []],
    ["jupyter", ["lab"]],
  ]);
  if (lab && major(lab.version) >= 4)
    return { kind: "lab", tool: lab, reason: `JupyterLab ${lab.version} found: it renders live widgets with the widget manager (jupyterlab_widgets)` };
  const nb = find([
    ["jupyter-notebook", []],
    ["jupyter", ["notebook"]],
  ]);
  if (nb && major(nb.version) >= 7)
    return {
      kind: "notebook",
      tool: nb,
      reason: `Notebook ${nb.version} found${lab ? ` (JupyterLab ${lab.version} is older than 4)` : ""}: it renders live widgets with the widget manager (jupyterlab_widgets)`,
    };
  const server = find([
    ["jupyter-server", []],
    ["jupyter", ["server"]],
  ]);
  const older = [
    lab ? `JupyterLab ${lab.version} is older than 4 and cannot load Helicoid's extension` : "",
    nb ? `Classic Notebook ${nb.version} found: it renders no widgets` : "",
  ]
    .filter(Boolean)
    .join("; ");
  if (server) {
    return {
      kind: "frontend",
      tool: server,
      reason: `${older || "no JupyterLab 4 or Notebook 7 found"}; serving Helicoid's JupyterLab-based front end instead, on jupyter-server ${server.version}`,
    };
  }
  return {
    kind: "none",
    tool: null,
    reason: older
      ? `${older}; no jupyter-server to serve Helicoid's own front end either`
      : "no Jupyter found (looked for jupyter-lab, jupyter-notebook, jupyter-server and the jupyter command)",
  };
}

function freePort(): Promise<number> {
  return new Promise((res, rej) => {
    const srv = createServer();
    srv.on("error", rej);
    srv.listen(0, "127.0.0.1", () => {
      const port = (srv.address() as { port: number }).port;
      srv.close(() => res(port));
    });
  });
}

export async function labCommand(args: string[], io: CommandIO): Promise<number> {
  let a: ReturnType<typeof parseStrict>;
  try {
    a = parseStrict(args, { flags: ["--dry-run"], valued: { "--notebook-dir": "a directory of notebooks", "--port": "a port number" } });
  } catch (err) {
    if (!(err instanceof UsageError)) throw err;
    io.stderr(`helicoid lab: ${err.message} (give Jupyter's own options after --)\nusage: helicoid lab [--dry-run] [--notebook-dir DIR] [--port N] [-- JUPYTER OPTIONS]\n`);
    return 2;
  }
  const choice = chooseFrontEnd();
  // A checkout opens its example notebooks; an installed package opens the folder you are in.
  const root = checkoutRoot();
  const dir = resolve(a.options.get("--notebook-dir") ?? (root ? join(root, "notebooks") : process.cwd()));
  if (a.flags.has("--dry-run")) {
    io.stdout(
      `helicoid lab would use: ${choice.kind === "none" ? "nothing" : choice.kind === "frontend" ? "Helicoid's JupyterLab-based front end" : choice.kind === "lab" ? "JupyterLab" : "Notebook"}\n${choice.reason}\n`,
    );
    if (choice.kind === "frontend") {
      const s = labFrontendState();
      io.stdout(
        `front end (lab-frontend/): npm packages ${s.installed ? "installed" : "not installed yet (would run npm ci --prefix lab-frontend, about 360 MB)"}, bundle ${s.built ? "built" : "to build"}\n`,
      );
    }
    io.stdout(`notebooks: ${dir}\n`);
    return choice.kind === "none" ? 1 : 0;
  }
  if (choice.kind === "none" || !choice.tool) {
    io.stderr(
      `helicoid lab: ${choice.reason}.\n` +
        "Install JupyterLab 4 (for example `pipx install jupyterlab`, then `helicoid install`) or at least a Jupyter server\n" +
        "(`sudo apt-get install jupyter-server` on Debian/Ubuntu), then run `helicoid lab` again.\n" +
        "Without Jupyter, `npm start` serves the example notebooks as live pages.\n",
    );
    return 1;
  }
  io.stdout(`helicoid lab: ${choice.reason}.\n`);
  const r = install({ user: true });
  io.stdout(`kernelspec installed in ${r.kernelDir}${r.labExtensionDir ? `; extension in ${r.labExtensionDir}` : ""}\n`);
  if (r.widgetManager) io.stdout(`${r.widgetManager.message}\n`);
  const portOpt = a.options.get("--port");
  if (portOpt !== undefined && !/^\d+$/.test(portOpt)) throw new UsageError(`--port expects a port number, got '${portOpt}'`);

  if (choice.kind !== "frontend") {
    const child = spawn(
      choice.tool.cmd,
      [...choice.tool.args, `--notebook-dir=${dir}`, "--ServerApp.ip=127.0.0.1", ...(portOpt ? [`--ServerApp.port=${portOpt}`] : []), ...a.positional],
      { stdio: "inherit" },
    );
    return new Promise((res) => child.on("exit", (code) => res(code ?? 0)));
  }

  try {
    ensureLabFrontend((s) => io.stdout(s));
  } catch (err) {
    io.stderr(
      `helicoid lab: cannot prepare Helicoid's front end: ${(err as Error).message}\n` +
        "It ships with the Helicoid repository (lab-frontend/) and inside @helicoid/kernel. Alternatively install JupyterLab 4 with the widget manager\n" +
        "(for example `pipx install jupyterlab` and `pipx inject jupyterlab jupyterlab_widgets`) and run `helicoid lab` again.\n",
    );
    return 1;
  }
  if (!r.labExtensionDir) io.stderr("helicoid lab: Helicoid's JupyterLab extension is not built (run npm run build): widgets will show as text\n");
  const site = prepareLabSite({ labextensionsDir: join(r.dataDir, "labextensions") });
  const port = portOpt ? Number(portOpt) : await freePort();
  const token = randomBytes(24).toString("hex");
  const server = spawn(
    choice.tool.cmd,
    [
      ...choice.tool.args,
      "--ServerApp.ip=127.0.0.1",
      `--ServerApp.port=${port}`,
      "--ServerApp.port_retries=0",
      `--ServerApp.token=${token}`,
      "--ServerApp.open_browser=False",
      `--ServerApp.root_dir=${dir}`,
      ...site.staticPaths.map((d) => `--ServerApp.extra_static_paths=${d}`),
      ...(process.getuid?.() === 0 ? ["--allow-root"] : []),
      ...a.positional,
    ],
    { stdio: "inherit" },
  );
  const url = `http://127.0.0.1:${port}${site.pagePath}?token=${token}`;
  io.stdout(`\nOpen the notebooks at:\n  ${url}\n(Ctrl+C stops the server)\n\n`);
  const stop = () => server.kill("SIGTERM");
  process.once("SIGINT", stop);
  process.once("SIGTERM", stop);
  return new Promise((res) =>
    server.on("exit", (code) => {
      process.off("SIGINT", stop);
      process.off("SIGTERM", stop);
      rmSync(site.siteDir, { recursive: true, force: true });
      res(code ?? 0);
    }),
  );
}
