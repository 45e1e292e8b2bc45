// How ready each station and the district are: gallons on hand by foam class, and how many
// minutes of a typical Class B attack the Class B concentrate supports (the attack is an agency
// setting). Foam held for disposal is not counted as ready; it is shown beside.
import { decimalOrZero } from "~/lib/decimal";
import { db, type Db } from "~/lib/db.server";
import { attackConcentrateGpm, attackMinutes, roundGal } from "~/lib/stock/ledger";
import { readAgencySettings } from "./agency-settings.server";

export type Readiness = {
  /** null: the district as a whole (every location, those without a station too). */
  stationId: number | null;
  name: string;
  classAGal: number;
  classBGal: number;
  heldForDisposalGal: number;
  classBAttackMinutes: number | null;
};

export type ReadinessReport = {
  attack: { solutionGpm: number; percent: number; concentrateGpm: number };
  stations: Readiness[];
  district: Readiness;
};

export async function stockReadiness(connection: Db = db): Promise<ReadinessReport> {
  const settings = await readAgencySettings(connection);
  const solutionGpm = settings.classBAttackSolutionGpm;
  const percent = settings.classBAttackPercent;
  const rows: { station_id: number | null; foam_class: string; held_for_disposal: unknown; gal: unknown }[] =
    await connection("stock_movements as m")
      .join("stock_locations as l", "l.id", "m.location_id")
      .join("foam_products as p", "p.id", "m.product_id")
      .groupBy("l.station_id", "p.foam_class", "p.held_for_disposal")
      .select("l.station_id", "p.foam_class", "p.held_for_disposal", connection.raw("SUM(m.gal) AS gal"));
  const stations = await connection("stations").where({ active: true }).orderBy("code").select("id", "code", "name");
  const blank = (stationId: number | null, name: string): Readiness => ({
    stationId,
    name,
    classAGal: 0,
    classBGal: 0,
    heldForDisposalGal: 0,
    classBAttackMinutes: null,
  });
  const byStation = new Map<number, Readiness>(
    stations.map((station) => [station.id, blank(station.id, `${station.name} (${station.code})`)]),
  );
  const district = blank(null, "District");
  for (const row of rows) {
    const amount = decimalOrZero(row.gal);
    const targets = [
      district,
      ...(row.station_id && byStation.has(row.station_id) ? [byStation.get(row.station_id)!] : []),
    ];
    for (const target of targets) {
      if (Number(row.held_for_disposal)) target.heldForDisposalGal = roundGal(target.heldForDisposalGal + amount);
      else if (row.foam_class === "A") target.classAGal = roundGal(target.classAGal + amount);
      else target.classBGal = roundGal(target.classBGal + amount);
    }
  }
  for (const target of [district, ...byStation.values()]) {
    target.classBAttackMinutes = attackMinutes(target.classBGal, solutionGpm, percent);
  }
  return {
    attack: { solutionGpm, percent, concentrateGpm: attackConcentrateGpm(solutionGpm, percent) },
    stations: [...byStation.values()],
    district,
  };
}
