import { recordAudit } from "~/lib/audit.server";
import type { SessionUser } from "~/lib/auth.server";
import type { ApparatusFormValue, StationFormValue } from "~/lib/catalogue/apparatus-form";
import { StaleRecordError } from "~/lib/catalogue/record-version";
import { decimalOrNull } from "~/lib/decimal";
import { db } from "~/lib/db.server";
import { isProportionerType, type ProportionerType } from "~/lib/foam/vocabulary";
import { apparatusRow, outletRow, stationRow } from "./catalogue-rows.server";
import type { OutletDefaults } from "./catalogue.server";
import { bumpDataVersion } from "./data-version.server";

export type StationRecord = {
  id: number;
  code: string;
  name: string;
  address: string;
  latitude: number | null;
  longitude: number | null;
  active: boolean;
  version: number;
};

function stationOf(row: Record<string, unknown>): StationRecord {
  return {
    id: row.id as number,
    code: row.code as string,
    name: row.name as string,
    address: (row.address as string) ?? "",
    latitude: decimalOrNull(row.latitude),
    longitude: decimalOrNull(row.longitude),
    active: Boolean(row.active),
    version: Number(row.version ?? 1),
  };
}

export type ApparatusRecord = {
  id: number;
  unitId: string;
  description: string;
  stationId: number | null;
  stationCode: string | null;
  concentrateTankGal: number | null;
  proportionerMaxConcentrateGpm: number | null;
  proportionerType: ProportionerType | null;
  waterFlowMinGpm: number | null;
  waterFlowMaxGpm: number | null;
  compressedAirCfm: number | null;
  active: boolean;
  outlets: OutletDefaults[];
  version: number;
};

function apparatusOf(row: Record<string, unknown>, outlets: Array<Record<string, unknown>>): ApparatusRecord {
  return {
    id: row.id as number,
    unitId: row.unit_id as string,
    description: (row.description as string) ?? "",
    stationId: (row.station_id as number | null) ?? null,
    stationCode: (row.station_code as string | null) ?? null,
    concentrateTankGal: decimalOrNull(row.concentrate_tank_gal),
    proportionerMaxConcentrateGpm: decimalOrNull(row.proportioner_max_concentrate_gpm),
    proportionerType: isProportionerType(row.proportioner_type) ? row.proportioner_type : null,
    waterFlowMinGpm: decimalOrNull(row.water_flow_min_gpm),
    waterFlowMaxGpm: decimalOrNull(row.water_flow_max_gpm),
    compressedAirCfm: decimalOrNull(row.compressed_air_cfm),
    active: Boolean(row.active),
    outlets: outlets
      .filter((outlet) => outlet.apparatus_id === row.id)
      .map((outlet) => ({
        name: outlet.name as string,
        foamCapable: Boolean(outlet.foam_capable),
        defaultFlowGpm: decimalOrNull(outlet.default_flow_gpm),
        defaultFlowBasis: outlet.default_flow_basis === "solution" ? "solution" : "water",
        defaultMethod: (outlet.default_method as OutletDefaults["defaultMethod"]) ?? null,
      })),
    version: Number(row.version ?? 1),
  };
}

export async function listStations(): Promise<StationRecord[]> {
  return (await db("stations").orderBy("code")).map(stationOf);
}

export async function getStation(id: number): Promise<StationRecord | null> {
  const row = await db("stations").where({ id }).first();
  return row ? stationOf(row) : null;
}

const apparatusColumns = ["apparatus.*", "stations.code as station_code"];

export async function listApparatus(): Promise<ApparatusRecord[]> {
  const [rows, outlets] = await Promise.all([
    db("apparatus")
      .leftJoin("stations", "stations.id", "apparatus.station_id")
      .select(apparatusColumns)
      .orderBy("apparatus.unit_id"),
    db("apparatus_outlets").orderBy(["apparatus_id", "id"]),
  ]);
  return rows.map((row) => apparatusOf(row, outlets));
}

export async function getApparatus(id: number): Promise<ApparatusRecord | null> {
  const row = await db("apparatus")
    .leftJoin("stations", "stations.id", "apparatus.station_id")
    .where("apparatus.id", id)
    .first(apparatusColumns);
  if (!row) return null;
  const outlets = await db("apparatus_outlets").where({ apparatus_id: id }).orderBy("id");
  return apparatusOf(row, outlets);
}

