/**
 * tslab's TypeScript-to-JavaScript cell converter, loaded with one fix applied to its source.
 *
 * TypeScript keeps identifiers that begin with two underscores in an escaped form inside symbol
 * tables (`__k` is stored as `___k`). tslab 1.0.22 collects a cell's declarations from those tables
 * and writes the escaped names back into source (`export { ___k }`, `let ___k: any;`), so
 * `const __k = 1; __k + 1` fails with "Cannot find name '___k'". Here the names are unescaped with
 * `ts.unescapeLeadingUnderscores` where tslab turns them into text. A second edit turns on
 * `noErrorTruncation`, so a type error shows the whole type (the outputs of a calculator result,
 * the ids of the catalogue) instead of "... 25 more ...". The converter module is compiled
 * from tslab's own file (same folder, same dependencies); each edit must match exactly once, so a
 * different tslab release fails loudly here instead of silently running unpatched.
 */
import Module from "node:module";
import { readFileSync } from "node:fs";
import { dirname } from "node:path";
import type * as converterModule from "tslab/dist/converter";

const edits: Array<[string, string]> = [
  // The names of a cell's locals, exported so the next cell sees them.
  ["keys.add(key);", "keys.add(ts.unescapeLeadingUnderscores(key));"],
  // Declarations of values whose type was redeclared.
  ["anyVarsDecls.push(`let ${name}: any;\\n`);", "anyVarsDecls.push(`let ${ts.unescapeLeadingUnderscores(name)}: any;\\n`);"],
  // Object shorthand for a variable of an earlier cell: `{ Jz }` names the property's symbol, not
  // the variable's, so tslab left it as `{ Jz }` and the cell failed with "Jz is not defined".
  // Write it as `{ Jz: exports.Jz }` (with a default, `{ Jz: exports.Jz = d }` in a pattern).
  [
    `            if (!ts.isIdentifier(node)) {
                return ts.visitEachChild(node, wrapPrevIdentifier, nullTransformationContext);`,
    `            if (ts.isShorthandPropertyAssignment(node)) {
                const original = ts.getOriginalNode(node);
                const sym = ts.isShorthandPropertyAssignment(original) ? checker.getShorthandAssignmentValueSymbol(original) : undefined;
                if (sym && (sym.declarations ?? []).some((d) => d.getSourceFile() === declsFile)) {
                    const name = ts.idText(node.name);
                    let value = ts.factory.createPropertyAccessExpression(ts.factory.createIdentifier("exports"), ts.factory.createIdentifier(name));
                    if (node.objectAssignmentInitializer) {
                        value = ts.factory.createBinaryExpression(value, ts.SyntaxKind.EqualsToken, ts.visitNode(node.objectAssignmentInitializer, wrapPrevIdentifier));
                    }
                    return ts.factory.createPropertyAssignment(ts.factory.createIdentifier(name), value);
                }
                return ts.visitEachChild(node, wrapPrevIdentifier, nullTransformationContext);
            }
            if (!ts.isIdentifier(node)) {
                return ts.visitEachChild(node, wrapPrevIdentifier, nullTransformationContext);`,
  ],
  // Whole types in error messages: a misspelt output of a calculator result then lists every
  // output ("Property 'radus' does not exist on type '{ radius: ...; wallWidth: ...; ... }'"),
  // where TypeScript would cut the type after 160 characters.
  ["        skipLibCheck: true,\n", "        skipLibCheck: true,\n        noErrorTruncation: true,\n"],
  // Only Node's global types are included without an import (TypeScript otherwise includes every
  // package under each node_modules/@types up the tree: in this repository jquery, lodash,
  // underscore, react with csstype, chai..., 3.2 MB of declarations beside Node's 2.3 MB, parsed
  // at kernel start and carried through every cell's program). A package imported by a cell
  // still finds its @types; a triple-slash `/// <reference types="..." />` brings in globals.
  ["        typeRoots: getTypeRoots(),\n", '        typeRoots: getTypeRoots(),\n        types: ["node"],\n'],
];

let cached: typeof converterModule | null = null;

export function loadConverterModule(): typeof converterModule {
  if (cached) return cached;
  const file = require.resolve("tslab/dist/converter");
  let source = readFileSync(file, "utf8");
  for (const [from, to] of edits) {
    const n = source.split(from).length - 1;
    if (n !== 1) throw new Error(`tslab converter patch: expected one '${from}' in ${file}, found ${n} (tslab changed?)`);
    source = source.replace(from, () => to);
  }
  type InternalModule = Module & { _compile(code: string, filename: string): void; paths: string[] };
  const Ctor = Module as unknown as { new (id: string, parent?: unknown): InternalModule; _nodeModulePaths(dir: string): string[] };
  const mod = new Ctor(file, module);
  mod.filename = file;
  mod.paths = Ctor._nodeModulePaths(dirname(file));
  mod._compile(source, file);
  cached = mod.exports as typeof converterModule;
  return cached;
}
