import { randomUUID } from "node:crypto";
import type { Knex } from "knex";
import { recordAudit } from "~/lib/audit.server";
import type { SessionUser } from "~/lib/auth.server";
import { decimalOrNull } from "~/lib/decimal";
import { db, type Db } from "~/lib/db.server";
import { computeAccuracyTest, type AccuracyTestInput, type AccuracyTestResult } from "~/lib/foam/accuracy-test";
import {
  accuracyInputOf,
  splitOutletNames,
  type AccuracyTestFormValue,
  type FoamSystemFormValue,
  type MaintenanceFormValue,
} from "~/lib/foam/system-forms";
import { systemSchedule, type Schedule } from "~/lib/foam/system-schedule";
import {
  FLEET_STATUSES,
  isFoamSystemType,
  type AccuracyTestMethod,
  type FleetStatus,
  type FlushReason,
  type FoamClass,
  type FoamSystemStatus,
  type FoamSystemType,
  type MaintenanceKind,
  type PercentOf,
} from "~/lib/foam/vocabulary";
import { staleRecordMessage } from "~/lib/catalogue/record-version";
import { conflict, refused, RefusalError, type Refusal } from "~/lib/refusal";
import { instantToWallClock, wallClockToInstant } from "~/lib/time-zone";
import { readAgencySettings } from "./agency-settings.server";
import { bumpDataVersion } from "./data-version.server";
import { saveReportWithin } from "./event.server";
import { deliverPendingMailSoon } from "./mail-outbox.server";
import { failureReason } from "./foam-system-facts.server";

export type FoamSystemSummary = {
  id: number;
  apparatusId: number;
  apparatus: string;
  stationId: number | null;
  stationCode: string | null;
  name: string;
  type: FoamSystemType;
  percentOf: PercentOf;
  minConcentrateGpm: number | null;
  maxConcentrateGpm: number | null;
  waterFlowMinGpm: number | null;
  waterFlowMaxGpm: number | null;
  systemStatus: FoamSystemStatus;
  statusReason: string | null;
  active: boolean;
  lastFlushAt: Date | null;
  lastTestAt: Date | null;
  lastTestPass: boolean | null;
} & Schedule;

/** The agency's calendar day of an instant. */
function localDay(instant: Date, timeZone: string): string {
  return instantToWallClock(instant, timeZone).slice(0, 10);
}

const asDate = (value: unknown) => (value == null ? null : new Date(value as string));

