import { describe, expect, it } from "vitest";
import { BoundedCache } from "./bounded-cache";

// Least-recently-used eviction as described in the literature on page replacement (common practice).
describe("BoundedCache", () => {
  it("drops the least recently used entry once the bound is passed", () => {
    const cache = new BoundedCache<string, number>(2);
    cache.set("a", 1);
    cache.set("b", 2);
    expect(cache.get("a")).toBe(1); // "a" is now the most recently used
    cache.set("c", 3);
    expect(cache.get("b")).toBeUndefined();
    expect(cache.get("a")).toBe(1);
    expect(cache.get("c")).toBe(3);
    expect(cache.size).toBe(2);
  });

  it("bounds the total weight, not the count", () => {
    const cache = new BoundedCache<string, string>(10, (s) => s.length);
    cache.set("x", "12345");
    cache.set("y", "1234");
    expect(cache.weight).toBe(9);
    cache.set("z", "123");
    // 5 + 4 + 3 = 12 > 10: the oldest ("x") goes.
    expect(cache.get("x")).toBeUndefined();
    expect(cache.weight).toBe(7);
  });

  it("never keeps a value heavier than the bound, and replacing a key counts its weight once", () => {
    const cache = new BoundedCache<string, string>(4, (s) => s.length);
    cache.set("big", "12345");
    expect(cache.get("big")).toBeUndefined();
    cache.set("k", "12");
    cache.set("k", "123");
    expect(cache.weight).toBe(3);
    cache.delete("k");
    expect(cache.weight).toBe(0);
    expect(cache.size).toBe(0);
  });
});
