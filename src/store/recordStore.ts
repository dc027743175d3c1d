/**
 * Records in KV under "calc:<id>", stored as canonical JSON. Knows nothing of designs.
 *
 * KV has no compare-and-set, so "put only if absent" is a read followed by a write.
 * Two identical requests racing within KV's propagation window could both write;
 * they carry the same inputs and result, differing only in createdAt, and the
 * later write wins. DEVELOPERS.md records this trade-off.
 */
import { canonicalJson } from "./canonical.js";
import { type CalculationRecord, recordDigest } from "./record.js";

export type ReadOutcome =
  | { status: "found"; record: CalculationRecord }
  | { status: "missing" }
  | { status: "corrupt"; reason: string; storedDigest?: string; computedDigest?: string };

const recordKey = (id: string): string => `calc:${id}`;

export class RecordStore {
  constructor(private readonly kv: KVNamespace) {}

  /** Reads and verifies a record: the digest must match its content and the key its id. */
  async read(id: string): Promise<ReadOutcome> {
    const text = await this.kv.get(recordKey(id), "text");
    if (text === null) return { status: "missing" };
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
    return { status: "found", record };
  }

  /** Writes the record unless one is already stored under its id; returns what is stored. */
  async putIfAbsent(record: CalculationRecord): Promise<{ created: boolean; outcome: ReadOutcome }> {
    const existing = await this.read(record.id);
    if (existing.status !== "missing") return { created: false, outcome: existing };
    await this.kv.put(recordKey(record.id), canonicalJson(record));
    return { created: true, outcome: { status: "found", record } };
  }

  /** A cached rendering of a record (the PDF), keyed by id and format. */
  async getRendering(id: string, format: string): Promise<ArrayBuffer | null> {
    return this.kv.get(`render:${format}:${id}`, "arrayBuffer");
  }

  async putRendering(id: string, format: string, bytes: ArrayBuffer | Uint8Array): Promise<void> {
    await this.kv.put(`render:${format}:${id}`, bytes);
  }
}
