/**
 * The `helicoid` command.
 *
 *   helicoid install [--user|--prefix DIR]   kernelspec "helicoid" + JupyterLab extension
 *   helicoid uninstall [--prefix DIR]
 *   helicoid doctor [--json] [--start-kernel] what Helicoid finds of your Jupyter, and what to do
 *   helicoid kernel --connection-file FILE   (started by Jupyter)
 *   helicoid run NOTEBOOK [-o OUT] [--timeout S]  execute a notebook (child process, per-cell limit)
 *   helicoid export NOTEBOOK -o PAGE.html    one self-contained page, live catalogue explorers
 *   helicoid lab [--dry-run]                 JupyterLab 4, Notebook 7 or our front end on jupyter-server
 *   helicoid start                           run the examples and serve the gallery (npm start)
 *   helicoid calc ID name=value ... [--json] any catalogue calculator
 *   helicoid charge FILE [--json]            topological charge of a vector field file
 *   helicoid fit FILE --model ID [--json]    fit a measured line profile
 *   helicoid fit --series FILE@FIELD ... --film ...   A, D (Ku) from profiles at several fields
 */
import { KERNEL_VERSION } from "../version.js";
import { describeError } from "../display/output.js";
import { processIO, shorten, UsageError, type CommandIO } from "./args.js";

type Command = (args: string[], io: CommandIO) => Promise<number>;

/** Commands load on demand, so `helicoid calc` does not pay for the kernel's start-up. */
const commands: Record<string, { load: () => Command; help: string; ownHelp?: boolean }> = {
  install: {
    load: () => require("./install.js").installCommand,
    help: "install [--user|--prefix DIR]     write the kernelspec and the JupyterLab extension (and a widget manager if none)",
  },
  uninstall: { load: () => require("./install.js").uninstallCommand, help: "uninstall [--prefix DIR]          remove them" },
  doctor: { load: () => require("./doctor.js").doctorCommand, help: "doctor [--json] [--start-kernel]  check Jupyter, the kernelspec, the extension and the widget manager" },
  kernel: { load: () => require("./kernel.js").kernelCommand, help: "kernel --connection-file FILE     run the kernel (Jupyter starts this)" },
  run: { load: () => require("./run.js").runCommand, help: "run NOTEBOOK [-o OUT] [--timeout S] execute a notebook, no Jupyter needed" },
  export: {
    load: () => require("../notebook/export.js").exportCommand,
    help: "export NOTEBOOK -o PAGE.html [--trusted]  a self-contained page; catalogue explorers stay live",
    ownHelp: true,
  },
  lab: {
    load: () => require("./lab.js").labCommand,
    help: "lab [--dry-run] [--notebook-dir DIR] [--port N]\n                                    open notebooks in JupyterLab 4, Notebook 7, or our JupyterLab-based\n                                    front end on jupyter-server; --dry-run says which and why",
  },
  start: {
    load: () => require("./start.js").startCommand,
    help: "start [--port N] [--no-serve] [--fresh] [--timeout S]  serve the gallery on 127.0.0.1 and run the examples into it (unchanged ones are kept)",
  },
  calc: { load: () => require("./calc.js").calcCommand, help: "calc ID name=value ... [--json]   run a catalogue calculator (--list shows them)", ownHelp: true },
  charge: { load: () => require("./charge.js").chargeCommand, help: "charge FILE [--json]              skyrmion number and objects of a vector field", ownHelp: true },
  fit: {
    load: () => require("./fit.js").fitCommand,
    help: "fit FILE --model ID [--json]      fit a line profile (--list shows the models)\n  fit --series FILE@FIELD ... --film Ms=..,t=..,A=..,D=..,Ku=.. [--json]\n                                    A, D (Ku) from skyrmion profiles at several fields",
    ownHelp: true,
  },
};

/** The command names, in the order of the overview (for tests and completion). */
export function commandNames(): string[] {
  return Object.keys(commands);
}

export function usage(): string {
  return `helicoid ${KERNEL_VERSION}: TypeScript notebooks, widgets and calculators for magnetic textures\n\nusage: helicoid COMMAND ...\n\n${Object.values(commands)
    .map((c) => `  ${c.help}`)
    .join("\n")}\n`;
}

export async function main(argv: string[], io: CommandIO = processIO): Promise<number> {
  const [name, ...rest] = argv;
  if (!name || name === "help" || name === "--help" || name === "-h") {
    io.stdout(usage());
    return name ? 0 : 2;
  }
  if (name === "--version" || name === "-V") {
    io.stdout(`${KERNEL_VERSION}\n`);
    return 0;
  }
  const cmd = commands[name];
  if (!cmd) {
    io.stderr(`helicoid: unknown command '${name}'\n\n${usage()}`);
    return 2;
  }
  // --help never runs a command (install, lab, start... would act): commands without their own
  // usage text get their line of the overview.
  if (!cmd.ownHelp && rest.some((a) => a === "--help" || a === "-h")) {
    io.stdout(`usage: helicoid ${cmd.help}\n`);
    return 0;
  }
  try {
    return await cmd.load()(rest, io);
  } catch (err) {
    if (err instanceof UsageError) {
      io.stderr(`helicoid ${name}: ${err.message}\n`);
      return 2;
    }
    // One line, never a stack trace (HELICOID_DEBUG=1 shows it).
    const { ename, evalue, traceback } = describeError(err);
    io.stderr(`helicoid ${name}: ${ename}: ${shorten(evalue)}\n`);
    if (process.env.HELICOID_DEBUG) io.stderr(traceback.join("\n") + "\n");
    return 1;
  }
}
