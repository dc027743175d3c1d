// The small formats: CSV (RFC 4180), the SVG chart drawing and its layout,
// BibTeX and RIS entries, and number formatting shared by all renderers.
import { PDFArray, PDFDict, PDFDocument, PDFHexString, PDFName, PDFRef, PDFString } from "pdf-lib";
import { describe, expect, it } from "vitest";
import { layoutChart } from "../../../src/report/chartLayout.js";
import { accessDate, toBibtex, toRis } from "../../../src/report/citation.js";
import { tableCsv } from "../../../src/report/csv.js";
import type { Chart } from "../../../src/report/document.js";
import { renderPdf } from "../../../src/report/pdf.js";
import { visualOrder } from "../../../src/report/pdfText.js";
import { renderChartSvg } from "../../../src/report/svg.js";
import { twoMeans } from "../../../src/designs/twoMeans.js";
import { TEST_FONTS, exampleReport } from "../../support/report.js";

describe("CSV", () => {
  it("quotes fields with commas, quotes and line breaks, CRLF between records (RFC 4180 §2)", () => {
    const csv = tableCsv({
      id: "t", caption: "c",
      columns: [{ key: "a", label: "Dose, mg" }, { key: "b", label: "P", unit: "%" }, { key: "c", label: "Note" }],
      rows: [["TW-417 \"high\"", 0.1234567890123, "line\nbreak"], [null, 3, "plain"]],
    });
    expect(csv).toBe('"Dose, mg",P (%),Note\r\n"TW-417 ""high""",0.1234567890123,"line\nbreak"\r\n,3,plain\r\n');
  });

  it("keeps text that a spreadsheet would run as a formula as text (OWASP, CSV injection)", () => {
    const csv = tableCsv({ id: "t", caption: "c", columns: [{ key: "a", label: "=cmd" }], rows: [["=HYPERLINK(\"x\")"], ["+1"], ["-2"], ["@SUM(A1)"], [-2]] });
    expect(csv.split("\r\n")).toEqual(["'=cmd", '"\'=HYPERLINK(""x"")"', "'+1", "'-2", "'@SUM(A1)", "-2", ""]);
  });
});

const powerChart: Chart = {
  id: "power", title: "Power <against> n", xLabel: "n", yLabel: "Power", yDomain: [0, 1],
  series: [{ name: "Power & co", points: [[10, 0.2], [20, 0.5], [40, 0.9]], style: "line" }],
  markers: [{ axis: "y", value: 0.8, label: "target 0.8" }, { axis: "x", value: 30, label: "n = 30" }],
};

describe("chart layout and SVG", () => {
  it("places points by linear scales inside the plot and the y domain as given", () => {
    const layout = layoutChart(powerChart, { width: 600, height: 300, fontSize: 10 });
    const line = layout.primitives.find((p) => p.type === "polyline");
    expect(line?.type).toBe("polyline");
    const pts = line!.type === "polyline" ? line!.points : [];
    // Equal steps in x give equal steps on the page: 10→20 is half of 20→40.
    expect(pts[2]![0] - pts[1]![0]).toBeCloseTo(2 * (pts[1]![0] - pts[0]![0]), 9);
    // y = 0.5 is midway between the tick labels for 0 and 1 (yDomain [0, 1] is kept as given).
    const tickY = (label: string): number => {
      const t = layout.primitives.find((p) => p.type === "text" && p.text === label);
      return t && t.type === "text" ? t.y : Number.NaN;
    };
    expect(pts[1]![1]).toBeCloseTo((tickY("0.0") + tickY("1.0")) / 2 - 10 * 0.35, 6);
  });

  it("escapes titles, series names and labels and never writes NaN", () => {
    const svg = renderChartSvg(powerChart);
    expect(svg).toContain("Power &lt;against&gt; n");
    expect(svg).not.toMatch(/NaN|Infinity|undefined/);
    expect(svg).toMatch(/^<svg [^>]*role="img"/);
  });

  it("draws degenerate charts without failing: no points, one point, a flat line, non-finite values", () => {
    const cases: Chart[] = [
      { id: "a", title: "empty", xLabel: "x", yLabel: "y", series: [] },
      { id: "b", title: "one", xLabel: "x", yLabel: "y", series: [{ name: "s", points: [[1, 1]] }] },
      { id: "c", title: "flat", xLabel: "x", yLabel: "y", series: [{ name: "s", points: [[0, 2], [1, 2], [2, 2]], style: "step" }] },
      { id: "d", title: "holes", xLabel: "x", yLabel: "y", series: [{ name: "s", points: [[0, Number.NaN], [1, 3], [Number.POSITIVE_INFINITY, 1]], style: "points" }] },
    ];
    for (const chart of cases) expect(renderChartSvg(chart)).not.toMatch(/NaN|Infinity/);
  });

  it("puts bars on category bands with their labels", () => {
    const svg = renderChartSvg({
      id: "dose", title: "Selection", xLabel: "Dose", yLabel: "Probability", categories: ["None", "10 mg", "20 mg"],
      series: [{ name: "P(selected)", points: [[0, 0.1], [1, 0.3], [2, 0.6]], style: "bars" }],
    });
    expect(svg.match(/<rect /g)).toHaveLength(3);
    for (const label of ["None", "10 mg", "20 mg"]) expect(svg).toContain(`>${label}</text>`);
  });
});

