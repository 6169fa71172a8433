// @helicoid/lib/internal for Node10 module resolution (see src/internal.ts): the built internal entry.
module.exports = require("./dist/internal.js");
