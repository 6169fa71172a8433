/** Small DOM helpers shared by the views. */

/** Create an element with attributes; `text` sets its text content. */
export function el(tag: string, attrs: Record<string, string> = {}): HTMLElement {
  const node = document.createElement(tag);
  for (const [k, v] of Object.entries(attrs)) {
    if (k === "text") node.textContent = v;
    else if (k === "class") node.className = v;
    else node.setAttribute(k, v);
  }
  return node;
}

/** True when the view lives in an exported page with no kernel behind it. */
export function isStaticPage(view: { model: { widget_manager: unknown } }): boolean {
  const m = view.model.widget_manager as { helicoidStatic?: boolean };
  return m?.helicoidStatic === true;
}

/** Put text on the clipboard; false when the page may not (then the view shows it to copy by hand). */
export async function copyText(text: string): Promise<boolean> {
  try {
    if (navigator.clipboard && window.isSecureContext) {
      await navigator.clipboard.writeText(text);
      return true;
    }
  } catch {
    /* fall through */
  }
  try {
    const area = document.createElement("textarea");
    area.value = text;
    area.style.position = "fixed";
    area.style.opacity = "0";
    document.body.append(area);
    area.select();
    const ok = document.execCommand("copy");
    area.remove();
    return ok;
  } catch {
    return false;
  }
}
