/**
 * Renders a report document as a PDF with pdf-lib: vector text in embedded,
 * subset DejaVu Sans (so accents, Greek, Cyrillic, Hebrew and Arabic letters
 * render, and anything else becomes a replacement mark), charts drawn from
 * the same layout as the SVG, tables that break across pages with their
 * header repeated, a header with the label on every page and a footer with
 * id, digest and page numbers.
 *
 * Output is deterministic for a record: the PDF's dates are the record's
 * creation time, so the same record always gives the same bytes.
 */
import fontkit from "@pdf-lib/fontkit";
import type { Font, Glyph } from "@pdf-lib/fontkit";
import { LineCapStyle, PDFDocument, type PDFFont, PDFHexString, PDFName, type PDFPage, PDFString, type RGB, degrees, rgb } from "pdf-lib";
import {
  ACCENT, INK, KEY_BACKGROUND, LONG_KEY_VALUE, MUTED, PAGE_MARGIN, PAPER, PROTOCOL_BACKGROUND, RULE, type Paper, TYPE,
} from "../../reports/theme.js";
import type { ReportDocument } from "./build.js";
import { type Anchor, type Primitive, layoutChart } from "./chartLayout.js";
import { type Chart, type Column, type Fact, type Section, type Table, columnHeading, formatCell } from "./document.js";
import { FontMetrics, visualOrder, wrapText } from "./pdfText.js";

export interface ReportFonts {
  regular: Uint8Array;
  bold: Uint8Array;
}

export interface PdfOptions {
  paper?: Paper;
}

// Parsing a font takes longer than laying out a whole report, so each font is parsed once per isolate.
const parsed = new Map<Uint8Array, Font>();
function parseFont(bytes: Uint8Array): Font {
  let font = parsed.get(bytes);
  if (!font) {
    const f = fontkit.create(bytes);
    // Glyphs straight from the character map, without OpenType shaping: lines arrive in visual order
    // (pdfText.ts), ligatures and kerning are off anyway, and shaping was most of the drawing time.
    // Sanitized text has no variation selectors, so one glyph per code point, and the character map is read once per code point.
    const glyphs = new Map<number, Glyph>();
    const glyphFor = (cp: number): Glyph => {
      let g = glyphs.get(cp);
      if (!g) {
        g = f.glyphForCodePoint(cp);
        glyphs.set(cp, g);
      }
      return g;
    };
    (f as { layout: unknown }).layout = (s: string) => {
      const run: Glyph[] = [];
      for (const ch of s) run.push(glyphFor(ch.codePointAt(0)!));
      return { glyphs: run, positions: [] };
    };
    font = f;
    parsed.set(bytes, font);
  }
  return font;
}
const cachedFontkit = { create: (bytes: Uint8Array) => parseFont(bytes) };

function colour(hex: string): RGB {
  const n = Number.parseInt(hex.slice(1), 16);
  return rgb(((n >> 16) & 255) / 255, ((n >> 8) & 255) / 255, (n & 255) / 255);
}

interface Face {
  pdf: PDFFont;
  metrics: FontMetrics;
}

const LINE = 1.35;
const CELL_PAD_X = 4;
const CELL_PAD_Y = 2.6;

class Writer {
  readonly pages: PDFPage[] = [];
  /** Where each section starts, for the document outline. */
  readonly headings: Array<{ title: string; page: PDFPage; top: number }> = [];
  page!: PDFPage;
  /** Distance from the top edge of the page, in points. */
  y = 0;
  readonly width: number;
  readonly height: number;
  readonly left = PAGE_MARGIN.left;
  readonly contentWidth: number;

  constructor(readonly pdf: PDFDocument, readonly regular: Face, readonly bold: Face, paper: Paper) {
    this.width = PAPER[paper].width;
    this.height = PAPER[paper].height;
    this.contentWidth = this.width - PAGE_MARGIN.left - PAGE_MARGIN.right;
    this.newPage();
  }

  get bottom(): number {
    return this.height - PAGE_MARGIN.bottom;
  }

