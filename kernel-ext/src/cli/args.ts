import { realStderr, realStdout } from "../display/output.js";

/** A small argument reader for the `helicoid` command: flags, options with values, positionals. */
export interface ParsedArgs {
  positional: string[];
  flags: Set<string>;
  options: Map<string, string>;
}

export class UsageError extends Error {
  override readonly name = "UsageError";
}

/** `valued` lists options that take a value (`-o OUT`, `--prefix DIR`, `--port=8000`). */
export function parseArgs(args: string[], valued: string[] = []): ParsedArgs {
  const out: ParsedArgs = { positional: [], flags: new Set(), options: new Map() };
  for (let i = 0; i < args.length; i++) {
    const a = args[i]!;
    if (a === "--") {
      out.positional.push(...args.slice(i + 1));
      break;
    }
    if (a.startsWith("-") && a.length > 1 && !/^-\d/.test(a)) {
      const eq = a.indexOf("=");
      const name = eq > 0 ? a.slice(0, eq) : a;
      if (valued.includes(name)) {
        const value = eq > 0 ? a.slice(eq + 1) : args[++i];
        if (value === undefined) throw new UsageError(`${name} needs a value`);
        out.options.set(name, value);
      } else out.flags.add(name);
    } else out.positional.push(a);
  }
  return out;
}

export interface CommandIO {
  stdout: (s: string) => void;
  stderr: (s: string) => void;
}

/** The process's own streams (not the notebook's: cell output capture replaces process.stdout.write). */
export const processIO: CommandIO = {
  stdout: (s) => realStdout(s),
  stderr: (s) => realStderr(s),
};
