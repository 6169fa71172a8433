/**
 * Stand-in for the npm package sanitize-html in exported pages (about 240 kB with postcss,
 * htmlparser2 and entities). In a page, the exporter has already sanitized every piece of HTML of
 * an untrusted notebook in Node with the real sanitize-html (kernel-ext notebook/sanitize.ts), and
 * the page renders Output widgets as trusted, so the two callers left (the widget manager's
 * `inline_sanitize` of descriptions and JupyterLab's Sanitizer as a fallback) are served by this
 * allow-list sanitizer on the browser's inert DOMParser document. It follows the options it is given
 * (allowedTags, allowedAttributes with "*" and "prefix-*" patterns, allowedSchemes and
 * allowedSchemesByTag, transformTags made by simpleTransform) and is stricter where it differs:
 * script-like elements, event-handler attributes, and styles or URLs that could load or run code
 * are always removed. Common practice, no source.
 */
type AttributeRule = string | { name: string };
export interface SanitizeOptions {
  allowedTags?: string[] | false;
  allowedAttributes?: Record<string, AttributeRule[]> | false;
  allowedSchemes?: string[];
  allowedSchemesByTag?: Record<string, string[]>;
  transformTags?: Record<string, unknown>;
  [other: string]: unknown;
}

/** Elements dropped with their content (never kept, whatever the options say). */
const DROP = new Set([
  "script",
  "style",
  "textarea",
  "option",
  "noscript",
  "template",
  "iframe",
  "object",
  "embed",
  "frame",
  "frameset",
  "applet",
  "base",
  "meta",
  "link",
  "title",
  "xmp",
  "noembed",
  "noframes",
  "plaintext",
  "svg",
  "math",
]);
const URL_ATTRIBUTES = new Set(["href", "src", "cite", "action", "formaction", "poster", "background", "xlink:href", "longdesc", "usemap", "srcset", "data"]);
const defaults = {
  allowedTags: [
    "a",
    "abbr",
    "b",
    "blockquote",
    "br",
    "code",
    "div",
    "em",
    "h1",
    "h2",
    "h3",
    "h4",
    "h5",
    "h6",
    "hr",
    "i",
    "li",
    "ol",
    "p",
    "pre",
    "span",
    "strong",
    "sub",
    "sup",
    "table",
    "tbody",
    "td",
    "th",
    "thead",
    "tr",
    "ul",
  ],
  allowedAttributes: { a: ["href", "name", "target"], img: ["src", "alt", "title", "width", "height"] } as Record<string, AttributeRule[]>,
  allowedSchemes: ["http", "https", "ftp", "mailto", "tel"],
};

interface Transform {
  (tagName: string, attribs: Record<string, string>): { tagName: string; attribs: Record<string, string> };
}
function simpleTransform(tagName: string, attribs: Record<string, string>, merge = true): Transform {
  return (_tag, old) => ({ tagName, attribs: merge ? { ...old, ...attribs } : { ...attribs } });
}

function attributeAllowed(rules: Record<string, AttributeRule[]> | false, tag: string, name: string): boolean {
  if (rules === false) return true;
  for (const list of [rules[tag], rules["*"]]) {
    for (const rule of list ?? []) {
      const r = typeof rule === "string" ? rule : rule.name;
      if (r === name || (r.endsWith("*") && name.startsWith(r.slice(0, -1)))) return true;
    }
  }
  return false;
}

function urlAllowed(value: string, schemes: string[]): boolean {
  // Control characters and spaces are ignored by browsers inside a scheme ("java\nscript:").
  const v = value.replace(/[\u0000-\u0020\u007f-\u009f]/g, "");
  const m = /^([a-zA-Z][a-zA-Z0-9+.-]*):/.exec(v);
  if (!m) return !v.startsWith("//") || schemes.includes("http") || schemes.includes("https"); // relative
  return schemes.includes(m[1]!.toLowerCase());
}

function styleAllowed(value: string): boolean {
  return !/url\s*\(|expression\s*\(|@import|javascript:|behavior\s*:|-moz-binding/i.test(value);
}

function clean(node: Node, o: Required<Pick<SanitizeOptions, "allowedSchemes">> & SanitizeOptions): void {
  for (const child of Array.from(node.childNodes)) {
    if (child.nodeType === 3) continue; // text
    if (child.nodeType !== 1) {
      child.remove();
      continue;
    } // comments, processing instructions
    const el = child as Element;
    let tag = el.localName.toLowerCase();
    if (DROP.has(tag)) {
      el.remove();
      continue;
    }
    clean(el, o);
    let attribs: Record<string, string> = {};
    for (const a of Array.from(el.attributes)) attribs[a.name.toLowerCase()] = a.value;
    const t = o.transformTags?.[tag];
    if (typeof t === "function") ({ tagName: tag, attribs } = (t as Transform)(tag, attribs));
    else if (typeof t === "string") tag = t;
    tag = tag.toLowerCase();
    const tagAllowed = o.allowedTags === false ? true : (o.allowedTags ?? defaults.allowedTags).includes(tag);
    if (!tagAllowed || DROP.has(tag)) {
      el.replaceWith(...Array.from(el.childNodes));
      continue;
    }
    const out = el.ownerDocument.createElement(tag);
    const schemes = o.allowedSchemesByTag?.[tag] ?? o.allowedSchemes;
    for (const [name, value] of Object.entries(attribs)) {
      if (name.startsWith("on") || !attributeAllowed(o.allowedAttributes ?? defaults.allowedAttributes, tag, name)) continue;
      if (URL_ATTRIBUTES.has(name) && !value.split(name === "srcset" ? "," : /$^/).every((u) => urlAllowed(u.trim().split(/\s+/)[0] ?? "", schemes))) continue;
      if (name === "style" && !styleAllowed(value)) continue;
      try {
        out.setAttribute(name, value);
      } catch {
        /* a name the DOM refuses is left out */
      }
    }
    out.append(...Array.from(el.childNodes));
    el.replaceWith(out);
  }
}

function sanitize(dirty: string, options: SanitizeOptions = {}): string {
  if (typeof dirty !== "string" || dirty === "") return "";
  const doc = new DOMParser().parseFromString(`<!DOCTYPE html><html><body>${dirty}</body></html>`, "text/html");
  clean(doc.body, { ...options, allowedSchemes: options.allowedSchemes ?? defaults.allowedSchemes });
  return doc.body.innerHTML;
}
sanitize.defaults = defaults;
sanitize.simpleTransform = simpleTransform;

export default sanitize;
