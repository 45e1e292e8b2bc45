// The stock book: locations, lots and every movement of concentrate. The one writer of the
// `stock_*` tables. Each change locks the locations it touches, plans its movements with the pure
// ledger (`app/lib/stock/ledger.ts`), writes them with an audit row in the same transaction and
// bumps the locations' versions, so a form that read an older balance is refused, not obeyed.
import type { Knex } from "knex";
import { recordAudit } from "~/lib/audit.server";
import type { SessionUser } from "~/lib/auth.server";
import { decimalOrNull, decimalOrZero } from "~/lib/decimal";
import { db, type Db } from "~/lib/db.server";
import { concentrateCostSql } from "~/lib/stock/concentrate-cost";
import { pastShelfLife } from "~/lib/stock/shelf-life";
import {
  STOCK_LOCATION_KIND_LABELS,
  type FoamClass,
  type StockContainer,
  type StockLocationKind,
  type StockMovementKind,
} from "~/lib/foam/vocabulary";
import { conflict, RefusalError, refused, type Refusal } from "~/lib/refusal";
import {
  planMovement,
  quantityError,
  roundGal,
  usedByEvent,
  type BookEntry,
  type StockFacts,
  type StockRequest,
} from "~/lib/stock/ledger";
import { deliverPendingMailSoon } from "./mail-outbox.server";
import { queueStockAlerts } from "./stock-alerts.server";

type Actor = Pick<SessionUser, "id" | "email">;

export type StockLocation = {
  id: number;
  kind: StockLocationKind;
  name: string;
  stationId: number | null;
  apparatusId: number | null;
  /** The foam system tank this location is (apparatus tanks), with its capacity when known. */
  foamSystemTankId: number | null;
  capacityGal: number | null;
  version: number;
};

type LocationRow = {
  id: number;
  kind: StockLocationKind;
  name: string;
  station_id: number | null;
  apparatus_id: number | null;
  foam_system_tank_id: number | null;
  capacity_gal?: unknown;
  version: number;
};

const locationOf = (row: LocationRow): StockLocation => ({
  id: row.id,
  kind: row.kind,
  name: row.name,
  stationId: row.station_id,
  apparatusId: row.apparatus_id,
  foamSystemTankId: row.foam_system_tank_id ?? null,
  capacityGal: decimalOrNull(row.capacity_gal),
  version: row.version,
});

/** Locations with their tank's capacity (`capacity_gal`) where they are a foam system's tank. */
const locationsWithTanks = (connection: Db) =>
  connection("stock_locations as l")
    .leftJoin("foam_system_tanks as k", "k.id", "l.foam_system_tank_id")
    .select("l.*", "k.capacity_gal");

export type TankFill = {
  locationId: number;
  name: string;
  capacityGal: number | null;
  onHandGal: number;
  /** On hand as a share of the capacity, in %; null without a capacity on record. */
  fillPercent: number | null;
};

/** Every apparatus tank with its capacity (from its foam system's tank) and what is in it now. */
export async function tankFill(connection: Db = db): Promise<TankFill[]> {
  const rows = await locationsWithTanks(connection)
    .where({ "l.active": true, "l.kind": "apparatus_tank" })
    .select(
      connection.raw("(SELECT COALESCE(SUM(m.gal), 0) FROM stock_movements m WHERE m.location_id = l.id) AS on_hand"),
    )
    .orderBy("l.name");
  return rows.map((row: LocationRow & { on_hand: unknown }) => {
    const capacityGal = decimalOrNull(row.capacity_gal);
    const onHandGal = roundGal(decimalOrZero(row.on_hand));
    return {
      locationId: row.id,
      name: row.name,
      capacityGal,
      onHandGal,
      fillPercent: capacityGal && capacityGal > 0 ? Math.round((onHandGal / capacityGal) * 1000) / 10 : null,
    };
  });
}

export async function listStockLocations(connection: Db = db): Promise<StockLocation[]> {
  const rows: LocationRow[] = await locationsWithTanks(connection)
    .where("l.active", true)
    .orderBy([{ column: "l.kind" }, { column: "l.name" }]);
  return rows.map(locationOf);
}

/**
 * The tank a line of an apparatus draws from, as a stock location (decision 170): the tank of the
 * foam system the line was placed on when known, else the apparatus's first tank location. A tank
 * without a location gets one the first time it is needed.
 */
export async function apparatusTankLocation(
  trx: Knex.Transaction,
  apparatusId: number,
  foamSystemId: number | null = null,
): Promise<number> {
  const systemTank = foamSystemId
    ? await trx("foam_system_tanks as k")
        .join("foam_systems as s", "s.id", "k.foam_system_id")
        .where({ "k.foam_system_id": foamSystemId, "s.apparatus_id": apparatusId })
        .orderBy("k.id")
        .first("k.id", "k.name", "s.name as system_name")
    : null;
  if (systemTank) {
    const linked = await trx("stock_locations").where({ foam_system_tank_id: systemTank.id }).first("id");
    if (linked) return linked.id;
  } else {
    const existing = await trx("stock_locations")
      .where({ apparatus_id: apparatusId, kind: "apparatus_tank" })
      .orderBy("id")
      .first("id");
    if (existing) return existing.id;
  }
  const tank =
    systemTank ??
    (await trx("foam_system_tanks as k")
      .join("foam_systems as s", "s.id", "k.foam_system_id")
      .where("s.apparatus_id", apparatusId)
      .whereNotExists(trx("stock_locations as l").whereRaw("l.foam_system_tank_id = k.id").select("l.id"))
      .orderBy([{ column: "s.id" }, { column: "k.id" }])
      .first("k.id", "k.name", "s.name as system_name"));
  const apparatus = await trx("apparatus").where({ id: apparatusId }).first("unit_id", "station_id");
  const others = await trx("stock_locations").where({ apparatus_id: apparatusId }).first("id");
  const wanted =
    others && tank ? `${apparatus.unit_id} ${tank.system_name} · ${tank.name}` : `${apparatus.unit_id} tank`;
  const [id] = await trx("stock_locations").insert({
    kind: "apparatus_tank",
    name: await freeLocationName(trx, wanted),
    station_id: apparatus.station_id,
    apparatus_id: apparatusId,
    foam_system_tank_id: tank?.id ?? null,
  });
  return id;
}

