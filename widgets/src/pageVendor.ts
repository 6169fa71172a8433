/**
 * The widget runtime of exported pages (widgets/build.mjs bundles this as its own part of
 * dist/export.js, run in a task before the page bundle): html-manager (with the standard controls,
 * @jupyter-widgets/base, lumino, rendermime), marked, their CSS. The page bundle reads these from
 * `globalThis.__hxVendor` (src/stubs/vendor/), so both use one instance of each.
 */
import "@lumino/widgets/style/index.css";
import "@jupyter-widgets/controls/css/widgets-base.css";
import "@jupyter-widgets/controls/css/labvariables.css";
export * as base from "@jupyter-widgets/base";
export { HTMLManager } from "@jupyter-widgets/html-manager/lib/htmlmanager";
export { RenderMimeRegistry, standardRendererFactories } from "@jupyterlab/rendermime";
export { Widget } from "@lumino/widgets";
export { marked } from "marked";
