// Stock conditions that need someone: a product below its reorder point at a location, a lot past
// its shelf life, a lot due for its quality sample. Each is mailed once through the outbox while
// it holds (`stock_alerts_sent`); a reorder condition that clears is forgotten, so the next fall
// below the point alerts again.
import type { Knex } from "knex";
import { rolesFor } from "~/lib/access";
import { decimalOrZero } from "~/lib/decimal";
import { db, type Db } from "~/lib/db.server";
import { env } from "~/lib/env.server";
import { addMonths } from "~/lib/foam/system-schedule";
import { shelfLifeEnds } from "~/lib/stock/shelf-life";
import { readAgencySettings } from "./agency-settings.server";
import { queueMail } from "./mail-outbox.server";

export type StockConditionKind = "reorder" | "expired" | "sample_due";
export type StockCondition = { key: string; kind: StockConditionKind; message: string };

const isoDay = (value: unknown): string | null =>
  value ? (value instanceof Date ? value.toISOString().slice(0, 10) : String(value).slice(0, 10)) : null;
const gal = (value: number) => `${value.toLocaleString("en-US", { maximumFractionDigits: 1 })} gal`;

/** Every stock condition that holds on `today` (YYYY-MM-DD, UTC). */
export async function currentStockConditions(
  connection: Db = db,
  today = new Date().toISOString().slice(0, 10),
): Promise<StockCondition[]> {
  const settings = await readAgencySettings(connection);
  const conditions: StockCondition[] = [];

  const reorder = await connection("stock_reorder_points as r")
    .join("stock_locations as l", "l.id", "r.location_id")
    .join("foam_products as p", "p.id", "r.product_id")
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
  for (const row of reorder) {
    const onHand = decimalOrZero(row.on_hand);
    const point = decimalOrZero(row.reorder_gal);
    if (onHand < point) {
      conditions.push({
        key: `reorder:${row.location_id}:${row.product_id}`,
        kind: "reorder",
        message: `${row.product_name} at ${row.location_name}: ${gal(onHand)} on hand, below the reorder point of ${gal(point)}.`,
      });
    }
  }

  // Lots still held somewhere, with when they were made, last sampled and their product's shelf life.
  const lots = await connection("stock_lots as t")
    .join("foam_products as p", "p.id", "t.product_id")
    .select(
      "t.id",
      "t.lot_number",
      "t.manufactured_on",
      "t.received_on",
      "p.name as product_name",
      "p.shelf_life_months",
      "p.held_for_disposal",
      connection.raw("(SELECT COALESCE(SUM(m.gal), 0) FROM stock_movements m WHERE m.lot_id = t.id) AS on_hand"),
      connection.raw(
        "(SELECT MAX(m.at) FROM stock_movements m WHERE m.lot_id = t.id AND m.kind = 'sampled') AS sampled_at",
      ),
    );
  for (const lot of lots) {
    const onHand = decimalOrZero(lot.on_hand);
    if (onHand <= 0) continue;
    const made = isoDay(lot.manufactured_on);
    const expires = shelfLifeEnds(made, lot.shelf_life_months == null ? null : Number(lot.shelf_life_months));
    if (expires) {
      if (expires < today) {
        conditions.push({
          key: `expired:${lot.id}`,
          kind: "expired",
          message: `Lot ${lot.lot_number} of ${lot.product_name} (${gal(onHand)} in stock) passed its shelf life on ${expires}.`,
        });
      }
    }
    // Foam held for disposal is not sampled for use; it waits for the hauler.
    if (Number(lot.held_for_disposal)) continue;
    const since = isoDay(lot.sampled_at) ?? isoDay(lot.received_on)!;
    const due = addMonths(since, settings.qualitySampleIntervalMonths);
    if (due <= today) {
      conditions.push({
        key: `sample:${lot.id}:${due}`,
        kind: "sample_due",
        message: `Lot ${lot.lot_number} of ${lot.product_name} is due for its quality sample (NFPA 11 §13.2.6; every ${settings.qualitySampleIntervalMonths} months): last ${lot.sampled_at ? "sampled" : "received"} ${since}, due ${due}.`,
      });
    }
  }
  return conditions;
}

async function stockAlertRecipients(connection: Db): Promise<string[]> {
  return connection("users")
    .join("user_roles", "user_roles.user_id", "users.id")
    .whereIn("user_roles.role", rolesFor("alerts.stock"))
    .where({ "users.active": true })
    .distinct()
    .pluck("users.email");
}

/**
 * Queues one mail listing the stock conditions not alerted before, and forgets reorder conditions
 * that cleared. Runs in the caller's transaction after every stock change, and hourly from
 * `runScheduledChecks` (shelf life and sample dates pass without any movement).
 */
export async function queueStockAlerts(trx: Knex.Transaction, today?: string): Promise<number> {
  const conditions = await currentStockConditions(trx, today);
  const sent = new Set<string>(await trx("stock_alerts_sent").forUpdate().pluck("alert_key"));
  const holding = new Set(conditions.map((condition) => condition.key));
  const cleared = [...sent].filter((key) => key.startsWith("reorder:") && !holding.has(key));
  if (cleared.length) await trx("stock_alerts_sent").whereIn("alert_key", cleared).delete();
  const fresh = conditions.filter((condition) => !sent.has(condition.key));
  if (!fresh.length) return 0;
  await trx("stock_alerts_sent").insert(fresh.map((condition) => ({ alert_key: condition.key })));
  const link = `${env().APP_URL.replace(/\/$/, "")}/stock`;
  await queueMail(
    {
      kind: "stock_alert",
      to: await stockAlertRecipients(trx),
      subject: `Concentrate stock: ${fresh.length} item${fresh.length === 1 ? "" : "s"} need attention`,
      text: [
        "The concentrate stock book shows:",
        "",
        ...fresh.map((condition) => `- ${condition.message}`),
        "",
        `Open the stock book: ${link}`,
        "",
        "Figures are the book's, from received, moved, used and counted concentrate; a count settles what is really there.",
      ].join("\n"),
    },
    trx,
  );
  return fresh.length;
}
