/**
 * A page that provides the shared packages to a prebuilt extension the way JupyterLab 4 does:
 * it loads the extension's remoteEntry script (a webpack module-federation container stored on
 * window._JUPYTERLAB[name]), initialises it with a share scope that offers @jupyter-widgets/base 6
 * (as jupyterlab_widgets does), gets "./extension", activates the plugin with a widget registry,
 * and renders the registered module's views with a widget manager (base-manager).
 */
import * as base from "@jupyter-widgets/base";
import { ManagerBase } from "@jupyter-widgets/base-manager";
import { Widget } from "@lumino/widgets";

type Exports = Record<string, unknown>;
const registered: Array<{ name: string; version: string; exports: Exports }> = [];

class PageManager extends ManagerBase {
  readonly helicoidStatic = true;
  protected async loadClass(className: string, moduleName: string, moduleVersion: string): Promise<any> {
    if (moduleName === "@jupyter-widgets/base") return (base as unknown as Exports)[className];
    const mod = registered.find((r) => r.name === moduleName);
    if (!mod) throw new Error(`module ${moduleName}@${moduleVersion} not registered`);
    const cls = mod.exports[className];
    if (!cls) throw new Error(`class ${className} not in ${moduleName}`);
    return cls;
  }
  protected async _create_comm(): Promise<any> { return { on_close() {}, on_msg() {}, close() {}, send() {} }; }
  protected async _get_comm_info(): Promise<{}> { return {}; }
  async display_view(view: base.DOMWidgetView, el: HTMLElement) { Widget.attach(view.luminoWidget, el); }
}

function loadScript(src: string): Promise<void> {
  return new Promise((res, rej) => {
    const s = document.createElement("script");
    s.src = src;
    s.onload = () => res();
    s.onerror = () => rej(new Error(`could not load ${src}`));
    document.head.append(s);
  });
}

async function boot(): Promise<Record<string, unknown>> {
  const meta = await (await fetch("/labextensions/@helicoid/widgets/package.json")).json();
  const name: string = meta.name;
  await loadScript(`/labextensions/@helicoid/widgets/${meta.jupyterlab._build.load}`);
  const container = (window as any)._JUPYTERLAB[name];
  // The share scope of JupyterLab: one entry per package and version, offered by its provider.
  const scope: Record<string, unknown> = {
    "@jupyter-widgets/base": { "6.0.12": { get: () => Promise.resolve(() => base), loaded: 1, from: "jupyterlab_widgets" } },
  };
  await container.init(scope);
  const factory = await container.get(meta.jupyterlab._build.extension);
  const mod = factory();
  const plugins = Array.isArray(mod.default) ? mod.default : [mod.default];
  const plugin = plugins[0];
  const sameToken = plugin.requires[0] === base.IJupyterWidgetRegistry;
  plugin.activate({}, { registerWidget: (d: { name: string; version: string; exports: Exports }) => registered.push(d) });
  const manager = new PageManager();
  const shown: string[] = [];
  const states = (window as any).helicoidTestStates as Array<{ model: string; state: Record<string, unknown>; buffers?: Record<string, number[]> }>;
  for (const s of states) {
    const state: Record<string, unknown> = { ...s.state };
    for (const [k, v] of Object.entries(s.buffers ?? {})) state[k] = new DataView(new Float32Array(v).buffer);
    const model = await manager.new_model({ model_name: s.model, model_module: name, model_module_version: "^0.1.0", model_id: `m-${shown.length}` }, state);
    const view = await manager.create_view(model);
    const host = document.createElement("div");
    host.className = "lab-host";
    document.body.append(host);
    await manager.display_view(view as base.DOMWidgetView, host);
    shown.push(s.model);
  }
  return { pluginId: plugin.id, autoStart: plugin.autoStart, sameToken, registered: registered.map((r) => `${r.name}@${r.version}`), exportsNames: Object.keys(registered[0]?.exports ?? {}).sort(), shown };
}

(window as any).helicoidBoot = boot;