async function freeLocationName(trx: Knex.Transaction, wanted: string): Promise<string> {
  const base = wanted.slice(0, 110);
  for (let n = 1; ; n += 1) {
    const name = n === 1 ? base : `${base} (${n})`;
    if (!(await trx("stock_locations").where({ name }).first("id"))) return name;
  }
}

/** A station's store as a stock location, made the first time it is needed. */
export async function stationStoreLocation(trx: Knex.Transaction, stationId: number): Promise<number> {
  const existing = await trx("stock_locations").where({ station_id: stationId, kind: "station_store" }).first("id");
  if (existing) return existing.id;
  const station = await trx("stations").where({ id: stationId }).first("code", "name");
  const [id] = await trx("stock_locations").insert({
    kind: "station_store",
    name: `${station.name} (${station.code}) store`,
    station_id: stationId,
  });
  return id;
}

// ---------------------------------------------------------------------------------------------
// Reading the book for a plan

async function bookFor(connection: Db, locationIds: number[], productIds: number[]): Promise<BookEntry[]> {
  if (!locationIds.length || !productIds.length) return [];
  const rows = await connection("stock_movements")
    .whereIn("location_id", locationIds)
    .whereIn("product_id", productIds)
    .orderBy("id")
    .select("kind", "location_id", "product_id", "lot_id", "gal", "event_id", "counterpart_location_id");
  return rows.map((row) => ({
    kind: row.kind,
    locationId: row.location_id,
    productId: row.product_id,
    lotId: row.lot_id,
    gal: decimalOrZero(row.gal),
    eventId: row.event_id,
    counterpartLocationId: row.counterpart_location_id,
  }));
}

async function factsFor(connection: Db, productIds: number[]): Promise<StockFacts> {
  const products = productIds.length
    ? await connection("foam_products").whereIn("id", productIds).select("id", "held_for_disposal")
    : [];
  const held = new Set(products.filter((row) => Boolean(Number(row.held_for_disposal))).map((row) => row.id as number));
  const lots = productIds.length
    ? await connection("stock_lots as t")
        .join("foam_products as p", "p.id", "t.product_id")
        .whereIn("t.product_id", productIds)
        .select("t.id", "t.product_id", "t.manufactured_on", "p.shelf_life_months")
    : [];
  const lotProduct = new Map<number, number>(lots.map((row) => [row.id, row.product_id]));
  // Oldest made first, so the lot that ends its shelf life first goes first; a lot already past it
  // goes after every other (its quality is in doubt until sampled), and a lot of unknown age last.
  const today = new Date().toISOString().slice(0, 10);
  const lotOrder = new Map<number, number>(
    lots.map((row) => {
      const made = row.manufactured_on ? new Date(row.manufactured_on) : null;
      const madeOn = made ? made.toISOString().slice(0, 10) : null;
      const months = row.shelf_life_months == null ? null : Number(row.shelf_life_months);
      const age = made ? made.getTime() : Number.MAX_SAFE_INTEGER / 4;
      return [row.id, pastShelfLife(madeOn, months, today) ? Number.MAX_SAFE_INTEGER / 2 + age : age];
    }),
  );
  return {
    heldForDisposal: (productId) => held.has(productId),
    lotProduct: (lotId) => lotProduct.get(lotId),
    lotOrder: (lotId) => lotOrder.get(lotId) ?? Number.MAX_SAFE_INTEGER,
  };
}

async function lockLocations(trx: Knex.Transaction, ids: number[]): Promise<Map<number, LocationRow>> {
  const rows: LocationRow[] = await trx("stock_locations")
    .whereIn("id", [...new Set(ids)])
    .orderBy("id")
    .forUpdate();
  return new Map(rows.map((row) => [row.id, row]));
}

type WriteMeta = { at: Date; reason?: string; reference?: string; createdBy: number | null; countId?: number };

async function writeEntries(trx: Knex.Transaction, entries: BookEntry[], meta: WriteMeta): Promise<number[]> {
  const ids: number[] = [];
  for (const entry of entries) {
    const [id] = await trx("stock_movements").insert({
      kind: entry.kind,
      location_id: entry.locationId,
      product_id: entry.productId,
      lot_id: entry.lotId,
      gal: entry.gal,
      at: meta.at,
      event_id: entry.eventId ?? null,
      count_id: meta.countId ?? null,
      counterpart_location_id: entry.counterpartLocationId ?? null,
      reason: meta.reason ?? "",
      reference: meta.reference ?? "",
      created_by: meta.createdBy,
    });
    ids.push(id);
  }
  const touched = [...new Set(entries.map((entry) => entry.locationId))];
  if (touched.length) await trx("stock_locations").whereIn("id", touched).increment("version", 1);
  return ids;
}

