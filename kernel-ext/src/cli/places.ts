/**
 * Where things are, in a checkout of the repository and in an installed package alike. Nothing here
 * assumes the repository: an installed @helicoid/kernel lives in someone's node_modules (project or
 * global), next to @helicoid/lib and @helicoid/widgets.
 */
import { existsSync, readFileSync } from "node:fs";
import { tmpdir, userInfo } from "node:os";
import { join, resolve } from "node:path";

/** The root of this package (the folder holding bin/, dist/ and package.json). */
export const packageRoot = resolve(__dirname, "..", "..");

/** The repository root when running from a checkout (its package.json lists our workspaces), else null. */
export function checkoutRoot(): string | null {
  const root = resolve(packageRoot, "..");
  try {
    const pkg = JSON.parse(readFileSync(join(root, "package.json"), "utf8")) as { name?: string; workspaces?: string[] };
    return pkg.name === "helicoid" && Array.isArray(pkg.workspaces) && pkg.workspaces.includes("kernel-ext") ? root : null;
  } catch {
    return null;
  }
}

/** The example notebooks: notebooks/ of a checkout, or the copy shipped in the package (examples/). */
export function exampleNotebooksDir(): string | null {
  const root = checkoutRoot();
  if (root && existsSync(join(root, "notebooks"))) return join(root, "notebooks");
  const shipped = join(packageRoot, "examples");
  return existsSync(shipped) ? shipped : null;
}

/** Where `helicoid start` writes its gallery by default: .gallery/ of a checkout, else a folder under the temp directory. */
export function defaultGalleryDir(): string {
  const root = checkoutRoot();
  if (root) return join(root, ".gallery");
  let user = "user";
  try {
    user = userInfo().username || user;
  } catch {
    /* no user name: keep the default */
  }
  return join(tmpdir(), `helicoid-gallery-${user}`);
}
