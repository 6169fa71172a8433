/**
 * A notebook front end assembled from JupyterLab 4's own packages, for a plain jupyter-server.
 *
 * - The application is JupyterLab's `JupyterLab` class with its `LabShell` and plugin registry, so
 *   services (the rendermime registry, the notebook tracker, the widget registry) are resolved by
 *   the real application, as in JupyterLab.
 * - Notebooks open through `DocumentManager` + `NotebookWidgetFactory` (CodeMirror editors,
 *   JupyterLab's renderers, Markdown by marked).
 * - The widget manager is the four plugins of `@jupyter-widgets/jupyterlab-manager` (manager, base,
 *   controls, output), unless the page config says `helicoidWidgetManager: false` (used by the
 *   tests to show what a JupyterLab without the widget manager does).
 * - Federated (prebuilt) extensions listed in the page config are loaded the way JupyterLab's
 *   bootstrap loads them: a script tag for `remoteEntry`, `container.init(shareScope)`,
 *   `container.get(extension)`. The share scope offers `@jupyter-widgets/base` (as the Python
 *   package jupyterlab_widgets does in JupyterLab) and the JupyterLab/Lumino packages this page
 *   has, each as one singleton.
 *
 * The page config is read from `<script id="jupyter-config-data">` (written by the launcher, as
 * jupyterlab_server does); the server token is taken from the page address (`?token=`), never
 * stored in the served file. `?path=` opens a notebook; without it the page lists the notebooks of
 * `?dir=` (default: the server's root).
 */
import "@jupyterlab/theme-light-extension/style/variables.css";
import "@jupyterlab/theme-light-extension/style/theme.css";
import "@jupyterlab/application/style/index.css";
import "@jupyterlab/apputils/style/index.css";
import "@jupyterlab/ui-components/style/index.css";
import "@jupyterlab/codemirror/style/index.css";
import "@jupyterlab/cells/style/index.css";
import "@jupyterlab/outputarea/style/index.css";
import "@jupyterlab/rendermime/style/index.css";
import "@jupyterlab/notebook/style/index.css";
import "@jupyterlab/docmanager/style/index.css";
import "./page.css";

import { JupyterLab, LabShell, type JupyterFrontEnd, type JupyterFrontEndPlugin } from "@jupyterlab/application";
import { PageConfig, URLExt } from "@jupyterlab/coreutils";
import { ServiceManager } from "@jupyterlab/services";
import { IRenderMimeRegistry, RenderMimeRegistry, standardRendererFactories, IMarkdownParser } from "@jupyterlab/rendermime";
import { DocumentManager } from "@jupyterlab/docmanager";
import type { IDocumentWidget } from "@jupyterlab/docregistry";
import {
  INotebookTracker, NotebookActions, NotebookModelFactory, NotebookPanel, NotebookTracker, NotebookWidgetFactory, StaticNotebook,
} from "@jupyterlab/notebook";
import {
  CodeMirrorEditorFactory, CodeMirrorMimeTypeService, EditorExtensionRegistry, EditorLanguageRegistry, EditorThemeRegistry,
  IEditorLanguageRegistry, ybinding,
} from "@jupyterlab/codemirror";
import { ToolbarButton } from "@jupyterlab/apputils";
import { Signal } from "@lumino/signaling";
import type { Widget } from "@lumino/widgets";
import markedParser from "@jupyterlab/markedparser-extension";
import widgetManagerPlugins from "@jupyter-widgets/jupyterlab-manager";
import * as jupyterWidgetsBase from "@jupyter-widgets/base";
import * as luminoWidgets from "@lumino/widgets";
import * as luminoCoreutils from "@lumino/coreutils";
import * as luminoSignaling from "@lumino/signaling";
import * as jlabServices from "@jupyterlab/services";
import * as jlabCoreutils from "@jupyterlab/coreutils";
import * as jlabRendermime from "@jupyterlab/rendermime";
import * as jlabApplication from "@jupyterlab/application";
import * as jlabNotebook from "@jupyterlab/notebook";
import applicationPackage from "@jupyterlab/application/package.json";
import basePackage from "@jupyter-widgets/base/package.json";
import servicesPackage from "@jupyterlab/services/package.json";
import coreutilsPackage from "@jupyterlab/coreutils/package.json";
import rendermimePackage from "@jupyterlab/rendermime/package.json";
import notebookPackage from "@jupyterlab/notebook/package.json";
import luminoWidgetsPackage from "@lumino/widgets/package.json";
import luminoCoreutilsPackage from "@lumino/coreutils/package.json";
import luminoSignalingPackage from "@lumino/signaling/package.json";