const refuseAt = (field: string, message: string): never => {
  throw new RefusalError(refused(400, message, { [field]: [message] }));
};

function checkVersion(location: LocationRow | undefined, field: string, version: number | null): void {
  if (!location) refuseAt(field, "Choose a location from the list.");
  if (version !== null && location!.version !== version) {
    throw new RefusalError(
      conflict(
        "The stock at this location changed after you opened the page (someone else moved, counted or used concentrate). Nothing was written; reload to see the current book, then enter the movement again.",
      ),
    );
  }
}

async function runStockChange<T>(
  work: (trx: Knex.Transaction) => Promise<T>,
  connection: Knex = db,
): Promise<T | Refusal> {
  try {
    const outcome = await connection.transaction(work);
    // The demo seed writes through its own connection and sends nothing.
    if (connection === db) deliverPendingMailSoon();
    return outcome;
  } catch (error) {
    if (error instanceof RefusalError) return error.refusal;
    throw error;
  }
}

async function productExists(trx: Knex.Transaction, productId: number): Promise<boolean> {
  return Boolean(await trx("foam_products").where({ id: productId }).first("id"));
}

// ---------------------------------------------------------------------------------------------
// Receiving, moving, counting

export type ReceiveInput = {
  locationId: number;
  version: number | null;
  productId: number;
  lotNumber: string;
  manufacturedOn: string | null;
  container: StockContainer;
  containerGal: number;
  containerCount: number;
  supplier: string;
  deliveryReference: string;
  receivedOn: string;
};

/** Books a delivery: the lot (made, or found by its number) and a received movement into the location. */
export async function receiveStock(
  user: Actor,
  input: ReceiveInput,
  clientAddress?: string,
  connection: Knex = db,
): Promise<{ kind: "done"; lotId: number; movementIds: number[] } | Refusal> {
  return runStockChange(async (trx) => {
    const locations = await lockLocations(trx, [input.locationId]);
    checkVersion(locations.get(input.locationId), "locationId", input.version);
    if (!(await productExists(trx, input.productId))) refuseAt("productId", "Choose a product from the catalogue.");
    const gal = roundGal(input.containerGal * input.containerCount);
    // The lot is written before its movement is planned, so its quantity passes the movement's limit first.
    const tooMuch = quantityError(gal);
    if (tooMuch) refuseAt("containerCount", tooMuch);
    const existing = await trx("stock_lots")
      .where({ product_id: input.productId, lot_number: input.lotNumber })
      .first("id");
    const lotId: number =
      existing?.id ??
      (
        await trx("stock_lots").insert({
          product_id: input.productId,
          lot_number: input.lotNumber,
          manufactured_on: input.manufacturedOn,
          container: input.container,
          container_gal: input.containerGal,
          container_count: input.containerCount,
          quantity_gal: gal,
          supplier: input.supplier,
          delivery_reference: input.deliveryReference,
          received_on: input.receivedOn,
          created_by: user.id,
        })
      )[0];
    const facts = await factsFor(trx, [input.productId]);
    const request: StockRequest = {
      kind: "received",
      locationId: input.locationId,
      productId: input.productId,
      lotId,
      gal,
    };
    const plan = planMovement([], request, facts);
    if (!plan.ok) return refuseAt(plan.field === "gal" ? "containerCount" : plan.field, plan.message);
    const movementIds = await writeEntries(trx, plan.entries, {
      at: new Date(`${input.receivedOn}T12:00:00Z`),
      reference: input.deliveryReference,
      createdBy: user.id,
    });
    await recordAudit(
      {
        actorUserId: user.id,
        actorLabel: user.email,
        action: "stock_received",
        entityType: "stock_lot",
        entityId: lotId,
        summary: `Received ${gal} gal of lot ${input.lotNumber} (${input.containerCount} × ${input.containerGal} gal ${input.container})`,
        after: { input, movementIds },
        clientAddress,
      },
      trx,
    );
    await queueStockAlerts(trx);
    return { kind: "done" as const, lotId, movementIds };
  }, connection);
}

export type MoveInput = {
  kind: "transferred" | "sampled" | "disposed";
  locationId: number;
  toLocationId?: number | null;
  version: number | null;
  productId: number;
  lotId?: number | null;
  gal: number;
  reason: string;
  reference: string;
  at: Date;
};

/**
 * A transfer into a foam system's tank must fit: what the tank holds now (every product) plus the
 * transfer at most its capacity. A tank without a capacity on record takes any amount.
 */
async function checkTankRoom(trx: Knex.Transaction, locationId: number, gal: number): Promise<void> {
  const tank = await trx("stock_locations as l")
    .join("foam_system_tanks as k", "k.id", "l.foam_system_tank_id")
    .where("l.id", locationId)
    .first("l.name", "k.capacity_gal");
  const capacity = decimalOrNull(tank?.capacity_gal);
  if (!tank || capacity == null) return;
  const held = decimalOrZero(
    (await trx("stock_movements").where({ location_id: locationId }).sum({ gal: "gal" }).first())?.gal,
  );
  if (held + gal > capacity + 1e-6) {
    const room = Math.max(0, capacity - held);
    refuseAt(
      "gal",
      `${tank.name} holds ${formatGal(capacity)} gal and has ${formatGal(held)} gal in it: at most ${formatGal(room)} gal more fits.`,
    );
  }
}

const formatGal = (value: number) => value.toLocaleString("en-US", { maximumFractionDigits: 2 });

