/**
 * Renders a report document as one self-contained HTML page: inline CSS,
 * no scripts, no external requests. Every string from a record is escaped.
 */
import type { ReportDocument } from "./build.js";
import { type Block, type Table, formatCell } from "./document.js";

export function escapeHtml(text: string): string {
  return text.replace(/[&<>"']/g, (ch) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" })[ch]!);
}

function renderTable(table: Table): string {
  const head = table.columns.map((c) => `<th scope="col">${escapeHtml(c.label)}</th>`).join("");
  const body = table.rows.map((row) => `<tr>${row.map((cell, i) => {
    const col = table.columns[i];
    const text = escapeHtml(formatCell(cell, col?.digits));
    return i === 0 ? `<th scope="row">${text}</th>` : `<td${typeof cell === "number" ? ' class="num"' : ""}>${text}</td>`;
  }).join("")}</tr>`).join("\n");
  return `<table id="table-${escapeHtml(table.id)}"><caption>${escapeHtml(table.caption)}</caption><thead><tr>${head}</tr></thead><tbody>${body}</tbody></table>`;
}

function renderBlock(block: Block): string {
  switch (block.kind) {
    case "facts":
      return `<dl class="facts">${block.facts.map((f) => `<div${f.key ? ' class="key"' : ""}><dt>${escapeHtml(f.label)}</dt><dd>${escapeHtml(formatCell(f.value, f.digits))}${f.unit ? ` ${escapeHtml(f.unit)}` : ""}${f.note ? ` <small>(${escapeHtml(f.note)})</small>` : ""}</dd></div>`).join("")}</dl>`;
    case "table":
      return renderTable(block.table);
    case "chart":
      return `<figure><figcaption>${escapeHtml(block.chart.title)}</figcaption></figure>`;
    case "paragraph":
      return `<p>${escapeHtml(block.text)}</p>`;
    case "protocol":
      return `<blockquote class="protocol">${escapeHtml(block.text)}</blockquote>`;
    case "list":
      return `<ul>${block.items.map((i) => `<li>${escapeHtml(i)}</li>`).join("")}</ul>`;
  }
}

export function renderHtml(doc: ReportDocument): string {
  const sections = doc.sections.map((s) => `<section id="${escapeHtml(s.id)}"><h2>${escapeHtml(s.title)}</h2>${s.blocks.map(renderBlock).join("\n")}</section>`).join("\n");
  return `<!doctype html>
<html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width, initial-scale=1">
<title>${escapeHtml(doc.title)} · Trialwright</title>
<style>body{font-family:system-ui,sans-serif;max-width:60rem;margin:2rem auto;padding:0 1rem;line-height:1.45;color:#1a1a1a}
table{border-collapse:collapse;margin:1rem 0}th,td{border:1px solid #bbb;padding:.25rem .5rem;text-align:left}td.num{text-align:right;font-variant-numeric:tabular-nums}
caption{text-align:left;font-weight:600}.facts div{display:flex;gap:1rem}.facts dt{min-width:16rem;font-weight:600}.protocol{border-left:4px solid #2a5d8f;margin:0;padding:.5rem 1rem;background:#f3f6fa}</style>
</head><body>
<header><p>${escapeHtml(doc.designTitle)}</p><h1>${escapeHtml(doc.title)}</h1><p class="question">${escapeHtml(doc.question)}</p></header>
<main>${sections}</main>
</body></html>`;
}
