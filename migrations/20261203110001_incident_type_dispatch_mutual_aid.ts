import type { Knex } from "knex";

/**
 * An event's incident type and the dispatch (CAD) incident number it was dispatched under, both listed
 * and filtered; a discharge's mutual-aid unit (another agency's name and unit id, as typed).
 * Non-incident events take their kind as their type; incidents saved before the type existed keep
 * none ("Not recorded"), since nobody said what they were.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable("events", (t) => {
    t.enum("incident_type", [
      "structure_fire",
      "vehicle_fire",
      "flammable_liquid_spill",
      "wildland",
      "hazmat",
      "training",
      "test",
      "flush",
      "other",
    ]).nullable();
    t.string("dispatch_number", 32).nullable();
    t.index(["incident_type", "started_at"]);
    t.index(["dispatch_number"]);
  });
  await knex("events")
    .whereIn("kind", ["training", "test", "flush"])
    .update({ incident_type: knex.ref("kind") });
  await knex.schema.alterTable("discharges", (t) => {
    t.string("mutual_aid_agency", 120).nullable();
    t.string("mutual_aid_unit", 24).nullable();
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable("discharges", (t) => {
    t.dropColumn("mutual_aid_unit");
    t.dropColumn("mutual_aid_agency");
  });
  await knex.schema.alterTable("events", (t) => {
    t.dropIndex(["dispatch_number"]);
    t.dropIndex(["incident_type", "started_at"]);
    t.dropColumn("dispatch_number");
    t.dropColumn("incident_type");
  });
}
