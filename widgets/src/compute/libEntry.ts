/**
 * The library factory of exported pages (widgets/build.mjs): the parts of @helicoid/lib that the
 * page's views import (widgets/src; add a name here when a view imports a new one: the page bundle
 * reads them from this factory, src/stubs/pageLib.cjs, and the build checks the list) and the
 * compute job runner, in one bundle, run once on the page and once in its Web Worker from the same
 * source text. Naming them instead of re-exporting the whole library lets the bundler leave out
 * what neither uses (1.2 -> 0.65 MB).
 */
export {
  InputError,
  FIT_PANEL_DEFAULTS,
  anyUncertainty,
  fitPanelState,
  formatWithError,
  withUncertainties,
  PLOT_MARGIN,
  axisTitle,
  axisUnit,
  catalogue,
  currentMarkFor,
  customaryUnit,
  defaultSweep,
  displayUnit,
  filmInputNames,
  formatNumber,
  formatQuantity,
  getCalculator,
  paperLayout,
  parseQuantity,
  plotFigure,
  runCalculator,
  symbolHtml,
  symbolText,
  triangleSolidAngle,
  withoutArgument,
} from "@helicoid/lib";
export { runJob as __runJob } from "./runJob.js";
