import { defineConfig } from "vitest/config";
import { fileURLToPath } from "node:url";

export default defineConfig({
  resolve: {
    alias: [
      // Tests of the library run against its TypeScript source; kernel and e2e tests use the build.
      // The supported API and the internal entry (see lib/src/internal.ts); exact ids only.
      { find: /^@helicoid\/lib$/, replacement: fileURLToPath(new URL("./lib/src/index.ts", import.meta.url)) },
      { find: /^@helicoid\/lib\/internal$/, replacement: fileURLToPath(new URL("./lib/src/internal.ts", import.meta.url)) },
    ],
  },
  test: {
    include: ["test/**/*.test.ts"],
    testTimeout: 120_000,
    hookTimeout: 180_000,
    pool: "forks",
    reporters: ["default"],
  },
});