describe("citation entries", () => {
  it("date the access in UTC and carry the record's id, digest and permalink", async () => {
    const doc = await exampleReport(twoMeans, "TW-417 sizing");
    const accessed = new Date("2026-12-31T23:30:00-05:00");
    expect(accessDate(accessed)).toBe("2027-01-01");
    const bib = toBibtex(doc, accessed);
    expect(bib).toContain(`urldate      = {2027-01-01}`);
    expect(bib).toContain(doc.record.digest);
    expect(bib).toContain(`url          = {${doc.permalink}}`);
    expect(bib).toContain(`title        = {{TW-417 sizing: ${doc.designTitle}}}`);
    const ris = toRis(doc, accessed);
    expect(ris).toContain("Y2  - 2027/01/01\r\n");
    expect(ris).toContain(`ID  - ${doc.record.id}\r\n`);
  });
});

describe("PDF links", () => {
  it("makes the permalink clickable in every page's footer (URI actions, ISO 32000-1 §12.6.4.7)", async () => {
    const doc = await exampleReport(twoMeans, "TW-417 links");
    const pdf = await PDFDocument.load(await renderPdf(doc, TEST_FONTS));
    for (const page of pdf.getPages()) {
      const annots = page.node.Annots();
      expect(annots?.size()).toBeGreaterThan(0);
      const uris = Array.from({ length: annots!.size() }, (_, i) => {
        const action = (pdf.context.lookup(annots!.get(i)) as PDFDict).lookup(PDFName.of("A"), PDFDict);
        return action.lookup(PDFName.of("URI"), PDFString).decodeText();
      });
      expect(uris).toContain(doc.permalink);
    }
  });
});

describe("PDF outline", () => {
  it("has one bookmark per section, in order, each opening on a page of the document (ISO 32000-1 §12.3.3)", async () => {
    const doc = await exampleReport(twoMeans, "TW-417 outline");
    const pdf = await PDFDocument.load(await renderPdf(doc, TEST_FONTS));
    const outlines = pdf.catalog.lookup(PDFName.of("Outlines"), PDFDict);
    const pageRefs = pdf.getPages().map((p) => p.ref.toString());
    const titles: string[] = [];
    let item = outlines.lookup(PDFName.of("First"), PDFDict) as PDFDict | undefined;
    while (item) {
      titles.push(item.lookup(PDFName.of("Title"), PDFHexString).decodeText());
      const dest = item.lookup(PDFName.of("Dest"), PDFArray);
      expect(pageRefs).toContain((dest.get(0) as PDFRef).toString());
      item = item.lookup(PDFName.of("Next")) as PDFDict | undefined;
    }
    expect(titles).toEqual(doc.sections.map((s) => s.title));
  });
});

describe("visual order of right-to-left text (UAX #9, simplified)", () => {
  it("reverses a Hebrew run inside a left-to-right line, keeping numbers and the Latin text in order", () => {
    // Visual order read left to right: Latin as typed, then the Hebrew words from last to first, each letter reversed.
    expect(visualOrder("TW-417 שלב 2 מינון")).toBe("TW-417 ןונימ 2 בלש");
    expect(visualOrder("dose 12.5 mg")).toBe("dose 12.5 mg");
    expect(visualOrder("אב 10.25 גד")).toBe("דג 10.25 בא");
  });
});
