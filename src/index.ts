/** The Worker: wires the routers and turns every failure into problem+json. */
import { Hono } from "hono";
import type { Env } from "./env.js";
import { createRouter, readRouter } from "./api/calculations.js";
import { designsRouter } from "./api/designs.js";
import { healthRouter } from "./api/health.js";
import { openApiRouter } from "./api/openapi.js";
import { pagesRouter } from "./api/pages.js";
import { permalinkRouter } from "./api/permalinks.js";
import { previewRouter } from "./api/previews.js";
import { ProblemError, problemResponse } from "./api/problem.js";

export const app = new Hono<{ Bindings: Env }>();

app.route("/api/v1/designs", designsRouter);
app.route("/api/v1/designs", createRouter);
app.route("/api/v1/designs", previewRouter);
app.route("/api/v1/calculations", readRouter);
app.route("/api/v1", openApiRouter);
app.route("/api/v1", healthRouter);
app.route("/c", permalinkRouter);
app.route("/", pagesRouter);

app.notFound((c) => problemResponse(c, new ProblemError(404, "not-found", "Not found", `Nothing is served at ${new URL(c.req.url).pathname}.`)));

app.onError((error, c) => {
  if (error instanceof ProblemError) return problemResponse(c, error);
  console.error(error);
  return problemResponse(c, new ProblemError(500, "internal-error", "Internal error", "The service failed while handling this request. The request was not stored."));
});

export default app;
export { CalculationLedger } from "./store/ledger.js";
