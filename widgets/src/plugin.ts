/**
 * JupyterLab 4 / Notebook 7 plugin: registers the widget module "@helicoid/widgets" with the
 * widget manager's registry (IJupyterWidgetRegistry from @jupyter-widgets/base, provided by
 * jupyterlab_widgets).
 */
import { IJupyterWidgetRegistry } from "@jupyter-widgets/base";
import * as widgetExports from "./index.js";
import { MODULE_NAME, MODULE_VERSION } from "./version.js";

interface Registry {
  registerWidget(data: { name: string; version: string; exports: unknown }): void;
}

const plugin = {
  id: "@helicoid/widgets:plugin",
  description: "Helicoid widgets: calculator explorer, figures, textures and fit panels.",
  requires: [IJupyterWidgetRegistry],
  autoStart: true,
  activate: (_app: unknown, registry: Registry): void => {
    registry.registerWidget({ name: MODULE_NAME, version: MODULE_VERSION, exports: widgetExports });
  },
};

export default plugin;
