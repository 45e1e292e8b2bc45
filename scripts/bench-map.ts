// Benchmark of the map's data: fills a throwaway database with 20,000 events (one discharge each)
// spread over the demo district's bounds, then times GET /api/map/events.geojson (through the route
// loader, with token sign-in, query and serialisation), GET /api/summary for the same year and a
// map-sized bbox, and rechecking every event's geography after a layer upload. Not a test.
//   npm run bench -- map          (or: node --import tsx scripts/bench-map.ts)
import { createHash, randomBytes } from "node:crypto";
import { existsSync, readFileSync } from "node:fs";
import { performance } from "node:perf_hooks";
import { gunzipSync, gzipSync } from "node:zlib";

if (existsSync(".env")) process.loadEnvFile(".env");
const { benchDatabaseName, freshBenchDatabase } = await import("./throwaway-database");
const BENCH_DB = benchDatabaseName("foamtally_bench_map");
process.env.DB_NAME = BENCH_DB;
const EVENTS = Number(process.env.BENCH_MAP_EVENTS ?? 20_000);
const RUNS = 5;

async function fill(): Promise<string> {
  const { EVENT_KINDS } = await import("../app/lib/foam/vocabulary");
  const { insertReportsInBatches, statedResults, totalsColumns } = await import("../app/models/report-rows.server");
  const knex = await freshBenchDatabase(BENCH_DB, { name: "Benchmark district (synthetic)" });
  try {
    const [userId] = await knex("users").insert({ email: "bench@bench.example", name: "Bench", password_hash: "x" });
    await knex("user_roles").insert({ user_id: userId, role: "chief" });
    const token = randomBytes(24).toString("hex");
    await knex("api_tokens").insert({
      user_id: userId,
      name: "bench",
      token_prefix: token.slice(0, 8),
      token_hash: createHash("sha256").update(token).digest("hex"),
    });
    const stations: number[] = [];
    for (const code of ["B1", "B2", "B3"]) {
      const [id] = await knex("stations").insert({ code, name: `Bench ${code}` });
      stations.push(id);
    }
    const products: { id: number; pfas: boolean }[] = [];
    for (const [name, foamClass, pfas] of [
      ["Bench Class A (synthetic)", "A", false],
      ["Bench fluorine-free B (synthetic)", "B", false],
      ["Bench legacy AR-AFFF (synthetic)", "B", true],
    ] as const) {
      const [id] = await knex("foam_products").insert({
        name,
        foam_class: foamClass,
        foam_type: "other",
        pfas_containing: pfas,
      });
      products.push({ id, pfas });
    }
    // Deterministic pseudo-random spread (a small linear congruential generator).
    let seed = 20_261_201;
    const random = () => (seed = (seed * 1_103_515_245 + 12_345) % 2 ** 31) / 2 ** 31;
    const start = Date.UTC(2030, 0, 2); // well inside the local year
    const BATCH = 1000;
    for (let first = 0; first < EVENTS; first += BATCH) {
      const reports = [];
      for (let i = first; i < Math.min(EVENTS, first + BATCH); i++) {
        const product = products[Math.floor(random() * (random() < 0.9 ? 1 : 3))];
        const concentrate = Math.round(random() * 3000) / 100;
        const water = Math.round(random() * 300_000) / 100;
        const computed = statedResults([{ water, concentrate }], product.pfas);
        reports.push({
          event: {
            number: `BENCH-${i}`,
            kind: EVENT_KINDS[i % EVENT_KINDS.length],
            status: "accepted",
            started_at: new Date(start + random() * 360 * 86_400_000),
            address: `${i} Bench Road`,
            latitude: (38.6 + random() * 0.2).toFixed(6),
            longitude: (-98.32 + random() * 0.24).toFixed(6),
            station_id: stations[i % 3],
            created_by: userId,
            ...totalsColumns(computed),
          },
          // One ten-minute line whose stated volumes are the event's.
          lines: {
            discharges: [{ apparatusId: null, productId: product.id, percent: null, flow: water / 10, minutes: 10 }],
          },
          computed,
        });
      }
      await insertReportsInBatches(knex, reports);
    }
    return token;
  } finally {
    await knex.destroy();
  }
}

function median(values: number[]): number {
  const sorted = [...values].sort((a, b) => a - b);
  return sorted[Math.floor(sorted.length / 2)];
}

