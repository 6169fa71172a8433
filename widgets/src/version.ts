/**
 * The identity of our widget module. The kernel sends model_module "@helicoid/widgets" with
 * model_module_version "^0.1.0"; the JupyterLab registry and the export loader answer with these.
 */
export const MODULE_NAME = "@helicoid/widgets";
export const MODULE_VERSION = "0.1.0";

/**
 * Compare the kernel's version with ours. Same major.minor is compatible (0.x: minor is breaking).
 * Returns null when they agree, else a sentence for the view.
 */
export function versionMismatch(kernelVersion: unknown): string | null {
  if (typeof kernelVersion !== "string" || kernelVersion === "") return null;
  const [km, kn] = kernelVersion.split(".");
  const [fm, fn] = MODULE_VERSION.split(".");
  if (km === fm && kn === fn) return null;
  return (
    `Version mismatch: the kernel (@helicoid/kernel ${kernelVersion}) and this front end ` +
    `(@helicoid/widgets ${MODULE_VERSION}) differ. Reinstall both from the same checkout ` +
    `(\`npm run build && helicoid install\`) and reload the page.`
  );
}
