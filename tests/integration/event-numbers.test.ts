// Generated event numbers come from a counter row locked in the save's transaction, and one
// submission key makes one report however often it is sent.
import { randomUUID } from "node:crypto";
import { beforeAll, describe, expect, it } from "vitest";
import { db } from "~/lib/db.server";
import { action as newAction } from "~/routes/events.new";
import { makeUser, TEST_PASSWORD } from "../support/factories";
import { formRequest, routeArgs, settle } from "../support/requests";
import { signIn } from "../support/session";
import { ensureAgency, makeStation } from "../support/usage-fixtures";

let officer: string;
let stationId: number;

beforeAll(async () => {
  await ensureAgency();
  stationId = (await makeStation()).id;
  officer = await signIn((await makeUser(["officer"], "Numbers Test", { stationId })).email, TEST_PASSWORD);
});

/** The status of an action's answer and the event a redirect points to. */
async function send(fields: Record<string, string>) {
  const { value } = await settle(() => newAction(routeArgs(formRequest("/events/new", fields, { Cookie: officer }))));
  const response = value as Response & { init?: { status?: number } };
  const status = value instanceof Response ? value.status : (response.init?.status ?? 200);
  const location = value instanceof Response ? value.headers.get("Location") : null;
  const eventId = Number(location?.match(/\/events\/(\d+)/)?.[1]) || null;
  return { status, eventId, value };
}

const draft = (year: number, kind = "incident") => ({
  intent: "save-draft",
  submissionKey: randomUUID(),
  kind,
  startedAt: `${year}-03-01T10:00`,
  address: "1 Counter Lane",
});

describe("event numbers allocated in the database", () => {
  it("gives 20 drafts saved at once 20 different numbers, one after another", async () => {
    const answers = await Promise.all(Array.from({ length: 20 }, () => send(draft(2031))));
    expect(answers.map((answer) => answer.status)).toEqual(Array(20).fill(302));
    const rows = await db("events").whereIn(
      "id",
      answers.map((answer) => answer.eventId!),
    );
    const numbers = rows.map((row) => row.number).sort();
    expect(new Set(numbers).size).toBe(20);
    expect(numbers).toEqual(Array.from({ length: 20 }, (_, index) => `AB-2031-${String(index + 1).padStart(4, "0")}`));
    const counter = await db("event_number_counters").where({ series: "AB", year: 2031 }).first();
    expect(counter.last_sequence).toBe(20);
  });

  it("continues after a number already used and skips one typed by hand", async () => {
    await send({ ...draft(2032), number: "AB-2032-0007" });
    await send({ ...draft(2032), number: "AB-2032-0009" });
    const first = await send(draft(2032));
    const row = await db("events").where({ id: first.eventId! }).first();
    expect(row.number).toBe("AB-2032-0010");
  });

  it("numbers each kind in its own series and incidents with the agency's prefix", async () => {
    await db("agency_settings").where({ id: 1 }).update({ event_number_prefix: "NV" });
    try {
      const incident = await send(draft(2033));
      const training = await send(draft(2033, "training"));
      const numbers = await db("events").whereIn("id", [incident.eventId!, training.eventId!]).orderBy("id");
      expect(numbers.map((row) => row.number)).toEqual(["NV-2033-0001", "TR-2033-0001"]);
    } finally {
      await db("agency_settings").where({ id: 1 }).update({ event_number_prefix: "AB" });
    }
  });
});

describe("repeated File report clicks", () => {
  it("20 requests with one submission key make one report, and every answer points to it", async () => {
    const number = `REP-${randomUUID().slice(0, 8)}`;
    const fields = {
      intent: "file",
      submissionKey: randomUUID(),
      number,
      kind: "training",
      startedAt: "2026-04-01T09:00",
      clearedAt: "2026-04-01T10:00",
      address: "12 Drill Yard",
      latitude: "38.7",
      longitude: "-98.2",
      stationId: String(stationId),
      "discharges[0].flow": "100",
      "discharges[0].flowUnit": "gpm",
      "discharges[0].basis": "water",
      "discharges[0].minutes": "5",
      "dispositions[0].disposition": "soil",
      "dispositions[0].sharePercent": "100",
    };
    const answers = await Promise.all(Array.from({ length: 20 }, () => send(fields)));
    const events = await db("events").where({ number });
    expect(events).toHaveLength(1);
    expect(answers.map((answer) => answer.status)).toEqual(Array(20).fill(302));
    expect(answers.map((answer) => answer.eventId)).toEqual(Array(20).fill(events[0].id));
    expect(await db("form_submissions").where({ submission_key: fields.submissionKey })).toMatchObject([
      { event_id: events[0].id },
    ]);
  });

  it("a refused first attempt leaves the key free for the corrected one", async () => {
    const submissionKey = randomUUID();
    const refused = await send({ ...draft(2034), submissionKey, stationId: "4000000000" });
    expect(refused.status).toBe(400);
    expect(await db("form_submissions").where({ submission_key: submissionKey })).toEqual([]);
    const saved = await send({ ...draft(2034), submissionKey });
    expect(saved.status).toBe(302);
  });
});
