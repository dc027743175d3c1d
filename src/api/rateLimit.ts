/**
 * An optional rate limit on the requests that compute (calculations and
 * previews), through the Workers rate-limiting binding, counted per client
 * address. It applies only where the binding exists and RATE_LIMIT is "on":
 * `npm run deploy` turns it on; local development, the tests and the load
 * test run without it (wrangler.toml).
 */
import type { MiddlewareHandler } from "hono";
import type { Env } from "../env.js";
import { ProblemError } from "./problem.js";

/** The binding's period (wrangler.toml `[ratelimits.simple]`), told to clients as Retry-After. */
const RATE_LIMIT_PERIOD_SECONDS = 60;

export const rateLimitComputation: MiddlewareHandler<{ Bindings: Env }> = async (c, next) => {
  const limiter = c.env.COMPUTE_RATE_LIMITER;
  if (c.env.RATE_LIMIT === "on" && limiter) {
    // Cloudflare sets CF-Connecting-IP; with no address every such request shares one count.
    const key = c.req.header("cf-connecting-ip") ?? "unknown";
    const { success } = await limiter.limit({ key });
    if (!success) {
      throw new ProblemError(429, "rate-limited", "Too many calculations",
        `This address sent more calculations and previews than the service takes in ${RATE_LIMIT_PERIOD_SECONDS} seconds. Wait and send the request again; frozen calculations and reports can still be read.`,
        { retryAfterSeconds: RATE_LIMIT_PERIOD_SECONDS });
    }
  }
  await next();
};
