// Exported pages: html-manager from the page's widget runtime part (src/pageVendor.ts).
module.exports = { HTMLManager: require("./vendor.cjs").HTMLManager };
