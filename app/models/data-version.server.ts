// Version stamps of the data that app servers keep derived answers of in memory. Relative imports
// and a connection passed in, so that the report-row writer (which seeds also load) can bump them.
import type { Knex } from "knex";

/**
 * `reports`: events, their lines, statuses and geography checks (list totals, the map's events,
 * summaries). `catalogue`: foam products, apparatus, stations and the agency settings (the facts
 * `/api/totals` computes with).
 */
export type DataKind = "reports" | "catalogue";

type Connection = Knex | Knex.Transaction;

/**
 * Gives `kind` a new version stamp. Call it inside the transaction that writes the data, so the
 * new stamp becomes visible with the data and never before it. A stamp is a fresh UUID, not a
 * counter, so a database recreated from zero never repeats a stamp a server still holds.
 */
export async function bumpDataVersion(connection: Connection, kind: DataKind): Promise<void> {
  await connection.raw(
    "INSERT INTO data_versions (name, stamp) VALUES (?, UUID()) ON DUPLICATE KEY UPDATE stamp = VALUES(stamp)",
    [kind],
  );
}

export type DataVersions = Record<DataKind, string | null>;

function versionsOf(stamps: Map<string, string>): DataVersions {
  return { reports: stamps.get("reports") ?? null, catalogue: stamps.get("catalogue") ?? null };
}

/** The current stamp of each kind, in one query; a kind without a row is `null` (nothing is kept). */
export async function currentDataVersions(connection: Connection): Promise<DataVersions> {
  const rows: { name: string; stamp: string }[] = await connection("data_versions").select("name", "stamp");
  return versionsOf(new Map(rows.map((row) => [row.name, row.stamp])));
}

/** Reads `GROUP_CONCAT(name, ':', stamp)` of `data_versions` (names and UUID stamps hold neither `:` nor `,`). */
export function parseDataVersions(list: string): DataVersions {
  const pairs = list === "" ? [] : list.split(",").map((pair) => pair.split(":") as [string, string]);
  return versionsOf(new Map(pairs));
}
