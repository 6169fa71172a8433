// Exported pages: lumino widgets from the page's widget runtime part (src/pageVendor.ts).
module.exports = { Widget: require("./vendor.cjs").Widget };
