import type { Knex } from "knex";
import { queueFiledReportAlerts } from "../app/models/report-notifications.server";

// Demo data only: the alerts the demo's filed reports would have raised when they were filed
// (the legacy AR-AFFF release above all), queued so that the running demo sends them to the local
// fake SMTP server, where the outbox page shows them.
export async function seed(knex: Knex): Promise<void> {
  const already = await knex("mail_outbox").where({ kind: "release_alert" }).count({ n: "*" }).first();
  if (Number(already?.n ?? 0) > 0) return;
  const events = await knex("events")
    .whereIn("status", ["filed", "accepted"])
    .where("pfas_containing", true)
    .orderBy("started_at")
    .pluck("id");
  await knex.transaction(async (trx) => {
    for (const id of events) await queueFiledReportAlerts(id, trx);
  });
}