interface FederatedExtension { name: string; load: string; extension?: string; style?: string }
type ShareScope = Record<string, Record<string, { get: () => Promise<() => unknown>; from: string; eager: boolean; loaded: number }>>;

const config = (() => {
  const el = document.getElementById("jupyter-config-data");
  return el ? (JSON.parse(el.textContent || "{}") as Record<string, unknown>) : {};
})();
const query = new URLSearchParams(location.search);
const withWidgetManager = config.helicoidWidgetManager !== false && query.get("widgets") !== "off";

// What JupyterLab's page config carries; the token comes from the address only.
PageConfig.setOption("baseUrl", String(config.baseUrl ?? "/"));
PageConfig.setOption("token", query.get("token") ?? "");
PageConfig.setOption("appName", "Helicoid lab front end");
PageConfig.setOption("appVersion", applicationPackage.version);

/** The packages this page shares with federated extensions, one version each (singletons). */
function shareScope(): ShareScope {
  const offer: Record<string, [string, unknown]> = {
    "@lumino/widgets": [luminoWidgetsPackage.version, luminoWidgets],
    "@lumino/coreutils": [luminoCoreutilsPackage.version, luminoCoreutils],
    "@lumino/signaling": [luminoSignalingPackage.version, luminoSignaling],
    "@jupyterlab/services": [servicesPackage.version, jlabServices],
    "@jupyterlab/coreutils": [coreutilsPackage.version, jlabCoreutils],
    "@jupyterlab/rendermime": [rendermimePackage.version, jlabRendermime],
    "@jupyterlab/application": [applicationPackage.version, jlabApplication],
    "@jupyterlab/notebook": [notebookPackage.version, jlabNotebook],
  };
  // jupyterlab_widgets (the widget manager) is what offers @jupyter-widgets/base in JupyterLab.
  if (withWidgetManager) offer["@jupyter-widgets/base"] = [basePackage.version, jupyterWidgetsBase];
  const scope: ShareScope = {};
  for (const [name, [version, mod]] of Object.entries(offer)) {
    scope[name] = { [version]: { get: () => Promise.resolve(() => mod), from: "@helicoid/lab-frontend", eager: true, loaded: 1 } };
  }
  return scope;
}

function loadScript(url: string): Promise<void> {
  return new Promise((res, rej) => {
    const s = document.createElement("script");
    s.src = url;
    s.onload = () => res();
    s.onerror = () => rej(new Error(`could not load ${url}`));
    document.head.appendChild(s);
  });
}

/** JupyterLab's bootstrap for one federated extension; returns its plugins. */
async function loadFederated(ext: FederatedExtension, scope: ShareScope): Promise<JupyterFrontEndPlugin<unknown>[]> {
  const base = String(config.fullLabextensionsUrl ?? URLExt.join(PageConfig.getBaseUrl(), "static"));
  await loadScript(URLExt.join(base, ext.name, ext.load));
  const containers = (window as unknown as { _JUPYTERLAB: Record<string, { init(s: unknown): Promise<void>; get(m: string): Promise<() => unknown> }> })._JUPYTERLAB;
  const container = containers?.[ext.name];
  if (!container) throw new Error(`${ext.name}: its remoteEntry did not register a container`);
  await container.init(scope);
  const factory = await container.get(ext.extension ?? "./extension");
  const mod = factory() as { default?: unknown; __esModule?: boolean };
  const exported = mod && Object.prototype.hasOwnProperty.call(mod, "__esModule") ? mod.default : (mod.default ?? mod);
  return (Array.isArray(exported) ? exported : [exported]) as JupyterFrontEndPlugin<unknown>[];
}

function editorSetup() {
  const languages = new EditorLanguageRegistry();
  for (const lang of EditorLanguageRegistry.getDefaultLanguages()) languages.addLanguage(lang);
  const themes = new EditorThemeRegistry();
  for (const theme of EditorThemeRegistry.getDefaultThemes()) themes.addTheme(theme);
  const extensions = new EditorExtensionRegistry();
  for (const f of EditorExtensionRegistry.getDefaultExtensions({ themes })) extensions.addExtension(f);
  extensions.addExtension({
    name: "shared-model-binding",
    factory: (options) => {
      const shared = options.model.sharedModel as unknown as { ysource: never; undoManager?: never };
      return EditorExtensionRegistry.createImmutableExtension(ybinding({ ytext: shared.ysource, undoManager: shared.undoManager ?? undefined }));
    },
  });
  const factory = new CodeMirrorEditorFactory({ extensions, languages });
  return { languages, factory, mimeTypes: new CodeMirrorMimeTypeService(languages) };
}