/** Every system with its last flush, last test, due dates and fleet status: worst first. */
export async function listFleet(
  options: { now?: Date; connection?: Db; systemId?: number } = {},
): Promise<FoamSystemSummary[]> {
  const connection = options.connection ?? db;
  const settings = await readAgencySettings(connection);
  const today = localDay(options.now ?? new Date(), settings.timeZone);
  // eslint-disable-next-line @typescript-eslint/no-explicit-any -- a row of a joined query
  const rows: Array<Record<string, any>> = await connection("foam_systems as s")
    .join("apparatus as a", "a.id", "s.apparatus_id")
    .leftJoin("stations as st", "st.id", "a.station_id")
    .select(
      "s.*",
      "a.unit_id",
      "a.station_id",
      "st.code as station_code",
      connection.raw(
        "(SELECT MAX(m.performed_at) FROM foam_system_maintenance m WHERE m.foam_system_id = s.id AND m.kind = 'flush') AS last_flush_at",
      ),
      connection.raw(
        "(SELECT MAX(t.tested_at) FROM foam_accuracy_tests t WHERE t.foam_system_id = s.id) AS last_test_at",
      ),
      connection.raw(
        "(SELECT t.pass FROM foam_accuracy_tests t WHERE t.foam_system_id = s.id ORDER BY t.tested_at DESC, t.id DESC LIMIT 1) AS last_test_pass",
      ),
      connection.raw(
        "(SELECT MAX(t.tested_at) FROM foam_accuracy_tests t WHERE t.foam_system_id = s.id AND t.pass = 1) AS last_pass_at",
      ),
    )
    .modify((query) => {
      // One system is read whether active or not; the fleet lists the active ones.
      if (options.systemId != null) query.where("s.id", options.systemId);
      else query.where("s.active", true);
    })
    .orderBy(["a.unit_id", "s.name"]);
  const items = rows.map((row): FoamSystemSummary => {
    const lastFlushAt = asDate(row.last_flush_at);
    const lastPassAt = asDate(row.last_pass_at);
    const schedule = systemSchedule(
      {
        enteredOn: localDay(new Date(row.created_at), settings.timeZone),
        lastPassingTestOn: lastPassAt ? localDay(lastPassAt, settings.timeZone) : null,
        lastFlushOn: lastFlushAt ? localDay(lastFlushAt, settings.timeZone) : null,
        status: row.status,
      },
      settings,
      today,
    );
    return {
      id: row.id,
      apparatusId: row.apparatus_id,
      apparatus: row.unit_id,
      stationId: row.station_id ?? null,
      stationCode: row.station_code ?? null,
      name: row.name,
      type: isFoamSystemType(row.system_type) ? row.system_type : "other",
      percentOf: row.percent_of,
      minConcentrateGpm: decimalOrNull(row.min_concentrate_gpm),
      maxConcentrateGpm: decimalOrNull(row.max_concentrate_gpm),
      waterFlowMinGpm: decimalOrNull(row.water_flow_min_gpm),
      waterFlowMaxGpm: decimalOrNull(row.water_flow_max_gpm),
      systemStatus: row.status,
      statusReason: row.status_reason ?? null,
      active: Boolean(row.active),
      lastFlushAt,
      lastTestAt: asDate(row.last_test_at),
      lastTestPass: row.last_test_pass == null ? null : Boolean(row.last_test_pass),
      ...schedule,
    };
  });
  const rank = (status: FleetStatus) => FLEET_STATUSES.indexOf(status);
  return items.sort(
    (a, b) =>
      rank(a.status) - rank(b.status) ||
      (a.nextTestDue < b.nextTestDue ? -1 : a.nextTestDue > b.nextTestDue ? 1 : 0) ||
      a.apparatus.localeCompare(b.apparatus),
  );
}

export type MaintenanceRecord = {
  id: number;
  kind: MaintenanceKind;
  flushReason: FlushReason | null;
  performedAt: string;
  performedBy: string;
  notes: string;
  waterGal: number | null;
  concentrateDisposedGal: number | null;
  eventId: number | null;
  eventNumber: string | null;
  fromProduct: string | null;
  toProduct: string | null;
  rinseProcedure: string;
  verificationResult: string;
};

export type AccuracyTestRecord = {
  id: number;
  testedAt: string;
  testedBy: string;
  method: AccuracyTestMethod;
  foamClass: FoamClass;
  product: string | null;
  ratedPercent: number;
  setPercent: number | null;
  waterFlowGpm: number | null;
  readings: AccuracyTestInput;
  achievedPercent: number;
  slope: number | null;
  intercept: number | null;
  r2: number | null;
  band: [number, number];
  pass: boolean;
  notes: string;
};

export type PfasHistory = {
  productsCarried: Array<{ id: number; name: string; pfasContaining: boolean }>;
  lastPfasUseAt: string | null;
  changeover:
    | { state: "never_carried" }
    | { state: "not_recorded" }
    | { state: "changed_over"; on: string; rinseProcedure: string; verificationResult: string };
};

export type FoamSystemDetail = FoamSystemSummary & {
  tanks: Array<{ name: string; capacityGal: number | null; productId: number | null; product: string | null }>;
  outlets: string[];
  apparatusOutlets: string[];
  maintenance: MaintenanceRecord[];
  tests: AccuracyTestRecord[];
  pfasHistory: PfasHistory;
  version: number;
};

