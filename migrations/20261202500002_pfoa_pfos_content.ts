import type { Knex } from "knex";

/**
 * PFOA and PFOS content of a product, each with its unit: the CERCLA reportable quantity counts each
 * of them (40 CFR 302.4 as amended by 89 FR 39124), not total PFAS, which stays a screening figure.
 * Empty means not known, which makes the reportable-quantity answer "unknown".
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable("foam_products", (t) => {
    t.decimal("pfoa_content", 18, 9).nullable();
    t.string("pfoa_content_unit", 24).nullable();
    t.decimal("pfos_content", 18, 9).nullable();
    t.string("pfos_content_unit", 24).nullable();
  });
  await knex.schema.alterTable("foam_products", (t) => {
    t.string("pfas_content_unit", 24).nullable().alter();
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable("foam_products", (t) => {
    t.dropColumn("pfos_content_unit");
    t.dropColumn("pfos_content");
    t.dropColumn("pfoa_content_unit");
    t.dropColumn("pfoa_content");
  });
}
