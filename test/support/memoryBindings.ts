// In-memory stand-ins for the Worker's KV namespace and ledger binding, for
// driving the app under Node (benchmarks, scripts). Tests of storage itself
// run against miniflare's real KV and Durable Objects in the Workers pool.
import type { Env } from "../../src/env.js";
import { CalculationLedger } from "../../src/store/ledger.js";

/** The KV calls the record store makes, over a Map, counting writes. */
export class MemoryKV {
  readonly values = new Map<string, string | ArrayBuffer>();
  puts = 0;
  async get(key: string, type: "text" | "arrayBuffer"): Promise<string | ArrayBuffer | null> {
    const v = this.values.get(key);
    if (v === undefined) return null;
    if (type === "arrayBuffer") return typeof v === "string" ? new TextEncoder().encode(v).buffer : v;
    return typeof v === "string" ? v : new TextDecoder().decode(v);
  }
  async put(key: string, value: string | ArrayBuffer | Uint8Array): Promise<void> {
    this.puts++;
    this.values.set(key, typeof value === "string" ? value : value instanceof Uint8Array ? value.slice().buffer : value);
  }
}

/** The ledger's Durable Object namespace: one CalculationLedger per name, each with Map storage. */
function memoryLedgerNamespace(): DurableObjectNamespace {
  const objects = new Map<string, CalculationLedger>();
  const objectFor = (name: string): CalculationLedger => {
    let object = objects.get(name);
    if (!object) {
      const storage = new Map<string, unknown>();
      const state = { storage: { get: async (k: string) => storage.get(k), put: async (k: string, v: unknown) => { storage.set(k, v); } } };
      object = new CalculationLedger(state as unknown as DurableObjectState);
      objects.set(name, object);
    }
    return object;
  };
  return {
    idFromName: (name: string) => ({ name }),
    get: (id: { name: string }) => ({ fetch: (url: string, init: RequestInit) => objectFor(id.name).fetch(new Request(url, init)) }),
  } as unknown as DurableObjectNamespace;
}

/** Bindings for `app.fetch` under Node: memory KV and ledger, no static assets. */
export function memoryEnv(): Env & { CALCULATIONS: MemoryKV & KVNamespace } {
  return { CALCULATIONS: new MemoryKV() as MemoryKV & KVNamespace, LEDGER: memoryLedgerNamespace() };
}