/** One system with its tanks, outlets, records, tests and its apparatus's PFAS history; null if none. */
export async function getFoamSystem(id: number, connection: Db = db): Promise<FoamSystemDetail | null> {
  const settings = await readAgencySettings(connection);
  const [summary] = await listFleet({ connection, systemId: id });
  if (!summary) return null;
  const zone = settings.timeZone;
  const [system, tanks, outlets, apparatusOutlets, maintenance, tests] = await Promise.all([
    connection("foam_systems").where({ id }).first("version"),
    connection("foam_system_tanks as k")
      .leftJoin("foam_products as p", "p.id", "k.product_id")
      .where("k.foam_system_id", id)
      .orderBy("k.id")
      .select("k.name", "k.capacity_gal", "k.product_id", "p.name as product"),
    connection("foam_system_outlets").where({ foam_system_id: id }).orderBy("outlet_name").pluck("outlet_name"),
    connection("apparatus_outlets").where({ apparatus_id: summary.apparatusId }).orderBy("id").pluck("name"),
    connection("foam_system_maintenance as m")
      .join("users as u", "u.id", "m.performed_by")
      .leftJoin("events as e", "e.id", "m.event_id")
      .leftJoin("foam_products as fp", "fp.id", "m.from_product_id")
      .leftJoin("foam_products as tp", "tp.id", "m.to_product_id")
      .where("m.foam_system_id", id)
      .orderBy([
        { column: "m.performed_at", order: "desc" },
        { column: "m.id", order: "desc" },
      ])
      .select("m.*", "u.name as user_name", "e.number as event_number", "fp.name as from_name", "tp.name as to_name"),
    connection("foam_accuracy_tests as t")
      .join("users as u", "u.id", "t.tested_by")
      .leftJoin("foam_products as p", "p.id", "t.product_id")
      .where("t.foam_system_id", id)
      .orderBy([
        { column: "t.tested_at", order: "desc" },
        { column: "t.id", order: "desc" },
      ])
      .select("t.*", "u.name as user_name", "p.name as product"),
  ]);
  return {
    ...summary,
    version: Number(system?.version ?? 1),
    tanks: tanks.map((row) => ({
      name: row.name,
      capacityGal: decimalOrNull(row.capacity_gal),
      productId: row.product_id ?? null,
      product: row.product ?? null,
    })),
    outlets,
    apparatusOutlets,
    maintenance: maintenance.map((row) => ({
      id: row.id,
      kind: row.kind,
      flushReason: row.flush_reason ?? null,
      performedAt: instantToWallClock(row.performed_at, zone),
      performedBy: row.user_name,
      notes: row.notes ?? "",
      waterGal: decimalOrNull(row.water_gal),
      concentrateDisposedGal: decimalOrNull(row.concentrate_disposed_gal),
      eventId: row.event_id ?? null,
      eventNumber: row.event_number ?? null,
      fromProduct: row.from_name ?? null,
      toProduct: row.to_name ?? null,
      rinseProcedure: row.rinse_procedure ?? "",
      verificationResult: row.verification_result ?? "",
    })),
    tests: tests.map(testRecordOf(zone)),
    pfasHistory: await pfasHistory(summary.apparatusId, zone, connection),
  };
}

function testRecordOf(zone: string) {
  return (row: Record<string, unknown>): AccuracyTestRecord => ({
    id: row.id as number,
    testedAt: instantToWallClock(row.tested_at as Date, zone),
    testedBy: row.user_name as string,
    method: row.method as AccuracyTestMethod,
    foamClass: row.foam_class as FoamClass,
    product: (row.product as string | null) ?? null,
    ratedPercent: Number(row.rated_percent),
    setPercent: decimalOrNull(row.set_percent),
    waterFlowGpm: decimalOrNull(row.water_flow_gpm),
    readings: JSON.parse(String(row.readings_json)) as AccuracyTestInput,
    achievedPercent: Number(row.achieved_percent),
    slope: row.slope == null ? null : Number(row.slope),
    intercept: row.intercept == null ? null : Number(row.intercept),
    r2: row.r2 == null ? null : Number(row.r2),
    band: [Number(row.band_low), Number(row.band_high)],
    pass: Boolean(row.pass),
    notes: (row.notes as string | null) ?? "",
  });
}

/** One test with its system and apparatus, for the printable record; null if none. */
export async function getAccuracyTest(systemId: number, testId: number, connection: Db = db) {
  const settings = await readAgencySettings(connection);
  const row = await connection("foam_accuracy_tests as t")
    .join("users as u", "u.id", "t.tested_by")
    .join("foam_systems as s", "s.id", "t.foam_system_id")
    .join("apparatus as a", "a.id", "s.apparatus_id")
    .leftJoin("foam_products as p", "p.id", "t.product_id")
    .where({ "t.id": testId, "t.foam_system_id": systemId })
    .first("t.*", "u.name as user_name", "p.name as product", "s.name as system_name", "s.system_type", "a.unit_id");
  if (!row) return null;
  return {
    ...testRecordOf(settings.timeZone)(row),
    systemName: row.system_name as string,
    systemType: row.system_type as FoamSystemType,
    apparatus: row.unit_id as string,
    agencyName: settings.name,
    timeZone: settings.timeZone,
    classAAccuracyShare: settings.classAAccuracyShare,
  };
}

