#!/usr/bin/env node
/**
 * Build of @helicoid/widgets (run by the root `npm run build`):
 *   1. dist/worker.js          the compute worker (bundled @helicoid/lib), embedded as text below
 *   2. dist/export.js          the standalone bootstrap of exported pages, in parts that the page
 *                              runs one task each: the library factory (also the worker's source),
 *                              plotly (core + our trace types), the widget runtime (html-manager,
 *                              standard controls, CSS), our module
 *   3. dist/markdown.cjs       the Markdown renderer for the exporter (marked, as CommonJS)
 *   4. lib/plugin.js + chunks  the JupyterLab plugin (ESM, shared packages external); the views load on activation
 *   5. labextension/           the prebuilt JupyterLab 4 extension, by @jupyterlab/builder
 *   6. widget-manager/         the widget manager (npm @jupyter-widgets/jupyterlab-manager, from
 *                              lab-frontend/'s own install) as a
 *                              prebuilt extension, by @jupyterlab/builder, for `helicoid install` to
 *                              put in place when the user's Jupyter has none; rebuilt only when the
 *                              manager's version changes (or with --manager)
 * `node build.mjs --no-lab` skips steps 5 and 6. Step 6 (about 90 s the first time) runs only with
 * `--with-manager` (rebuilt when the manager's version changes) or `--manager` (always): `npm test`,
 * `npm pack` and `npm run build:manager` ask for it; `npm start` does not need it.
 */
import * as esbuild from "esbuild";
import { readFileSync, writeFileSync, mkdirSync, rmSync, existsSync, statSync, readdirSync, cpSync } from "node:fs";

import { dirname, join, relative } from "node:path";
import { fileURLToPath } from "node:url";
import { spawnSync } from "node:child_process";

const here = dirname(fileURLToPath(import.meta.url));
const argv = process.argv.slice(2);
const args = new Set(argv);
const option = (name) => {
  const i = argv.indexOf(name);
  return i >= 0 ? argv[i + 1] : undefined;
};
// Tests: `--extra-specs FILE --out DIR` builds only the worker and the export bundle into DIR,
// with FILE (which adds test calculators to the catalogue) injected into both.
const extraSpecs = option("--extra-specs");
const dist = option("--out") ?? join(here, "dist");
mkdirSync(dist, { recursive: true });
const t0 = Date.now();
const log = (m) => process.stderr.write(`widgets build: ${m} (${((Date.now() - t0) / 1000).toFixed(1)} s)\n`);

/** CSS imported from JS becomes a module that injects one <style> tag (with @import resolved). */
const cssInject = {
  name: "css-inject",
  setup(build) {
    build.onLoad({ filter: /\.css$/ }, async (a) => {
      const out = await esbuild.build({
        entryPoints: [a.path],
        bundle: true,
        write: false,
        minify: true,
        loader: { ".svg": "dataurl", ".png": "dataurl", ".woff": "dataurl", ".woff2": "dataurl", ".ttf": "dataurl", ".eot": "dataurl", ".gif": "dataurl" },
        logLevel: "silent",
      });
      const css = out.outputFiles[0].text;
      return {
        contents: `const css = ${JSON.stringify(css)};\nif (typeof document !== "undefined") { const s = document.createElement("style"); s.dataset.source = ${JSON.stringify(relative(here, a.path))}; s.textContent = css; document.head.appendChild(s); }\nexport default css;\n`,
        loader: "js",
      };
    });
  },
};

const common = {
  bundle: true,
  minify: !args.has("--dev"),
  target: "es2020",
  logLevel: "warning",
  define: { __webpack_public_path__: '""', "process.env.NODE_ENV": '"production"', global: "globalThis" },
  // @helicoid/lib from its TypeScript source: the front end and the kernel share one build of the physics.
  alias: { "@helicoid/lib": join(here, "..", "lib", "src", "index.ts") },
  // Keep the licence notices of bundled libraries (plotly.js, mathjs, jupyter-widgets ...) at the end of each bundle.
  legalComments: "eof",
  inject: extraSpecs ? [extraSpecs] : [],
  loader: { ".svg": "text" },
};

// 1. worker
const worker = await esbuild.build({ ...common, entryPoints: [join(here, "src/compute/worker.ts")], format: "iife", write: false, outfile: join(dist, "worker.js") });
const workerText = worker.outputFiles[0].text;
writeFileSync(join(dist, "worker.js"), workerText);
log(`worker ${(workerText.length / 1e6).toFixed(2)} MB`);

