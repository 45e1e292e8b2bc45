import { describe, expect, it } from "vitest";
import { VersionedCache } from "./versioned-cache";

describe("answers kept under a data version", () => {
  it("computes once per key and version, and again when the version changes", async () => {
    const cache = new VersionedCache<number>(10);
    let computed = 0;
    const compute = async () => ++computed;
    expect(await cache.get("a", "v1", compute)).toBe(1);
    expect(await cache.get("a", "v1", compute)).toBe(1);
    expect(await cache.get("a", "v2", compute)).toBe(2);
    expect(await cache.get("b", "v2", compute)).toBe(3);
  });

  it("shares one computation between callers at once, and keeps no failure", async () => {
    const cache = new VersionedCache<number>(10);
    let computed = 0;
    const slow = () => new Promise<number>((resolve) => setTimeout(() => resolve(++computed), 10));
    expect(await Promise.all([cache.get("a", "v1", slow), cache.get("a", "v1", slow)])).toEqual([1, 1]);
    await expect(cache.get("b", "v1", () => Promise.reject(new Error("down")))).rejects.toThrow("down");
    expect(await cache.get("b", "v1", async () => 7)).toBe(7);
  });

  it("keeps nothing for an unknown version, and at most its limit of keys", async () => {
    const cache = new VersionedCache<string>(2);
    let computed = 0;
    const compute = async () => `answer ${++computed}`;
    await cache.get("a", null, compute);
    expect(await cache.get("a", null, compute)).toBe("answer 2");
    await cache.get("a", "v", compute);
    await cache.get("b", "v", compute);
    await cache.get("c", "v", compute);
    expect(await cache.get("b", "v", compute)).toBe("answer 4");
    expect(await cache.get("a", "v", compute)).toBe("answer 6");
  });
});
