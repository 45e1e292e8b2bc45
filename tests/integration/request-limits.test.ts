import { randomUUID } from "node:crypto";
import { beforeAll, describe, expect, it } from "vitest";
import { db } from "~/lib/db.server";
import { action as totalsAction } from "~/routes/api.totals";
import { loader as editLoader } from "~/routes/events.$id.edit";
import { action as newAction } from "~/routes/events.new";
import { action as signInAction } from "~/routes/sign-in";
import { makeUser, TEST_PASSWORD } from "../support/factories";
import { getRequest, jsonRequest, routeArgs, settle } from "../support/requests";
import { signIn } from "../support/session";

const ORIGIN = "http://127.0.0.1:3000";
let officerId: number;
let officerCookie: string;

beforeAll(async () => {
  const officer = await makeUser(["officer"], "Officer Limits");
  officerId = officer.id;
  officerCookie = await signIn(officer.email, TEST_PASSWORD);
});

function post(path: string, body: BodyInit | null, headers: Record<string, string> = {}): Request {
  return new Request(`${ORIGIN}${path}`, {
    method: "POST",
    body,
    headers: { Origin: ORIGIN, ...headers },
    ...(body instanceof ReadableStream ? { duplex: "half" } : {}),
  } as RequestInit);
}

const form = (path: string, body: string, headers: Record<string, string> = {}) =>
  post(path, body, { "Content-Type": "application/x-www-form-urlencoded", ...headers });

/** The status and the size of what an action answered or threw. */
async function answer(run: () => Promise<unknown>): Promise<{ status: number; bytes: number; text: string }> {
  const { value } = await settle(run);
  if (value instanceof Response) {
    const text = await value.text();
    return { status: value.status, bytes: text.length, text };
  }
  const shaped = value as { init?: { status?: number } | null; data?: unknown };
  const text = JSON.stringify(shaped.data ?? value);
  return { status: shaped.init?.status ?? 200, bytes: text.length, text };
}

async function eventCount() {
  const [{ count }] = await db("events").count({ count: "*" });
  return Number(count);
}

describe("anonymous sign-in with huge list indexes", () => {
  it.each(["x%5B100000000%5D=1", "x%5B1000000%5D=1"])("answers %s with a small 400", async (extra) => {
    const reply = await answer(() => signInAction(routeArgs(form("/sign-in", `email=bad&password=x&${extra}`))));
    expect(reply.status).toBe(400);
    expect(reply.bytes).toBeLessThan(1_000);
    expect(reply.text).toContain("Enter a valid email address.");
  });

  it("refuses a 100 MB body after reading at most the form limit", async () => {
    let sent = 0;
    const body = new ReadableStream<Uint8Array>({
      pull(controller) {
        if (sent >= 100 * 1024 * 1024) return controller.close();
        sent += 256 * 1024;
        controller.enqueue(new TextEncoder().encode("a".repeat(256 * 1024)));
      },
    });
    const reply = await answer(() =>
      signInAction(routeArgs(post("/sign-in", body, { "Content-Type": "application/x-www-form-urlencoded" }))),
    );
    expect(reply.status).toBe(413);
    expect(sent).toBeLessThanOrEqual(2 * 1024 * 1024);
  });
});

describe("an officer's report form past its bounds", () => {
  const headers = () => ({ Cookie: officerCookie });
  const base = () => `intent=save-draft&submissionKey=${randomUUID()}&number=LIM-${randomUUID().slice(0, 8)}`;

  it.each([
    ["discharges%5B1000000000%5D.flow=1", "The form has more than 200 entries for discharges."],
    ["discharges%5B5000%5D.flow=1", "The form has more than 200 entries for discharges."],
    ["tankReadings%5B20%5D.refillGal=1", "The form has more than 20 entries for tankReadings."],
  ])("answers %s with 400 and saves nothing", async (extra, message) => {
    const before = await eventCount();
    const reply = await answer(() => newAction(routeArgs(form("/events/new", `${base()}&${extra}`, headers()))));
    expect(reply).toMatchObject({ status: 400 });
    expect(JSON.parse(reply.text)).toEqual({ message });
    expect(await eventCount()).toBe(before);
  });

  it("answers 10,000 full lines with 413 and saves nothing", async () => {
    const lines = Array.from(
      { length: 10_000 },
      (_, index) =>
        `discharges%5B${index}%5D.flow=100&discharges%5B${index}%5D.flowUnit=gpm&discharges%5B${index}%5D.basis=water&discharges%5B${index}%5D.minutes=5`,
    );
    const before = await eventCount();
    const reply = await answer(() =>
      newAction(routeArgs(form("/events/new", `${base()}&${lines.join("&")}`, headers()))),
    );
    expect(reply.status).toBe(413);
    expect(await eventCount()).toBe(before);
  });

  it("saves a draft of 200 lines, the most a report holds", async () => {
    const lines = Array.from({ length: 200 }, (_, index) => `discharges%5B${index}%5D.flow=100`);
    const reply = await answer(() =>
      newAction(routeArgs(form("/events/new", `${base()}&${lines.join("&")}`, headers()))),
    );
    expect(reply.status).toBe(302);
  });

  it.each([
    ["JSON", "application/json", '{"intent":"save-draft"}', 415],
    ["text", "text/plain", "intent=save-draft", 415],
    ["a broken multipart body", "multipart/form-data; boundary=zz", "--zz\r\nContent-Disposition: form-data", 400],
  ])("answers %s with %s's status and saves nothing", async (_, type, body, status) => {
    const before = await eventCount();
    const reply = await answer(() =>
      newAction(routeArgs(post("/events/new", body, { "Content-Type": type, ...headers() }))),
    );
    expect(reply.status).toBe(status);
    expect(await eventCount()).toBe(before);
  });

  it("answers a missing body with 415", async () => {
    const reply = await answer(() => newAction(routeArgs(post("/events/new", null, headers()))));
    expect(reply.status).toBe(415);
  });
});

describe("a stored draft heavier than a valid report", () => {
  it("opens on its edit page with at most 200 lines", async () => {
    const stored = { number: "HEAVY-1", discharges: [...Array.from({ length: 1000 }, () => null), { flow: "1" }] };
    const [eventId] = await db("events").insert({
      number: `HEAVY-${randomUUID().slice(0, 8)}`,
      kind: "incident",
      status: "draft",
      version: 1,
      created_by: officerId,
      address: "",
      draft_json: JSON.stringify(stored),
    });
    const page = (await editLoader(
      routeArgs(getRequest(`/events/${eventId}/edit`, { Cookie: officerCookie }), { id: String(eventId) }),
    )) as unknown as { defaultValue: { discharges: unknown[] } };
    expect(page.defaultValue.discharges).toHaveLength(200);
  });
});

describe("the totals API", () => {
  it("answers a list past its maximum with a short 400 and a form body with 415", async () => {
    const token = { Cookie: officerCookie };
    const many = jsonRequest("/api/totals", { discharges: Array.from({ length: 100_000 }, () => ({})) }, token);
    const reply = await answer(() => totalsAction(routeArgs(many)));
    expect(reply.status).toBe(400);
    expect(reply.bytes).toBeLessThan(200);
    const asForm = form("/api/totals", "discharges=1", token);
    expect((await answer(() => totalsAction(routeArgs(asForm)))).status).toBe(415);
  });
});