const editors = editorSetup();
const tracker = new NotebookTracker({ namespace: "helicoid-lab" });

const languagesPlugin: JupyterFrontEndPlugin<unknown> = {
  id: "@helicoid/lab-frontend:languages",
  provides: IEditorLanguageRegistry,
  autoStart: true,
  activate: () => editors.languages,
};

const rendermimePlugin: JupyterFrontEndPlugin<unknown> = {
  id: "@helicoid/lab-frontend:rendermime",
  provides: IRenderMimeRegistry,
  optional: [IMarkdownParser],
  autoStart: true,
  activate: (_app: JupyterFrontEnd, markdownParser: unknown) =>
    new RenderMimeRegistry({ initialFactories: standardRendererFactories, markdownParser: (markdownParser as never) ?? undefined }),
};

const trackerPlugin: JupyterFrontEndPlugin<unknown> = {
  id: "@helicoid/lab-frontend:tracker",
  provides: INotebookTracker,
  autoStart: true,
  activate: () => tracker,
};

/** What the page reports to scripts (and the tests): the open notebook and how to run it. */
const pageApi: {
  ready: Promise<void>;
  app?: JupyterLab;
  panel?: NotebookPanel;
  runAll?: () => Promise<boolean>;
  errors?: () => { cell: number; text: string }[];
  save?: () => Promise<void>;
  execute?: (code: string) => Promise<{ status: string; text: string }>;
} = { ready: Promise.resolve() };
(window as unknown as { helicoidLab: typeof pageApi }).helicoidLab = pageApi;

function errorsOf(panel: NotebookPanel): { cell: number; text: string }[] {
  const found: { cell: number; text: string }[] = [];
  const cells = panel.content.model!.cells;
  for (let i = 0; i < cells.length; i++) {
    const cell = cells.get(i);
    if (cell.type !== "code") continue;
    const outputs = (cell as unknown as { outputs: { toJSON(): Array<Record<string, unknown>> } }).outputs.toJSON();
    for (const o of outputs) {
      if (o.output_type === "error") found.push({ cell: i, text: `${o.ename}: ${o.evalue}` });
      else if (o.output_type === "stream" && o.name === "stderr") found.push({ cell: i, text: String(o.text) });
    }
  }
  return found;
}

const notebookPlugin: JupyterFrontEndPlugin<void> = {
  id: "@helicoid/lab-frontend:notebook",
  requires: [IRenderMimeRegistry],
  autoStart: true,
  activate: (app: JupyterFrontEnd, rendermime: unknown) => {
    const path = query.get("path");
    if (!path) return void listNotebooks(app);
    const opened = new Signal<unknown, IDocumentWidget>({});
    const docManager = new DocumentManager({
      registry: app.docRegistry,
      manager: app.serviceManager,
      opener: { open: (w: Widget) => { app.shell.add(w, "main"); app.shell.activateById(w.id); }, opened } as never,
    });
    const contentFactory = new NotebookPanel.ContentFactory({ editorFactory: editors.factory.newInlineEditor });
    app.docRegistry.addModelFactory(new NotebookModelFactory({}));
    const wFactory = new NotebookWidgetFactory({
      name: "Notebook", modelName: "notebook", fileTypes: ["notebook"], defaultFor: ["notebook"],
      preferKernel: true, canStartKernel: true,
      rendermime: rendermime as IRenderMimeRegistry, contentFactory, mimeTypeService: editors.mimeTypes,
      notebookConfig: { ...StaticNotebook.defaultNotebookConfig, windowingMode: "none" },
    });
    app.docRegistry.addWidgetFactory(wFactory);
    const panel = docManager.open(path) as NotebookPanel;
    if (!panel) throw new Error(`cannot open ${path}`);
    void tracker.add(panel);
    const run = async () => NotebookActions.runAll(panel.content, panel.sessionContext);
    panel.toolbar.insertItem(0, "run-all", new ToolbarButton({ label: "Run all", tooltip: "Run every cell", className: "hx-run-all", onClick: () => void run() }));
    panel.toolbar.insertItem(1, "restart", new ToolbarButton({ label: "Restart kernel", className: "hx-restart", onClick: () => void panel.sessionContext.restartKernel() }));
    panel.toolbar.insertItem(2, "save", new ToolbarButton({ label: "Save", className: "hx-save", onClick: () => void panel.context.save() }));
    app.commands.addCommand("helicoid-lab:run-and-advance", {
      label: "Run cell and select next",
      execute: () => NotebookActions.runAndAdvance(panel.content, panel.sessionContext),
    });
    app.commands.addKeyBinding({ command: "helicoid-lab:run-and-advance", keys: ["Shift Enter"], selector: ".jp-Notebook" });
    pageApi.panel = panel;
    pageApi.runAll = async () => {
      await panel.context.ready;
      await panel.sessionContext.ready;
      return run();
    };
    pageApi.errors = () => errorsOf(panel);
    pageApi.save = () => panel.context.save();
    // Run code in the notebook's kernel outside the cells (scripts, tests): its status and printed/result text.
    pageApi.execute = async (code: string) => {
      const kernel = panel.sessionContext.session?.kernel;
      if (!kernel) throw new Error("no kernel");
      let text = "";
      const future = kernel.requestExecute({ code, store_history: false });
      future.onIOPub = (msg) => {
        const c = msg.content as { text?: string; data?: Record<string, unknown>; ename?: string; evalue?: string };
        if (msg.header.msg_type === "stream") text += c.text ?? "";
        else if (msg.header.msg_type === "execute_result" || msg.header.msg_type === "display_data") text += String(c.data?.["text/plain"] ?? "");
        else if (msg.header.msg_type === "error") text += `${c.ename}: ${c.evalue}`;
      };
      const reply = await future.done;
      return { status: String((reply.content as { status: string }).status), text };
    };
  },
};