/** Products the apparatus carried, its last PFAS-containing use and whether it was changed over since. */
export async function pfasHistory(apparatusId: number, timeZone: string, connection: Db = db): Promise<PfasHistory> {
  const systemIds = await connection("foam_systems").where({ apparatus_id: apparatusId }).pluck("id");
  const used = await connection("discharges as d")
    .join("foam_products as p", "p.id", "d.product_id")
    .join("events as e", "e.id", "d.event_id")
    .where("d.apparatus_id", apparatusId)
    .where("d.concentrate_gal", ">", 0)
    .groupBy("p.id", "p.name", "p.pfas_containing")
    .select("p.id", "p.name", "p.pfas_containing", connection.raw("MAX(e.started_at) AS last_used"));
  const loaded = systemIds.length
    ? await connection("foam_system_tanks as k")
        .join("foam_products as p", "p.id", "k.product_id")
        .whereIn("k.foam_system_id", systemIds)
        .select("p.id", "p.name", "p.pfas_containing")
    : [];
  const changeovers = systemIds.length
    ? await connection("foam_system_maintenance as m")
        .leftJoin("foam_products as p", "p.id", "m.from_product_id")
        .whereIn("m.foam_system_id", systemIds)
        .where("m.kind", "changeover")
        .orderBy("m.performed_at", "desc")
        .select("m.performed_at", "m.rinse_procedure", "m.verification_result", "p.id", "p.name", "p.pfas_containing")
    : [];
  const products = new Map<number, { id: number; name: string; pfasContaining: boolean }>();
  for (const row of [...used, ...loaded, ...changeovers.filter((row) => row.id != null)]) {
    products.set(row.id, { id: row.id, name: row.name, pfasContaining: Boolean(row.pfas_containing) });
  }
  const pfasUses = used.filter((row) => Boolean(row.pfas_containing) && row.last_used);
  const lastPfasUse = pfasUses.reduce<Date | null>((latest, row) => {
    const at = new Date(row.last_used);
    return !latest || at > latest ? at : latest;
  }, null);
  const carried = [...products.values()].some((product) => product.pfasContaining);
  const away = changeovers.find((row) => Boolean(row.pfas_containing));
  const changeover: PfasHistory["changeover"] = !carried
    ? { state: "never_carried" }
    : away && (!lastPfasUse || new Date(away.performed_at) >= lastPfasUse)
      ? {
          state: "changed_over",
          on: instantToWallClock(away.performed_at, timeZone),
          rinseProcedure: away.rinse_procedure ?? "",
          verificationResult: away.verification_result ?? "",
        }
      : { state: "not_recorded" };
  return {
    productsCarried: [...products.values()].sort((a, b) => a.name.localeCompare(b.name)),
    lastPfasUseAt: lastPfasUse ? instantToWallClock(lastPfasUse, timeZone) : null,
    changeover,
  };
}

// ---------------------------------------------------------------------------------------------
// Saving

async function lockSystem(trx: Db, id: number) {
  const system = await trx("foam_systems").where({ id }).forUpdate().first();
  if (!system) throw new RefusalError(refused(404, "No such foam system."));
  return system;
}

function instantOf(wallClock: string, timeZone: string, field: string): Date {
  const instant = wallClockToInstant(wallClock, timeZone);
  if (!instant) throw new RefusalError(refused(400, "Check the date.", { [field]: ["Enter a real date and time."] }));
  if (instant.getTime() > Date.now() + 60 * 60_000) {
    throw new RefusalError(refused(400, "Check the date.", { [field]: ["This is in the future."] }));
  }
  return instant;
}

async function productExists(trx: Db, id: number | undefined, field: string) {
  if (id == null) return null;
  const product = await trx("foam_products").where({ id }).first("id", "name", "pfas_containing");
  if (!product) {
    throw new RefusalError(refused(400, "Check the product.", { [field]: ["That product is not in the catalogue."] }));
  }
  return product;
}