  newPage(): void {
    this.page = this.pdf.addPage([this.width, this.height]);
    this.pages.push(this.page);
    this.y = PAGE_MARGIN.top;
  }

  /** Starts a new page unless `height` more points fit on this one. */
  ensure(height: number): boolean {
    if (this.y + height <= this.bottom) return false;
    this.newPage();
    return true;
  }

  /** Draws one line of sanitized text with its baseline at `baseline` (from the top). */
  text(text: string, x: number, baseline: number, size: number, face: Face, fill = INK, anchor: Anchor = "start"): void {
    if (text === "") return;
    const visual = visualOrder(text);
    const w = face.metrics.width(visual, size);
    const dx = anchor === "middle" ? -w / 2 : anchor === "end" ? -w : 0;
    this.page.drawText(visual, { x: x + dx, y: this.height - baseline, size, font: face.pdf, color: colour(fill) });
  }

  rect(x: number, top: number, w: number, h: number, fill: string, border?: string): void {
    this.page.drawRectangle({
      x, y: this.height - top - h, width: w, height: h, color: colour(fill),
      ...(border ? { borderColor: colour(border), borderWidth: 0.5 } : {}),
    });
  }

  rule(x1: number, x2: number, at: number, thickness = 0.5, stroke = RULE): void {
    this.page.drawLine({ start: { x: x1, y: this.height - at }, end: { x: x2, y: this.height - at }, thickness, color: colour(stroke) });
  }

  /** Wrapped paragraph at the cursor; breaks between lines where the page ends. */
  paragraph(text: string, options: { size?: number; face?: Face; fill?: string; indent?: number; width?: number } = {}): void {
    const size = options.size ?? TYPE.body;
    const face = options.face ?? this.regular;
    const x = this.left + (options.indent ?? 0);
    const width = options.width ?? this.contentWidth - (options.indent ?? 0);
    for (const line of wrapText(face.metrics, face.metrics.sanitize(text), size, width)) {
      this.ensure(size * LINE);
      this.text(line, x, this.y + size, size, face, options.fill);
      this.y += size * LINE;
    }
  }
}

function drawPrimitive(w: Writer, p: Primitive, ox: number, oy: number): void {
  const H = w.height;
  switch (p.type) {
    case "line":
      w.page.drawLine({
        start: { x: ox + p.x1, y: H - oy - p.y1 }, end: { x: ox + p.x2, y: H - oy - p.y2 }, thickness: p.width, color: colour(p.stroke),
        ...(p.dash && p.dash.length > 0 ? { dashArray: [...p.dash] } : {}),
      });
      return;
    case "polyline": {
      // One SVG path keeps the line joined and dashed continuously.
      const [first, ...rest] = p.points;
      if (!first) return;
      const path = `M ${first[0]} ${first[1]} ${rest.map(([x, y]) => `L ${x} ${y}`).join(" ")}`;
      w.page.drawSvgPath(path, {
        x: ox, y: H - oy, borderColor: colour(p.stroke), borderWidth: p.width, borderLineCap: LineCapStyle.Round,
        ...(p.dash && p.dash.length > 0 ? { borderDashArray: [...p.dash] } : {}),
      });
      return;
    }
    case "rect":
      w.page.drawRectangle({ x: ox + p.x, y: H - oy - p.y - p.height, width: p.width, height: p.height, color: colour(p.fill) });
      return;
    case "circle":
      w.page.drawCircle({ x: ox + p.cx, y: H - oy - p.cy, size: p.r, color: colour(p.fill) });
      return;
    case "text": {
      const face = p.bold ? w.bold : w.regular;
      const text = visualOrder(face.metrics.sanitize(p.text));
      if (text === "") return;
      const width = face.metrics.width(text, p.size);
      const shift = p.anchor === "middle" ? width / 2 : p.anchor === "end" ? width : 0;
      if (p.rotate === -90) {
        w.page.drawText(text, { x: ox + p.x, y: H - oy - p.y - shift, size: p.size, font: face.pdf, color: colour(p.fill), rotate: degrees(90) });
      } else {
        w.page.drawText(text, { x: ox + p.x - shift, y: H - oy - p.y, size: p.size, font: face.pdf, color: colour(p.fill) });
      }
    }
  }
}

