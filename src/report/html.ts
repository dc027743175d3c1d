/**
 * Renders a report document as one self-contained HTML page: inline CSS,
 * inline SVG charts, no scripts, no external requests. Every string from a
 * record is escaped; the permalink router adds a Content-Security-Policy that
 * forbids scripts as a second guard.
 */
import { REPORT_STYLESHEET } from "../../reports/stylesheet.js";
import { LONG_KEY_VALUE } from "../../reports/theme.js";
import type { ReportDocument } from "./build.js";
import { mainTables } from "./build.js";
import { type Block, type Column, type Fact, type Section, type Table, columnHeading, formatCell } from "./document.js";
import { escapeMarkup } from "./escape.js";
import { renderChartSvg } from "./svg.js";

const columnLabel = (c: Column): string => escapeMarkup(columnHeading(c));

function numericColumns(table: Table): boolean[] {
  return table.columns.map((_, i) => table.rows.length > 0 && table.rows.every((row) => row[i] === null || typeof row[i] === "number"));
}

/** Tables with running text in their cells are stacked into one block per row on a phone. */
function hasProse(table: Table): boolean {
  return table.rows.some((row) => row.some((cell) => typeof cell === "string" && cell.length > 48));
}

function renderTable(table: Table, csvHref: string | null): string {
  const numeric = numericColumns(table);
  const stack = hasProse(table);
  const head = table.columns.map((c, i) => `<th scope="col"${numeric[i] ? ' class="num"' : ""}>${columnLabel(c)}</th>`).join("");
  const body = table.rows.map((row) => `<tr>${table.columns.map((col, i) => {
    const cell = row[i] ?? null;
    const text = escapeMarkup(formatCell(cell, col.digits));
    const cls = numeric[i] ? ' class="num"' : "";
    const label = stack ? ` data-label="${columnLabel(col)}"` : "";
    return i === 0 ? `<th scope="row"${cls}>${text}</th>` : `<td${cls}${label}>${text}</td>`;
  }).join("")}</tr>`).join("\n");
  const csv = csvHref ? ` <a class="csv" href="${escapeMarkup(csvHref)}">CSV</a>` : "";
  const note = table.note ? `<p class="table-note">${escapeMarkup(table.note)}</p>` : "";
  return `<div class="table-wrap" role="region" aria-labelledby="caption-${escapeMarkup(table.id)}" tabindex="0"><table id="table-${escapeMarkup(table.id)}"${stack ? ' class="stack"' : ""}><caption id="caption-${escapeMarkup(table.id)}">${escapeMarkup(table.caption)}${csv}</caption><thead><tr>${head}</tr></thead><tbody>${body}</tbody></table></div>${note}`;
}

