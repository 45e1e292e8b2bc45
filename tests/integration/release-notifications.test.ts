// Notification records beside a release: who was told, when, by whom, the case number; audited.
// A record kept afterwards is not a notification (40 CFR 302.6(a), 355.40).
import { beforeAll, describe, expect, it } from "vitest";
import { db } from "~/lib/db.server";
import { loader as eventLoader } from "~/routes/events.$id";
import { notificationReason } from "~/models/release-notification.server";
import { action as notifyAction } from "~/routes/events.$id.notifications";
import { makeUser, TEST_PASSWORD } from "../support/factories";
import { formRequest, getRequest, routeArgs, settle } from "../support/requests";
import { signIn } from "../support/session";
import { ensureAgency, makeEvent, makeProduct, makeStation } from "../support/usage-fixtures";

let eventId: number;
let officerCookie: string;
let strangerCookie: string;
let chiefCookie: string;

beforeAll(async () => {
  await ensureAgency();
  const station = await makeStation();
  const other = await makeStation();
  const officer = await makeUser(["officer"], "Notify Officer", { stationId: station.id });
  const stranger = await makeUser(["officer"], "Other Officer", { stationId: other.id });
  const chief = await makeUser(["chief"], "Notify Chief");
  officerCookie = await signIn(officer.email, TEST_PASSWORD);
  strangerCookie = await signIn(stranger.email, TEST_PASSWORD);
  chiefCookie = await signIn(chief.email, TEST_PASSWORD);
  eventId = (
    await makeEvent({
      createdBy: officer.id,
      status: "filed",
      stationId: station.id,
      startedAt: new Date("2026-05-01T15:00:00Z"),
      discharges: [{ percent: null, water: 100, concentrate: 0 }],
      dispositions: [{ disposition: "surface_water", sharePercent: 100, receivingWater: "Test Creek" }],
    })
  ).id;
});

const fields = {
  party: "state_spill_line",
  notifiedAt: "2026-05-01T10:20",
  notifiedBy: "Capt. Test",
  caseNumber: "SPILL-2026-0042",
  notes: "Called from the scene.",
};

describe("release notifications", () => {
  it("lets the station's officer record one, audited, and shows it on the event page", async () => {
    const outcome = await settle(() =>
      notifyAction(
        routeArgs(formRequest(`/events/${eventId}/notifications`, fields, { Cookie: officerCookie }), {
          id: String(eventId),
        }),
      ),
    );
    expect((outcome.value as Response).status).toBe(302);
    const row = await db("release_notifications").where({ event_id: eventId }).first();
    expect(row).toMatchObject({ party: "state_spill_line", case_number: "SPILL-2026-0042", notified_by: "Capt. Test" });
    const audit = await db("audit_events")
      .where({ action: "release_notification_recorded", entity_id: String(eventId) })
      .first();
    expect(audit.summary).toBe("State spill line, case SPILL-2026-0042");
    const page = (await eventLoader(
      routeArgs(getRequest(`/events/${eventId}`, { Cookie: chiefCookie }), { id: String(eventId) }),
    )) as { notifications: Array<{ caseNumber: string; notifiedAt: string }>; canNotify: boolean };
    expect(page.notifications.map((entry) => entry.caseNumber)).toEqual(["SPILL-2026-0042"]);
    // Typed and shown in the agency's time zone.
    expect(page.notifications[0].notifiedAt.startsWith("2026-05-01T10:20")).toBe(true);
    expect(page.canNotify).toBe(true);
  });

  it("refuses an officer of another station (403: they may read it, not record on it) and names missing fields (400), writing nothing", async () => {
    const before = await db("release_notifications").where({ event_id: eventId }).count({ n: "*" });
    const stranger = await settle(() =>
      notifyAction(
        routeArgs(formRequest(`/events/${eventId}/notifications`, fields, { Cookie: strangerCookie }), {
          id: String(eventId),
        }),
      ),
    );
    expect((stranger.value as { init?: { status?: number } }).init?.status).toBe(403);
    const bad = await settle(() =>
      notifyAction(
        routeArgs(
          formRequest(
            `/events/${eventId}/notifications`,
            { party: "other", notifiedAt: "soon" },
            { Cookie: chiefCookie },
          ),
          { id: String(eventId) },
        ),
      ),
    );
    const reply = bad.value as {
      init: { status: number };
      data: { notification: { error: Record<string, string[]> } };
    };
    expect(reply.init.status).toBe(400);
    expect(Object.keys(reply.data.notification.error).sort()).toEqual(["notifiedAt", "notifiedBy"]);
    expect(await db("release_notifications").where({ event_id: eventId }).count({ n: "*" })).toEqual(before);
  });

  it("asks for a notification at filing for surface water, and for PFAS foam of unknown PFOA/PFOS content (mixture rule, 40 CFR 302.6(b)(1)(ii))", async () => {
    expect(await notificationReason(eventId)).toBe("runoff reached a storm drain or surface water");
    const officer = await makeUser(["officer"], "Reason Officer");
    const unknown = await makeProduct({ foamClass: "B", foamType: "afff", pfasContaining: true });
    const pfasEvent = await makeEvent({
      createdBy: officer.id,
      status: "filed",
      startedAt: new Date("2026-05-02T15:00:00Z"),
      discharges: [{ productId: unknown.id, percent: 3, water: 97, concentrate: 3 }],
      dispositions: [{ disposition: "contained", sharePercent: 100, disposalReference: "Drum N-1" }],
      pfasContaining: true,
    });
    expect(await notificationReason(pfasEvent.id)).toBe(
      "whether its PFOA or PFOS reaches the reportable quantity is unknown",
    );
    const quiet = await makeEvent({
      createdBy: officer.id,
      status: "filed",
      startedAt: new Date("2026-05-03T15:00:00Z"),
      discharges: [{ percent: null, water: 50, concentrate: 0 }],
      dispositions: [{ disposition: "soil", sharePercent: 100 }],
    });
    expect(await notificationReason(quiet.id)).toBeNull();
  });
});
