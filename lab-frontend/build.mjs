#!/usr/bin/env node
/**
 * Builds the notebook front end (src/main.ts) into dist/ with esbuild: ES modules with code
 * splitting (languages and the standard controls load on demand), one CSS file, fonts and images
 * as files. Run by `helicoid lab` and by the end-to-end test when dist/ is missing or older than
 * the sources: `node lab-frontend/build.mjs`.
 *
 * Two adaptations of webpack-isms in JupyterLab's packages:
 * - CSS `@import url('~pkg/file.css')` (webpack's "from node_modules" prefix) is resolved as `pkg/file.css`;
 * - the widget manager's `require.ensure([...], cb)` for @jupyter-widgets/controls becomes `import()`.
 */
import * as esbuild from "esbuild";
import { readFileSync, rmSync, writeFileSync, mkdirSync } from "node:fs";
import { dirname, join } from "node:path";
import { fileURLToPath } from "node:url";
import { createRequire } from "node:module";

const here = dirname(fileURLToPath(import.meta.url));
const dist = join(here, "dist");
const require = createRequire(join(here, "package.json"));
const t0 = Date.now();

const tilde = {
  name: "tilde-css",
  setup(build) {
    build.onResolve({ filter: /^~/ }, (a) => ({ path: require.resolve(a.path.slice(1), { paths: [a.resolveDir] }) }));
  },
};

/** SVG icons imported by JupyterLab's code are SVG text (LabIcon); those referenced by CSS are files. */
const svgText = {
  name: "svg-text",
  setup(build) {
    build.onResolve({ filter: /\.svg$/ }, (a) => (a.kind === "import-statement" || a.kind === "require-call" || a.kind === "dynamic-import")
      ? { path: require.resolve(a.path, { paths: [a.resolveDir] }), namespace: "svg-text" } : undefined);
    build.onLoad({ filter: /.*/, namespace: "svg-text" }, (a) => ({ contents: readFileSync(a.path, "utf8"), loader: "text" }));
  },
};

const requireEnsure = {
  name: "require-ensure",
  setup(build) {
    build.onLoad({ filter: /jupyterlab-manager[\\/]lib[\\/]plugin\.js$/ }, (a) => {
      const src = readFileSync(a.path, "utf8");
      const out = src.replace(
        /require\.ensure\(\['@jupyter-widgets\/controls'\],\s*\(require\)\s*=>\s*\{[\s\S]*?resolve\(require\('@jupyter-widgets\/controls'\)\);\s*\},\s*\(err\)\s*=>\s*\{\s*reject\(err\);\s*\},\s*'@jupyter-widgets\/controls'\);/,
        "import('@jupyter-widgets/controls').then(resolve, reject);",
      );
      if (out === src) throw new Error("lab-frontend build: the widget manager's require.ensure was not found; check @jupyter-widgets/jupyterlab-manager's version");
      return { contents: out, loader: "js" };
    });
  },
};

rmSync(dist, { recursive: true, force: true });
mkdirSync(dist, { recursive: true });
await esbuild.build({
  entryPoints: { main: join(here, "src", "main.ts") },
  bundle: true,
  splitting: true,
  format: "esm",
  outdir: dist,
  minify: true,
  target: "es2020",
  logLevel: "warning",
  legalComments: "linked",
  define: { "process.env.NODE_ENV": '"production"', global: "globalThis", __webpack_public_path__: '""' },
  loader: { ".svg": "file", ".png": "file", ".gif": "file", ".woff": "file", ".woff2": "file", ".ttf": "file", ".eot": "file", ".otf": "file", ".md": "text" },
  assetNames: "assets/[name]-[hash]",
  chunkNames: "chunks/[name]-[hash]",
  plugins: [tilde, svgText, requireEnsure],
});
const own = JSON.parse(readFileSync(join(here, "package.json"), "utf8"));
writeFileSync(join(dist, "build.json"), JSON.stringify({ name: own.name, version: own.version, built: new Date().toISOString() }, null, 2) + "\n");
process.stderr.write(`lab-frontend build: dist/ in ${((Date.now() - t0) / 1000).toFixed(1)} s\n`);
