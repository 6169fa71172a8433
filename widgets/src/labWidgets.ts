/**
 * What the JupyterLab plugin loads on activation: the registry token (from the shared
 * @jupyter-widgets/base) and the widget module's exports.
 */
export { IJupyterWidgetRegistry } from "@jupyter-widgets/base";
import * as widgetExports from "./index.js";
export { widgetExports };