/** A transfer between locations, a quality sample taken or concentrate sent for disposal. */
export async function moveStock(
  user: Actor,
  input: MoveInput,
  clientAddress?: string,
  connection: Knex = db,
): Promise<{ kind: "done"; movementIds: number[] } | Refusal> {
  return runStockChange(async (trx) => {
    const ids =
      input.kind === "transferred" && input.toLocationId ? [input.locationId, input.toLocationId] : [input.locationId];
    const locations = await lockLocations(trx, ids);
    checkVersion(locations.get(input.locationId), "locationId", input.version);
    if (input.kind === "transferred") {
      if (!input.toLocationId || !locations.get(input.toLocationId)) {
        refuseAt("toLocationId", "Choose the location the concentrate goes to.");
      }
    }
    if (!(await productExists(trx, input.productId))) refuseAt("productId", "Choose a product from the catalogue.");
    const book = await bookFor(trx, ids, [input.productId]);
    const facts = await factsFor(trx, [input.productId]);
    const request: StockRequest =
      input.kind === "transferred"
        ? {
            kind: "transferred",
            fromLocationId: input.locationId,
            toLocationId: input.toLocationId!,
            productId: input.productId,
            lotId: input.lotId ?? null,
            gal: input.gal,
          }
        : {
            kind: input.kind,
            locationId: input.locationId,
            productId: input.productId,
            lotId: input.lotId ?? null,
            gal: input.gal,
          };
    const plan = planMovement(book, request, facts);
    if (!plan.ok) return refuseAt(plan.field, plan.message);
    if (input.kind === "transferred") await checkTankRoom(trx, input.toLocationId!, input.gal);
    const movementIds = await writeEntries(trx, plan.entries, {
      at: input.at,
      reason: input.reason,
      reference: input.reference,
      createdBy: user.id,
    });
    await recordAudit(
      {
        actorUserId: user.id,
        actorLabel: user.email,
        action: `stock_${input.kind}`,
        entityType: "stock_location",
        entityId: input.locationId,
        summary: `${input.kind} ${input.gal} gal of product ${input.productId}${input.reason ? `: ${input.reason}` : ""}`,
        after: { input, movementIds },
        clientAddress,
      },
      trx,
    );
    await queueStockAlerts(trx);
    return { kind: "done" as const, movementIds };
  }, connection);
}

export type CountInput = {
  locationId: number;
  version: number | null;
  countedAt: Date;
  reason: string;
  lines: { productId: number; lotId: number | null; countedGal: number }[];
};

export type CountLineResult = {
  productId: number;
  lotId: number | null;
  bookGal: number;
  countedGal: number;
  varianceGal: number;
};

/**
 * A count of one location: what was found beside the book, line by line, and each variance posted
 * as an adjustment with the count's reason (required when anything differs).
 */
export async function recordStockCount(
  user: Actor,
  input: CountInput,
  clientAddress?: string,
  connection: Knex = db,
): Promise<{ kind: "done"; countId: number; lines: CountLineResult[] } | Refusal> {
  return runStockChange(async (trx) => {
    const locations = await lockLocations(trx, [input.locationId]);
    checkVersion(locations.get(input.locationId), "locationId", input.version);
    const productIds = [...new Set(input.lines.map((line) => line.productId))];
    const book = await bookFor(trx, [input.locationId], productIds);
    const facts = await factsFor(trx, productIds);
    const entries: BookEntry[] = [];
    const results: CountLineResult[] = [];
    for (const [index, line] of input.lines.entries()) {
      if (!(await productExists(trx, line.productId)))
        refuseAt(`lines[${index}].productId`, "Choose a product from the catalogue.");
      const plan = planMovement(
        [...book, ...entries],
        {
          kind: "adjusted",
          locationId: input.locationId,
          productId: line.productId,
          lotId: line.lotId,
          countedGal: line.countedGal,
        },
        facts,
      );
      if (!plan.ok) return refuseAt(`lines[${index}].${plan.field}`, plan.message);
      const variance = plan.entries.reduce((sum, entry) => sum + entry.gal, 0);
      results.push({
        productId: line.productId,
        lotId: line.lotId,
        bookGal: roundGal(line.countedGal - variance),
        countedGal: line.countedGal,
        varianceGal: roundGal(variance),
      });
      entries.push(...plan.entries);
    }
    if (entries.length && !input.reason.trim()) {
      refuseAt("reason", "The count differs from the book: give the reason for the adjustment.");
    }
    const [countId] = await trx("stock_counts").insert({
      location_id: input.locationId,
      counted_at: input.countedAt,
      reason: input.reason,
      counted_by: user.id,
    });
    if (results.length) {
      await trx("stock_count_lines").insert(
        results.map((line) => ({
          count_id: countId,
          product_id: line.productId,
          lot_id: line.lotId,
          book_gal: line.bookGal,
          counted_gal: line.countedGal,
          variance_gal: line.varianceGal,
        })),
      );
    }
    const movementIds = await writeEntries(trx, entries, {
      at: input.countedAt,
      reason: input.reason,
      createdBy: user.id,
      countId,
    });
    // A count that agrees still shows the location was looked at.
    if (!entries.length) await trx("stock_locations").where({ id: input.locationId }).increment("version", 1);
    await recordAudit(
      {
        actorUserId: user.id,
        actorLabel: user.email,
        action: "stock_counted",
        entityType: "stock_count",
        entityId: countId,
        summary: `Counted ${results.length} line${results.length === 1 ? "" : "s"}; ${entries.length} adjustment${entries.length === 1 ? "" : "s"}${input.reason ? `: ${input.reason}` : ""}`,
        after: { lines: results, movementIds },
        clientAddress,
      },
      trx,
    );
    await queueStockAlerts(trx);
    return { kind: "done" as const, countId, lines: results };
  }, connection);
}

