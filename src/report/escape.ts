/** Escaping for HTML and SVG text and attribute values: every string from a record passes through it. */
const ENTITIES: Record<string, string> = { "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" };

export function escapeMarkup(text: string): string {
  return text.replace(/[&<>"']/g, (ch) => ENTITIES[ch]!);
}
