/** Model/view names of our widget module (@helicoid/widgets), as the front end registers them. */
import { WIDGET_MODULE, WIDGET_MODULE_VERSION } from "../version.js";
import type { ModelRef } from "./widget.js";

export function ourModel(name: string): { model: ModelRef; view: ModelRef } {
  return {
    model: { name: `${name}Model`, module: WIDGET_MODULE, version: WIDGET_MODULE_VERSION },
    view: { name: `${name}View`, module: WIDGET_MODULE, version: WIDGET_MODULE_VERSION },
  };
}
