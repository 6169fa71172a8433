/**
 * Bootstrap of exported pages (no kernel, no network): renders the saved widget state of the
 * page with @jupyter-widgets/html-manager, our module and the standard controls, and draws the
 * notebook's plotly outputs. Catalogue explorers stay live (they compute in the page).
 *
 * The page holds one <script type="application/vnd.jupyter.widget-state+json"> and, where each
 * widget was displayed, <script type="application/vnd.jupyter.widget-view+json">; plotly outputs
 * are <script type="application/vnd.plotly.v1+json"> tags.
 */
// The runtime's CSS (lumino, the controls' widgets-base and labvariables) comes with it: src/pageVendor.ts.
import { HTMLManager } from "@jupyter-widgets/html-manager/lib/htmlmanager";
import { RenderMimeRegistry, standardRendererFactories } from "@jupyterlab/rendermime";
import type { IRenderMime } from "@jupyterlab/rendermime-interfaces";
import { Widget as LuminoWidget } from "@lumino/widgets";
import { marked } from "marked";
import * as ours from "./index.js";
import { MODULE_NAME, MODULE_VERSION } from "./version.js";
import { Plotly, unsupportedTraces } from "./plotly.js";

const PLOTLY_MIME = "application/vnd.plotly.v1+json";
const WIDGET_MIME = "application/vnd.jupyter.widget-view+json";

/** Plotly outputs inside Output widgets (e.g. a control panel's figure), drawn with the page's plotly. */
class PlotlyRenderer extends LuminoWidget implements IRenderMime.IRenderer {
  async renderModel(model: IRenderMime.IMimeModel): Promise<void> {
    const fig = model.data[PLOTLY_MIME] as { data?: unknown[]; layout?: Record<string, unknown>; config?: Record<string, unknown> };
    this.node.classList.add("hx-plotly-output");
    await Plotly.react(this.node, fig.data ?? [], { autosize: true, ...(fig.layout ?? {}) }, { displaylogo: false, responsive: true, ...(fig.config ?? {}) });
  }
}

class StaticManager extends HTMLManager {
  /** Read by our views: there is no kernel behind this page. */
  readonly helicoidStatic = true;

  constructor(options: ConstructorParameters<typeof HTMLManager>[0]) {
    super(options);
    // Output widgets' contents: the standard renderers with a Markdown parser (marked), plotly
    // figures, and nested widgets (the factory html-manager registered).
    const widgetFactory = this.renderMime.getFactory(WIDGET_MIME);
    this.renderMime = new RenderMimeRegistry({
      initialFactories: standardRendererFactories,
      markdownParser: { render: async (source: string) => marked.parse(source, { async: false, gfm: true }) as string },
    });
    if (widgetFactory) this.renderMime.addFactory(widgetFactory, 0);
    this.renderMime.addFactory({ safe: true, mimeTypes: [PLOTLY_MIME], createRenderer: () => new PlotlyRenderer() }, 1);
  }
}

function makeManager(): StaticManager {
  return new StaticManager({
    loader: async (name: string, version: string) => {
      if (name === MODULE_NAME) return ours;
      throw new Error(`Widget module ${name}@${version} is not in this page (only ${MODULE_NAME} ${MODULE_VERSION} and the standard controls are)`);
    },
  });
}

/** Resolves in a later task (the browser may paint and handle input in between). */
function nextTask(): Promise<void> {
  return new Promise((resolve) => setTimeout(resolve, 0));
}

