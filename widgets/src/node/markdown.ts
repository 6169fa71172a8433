/** Markdown to HTML for the notebook exporter (Node side), with marked (GitHub-flavoured). */
import { marked } from "marked";

export function renderMarkdown(source: string): string {
  return marked.parse(source, { async: false, gfm: true }) as string;
}
