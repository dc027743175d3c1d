/** Bindings of the Worker, as declared in wrangler.toml. */
export interface Env {
  /** Frozen calculation records and cached renderings, keyed by id. */
  CALCULATIONS: KVNamespace;
  /** The form pages under static/, served by Workers Static Assets. */
  ASSETS?: Fetcher;
}
