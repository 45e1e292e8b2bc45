import type { Knex } from "knex";

/**
 * Files attached to an event (photos, disposal manifests, lab results, test printouts). The bytes
 * live in object storage under a key the server makes; this row is written only after the object
 * is stored. A removed attachment keeps its row and its object until the retention setting allows
 * the object to be deleted (`purged_at`).
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("attachments", (t) => {
    t.increments("id").primary();
    // event (subject_id = events.id); a subject column leaves room for other records
    t.string("subject", 32).notNullable();
    t.integer("subject_id").unsigned().notNullable();
    t.string("kind", 32).notNullable();
    t.string("file_name", 255).notNullable();
    t.string("content_type", 100).notNullable();
    t.bigInteger("byte_size").unsigned().notNullable();
    t.string("sha256", 64).notNullable();
    t.string("storage_key", 255).notNullable().unique();
    t.string("thumbnail_key", 255).nullable().unique();
    // Only when the officer chose to use the photo's position; otherwise never read or kept.
    t.decimal("photo_latitude", 9, 6).nullable();
    t.decimal("photo_longitude", 9, 6).nullable();
    t.integer("uploaded_by").unsigned().nullable().references("users.id");
    t.timestamp("uploaded_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.integer("removed_by").unsigned().nullable().references("users.id");
    t.timestamp("removed_at", { precision: 3 }).nullable();
    t.timestamp("purged_at", { precision: 3 }).nullable();
    t.index(["subject", "subject_id", "removed_at"]);
    t.index(["removed_at", "purged_at"]);
  });
  await knex.schema.alterTable("agency_settings", (t) => {
    t.integer("attachment_max_mb").unsigned().notNullable().defaultTo(25);
    t.integer("attachments_per_event").unsigned().notNullable().defaultTo(40);
    t.integer("attachment_retention_days").unsigned().notNullable().defaultTo(1095);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable("agency_settings", (t) => {
    t.dropColumn("attachment_max_mb");
    t.dropColumn("attachments_per_event");
    t.dropColumn("attachment_retention_days");
  });
  await knex.schema.dropTableIfExists("attachments");
}
