import type { Knex } from "knex";

// Demo data only: the notification an invented officer recorded for the demo's PFAS release (the
// legacy AR-AFFF, whose PFOA and PFOS content is not known, so its reportable-quantity answer is
// "unknown"). The case number is invented.
export async function seed(knex: Knex): Promise<void> {
  const already = await knex("release_notifications").count({ n: "*" }).first();
  if (Number(already?.n ?? 0) > 0) return;
  const event = await knex("events as e")
    .whereIn("e.status", ["filed", "accepted"])
    .where("e.pfas_containing", true)
    .whereExists(
      knex("runoff_dispositions as r")
        .whereRaw("r.event_id = e.id")
        .whereIn("r.disposition", ["storm_drain", "surface_water", "soil"]),
    )
    .orderBy("e.started_at")
    .first("e.id", "e.started_at", "e.created_by");
  if (!event) return;
  const notifiedAt = new Date(new Date(event.started_at).getTime() + 40 * 60_000);
  const [id] = await knex("release_notifications").insert({
    event_id: event.id,
    party: "state_spill_line",
    party_detail: "",
    notified_at: notifiedAt,
    notified_by: "Capt. Demo Officer (demo)",
    case_number: "DEMO-SPILL-0001",
    notes: "Demo data: called from the scene once the legacy AR-AFFF runoff reached the storm inlet.",
    recorded_by: event.created_by,
  });
  await knex("audit_events").insert({
    actor_user_id: event.created_by,
    actor_label: "demo seed",
    action: "release_notification_recorded",
    entity_type: "release_notification",
    entity_id: String(id),
    summary: "State spill line, case DEMO-SPILL-0001 (demo)",
  });
}
