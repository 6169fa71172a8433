/** The public packages, as a notebook imports them. */
export * from "@helicoid/lib";
export { table } from "@helicoid/kernel";
