import { gunzipSync, gzipSync } from "node:zlib";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { PiecewiseGzip } from "./piecewise-gzip.server";

describe("PiecewiseGzip", () => {
  it("makes one gzip member that inflates to the pieces joined, whatever the pieces", async () => {
    // Checked with Node's own gunzip, which verifies the CRC-32 and length of RFC 1952's trailer.
    await fc.assert(
      fc.asyncProperty(fc.array(fc.string({ unit: "binary", maxLength: 3000 }), { maxLength: 12 }), async (pieces) => {
        const body = await new PiecewiseGzip(1_000_000).gzip(pieces);
        expect(gunzipSync(body).toString("utf8")).toBe(pieces.join(""));
      }),
      { numRuns: 200 },
    );
  });

  it("joins pieces larger than deflate's 32 KiB window", async () => {
    const pieces = Array.from({ length: 5 }, (_, index) => `{"piece":${index},"text":"${"abc".repeat(40_000)}"},`);
    const body = await new PiecewiseGzip(10_000_000).gzip(pieces);
    expect(gunzipSync(body).toString("utf8")).toBe(pieces.join(""));
    expect(body.length).toBeLessThan(pieces.join("").length / 50);
  });

  it("compresses only the pieces it has not kept and the ones that follow a changed piece", async () => {
    const gzip = new PiecewiseGzip(1_000_000);
    const pieces = Array.from({ length: 20 }, (_, index) => `feature ${index} `.repeat(200));
    await gzip.gzip(pieces);
    expect(gzip.compressedPieces).toBe(20);
    const changed = [...pieces.slice(0, 7), "a changed feature", ...pieces.slice(8)];
    const body = await gzip.gzip(changed);
    expect(gzip.compressedPieces).toBe(22);
    expect(gunzipSync(body).toString("utf8")).toBe(changed.join(""));
  });

  it("lets a piece refer back into the piece before it, at nearly the size of one whole gzip", async () => {
    // Each piece alone repeats nothing; together they repeat one another.
    const shared = Array.from({ length: 400 }, (_, index) => `"line ${(index * 7919) % 10007}"`).join(",");
    const pieces = Array.from({ length: 10 }, (_, index) => `[${index},${shared}],`);
    const body = await new PiecewiseGzip(1_000_000).gzip(pieces);
    expect(gunzipSync(body).toString("utf8")).toBe(pieces.join(""));
    expect(body.length).toBeLessThan(gzipSync(pieces.join("")).length * 1.1);
  });

  it("keeps a piece once for each piece it has followed, and reuses each where it fits", async () => {
    const gzip = new PiecewiseGzip(10_000_000);
    const [first, other, shared] = ["alpha ".repeat(9000), "omega ".repeat(9000), "shared tail text ".repeat(500)];
    for (const pieces of [
      [first, shared],
      [other, shared],
      [first, shared],
      [other, shared],
    ]) {
      expect(gunzipSync(await gzip.gzip(pieces)).toString("utf8")).toBe(pieces.join(""));
    }
    expect(gzip.compressedPieces).toBe(4);
  });

  it("keeps no more than its budget of texts and compressed bytes, oldest out first", async () => {
    const gzip = new PiecewiseGzip(1);
    const pieces = ["first piece ".repeat(100), "second piece ".repeat(100)];
    await gzip.gzip(pieces);
    await gzip.gzip(pieces);
    expect(gzip.compressedPieces).toBe(4);
  });
});
