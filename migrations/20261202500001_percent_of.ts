import type { Knex } from "knex";

/**
 * What a discharge's percentage is a share of (foam solution or water), and the apparatus's
 * proportioner type that gives the default. Existing lines keep the meaning they were computed with:
 * a water figure took its percentage of the water, a solution rating of the solution.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable("discharges", (t) => {
    t.enum("percent_of", ["solution", "water"]).notNullable().defaultTo("water");
    t.decimal("effective_percent_of_solution", 8, 4).nullable();
  });
  await knex("discharges").update({ percent_of: knex.raw("IF(flow_basis = 'solution', 'solution', 'water')") });
  await knex("discharges")
    .where("solution_gal", ">", 0)
    .whereNotNull("percent")
    .update({ effective_percent_of_solution: knex.raw("concentrate_gal / solution_gal * 100") });
  await knex.schema.alterTable("apparatus", (t) => {
    t.enum("proportioner_type", [
      "direct_injection",
      "eductor",
      "around_the_pump",
      "balanced_pressure",
      "premix",
    ]).nullable();
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable("apparatus", (t) => {
    t.dropColumn("proportioner_type");
  });
  await knex.schema.alterTable("discharges", (t) => {
    t.dropColumn("effective_percent_of_solution");
    t.dropColumn("percent_of");
  });
}
