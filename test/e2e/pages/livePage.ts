/**
 * A page connected to a live kernel behind jupyter-server, the way a notebook front end is:
 * @jupyterlab/services for the kernel connection, @jupyter-widgets/html-manager (a ManagerBase)
 * for the widget models, our module and the standard controls. Widgets opened by the kernel
 * (comm_open on target "jupyter.widget") get models; display bundles of executed code are shown.
 *
 * window.hxLive = { start(kernelName), execute(code) -> {status, text, widgets} }.
 */
import { KernelManager, ServerConnection, type Kernel, type KernelMessage } from "@jupyterlab/services";
import { HTMLManager } from "@jupyter-widgets/html-manager/lib/htmlmanager";
import { shims } from "@jupyter-widgets/base";
import "@lumino/widgets/style/index.css";
import "@jupyter-widgets/controls/css/widgets-base.css";
import "@jupyter-widgets/controls/css/labvariables.css";
import * as ours from "../../../widgets/src/index";

const VIEW = "application/vnd.jupyter.widget-view+json";

class LiveManager extends HTMLManager {
  constructor(private readonly kernel: Kernel.IKernelConnection) {
    super({
      loader: async (name: string) => {
        if (name === "@helicoid/widgets") return ours;
        throw new Error(`no module ${name}`);
      },
    });
    kernel.registerCommTarget(this.comm_target_name, async (comm, msg) => {
      await this.handle_comm_open(new shims.services.Comm(comm), msg as KernelMessage.ICommOpenMsg);
    });
  }
  override async _create_comm(target: string, modelId: string, data?: any, metadata?: any, buffers?: any): Promise<any> {
    const comm = this.kernel.createComm(target, modelId);
    if (data || metadata) comm.open(data, metadata, buffers);
    return new shims.services.Comm(comm);
  }
  override async _get_comm_info(): Promise<any> {
    const reply = await this.kernel.requestCommInfo({ target_name: this.comm_target_name });
    return (reply.content as { comms: Record<string, unknown> }).comms;
  }
}

let kernel: Kernel.IKernelConnection;
let manager: LiveManager;

async function start(name: string): Promise<string> {
  const settings = ServerConnection.makeSettings({ baseUrl: location.origin + "/", wsUrl: location.origin.replace(/^http/, "ws") + "/", token: (window as any).hxToken });
  const km = new KernelManager({ serverSettings: settings });
  await km.ready;
  kernel = await km.startNew({ name });
  manager = new LiveManager(kernel);
  const info = await kernel.info;
  return info.implementation;
}

async function execute(code: string): Promise<{ status: string; text: string; widgets: number }> {
  const future = kernel.requestExecute({ code, store_history: true });
  let text = "";
  let widgets = 0;
  const shows: Promise<void>[] = [];
  future.onIOPub = (msg) => {
    const t = msg.header.msg_type;
    if ((window as any).hxDebug) console.log("iopub", t, JSON.stringify(msg.content).slice(0, 300));
    if (t === "stream") text += (msg.content as { text: string }).text;
    if (t === "error") text += `${(msg.content as { ename: string; evalue: string }).ename}: ${(msg.content as { evalue: string }).evalue}\n`;
    if (t === "display_data" || t === "execute_result") {
      const data = (msg.content as { data: Record<string, any> }).data;
      if (data[VIEW]) {
        widgets++;
        shows.push(
          (async () => {
            const model = await manager.get_model(data[VIEW].model_id);
            const host = document.createElement("div");
            host.className = "hx-live-output";
            document.getElementById("outputs")!.append(host);
            await manager.display_view(await manager.create_view(model), host);
          })(),
        );
      } else if (data["text/plain"]) text += data["text/plain"] + "\n";
    }
  };
  const reply = await future.done;
  await Promise.all(shows);
  return { status: (reply.content as { status: string }).status, text, widgets };
}

(window as any).hxLive = { start, execute, shutdown: () => kernel?.shutdown() };
