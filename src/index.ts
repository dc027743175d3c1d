/** The Worker: wires the routers and turns every failure into problem+json. */
import { Hono } from "hono";
import { cors } from "hono/cors";
import type { Env } from "./env.js";
import { createRouter, readRouter } from "./api/calculations.js";
import { designsRouter } from "./api/designs.js";
import { healthRouter } from "./api/health.js";
import { openApiRouter } from "./api/openapi.js";
import { pagesRouter } from "./api/pages.js";
import { permalinkRouter } from "./api/permalinks.js";
import { previewRouter } from "./api/previews.js";
import { ProblemError, problemResponse } from "./api/problem.js";
import { rateLimitComputation } from "./api/rateLimit.js";
import { securityHeaders } from "./api/securityHeaders.js";
import { API_CORS } from "./api/cors.js";

export const app = new Hono<{ Bindings: Env }>();

app.use("*", securityHeaders);
// The JSON API and the permalinks are meant to be called from other systems' pages. Nothing
// they can do writes state beyond a calculation, and no cookie or credential is involved.
app.use("/api/*", cors(API_CORS));
app.use("/c/*", cors(API_CORS));
app.post("/api/v1/designs/:design/calculations", rateLimitComputation);
app.post("/api/v1/designs/:design/previews", rateLimitComputation);

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
