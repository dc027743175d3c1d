/**
 * A least-recently-used map bounded by the total size of its values, kept in
 * the Worker's memory across requests. Only immutable, already verified
 * content goes in (a record never changes once frozen), so nothing is ever
 * invalidated: an entry leaves only to make room.
 */
export class BoundedCache<V> {
  private readonly entries = new Map<string, { value: V; size: number }>();
  private total = 0;

  constructor(private readonly maxBytes: number) {}

  get(key: string): V | undefined {
    const entry = this.entries.get(key);
    if (!entry) return undefined;
    // Re-inserting moves the key to the end: Map iteration order is the recency order.
    this.entries.delete(key);
    this.entries.set(key, entry);
    return entry.value;
  }

  /** Keeps the value unless it alone exceeds the bound; evicts the least recently used until it fits. */
  set(key: string, value: V, size: number): void {
    if (size > this.maxBytes) return;
    const old = this.entries.get(key);
    if (old) {
      this.total -= old.size;
      this.entries.delete(key);
    }
    while (this.total + size > this.maxBytes) {
      const oldest = this.entries.keys().next();
      if (oldest.done) break;
      this.total -= this.entries.get(oldest.value)!.size;
      this.entries.delete(oldest.value);
    }
    this.entries.set(key, { value, size });
    this.total += size;
  }

  get bytes(): number {
    return this.total;
  }

  get size(): number {
    return this.entries.size;
  }
}
