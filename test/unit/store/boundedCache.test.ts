// The in-memory cache of verified records and drawn pages: bounded in bytes,
// least recently used out first.
import { describe, expect, it } from "vitest";
import { BoundedCache } from "../../../src/store/boundedCache.js";

describe("BoundedCache", () => {
  it("keeps values until their total size would pass the bound, then drops the least recently used", () => {
    const cache = new BoundedCache<string>(10);
    cache.set("a", "A", 4);
    cache.set("b", "B", 4);
    expect(cache.get("a")).toBe("A"); // a is now the most recently used
    cache.set("c", "C", 4);
    expect(cache.get("b")).toBeUndefined();
    expect(cache.get("a")).toBe("A");
    expect(cache.get("c")).toBe("C");
    expect(cache.bytes).toBe(8);
    expect(cache.size).toBe(2);
  });

  it("replaces a key's value and its size", () => {
    const cache = new BoundedCache<string>(10);
    cache.set("a", "A", 6);
    cache.set("a", "A2", 3);
    expect(cache.bytes).toBe(3);
    expect(cache.get("a")).toBe("A2");
  });

  it("never keeps a value larger than the whole bound, and evicts nothing for it", () => {
    const cache = new BoundedCache<string>(10);
    cache.set("a", "A", 5);
    cache.set("huge", "H", 11);
    expect(cache.get("huge")).toBeUndefined();
    expect(cache.get("a")).toBe("A");
  });

  it("evicts as many entries as a large value needs", () => {
    const cache = new BoundedCache<number>(10);
    for (let i = 0; i < 5; i++) cache.set(`k${i}`, i, 2);
    cache.set("big", 99, 9);
    expect(cache.size).toBe(1);
    expect(cache.get("big")).toBe(99);
  });
});