function drawChart(w: Writer, chart: Chart): void {
  const full = Math.min(210, w.contentWidth * 0.5);
  const titleLines = wrapText(w.bold.metrics, w.bold.metrics.sanitize(chart.title), TYPE.caption, w.contentWidth);
  const titleHeight = titleLines.length * TYPE.caption * LINE;
  // A chart shrinks a little to finish a page rather than leave a third of it blank.
  const room = w.bottom - w.y - titleHeight - 6;
  const height = room >= full * 0.72 && room < full ? room : full;
  w.ensure(titleHeight + height + 6);
  for (const line of titleLines) {
    w.text(line, w.left, w.y + TYPE.caption, TYPE.caption, w.bold);
    w.y += TYPE.caption * LINE;
  }
  const layout = layoutChart(chart, { width: w.contentWidth, height, fontSize: TYPE.chart });
  for (const p of layout.primitives) drawPrimitive(w, p, w.left, w.y);
  w.y += height + 8;
}

function drawKeyFacts(w: Writer, facts: Fact[]): void {
  const columns = 3;
  const gap = 8;
  const cardWidth = (w.contentWidth - gap * (columns - 1)) / columns;
  const inner = cardWidth - 12;
  for (let start = 0; start < facts.length; start += columns) {
    const row = facts.slice(start, start + columns).map((f) => {
      const label = wrapText(w.regular.metrics, w.regular.metrics.sanitize(f.label), TYPE.small, inner);
      const text = factText(f, false);
      const size = text.length > LONG_KEY_VALUE ? 9.5 : 13;
      const value = wrapText(w.bold.metrics, w.bold.metrics.sanitize(text), size, inner);
      const note = f.note ? wrapText(w.regular.metrics, w.regular.metrics.sanitize(f.note), TYPE.small, inner) : [];
      return { label, value, note, size };
    });
    const height = Math.max(...row.map((c) => c.label.length * TYPE.small * LINE + c.value.length * c.size * 1.2 + c.note.length * TYPE.small * LINE)) + 12;
    w.ensure(height + gap);
    row.forEach((c, i) => {
      const x = w.left + i * (cardWidth + gap);
      w.rect(x, w.y, cardWidth, height, KEY_BACKGROUND, RULE);
      let y = w.y + 6;
      for (const l of c.label) { w.text(l, x + 6, y + TYPE.small, TYPE.small, w.regular, MUTED); y += TYPE.small * LINE; }
      for (const l of c.value) { w.text(l, x + 6, y + c.size, c.size, w.bold); y += c.size * 1.2; }
      for (const l of c.note) { w.text(l, x + 6, y + TYPE.small, TYPE.small, w.regular, MUTED); y += TYPE.small * LINE; }
    });
    w.y += height + gap;
  }
}

function factText(f: Fact, withNote: boolean): string {
  return `${formatCell(f.value, f.digits)}${f.unit ? ` ${f.unit}` : ""}${withNote && f.note ? ` (${f.note})` : ""}`;
}

function drawFacts(w: Writer, facts: Fact[]): void {
  const size = TYPE.body;
  const labelWidth = w.contentWidth * 0.36;
  const valueWidth = w.contentWidth - labelWidth - 10;
  for (const f of facts) {
    const label = wrapText(w.bold.metrics, w.bold.metrics.sanitize(f.label), size, labelWidth);
    const value = wrapText(w.regular.metrics, w.regular.metrics.sanitize(factText(f, true)), size, valueWidth);
    const lines = Math.max(label.length, value.length);
    const height = lines * size * LINE + 3;
    w.ensure(height);
    label.forEach((l, i) => w.text(l, w.left, w.y + size + i * size * LINE, size, w.bold));
    value.forEach((l, i) => w.text(l, w.left + labelWidth + 10, w.y + size + i * size * LINE, size, w.regular));
    if (typeof f.value === "string" && /^https?:\/\/\S+$/.test(f.value)) {
      const x = w.left + labelWidth + 10;
      linkArea(w.pdf, w.page, [x, w.height - w.y - value.length * size * LINE, x + valueWidth, w.height - w.y], f.value);
    }
    w.y += height;
    w.rule(w.left, w.left + w.contentWidth, w.y - 1.5, 0.3);
  }
  w.y += 4;
}

