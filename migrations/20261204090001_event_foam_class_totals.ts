import type { Knex } from "knex";

// Each event carries its concentrate by foam class and the classes it used, written with its lines
// in the same transaction (decision 180): the map, the list and the summary read them from the
// event row instead of grouping every discharge on each request.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable("events", (t) => {
    t.decimal("class_a_concentrate_gal", 16, 6).notNullable().defaultTo(0);
    t.decimal("class_b_concentrate_gal", 16, 6).notNullable().defaultTo(0);
    // "", "A", "B" or "A,B": the classes of the products its lines named, concentrate or not.
    t.string("foam_classes", 3).notNullable().defaultTo("");
  });
  await knex.raw(`
    UPDATE events e
    JOIN (
      SELECT d.event_id,
        SUM(CASE WHEN p.foam_class = 'A' THEN d.concentrate_gal ELSE 0 END) AS class_a,
        SUM(CASE WHEN p.foam_class = 'B' THEN d.concentrate_gal ELSE 0 END) AS class_b,
        GROUP_CONCAT(DISTINCT p.foam_class ORDER BY p.foam_class) AS classes
      FROM discharges d JOIN foam_products p ON p.id = d.product_id
      GROUP BY d.event_id
    ) c ON c.event_id = e.id
    SET e.class_a_concentrate_gal = c.class_a, e.class_b_concentrate_gal = c.class_b, e.foam_classes = c.classes`);
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable("events", (t) => {
    t.dropColumn("class_a_concentrate_gal");
    t.dropColumn("class_b_concentrate_gal");
    t.dropColumn("foam_classes");
  });
}