// ---------------------------------------------------------------------------------------------
// A filed report's use and refills

export const HELD_USE_REASON_NEEDED =
  "This product is held for disposal. Choose another product, or say why it was used (the reason is kept with the report).";

/**
 * Refuses, at the line, a filed report that uses a product held for disposal without a reason.
 * Lines are `discharges[i]` as the form names them.
 */
async function checkHeldForDisposalUse(trx: Knex.Transaction, eventId: number): Promise<void> {
  const lines = await trx("discharges as d")
    .join("foam_products as p", "p.id", "d.product_id")
    .where({ "d.event_id": eventId, "p.held_for_disposal": true })
    .where((q) => q.whereNull("d.held_use_reason").orWhere("d.held_use_reason", ""))
    .select("d.position");
  if (!lines.length) return;
  const fieldErrors = Object.fromEntries(
    lines.map((line) => [`discharges[${line.position - 1}].heldUseReason`, [HELD_USE_REASON_NEEDED]]),
  );
  throw new RefusalError(
    refused(400, "The report was not filed: a line uses foam held for disposal without a reason.", fieldErrors),
  );
}

/**
 * Brings the stock book in line with a report that is being filed (first filing, filing again
 * after a return, or a revision): what it used from each apparatus tank (or, for a line without an
 * apparatus, its station's store) and what its refill readings moved from the station's store into
 * the tank. Only the difference from what earlier filings of the report already posted is written,
 * so however often a report is filed, its stock moves once. Call it inside the filing transaction.
 */
export async function postReportStock(trx: Knex.Transaction, eventId: number, actor: Actor): Promise<void> {
  await checkHeldForDisposalUse(trx, eventId);
  const event = await trx("events").where({ id: eventId }).first("number", "station_id", "started_at", "cleared_at");
  const discharges: {
    apparatus_id: number | null;
    foam_system_id: number | null;
    product_id: number;
    station_id: number | null;
    gal: unknown;
  }[] = await trx("discharges as d")
    .leftJoin("apparatus as a", "a.id", "d.apparatus_id")
    .where("d.event_id", eventId)
    .whereNotNull("d.product_id")
    .groupBy("d.apparatus_id", "d.foam_system_id", "d.product_id", "a.station_id")
    .select(
      "d.apparatus_id",
      "d.foam_system_id",
      "d.product_id",
      "a.station_id",
      trx.raw("SUM(d.concentrate_gal) AS gal"),
    );
  const refills = await trx("tank_readings as t")
    .join("apparatus as a", "a.id", "t.apparatus_id")
    .where({ "t.event_id": eventId, "t.kind": "refill" })
    .whereNotNull("t.refill_gal")
    .select("t.apparatus_id", "t.product_id", "t.refill_gal", "a.station_id");

  const usedWanted = new Map<string, number>();
  for (const line of discharges) {
    const locationId = line.apparatus_id
      ? await apparatusTankLocation(trx, line.apparatus_id, line.foam_system_id)
      : event.station_id
        ? await stationStoreLocation(trx, event.station_id)
        : null;
    if (locationId === null) continue;
    const key = `${locationId}:${line.product_id}`;
    usedWanted.set(key, roundGal((usedWanted.get(key) ?? 0) + decimalOrZero(line.gal)));
  }
  const refillWanted = new Map<string, number>();
  for (const reading of refills) {
    const productId =
      reading.product_id ?? discharges.find((line) => line.apparatus_id === reading.apparatus_id)?.product_id ?? null;
    const storeStation = reading.station_id ?? event.station_id;
    if (!productId || !storeStation) continue;
    const from = await stationStoreLocation(trx, storeStation);
    const to = await apparatusTankLocation(trx, reading.apparatus_id);
    const key = `${from}:${to}:${productId}`;
    refillWanted.set(key, roundGal((refillWanted.get(key) ?? 0) + decimalOrZero(reading.refill_gal)));
  }

  // What earlier filings posted, so that only the difference is written.
  const earlier = await trx("stock_movements")
    .where({ event_id: eventId })
    .select("kind", "location_id", "product_id", "gal", "counterpart_location_id");
  for (const row of earlier) {
    if (row.kind === "used") {
      const key = `${row.location_id}:${row.product_id}`;
      if (!usedWanted.has(key)) usedWanted.set(key, 0);
    } else if (row.kind === "transferred" && decimalOrZero(row.gal) > 0) {
      const key = `${row.counterpart_location_id}:${row.location_id}:${row.product_id}`;
      if (!refillWanted.has(key)) refillWanted.set(key, 0);
    }
  }
  const locationIds = new Set<number>();
  const productIds = new Set<number>();
  for (const key of usedWanted.keys()) {
    const [location, product] = key.split(":").map(Number);
    locationIds.add(location);
    productIds.add(product);
  }
  for (const key of refillWanted.keys()) {
    const [from, to, product] = key.split(":").map(Number);
    locationIds.add(from);
    locationIds.add(to);
    productIds.add(product);
  }
  if (!locationIds.size) return;
  await lockLocations(trx, [...locationIds]);
  const book = await bookFor(trx, [...locationIds], [...productIds]);
  const facts = await factsFor(trx, [...productIds]);
  const entries: BookEntry[] = [];
  const already = usedByEvent(book, eventId);
  for (const [key, wanted] of usedWanted) {
    const [locationId, productId] = key.split(":").map(Number);
    const plan = planMovement(
      [...book, ...entries],
      { kind: "used", locationId, productId, gal: roundGal(wanted - (already.get(key) ?? 0)), eventId },
      facts,
    );
    if (plan.ok) entries.push(...plan.entries);
  }
  for (const [key, wanted] of refillWanted) {
    const [fromLocationId, toLocationId, productId] = key.split(":").map(Number);
    const refilled = book
      .filter(
        (entry) =>
          entry.kind === "transferred" &&
          entry.eventId === eventId &&
          entry.locationId === toLocationId &&
          entry.counterpartLocationId === fromLocationId &&
          entry.productId === productId,
      )
      .reduce((sum, entry) => sum + entry.gal, 0);
    const plan = planMovement(
      [...book, ...entries],
      { kind: "refilled", fromLocationId, toLocationId, productId, gal: roundGal(wanted - refilled), eventId },
      facts,
    );
    if (plan.ok) entries.push(...plan.entries);
  }
  if (!entries.length) return;
  const movementIds = await writeEntries(trx, entries, {
    at: event.started_at ?? new Date(),
    reason: `Report ${event.number}`,
    createdBy: actor.id,
  });
  await recordAudit(
    {
      actorUserId: actor.id,
      actorLabel: actor.email,
      action: "stock_used_by_report",
      entityType: "stock_report_use",
      entityId: eventId,
      summary: `Stock book brought in line with report ${event.number}: ${entries.length} movement${entries.length === 1 ? "" : "s"}`,
      after: { movementIds },
    },
    trx,
  );
  await queueStockAlerts(trx);
}