interface PreparedTable {
  size: number;
  widths: number[];
  numeric: boolean[];
  header: string[][];
  rows: string[][][];
}

/**
 * Column widths in the manner of automatic table layout: each column at least
 * as wide as its longest word (numbers never wrap), the rest of the line shared
 * in proportion to what each column would need unwrapped.
 */
function prepareTable(w: Writer, table: Table): PreparedTable {
  const numeric = table.columns.map((_, i) => table.rows.length > 0 && table.rows.every((row) => row[i] === null || typeof row[i] === "number"));
  const cells = table.rows.map((row) => table.columns.map((c, i) => w.regular.metrics.sanitize(formatCell(row[i] ?? null, c.digits))));
  const heads = table.columns.map((c) => w.bold.metrics.sanitize(columnHeading(c)));
  const available = w.contentWidth;
  const longestWord = (face: Face, text: string, s: number): number => Math.max(0, ...text.split(" ").map((word) => face.metrics.width(word, s)));
  const measure = (s: number): { natural: number[]; minimum: number[]; content: number[] } => {
    const natural: number[] = [];
    const minimum: number[] = [];
    const content: number[] = [];
    table.columns.forEach((_, i) => {
      const cellNatural = Math.max(0, ...cells.map((r) => w.regular.metrics.width(r[i]!, s)));
      const cellWord = numeric[i] ? cellNatural : Math.max(0, ...cells.map((r) => longestWord(w.regular, r[i]!, s)));
      const headNatural = w.bold.metrics.width(heads[i]!, s);
      const headWord = longestWord(w.bold, heads[i]!, s);
      natural.push(Math.max(cellNatural, headNatural) + 2 * CELL_PAD_X);
      minimum.push(Math.min(Math.max(cellWord, headWord) + 2 * CELL_PAD_X, available * 0.4));
      content.push(cellNatural + 2 * CELL_PAD_X);
    });
    return { natural, minimum, content };
  };
  let size: number = TYPE.table;
  let m = measure(size);
  const sum = (xs: number[]): number => xs.reduce((a, v) => a + v, 0);
  while (sum(m.minimum) > available && size > 5.5) {
    size -= 0.5;
    m = measure(size);
  }
  let widths: number[];
  const naturalTotal = sum(m.natural);
  if (naturalTotal <= available) {
    widths = naturalTotal > available * 0.55 ? m.natural.map((v) => v * (available / naturalTotal)) : m.natural;
  } else {
    // Unwrapping cells comes before unwrapping headers: a header may take two lines, a row should not.
    let spare = available - sum(m.minimum);
    widths = [...m.minimum];
    if (spare <= 0) widths = widths.map((v) => v * (available / sum(m.minimum)));
    for (const target of [m.content, m.natural]) {
      if (spare <= 0) break;
      const want = widths.map((v, i) => Math.max(0, Math.max(target[i]!, v) - v));
      const total = sum(want);
      if (total <= 0) continue;
      const share = Math.min(1, spare / total);
      widths = widths.map((v, i) => v + want[i]! * share);
      spare -= total * share;
    }
  }
  const wrapCell = (text: string, i: number, face: Face): string[] => wrapText(face.metrics, text, size, widths[i]! - 2 * CELL_PAD_X);
  return {
    size,
    widths,
    numeric,
    header: heads.map((h, i) => wrapCell(h, i, w.bold)),
    rows: cells.map((r) => r.map((c, i) => wrapCell(c, i, w.regular))),
  };
}

