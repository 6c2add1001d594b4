// The parsed-part cache (engine/system/parts.ts): least recently used within a byte cap (issue 14).
import { afterEach, describe, expect, it } from "vitest";
import { clearPartCache, DEFAULT_PART_CACHE_BYTES, parseTouchstoneCached, partCacheStats, setPartCacheLimit } from "@/engine/system";

/** A 2-port file of `points` points (a matched 0 dB through; values do not matter here). */
function through(points: number, tag: string): string {
  const lines = [`! ${tag}`, "# Hz S RI R 50"];
  for (let i = 0; i < points; i++) lines.push(`${1e9 + i * 1e6} 0 0 1 0 1 0 0 0`);
  return `${lines.join("\n")}\n`;
}

/** Bytes one entry holds by the cache's own count: its key (2 bytes a UTF-16 unit) and its typed arrays. */
function entryBytes(text: string, name: string, points: number): number {
  const key = `\u0000${name}\u0000${text}`;
  return 2 * key.length + 16 * points * 4 + 8 * points; // S: 2×2 complex per point; frequencies: one double per point
}

afterEach(() => {
  setPartCacheLimit(DEFAULT_PART_CACHE_BYTES);
  clearPartCache();
});

describe("part cache", () => {
  it("keeps what it parsed within the cap, evicting the least recently used first", () => {
    const texts = ["a", "b", "c"].map((t) => through(200, t));
    const one = entryBytes(texts[0], "a.s2p", 200);
    // room for two entries, not three
    setPartCacheLimit(Math.floor(2.5 * one));
    const a = parseTouchstoneCached(texts[0], "a.s2p");
    parseTouchstoneCached(texts[1], "b.s2p");
    expect(partCacheStats()).toMatchObject({ entries: 2, bytes: entryBytes(texts[0], "a.s2p", 200) + entryBytes(texts[1], "b.s2p", 200) });
    // a is used again, so b is now the least recently used and goes when c arrives
    expect(parseTouchstoneCached(texts[0], "a.s2p")).toBe(a);
    const b = parseTouchstoneCached(texts[1], "b.s2p");
    parseTouchstoneCached(texts[0], "a.s2p");
    parseTouchstoneCached(texts[2], "c.s2p");
    const stats = partCacheStats();
    expect(stats.entries).toBe(2);
    expect(stats.bytes).toBeLessThanOrEqual(stats.limitBytes);
    expect(parseTouchstoneCached(texts[0], "a.s2p")).toBe(a); // still cached: same object
    expect(parseTouchstoneCached(texts[1], "b.s2p")).not.toBe(b); // evicted: parsed again
  });

  it("parses a part larger than the cap without keeping it, and a lower cap evicts at once", () => {
    const big = through(2000, "big");
    setPartCacheLimit(entryBytes(big, "big.s2p", 2000) - 1);
    const first = parseTouchstoneCached(big, "big.s2p");
    expect(first.frequencies.length).toBe(2000);
    expect(partCacheStats().entries).toBe(0);
    expect(parseTouchstoneCached(big, "big.s2p")).not.toBe(first);
    setPartCacheLimit(DEFAULT_PART_CACHE_BYTES);
    parseTouchstoneCached(big, "big.s2p");
    expect(partCacheStats().entries).toBe(1);
    setPartCacheLimit(0);
    expect(partCacheStats()).toMatchObject({ entries: 0, bytes: 0, limitBytes: 0 });
  });
});