const workerSource = {
  name: "worker-source",
  setup(build) {
    build.onResolve({ filter: /^helicoid:worker-source$/ }, () => ({ path: "worker-source", namespace: "helicoid" }));
    build.onLoad({ filter: /.*/, namespace: "helicoid" }, () => ({ contents: `export default ${JSON.stringify(workerText)};`, loader: "js" }));
  },
};

// 2. export bootstrap (ipywidgets 7 models left out: our kernel speaks protocol 2), in two parts in
//    one file: (a) the library factory, a function holding @helicoid/lib and the job runner, called
//    once for the page; its own source text (Function.prototype.toString) starts the Web Worker, so
//    the page carries the library once instead of a second copy as a worker string; (b) the page
//    bundle, which takes @helicoid/lib from (a). sanitize-html is replaced by a DOM allow-list
//    sanitizer (src/stubs/sanitizeHtml: the exporter sanitizes untrusted HTML in Node beforehand).
const libPart = await esbuild.build({
  ...common,
  entryPoints: [join(here, "src/compute/libEntry.ts")],
  format: "iife",
  globalName: "__hxLib",
  write: false,
  outfile: join(dist, "lib-factory.js"),
});
// The factory is a parenthesized function expression, so V8 compiles it at once rather than
// pre-parsing 0.6 MB and parsing it again when it is called.
const factoryDefinition = `var __helicoidLibFactory=(function(){${libPart.outputFiles[0].text}\nreturn __hxLib;});\n`;
const factoryRun =
  "globalThis.__helicoidLib=__helicoidLibFactory();\n" +
  'globalThis.__helicoidWorkerSource=function(){return "var __hxL=("+__helicoidLibFactory.toString()+")();\\nself.onmessage=function(e){self.postMessage(__hxL.__runJob(e.data));};\\n";};\n';
// The factory names only what the views import (src/compute/libEntry.ts): check that every value
// the page's sources import from @helicoid/lib is among them, so a new import cannot be undefined.
{
  const names = new Set();
  const walk = (d) => {
    for (const e of readdirSync(d, { withFileTypes: true })) {
      if (e.isDirectory()) walk(join(d, e.name));
      else if (/\.ts$/.test(e.name) && e.name !== "libEntry.ts") {
        for (const m of readFileSync(join(d, e.name), "utf8").matchAll(/(?:import|export) (type )?\{([^}]*)\} from "@helicoid\/lib"/g)) {
          if (m[1]) continue;
          for (const n of m[2]
            .split(",")
            .map((x) => x.trim())
            .filter(Boolean))
            if (!n.startsWith("type ")) names.add(n.split(/\s+as\s+/)[0]);
        }
      }
    }
  };
  walk(join(here, "src"));
  const exported = new Set(libPart.outputFiles[0].text.length ? Object.keys(new Function(`${libPart.outputFiles[0].text}\nreturn __hxLib;`)()) : []);
  const missing = [...names].filter((n) => !exported.has(n));
  if (missing.length) throw new Error(`src/compute/libEntry.ts does not export ${missing.join(", ")}, which the page's views import from @helicoid/lib: add them there`);
}
const widgets7 = join(here, "src", "stubs", "widgets7");
const vendorStubs = join(here, "src", "stubs", "vendor");
const pageAliases = {
  "sanitize-html": join(here, "src", "stubs", "sanitizeHtml"),
  "@jupyter-widgets/base7": widgets7,
  "@jupyter-widgets/controls7": widgets7,
};
// the widget runtime (html-manager, standard controls, base, lumino, rendermime, marked, their CSS)
const vendorPart = await esbuild.build({
  ...common,
  alias: pageAliases,
  inject: [],
  entryPoints: [join(here, "src", "pageVendor.ts")],
  format: "iife",
  globalName: "__hxVendor",
  write: false,
  outfile: join(dist, "vendor.js"),
  plugins: [cssInject],
});
const page = await esbuild.build({
  ...common,
  alias: {
    ...common.alias,
    "@helicoid/lib": join(here, "src", "stubs", "pageLib.cjs"),
    ...pageAliases,
    "plotly.js-cartesian-dist-min": join(here, "src", "stubs", "pagePlotly.cjs"),
    "@jupyter-widgets/base": join(vendorStubs, "base.cjs"),
    "@jupyter-widgets/html-manager/lib/htmlmanager": join(vendorStubs, "htmlmanager.cjs"),
    "@jupyterlab/rendermime": join(vendorStubs, "rendermime.cjs"),
    "@lumino/widgets": join(vendorStubs, "lumino.cjs"),
    marked: join(vendorStubs, "marked.cjs"),
  },
  inject: [],
  entryPoints: [join(here, "src/exportPage.ts")],
  format: "iife",
  write: false,
  outfile: join(dist, "export.js"),
  plugins: [
    cssInject,
    {
      name: "page-worker-source",
      setup(build) {
        build.onResolve({ filter: /^helicoid:worker-source$/ }, () => ({ path: join(here, "src", "stubs", "pageWorkerSource.js") }));
      },
    },
  ],
});
// Four pieces, in seven parts (below), which the exported page unpacks and runs in order, one task each (kernel-ext's exporter
// splits at PART): the library factory, plotly.js (src/pagePlotly.js: the core and the trace types we use,
// which sets globalThis.Plotly; the page bundle reads it through src/stubs/pagePlotly.cjs), the
// widget runtime (src/pageVendor.ts, read through src/stubs/vendor/), the page bundle.
const PART = "\n//# helicoid-part\n";
const plotlyPart = await esbuild.build({
  ...common,
  alias: {},
  inject: [],
  entryPoints: [join(here, "src", "pagePlotly.js")],
  format: "iife",
  write: false,
  outfile: join(dist, "plotly-page.js"),
});
const plotlyDist = plotlyPart.outputFiles[0].text;
// Each large part is defined (parsed and compiled: a parenthesized function) in one task and run
// in the next, so that no task both compiles and runs one of them.
const parts = [
  factoryDefinition,
  factoryRun,
  `var __hxPlotlyFactory=(function(){${plotlyDist}\n});\n`,
  "__hxPlotlyFactory();\n",
  `var __hxVendorFactory=(function(){${vendorPart.outputFiles[0].text}\nreturn __hxVendor;});\n`,
  "var __hxVendor=__hxVendorFactory();\n",
  page.outputFiles[0].text,
];
writeFileSync(join(dist, "export.js"), parts.join(PART));
log(`export.js ${(statSync(join(dist, "export.js")).size / 1e6).toFixed(2)} MB`);

