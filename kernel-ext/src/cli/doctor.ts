/**
 * `helicoid doctor [--json] [--start-kernel] [--prefix DIR]`: what Helicoid finds of the user's
 * Jupyter, and what to do about each problem:
 *   - the `jupyter` command and the versions of jupyter-server, JupyterLab, Notebook, nbconvert;
 *   - the front ends: JupyterLab 4 or Notebook 7 show Helicoid's widgets; the classic Notebook 6
 *     shows none of them;
 *   - the `helicoid` kernelspec: where it is, whether its command exists, whether it is this install;
 *     with --start-kernel, whether the kernel starts and answers kernel_info;
 *   - Helicoid's JupyterLab extension and the widget manager it needs.
 * Exit status 0 when nothing is a problem (warnings allowed), 1 otherwise.
 */
import { existsSync, readFileSync, realpathSync } from "node:fs";
import { join } from "node:path";
import { KERNEL_VERSION } from "../version.js";
import { parseStrict, UsageError, type CommandIO } from "./args.js";
import { binPath, KERNEL_NAME, LAB_EXTENSION_NAME, labExtensionSource } from "./install.js";
import { findLabExtensions, JUPYTERLAB_MAJOR, jupyterCommand, jupyterDataDirs, jupyterVersions, majorOf, WIDGET_MANAGER, widgetManagerProblem } from "./jupyterEnv.js";

export type Status = "ok" | "warning" | "problem";

export interface Check {
  /** Short name: jupyter, front end, kernelspec, kernel, extension, widget manager. */
  name: string;
  status: Status;
  /** What was found, in words. */
  found: string;
  /** What to do (empty when nothing needs doing). */
  advice: string;
}

export interface DoctorReport {
  helicoid: { version: string; command: string };
  jupyter: { command: string | null; versions: Record<string, string | null>; dataDirs: string[]; dataDirsFrom: string };
  checks: Check[];
  problems: number;
  warnings: number;
}

const INSTALL = "run `npx helicoid install` (add --user or --prefix DIR as you installed Jupyter)";

/** The version of the extension this install ships (@helicoid/widgets' labextension/), or null. */
function shippedExtensionVersion(): string | null {
  try {
    return (JSON.parse(readFileSync(join(labExtensionSource, "package.json"), "utf8")) as { version?: string }).version ?? null;
  } catch {
    return null;
  }
}

function realOr(p: string): string {
  try {
    return realpathSync(p);
  } catch {
    return p;
  }
}

interface SpecFound {
  dir: string;
  spec: { argv?: string[]; metadata?: { helicoid_version?: string } } | null;
}

function findKernelspecs(dataDirs: string[]): SpecFound[] {
  const out: SpecFound[] = [];
  for (const d of dataDirs) {
    const file = join(d, "kernels", KERNEL_NAME, "kernel.json");
    if (!existsSync(file)) continue;
    try {
      out.push({ dir: join(d, "kernels", KERNEL_NAME), spec: JSON.parse(readFileSync(file, "utf8")) });
    } catch {
      out.push({ dir: join(d, "kernels", KERNEL_NAME), spec: null });
    }
  }
  return out;
}

/** Start the kernel of a kernelspec and ask kernel_info; the answer in words, or the failure. */
async function tryKernel(argv: string[]): Promise<{ ok: boolean; text: string }> {
  const { launchKernel } = await import("../comm/client.js");
  let k: Awaited<ReturnType<typeof launchKernel>> | undefined;
  try {
    k = await launchKernel(argv);
    const reply = await k.client.request("kernel_info_request", {}, "shell", 60_000);
    const c = reply.content as { status?: string; implementation?: string; implementation_version?: string; protocol_version?: string };
    return { ok: c.status === "ok", text: `kernel_info answered: ${c.implementation} ${c.implementation_version}, protocol ${c.protocol_version}` };
  } catch (err) {
    return { ok: false, text: `the kernel did not answer kernel_info: ${(err as Error).message}${k ? `; its output: ${k.output().trim().split("\n").slice(-3).join(" ")}` : ""}` };
  } finally {
    await k?.stop();
  }
}

