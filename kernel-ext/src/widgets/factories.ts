/**
 * Short factory functions for the standard controls, in our own words:
 * `slider`, `intSlider`, `logSlider`, `textBox`, `dropdown`, `checkbox`, `button`, `html`, `label`,
 * `progress`, `intProgress`, `vbox`, `hbox`, `outputArea`.
 */
import { Box, Button, Checkbox, Dropdown, FloatLogSlider, FloatProgress, FloatSlider, HTML, IntProgress, IntSlider, Label, Output, Text } from "./controls.js";
import type { Widget } from "./widget.js";

export const slider = (o: ConstructorParameters<typeof FloatSlider>[0] = {}) => new FloatSlider(o);
export const intSlider = (o: ConstructorParameters<typeof IntSlider>[0] = {}) => new IntSlider(o);
export const logSlider = (o: ConstructorParameters<typeof FloatLogSlider>[0] = {}) => new FloatLogSlider(o);
export const textBox = (o: ConstructorParameters<typeof Text>[0] = {}) => new Text(o);
export const checkbox = (o: ConstructorParameters<typeof Checkbox>[0] = {}) => new Checkbox(o);
export const dropdown = <T>(o: { options: ReadonlyArray<T | { label: string; value: T }>; value?: T; description?: string; disabled?: boolean }) => new Dropdown<T>(o);
export const button = (o: ConstructorParameters<typeof Button>[0] = {}) => new Button(o);
export const html = (value = "", o: Omit<NonNullable<ConstructorParameters<typeof HTML>[0]>, "value"> = {}) => new HTML({ ...o, value });
export const label = (value = "") => new Label({ value });
export const progress = (o: ConstructorParameters<typeof FloatProgress>[0] = {}) => new FloatProgress(o);
export const intProgress = (o: ConstructorParameters<typeof IntProgress>[0] = {}) => new IntProgress(o);
export const vbox = (children: Widget[]) => new Box("VBox", children);
export const hbox = (children: Widget[]) => new Box("HBox", children);
export const outputArea = () => new Output();
