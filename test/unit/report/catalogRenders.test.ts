// Every catalog design's example renders as HTML and PDF, and the numbers a
// reader sees in the PDF are the record's numbers as the document formats them.
// The PDF's text is read back by poppler's pdftotext (an independent PDF
// parser), not by our own code.
import { describe, expect, it } from "vitest";
import { catalog } from "../../../src/designs/catalog.js";
import { type Cell, formatCell } from "../../../src/report/document.js";
import { renderHtml } from "../../../src/report/html.js";
import { renderPdf } from "../../../src/report/pdf.js";
import { escapeMarkup } from "../../../src/report/escape.js";
import { renderChartSvg } from "../../../src/report/svg.js";
import { TEST_FONTS, exampleReport, pdfText } from "../../support/report.js";

/** Every finite number anywhere in a JSON value. */
function numbersIn(value: unknown, out: number[] = []): number[] {
  if (typeof value === "number" && Number.isFinite(value)) out.push(value);
  else if (Array.isArray(value)) for (const v of value) numbersIn(v, out);
  else if (value && typeof value === "object") for (const v of Object.values(value)) numbersIn(v, out);
  return out;
}

/**
 * Well-formed XML in the sense of XML 1.0 §2.1 for the subset an SVG drawing uses: tags nest, attribute values are
 * quoted, and text holds no raw < or > and only the five predefined entities. The form pages parse the SVG as XML.
 */
function xmlProblems(xml: string): string[] {
  const problems: string[] = [];
  const badText = (text: string, where: number): void => {
    if (/[<>]/.test(text) || /&(?!(?:amp|lt|gt|quot|#39);)/.test(text)) problems.push(`bad text at ${where}: ${text.slice(0, 40)}`);
  };
  const tag = /<(\/?)([A-Za-z][\w:-]*)((?:\s+[\w:-]+="[^"<>]*")*)\s*(\/?)>/g;
  const stack: string[] = [];
  let last = 0;
  let roots = 0;
  for (let m = tag.exec(xml); m; m = tag.exec(xml)) {
    badText(xml.slice(last, m.index), last);
    for (const value of m[3]!.matchAll(/="([^"]*)"/g)) badText(value[1]!, m.index);
    if (m[1]) {
      if (stack.pop() !== m[2]) problems.push(`unbalanced </${m[2]}> at ${m.index}`);
    } else {
      if (stack.length === 0) roots++;
      if (!m[4]) stack.push(m[2]!);
    }
    last = tag.lastIndex;
  }
  badText(xml.slice(last), last);
  if (stack.length > 0) problems.push(`unclosed ${stack.join(", ")}`);
  if (roots !== 1) problems.push(`${roots} root elements`);
  return problems;
}

/** pdftotext splits words at gaps; compare on single spaces. */
const words = (text: string): Set<string> => new Set(text.split(/\s+/).map((w) => w.replace(/^[(\[]+|[),;:\]]+$/g, "")));

it("the XML check catches what an XML parser refuses", () => {
  expect(xmlProblems('<svg a="1"><text>ok &amp; fine</text></svg>')).toEqual([]);
  for (const bad of ["<svg><text>a < b</text></svg>", "<svg><g></svg>", '<svg a="x & y"/>', "<svg/><svg/>", "<svg>&nbsp;</svg>"]) {
    expect(xmlProblems(bad), bad).not.toEqual([]);
  }
});

describe.each(catalog.map((d) => [d.id, d] as const))("%s", (_id, design) => {
  it("renders its example as a PDF whose numbers are the record's, as formatted", async () => {
    const doc = await exampleReport(design, `${design.title}: TW-417 example`);
    const text = pdfText(await renderPdf(doc, TEST_FONTS));
    const seen = words(text);
    const recordNumbers = numbersIn([doc.record.result, doc.record.inputs]);
    const shown: Array<{ where: string; value: number; text: string }> = [];
    for (const section of doc.sections) {
      for (const block of section.blocks) {
        if (block.kind === "facts") {
          for (const f of block.facts) if (typeof f.value === "number" && Number.isFinite(f.value)) shown.push({ where: `${section.id}: ${f.label}`, value: f.value, text: formatCell(f.value, f.digits) });
        } else if (block.kind === "table") {
          block.table.rows.forEach((row, r) => block.table.columns.forEach((c, i) => {
            const cell: Cell = row[i] ?? null;
            if (typeof cell === "number" && Number.isFinite(cell)) shown.push({ where: `${block.table.id} row ${r + 1} ${c.label}`, value: cell, text: formatCell(cell, c.digits) });
          }));
        }
      }
    }
    expect(shown.length).toBeGreaterThan(0);
    const missing = shown.filter((s) => !seen.has(s.text));
    expect(missing, "numbers of the document absent from the PDF text").toEqual([]);
    // The headline numbers are the stored record's, not recomputed by the report (a proportion may be shown as a percentage).
    const keyNumbers = doc.keyFacts.flatMap((f) => (typeof f.value === "number" ? [{ label: f.label, text: formatCell(f.value, f.digits), digits: f.digits }] : []));
    const unmatched = keyNumbers.filter((k) => !recordNumbers.some((x) => formatCell(x, k.digits) === k.text || formatCell(x * 100, k.digits) === k.text));
    expect(unmatched, "key facts whose value is not a number of the JSON record").toEqual([]);
    expect(text).toContain(doc.record.id);
    expect(text.replace(/\s+/g, "")).toContain(doc.record.digest);
  });

  it("renders its example as a self-contained HTML page showing the same numbers", async () => {
    const doc = await exampleReport(design);
    const html = renderHtml(doc);
    expect(html).not.toMatch(/<script|<link rel="stylesheet"|src="https?:|url\(/i);
    for (const f of doc.keyFacts) expect(html).toContain(escapeMarkup(formatCell(f.value, f.digits)));
    expect(html).toContain(doc.record.digest);
    expect(html).toContain(escapeMarkup(doc.question));
    expect(html).toContain('<th scope="col"');
    for (const block of doc.sections.flatMap((sec) => sec.blocks)) {
      if (block.kind === "chart") expect(xmlProblems(renderChartSvg(block.chart)), block.chart.id).toEqual([]);
    }
  });
});
