// The bindings seen by `env` from "cloudflare:test" are the Worker's own (src/env.ts).
import type { Env as WorkerEnv } from "../../src/env.js";

declare global {
  namespace Cloudflare {
    // eslint-disable-next-line @typescript-eslint/no-empty-object-type
    interface Env extends WorkerEnv {}
  }
}
