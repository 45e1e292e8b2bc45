import { decimalOrNull, decimalOrZero } from "~/lib/decimal";
import { db, type Db } from "~/lib/db.server";
import { DISPOSITIONS_TO_WATER, type EventKind, type ReviewFlag } from "~/lib/foam/vocabulary";
import { instantToWallClock } from "~/lib/time-zone";
import { readAgencySettings } from "./agency-settings.server";

export type ReviewQueueItem = {
  id: number;
  number: string;
  kind: EventKind;
  startedAt: string;
  station: string | null;
  authorName: string | null;
  filedAt: string;
  /** Whole minutes since filing, at the time the queue was read. */
  minutesWaiting: number;
  concentrateGal: number;
  flags: ReviewFlag[];
};

/** Filed reports awaiting review, oldest filing first, with their flags and how long they have waited. */
export async function reviewQueue(now: Date = new Date(), connection: Db = db): Promise<ReviewQueueItem[]> {
  const { timeZone } = await readAgencySettings(connection);
  const rows = await connection("events as e")
    .leftJoin("stations as s", "s.id", "e.station_id")
    .leftJoin("users as u", "u.id", "e.created_by")
    .where("e.status", "filed")
    .select(
      "e.id",
      "e.number",
      "e.kind",
      "e.started_at",
      "e.filed_at",
      "e.latitude",
      "e.longitude",
      "e.pfas_containing",
      "e.has_warnings",
      "e.concentrate_gal",
      "s.code as station_code",
      "u.name as author_name",
      connection.raw(
        `EXISTS (SELECT 1 FROM runoff_dispositions r WHERE r.event_id = e.id AND r.disposition IN (${DISPOSITIONS_TO_WATER.map(() => "?").join(", ")})) AS to_water`,
        [...DISPOSITIONS_TO_WATER],
      ),
    )
    .orderByRaw("e.filed_at IS NULL, e.filed_at ASC, e.id ASC");
  return rows.map((row) => {
    const filedAt = row.filed_at ? new Date(row.filed_at) : null;
    const flags: ReviewFlag[] = [];
    if (row.pfas_containing) flags.push("pfas");
    if (Number(row.to_water)) flags.push("to-water");
    if (row.has_warnings) flags.push("warnings");
    if (decimalOrNull(row.latitude) === null || decimalOrNull(row.longitude) === null) flags.push("no-location");
    return {
      id: Number(row.id),
      number: String(row.number),
      kind: row.kind as EventKind,
      startedAt: instantToWallClock(row.started_at as Date | null, timeZone).replace("T", " "),
      station: (row.station_code as string | null) ?? null,
      authorName: (row.author_name as string | null) ?? null,
      filedAt: filedAt ? instantToWallClock(filedAt, timeZone).replace("T", " ") : "",
      minutesWaiting: filedAt ? Math.max(0, Math.floor((now.getTime() - filedAt.getTime()) / 60_000)) : 0,
      concentrateGal: decimalOrZero(row.concentrate_gal),
      flags,
    };
  });
}
