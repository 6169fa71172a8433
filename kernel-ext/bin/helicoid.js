#!/usr/bin/env node
"use strict";
// The `helicoid` command (built code in ../dist; `npm run build` at the repository root builds it).
const { main } = require("../dist/cli/main.js");
main(process.argv.slice(2)).then(
  (code) => {
    if (code !== undefined) process.exit(code);
  },
  (err) => {
    console.error(err);
    process.exit(1);
  },
);
