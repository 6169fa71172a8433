/**
 * The widget front end is bundled by esbuild, which does not check types: this runs the
 * TypeScript checker over widgets/src (strict, DOM) so type errors fail the test suite.
 */
import { it, expect } from "vitest";
import { spawnSync } from "node:child_process";
import { join } from "node:path";

it("widgets/src type-checks (tsc --noEmit, strict)", () => {
  const root = join(__dirname, "..", "..");
  const r = spawnSync(process.execPath, [join(root, "node_modules", "typescript", "bin", "tsc"), "-p", join(root, "widgets", "tsconfig.json"), "--noEmit"], { encoding: "utf8" });
  expect(r.stdout + r.stderr).toBe("");
  expect(r.status).toBe(0);
}, 120_000);
