/**
 * Cross-origin access to the JSON API and the permalinks: open to every
 * origin, without credentials (the service has no cookies or accounts). The
 * headers a client needs to follow a created calculation or a cached report
 * are exposed.
 */
import type { cors } from "hono/cors";
import { RENDERING_HEADER } from "./renderingHeader.js";

export const API_CORS = {
  origin: "*",
  allowMethods: ["GET", "HEAD", "POST", "OPTIONS"],
  allowHeaders: ["Content-Type", "If-None-Match"],
  exposeHeaders: ["Location", "Link", "ETag", "Retry-After", "Content-Disposition", RENDERING_HEADER],
  maxAge: 86400,
} satisfies Parameters<typeof cors>[0];