if (extraSpecs) {
  log("done (test bundle)");
  process.exit(0);
}

// 3. markdown renderer for the exporter (Node)
await esbuild.build({ ...common, alias: {}, entryPoints: [join(here, "src/node/markdown.ts")], platform: "node", format: "cjs", outfile: join(dist, "markdown.cjs") });

// 4. the plugin as one ESM module for the JupyterLab builder
const shared = ["@jupyter-widgets/base", "@jupyterlab/*", "@lumino/*"];
// Split: plugin.js loads first and imports the views (and @jupyter-widgets/base) on activation, so a
// JupyterLab without the widget manager still runs the plugin, which says what is missing.
rmSync(join(here, "lib"), { recursive: true, force: true });
mkdirSync(join(here, "lib"), { recursive: true });
await esbuild.build({
  ...common,
  entryPoints: { plugin: join(here, "src/plugin.ts") },
  format: "esm",
  splitting: true,
  outdir: join(here, "lib"),
  chunkNames: "[name]-[hash]",
  external: shared,
  plugins: [cssInject, workerSource],
});
const libFiles = readdirSync(join(here, "lib")).filter((f) => f.endsWith(".js"));
log(`lib/ ${libFiles.join(", ")} ${(libFiles.reduce((n, f) => n + statSync(join(here, "lib", f)).size, 0) / 1e6).toFixed(2)} MB`);