async function listNotebooks(app: JupyterFrontEnd): Promise<void> {
  const dir = query.get("dir") ?? "";
  const box = document.createElement("div");
  box.className = "hx-lab-listing";
  const title = document.createElement("h2");
  title.textContent = `Notebooks in ${dir || "the server's folder"}`;
  box.appendChild(title);
  const list = document.createElement("ul");
  box.appendChild(list);
  document.body.appendChild(box);
  const model = await app.serviceManager.contents.get(dir, { content: true });
  for (const item of (model.content as Array<{ name: string; path: string; type: string }>).sort((a, b) => a.name.localeCompare(b.name))) {
    if (item.type !== "notebook" && item.type !== "directory") continue;
    const li = document.createElement("li");
    const a = document.createElement("a");
    const q = new URLSearchParams(location.search);
    q.delete(item.type === "notebook" ? "dir" : "path");
    q.set(item.type === "notebook" ? "path" : "dir", item.path);
    a.href = `?${q.toString()}`;
    a.textContent = item.type === "directory" ? `${item.name}/` : item.name;
    li.appendChild(a);
    list.appendChild(li);
  }
}

function banner(text: string): void {
  const el = document.createElement("div");
  el.className = "hx-lab-banner";
  el.setAttribute("role", "alert");
  el.textContent = text;
  document.body.insertBefore(el, document.getElementById("main"));
}

async function main(): Promise<void> {
  const serviceManager = new ServiceManager();
  const app = new JupyterLab({ shell: new LabShell({ waitForRestore: false } as never), serviceManager });
  pageApi.app = app;
  app.registerPlugins([languagesPlugin, rendermimePlugin, trackerPlugin, notebookPlugin, ...([] as JupyterFrontEndPlugin<unknown>[]).concat(markedParser as never)]);
  if (withWidgetManager) app.registerPlugins(widgetManagerPlugins as unknown as JupyterFrontEndPlugin<unknown>[]);
  const scope = shareScope();
  for (const ext of (config.federated_extensions ?? []) as FederatedExtension[]) {
    try {
      app.registerPlugins(await loadFederated(ext, scope));
    } catch (err) {
      // JupyterLab logs such a failure to the console only; this page says it.
      console.error(`extension ${ext.name} failed to load`, err);
      banner(`The extension ${ext.name} failed to load: ${(err as Error).message}`);
    }
  }
  await app.start({ hostID: "main" } as never);
  const shell = app.shell as LabShell;
  shell.mode = "single-document";
  shell.collapseLeft();
  shell.collapseRight();
  const header = document.getElementById("hx-lab-header");
  if (header) header.textContent = `Helicoid: a notebook front end built from JupyterLab ${app.version} packages${withWidgetManager ? ", with the Jupyter widget manager" : ", WITHOUT the Jupyter widget manager"}`;
}

pageApi.ready = main().catch((err) => {
  banner(`The front end failed to start: ${(err as Error).message}`);
  throw err;
});
