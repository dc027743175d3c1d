/** A small element builder: the pages are built from data, never from HTML strings. */

type Child = Node | string | number | null | undefined | false;
type Attributes = Record<string, string | number | boolean | null | undefined>;

/** Creates an element; `on*` attributes are refused so no handler can be inline (strict CSP). */
export function h<K extends keyof HTMLElementTagNameMap>(tag: K, attributes: Attributes = {}, ...children: Child[]): HTMLElementTagNameMap[K] {
  const element = document.createElement(tag);
  setAttributes(element, attributes);
  append(element, ...children);
  return element;
}

function setAttributes(element: Element, attributes: Attributes): void {
  for (const [name, value] of Object.entries(attributes)) {
    if (name.startsWith("on")) throw new Error(`inline handler ${name} refused`);
    if (value === false || value === null || value === undefined) continue;
    element.setAttribute(name, value === true ? "" : String(value));
  }
}

function append(parent: Node, ...children: Child[]): void {
  for (const child of children) {
    if (child === null || child === undefined || child === false) continue;
    parent.appendChild(typeof child === "string" || typeof child === "number" ? document.createTextNode(String(child)) : child);
  }
}

export function replaceChildren(parent: Element, ...children: Child[]): void {
  parent.replaceChildren();
  append(parent, ...children);
}

/** "allocationRatio" → "Allocation ratio"; short symbols such as p0 or n1 stay as they are. */
export function humanize(key: string): string {
  if (/^[a-z]\d*$/.test(key) || /^[a-z]\d+[a-z]?$/.test(key)) return key;
  const words = key.replace(/([a-z0-9])([A-Z])/g, "$1 $2").replace(/[-_]+/g, " ").toLowerCase().split(" ")
    .map((w) => ABBREVIATIONS[w] ?? w).join(" ");
  return words.charAt(0).toUpperCase() + words.slice(1);
}

/** Trade abbreviations keep their capitals in labels. */
const ABBREVIATIONS: Record<string, string> = {
  sd: "SD", mtd: "MTD", crm: "CRM", boin: "BOIN", dlt: "DLT", dlts: "DLTs", pet: "PET", hr: "HR", ci: "CI", id: "id",
};

/** Copies text, falling back to selecting it when the clipboard is not available. */
export async function copyText(text: string, fallbackField?: HTMLInputElement | HTMLTextAreaElement): Promise<boolean> {
  try {
    await navigator.clipboard.writeText(text);
    return true;
  } catch {
    if (fallbackField) {
      fallbackField.focus();
      fallbackField.select();
    }
    return false;
  }
}