// 5. prebuilt JupyterLab extension
if (!args.has("--no-lab")) {
  const stage = join(here, "build", "lab");
  rmSync(stage, { recursive: true, force: true });
  mkdirSync(stage, { recursive: true });
  const own = JSON.parse(readFileSync(join(here, "package.json"), "utf8"));
  for (const f of libFiles) writeFileSync(join(stage, f), readFileSync(join(here, "lib", f)));
  writeFileSync(
    join(stage, "package.json"),
    JSON.stringify(
      {
        name: own.name,
        version: own.version,
        description: own.description,
        license: "MIT",
        main: "plugin.js",
        keywords: ["jupyter", "jupyterlab", "jupyterlab-extension", "widgets"],
        dependencies: { "@jupyter-widgets/base": (own.dependencies ?? own.devDependencies)["@jupyter-widgets/base"] },
        jupyterlab: {
          extension: true,
          outputDir: relative(stage, join(here, "labextension")),
          webpackConfig: "./webpack.config.js",
          sharedPackages: { "@jupyter-widgets/base": { bundled: false, singleton: true } },
        },
      },
      null,
      2,
    ),
  );
  // The input is already minified by esbuild; skipping terser keeps the build fast.
  writeFileSync(join(stage, "webpack.config.js"), "module.exports = { optimization: { minimize: false } };\n");
  const builder = join(here, "..", "node_modules", "@jupyterlab", "builder", "lib", "build-labextension.js");
  const r = spawnSync(process.execPath, [builder, "--core-path", join(here, "lab-core"), stage], { cwd: stage, encoding: "utf8" });
  if (r.status !== 0) {
    process.stderr.write(r.stdout + r.stderr);
    throw new Error(`build-labextension failed with status ${r.status}`);
  }
  const meta = JSON.parse(readFileSync(join(here, "labextension", "package.json"), "utf8"));
  log(`labextension ${meta.jupyterlab._build.load}`);
}
// 6. the widget manager as a prebuilt extension (what the Python package jupyterlab_widgets ships)
if (!args.has("--no-lab") && (args.has("--with-manager") || args.has("--manager"))) {
  // The manager and its build dependencies (JupyterLab's notebook packages, about 180 npm packages)
  // are not in the root install: they come from lab-frontend/'s own install (the JupyterLab 4 front
  // end of the tests), installed here on first use, so `npm ci` and `npm start` stay light.
  const labFrontend = join(here, "..", "lab-frontend");
  const src = join(labFrontend, "node_modules", "@jupyter-widgets", "jupyterlab-manager");
  if (!existsSync(join(src, "package.json"))) {
    log("installing lab-frontend's npm packages for the widget manager (once): npm ci --prefix lab-frontend");
    const npm = process.platform === "win32" ? "npm.cmd" : "npm";
    const r = spawnSync(npm, ["ci", "--prefix", labFrontend, "--no-audit", "--no-fund"], { stdio: ["ignore", "inherit", "inherit"] });
    if (r.status !== 0) throw new Error(`npm ci --prefix ${labFrontend} failed (status ${r.status}): the widget manager cannot be built`);
  }
  const pkg = JSON.parse(readFileSync(join(src, "package.json"), "utf8"));
  const outDir = join(here, "widget-manager");
  const builtFor = existsSync(join(outDir, "package.json")) ? JSON.parse(readFileSync(join(outDir, "package.json"), "utf8")).version : null;
  if (builtFor === pkg.version && !args.has("--manager")) {
    log(`widget-manager ${pkg.version} up to date`);
  } else {
    // staged inside lab-frontend/ so that the bundler finds the manager's dependencies in its node_modules
    const stage = join(labFrontend, "build", "manager-stage");
    rmSync(stage, { recursive: true, force: true });
    rmSync(outDir, { recursive: true, force: true });
    mkdirSync(stage, { recursive: true });
    for (const d of ["lib", "schema"]) cpSync(join(src, d), join(stage, d), { recursive: true });
    writeFileSync(
      join(stage, "package.json"),
      JSON.stringify(
        {
          name: pkg.name,
          version: pkg.version,
          description: pkg.description,
          license: pkg.license,
          main: pkg.main,
          dependencies: pkg.dependencies,
          jupyterlab: {
            extension: true,
            schemaDir: "./schema",
            outputDir: relative(stage, outDir),
            // The widget packages are provided once, for every widget extension (ours asks for base as a singleton).
            sharedPackages: {
              "@jupyter-widgets/base": { bundled: true, singleton: true },
              "@jupyter-widgets/controls": { bundled: true, singleton: true },
              "@jupyter-widgets/output": { bundled: true, singleton: true },
            },
          },
        },
        null,
        2,
      ),
    );
    const builder = join(here, "..", "node_modules", "@jupyterlab", "builder", "lib", "build-labextension.js");
    const r = spawnSync(process.execPath, [builder, "--core-path", join(here, "lab-core"), stage], { cwd: stage, encoding: "utf8" });
    if (r.status !== 0) {
      process.stderr.write(r.stdout + r.stderr);
      throw new Error(`build-labextension (widget manager) failed with status ${r.status}`);
    }
    const meta = JSON.parse(readFileSync(join(outDir, "package.json"), "utf8"));
    log(`widget-manager ${meta.version} ${meta.jupyterlab._build.load}`);
  }
}
log("done");
