import { accessSync, closeSync, constants as fsConstants, openSync, statSync, unlinkSync } from "node:fs";
import { dirname, resolve } from "node:path";
import { realStderr, realStdout } from "../display/output.js";

/** What `parseStrict` (the one option reader of every `helicoid` command) returns. */
export interface ParsedArgs {
  positional: string[];
  flags: Set<string>;
  options: Map<string, string>;
  /** Every value of each repeatable option, in order (`--start a=1 --start b=2`). */
  lists: Map<string, string[]>;
}

export class UsageError extends Error {
  override readonly name = "UsageError";
}

export interface CommandIO {
  stdout: (s: string) => void;
  stderr: (s: string) => void;
  /** True when stderr is a terminal (progress lines are then drawn in place). */
  stderrIsTTY?: boolean;
}

/** The process's own streams (not the notebook's: cell output capture replaces process.stdout.write). */
export const processIO: CommandIO = {
  stdout: (s) => realStdout(s),
  stderr: (s) => realStderr(s),
  stderrIsTTY: process.stderr.isTTY === true,
};

/**
 * A strict reader for commands with a fixed set of options: an unknown option, a repeated option
 * or an option without its value is a `UsageError` naming it (never ignored, never last-wins).
 * `valued` maps each option that takes a value to a hint of that value ("a length such as 2nm").
 * Arguments like `-1.5` are positionals (negative numbers), and everything after `--` is too.
 */
export interface StrictSpec {
  flags: string[];
  valued: Record<string, string>;
  /** Valued options that may be given more than once (their values are in `lists`). */
  repeatable?: string[];
  /** Groups of names of one option (`["-m", "--model"]`): giving two of a group counts as repeating it. */
  aliases?: string[][];
}

export function parseStrict(args: string[], spec: StrictSpec): ParsedArgs {
  const out: ParsedArgs = { positional: [], flags: new Set(), options: new Map(), lists: new Map() };
  const canonical = (n: string) => spec.aliases?.find((g) => g.includes(n))?.[0] ?? n;
  const seen = new Map<string, string>();
  const valid = () => [...spec.flags, ...Object.keys(spec.valued)].join(", ");
  for (let i = 0; i < args.length; i++) {
    const a = args[i]!;
    if (a === "--") {
      out.positional.push(...args.slice(i + 1));
      break;
    }
    if (!a.startsWith("-") || a.length === 1 || /^-\d/.test(a)) {
      out.positional.push(a);
      continue;
    }
    const eq = a.indexOf("=");
    const name = eq > 0 ? a.slice(0, eq) : a;
    const hint = spec.valued[name];
    if (hint !== undefined) {
      const value = eq > 0 ? a.slice(eq + 1) : args[i + 1];
      // The next word is not this option's value when it is another option of ours.
      const isOption = (s: string) => spec.flags.includes(s) || spec.valued[s.split("=")[0]!] !== undefined;
      if (value === undefined || value === "" || (eq < 0 && isOption(value))) throw new UsageError(`${name} needs a value (${hint})`);
      if (eq < 0) i++;
      if (spec.repeatable?.includes(name)) {
        out.lists.set(name, [...(out.lists.get(name) ?? []), value]);
        continue;
      }
      const key = canonical(name);
      if (seen.has(key)) throw new UsageError(`${name} given twice (${shortText(seen.get(key)!)}, ${shortText(value)}): give it once`);
      seen.set(key, value);
      out.options.set(name, value);
    } else if (spec.flags.includes(name)) {
      if (eq > 0) throw new UsageError(`${name} takes no value (given ${a})`);
      if (out.flags.has(name) || seen.has(canonical(name))) throw new UsageError(`${name} given twice: give it once`);
      seen.set(canonical(name), name);
      out.flags.add(name);
    } else {
      throw new UsageError(`unknown option ${shortText(a)}; the options are ${valid()}`);
    }
  }
  return out;
}

