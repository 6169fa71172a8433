// Exported pages: @jupyter-widgets/base from the page's widget runtime part (src/pageVendor.ts).
module.exports = require("./vendor.cjs").base;