function drawTable(w: Writer, table: Table): void {
  const t = prepareTable(w, table);
  const lineHeight = t.size * 1.3;
  const rowHeight = (cells: string[][]): number => Math.max(1, ...cells.map((c) => c.length)) * lineHeight + 2 * CELL_PAD_Y;
  const headerHeight = rowHeight(t.header);
  const tableWidth = t.widths.reduce((a, v) => a + v, 0);
  const captionLines = wrapText(w.bold.metrics, w.bold.metrics.sanitize(table.caption), TYPE.caption, w.contentWidth);
  const captionHeight = captionLines.length * TYPE.caption * LINE + 2;

  const drawRow = (cells: string[][], face: Face, top: number): void => {
    let x = w.left;
    cells.forEach((lines, i) => {
      const width = t.widths[i]!;
      lines.forEach((line, k) => {
        const baseline = top + CELL_PAD_Y + t.size + k * lineHeight - 0.5;
        if (t.numeric[i]) w.text(line, x + width - CELL_PAD_X, baseline, t.size, face, INK, "end");
        else w.text(line, x + CELL_PAD_X, baseline, t.size, face);
      });
      x += width;
    });
  };
  const drawHeader = (continued: boolean): void => {
    const lines = continued ? [`${captionLines.join(" ")} (continued)`] : captionLines;
    for (const line of lines) {
      w.text(line, w.left, w.y + TYPE.caption, TYPE.caption, w.bold);
      w.y += TYPE.caption * LINE;
    }
    w.y += 2;
    drawRow(t.header, w.bold, w.y);
    w.y += headerHeight;
    w.rule(w.left, w.left + tableWidth, w.y, 1, INK);
  };

  const firstRow = t.rows[0] ? rowHeight(t.rows[0]) : 0;
  w.ensure(captionHeight + headerHeight + firstRow + 4);
  drawHeader(false);
  t.rows.forEach((cells, index) => {
    const h = rowHeight(cells);
    if (w.y + h > w.bottom) {
      w.newPage();
      drawHeader(true);
    }
    if (index % 2 === 1) w.rect(w.left, w.y, tableWidth, h, "#f7f7f7");
    drawRow(cells, w.regular, w.y);
    w.y += h;
    w.rule(w.left, w.left + tableWidth, w.y, 0.3);
  });
  w.y += 4;
  if (table.note) w.paragraph(table.note, { size: TYPE.small, fill: MUTED });
  w.y += 6;
}

function drawProtocol(w: Writer, text: string): void {
  const size = TYPE.body;
  const pad = 7;
  const lines = wrapText(w.regular.metrics, w.regular.metrics.sanitize(text), size, w.contentWidth - 2 * pad - 3);
  let i = 0;
  while (i < lines.length) {
    w.ensure(size * LINE * Math.min(3, lines.length - i) + 2 * pad);
    const fit = Math.max(1, Math.floor((w.bottom - w.y - 2 * pad) / (size * LINE)));
    const chunk = lines.slice(i, i + fit);
    const h = chunk.length * size * LINE + 2 * pad;
    w.rect(w.left, w.y, w.contentWidth, h, PROTOCOL_BACKGROUND);
    w.rect(w.left, w.y, 3, h, ACCENT);
    chunk.forEach((l, k) => w.text(l, w.left + pad + 3, w.y + pad + size + k * size * LINE, size, w.regular));
    w.y += h;
    i += chunk.length;
    if (i < lines.length) w.newPage();
  }
  w.y += 8;
}

function drawList(w: Writer, items: string[], numbered: boolean): void {
  const size = TYPE.body;
  const indent = numbered ? 16 : 11;
  items.forEach((item, n) => {
    const lines = wrapText(w.regular.metrics, w.regular.metrics.sanitize(item), size, w.contentWidth - indent);
    lines.forEach((l, k) => {
      w.ensure(size * LINE);
      if (k === 0) w.text(numbered ? `${n + 1}.` : "•", w.left + (numbered ? indent - 4 : 2), w.y + size, size, w.regular, INK, numbered ? "end" : "start");
      w.text(l, w.left + indent, w.y + size, size, w.regular);
      w.y += size * LINE;
    });
    w.y += 2.5;
  });
  w.y += 4;
}

