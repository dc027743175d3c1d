/** Bindings of the Worker, as declared in wrangler.toml. */
export interface Env {
  /** Frozen calculation records and cached renderings, keyed by id. */
  CALCULATIONS: KVNamespace;
  /** One Durable Object per calculation id, deciding which record the id stands for (src/store/ledger.ts). */
  LEDGER?: DurableObjectNamespace;
  /** The form pages under static/, served by Workers Static Assets. */
  ASSETS?: Fetcher;
}