function factValue(f: Fact): string {
  // Only http(s) addresses become links, so no label can smuggle in another scheme.
  if (typeof f.value === "string" && /^https?:\/\/[^\s"<>]+$/.test(f.value)) return `<a href="${escapeMarkup(f.value)}">${escapeMarkup(f.value)}</a>`;
  return `${escapeMarkup(formatCell(f.value, f.digits))}${f.unit ? ` ${escapeMarkup(f.unit)}` : ""}${f.note ? ` <small>(${escapeMarkup(f.note)})</small>` : ""}`;
}

function renderFacts(facts: Fact[], key: boolean): string {
  return `<dl class="${key ? "key" : "facts"}">${facts.map((f) => {
    const long = key && formatCell(f.value, f.digits).length + (f.unit?.length ?? 0) > LONG_KEY_VALUE;
    return `<div><dt>${escapeMarkup(f.label)}</dt><dd${long ? ' class="long"' : ""}>${factValue(f)}</dd></div>`;
  }).join("")}</dl>`;
}

function renderBlock(block: Block, section: Section, doc: ReportDocument, csvTables: Set<string>): string {
  switch (block.kind) {
    case "facts":
      return renderFacts(block.facts, section.id === "summary");
    case "table":
      return renderTable(block.table, csvTables.has(block.table.id) ? `${doc.permalink}.csv?table=${encodeURIComponent(block.table.id)}` : null);
    case "chart":
      // Two drawings of one chart: lettering stays legible both on a phone and on a wide screen or page.
      return `<figure><figcaption>${escapeMarkup(block.chart.title)}</figcaption>` +
        `<div class="chart-wide">${renderChartSvg(block.chart, { idPrefix: `${section.id}-wide` })}</div>` +
        `<div class="chart-narrow">${renderChartSvg(block.chart, { idPrefix: `${section.id}-narrow`, width: 360, height: 270, fontSize: 11 })}</div></figure>`;
    case "paragraph":
      return section.id === "citation" ? `<p class="citation">${escapeMarkup(block.text)}</p>` : `<p>${escapeMarkup(block.text)}</p>`;
    case "protocol":
      return `<blockquote class="protocol"><p>${escapeMarkup(block.text)}</p></blockquote>`;
    case "list":
      return section.id === "references"
        ? `<ol class="references">${block.items.map((i) => `<li>${escapeMarkup(i)}</li>`).join("")}</ol>`
        : `<ul>${block.items.map((i) => `<li>${escapeMarkup(i)}</li>`).join("")}</ul>`;
  }
}

function citationLinks(doc: ReportDocument): string {
  return `<p class="formats">Download the entry: <a href="${escapeMarkup(doc.permalink)}.bib">BibTeX</a> <a href="${escapeMarkup(doc.permalink)}.ris">RIS</a></p>`;
}

export function renderHtml(doc: ReportDocument): string {
  const csvTables = new Set(mainTables(doc).map((t) => t.id));
  const sections = doc.sections.map((s) =>
    `<section id="${escapeMarkup(s.id)}" aria-labelledby="h-${escapeMarkup(s.id)}"><h2 id="h-${escapeMarkup(s.id)}">${escapeMarkup(s.title)}</h2>` +
    s.blocks.map((b) => renderBlock(b, s, doc, csvTables)).join("\n") +
    (s.id === "citation" ? citationLinks(doc) : "") +
    "</section>").join("\n");
  const contents = doc.sections.map((s) => `<li><a href="#${escapeMarkup(s.id)}">${escapeMarkup(s.title)}</a></li>`).join("");
  const p = escapeMarkup(doc.permalink);
  const r = doc.record;
  const heading = r.label
    ? `<h1>${escapeMarkup(r.label)}</h1><p class="design-name">${escapeMarkup(doc.designTitle)}</p>`
    : `<h1>${escapeMarkup(doc.designTitle)}</h1>`;
  return `<!doctype html>
<html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width, initial-scale=1">
<title>${escapeMarkup(doc.title)} · ${escapeMarkup(doc.designTitle)} · Trialwright</title>
<meta name="description" content="${escapeMarkup(doc.question)}">
<link rel="canonical" href="${p}">
<link rel="alternate" type="application/pdf" href="${p}.pdf">
<link rel="alternate" type="application/json" href="${p}.json">
<style>${REPORT_STYLESHEET}</style>
</head><body><div class="page">
<header class="report-head">
<p class="eyebrow">Trialwright · frozen calculation <span class="id">${escapeMarkup(r.id)}</span></p>
${heading}
<p class="question">${escapeMarkup(doc.question)}</p>
<p class="formats">Formats: <a href="${p}.pdf">PDF</a> <a href="${p}.json">JSON</a> <a href="${p}.csv">CSV</a> <a href="${p}.bib">BibTeX</a> <a href="${p}.ris">RIS</a></p>
<nav class="contents" aria-label="Contents"><ol>${contents}</ol></nav>
</header>
<main>${sections}</main>
<footer class="report-foot">${escapeMarkup(r.id)} · SHA-256 ${escapeMarkup(r.digest)} · ${escapeMarkup(doc.designId)} v${r.designVersion} · ${escapeMarkup(r.engine)} · created ${escapeMarkup(r.createdAt)}</footer>
</div></body></html>`;
}
