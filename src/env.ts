/** Bindings of the Worker, as declared in wrangler.toml. */
export interface Env {
  /** Frozen calculation records and cached renderings, keyed by id. */
  CALCULATIONS: KVNamespace;
  /** One Durable Object per calculation id, deciding which record the id stands for (src/store/ledger.ts). */
  LEDGER: DurableObjectNamespace;
  /** Counts computing requests per client address (src/api/rateLimit.ts); used only when RATE_LIMIT is "on". */
  COMPUTE_RATE_LIMITER?: RateLimit;
  /** "on" to apply the rate limit; "off" (the default, for local development and tests). */
  RATE_LIMIT?: string;
  /** The form pages under static/, served by Workers Static Assets. */
  ASSETS?: Fetcher;
}
