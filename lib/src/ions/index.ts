export * from "./stevens.js";
export * from "./singleIon.js";
export * from "./hund.js";
export * from "./fitCrystalField.js";
export * from "./stevensFactors.js";
