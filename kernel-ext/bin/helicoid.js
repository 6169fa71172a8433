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
// End only once everything written has left: an empty write's callback runs after every earlier
// write on that stream is flushed, so a `--json` answer to a pipe is never cut short.
function finish(code) {
  process.exitCode = code;
  process.stdout.write("", () => process.stderr.write("", () => process.exit(code)));
}
main(process.argv.slice(2)).then(
  (code) => {
    if (code !== undefined) finish(code);
  },
  (err) => {
    process.stderr.write(`helicoid: ${String((err && err.message) || "an unexpected error")}\n`);
    finish(1);
  },
);
