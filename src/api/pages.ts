/**
 * The form pages through the Worker. Workers Static Assets answers page paths
 * before the Worker runs (wrangler.toml `run_worker_first` keeps /api and /c
 * for the Worker), so in `wrangler dev` and in production this router only
 * sees paths no file matches. The Workers test pool calls the Worker directly,
 * with no asset router in front; there the same ASSETS binding serves the pages
 * through this fallback, so tests see what users see.
 */
import { Hono } from "hono";
import type { Env } from "../env.js";

const WORKER_PATHS = /^\/(api|c)(\/|$)/;

export const pagesRouter = new Hono<{ Bindings: Env }>().get("*", async (c) => {
  const path = new URL(c.req.url).pathname;
  if (!c.env.ASSETS || WORKER_PATHS.test(path)) return c.notFound();
  const response = await c.env.ASSETS.fetch(c.req.raw);
  return response.status === 404 ? c.notFound() : response;
});