async function run<T>(work: (trx: Knex.Transaction) => Promise<T>): Promise<T | Refusal> {
  try {
    return await db.transaction(async (trx) => {
      const result = await work(trx);
      // A system's limits, tank product and tolerance feed the kept catalogue facts.
      await bumpDataVersion(trx, "catalogue");
      return result;
    });
  } catch (error) {
    if (error instanceof RefusalError) return error.refusal;
    throw error;
  }
}

/**
 * Records a flush, prime, strainer cleaning or changeover, linked to the usage report it names; a
 * flush that flowed and names none files its own usage report (`fileFlushReport`).
 */
export async function recordMaintenance(
  systemId: number,
  value: MaintenanceFormValue,
  actor: SessionUser,
  clientAddress?: string,
): Promise<{ id: number; eventId: number | null; createdReport: string | null } | Refusal> {
  const outcome = await run(async (trx) => {
    const settings = await readAgencySettings(trx);
    const system = await lockSystem(trx, systemId);
    const performedAt = instantOf(value.performedAt, settings.timeZone, "performedAt");
    let eventId: number | null = null;
    if (value.eventNumber) {
      const event = await trx("events").where({ number: value.eventNumber }).first("id", "kind");
      if (!event) {
        throw new RefusalError(
          refused(400, "Check the usage report number.", { eventNumber: ["No usage report has this number."] }),
        );
      }
      eventId = event.id;
    }
    const flowed = (value.waterGal ?? 0) > 0 || (value.concentrateDisposedGal ?? 0) > 0;
    let createdReport: string | null = null;
    if (flowed && eventId == null && value.kind === "flush") {
      const filed = await fileFlushReport(trx, system, value, actor, clientAddress);
      eventId = filed.id;
      createdReport = filed.number;
    }
    const from = await productExists(trx, value.fromProductId, "fromProductId");
    const to = await productExists(trx, value.toProductId, "toProductId");
    if (value.kind === "changeover" && from && Boolean(from.pfas_containing) && !value.rinseProcedure) {
      throw new RefusalError(
        refused(400, "Record the rinse procedure.", {
          rinseProcedure: [
            `${from.name} contains PFAS: record how the tank, lines and proportioner were rinsed, because legacy PFAS returns from wetted surfaces into the replacement foam.`,
          ],
        }),
      );
    }
    const row = {
      foam_system_id: systemId,
      kind: value.kind,
      flush_reason: value.kind === "flush" ? (value.flushReason ?? null) : null,
      performed_at: performedAt,
      performed_by: actor.id,
      notes: value.notes || null,
      water_gal: value.waterGal ?? null,
      concentrate_disposed_gal: value.concentrateDisposedGal ?? null,
      event_id: eventId,
      from_product_id: value.kind === "changeover" ? (from?.id ?? null) : null,
      to_product_id: value.kind === "changeover" ? (to?.id ?? null) : null,
      rinse_procedure: value.kind === "changeover" ? value.rinseProcedure || null : null,
      verification_result: value.kind === "changeover" ? value.verificationResult || null : null,
    };
    const [id] = await trx("foam_system_maintenance").insert(row);
    if (value.kind === "changeover" && to) {
      await trx("foam_system_tanks").where({ foam_system_id: systemId }).update({ product_id: to.id });
    }
    await recordAudit(
      {
        actorUserId: actor.id,
        actorLabel: actor.email,
        action: "foam_system_maintenance_recorded",
        entityType: "foam_system",
        entityId: systemId,
        summary: `${value.kind} on ${system.name}`,
        after: row,
        clientAddress,
      },
      trx,
    );
    return { id, eventId, createdReport };
  });
  // A filed report may have queued alerts: they go out once the flush is committed.
  if (!("kind" in outcome) && outcome.createdReport) deliverPendingMailSoon();
  return outcome;
}

/**
 * The usage report of a flush that flowed and names none: filed through the one report save path
 * (totals, event number, audit and stock as for any report), in the maintenance entry's transaction,
 * so the flush's water and concentrate are counted once — in this report.
 */
