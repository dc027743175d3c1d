/**
 * Records in KV under "calc:<id>", stored as canonical JSON, verified on every
 * read. Knows nothing of designs. Which record an id stands for is decided by
 * the ledger (ledger.ts) before a record is written here; KV serves reads.
 * Every KV failure surfaces as StorageUnavailableError.
 */
import { canonicalJson } from "./canonical.js";
import { type CalculationRecord, recordDigest } from "./record.js";
import { BoundedCache } from "./boundedCache.js";
import { StorageUnavailableError } from "./storageError.js";

export type ReadOutcome =
  | { status: "found"; record: CalculationRecord; text: string }
  | { status: "missing" }
  | { status: "corrupt"; reason: string; storedDigest?: string; computedDigest?: string };

const recordKey = (id: string): string => `calc:${id}`;

/** Checks stored text against the id it was stored under: valid JSON, the same id, a matching digest, canonical bytes. */
export async function verifyRecordText(id: string, text: string): Promise<Exclude<ReadOutcome, { status: "missing" }>> {
  let parsed: unknown;
  try {
    parsed = JSON.parse(text);
  } catch {
    return { status: "corrupt", reason: "the stored bytes are not valid JSON" };
  }
  if (typeof parsed !== "object" || parsed === null || Array.isArray(parsed)) {
    return { status: "corrupt", reason: "the stored value is not a record" };
  }
  const record = parsed as CalculationRecord;
  if (record.id !== id) return { status: "corrupt", reason: "the stored record carries another id" };
  const computed = await recordDigest(record);
  if (computed !== record.digest) {
    return { status: "corrupt", reason: "the digest does not match the content", storedDigest: record.digest, computedDigest: computed };
  }
  if (canonicalJson(record) !== text) return { status: "corrupt", reason: "the stored bytes are not in canonical form" };
  return { status: "found", record, text };
}

async function attempt<T>(what: string, operation: () => Promise<T>): Promise<T> {
  try {
    return await operation();
  } catch (error) {
    throw new StorageUnavailableError(what, error);
  }
}

/**
 * Records read and verified in this Worker, so a permalink read again is
 * served without a KV read or a second digest check. 8 MiB, each record
 * counted as four bytes a character of its text (the text and its parsed copy):
 * about five hundred typical records, well inside a Worker's 128 MB.
 */
const verified = new BoundedCache<Extract<ReadOutcome, { status: "found" }>>(8 * 1024 * 1024);

/**
 * A remembered record is shared by every later request in this Worker, so it
 * is frozen: code that changed it (a report sorting a result's array in place,
 * say) would throw instead of silently altering what later readers are served.
 */
function deepFreeze<T>(value: T): T {
  if (typeof value === "object" && value !== null && !Object.isFrozen(value)) {
    Object.freeze(value);
    for (const member of Object.values(value)) deepFreeze(member);
  }
  return value;
}

export class RecordStore {
  constructor(private readonly kv: KVNamespace) {}

  /**
   * Reads and verifies a record. A record verified once is kept in memory:
   * frozen records never change, and what is kept is only what passed the check.
   */
  async read(id: string): Promise<ReadOutcome> {
    const remembered = verified.get(id);
    if (remembered) return remembered;
    const text = await attempt("the record could not be read", () => this.kv.get(recordKey(id), "text"));
    if (text === null) return { status: "missing" };
    const outcome = await verifyRecordText(id, text);
    if (outcome.status === "found") verified.set(id, { ...outcome, record: deepFreeze(outcome.record) }, text.length * 4);
    return outcome;
  }

  /** Writes a record's canonical bytes: the record the ledger gave for its id, so a write never replaces one record with another. */
  async write(id: string, canonicalText: string): Promise<void> {
    await attempt("the record could not be written", () => this.kv.put(recordKey(id), canonicalText));
  }

  /** A cached rendering of a record (the PDF), keyed by id and format. */
  async getRendering(id: string, format: string): Promise<ArrayBuffer | null> {
    return attempt("the rendering cache could not be read", () => this.kv.get(`render:${format}:${id}`, "arrayBuffer"));
  }

  async putRendering(id: string, format: string, bytes: ArrayBuffer | Uint8Array): Promise<void> {
    await attempt("the rendering could not be cached", () => this.kv.put(`render:${format}:${id}`, bytes));
  }
}