// ---------------------------------------------------------------------------------------------
// Reading

export type StockItem = {
  location: { id: number; name: string; kind: StockLocationKind; stationId: number | null };
  product: { id: number; name: string; foamClass: FoamClass; heldForDisposal: boolean };
  lot: { id: number; number: string } | null;
  onHandGal: number;
};

type StockItemRow = {
  location_id: number;
  location_name: string;
  location_kind: StockLocationKind;
  station_id: number | null;
  product_id: number;
  product_name: string;
  foam_class: FoamClass;
  held_for_disposal: unknown;
  lot_id: number | null;
  lot_number: string | null;
  gal: unknown;
};

export type StockFilters = { locationId?: number; productId?: number };

/** What every location holds, lot by lot (lines that net to zero left out). */
export async function stockItems(filters: StockFilters = {}, connection: Db = db): Promise<StockItem[]> {
  const query = connection("stock_movements as m")
    .join("stock_locations as l", "l.id", "m.location_id")
    .join("foam_products as p", "p.id", "m.product_id")
    .leftJoin("stock_lots as t", "t.id", "m.lot_id")
    .groupBy("m.location_id", "m.product_id", "m.lot_id")
    .select(
      "m.location_id",
      "l.name as location_name",
      "l.kind as location_kind",
      "l.station_id",
      "m.product_id",
      "p.name as product_name",
      "p.foam_class",
      "p.held_for_disposal",
      "m.lot_id",
      "t.lot_number",
      connection.raw("SUM(m.gal) AS gal"),
    )
    .orderBy(["l.name", "p.name", "m.lot_id"]);
  if (filters.locationId) query.where("m.location_id", filters.locationId);
  if (filters.productId) query.where("m.product_id", filters.productId);
  const rows: StockItemRow[] = await query;
  return rows
    .map((row) => ({
      location: { id: row.location_id, name: row.location_name, kind: row.location_kind, stationId: row.station_id },
      product: {
        id: row.product_id,
        name: row.product_name,
        foamClass: row.foam_class,
        heldForDisposal: Boolean(Number(row.held_for_disposal)),
      },
      lot: row.lot_id ? { id: row.lot_id, number: row.lot_number ?? "" } : null,
      onHandGal: roundGal(decimalOrZero(row.gal)),
    }))
    .filter((item) => item.onHandGal !== 0);
}

export type StockMovementItem = {
  kind: StockMovementKind;
  gal: number;
  location: { id: number; name: string };
  product: { id: number; name: string };
  lot: { id: number; number: string } | null;
  at: string;
  eventId?: number;
};

export type MovementFilters = StockFilters & { kind?: StockMovementKind; from?: Date; to?: Date; eventId?: number };

/** Every movement the filters select, oldest first. */
export async function stockMovements(
  filters: MovementFilters = {},
  connection: Db = db,
): Promise<(StockMovementItem & { id: number; reason: string; reference: string; eventNumber: string | null })[]> {
  const query = connection("stock_movements as m")
    .join("stock_locations as l", "l.id", "m.location_id")
    .join("foam_products as p", "p.id", "m.product_id")
    .leftJoin("stock_lots as t", "t.id", "m.lot_id")
    .leftJoin("events as e", "e.id", "m.event_id")
    .orderBy([{ column: "m.at" }, { column: "m.id" }])
    .select(
      "m.id",
      "m.kind",
      "m.gal",
      "m.at",
      "m.event_id",
      "m.reason",
      "m.reference",
      "m.location_id",
      "l.name as location_name",
      "m.product_id",
      "p.name as product_name",
      "m.lot_id",
      "t.lot_number",
      "e.number as event_number",
    );
  if (filters.locationId) query.where("m.location_id", filters.locationId);
  if (filters.productId) query.where("m.product_id", filters.productId);
  if (filters.kind) query.where("m.kind", filters.kind);
  if (filters.eventId) query.where("m.event_id", filters.eventId);
  if (filters.from) query.where("m.at", ">=", filters.from);
  if (filters.to) query.where("m.at", "<", filters.to);
  const rows = await query;
  return rows.map((row) => ({
    id: row.id,
    kind: row.kind,
    gal: decimalOrZero(row.gal),
    location: { id: row.location_id, name: row.location_name },
    product: { id: row.product_id, name: row.product_name },
    lot: row.lot_id ? { id: row.lot_id, number: row.lot_number } : null,
    at: new Date(row.at).toISOString(),
    ...(row.event_id ? { eventId: row.event_id as number } : {}),
    reason: row.reason,
    reference: row.reference,
    eventNumber: row.event_number ?? null,
  }));
}