async function fileFlushReport(
  trx: Knex.Transaction,
  system: { id: number; apparatus_id: number; name: string; max_concentrate_gpm: unknown },
  value: MaintenanceFormValue,
  actor: SessionUser,
  clientAddress?: string,
): Promise<{ id: number; number: string }> {
  const waterGal = value.waterGal ?? 0;
  const concentrateGal = value.concentrateDisposedGal ?? 0;
  const apparatus = await trx("apparatus").where({ id: system.apparatus_id }).first("id", "unit_id", "station_id");
  const station = apparatus?.station_id
    ? await trx("stations").where({ id: apparatus.station_id }).first("id", "name", "address", "latitude", "longitude")
    : null;
  const latitude = decimalOrNull(station?.latitude);
  const longitude = decimalOrNull(station?.longitude);
  if (!station || latitude == null || longitude == null) {
    throw new RefusalError(
      refused(400, "Name the flush's usage report.", {
        eventNumber: [
          "This flush flowed water or concentrate, and its usage report cannot be made here: the apparatus has no station with a map position. Enter the number of its usage report (kind “flush”).",
        ],
      }),
    );
  }
  if (waterGal <= 0) {
    throw new RefusalError(
      refused(400, "Enter the water used.", {
        waterGal: [
          "Concentrate went through the system: enter the water used with it, so the flush's report can be made.",
        ],
      }),
    );
  }
  const tank = await trx("foam_system_tanks")
    .where({ foam_system_id: system.id })
    .whereNotNull("product_id")
    .orderBy("id")
    .first("product_id");
  if (concentrateGal > 0 && !tank) {
    throw new RefusalError(
      refused(400, "Record the product loaded.", {
        concentrateDisposedGal: [
          "The system's tank has no product loaded, so the concentrate cannot be counted: record the product on the system, or enter the number of the flush's usage report.",
        ],
      }),
    );
  }
  const outlet = await trx("foam_system_outlets")
    .where({ foam_system_id: system.id })
    .orderBy("id")
    .first("outlet_name");
  // One line carrying the whole flush: a water flow over its minutes gives the water used; the
  // concentrate as a share of the solution (water + concentrate) gives the concentrate used, and
  // stays below 100 % whatever the two figures are. The minutes are long enough that the
  // concentrate rate stays within the system's maximum, which would otherwise cap it.
  const percent = concentrateGal > 0 ? (concentrateGal / (waterGal + concentrateGal)) * 100 : undefined;
  const maxRate = decimalOrNull(system.max_concentrate_gpm);
  const minutes = Math.min(
    24 * 60,
    Math.max(1, maxRate && maxRate > 0 && concentrateGal > 0 ? Math.ceil(concentrateGal / maxRate) : 1),
  );
  const report = {
    kind: "flush" as const,
    incidentType: "flush" as const,
    startedAt: value.performedAt,
    address: station.address || station.name,
    latitude,
    longitude,
    stationId: station.id,
    narrative:
      `Made with the ${system.name} flush entry on ${apparatus!.unit_id}. ` +
      `The place shown is ${station.name}, the apparatus's station, not necessarily where the water went; ` +
      `the flush entry does not say where its runoff went, so it is given as unknown. Revise this report to correct either.` +
      (value.notes ? ` Flush notes: ${value.notes}` : ""),
    discharges: [
      {
        apparatusId: apparatus!.id,
        outlet: (outlet?.outlet_name as string | undefined) ?? system.name,
        productId: concentrateGal > 0 ? (tank!.product_id as number) : undefined,
        percent,
        percentOf: concentrateGal > 0 ? ("solution" as const) : undefined,
        flow: waterGal / minutes,
        flowUnit: "gpm" as const,
        basis: "water" as const,
        minutes,
      },
    ],
    dispositions: [{ disposition: "evaporated_unknown" as const, sharePercent: 100 }],
  };
  const outcome = await saveReportWithin(trx, {
    user: actor,
    intent: "file",
    submissionKey: `flush-${randomUUID()}`,
    payload: report,
    report,
    clientAddress,
  });
  if (outcome.kind === "saved" || outcome.kind === "repeat") {
    const event = await trx("events").where({ id: outcome.eventId }).first("id", "number");
    return { id: event.id as number, number: event.number as string };
  }
  // The report's own field names are not on this form: its reasons are shown at the water field.
  const reasons = Object.values(outcome.fieldErrors ?? {}).flat();
  throw new RefusalError(
    refused(outcome.kind === "refused" ? outcome.status : 400, "The flush's usage report could not be filed.", {
      waterGal: [`The flush's usage report could not be filed: ${[outcome.message, ...reasons].join(" ")}`],
    }),
  );
}