async function renderWidgets(root: ParentNode): Promise<number> {
  const stateTag = root.querySelector('script[type="application/vnd.jupyter.widget-state+json"]');
  if (!stateTag) return 0;
  const manager = makeManager();
  const state = JSON.parse(stateTag.textContent || "{}");
  const saved = (state.state ?? {}) as Record<string, { model_name?: string; model_module?: string; state?: unknown }>;
  const pick = (ids: string[]) => ({ ...state, state: Object.fromEntries(ids.map((id) => [id, saved[id]])) });
  // Live explorers first (what a reader can move): their models (ours, referring to no other model)
  // are made and drawn before the rest of the state, so the standard controls' module is not even
  // loaded before them; then the rest in page order. One view per task, so that no task draws every
  // figure of the page.
  const liveIds = new Set(
    Object.keys(saved).filter(
      (id) => saved[id]!.model_module === MODULE_NAME && saved[id]!.model_name === "ExplorerModel" && !JSON.stringify(saved[id]!.state ?? {}).includes('"IPY_MODEL_'),
    ),
  );
  const models = new Map<string, Awaited<ReturnType<typeof manager.set_state>>[number]>();
  const make = async (ids: string[]) => {
    if (ids.length) for (const m of await manager.set_state(pick(ids))) models.set(m.model_id, m);
  };
  const tags = Array.from(root.querySelectorAll('script[type="application/vnd.jupyter.widget-view+json"]')).map((tag) => {
    const { model_id } = JSON.parse(tag.textContent || "{}");
    return { tag, model_id: model_id as string };
  });
  const live = (id: string) => (liveIds.has(id) ? 0 : 1);
  tags.sort((a, b) => live(a.model_id) - live(b.model_id));
  await make([...liveIds]);
  let shown = 0;
  let restMade = false;
  for (const { tag, model_id } of tags) {
    await nextTask();
    if (!restMade && !liveIds.has(model_id)) {
      restMade = true;
      await make(Object.keys(saved).filter((id) => !liveIds.has(id)));
    }
    const model = models.get(model_id);
    const host = document.createElement("div");
    host.className = "widget-subarea hx-widget-host";
    tag.parentElement!.insertBefore(host, tag);
    if (!model) {
      host.textContent = `(widget ${model_id} has no saved state)`;
      host.classList.add("hx-error");
      continue;
    }
    try {
      const view = await manager.create_view(model);
      await manager.display_view(view, host);
      shown++;
      // Standard controls were driven by kernel code: say that they only show their last state.
      const module = model.get("_model_module") as string;
      if (module === "@jupyter-widgets/controls" && model.get("_model_name") !== "OutputModel") {
        const note = document.createElement("div");
        note.className = "hx-static-note";
        note.textContent = "Kernel widget: its last state is shown; it runs only with the kernel (open the notebook in Jupyter with the helicoid kernel).";
        host.after(note);
      }
      tag.parentElement!.querySelector(".hx-widget-fallback")?.remove();
    } catch (err) {
      host.textContent = `Could not show widget ${model_id}: ${(err as Error)?.message ?? String(err)}`;
      host.classList.add("hx-error");
    }
  }
  if (!restMade) await make(Object.keys(saved).filter((id) => !liveIds.has(id)));
  return shown;
}

async function renderPlotly(root: ParentNode): Promise<number> {
  const tags = Array.from(root.querySelectorAll('script[type="application/vnd.plotly.v1+json"]'));
  for (const tag of tags) {
    await nextTask();
    const fig = JSON.parse(tag.textContent || "{}");
    const host = document.createElement("div");
    host.className = "hx-plotly-output";
    tag.parentElement!.insertBefore(host, tag);
    tag.parentElement!.querySelector(".hx-plotly-fallback")?.remove();
    const bad = unsupportedTraces(fig.data ?? []);
    if (bad.length)
      host.before(Object.assign(document.createElement("div"), { className: "hx-error", textContent: `This page's plotly bundle cannot draw trace type(s): ${bad.join(", ")}` }));
    await Plotly.newPlot(host, fig.data ?? [], { autosize: true, ...(fig.layout ?? {}) }, { displaylogo: false, responsive: true, ...(fig.config ?? {}) });
  }
  return tags.length;
}

async function start(): Promise<void> {
  const body = document.body;
  try {
    // widgets (the explorers first) before the notebook's plain plotly outputs
    const w = await renderWidgets(document);
    const p = await renderPlotly(document);
    body.dataset.helicoidWidgets = String(w);
    body.dataset.helicoidPlots = String(p);
  } catch (err) {
    console.error(err);
    const box = document.createElement("div");
    box.className = "hx-error";
    box.textContent = `The page's widgets could not be rendered: ${(err as Error)?.message ?? String(err)}`;
    body.prepend(box);
  } finally {
    body.dataset.helicoidReady = "1";
  }
}

(globalThis as Record<string, unknown>).helicoidWidgets = { ...ours, renderWidgets, renderPlotly, Plotly };
if (document.readyState === "loading") document.addEventListener("DOMContentLoaded", () => void start());
else void start();
