/**
 * Stand-in for @jupyter-widgets/base7 and controls7 (ipywidgets 7) in exported pages: Helicoid's
 * kernel speaks widget protocol 2 (controls 2.0.0), so the pages leave the version-7 models out
 * (about 230 kB) and say so if a notebook asks for them.
 */
const message = "widgets of ipywidgets 7 (@jupyter-widgets/controls 1.x) are not included in Helicoid's exported pages";
export default new Proxy(
  {},
  {
    get(_t, name) {
      if (name === "__esModule" || typeof name === "symbol") return undefined;
      throw new Error(`${message} (asked for ${String(name)})`);
    },
  },
);
