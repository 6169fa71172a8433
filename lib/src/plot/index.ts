export * from "./symbols.js";
export * from "./calculatorFigure.js";
export * from "./paperSvg.js";
export * from "./fitPanelState.js";
