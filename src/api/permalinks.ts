/**
 * Permalinks /c/{id}[.format]: the frozen record as a page, JSON and other
 * formats. A record never changes, so every answer is immutable and tagged
 * with its digest.
 */
import { Hono } from "hono";
import type { Env } from "../env.js";
import { findDesign } from "../designs/catalog.js";
import { buildReport } from "../report/build.js";
import { renderHtml } from "../report/html.js";
import { RecordStore } from "../store/recordStore.js";
import { requireId } from "./calculations.js";
import { ProblemError } from "./problem.js";
import { loadRecord } from "./service.js";

const IMMUTABLE = "public, max-age=31536000, immutable";

export const permalinkRouter = new Hono<{ Bindings: Env }>().get("/:name", async (c) => {
  const name = c.req.param("name");
  const dot = name.indexOf(".");
  const id = requireId(dot < 0 ? name : name.slice(0, dot));
  const format = dot < 0 ? "html" : name.slice(dot + 1);
  const record = await loadRecord(new RecordStore(c.env.CALCULATIONS), id);
  const etag = `"${record.digest}"`;
  c.header("ETag", etag);
  c.header("Cache-Control", IMMUTABLE);
  const match = c.req.header("if-none-match");
  if (match && match.split(",").some((t) => t.trim().replace(/^W\//, "") === etag)) return c.body(null, 304);
  const design = findDesign(record.design);
  switch (format) {
    case "json":
      return c.json(record);
    case "html": {
      if (!design) throw new ProblemError(404, "unknown-design", "Design no longer served", `The design ${record.design} is not in this catalog.`);
      return c.html(renderHtml(buildReport(design, record, new URL(c.req.url).origin)));
    }
    default:
      throw new ProblemError(404, "unknown-format", "No such format", `Calculations are served as /c/${id} (HTML) and /c/${id}.json.`);
  }
});
