import { db, type Db } from "~/lib/db.server";
import { eventNumberSeries, eventNumberStem, formatEventNumber, sequenceOf } from "~/lib/foam/event-number";
import type { EventKind } from "~/lib/foam/vocabulary";
import { instantToWallClock } from "~/lib/time-zone";
import { readAgencySettings } from "./agency-settings.server";

/** The highest sequence already used in a series and year (numbers typed or seeded before the counter). */
async function highestUsed(connection: Db, series: string, year: number): Promise<number> {
  const stem = eventNumberStem(series, year);
  const rows: { number: string }[] = await connection("events")
    .where("number", "like", `${stem}%`)
    .orderByRaw("LENGTH(number) DESC, number DESC")
    .limit(20)
    .select("number");
  return Math.max(0, ...rows.map((row) => sequenceOf(row.number, series, year) ?? 0));
}

/** The agency calendar year of an instant. */
export async function agencyYear(instant: Date, connection: Db = db): Promise<number> {
  return Number(instantToWallClock(instant, (await readAgencySettings(connection)).timeZone).slice(0, 4));
}

/**
 * The next number of a kind's series for a year, allocated inside the caller's transaction. One
 * statement creates the counter row (starting after any number already used) or advances it, and
 * holds the row's exclusive lock until the transaction ends (`INSERT … ON DUPLICATE KEY UPDATE` takes
 * an exclusive lock, never a shared one, so concurrent saves queue instead of deadlocking); the value
 * is then read with `SELECT … FOR UPDATE`. A number typed by hand in the meantime is skipped.
 */
export async function allocateEventNumber(trx: Db, kind: EventKind, year: number): Promise<string> {
  const { eventNumberPrefix } = await readAgencySettings(trx);
  const series = eventNumberSeries(kind, eventNumberPrefix);
  const start = (await highestUsed(trx, series, year)) + 1;
  await trx.raw(
    "INSERT INTO event_number_counters (series, year, last_sequence) VALUES (?, ?, ?) " +
      "ON DUPLICATE KEY UPDATE last_sequence = last_sequence + 1",
    [series, year, start],
  );
  const counter = await trx("event_number_counters").where({ series, year }).forUpdate().first("last_sequence");
  let sequence = Number(counter.last_sequence);
  let number = formatEventNumber(series, year, sequence);
  let skipped = false;
  while (await trx("events").where({ number }).first("id")) {
    sequence += 1;
    number = formatEventNumber(series, year, sequence);
    skipped = true;
  }
  if (skipped) await trx("event_number_counters").where({ series, year }).update({ last_sequence: sequence });
  return number;
}

/** What the next number of a kind would be now (shown on the new-report form; nothing is reserved). */
export async function suggestEventNumber(kind: EventKind = "incident", now = new Date()): Promise<string> {
  const [settings, year] = await Promise.all([readAgencySettings(), agencyYear(now)]);
  const series = eventNumberSeries(kind, settings.eventNumberPrefix);
  const counter = await db("event_number_counters").where({ series, year }).first();
  const last = counter ? Number(counter.last_sequence) : await highestUsed(db, series, year);
  return formatEventNumber(series, year, last + 1);
}
