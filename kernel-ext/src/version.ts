/** Version of the kernel package; the widget front end compares its own against it. */
export const KERNEL_VERSION = "0.1.0";
/** The semver range of our widget module the kernel-side models ask for. */
export const WIDGET_MODULE = "@helicoid/widgets";
export const WIDGET_MODULE_VERSION = "^0.1.0";