async function main() {
  const filled = performance.now();
  const token = await fill();
  console.log(`filled ${BENCH_DB} with ${EVENTS} events in ${((performance.now() - filled) / 1000).toFixed(1)} s`);
  const { RouterContextProvider } = await import("react-router");
  const { loader: eventsLoader } = await import("../app/routes/api.map.events");
  const { loader: summaryLoader } = await import("../app/routes/api.summary");
  const { replaceLayer } = await import("../app/models/geography.server");
  const { db } = await import("../app/lib/db.server");
  type Loader = (args: never) => Promise<unknown>;
  const call = async (loader: Loader, path: string) => {
    const request = new Request(`http://127.0.0.1${path}`, {
      headers: { Authorization: `Bearer ${token}`, "Accept-Encoding": "gzip" },
    });
    const response = (await loader({
      request,
      params: {},
      context: new RouterContextProvider(),
    } as never)) as Response;
    return Buffer.from(await response.arrayBuffer());
  };
  // Each run first gives the reports a new version stamp, as any saved report does, so the answer is
  // computed again (not the one kept for the last stamp); the kept answer is timed after.
  const { bumpDataVersion } = await import("../app/models/data-version.server");
  const figures = (times: number[]) =>
    `median ${median(times).toFixed(0)} ms of ${times.length} (min ${Math.min(...times).toFixed(0)}, max ${Math.max(...times).toFixed(0)})`;
  const measure = async (label: string, loader: Loader, path: string) => {
    const computed: number[] = [];
    const kept: number[] = [];
    let answer = Buffer.alloc(0);
    for (let run = 0; run < RUNS; run++) {
      await bumpDataVersion(db, "reports");
      let began = performance.now();
      answer = await call(loader, path);
      computed.push(performance.now() - began);
      began = performance.now();
      await call(loader, path);
      kept.push(performance.now() - began);
    }
    // The map's events come gzipped when asked; the summary is small and left to the server's compression.
    const isGzip = answer[0] === 0x1f && answer[1] === 0x8b;
    const body = isGzip ? gunzipSync(answer) : answer;
    const gzippedBytes = isGzip ? answer.length : gzipSync(body).length;
    console.log(
      `${label}: after a new version ${figures(computed)}; kept ${figures(kept)}; ` +
        `${(body.length / 1024).toFixed(0)} KB, ${(gzippedBytes / 1024).toFixed(0)} KB gzipped`,
    );
    return body;
  };
  try {
    const year = "from=2030-01-01&to=2030-12-31";
    const all = await measure(`events.geojson, ${EVENTS} events`, eventsLoader, `/api/map/events.geojson?${year}`);
    const count = (JSON.parse(all.toString()) as { features: unknown[] }).features.length;
    if (count !== EVENTS) throw new Error(`expected ${EVENTS} features, got ${count}`);
    await measure(
      "events.geojson, bbox a quarter of the district",
      eventsLoader,
      `/api/map/events.geojson?${year}&bbox=-98.32,38.6,-98.2,38.7`,
    );
    await measure(`summary, ${EVENTS} events`, summaryLoader, `/api/summary?${year}`);
    await measure(
      "summary, bbox a quarter of the district",
      summaryLoader,
      `/api/summary?${year}&bbox=-98.32,38.6,-98.2,38.7`,
    );
    const demo = (name: string) => readFileSync(`tiles/sources/alder-bend/${name}.geojson`, "utf8");
    for (const [kind, name] of [
      ["drainage_basins", "drainage-basins"],
      ["storm_inlets", "storm-inlets"],
      ["jurisdiction", "jurisdiction"],
    ] as const) {
      await replaceLayer({ kind, text: demo(name), fileName: name }, null, null, {
        recheckEvents: false,
        keepFile: false,
      });
    }
    const text = demo("waterways");
    const began = performance.now();
    const result = await replaceLayer({ kind: "waterways", text, fileName: "waterways.geojson" }, null, null, {
      keepFile: false,
    });
    if (!result.ok) throw new Error(result.errors.join(" "));
    console.log(
      `replace the waterways layer and recheck ${result.eventsRechecked} events: ${((performance.now() - began) / 1000).toFixed(1)} s`,
    );
  } finally {
    await db.destroy();
  }
}

await main();
