import { db, type Db } from "~/lib/db.server";
import { reminderStage } from "~/lib/foam/system-schedule";
import { instantToWallClock } from "~/lib/time-zone";
import { agencyNameForDocuments, readAgencySettings } from "./agency-settings.server";
import { listFleet } from "./foam-system.server";
import { queueMail } from "./mail-outbox.server";

const DUTY_WORDS = { accuracy_test: "accuracy test", flush: "scheduled flush" } as const;

/** Officers of the apparatus's station, else the chiefs (a unit with no station still has an owner). */
async function recipientsFor(stationId: number | null, connection: Db): Promise<string[]> {
  const byRole = (role: "officer" | "chief") =>
    connection("users")
      .join("user_roles", "user_roles.user_id", "users.id")
      .where({ "user_roles.role": role, "users.active": true })
      .modify((query) => {
        if (role === "officer") query.where("users.station_id", stationId);
      })
      .pluck("users.email");
  const officers = stationId == null ? [] : await byRole("officer");
  return officers.length ? officers : byRole("chief");
}

/**
 * Queues the reminders that are due: an accuracy test or scheduled flush due within 30 days, and again
 * once it is overdue, each mailed once per system, duty, stage and due date (a row in
 * `foam_system_reminders` claims it in the same transaction as the mail). Returns how many were queued.
 */
export async function queueFoamSystemReminders(now = new Date()): Promise<number> {
  return db.transaction(async (trx) => {
    const settings = await readAgencySettings(trx);
    const today = instantToWallClock(now, settings.timeZone).slice(0, 10);
    const fleet = await listFleet({ now, connection: trx });
    let queued = 0;
    for (const system of fleet) {
      for (const [duty, dueOn] of [
        ["accuracy_test", system.nextTestDue],
        ["flush", system.nextFlushDue],
      ] as const) {
        const stage = reminderStage(dueOn, today);
        if (!stage) continue;
        const claimed = await trx("foam_system_reminders")
          .insert({ foam_system_id: system.id, duty, stage, due_on: dueOn })
          .onConflict(["foam_system_id", "duty", "stage", "due_on"])
          .ignore();
        if (!claimed[0]) continue;
        const to = await recipientsFor(system.stationId, trx);
        const what = `${DUTY_WORDS[duty]} of ${system.apparatus} · ${system.name}`;
        const mailId = await queueMail(
          {
            kind: "foam_system_reminder",
            to,
            subject: stage === "overdue" ? `Overdue: ${what} (due ${dueOn})` : `Due by ${dueOn}: ${what}`,
            text:
              `${agencyNameForDocuments(settings)}\n\n` +
              `The ${what} ${stage === "overdue" ? "was due on" : "is due by"} ${dueOn}. ` +
              "Record it on the system's page in Foamtally once done. Every usage figure rests on the percentage the proportioner meters.\n",
          },
          trx,
        );
        await trx("foam_system_reminders")
          .where({ foam_system_id: system.id, duty, stage, due_on: dueOn })
          .update({ mail_id: mailId });
        queued += mailId == null ? 0 : 1;
      }
    }
    return queued;
  });
}
