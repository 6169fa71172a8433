/**
 * JupyterLab 4 / Notebook 7 plugin: registers the widget module "@helicoid/widgets" with the
 * widget manager's registry (IJupyterWidgetRegistry from @jupyter-widgets/base, provided by
 * jupyterlab_widgets).
 *
 * The views and @jupyter-widgets/base are imported on activation, not when the extension loads: a
 * JupyterLab without the widget manager (no @jupyter-widgets/base in the share scope, or no widget
 * registry) still loads this plugin, which then says in the page what is missing instead of the
 * console-only "Shared module ... doesn't exist in shared scope".
 */
import { MODULE_NAME, MODULE_VERSION } from "./version.js";

interface Registry {
  registerWidget(data: { name: string; version: string; exports: unknown }): void;
}
interface App {
  resolveOptionalService?(token: unknown): Promise<unknown>;
}

const HELP =
  "Helicoid widgets need the Jupyter widget manager: the Python package jupyterlab_widgets (or the prebuilt " +
  "extension @jupyter-widgets/jupyterlab-manager 5) in this JupyterLab. Widgets show as text until it is installed; " +
  "`helicoid doctor` says what was found, `helicoid lab` opens a front end that has it.";

/** One visible notice at the top of the page (also logged). */
export function showMissingWidgetManager(reason: string): HTMLElement | null {
  console.error(`@helicoid/widgets: ${reason}. ${HELP}`);
  if (typeof document === "undefined") return null;
  const el = document.createElement("div");
  el.className = "hx-missing-manager";
  el.setAttribute("role", "alert");
  el.style.cssText = "position:fixed;top:0;left:0;right:0;z-index:10000;padding:8px 12px;background:#fde2e1;color:#6b0f0c;border-bottom:1px solid #d9534f;font:14px sans-serif";
  el.textContent = `Helicoid: ${reason}. ${HELP}`;
  const close = document.createElement("button");
  close.textContent = "Dismiss";
  close.style.marginLeft = "12px";
  close.onclick = () => el.remove();
  el.appendChild(close);
  document.body.appendChild(el);
  return el;
}

const plugin = {
  id: "@helicoid/widgets:plugin",
  description: "Helicoid widgets: calculator explorer, figures, textures and fit panels.",
  autoStart: true,
  activate: async (app: App): Promise<void> => {
    let mod: typeof import("./labWidgets.js");
    try {
      mod = await import("./labWidgets.js");
    } catch (err) {
      showMissingWidgetManager(`the widget package @jupyter-widgets/base is not available (${(err as Error)?.message ?? err})`);
      return;
    }
    const registry = (await app.resolveOptionalService?.(mod.IJupyterWidgetRegistry)) as Registry | null | undefined;
    if (!registry) {
      showMissingWidgetManager("no Jupyter widget registry in this JupyterLab (the widget manager plugin is missing)");
      return;
    }
    registry.registerWidget({ name: MODULE_NAME, version: MODULE_VERSION, exports: mod.widgetExports });
  },
};

export default plugin;
