#!/usr/bin/env node
"use strict";
// The `helicoid` command (built code in ../dist; `npm run build` at the repository root builds it).
const { main } = require("../dist/cli/main.js");
// A reader that stops early (helicoid calc --list | head) closes the pipe: stop quietly.
for (const stream of [process.stdout, process.stderr]) {
  stream.on("error", (err) => {
    if (err && err.code === "EPIPE") process.exit(0);
    throw err;
  });
}
main(process.argv.slice(2)).then(
  (code) => {
    if (code !== undefined) process.exit(code);
  },
  (err) => {
    console.error(err);
    process.exit(1);
  },
);