/** Why a file-system call on a user's path failed, in words: "no such file or directory". */
export function fileReason(err: unknown): string {
  const code = (err as NodeJS.ErrnoException)?.code;
  const why: Record<string, string> = {
    ENOENT: "no such file or directory",
    EISDIR: "it is a directory, not a file",
    ENOTDIR: "a part of the path is not a directory",
    EACCES: "permission denied",
    EPERM: "operation not permitted",
    EROFS: "read-only file system",
    ENOSPC: "no space left on the device",
    ENAMETOOLONG: "the name is too long",
  };
  return (code && why[code]) ?? (err as Error)?.message ?? String(err);
}

/** One line for a failed file-system call on a user's path: "PATH: no such file or directory". */
export function fileProblem(path: string, err: unknown): string {
  return `${path}: ${fileReason(err)}`;
}

/** Is this an error of a file-system call (it has an errno code such as ENOENT)? */
export function isFileSystemError(err: unknown): err is NodeJS.ErrnoException {
  return err instanceof Error && typeof (err as NodeJS.ErrnoException).code === "string" && typeof (err as NodeJS.ErrnoException).syscall === "string";
}

/** Why `path` cannot be read as an input file ("it is a directory, not a file"), or null when it can. */
export function inputFileReason(path: string): string | null {
  try {
    if (statSync(path).isDirectory()) return "it is a directory, not a file";
    accessSync(path, fsConstants.R_OK);
    return null;
  } catch (err) {
    return fileReason(err);
  }
}

/**
 * Why `path` cannot be written as an output file, or null when it can: checked before any work is
 * done, so a long run does not end in a failed write. Nothing is created.
 */
export function outputFileProblem(path: string): string | null {
  const full = resolve(path);
  // The test is a real open for writing (access() says yes to root for any file): an existing file
  // is opened without truncating it, a new one is created and removed again.
  try {
    if (statSync(full).isDirectory()) return `${path}: it is a directory, not a file name`;
    closeSync(openSync(full, "r+"));
    return null;
  } catch (err) {
    if ((err as NodeJS.ErrnoException).code !== "ENOENT") return fileProblem(path, err);
  }
  const dir = dirname(full);
  try {
    if (!statSync(dir).isDirectory()) return `${path}: ${dir} is not a directory`;
    closeSync(openSync(full, "wx"));
    unlinkSync(full);
    return null;
  } catch (err) {
    const code = (err as NodeJS.ErrnoException).code;
    if (code === "ENOENT" || code === "ENOTDIR") return `${path}: the directory ${dir} does not exist`;
    if (code === "EACCES" || code === "EPERM" || code === "EROFS") return `${path}: the directory ${dir} is not writable`;
    return fileProblem(path, err);
  }
}

/** Over `max` characters: the first 80 and last 20 with the length (as @helicoid/lib's shortText; no import, to start fast). */
function shortText(text: string, max = 200): string {
  return text.length <= max ? text : `${text.slice(0, 80)}…${text.slice(-20)} (${text.length} characters)`;
}

/** A long value for one line of a message: over 200 characters, its first 80 and last 20 with the length. */
export function shorten(text: unknown, max = 200): string {
  return shortText(String(text).replace(/\s*\n\s*/g, " "), max);
}

/** Is the output path `out` the input file `input` itself (same device and inode: links count)? */
export function isSameFile(out: string, input: string): boolean {
  try {
    const a = statSync(out);
    const b = statSync(input);
    return a.dev === b.dev && a.ino === b.ino;
  } catch {
    return false;
  }
}

/** The JSON error object of a command's `--json` mode: {id, status: "error", error: {type, message, ...}}. */
export function errorJson(id: string | undefined, err: Error, extra: Record<string, unknown> = {}): string {
  const e = err as Error & { parameter?: string; value?: unknown; expected?: string; diagnostics?: Record<string, unknown> };
  const error: Record<string, unknown> = { type: err.name, message: err.message };
  if (e.parameter !== undefined) Object.assign(error, { parameter: e.parameter, value: e.value, expected: e.expected });
  if (e.diagnostics !== undefined) error.diagnostics = e.diagnostics;
  return JSON.stringify({ id: id ?? null, ...extra, status: "error", error }) + "\n";
}
