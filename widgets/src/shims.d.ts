declare module "plotly.js-cartesian-dist-min" {
  const Plotly: {
    react(el: HTMLElement, data: unknown[], layout?: unknown, config?: unknown): Promise<HTMLElement>;
    newPlot(el: HTMLElement, data: unknown[], layout?: unknown, config?: unknown): Promise<HTMLElement>;
    purge(el: HTMLElement): void;
    Plots: { resize(el: HTMLElement): void };
    [key: string]: unknown;
  };
  export default Plotly;
}
declare module "helicoid:worker-source" {
  /** The worker's source text, or (exported pages) a function that makes it on demand. */
  const source: string | (() => string);
  export default source;
}
declare module "*.css" {
  const css: string;
  export default css;
}
