/**
 * The ledger decides which record an id stands for. KV has no compare-and-set,
 * so two identical requests racing through "read, then write if absent" could
 * both write, and each client would hold a record (its createdAt and digest)
 * that the other's write replaced. One Durable Object per id serializes the
 * claims: the first record claimed under an id is the record, and every later
 * claim gets that one back. KV stays the store that serves reads; the ledger
 * is asked only when a new record is about to be written.
 */
import { StorageUnavailableError } from "./storageError.js";

export interface LedgerClaim {
  /** True when this claim stored the record; false when an earlier one was already there. */
  created: boolean;
  /** The canonical JSON of the record the id stands for. */
  text: string;
}

export interface RecordLedger {
  claim(id: string, recordText: string): Promise<LedgerClaim>;
}

const RECORD_KEY = "record";

/**
 * One instance per calculation id. A fetch handler (not an RPC class), so the
 * module imports nothing platform-specific and the Worker loads under Node too.
 */
export class CalculationLedger implements DurableObject {
  constructor(private readonly state: DurableObjectState) {}

  async fetch(request: Request): Promise<Response> {
    if (request.method !== "PUT") return new Response(null, { status: 405, headers: { allow: "PUT" } });
    const text = await request.text();
    // The input gate holds other requests to this object while storage is read,
    // and the write is issued before anything else is awaited: check-and-set is atomic.
    const stored = await this.state.storage.get<string>(RECORD_KEY);
    if (stored !== undefined) return Response.json({ created: false, text: stored } satisfies LedgerClaim);
    await this.state.storage.put(RECORD_KEY, text);
    return Response.json({ created: true, text } satisfies LedgerClaim);
  }
}

/** The ledger behind the Worker's Durable Object binding; any failure to reach it is StorageUnavailableError. */
export function durableLedger(namespace: DurableObjectNamespace): RecordLedger {
  return {
    async claim(id, recordText) {
      let response: Response;
      try {
        response = await namespace.get(namespace.idFromName(id)).fetch("https://ledger.internal/claim", { method: "PUT", body: recordText });
      } catch (error) {
        throw new StorageUnavailableError("the ledger could not be reached", error);
      }
      if (!response.ok) throw new StorageUnavailableError(`the ledger answered ${response.status}`);
      return response.json<LedgerClaim>();
    },
  };
}
