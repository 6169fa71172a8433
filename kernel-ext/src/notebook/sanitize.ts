/**
 * What an exported page shows of an untrusted notebook. A notebook received from someone else is
 * untrusted, as Jupyter treats it: its Markdown and HTML may carry script (a `<script>`, an
 * `onerror` attribute, a `javascript:` link, an `<iframe srcdoc>`). We clean that HTML with
 * sanitize-html (the library JupyterLab's own sanitizer is built on; it parses with htmlparser2
 * and keeps only listed tags, attributes and URL schemes, so it needs no DOM in Node), keep SVG
 * images as images (an SVG in an `<img>` never runs script), and accept image data only in the
 * strict base64 alphabet. `helicoid export --trusted` keeps raw HTML for notebooks you trust.
 */
import sanitizeHtml from "sanitize-html";

const TAGS = [
  ...sanitizeHtml.defaults.allowedTags,
  "img",
  "h1",
  "h2",
  "h3",
  "h4",
  "h5",
  "h6",
  "span",
  "div",
  "sub",
  "sup",
  "details",
  "summary",
  "del",
  "s",
  "ins",
  "kbd",
  "samp",
  "var",
  "small",
  "mark",
  "abbr",
  "dfn",
  "figure",
  "figcaption",
  "input",
  "colgroup",
  "col",
  "center",
];

const OPTIONS: sanitizeHtml.IOptions = {
  allowedTags: TAGS,
  allowedAttributes: {
    // No id or name: an element named like a global of the page's script could shadow it.
    "*": ["class", "title", "lang", "dir", "align", "style"],
    a: ["href", "target", "rel"],
    img: ["src", "alt", "width", "height"],
    td: ["colspan", "rowspan"],
    th: ["colspan", "rowspan", "scope"],
    ol: ["start", "type"],
    details: ["open"],
    // Task-list checkboxes of GitHub Markdown only.
    input: ["type", "checked", "disabled"],
    col: ["span"],
    colgroup: ["span"],
  },
  allowedSchemes: ["http", "https", "mailto"],
  allowedSchemesByTag: { img: ["http", "https", "data"] },
  allowProtocolRelative: false,
  // Styles: plain layout properties only (no url(), no expression()).
  allowedStyles: {
    "*": {
      color: [/^[#\w(),.\s%-]+$/],
      "background-color": [/^[#\w(),.\s%-]+$/],
      "text-align": [/^(left|right|center|justify)$/],
      "font-weight": [/^\w+$/],
      "font-style": [/^\w+$/],
      width: [/^[\d.]+(px|em|%)?$/],
      height: [/^[\d.]+(px|em|%)?$/],
      margin: [/^[\d.\spxem%-]+$/],
      padding: [/^[\d.\spxem%-]+$/],
      border: [/^[\w\s#.]+$/],
    },
  },
  transformTags: {
    a: (tagName, attribs) => ({ tagName, attribs: { ...attribs, rel: "noopener noreferrer nofollow" } }),
    input: (tagName, attribs) => (attribs.type === "checkbox" ? { tagName, attribs: { ...attribs, disabled: "" } } : { tagName: "span", attribs: {} }),
  },
  exclusiveFilter: (frame) => frame.tag === "img" && /^data:/i.test(frame.attribs.src ?? "") && !isImageDataUrl(frame.attribs.src!),
};

/** HTML of an untrusted notebook with every way to run script removed. */
export function sanitizeUntrustedHtml(html: string): string {
  return sanitizeHtml(html, OPTIONS);
}

/** Strict base64 (RFC 4648 alphabet, padding only at the end), whitespace removed first. Null when invalid. */
export function strictBase64(data: string): string | null {
  const s = data.replace(/[\r\n\t ]/g, "");
  if (s.length === 0 || s.length % 4 !== 0 || !/^[A-Za-z0-9+/]*={0,2}$/.test(s)) return null;
  return s;
}

/** A data: URL of a raster image in strict base64 (nothing else in an untrusted page's img src). */
export function isImageDataUrl(url: string): boolean {
  const m = /^data:image\/(png|jpeg|gif|webp);base64,(.*)$/is.exec(url);
  return !!m && strictBase64(m[2]!) !== null;
}