export type StockLot = {
  id: number;
  productId: number;
  productName: string;
  lotNumber: string;
  manufacturedOn: string | null;
  receivedOn: string;
  container: StockContainer;
  containerGal: number;
  containerCount: number;
  supplier: string;
  deliveryReference: string;
};

const isoDay = (value: unknown): string | null =>
  value ? (value instanceof Date ? value.toISOString().slice(0, 10) : String(value).slice(0, 10)) : null;

export async function listStockLots(connection: Db = db): Promise<StockLot[]> {
  const rows = await connection("stock_lots as t")
    .join("foam_products as p", "p.id", "t.product_id")
    .orderBy([{ column: "p.name" }, { column: "t.received_on" }])
    .select("t.*", "p.name as product_name");
  return rows.map((row) => ({
    id: row.id,
    productId: row.product_id,
    productName: row.product_name,
    lotNumber: row.lot_number,
    manufacturedOn: isoDay(row.manufactured_on),
    receivedOn: isoDay(row.received_on)!,
    container: row.container,
    containerGal: decimalOrZero(row.container_gal),
    containerCount: row.container_count,
    supplier: row.supplier,
    deliveryReference: row.delivery_reference,
  }));
}

/** The location kinds with their labels, for the pages' lists. */
export const LOCATION_KIND_OPTIONS = Object.entries(STOCK_LOCATION_KIND_LABELS).map(([value, label]) => ({
  value,
  label,
}));

/** A location's row by id (with its version), or null. */
export async function getStockLocation(id: number, connection: Db = db): Promise<StockLocation | null> {
  const row: LocationRow | undefined = await locationsWithTanks(connection).where("l.id", id).first();
  return row ? locationOf(row) : null;
}

export type NewLocationInput = {
  kind: StockLocationKind;
  name: string;
  stationId: number | null;
  apparatusId: number | null;
};

/** Adds a location (a store, a tender, a cache, or an apparatus's tank). */
export async function addStockLocation(
  user: Actor,
  input: NewLocationInput,
  clientAddress?: string,
  connection: Knex = db,
): Promise<{ kind: "done"; id: number } | Refusal> {
  return runStockChange(async (trx) => {
    if (await trx("stock_locations").where({ name: input.name }).first("id")) {
      refuseAt("name", "Another location has this name.");
    }
    if (input.stationId && !(await trx("stations").where({ id: input.stationId }).first("id"))) {
      refuseAt("stationId", "Choose a station from the list.");
    }
    if (input.apparatusId) {
      if (!(await trx("apparatus").where({ id: input.apparatusId }).first("id"))) {
        refuseAt("apparatusId", "Choose an apparatus from the list.");
      }
    }
    // An apparatus tank is the next of its foam systems' tanks not yet a location.
    const tank =
      input.kind === "apparatus_tank" && input.apparatusId
        ? await trx("foam_system_tanks as k")
            .join("foam_systems as s", "s.id", "k.foam_system_id")
            .where("s.apparatus_id", input.apparatusId)
            .whereNotExists(trx("stock_locations as l").whereRaw("l.foam_system_tank_id = k.id").select("l.id"))
            .orderBy([{ column: "s.id" }, { column: "k.id" }])
            .first("k.id")
        : null;
    if (input.kind === "apparatus_tank" && input.apparatusId && !tank) {
      if (await trx("stock_locations").where({ apparatus_id: input.apparatusId }).first("id")) {
        refuseAt("apparatusId", "Every tank of this apparatus's foam systems is already a location.");
      }
    }
    const [id] = await trx("stock_locations").insert({
      kind: input.kind,
      name: input.name,
      station_id: input.stationId,
      apparatus_id: input.kind === "apparatus_tank" ? input.apparatusId : null,
      foam_system_tank_id: tank?.id ?? null,
    });
    await recordAudit(
      {
        actorUserId: user.id,
        actorLabel: user.email,
        action: "stock_location_added",
        entityType: "stock_location",
        entityId: id,
        summary: input.name,
        after: input,
        clientAddress,
      },
      trx,
    );
    return { kind: "done" as const, id };
  }, connection);
}

