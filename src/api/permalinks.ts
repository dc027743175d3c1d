/**
 * Permalinks /c/{id}[.format]: the frozen record as a page (HTML), a PDF,
 * JSON, CSV per table, and BibTeX and RIS citation entries. A record never
 * changes, so every answer is immutable and tagged with its digest; the PDF is
 * rendered once and kept in KV beside the record.
 */
import { Hono } from "hono";
import type { Context } from "hono";
import type { Env } from "../env.js";
import { findDesign } from "../designs/catalog.js";
import { type ReportDocument, buildReport, findTable, mainTables } from "../report/build.js";
import { toBibtex, toRis } from "../report/citation.js";
import { tableCsv } from "../report/csv.js";
import { REPORT_FONTS } from "../report/fonts.js";
import { renderHtml } from "../report/html.js";
import { renderPdf } from "../report/pdf.js";
import type { CalculationRecord } from "../store/record.js";
import { RecordStore } from "../store/recordStore.js";
import { BoundedCache } from "../store/boundedCache.js";
import { JSON_TYPE, requireId } from "./calculations.js";
import { ProblemError } from "./problem.js";
import { RENDERING_HEADER } from "./renderingHeader.js";
import { loadRecord } from "./service.js";

const IMMUTABLE = "public, max-age=31536000, immutable";
/** Bump when the PDF layout changes, so cached renderings of old layouts are not served. */
export const PDF_RENDERING_VERSION = 2;
/** The page forbids every script and every request outside itself; a second guard behind escaping. */
const HTML_POLICY = "default-src 'none'; style-src 'unsafe-inline'; img-src data:; base-uri 'none'; form-action 'none'; frame-ancestors 'none'";

/** Report pages drawn in this Worker: a record never changes, so its page for a given origin never does either. */
const renderedPages = new BoundedCache<string>(8 * 1024 * 1024);

const FORMATS = ["html", "pdf", "json", "csv", "bib", "ris"] as const;
type Format = (typeof FORMATS)[number];

function parseName(name: string): { id: string; format: Format } {
  const dot = name.indexOf(".");
  const id = requireId(dot < 0 ? name : name.slice(0, dot));
  const format = dot < 0 ? "html" : name.slice(dot + 1);
  if (!(FORMATS as readonly string[]).includes(format)) {
    throw new ProblemError(404, "unknown-format", "No such format",
      `Calculations are served as /c/${id} (HTML), ${FORMATS.filter((f) => f !== "html").map((f) => `/c/${id}.${f}`).join(", ")}.`);
  }
  return { id, format: format as Format };
}

function notModified(c: Context, etag: string): boolean {
  const match = c.req.header("if-none-match");
  if (!match) return false;
  return match.trim() === "*" || match.split(",").some((t) => t.trim().replace(/^W\//, "") === etag);
}

function reportFor(c: Context, record: CalculationRecord): ReportDocument {
  const design = findDesign(record.design);
  if (!design) throw new ProblemError(404, "unknown-design", "Design no longer served", `The design ${record.design} is not in this catalog; /c/${record.id}.json still serves the record.`);
  return buildReport(design, record, new URL(c.req.url).origin);
}

/** The PDF from the rendering cache, or drawn now and kept; the report is only built on a miss. */
async function pdfBytes(store: RecordStore, id: string, host: string, report: () => ReportDocument, paper: "a4" | "letter"): Promise<{ bytes: ArrayBuffer | Uint8Array; cached: boolean }> {
  // The PDF prints its permalink, so a copy drawn for one host name is not served under another.
  const key = `pdf-v${PDF_RENDERING_VERSION}-${paper}-${host}`;
  const hit = await store.getRendering(id, key).catch((error: unknown) => {
    // An unreadable cache costs a render, not this answer.
    console.error(error);
    return null;
  });
  if (hit) return { bytes: hit, cached: true };
  const bytes = await renderPdf(report(), REPORT_FONTS, { paper });
  try {
    await store.putRendering(id, key, bytes);
  } catch (error) {
    // A failed cache write costs a re-render later, not this answer.
    console.error(error);
  }
  return { bytes, cached: false };
}

function attachment(name: string, inline: boolean): string {
  return `${inline ? "inline" : "attachment"}; filename="${name}"`;
}

export const permalinkRouter = new Hono<{ Bindings: Env }>().get("/:name", async (c) => {
  const { id, format } = parseName(c.req.param("name"));
  const paperParam = c.req.query("paper");
  if (format === "pdf" && paperParam !== undefined && paperParam !== "a4" && paperParam !== "letter") {
    throw new ProblemError(400, "unknown-paper", "No such paper size", "The PDF is drawn on paper=a4 (the default) or paper=letter.");
  }
  const store = new RecordStore(c.env.CALCULATIONS);
  const { record, text } = await loadRecord(store, id);
  let doc: ReportDocument | undefined;
  const report = (): ReportDocument => (doc ??= reportFor(c, record));
  const tableId = c.req.query("table");
  const table = format === "csv" ? (tableId ? findTable(report(), tableId) : mainTables(report())[0] ?? findTable(report(), "inputs")) : undefined;
  if (format === "csv" && !table) {
    throw new ProblemError(404, "unknown-table", "No such table",
      `This report has the tables ${report().sections.flatMap((s) => s.blocks.flatMap((b) => (b.kind === "table" ? [b.table.id] : []))).join(", ")}; ask for one as /c/${id}.csv?table=<id>.`);
  }

  const etag = `"${record.digest}"`;
  c.header("ETag", etag);
  c.header("Cache-Control", IMMUTABLE);
  c.header("X-Content-Type-Options", "nosniff");
  if (notModified(c, etag)) return c.body(null, 304);

  switch (format) {
    case "json":
      return c.body(text, 200, { "content-type": JSON_TYPE });
    case "html": {
      c.header("Content-Security-Policy", HTML_POLICY);
      // The page prints its own permalink, so a page drawn for one origin is kept apart from another's.
      const key = `${new URL(c.req.url).origin} ${id}`;
      let page = renderedPages.get(key);
      if (page === undefined) {
        page = renderHtml(report());
        renderedPages.set(key, page, page.length * 2);
      }
      return c.html(page);
    }
    case "pdf": {
      const { bytes, cached } = await pdfBytes(store, id, new URL(c.req.url).host, report, paperParam === "letter" ? "letter" : "a4");
      c.header(RENDERING_HEADER, cached ? "cached" : "rendered");
      c.header("Content-Type", "application/pdf");
      c.header("Content-Disposition", attachment(`${id}.pdf`, true));
      return c.body(new Uint8Array(bytes));
    }
    case "csv":
      c.header("Content-Type", "text/csv; charset=utf-8; header=present");
      c.header("Content-Disposition", attachment(`${id}-${table!.id.replace(/[^A-Za-z0-9_-]/g, "-")}.csv`, false));
      return c.body(tableCsv(table!));
    case "bib":
      c.header("Content-Type", "application/x-bibtex; charset=utf-8");
      c.header("Content-Disposition", attachment(`${id}.bib`, false));
      return c.body(toBibtex(report(), new Date()));
    case "ris":
      c.header("Content-Type", "application/x-research-info-systems; charset=utf-8");
      c.header("Content-Disposition", attachment(`${id}.ris`, false));
      return c.body(toRis(report(), new Date()));
  }
});
