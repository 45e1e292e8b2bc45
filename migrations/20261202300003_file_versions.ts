import type { Knex } from "knex";

/**
 * Every stored file of a GeoJSON layer or a product's safety sheet, one row per upload. The file
 * itself stays in object storage under its own key; replacing it marks the old row replaced.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("file_versions", (t) => {
    t.increments("id").primary();
    // geo_layer (subject_id = the layer kind) or safety_sheet (subject_id = the product's id)
    t.string("subject", 32).notNullable();
    t.string("subject_id", 64).notNullable();
    t.string("storage_key", 255).notNullable().unique();
    t.string("file_name", 255).notNullable();
    t.string("content_type", 100).notNullable();
    t.integer("byte_size").unsigned().nullable();
    t.string("sha256", 64).nullable();
    t.integer("uploaded_by").unsigned().nullable().references("users.id");
    t.timestamp("uploaded_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.timestamp("replaced_at", { precision: 3 }).nullable();
    t.index(["subject", "subject_id", "replaced_at"]);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTableIfExists("file_versions");
}
