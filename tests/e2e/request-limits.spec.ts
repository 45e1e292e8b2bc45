import http from "node:http";
import type { APIRequestContext, APIResponse } from "@playwright/test";
import { DEMO, DEMO_PASSWORD, expect, test } from "../support/e2e";

const port = Number(process.env.E2E_PORT ?? 3101);
const FORM = { "Content-Type": "application/x-www-form-urlencoded" };

/** Sends a hostile request and, while it is answered, an anonymous visit that must succeed too. */
async function alongsideSignInPage(request: APIRequestContext, hostile: Promise<APIResponse>) {
  const [refused, ordinary] = await Promise.all([hostile, request.get("/sign-in", { maxRedirects: 0 })]);
  expect(ordinary.status()).toBe(200);
  await expect(ordinary.text()).resolves.toContain("Sign in to Foamtally");
  return refused;
}

function reportBody(extra: string) {
  const key = `limits-${Date.now()}-${Math.random().toString(36).slice(2, 10)}`;
  return `intent=save-draft&submissionKey=${key}&number=LIMIT-${Date.now()}&${extra}`;
}

/**
 * Starts sending a body of `declaredBytes` (or a chunked one with no declared length), sends its
 * first megabyte and waits: resolves with the status the server answers while the rest is unsent.
 */
function startLargeUpload(declaredBytes: number | "chunked", path = "/sign-in") {
  return new Promise<number>((resolve, reject) => {
    const upload = http.request({
      host: "127.0.0.1",
      port,
      path,
      method: "POST",
      headers: {
        ...FORM,
        ...(declaredBytes === "chunked" ? { "Transfer-Encoding": "chunked" } : { "Content-Length": declaredBytes }),
      },
    });
    upload.on("response", (response) => {
      response.resume();
      resolve(response.statusCode ?? 0);
      upload.destroy();
    });
    upload.on("error", reject);
    upload.write(Buffer.alloc(1024 * 1024, "a"));
  });
}

test.describe("requests that once stopped the server are refused while it keeps serving", () => {
  test("anonymous sign-ins with huge list indexes get a small 400", async ({ request }) => {
    for (const extra of ["x%5B100000000%5D=1", "x%5B1000000%5D=1"]) {
      const refused = await alongsideSignInPage(
        request,
        request.post("/sign-in", { data: `email=bad&password=x&${extra}`, headers: FORM }),
      );
      expect(refused.status()).toBe(400);
      expect((await refused.body()).length).toBeLessThan(20_000);
    }
  });

  test("an anonymous 100 MB body is refused with 413 before it is read", async ({ request }) => {
    const upload = startLargeUpload(100 * 1024 * 1024);
    const ordinary = await request.get("/sign-in");
    expect(ordinary.status()).toBe(200);
    expect(await upload).toBe(413);
  });

  test("uploads and the JSON API have their own limits", async () => {
    expect(await startLargeUpload(11 * 1024 * 1024, "/geography")).toBe(413);
    expect(await startLargeUpload(11 * 1024 * 1024, "/products/new")).toBe(413);
    expect(await startLargeUpload(2 * 1024 * 1024, "/api/totals")).toBe(413);
  });

  test("a body without a declared length is refused with 411", async ({ request }) => {
    const upload = startLargeUpload("chunked");
    const ordinary = await request.get("/sign-in");
    expect(ordinary.status()).toBe(200);
    expect(await upload).toBe(411);
  });

  test("an officer's report form past its bounds gets 400, 413 or 415, and 200 lines still save", async ({
    playwright,
    baseURL,
    request,
  }) => {
    const officer = await playwright.request.newContext({ baseURL });
    const signedIn = await officer.post("/sign-in", {
      data: `email=${encodeURIComponent(DEMO.officer)}&password=${DEMO_PASSWORD}`,
      headers: FORM,
      maxRedirects: 0,
    });
    expect(signedIn.status()).toBe(302);

    const fullLine = (index: number) =>
      `discharges%5B${index}%5D.flow=100&discharges%5B${index}%5D.flowUnit=gpm&discharges%5B${index}%5D.basis=water&discharges%5B${index}%5D.minutes=5`;
    const cases: [string, string, number][] = [
      ["one line at index 1,000,000,000", "discharges%5B1000000000%5D.flow=1", 400],
      ["one line at index 5,000", "discharges%5B5000%5D.flow=1", 400],
      ["a draft reaching line 1,000", "discharges%5B1000%5D.flow=1", 400],
      ["10,000 full lines", Array.from({ length: 10_000 }, (_, index) => fullLine(index)).join("&"), 413],
    ];
    for (const [what, extra, status] of cases) {
      const refused = await alongsideSignInPage(
        request,
        officer.post("/events/new", { data: reportBody(extra), headers: FORM, maxRedirects: 0 }),
      );
      expect(refused.status(), what).toBe(status);
      expect((await refused.body()).length, what).toBeLessThan(20_000);
    }

    const notAForm = await officer.post("/events/new", { data: { intent: "save-draft" }, maxRedirects: 0 });
    expect(notAForm.status()).toBe(415);

    const twoHundred = Array.from({ length: 200 }, (_, index) => fullLine(index)).join("&");
    const saved = await officer.post("/events/new", { data: reportBody(twoHundred), headers: FORM, maxRedirects: 0 });
    expect(saved.status()).toBe(302);
    const edit = await officer.get(saved.headers().location);
    expect(edit.status()).toBe(200);
    await officer.dispose();
  });
});