/** Sets (or, with null, removes) the reorder point of a product at a location. */
export async function setReorderPoint(
  user: Actor,
  input: { locationId: number; productId: number; reorderGal: number | null },
  clientAddress?: string,
  connection: Knex = db,
): Promise<{ kind: "done" } | Refusal> {
  return runStockChange(async (trx) => {
    if (!(await trx("stock_locations").where({ id: input.locationId }).first("id"))) {
      refuseAt("locationId", "Choose a location from the list.");
    }
    if (!(await productExists(trx, input.productId))) refuseAt("productId", "Choose a product from the catalogue.");
    const where = { location_id: input.locationId, product_id: input.productId };
    const before = await trx("stock_reorder_points").where(where).first("reorder_gal");
    if (input.reorderGal === null) await trx("stock_reorder_points").where(where).delete();
    else {
      await trx("stock_reorder_points")
        .insert({ ...where, reorder_gal: input.reorderGal })
        .onConflict(["location_id", "product_id"])
        .merge(["reorder_gal"]);
    }
    await recordAudit(
      {
        actorUserId: user.id,
        actorLabel: user.email,
        action: "stock_reorder_point_set",
        entityType: "stock_location",
        entityId: input.locationId,
        summary: `Reorder point of product ${input.productId}: ${input.reorderGal ?? "none"}`,
        before: before ? { reorderGal: decimalOrNull(before.reorder_gal) } : undefined,
        after: { reorderGal: input.reorderGal },
        clientAddress,
      },
      trx,
    );
    await queueStockAlerts(trx);
    return { kind: "done" as const };
  }, connection);
}

export type StockProductOption = { id: number; name: string; foamClass: FoamClass; heldForDisposal: boolean };

/** The choices the stock forms offer: products (held ones marked), stations, apparatus, locations and lots. */
export async function stockFormOptions(connection: Db = db) {
  const [products, stations, apparatus, locations, lots] = await Promise.all([
    connection("foam_products")
      .where({ active: true })
      .orderBy("name")
      .select("id", "name", "foam_class", "held_for_disposal"),
    connection("stations").where({ active: true }).orderBy("code").select("id", "code", "name"),
    connection("apparatus").where({ active: true }).orderBy("unit_id").select("id", "unit_id"),
    listStockLocations(connection),
    listStockLots(connection),
  ]);
  return {
    products: products.map((row): StockProductOption => ({
      id: row.id,
      name: row.name,
      foamClass: row.foam_class,
      heldForDisposal: Boolean(Number(row.held_for_disposal)),
    })),
    stations: stations.map((row) => ({ id: row.id as number, label: `${row.name} (${row.code})` })),
    apparatus: apparatus.map((row) => ({ id: row.id as number, label: row.unit_id as string })),
    locations,
    lots,
  };
}

/** The reorder points, with what is on hand beside each. */
export async function listReorderPoints(connection: Db = db) {
  const rows = await connection("stock_reorder_points as r")
    .join("stock_locations as l", "l.id", "r.location_id")
    .join("foam_products as p", "p.id", "r.product_id")
    .orderBy(["l.name", "p.name"])
    .select(
      "r.location_id",
      "r.product_id",
      "r.reorder_gal",
      "l.name as location_name",
      "p.name as product_name",
      connection.raw(
        "(SELECT COALESCE(SUM(m.gal), 0) FROM stock_movements m WHERE m.location_id = r.location_id AND m.product_id = r.product_id) AS on_hand",
      ),
    );
  return rows.map((row) => ({
    locationId: row.location_id as number,
    productId: row.product_id as number,
    locationName: row.location_name as string,
    productName: row.product_name as string,
    reorderGal: decimalOrZero(row.reorder_gal),
    onHandGal: roundGal(decimalOrZero(row.on_hand)),
  }));
}

export type RecentCount = {
  id: number;
  countedAt: string;
  reason: string;
  countedBy: string;
  lines: (CountLineResult & { productName: string; lotNumber: string | null })[];
};

/** The latest counts of a location with their lines, newest first. */
export async function listRecentCounts(locationId: number, limit = 5, connection: Db = db): Promise<RecentCount[]> {
  const counts = await connection("stock_counts as c")
    .join("users as u", "u.id", "c.counted_by")
    .where("c.location_id", locationId)
    .orderBy("c.id", "desc")
    .limit(limit)
    .select("c.id", "c.counted_at", "c.reason", "u.name as counted_by");
  if (!counts.length) return [];
  const lines = await connection("stock_count_lines as l")
    .join("foam_products as p", "p.id", "l.product_id")
    .leftJoin("stock_lots as t", "t.id", "l.lot_id")
    .whereIn(
      "l.count_id",
      counts.map((count) => count.id),
    )
    .orderBy("l.id")
    .select("l.*", "p.name as product_name", "t.lot_number");
  return counts.map((count) => ({
    id: count.id,
    countedAt: new Date(count.counted_at).toISOString(),
    reason: count.reason,
    countedBy: count.counted_by,
    lines: lines
      .filter((line) => line.count_id === count.id)
      .map((line) => ({
        productId: line.product_id,
        lotId: line.lot_id,
        productName: line.product_name,
        lotNumber: line.lot_number ?? null,
        bookGal: decimalOrZero(line.book_gal),
        countedGal: decimalOrZero(line.counted_gal),
        varianceGal: decimalOrZero(line.variance_gal),
      })),
  }));
}

/** An event's concentrate cost (US $) at the catalogue's unit costs; null when no product used has one. */
export async function eventConcentrateCost(eventId: number, connection: Db = db): Promise<number | null> {
  const row = await connection("events as e")
    .where("e.id", eventId)
    .first(connection.raw(`${concentrateCostSql("e")} AS cost`));
  return decimalOrNull(row?.cost);
}

/** Whether a movement with this id is recorded as `disposed` (only those take a disposal manifest). */
export async function disposedMovementExists(movementId: number, connection: Db = db): Promise<boolean> {
  return Boolean(await connection("stock_movements").where({ id: movementId, kind: "disposed" }).first("id"));
}