export async function diagnose(opts: { prefix?: string; startKernel?: boolean } = {}): Promise<DoctorReport> {
  const checks: Check[] = [];
  const jupyter = jupyterCommand();
  const versions = jupyterVersions(jupyter);
  const extra = opts.prefix ? [join(opts.prefix, "share", "jupyter")] : [];
  const data = jupyterDataDirs(extra, jupyter);

  // Jupyter itself
  const v = (k: string) => versions[k] ?? null;
  if (!jupyter) {
    checks.push({
      name: "jupyter",
      status: "warning",
      found: "no `jupyter` command on PATH",
      advice:
        "Helicoid runs and exports notebooks without Jupyter (`helicoid run`, `helicoid export`, `helicoid start`). For live notebooks install JupyterLab 4 (`pipx install jupyterlab` or `pip install jupyterlab`), then run `npx helicoid install`.",
    });
  } else {
    const list = ["jupyter_server", "jupyterlab", "notebook", "nbconvert", "jupyter_client", "ipywidgets"].map((k) => `${k} ${v(k) ?? "not installed"}`).join(", ");
    checks.push({ name: "jupyter", status: "ok", found: `${jupyter}: ${list}`, advice: "" });
  }

  // Front ends
  if (jupyter) {
    const lab = v("jupyterlab");
    const nb = v("notebook");
    const labOk = majorOf(lab) === JUPYTERLAB_MAJOR;
    const nb7 = (majorOf(nb) ?? 0) >= 7;
    if (labOk || nb7) {
      checks.push({
        name: "front end",
        status: "ok",
        found: [labOk ? `JupyterLab ${lab}` : "", nb7 ? `Notebook ${nb}` : ""].filter(Boolean).join(" and ") + " (shows Helicoid's widgets)",
        advice: "",
      });
    } else {
      const what =
        [lab ? `JupyterLab ${lab} (Helicoid's extension is built for ${JUPYTERLAB_MAJOR}.x)` : "", nb ? `classic Notebook ${nb}, which renders no Helicoid widget` : ""]
          .filter(Boolean)
          .join("; ") || "no JupyterLab and no Notebook";
      checks.push({
        name: "front end",
        status: "warning",
        found: what,
        advice:
          "Use JupyterLab 4 or Notebook 7 for live widgets (`pipx install jupyterlab`); meanwhile `helicoid run` + `helicoid export` give pages whose catalogue explorers stay live.",
      });
    }
  }

  // Kernelspec
  const specs = findKernelspecs(data.dirs);
  const first = specs[0];
  let kernelArgv: string[] | null = null;
  if (!first) {
    checks.push({ name: "kernelspec", status: "problem", found: `no '${KERNEL_NAME}' kernelspec in ${data.dirs.join(", ")}`, advice: INSTALL });
  } else if (!first.spec || !Array.isArray(first.spec.argv)) {
    checks.push({ name: "kernelspec", status: "problem", found: `${first.dir}/kernel.json is not a valid kernelspec`, advice: INSTALL });
  } else {
    const argv = first.spec.argv;
    const missing = [argv[0], argv[1]].filter((p): p is string => !!p && !existsSync(p));
    if (missing.length > 0) {
      checks.push({
        name: "kernelspec",
        status: "problem",
        found: `${first.dir}: its command points at ${missing.join(" and ")}, which does not exist (moved or uninstalled Helicoid or Node)`,
        advice: INSTALL,
      });
    } else {
      kernelArgv = argv;
      const here = realOr(argv[1]!) === realOr(binPath);
      const ver = first.spec.metadata?.helicoid_version;
      const notes = [
        here ? "this install" : `another install (${argv[1]}; this one is ${binPath})`,
        ver && ver !== KERNEL_VERSION ? `written by Helicoid ${ver}, this is ${KERNEL_VERSION}` : "",
      ]
        .filter(Boolean)
        .join("; ");
      const shadowed =
        specs.length > 1
          ? `; also in ${specs
              .slice(1)
              .map((s) => s.dir)
              .join(", ")} (not used: Jupyter takes the first)`
          : "";
      checks.push({
        name: "kernelspec",
        status: here && (!ver || ver === KERNEL_VERSION) ? "ok" : "warning",
        found: `${first.dir} runs ${argv[0]} ${argv[1]} (${notes})${shadowed}`,
        advice: here ? "" : `to use this install, ${INSTALL}`,
      });
    }
  }
  if (opts.startKernel && kernelArgv) {
    const r = await tryKernel(kernelArgv);
    checks.push({
      name: "kernel",
      status: r.ok ? "ok" : "problem",
      found: r.text,
      advice: r.ok ? "" : "run `helicoid kernel --connection-file FILE` by hand to see its error, or reinstall",
    });
  }

  // Our extension and the widget manager
  const ours = findLabExtensions(LAB_EXTENSION_NAME, data.dirs);
  if (ours.length === 0) {
    checks.push({
      name: "extension",
      status: "problem",
      found: `Helicoid's JupyterLab extension (${LAB_EXTENSION_NAME}) is in none of ${data.dirs.map((d) => join(d, "labextensions")).join(", ")}`,
      advice: INSTALL,
    });
  } else if (!ours[0]!.loadable) {
    checks.push({ name: "extension", status: "problem", found: `${ours[0]!.dir} has no built remoteEntry`, advice: INSTALL });
  } else {
    const shipped = shippedExtensionVersion();
    const stale = shipped !== null && ours[0]!.version !== shipped;
    checks.push({
      name: "extension",
      status: stale ? "warning" : "ok",
      found: `${LAB_EXTENSION_NAME} ${ours[0]!.version} in ${ours[0]!.dir}${stale ? ` (this install ships ${shipped})` : ""}`,
      advice: stale ? INSTALL : "",
    });
  }
  const managers = findLabExtensions(WIDGET_MANAGER, data.dirs);
  const used = managers[0];
  if (!used) {
    checks.push({
      name: "widget manager",
      status: "problem",
      found: `no widget manager (${WIDGET_MANAGER}, from jupyterlab_widgets) in any labextensions folder: JupyterLab cannot load Helicoid's extension ("Shared module @jupyter-widgets/base doesn't exist in shared scope") and shows every widget as text`,
      advice: "run `npx helicoid install` (it installs the prebuilt one Helicoid ships), or `pip install jupyterlab_widgets` in your JupyterLab's Python",
    });
  } else {
    const problem = widgetManagerProblem(used);
    const byUs = existsSync(join(used.dir, "installed-by-helicoid.json"));
    checks.push({
      name: "widget manager",
      status: problem ? "problem" : "ok",
      found: problem
        ? `the widget manager Jupyter uses is not compatible: ${problem}`
        : `${WIDGET_MANAGER} ${used.version} in ${used.dir}${byUs ? " (installed by helicoid install)" : ""}`,
      advice: problem ? "`pip install -U jupyterlab_widgets` (ipywidgets 8), or remove it and run `npx helicoid install`" : "",
    });
  }

  return {
    helicoid: { version: KERNEL_VERSION, command: binPath },
    jupyter: { command: jupyter, versions, dataDirs: data.dirs, dataDirsFrom: data.from },
    checks,
    problems: checks.filter((c) => c.status === "problem").length,
    warnings: checks.filter((c) => c.status === "warning").length,
  };
}

