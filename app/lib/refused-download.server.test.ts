import { describe, expect, it } from "vitest";
import { refusalPage, wantsRefusalPage } from "./refused-download.server";

const BROWSER_ACCEPT = "text/html,application/xhtml+xml,application/xml;q=0.9,*/*;q=0.8";
const json = (status: number) =>
  Response.json({ message: "Your roles do not allow you to use this page." }, { status });
const request = (path: string, headers: Record<string, string>) => new Request(`http://127.0.0.1${path}`, { headers });

describe("a refused download opened by a browser", () => {
  it("is answered as a page when a browser follows the link", () => {
    const link = request("/reports/environmental.xlsx?year=2026&quarter=1", {
      Accept: BROWSER_ACCEPT,
      "Sec-Fetch-Mode": "navigate",
    });
    expect(wantsRefusalPage(link, json(403))).toBe(true);
    expect(wantsRefusalPage(link, json(404))).toBe(true);
  });

  it("stays JSON for scripts, /api/* and the app's own data requests", () => {
    expect(wantsRefusalPage(request("/reports/environmental.xlsx", { Accept: "*/*" }), json(403))).toBe(false);
    expect(wantsRefusalPage(request("/api/events", { Accept: BROWSER_ACCEPT }), json(403))).toBe(false);
    expect(wantsRefusalPage(request("/events.data", { Accept: BROWSER_ACCEPT }), json(403))).toBe(false);
  });

  it("leaves answers that are not JSON refusals alone", () => {
    const link = request("/events.csv", { Accept: BROWSER_ACCEPT });
    expect(wantsRefusalPage(link, new Response("a,b", { status: 200 }))).toBe(false);
    expect(
      wantsRefusalPage(link, new Response("<p>page</p>", { status: 403, headers: { "Content-Type": "text/html" } })),
    ).toBe(false);
    // A signed-out browser is sent to sign in by the guard itself.
    expect(wantsRefusalPage(link, json(401))).toBe(false);
  });

  it("says what the error page says, with the server's reason, escaped", () => {
    const page = refusalPage(403, "Roles <b>only</b>");
    expect(page).toContain("Not for your role");
    expect(page).toContain("Roles &#60;b&#62;only&#60;/b&#62;");
    expect(page).not.toContain("<b>");
  });
});
