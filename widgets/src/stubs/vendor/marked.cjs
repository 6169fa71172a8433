// Exported pages: marked from the page's widget runtime part (src/pageVendor.ts).
module.exports = { marked: require("./vendor.cjs").marked };
