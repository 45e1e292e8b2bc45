import { beforeAll, describe, expect, it } from "vitest";
import { db } from "~/lib/db.server";
import { queueFoamSystemReminders } from "~/models/foam-system-reminders.server";
import { makeApparatusRow } from "../support/catalogue-factories";
import { makeUser } from "../support/factories";
import { ensureAgency, makeStation } from "../support/usage-fixtures";

describe("foam-system reminders through the outbox", () => {
  let systemId: number;
  let officerEmail: string;

  beforeAll(async () => {
    await ensureAgency();
    const station = await makeStation();
    officerEmail = (await makeUser(["officer"], "Officer Reminded", { stationId: station.id })).email;
    const tester = await makeUser(["officer"], "Officer Tester");
    const apparatus = await makeApparatusRow({ stationId: station.id });
    [systemId] = await db("foam_systems").insert({
      apparatus_id: apparatus.id,
      name: "Reminder system",
      created_at: new Date("2025-01-05T12:00:00Z"),
    });
    // Passed on 2025-12-20: the next test falls due on 2026-12-20, across the year end from the flush.
    await db("foam_accuracy_tests").insert({
      foam_system_id: systemId,
      tested_at: new Date("2025-12-20T16:00:00Z"),
      tested_by: tester.id,
      method: "flow",
      foam_class: "B",
      rated_percent: 3,
      readings_json: "{}",
      achieved_percent: 3.2,
      band_low: 3,
      band_high: 3.9,
      pass: true,
    });
    await db("foam_system_maintenance").insert({
      foam_system_id: systemId,
      kind: "flush",
      flush_reason: "scheduled",
      performed_at: new Date("2026-11-01T16:00:00Z"),
      performed_by: tester.id,
    });
  });

  const mailsFor = () =>
    db("mail_outbox").where({ kind: "foam_system_reminder" }).where("subject", "like", "%Reminder system%");

  it("mails the station's officers 30 days ahead once, and again once overdue", async () => {
    await queueFoamSystemReminders(new Date("2026-11-15T18:00:00Z"));
    expect(await mailsFor()).toHaveLength(0);

    await queueFoamSystemReminders(new Date("2026-12-02T18:00:00Z"));
    await queueFoamSystemReminders(new Date("2026-12-03T18:00:00Z"));
    const ahead = await mailsFor();
    expect(ahead).toHaveLength(1);
    expect(ahead[0].subject).toMatch(/^Due by 2026-12-20: accuracy test of .+ · Reminder system$/);
    expect(ahead[0].to_addresses).toContain(officerEmail);

    // The flush fell due 90 days after 2026-11-01, on 2027-01-30; the test is overdue after 2026-12-20.
    await queueFoamSystemReminders(new Date("2026-12-21T18:00:00Z"));
    const subjects = (await mailsFor()).map((mail) => mail.subject).sort();
    expect(subjects).toEqual(
      [
        expect.stringMatching(/^Due by 2026-12-20: accuracy test/),
        expect.stringMatching(/^Overdue: accuracy test/),
      ].sort(),
    );
    await queueFoamSystemReminders(new Date("2027-01-02T18:00:00Z"));
    expect((await mailsFor()).map((mail) => mail.subject)).toEqual(
      expect.arrayContaining([expect.stringMatching(/^Due by 2027-01-30: scheduled flush/)]),
    );
  });
});
