import { createCookie } from "react-router";
import { describe, expect, it } from "vitest";
import { createSignedCookie, rawCookieValue } from "./signed-cookie.server";

// The kept-key cookie must read and write exactly what React Router's own signed cookie does, so
// sessions issued before keep working and the two can be swapped at any time.
const options = { httpOnly: true, sameSite: "lax" as const, path: "/", secure: false, maxAge: 3600 };
const secret = "test-session-secret-0123456789abcdef";
const ours = createSignedCookie("__foamtally", { ...options, secrets: [secret] });
const theirs = createCookie("__foamtally", { ...options, secrets: [secret] });
const cookieHeaderOf = (setCookie: string) => setCookie.split(";")[0];
const ids = ["Zm9vYmFyYmF6cXV4LXNlc3Npb24taWQtMzJieXRlcw", "a+b/c=d", "ünïcödé session", ""];

describe("the session cookie signed with a kept key", () => {
  it("writes the same Set-Cookie header as React Router's signed cookie", async () => {
    for (const id of ids) {
      const at = new Date("2026-12-02T12:00:00Z");
      expect(await ours.serialize(id, { expires: at, maxAge: undefined })).toBe(
        await theirs.serialize(id, { expires: at, maxAge: undefined }),
      );
    }
  });

  it("reads what React Router signed, and React Router reads what it signed", async () => {
    for (const id of ids.filter(Boolean)) {
      expect(await ours.parse(cookieHeaderOf(await theirs.serialize(id)))).toBe(id);
      expect(await theirs.parse(cookieHeaderOf(await ours.serialize(id)))).toBe(id);
    }
  });

  it("refuses a value with a wrong or missing signature, or signed with another secret", async () => {
    const good = cookieHeaderOf(await ours.serialize("session-id"));
    const [name, value] = good.split("=");
    const decoded = decodeURIComponent(value);
    const tampered = `${name}=${encodeURIComponent(`${decoded.slice(0, -3)}${decoded.endsWith("AAA") ? "BBB" : "AAA"}`)}`;
    expect(await ours.parse(tampered)).toBeNull();
    expect(await ours.parse(`${name}=${encodeURIComponent(decoded.split(".")[0])}`)).toBeNull();
    const other = createCookie("__foamtally", { ...options, secrets: ["another-secret-0123456789abcdefgh"] });
    expect(await ours.parse(cookieHeaderOf(await other.serialize("session-id")))).toBeNull();
    expect(await ours.parse(null)).toBeNull();
    expect(await ours.parse("other=1")).toBeNull();
  });

  it("finds its own value among other cookies", () => {
    expect(rawCookieValue("a=1; __foamtally=x%2By.z; b=2", "__foamtally")).toBe("x+y.z");
    expect(rawCookieValue('__foamtally="quoted"', "__foamtally")).toBe("quoted");
    expect(rawCookieValue("a=1", "__foamtally")).toBeNull();
  });
});
