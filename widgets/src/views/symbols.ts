/** Catalogue symbols as plotly text: see lib/src/plot/symbols.ts. */
export { symbolHtml, symbolText, withoutArgument } from "@helicoid/lib";
