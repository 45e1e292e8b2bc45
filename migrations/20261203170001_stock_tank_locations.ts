import type { Knex } from "knex";

// Stock tanks are the foam systems' tanks: each apparatus-tank location is tied to one
// `foam_system_tanks` row, one location per system tank (decision 170). An apparatus whose
// systems have several tanks keeps its existing location — and every balance on it — on its first
// tank (lowest system id, then tank id); each further tank gets a new, empty location.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable("stock_locations", (t) => {
    t.integer("foam_system_tank_id")
      .unsigned()
      .nullable()
      .unique()
      .references("foam_system_tanks.id")
      .onDelete("SET NULL");
    // The apparatus key stays (a location without a system tank keeps it) but is no longer unique.
    t.index(["apparatus_id"], "stock_locations_apparatus_index");
  });
  await knex.schema.alterTable("stock_locations", (t) => {
    t.dropUnique(["apparatus_id"]);
  });

  const tanks: {
    tank_id: number;
    tank_name: string;
    system_name: string;
    apparatus_id: number;
    unit_id: string;
    station_id: number | null;
  }[] = await knex("foam_system_tanks as k")
    .join("foam_systems as s", "s.id", "k.foam_system_id")
    .join("apparatus as a", "a.id", "s.apparatus_id")
    .orderBy([{ column: "s.apparatus_id" }, { column: "s.id" }, { column: "k.id" }])
    .select(
      "k.id as tank_id",
      "k.name as tank_name",
      "s.name as system_name",
      "s.apparatus_id",
      "a.unit_id",
      "a.station_id",
    );
  for (const tank of tanks) {
    const unlinked = await knex("stock_locations")
      .where({ kind: "apparatus_tank", apparatus_id: tank.apparatus_id })
      .whereNull("foam_system_tank_id")
      .orderBy("id")
      .first("id");
    if (unlinked) {
      await knex("stock_locations").where({ id: unlinked.id }).update({ foam_system_tank_id: tank.tank_id });
      continue;
    }
    await knex("stock_locations").insert({
      kind: "apparatus_tank",
      name: await freeName(knex, `${tank.unit_id} ${tank.system_name} · ${tank.tank_name}`),
      station_id: tank.station_id,
      apparatus_id: tank.apparatus_id,
      foam_system_tank_id: tank.tank_id,
    });
  }
}

/** A location name not yet taken (names are unique), within the column's 120 characters. */
async function freeName(knex: Knex, wanted: string): Promise<string> {
  const base = wanted.slice(0, 110);
  for (let n = 1; ; n += 1) {
    const name = n === 1 ? base : `${base} (${n})`;
    if (!(await knex("stock_locations").where({ name }).first("id"))) return name;
  }
}

export async function down(knex: Knex): Promise<void> {
  // A second location of one apparatus can go only while nothing was ever booked on it.
  const extra: { id: number }[] = await knex("stock_locations as l")
    .whereNotNull("l.apparatus_id")
    .whereExists(
      knex("stock_locations as o").whereRaw("o.apparatus_id = l.apparatus_id").whereRaw("o.id < l.id").select("o.id"),
    )
    .select("l.id");
  for (const { id } of extra) {
    const used =
      (await knex("stock_movements").where({ location_id: id }).first("id")) ??
      (await knex("stock_counts").where({ location_id: id }).first("id"));
    if (used) {
      throw new Error(
        `Stock location ${id} is a further tank of an apparatus and holds movements: move them before undoing this migration.`,
      );
    }
    await knex("stock_reorder_points").where({ location_id: id }).delete();
    await knex("stock_locations").where({ id }).delete();
  }
  await knex.schema.alterTable("stock_locations", (t) => {
    t.dropForeign(["foam_system_tank_id"]);
    t.dropUnique(["foam_system_tank_id"]);
    t.dropColumn("foam_system_tank_id");
    t.unique(["apparatus_id"]);
  });
  await knex.schema.alterTable("stock_locations", (t) => {
    t.dropIndex(["apparatus_id"], "stock_locations_apparatus_index");
  });
}
