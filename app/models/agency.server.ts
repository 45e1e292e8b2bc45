import { db, type Db } from "~/lib/db.server";

export const DEFAULT_TIME_ZONE = "America/Chicago";

/** The agency's time zone, in which people type and read times. */
export async function agencyTimeZone(connection: Db = db): Promise<string> {
  const row = await connection("agency_settings").where({ id: 1 }).first("time_zone");
  return row?.time_zone || DEFAULT_TIME_ZONE;
}
