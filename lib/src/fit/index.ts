export * from "./levenbergMarquardt.js";
export * from "./leastSquares.js";
export * from "./distributions.js";
export * from "./prng.js";
