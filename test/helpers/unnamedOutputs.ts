/**
 * Which outputs of the catalogue are never named in a test file.
 *
 * An output `o` of calculator `id` counts as named when one test file (test/**\/*.test.ts) both
 * names the calculator (its id in quotes, or the camel-case `<id>Spec` / `<id>Calculator` variable
 * the contract test also accepts) and names the output in code: in quotes or as a property, outside comments. This is a lower bound on
 * testing (a named output may still be checked loosely), but an output never named cannot be
 * checked by any test.
 *
 * `test/lib/calculators/outputsNamed.test.ts` fails while any output outside its allow-list is unnamed
 * and prints the list; `HELICOID_LIST_OUTPUTS=1 npx vitest run test/lib/calculators/outputsNamed.test.ts`
 * prints every unnamed output with the count.
 */
import { readFileSync, readdirSync, statSync } from "node:fs";
import { join, relative } from "node:path";
import { catalogue } from "@helicoid/lib";
import { repoRoot } from "./paths.js";

/** Every *.test.ts file under test/ (paths relative to the repository root) with its text. */
export function testFiles(root = join(repoRoot, "test")): { path: string; text: string }[] {
  const out: { path: string; text: string }[] = [];
  const walk = (dir: string): void => {
    for (const name of readdirSync(dir)) {
      const p = join(dir, name);
      if (name === "node_modules") continue;
      if (statSync(p).isDirectory()) walk(p);
      else if (name.endsWith(".test.ts")) out.push({ path: relative(repoRoot, p), text: readFileSync(p, "utf8") });
    }
  };
  walk(root);
  return out;
}

/** The text without // line comments and block comments (a name in a comment checks nothing). */
export function stripComments(text: string): string {
  return text.replace(/\/\*[\s\S]*?\*\//g, "").replace(/(^|[^:"'`\\])\/\/.*$/gm, "$1");
}

const escape = (s: string): string => s.replace(/[.*+?^${}()|[\]\\]/g, "\\$&");

/** Does `text` name the calculator `id`? */
export function namesCalculator(text: string, id: string): boolean {
  const camel = id.replace(/-(\w)/g, (_, c: string) => c.toUpperCase());
  return new RegExp(`["'\`]${escape(id)}["'\`]|\\b${escape(camel)}(Spec|Calculator)\\b`).test(text);
}

/** For each calculator id, its outputs never named in a test file that names the calculator. */
export function unnamedOutputs(files = testFiles()): Record<string, string[]> {
  const result: Record<string, string[]> = {};
  for (const spec of catalogue) {
    const texts = files.filter((f) => namesCalculator(f.text, spec.id)).map((f) => f.text);
    // named in code, not only in a comment: in quotes (num(r, "radius")) or as a property (outputs.radius)
    const missing = spec.outputs.map((o) => o.name).filter((name) => !texts.some((t) => new RegExp(`["'\`]${escape(name)}["'\`]|\\.${escape(name)}\\b`).test(stripComments(t))));
    if (missing.length > 0) result[spec.id] = missing;
  }
  return result;
}

/** The number of declared outputs in the catalogue. */
export const outputCount = (): number => catalogue.reduce((n, s) => n + s.outputs.length, 0);

/** The unnamed outputs as lines `id (n): a, b` and a closing count line. */
export function unnamedReport(missing = unnamedOutputs()): string {
  const lines = Object.entries(missing).map(([id, names]) => `${id} (${names.length}): ${names.join(", ")}`);
  const n = Object.values(missing).reduce((k, names) => k + names.length, 0);
  lines.push(`${n} of ${outputCount()} outputs never named in a test file that names their calculator`);
  return lines.join("\n");
}