/**
 * Records an accuracy test with the server's computation. A failure puts the system out of
 * tolerance with its reason; a pass brings it back in service.
 */
export async function recordAccuracyTest(
  systemId: number,
  value: AccuracyTestFormValue,
  actor: SessionUser,
  clientAddress?: string,
): Promise<{ id: number; result: AccuracyTestResult } | Refusal> {
  return run(async (trx) => {
    const settings = await readAgencySettings(trx);
    const system = await lockSystem(trx, systemId);
    const testedAt = instantOf(value.testedAt, settings.timeZone, "testedAt");
    await productExists(trx, value.productId, "productId");
    const readings = accuracyInputOf(value);
    const result = computeAccuracyTest(readings, settings.classAAccuracyShare);
    const row = {
      foam_system_id: systemId,
      tested_at: testedAt,
      tested_by: actor.id,
      method: readings.method,
      foam_class: readings.foamClass,
      product_id: value.productId ?? null,
      rated_percent: readings.ratedPercent,
      set_percent: value.setPercent ?? null,
      water_flow_gpm: value.waterFlowGpm ?? null,
      readings_json: JSON.stringify(readings),
      achieved_percent: Number(result.achievedPercent.toFixed(5)),
      slope: result.slope,
      intercept: result.intercept,
      r2: result.r2,
      band_low: result.band[0],
      band_high: result.band[1],
      pass: result.pass,
      notes: value.notes || null,
    };
    const [id] = await trx("foam_accuracy_tests").insert(row);
    // The system's state follows its latest test.
    const latest = await trx("foam_accuracy_tests")
      .where({ foam_system_id: systemId })
      .orderBy([
        { column: "tested_at", order: "desc" },
        { column: "id", order: "desc" },
      ])
      .first();
    const failing = !latest.pass;
    await trx("foam_systems")
      .where({ id: systemId })
      .update({
        status: failing ? "out_of_tolerance" : "in_service",
        status_reason: failing
          ? failureReason(
              Number(latest.achieved_percent),
              [Number(latest.band_low), Number(latest.band_high)],
              localDayOf(latest.tested_at, settings.timeZone),
            )
          : null,
        status_since: failing ? latest.tested_at : null,
        version: Number(system.version) + 1,
      });
    await recordAudit(
      {
        actorUserId: actor.id,
        actorLabel: actor.email,
        action: "foam_accuracy_test_recorded",
        entityType: "foam_system",
        entityId: systemId,
        summary: `${readings.method} test on ${system.name}: ${result.pass ? "pass" : "fail"}`,
        after: row,
        clientAddress,
      },
      trx,
    );
    return { id, result };
  });
}

function localDayOf(value: Date | string, timeZone: string) {
  return instantToWallClock(new Date(value), timeZone).slice(0, 10);
}

/**
 * Creates (id null) or changes a system on an apparatus, with its tank and the outlets it serves.
 * A change names the version its form was opened with; a stale or missing one is a conflict and
 * nothing is written (a recorded accuracy test raises the version too, as it changes the status).
 */