export class DuplicateCodeError extends Error {}
export class UnknownStationError extends Error {}

/**
 * Creates (id null) or updates a station with its audit row; null when the station does not exist.
 * An update names the version it was opened with; a stale one throws StaleRecordError.
 */
export async function saveStation(
  id: number | null,
  expectedVersion: number | null,
  value: StationFormValue,
  actor: SessionUser,
  clientAddress?: string,
): Promise<number | null> {
  return db.transaction(async (trx) => {
    const current = id == null ? null : await trx("stations").where({ id }).forUpdate().first();
    if (id != null && !current) return null;
    if (current && Number(current.version) !== expectedVersion) {
      throw new StaleRecordError(Number(current.version), expectedVersion);
    }
    const clash = await trx("stations")
      .where({ code: value.code })
      .modify((query) => {
        if (id != null) query.whereNot({ id });
      })
      .first("id");
    if (clash) throw new DuplicateCodeError(value.code);
    const columns = stationRow(value);
    let before: StationRecord | undefined;
    let savedId: number;
    if (id == null) {
      [savedId] = await trx("stations").insert(columns);
    } else {
      before = stationOf(current!);
      await trx("stations")
        .where({ id, version: expectedVersion })
        .update({ ...columns, version: Number(current!.version) + 1 });
      savedId = id;
    }
    await bumpDataVersion(trx, "catalogue");
    await recordAudit(
      {
        actorUserId: actor.id,
        actorLabel: actor.email,
        action: id == null ? "station_created" : "station_updated",
        entityType: "station",
        entityId: savedId,
        summary: `${value.code} ${value.name}`,
        before,
        after: { ...columns },
        clientAddress,
      },
      trx,
    );
    return savedId;
  });
}

/**
 * Creates (id null) or updates an apparatus, its foam system and its outlets (replaced as a set)
 * with one audit row, in one transaction. Null when the apparatus does not exist. An update names
 * the version it was opened with; a stale one throws StaleRecordError.
 */
export async function saveApparatus(
  id: number | null,
  expectedVersion: number | null,
  value: ApparatusFormValue,
  actor: SessionUser,
  clientAddress?: string,
): Promise<number | null> {
  return db.transaction(async (trx) => {
    const current = id == null ? null : await trx("apparatus").where({ id }).forUpdate().first();
    if (id != null && !current) return null;
    if (current && Number(current.version) !== expectedVersion) {
      throw new StaleRecordError(Number(current.version), expectedVersion);
    }
    const clash = await trx("apparatus")
      .where({ unit_id: value.unitId })
      .modify((query) => {
        if (id != null) query.whereNot({ id });
      })
      .first("id");
    if (clash) throw new DuplicateCodeError(value.unitId);
    if (value.stationId != null && !(await trx("stations").where({ id: value.stationId }).first("id"))) {
      throw new UnknownStationError(String(value.stationId));
    }
    const columns = apparatusRow(value);
    let before: ApparatusRecord | null = null;
    let savedId: number;
    if (id == null) {
      [savedId] = await trx("apparatus").insert(columns);
    } else {
      const outlets = await trx("apparatus_outlets").where({ apparatus_id: id }).orderBy("id");
      before = apparatusOf(current!, outlets);
      await trx("apparatus")
        .where({ id, version: expectedVersion })
        .update({ ...columns, version: Number(current!.version) + 1 });
      await trx("apparatus_outlets").where({ apparatus_id: id }).delete();
      savedId = id;
    }
    if (value.outlets.length) {
      await trx("apparatus_outlets").insert(value.outlets.map((outlet) => outletRow(savedId, outlet)));
    }
    await bumpDataVersion(trx, "catalogue");
    await recordAudit(
      {
        actorUserId: actor.id,
        actorLabel: actor.email,
        action: id == null ? "apparatus_created" : "apparatus_updated",
        entityType: "apparatus",
        entityId: savedId,
        summary: value.unitId,
        before: before ?? undefined,
        after: { ...columns, outlets: value.outlets },
        clientAddress,
      },
      trx,
    );
    return savedId;
  });
}
