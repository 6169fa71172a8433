import { fileURLToPath } from "node:url";
import { join } from "node:path";

export const repoRoot = fileURLToPath(new URL("../..", import.meta.url));
export const helicoidBin = join(repoRoot, "kernel-ext", "bin", "helicoid.js");
export const outputDir = join(repoRoot, "test-output");