function drawSection(w: Writer, section: Section): void {
  // A heading keeps the start of its first block with it: a table's caption, header and first rows, most of a chart, or a few lines.
  w.y += 8;
  const first = section.blocks[0];
  const keep = first?.kind === "table" ? 84 : first?.kind === "chart" ? 170 : 48;
  w.ensure(TYPE.h2 * LINE + 7 + keep);
  w.headings.push({ title: section.title, page: w.page, top: w.y });
  w.text(w.bold.metrics.sanitize(section.title), w.left, w.y + TYPE.h2, TYPE.h2, w.bold, ACCENT);
  w.y += TYPE.h2 * LINE + 1;
  w.rule(w.left, w.left + w.contentWidth, w.y, 0.6);
  w.y += 6;
  for (const block of section.blocks) {
    switch (block.kind) {
      case "facts":
        if (section.id === "summary") drawKeyFacts(w, block.facts);
        else drawFacts(w, block.facts);
        break;
      case "table":
        drawTable(w, block.table);
        break;
      case "chart":
        drawChart(w, block.chart);
        break;
      case "paragraph":
        w.paragraph(block.text, section.id === "citation" ? { size: TYPE.caption } : {});
        w.y += 5;
        break;
      case "protocol":
        drawProtocol(w, block.text);
        break;
      case "list":
        drawList(w, block.items, section.id === "references");
        break;
    }
  }
}

function drawTitle(w: Writer, doc: ReportDocument): void {
  w.text(`TRIALWRIGHT · FROZEN CALCULATION ${doc.record.id}`, w.left, w.y + TYPE.eyebrow, TYPE.eyebrow, w.regular, MUTED);
  w.y += TYPE.eyebrow * LINE + 4;
  const title = doc.record.label ?? doc.designTitle;
  w.paragraph(title, { size: TYPE.h1, face: w.bold });
  if (doc.record.label) w.paragraph(doc.designTitle, { size: 11, face: w.bold, fill: ACCENT });
  w.y += 4;
  w.paragraph(doc.question, { size: 10.5 });
  w.y += 4;
  w.rule(w.left, w.left + w.contentWidth, w.y, 1.5, ACCENT);
  w.y += 4;
}

function truncateToWidth(face: Face, text: string, size: number, width: number): string {
  if (face.metrics.width(text, size) <= width) return text;
  const chars = [...text];
  while (chars.length > 1 && face.metrics.width(`${chars.join("")}…`, size) > width) chars.pop();
  return `${chars.join("")}…`;
}

/** The document outline (bookmarks): one entry per section, opening at its heading (ISO 32000-1 §12.3.3). */
function addOutline(w: Writer): void {
  if (w.headings.length === 0) return;
  const context = w.pdf.context;
  const outlineRef = context.nextRef();
  const refs = w.headings.map(() => context.nextRef());
  w.headings.forEach((h, i) => {
    const item = context.obj({
      Title: PDFHexString.fromText(h.title),
      Parent: outlineRef,
      Dest: [h.page.ref, "XYZ", w.left, w.height - h.top + 4, null],
    });
    if (i > 0) item.set(PDFName.of("Prev"), refs[i - 1]!);
    if (i < refs.length - 1) item.set(PDFName.of("Next"), refs[i + 1]!);
    context.assign(refs[i]!, item);
  });
  context.assign(outlineRef, context.obj({ Type: "Outlines", First: refs[0]!, Last: refs[refs.length - 1]!, Count: refs.length }));
  w.pdf.catalog.set(PDFName.of("Outlines"), outlineRef);
  w.pdf.catalog.set(PDFName.of("PageMode"), PDFName.of("UseOutlines"));
}

/** A clickable area opening a URI (ISO 32000-1 §12.5.6.5 link annotation, §12.6.4.7 URI action). */
function linkArea(pdf: PDFDocument, page: PDFPage, rect: [number, number, number, number], uri: string): void {
  const annotation = pdf.context.obj({
    Type: "Annot", Subtype: "Link", Rect: rect, Border: [0, 0, 0],
    A: { Type: "Action", S: "URI", URI: PDFString.of(uri) },
  });
  page.node.addAnnot(pdf.context.register(annotation));
}

