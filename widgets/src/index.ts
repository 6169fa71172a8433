/**
 * @helicoid/widgets: the widget module "@helicoid/widgets" (models and views of the explorer,
 * figure, texture and fit panel). The JupyterLab plugin and the export bootstrap register it.
 */
import "./style.css";
export { MODULE_NAME, MODULE_VERSION, versionMismatch } from "./version.js";
export { ExplorerModel, ExplorerView } from "./explorer.js";
export { FigureModel, FigureView } from "./figure.js";
export { TextureModel, TextureView } from "./texture.js";
export { FitPanelModel, FitPanelView } from "./fitPanel.js";
