// Exported pages: rendermime from the page's widget runtime part (src/pageVendor.ts).
const v = require("./vendor.cjs");
module.exports = { RenderMimeRegistry: v.RenderMimeRegistry, standardRendererFactories: v.standardRendererFactories };
