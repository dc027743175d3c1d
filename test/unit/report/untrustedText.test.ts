// Labels are the one free text a requester puts into a report. Markup in them
// must reach the reader as text, and any Unicode (emoji, right-to-left, CJK,
// lone surrogates) must still give a valid PDF. Payloads are the classic
// cross-site scripting vectors of the OWASP XSS Filter Evasion Cheat Sheet.
import { PDFDocument } from "pdf-lib";
import { describe, expect, it } from "vitest";
import { twoMeans } from "../../../src/designs/twoMeans.js";
import { toBibtex, toRis } from "../../../src/report/citation.js";
import { renderHtml } from "../../../src/report/html.js";
import { renderPdf } from "../../../src/report/pdf.js";
import { TEST_FONTS, exampleReport, pdfText } from "../../support/report.js";

const PAYLOADS = [
  `<script>alert(1)</script>`,
  `"><img src=x onerror=alert(1)>`,
  `'><svg onload=alert(1)>`,
  `</title><script>alert(document.domain)</script>`,
  `<iframe src="javascript:alert(1)"></iframe>`,
  `<a href="javascript:alert(1)">TW-417</a>`,
  `<style>body{display:none}</style>`,
  `&lt;script&gt;alert(1)&lt;/script&gt;`,
  `<!--`,
  `<math><mtext></p><script>alert(1)</script>`,
];

/** Tags and comments a browser would parse: the report must contain exactly as many whatever the label. */
const markupCount = (html: string): number => (html.match(/<[a-zA-Z!/?]/g) ?? []).length;

describe("labels with markup are shown as text, never run", async () => {
  const plain = markupCount(renderHtml(await exampleReport(twoMeans, "TW-417")));
  for (const payload of PAYLOADS) {
    it(`escapes ${payload}`, async () => {
      const doc = await exampleReport(twoMeans, payload);
      const html = renderHtml(doc);
      // The payload adds no element, attribute or comment: the page has the same markup as with a plain label.
      expect(markupCount(html)).toBe(plain);
      // No script element, no event-handler attribute inside any tag, no javascript: address in an attribute.
      expect(html).not.toMatch(/<script|<iframe|<[^>]*\son\w+=|(href|src)="javascript:/i);
      const escaped = payload.replace(/&/g, "&amp;").replace(/</g, "&lt;").replace(/>/g, "&gt;").replace(/"/g, "&quot;").replace(/'/g, "&#39;");
      expect(html).toContain(`<h1>${escaped}</h1>`);
    });
  }

  it("keeps a markup label literal in the PDF text", async () => {
    const payload = PAYLOADS[1]!;
    const text = pdfText(await renderPdf(await exampleReport(twoMeans, payload), TEST_FONTS));
    expect(text).toContain(payload);
  });

  it("keeps BibTeX braces balanced and RIS to one record whatever the label", async () => {
    const doc = await exampleReport(twoMeans, "TW-417 } @misc{evil, 100% & $x_1$ #2 ~ ^ \\ \nER  - \nTY  - JOUR");
    const bib = toBibtex(doc, new Date("2026-12-01T12:00:00Z"));
    let depth = 0;
    for (const [i, ch] of [...bib].entries()) {
      if (bib[i - 1] === "\\") continue;
      if (ch === "{") depth++;
      if (ch === "}") depth--;
      expect(depth).toBeGreaterThanOrEqual(0);
    }
    expect(depth).toBe(0);
    expect(bib.match(/^@/gm)).toHaveLength(1);
    const ris = toRis(doc, new Date("2026-12-01T12:00:00Z"));
    expect(ris.match(/^TY {2}- /gm)).toHaveLength(1);
    expect(ris.match(/^ER {2}-/gm)).toHaveLength(1);
    for (const line of ris.split("\r\n").filter((l) => l !== "")) expect(line).toMatch(/^[A-Z][A-Z0-9] {2}-( |$)/);
  });
});

describe("any Unicode label gives a valid PDF", () => {
  const labels: Array<[string, string]> = [
    ["emoji and right-to-left text", "TW-417 😀👩‍🔬🇫🇷 שלום עולם مرحبا بالعالم"],
    ["accents and Greek", "Étude TW-417 à Nørreby: α = 0,05, β = 0,2, Δ = 4"],
    ["CJK only", "試験計画 第二相 临床试验"],
    ["a lone surrogate and control characters", "TW-417 \uD800 broken\u0007 bell\u200Bzero-width"],
    ["a long unbroken word", "TW417".repeat(60)],
  ];
  for (const [what, label] of labels) {
    it(what, async () => {
      const bytes = await renderPdf(await exampleReport(twoMeans, label), TEST_FONTS);
      const loaded = await PDFDocument.load(bytes);
      expect(loaded.getPageCount()).toBeGreaterThan(0);
      // pdftotext (poppler) parses the whole file and its fonts; it exits non-zero on a broken file.
      const text = pdfText(bytes);
      expect(text).toContain("TW-417".slice(0, what === "CJK only" ? 0 : 2));
    });
  }

  it("draws letters the font has and replaces the rest with U+FFFD", async () => {
    const text = pdfText(await renderPdf(await exampleReport(twoMeans, "Étude α TW-417 試験"), TEST_FONTS));
    expect(text).toContain("Étude α TW-417");
    expect(text).not.toContain("試験");
  });

  it("puts a right-to-left run in reading order (pdftotext restores logical order from the drawn glyphs)", async () => {
    const text = pdfText(await renderPdf(await exampleReport(twoMeans, "TW-417 שלום עולם"), TEST_FONTS));
    // Hebrew reading right to left: extracted in logical order, with or without bidi marks around it.
    expect(text.replace(/[\u202a-\u202e\u200e\u200f]/g, "")).toContain("שלום עולם");
  });
});