function drawFrame(w: Writer, doc: ReportDocument): void {
  const total = w.pages.length;
  const right = w.left + w.contentWidth;
  const label = w.regular.metrics.sanitize(doc.record.label ?? doc.designTitle);
  const brand = `Trialwright · ${w.regular.metrics.sanitize(doc.designTitle)}`;
  const brandWidth = Math.min(w.regular.metrics.width(brand, TYPE.small), w.contentWidth * 0.45);
  const labelText = truncateToWidth(w.bold, label, TYPE.small, w.contentWidth - brandWidth - 16);
  const brandText = truncateToWidth(w.regular, brand, TYPE.small, brandWidth);
  const footer = `${doc.record.id} · SHA-256 ${doc.record.digest}`;
  w.pages.forEach((page, i) => {
    w.page = page;
    const headerBaseline = PAGE_MARGIN.top - 22;
    w.text(labelText, w.left, headerBaseline, TYPE.small, w.bold);
    w.text(brandText, right, headerBaseline, TYPE.small, w.regular, MUTED, "end");
    w.rule(w.left, right, headerBaseline + 5, 0.5);
    const footerBaseline = w.height - PAGE_MARGIN.bottom + 26;
    w.rule(w.left, right, footerBaseline - 10, 0.5);
    const pageText = `Page ${i + 1} of ${total}`;
    const pageWidth = w.regular.metrics.width(pageText, TYPE.small);
    const footerSize = Math.min(6.5, 6.5 * (w.contentWidth - pageWidth - 12) / w.regular.metrics.width(footer, 6.5));
    w.text(footer, w.left, footerBaseline, footerSize, w.regular, MUTED);
    linkArea(w.pdf, page, [w.left, w.height - footerBaseline - 2, w.left + w.regular.metrics.width(footer, footerSize), w.height - footerBaseline + footerSize], doc.permalink);
    w.text(pageText, right, footerBaseline, TYPE.small, w.regular, MUTED, "end");
  });
}

/**
 * @param doc the report document built by buildReport
 * @param fonts the TrueType bytes of the regular and bold faces
 * @returns the PDF file
 */
export async function renderPdf(doc: ReportDocument, fonts: ReportFonts, options: PdfOptions = {}): Promise<Uint8Array> {
  const pdf = await PDFDocument.create({ updateMetadata: false });
  pdf.registerFontkit(cachedFontkit);
  const regularFont = parseFont(fonts.regular);
  const boldFont = parseFont(fonts.bold);
  const regular: Face = { pdf: await pdf.embedFont(fonts.regular, { subset: true }), metrics: metricsFor(regularFont) };
  const bold: Face = { pdf: await pdf.embedFont(fonts.bold, { subset: true }), metrics: metricsFor(boldFont) };
  const created = new Date(doc.record.createdAt);
  pdf.setTitle(regular.metrics.sanitize(doc.record.label ? `${doc.record.label}: ${doc.designTitle}` : doc.designTitle), { showInWindowTitleBar: true });
  pdf.setAuthor("Trialwright");
  pdf.setSubject(regular.metrics.sanitize(doc.question));
  pdf.setKeywords([doc.record.id, `sha256:${doc.record.digest}`, doc.designId]);
  pdf.setCreator(doc.record.engine);
  pdf.setProducer(`${doc.record.engine} with pdf-lib`);
  pdf.setLanguage("en");
  if (!Number.isNaN(created.getTime())) {
    pdf.setCreationDate(created);
    pdf.setModificationDate(created);
  }
  const w = new Writer(pdf, regular, bold, options.paper ?? "a4");
  drawTitle(w, doc);
  for (const section of doc.sections) drawSection(w, section);
  drawFrame(w, doc);
  addOutline(w);
  return pdf.save({ useObjectStreams: true });
}

const metricsCache = new Map<Font, FontMetrics>();
function metricsFor(font: Font): FontMetrics {
  let m = metricsCache.get(font);
  if (!m) {
    m = new FontMetrics(font);
    metricsCache.set(font, m);
  }
  return m;
}
