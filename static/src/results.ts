/** Draws a preview's document sections: key numbers first, then facts, tables, charts and text. */
import { type Block, type Fact, type Section, type Table, formatCell } from "../../src/report/document.js";
import type { Preview } from "./api.js";
import { chartElement } from "./charts.js";
import { copyText, h } from "./dom.js";

const factValue = (f: Fact): string => `${formatCell(f.value, f.digits)}${f.unit ? ` ${f.unit}` : ""}`;

function keyFacts(sections: Section[]): HTMLElement | null {
  const facts = sections.flatMap((s) => s.blocks.flatMap((b) => (b.kind === "facts" ? b.facts.filter((f) => f.key) : [])));
  if (facts.length === 0) return null;
  // A long value (a list, a model's name) takes two cells rather than wrapping a word a line.
  return h("dl", { class: "key-facts" }, ...facts.map((f) => {
    const value = factValue(f);
    return h("div", { class: value.length > 12 ? "key-fact long" : "key-fact" }, h("dt", {}, f.label), h("dd", {}, value, f.note ? h("small", {}, f.note) : null));
  }));
}

function tableElement(table: Table): HTMLElement {
  // A column of numbers is right-aligned, its heading too, so digits line up under it.
  const numeric = table.columns.map((_, i) => i > 0 && table.rows.some((r) => typeof r[i] === "number") && table.rows.every((r) => typeof r[i] === "number" || r[i] === null));
  const head = h("tr", {}, ...table.columns.map((c, i) => h("th", { scope: "col", class: numeric[i] ? "num" : undefined }, c.label, c.unit ? h("span", { class: "unit" }, ` (${c.unit})`) : null)));
  const rows = table.rows.map((row) => h("tr", {}, ...row.map((cell, i) => {
    const text = formatCell(cell, table.columns[i]?.digits);
    return i === 0 ? h("th", { scope: "row" }, text) : h("td", { class: numeric[i] || typeof cell === "number" ? "num" : undefined }, text);
  })));
  const captionId = `caption-${table.id}`;
  return h("div", { class: "table-scroll", role: "region", tabindex: 0, "aria-labelledby": captionId },
    h("table", { "data-table": table.id }, h("caption", { id: captionId }, table.caption), h("thead", {}, head), h("tbody", {}, ...rows)),
    table.note ? h("p", { class: "note" }, table.note) : null);
}

function blockElement(block: Block, status: (message: string) => void): HTMLElement | null {
  switch (block.kind) {
    case "facts": {
      const rest = block.facts.filter((f) => !f.key);
      if (rest.length === 0) return null;
      return h("dl", { class: "facts" }, ...rest.map((f) => h("div", {}, h("dt", {}, f.label), h("dd", {}, factValue(f), f.note ? h("small", {}, ` ${f.note}`) : null))));
    }
    case "table":
      return tableElement(block.table);
    case "chart":
      return h("figure", { class: "chart-figure", "data-chart": block.chart.id }, chartElement(block.chart, "live"), h("figcaption", {}, block.chart.title));
    case "paragraph":
      return h("p", {}, block.text);
    case "protocol": {
      const copy = h("button", { type: "button", class: "small" }, "Copy paragraph");
      copy.addEventListener("click", () => {
        void copyText(block.text).then((ok) => status(ok ? "Paragraph copied." : "Select the paragraph and copy it."));
      });
      return h("div", { class: "protocol" }, h("blockquote", {}, block.text), copy);
    }
    case "list":
      return h("ul", {}, ...block.items.map((item) => h("li", {}, item)));
  }
}

/** The question and the key numbers, shown first. */
export function previewHead(preview: Preview): HTMLElement {
  return h("div", { class: "preview-head" }, h("p", { class: "question" }, preview.question), keyFacts(preview.sections));
}

/** Every section in the design's order, then the cautions. */
export function previewBody(preview: Preview, status: (message: string) => void): HTMLElement {
  const sections = preview.sections.map((section) => {
    const blocks = section.blocks.map((b) => blockElement(b, status)).filter((b): b is HTMLElement => b !== null);
    if (blocks.length === 0) return null;
    return h("section", { class: "result-section", "data-section": section.id }, h("h3", {}, section.title), ...blocks);
  });
  return h("div", { class: "preview-body" },
    ...sections,
    h("section", { class: "result-section cautions", "data-section": "caution" }, h("h3", {}, "Caution"), h("ul", {}, ...preview.cautions.map((c) => h("li", {}, c)))));
}
