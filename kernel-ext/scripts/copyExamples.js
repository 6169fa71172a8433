#!/usr/bin/env node
"use strict";
// prepack: ship the example notebooks (and their data) inside the package as examples/, so an
// installed `helicoid start` has them, and the sources of the JupyterLab-based front end
// (lab-frontend/ without node_modules or dist) as lab-frontend/, so an installed `helicoid lab` can
// build it on a machine with only a Jupyter server. Both are build outputs (ignored by git).
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

const labSrc = join(__dirname, "..", "..", "lab-frontend");
const labDst = join(__dirname, "..", "lab-frontend");
rmSync(labDst, { recursive: true, force: true });
if (existsSync(labSrc)) {
  cpSync(labSrc, labDst, { recursive: true, filter: (p) => !/[\\/](node_modules|dist|build)([\\/]|$)/.test(p.slice(labSrc.length)) });
  console.log(`copyExamples: ${labSrc} -> ${labDst} (sources only)`);
}
