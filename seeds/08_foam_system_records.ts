import type { Knex } from "knex";

// Demo data only: a year of flushes on every foam system of the invented Alder Bend district — each
// demo flush report linked to the flush of the systems it flowed through (its volumes are counted
// once, in that report), scheduled flushes between them, a prime after each, and Foam Tender 1's
// changeover from the legacy PFAS-containing AR-AFFF after the December spill.

/** Scheduled flushes with clean water through each system; volumes not measured (demo). */
const SCHEDULED_FLUSHES = ["2025-12-16", "2026-03-10", "2026-06-02", "2026-08-25", "2026-11-17"];

export async function seed(knex: Knex): Promise<void> {
  if (Number((await knex("foam_system_maintenance").count({ n: "*" }).first())?.n ?? 0) > 0) return;
  const systems = await knex("foam_systems as s")
    .join("apparatus as a", "a.id", "s.apparatus_id")
    .select("s.id", "s.apparatus_id", "a.unit_id");
  if (systems.length === 0) return;
  const officer = (await knex("users").where({ email: "officer@alderbend.example" }).first("id")).id as number;
  const officer2 = (await knex("users").where({ email: "officer2@alderbend.example" }).first("id"))?.id ?? officer;
  const rows: Array<Record<string, unknown>> = [];

  for (const [index, system] of systems.entries()) {
    for (const day of SCHEDULED_FLUSHES) {
      // Each system on its own day of the week the flushes fall in.
      const performedAt = new Date(`${day}T15:00:00Z`);
      performedAt.setUTCDate(performedAt.getUTCDate() + index);
      rows.push({
        foam_system_id: system.id,
        kind: "flush",
        flush_reason: "scheduled",
        performed_at: performedAt,
        performed_by: index % 2 ? officer2 : officer,
        notes:
          "Clean water through the injector and lines to the station's oil-water separator; volume not measured (demo).",
      });
      rows.push({
        foam_system_id: system.id,
        kind: "prime",
        performed_at: new Date(performedAt.getTime() + 20 * 60_000),
        performed_by: index % 2 ? officer2 : officer,
        notes: "Re-primed from the tank after the flush (demo).",
      });
    }
  }

  // The demo's flush reports: each line's system gets a flush linked to the report.
  const flushLines = await knex("discharges as d")
    .join("events as e", "e.id", "d.event_id")
    .where("e.kind", "flush")
    .whereNotNull("d.foam_system_id")
    .groupBy("d.foam_system_id", "e.id", "e.started_at", "e.created_by")
    .select(
      "d.foam_system_id",
      "e.id as event_id",
      "e.started_at",
      "e.created_by",
      knex.raw("SUM(d.water_gal) AS water_gal"),
      knex.raw("SUM(d.concentrate_gal) AS concentrate_gal"),
    );
  for (const line of flushLines) {
    rows.push({
      foam_system_id: line.foam_system_id,
      kind: "flush",
      flush_reason: "scheduled",
      performed_at: line.started_at,
      performed_by: line.created_by,
      water_gal: Number(Number(line.water_gal).toFixed(3)),
      concentrate_disposed_gal: Number(Number(line.concentrate_gal).toFixed(3)),
      event_id: line.event_id,
      notes: "Annual flush into pails; counted in its usage report (demo).",
    });
  }

  const ft1 = systems.find((system) => system.unit_id === "FT1");
  const legacy = await knex("foam_products").where({ pfas_containing: true }).first("id");
  const f3 = await knex("foam_products").where({ name: "Millrace F3 3% (demo)" }).first("id");
  if (ft1 && legacy && f3) {
    rows.push({
      foam_system_id: ft1.id,
      kind: "flush",
      flush_reason: "before_change",
      performed_at: new Date("2025-12-12T15:00:00Z"),
      performed_by: officer2,
      notes: "Flushed before the product change; rinse water collected with the changeover (demo).",
    });
    rows.push({
      foam_system_id: ft1.id,
      kind: "changeover",
      performed_at: new Date("2025-12-12T18:00:00Z"),
      performed_by: officer2,
      from_product_id: legacy.id,
      to_product_id: f3.id,
      rinse_procedure:
        "Tank drained to drums; tank, eductor and lines rinsed three times with hot water, all rinsate drummed for the " +
        "licensed contractor (demo procedure, invented).",
      verification_result: "Sample DEMO-PFAS-01: below the laboratory's reporting limit (invented)",
      notes: "Legacy AR-AFFF taken out of service after the Depot St spill (demo).",
    });
  }
  await knex("foam_system_maintenance").insert(rows);
  await knex("audit_events").insert({
    actor_label: "demo seed",
    action: "foam_system_maintenance_seeded",
    entity_type: "foam_system",
    summary: `${rows.length} demo maintenance records`,
  });
}
