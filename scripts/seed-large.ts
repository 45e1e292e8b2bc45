// npm run seed:large -- --events 20000 [--seed 7] [--force]
// A large synthetic data set for benchmarks, into the database named by DB_NAME, built with the same
// row builders and arithmetic as the demo seed. Refuses the main database `foamtally` unless --force.
import knexFactory, { type Knex } from "knex";
import knexConfig from "../knexfile";
import type { EventStatus } from "../app/lib/foam/vocabulary";
import { insertReportsInBatches } from "../app/models/report-rows.server";
import {
  eventRow,
  loadCatalogueFacts,
  seededRandom,
  usageOf,
  type EventSpec,
} from "../app/models/usage-builders.server";
import { demoIds, routineEvent } from "../seeds/03_events";
import { createDatabaseIfMissing } from "./throwaway-database";

function option(name: string): string | undefined {
  const index = process.argv.indexOf(`--${name}`);
  return index >= 0 ? process.argv[index + 1] : undefined;
}

const eventCount = Number(option("events") ?? 20000);
const randomSeed = Number(option("seed") ?? 7);
const force = process.argv.includes("--force");
const database = (knexConfig.connection as Knex.MySqlConnectionConfig).database ?? "foamtally";
const BATCH = 500;

if (!Number.isInteger(eventCount) || eventCount < 1 || eventCount > 2_000_000) {
  console.error("--events must be a whole number from 1 to 2,000,000.");
  process.exit(2);
}
if (database === "foamtally" && !force) {
  console.error(
    "Refusing to add synthetic events to the main database `foamtally`. Set DB_NAME to another database " +
      "(e.g. DB_NAME=foamtally_bench) or pass --force.",
  );
  process.exit(2);
}

const started = performance.now();
await createDatabaseIfMissing(database);
const knex = knexFactory(knexConfig);
try {
  await knex.migrate.latest();
  // The demo accounts and catalogue give the synthetic events their apparatus, products and people.
  await knex.seed.run({ specific: "01_agency_and_accounts.ts" });
  await knex.seed.run({ specific: "02_catalogue.ts" });
  const ids = await demoIds(knex);
  const facts = await loadCatalogueFacts(knex);
  const random = seededRandom(randomSeed);
  const tag = `SY${Date.now().toString(36).toUpperCase()}`;
  const first = Date.UTC(2024, 11, 1);
  const span = Date.UTC(2026, 10, 30) - first;
  let discharges = 0;
  let dispositions = 0;
  let readings = 0;
  for (let offset = 0; offset < eventCount; offset += BATCH) {
    const specs: EventSpec[] = [];
    for (let index = offset; index < Math.min(eventCount, offset + BATCH); index++) {
      const start = new Date(first + Math.floor(random.next() * span));
      const status: EventStatus = random.chance(0.85) ? "accepted" : random.pick(["draft", "filed", "returned"]);
      const kind = random.chance(0.25) ? "training" : "incident";
      const spec = routineEvent(random, `${tag}-${String(index + 1).padStart(7, "0")}`, kind, {
        ids,
        start,
        reviewer: ids.reviewer,
        status,
      });
      // A share of the Class B lines draw the demo's PFAS-containing legacy concentrate, so that the
      // PFAS sheet and its 24-hour check have work at size.
      for (const discharge of spec.discharges) {
        if (discharge.productId === ids.products.f3 && random.chance(0.5)) discharge.productId = ids.products.legacy;
      }
      const line = spec.discharges[0];
      if (line.productId != null && random.chance(0.2)) {
        // A refill reading near the computed drawdown, as a crew would log it.
        const computed = usageOf(spec, facts).byProduct.find((group) => group.productId === line.productId);
        const refillGal = Math.round((computed?.totals.concentrate.gal ?? 0) * random.between(0.9, 1.1) * 10) / 10;
        spec.tankReadings = [{ apparatusId: line.apparatusId, productId: line.productId, refillGal }];
      }
      specs.push(spec);
    }
    await knex.transaction(async (trx) => {
      const written = await insertReportsInBatches(
        trx,
        specs.map((spec) => {
          const computed = usageOf(spec, facts);
          return { event: eventRow(spec, computed), lines: spec, computed };
        }),
        BATCH,
      );
      discharges += written.discharges;
      dispositions += written.dispositions;
      readings += written.tankReadings;
    });
    if (process.stdout.isTTY) process.stdout.write(`\r${Math.min(eventCount, offset + BATCH)} / ${eventCount} events`);
  }
  const inserted = (performance.now() - started) / 1000;
  // The demo's drainage basins, waterways, inlets and boundary (loaded when missing), and every
  // event's checks against them, as the demo seed does: the geography sheets then have work at size.
  await knex.seed.run({ specific: "04_geography.ts" });
  const seconds = (performance.now() - started) / 1000;
  const count = async (query: Knex.QueryBuilder) => Number((await query.count({ n: "*" }).first())!.n);
  const total = await count(knex("events"));
  const pfas = await count(knex("events").where({ pfas_containing: true }));
  const inBasins = await count(knex("events").whereNotNull("drainage_basin"));
  console.log(
    `\nInserted ${eventCount} events, ${discharges} discharges, ${dispositions} runoff dispositions and ` +
      `${readings} tank readings into ${database} in ${inserted.toFixed(1)} s ` +
      `(${Math.round(eventCount / inserted)} events/s), and checked them against the demo's drainage layers: ` +
      `${seconds.toFixed(1)} s in all. The database now holds ${total} events, ${pfas} with PFAS-containing ` +
      `foam and ${inBasins} inside a drainage basin.`,
  );
} finally {
  await knex.destroy();
}
