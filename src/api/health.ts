/**
 * GET /api/v1/health: answers at once, touching neither storage nor designs,
 * for uptime checks and as the load test's measure of the runtime's own ceiling.
 */
import { Hono } from "hono";
import type { Env } from "../env.js";
import { ENGINE } from "../version.js";

export const healthRouter = new Hono<{ Bindings: Env }>().get("/health", (c) => {
  c.header("Cache-Control", "no-store");
  return c.json({ status: "ok", engine: ENGINE });
});
