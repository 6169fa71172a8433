/** The explorer's plot figures: built by @helicoid/lib (lib/src/plot/), shared with the kernel's export. */
export { plotFigure, currentMarkFor, axisUnit, axisTitle, PLOT_MARGIN, type PlotFigure, type CurrentMark } from "@helicoid/lib";
