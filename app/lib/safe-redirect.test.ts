import { describe, expect, it } from "vitest";
import { safeRedirectTo } from "./safe-redirect";

describe("safeRedirectTo", () => {
  it("keeps a path on this site, with its query and fragment", () => {
    for (const path of ["/", "/events/12/edit", "/map?station=2&kind=training", "/events?q=%20x#top", "/a:b"]) {
      expect(safeRedirectTo(path)).toBe(path);
    }
  });

  it("goes home for anything that leaves the site or would be rewritten", () => {
    // As received after the query string is decoded: %2F%09%2Fevil.example is "/\t/evil.example".
    const hostile = [
      "/\t/evil.example",
      decodeURIComponent("%2F%09%2Fevil.example"),
      "//evil.example",
      "///evil.example",
      "/\\evil.example",
      "\\\\evil.example",
      "https://evil.example/",
      "javascript:alert(1)",
      "/\nSet-Cookie: x=1",
      "/\r/evil.example",
      "/\u3000/evil.example",
      "/\u00a0/evil",
      "/\u200b/evil",
      "/%2e%2e/x/../y",
      "/ä",
      "/ spaced",
      "events",
      "",
      null,
      undefined,
      `/${"a".repeat(3000)}`,
    ];
    for (const target of hostile) expect(safeRedirectTo(target), JSON.stringify(target)).toBe("/");
  });

  it("uses the given fallback", () => {
    expect(safeRedirectTo("//evil", "/home")).toBe("/home");
  });
});