export async function saveFoamSystem(
  apparatusId: number,
  id: number | null,
  expectedVersion: number | null,
  value: FoamSystemFormValue,
  actor: SessionUser,
  clientAddress?: string,
): Promise<{ id: number } | Refusal> {
  return run(async (trx) => {
    const apparatus = await trx("apparatus").where({ id: apparatusId }).forUpdate().first("id", "unit_id");
    if (!apparatus) throw new RefusalError(refused(404, "No such apparatus."));
    const current = id == null ? null : await lockSystem(trx, id);
    if (current && current.apparatus_id !== apparatusId) throw new RefusalError(refused(404, "No such foam system."));
    if (current && Number(current.version) !== expectedVersion) {
      throw new RefusalError(conflict(staleRecordMessage("foam system", "recorded an accuracy test on it")));
    }
    const clash = await trx("foam_systems")
      .where({ apparatus_id: apparatusId, name: value.name })
      .modify((query) => {
        if (id != null) query.whereNot({ id });
      })
      .first("id");
    if (clash) {
      throw new RefusalError(
        refused(400, "Choose another name.", { name: ["This apparatus already has a system of this name."] }),
      );
    }
    const known = new Set(
      (await trx("apparatus_outlets").where({ apparatus_id: apparatusId }).pluck("name")).map((name: string) =>
        name.toLowerCase(),
      ),
    );
    const outlets = splitOutletNames(value.outlets);
    const unknown = outlets.filter((name) => !known.has(name.toLowerCase()));
    if (unknown.length) {
      throw new RefusalError(
        refused(400, "Check the outlets.", {
          outlets: [`Not an outlet of ${apparatus.unit_id}: ${unknown.join(", ")}.`],
        }),
      );
    }
    const taken = outlets.length
      ? await trx("foam_system_outlets")
          .where({ apparatus_id: apparatusId })
          .whereIn("outlet_name", outlets)
          .modify((query) => {
            if (id != null) query.whereNot({ foam_system_id: id });
          })
          .pluck("outlet_name")
      : [];
    if (taken.length) {
      throw new RefusalError(
        refused(400, "Check the outlets.", { outlets: [`Another system already serves: ${taken.join(", ")}.`] }),
      );
    }
    await productExists(trx, value.tankProductId, "tankProductId");
    const columns = {
      apparatus_id: apparatusId,
      name: value.name,
      system_type: value.systemType,
      percent_of: value.percentOf,
      min_concentrate_gpm: value.minConcentrateGpm ?? null,
      max_concentrate_gpm: value.maxConcentrateGpm ?? null,
      water_flow_min_gpm: value.waterFlowMinGpm ?? null,
      water_flow_max_gpm: value.waterFlowMaxGpm ?? null,
      active: value.active ?? true,
    };
    let savedId: number;
    if (current) {
      await trx("foam_systems")
        .where({ id: current.id, version: expectedVersion })
        .update({ ...columns, version: Number(current.version) + 1 });
      savedId = current.id;
    } else {
      [savedId] = await trx("foam_systems").insert(columns);
    }
    // The tank is changed in place: a stock location is tied to it (decision 170).
    const tank = {
      name: value.tankName || "Tank",
      capacity_gal: value.tankCapacityGal ?? null,
      product_id: value.tankProductId ?? null,
    };
    const firstTank = await trx("foam_system_tanks").where({ foam_system_id: savedId }).orderBy("id").first("id");
    if (value.tankName || value.tankCapacityGal != null || value.tankProductId != null) {
      if (firstTank) await trx("foam_system_tanks").where({ id: firstTank.id }).update(tank);
      else await trx("foam_system_tanks").insert({ foam_system_id: savedId, ...tank });
    } else {
      await trx("foam_system_tanks").where({ foam_system_id: savedId }).delete();
    }
    await trx("foam_system_outlets").where({ foam_system_id: savedId }).delete();
    if (outlets.length) {
      await trx("foam_system_outlets").insert(
        outlets.map((outlet_name) => ({ foam_system_id: savedId, apparatus_id: apparatusId, outlet_name })),
      );
    }
    await recordAudit(
      {
        actorUserId: actor.id,
        actorLabel: actor.email,
        action: current ? "foam_system_updated" : "foam_system_created",
        entityType: "foam_system",
        entityId: savedId,
        summary: `${apparatus.unit_id} ${value.name}`,
        before: current ?? undefined,
        after: { ...columns, outlets, tank: value.tankName ?? null },
        clientAddress,
      },
      trx,
    );
    return { id: savedId };
  });
}

/** The systems of one apparatus, for its page. */
export async function listSystemsOfApparatus(apparatusId: number, connection: Db = db) {
  const rows = await connection("foam_systems")
    .where({ apparatus_id: apparatusId })
    .orderBy("name")
    .select("id", "name", "system_type", "status", "active");
  return rows.map((row) => ({
    id: row.id as number,
    name: row.name as string,
    type: (isFoamSystemType(row.system_type) ? row.system_type : "other") as FoamSystemType,
    outOfTolerance: row.status === "out_of_tolerance",
    active: Boolean(row.active),
  }));
}

/** Whether an accuracy test with this id is recorded (its printouts may be attached). */
export async function accuracyTestExists(testId: number, connection: Db = db): Promise<boolean> {
  return Boolean(await connection("foam_accuracy_tests").where({ id: testId }).first("id"));
}
