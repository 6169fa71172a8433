#!/usr/bin/env node
"use strict";
// prepack: ship the example notebooks (and their data) inside the package as examples/, so an
// installed `helicoid start` has them. examples/ is a build output (ignored by git).
const { cpSync, existsSync, rmSync } = require("node:fs");
const { join } = require("node:path");
const src = join(__dirname, "..", "..", "notebooks");
const dst = join(__dirname, "..", "examples");
if (!existsSync(src)) {
  console.error(`copyExamples: ${src} not found (run from a checkout of the repository)`);
  process.exit(1);
}
rmSync(dst, { recursive: true, force: true });
cpSync(src, dst, { recursive: true, filter: (p) => !p.includes(".ipynb_checkpoints") });
console.log(`copyExamples: ${src} -> ${dst}`);