export function formatReport(r: DoctorReport): string {
  const mark: Record<Status, string> = { ok: "ok     ", warning: "warning", problem: "PROBLEM" };
  const lines = [`helicoid ${r.helicoid.version} (${r.helicoid.command})`, `Jupyter data folders (${r.jupyter.dataDirsFrom}): ${r.jupyter.dataDirs.join(", ")}`, ""];
  for (const c of r.checks) {
    lines.push(`${mark[c.status]}  ${c.name}: ${c.found}`);
    if (c.advice) lines.push(`         what to do: ${c.advice}`);
  }
  lines.push(
    "",
    r.problems === 0
      ? `no problems${r.warnings ? ` (${r.warnings} warning${r.warnings > 1 ? "s" : ""})` : ""}`
      : `${r.problems} problem${r.problems > 1 ? "s" : ""}, ${r.warnings} warning${r.warnings === 1 ? "" : "s"}`,
  );
  return lines.join("\n") + "\n";
}

export const doctorUsage = "helicoid doctor [--json] [--start-kernel] [--prefix DIR]";

export async function doctorCommand(args: string[], io: CommandIO): Promise<number> {
  let a: ReturnType<typeof parseStrict>;
  try {
    a = parseStrict(args, { flags: ["--json", "--start-kernel"], valued: { "--prefix": "a Jupyter prefix directory" } });
    if (a.positional.length > 0) throw new UsageError(`unexpected argument ${a.positional[0]}`);
  } catch (err) {
    if (!(err instanceof UsageError)) throw err;
    io.stderr(`helicoid doctor: ${err.message}\nusage: ${doctorUsage}\n`);
    return 2;
  }
  const r = await diagnose({ prefix: a.options.get("--prefix"), startKernel: a.flags.has("--start-kernel") });
  io.stdout(a.flags.has("--json") ? JSON.stringify(r, null, 2) + "\n" : formatReport(r));
  return r.problems === 0 ? 0 : 1;
}
