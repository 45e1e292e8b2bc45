// Benchmark of the API and the map page through the built production server (`scripts/serve.js`,
// the build in BUILD_DIR: `npm run build` first), each measure against its baseline alternately
// (A then B, B then A) for BENCH_ROUNDS rounds (default and minimum 5). Throughput figures come from
// a small load generator in this process: BENCH_CONNECTIONS (default 50) keep-alive connections
// sending one request after another for BENCH_SECONDS (default 3) per run. Fills a throwaway
// database (foamtally_bench_api) with BENCH_API_EVENTS accepted events (default 20,000). Writes its
// rows to bench/results.json. Not a test: the figures move with the machine's load.
//   npm run bench -- api          (or: node --import tsx scripts/bench-api.ts)
import { spawn, type ChildProcess } from "node:child_process";
import { createHash, randomBytes } from "node:crypto";
import { existsSync } from "node:fs";
import http from "node:http";
import path from "node:path";
import { performance } from "node:perf_hooks";

if (existsSync(".env")) process.loadEnvFile(".env");
const { benchDatabaseName, freshBenchDatabase } = await import("./throwaway-database");
const { machine, median, ratioRow, writeResults } = await import("./benchmark-results");
type BenchRow = import("./benchmark-results").BenchRow;

const BENCH_DB = benchDatabaseName("foamtally_bench_api");
process.env.DB_NAME = BENCH_DB;
const EVENTS = Number(process.env.BENCH_API_EVENTS ?? 20_000);
const ROUNDS = Math.max(5, Number(process.env.BENCH_ROUNDS ?? 5));
const CONNECTIONS = Number(process.env.BENCH_CONNECTIONS ?? 50);
const SECONDS = Number(process.env.BENCH_SECONDS ?? 3);
const PORT = Number(process.env.BENCH_PORT ?? Number(process.env.PORT ?? 3000) + 9);
const ORIGIN = `http://127.0.0.1:${PORT}`;
const YEAR = "from=2030-01-01&to=2030-12-31";

async function fill(): Promise<{ chiefCookie: string; officerCookie: string; productIds: number[] }> {
  const { EVENT_KINDS } = await import("../app/lib/foam/vocabulary");
  const { insertReportsInBatches, statedResults, totalsColumns } = await import("../app/models/report-rows.server");
  const { createSignedCookie } = await import("../app/lib/signed-cookie.server");
  const knex = await freshBenchDatabase(BENCH_DB, {
    name: "Benchmark district (synthetic)",
    time_zone: "America/Chicago",
  });
  try {
    const cookie = createSignedCookie("__foamtally", { path: "/", secrets: [process.env.SESSION_SECRET ?? ""] });
    const person = async (email: string, role: string) => {
      const [id] = await knex("users").insert({ email, name: `Bench ${role} (synthetic)`, password_hash: "x" });
      await knex("user_roles").insert({ user_id: id, role });
      const sessionId = randomBytes(32).toString("base64url");
      await knex("sessions").insert({
        id_hash: createHash("sha256").update(sessionId).digest("hex"),
        user_id: id,
        data: JSON.stringify({ userId: id }),
        expires_at: new Date(Date.now() + 12 * 3_600_000),
      });
      return { id, cookie: (await cookie.serialize(sessionId)).split(";")[0] };
    };
    const chief = await person("chief@bench.example", "chief");
    const officer = await person("officer@bench.example", "officer");
    await knex("user_roles").insert({ user_id: chief.id, role: "environmental" });
    const stations: number[] = [];
    for (const code of ["B1", "B2", "B3"]) {
      const [id] = await knex("stations").insert({ code, name: `Bench ${code} (synthetic)` });
      stations.push(id);
    }
    const products: { id: number; pfas: boolean }[] = [];
    for (const [name, foamClass, type, pfas] of [
      ["Bench Class A (synthetic)", "A", "class-a", false],
      ["Bench fluorine-free B (synthetic)", "B", "f3", false],
      ["Bench legacy AR-AFFF (synthetic)", "B", "ar-afff", true],
    ] as const) {
      const [id] = await knex("foam_products").insert({
        name,
        foam_class: foamClass,
        foam_type: type,
        nominal_percents: foamClass === "A" ? "0.3,0.5" : "3",
        pfas_containing: pfas,
      });
      products.push({ id, pfas });
    }
    const basins = ["Upper Alder (synthetic)", "Millrace (synthetic)", "South Fork (synthetic)", null];
    let seed = 20_261_203;
    const random = () => (seed = (seed * 1_103_515_245 + 12_345) % 2 ** 31) / 2 ** 31;
    const start = Date.UTC(2030, 0, 2);
    for (let first = 0; first < EVENTS; first += 1000) {
      const reports = [];
      for (let i = first; i < Math.min(EVENTS, first + 1000); i++) {
        const product = products[Math.floor(random() * (random() < 0.9 ? 1 : 3))];
        const concentrate = Math.round(random() * 3000) / 100;
        const water = Math.round(random() * 300_000) / 100;
        const computed = statedResults([{ water, concentrate }], product.pfas);
        reports.push({
          event: {
            number: `BENCH-${i}`,
            kind: EVENT_KINDS[i % EVENT_KINDS.length],
            // Every twentieth is the officer's own draft: the list's visibility rule has work to do.
            status: i % 20 === 0 ? "draft" : "accepted",
            started_at: new Date(start + random() * 360 * 86_400_000),
            address: `${i} Bench Road`,
            latitude: (38.6 + random() * 0.2).toFixed(6),
            longitude: (-98.32 + random() * 0.24).toFixed(6),
            station_id: stations[i % 3],
            created_by: i % 20 === 0 ? officer.id : chief.id,
            drainage_basin: basins[i % 4],
            nearest_waterway: i % 3 ? "Alder Creek (synthetic)" : null,
            nearest_waterway_m: i % 3 ? (random() * 900).toFixed(2) : null,
            within_waterway_buffer: i % 3 ? random() < 0.3 : null,
            ...totalsColumns(computed),
          },
          lines: {
            discharges: [{ apparatusId: null, productId: product.id, percent: null, flow: water / 10, minutes: 10 }],
          },
          computed,
        });
      }
      await insertReportsInBatches(knex, reports);
    }
    return { chiefCookie: chief.cookie, officerCookie: officer.cookie, productIds: products.map((p) => p.id) };
  } finally {
    await knex.destroy();
  }
}

// ---------------------------------------------------------------------------------------------
// HTTP

type Call = { method?: string; path: string; headers?: Record<string, string>; body?: string };
type Answer = {
  status: number;
  firstByteMs: number;
  totalMs: number;
  bytes: number;
  headers: http.IncomingHttpHeaders;
};

function request(call: Call, agent?: http.Agent): Promise<Answer> {
  return new Promise((resolve, reject) => {
    const began = performance.now();
    const headers: Record<string, string> = { ...call.headers };
    if (call.body !== undefined) headers["Content-Length"] = String(Buffer.byteLength(call.body));
    const outgoing = http.request(`${ORIGIN}${call.path}`, { method: call.method ?? "GET", headers, agent }, (res) => {
      const firstByteMs = performance.now() - began;
      let bytes = 0;
      res.on("data", (chunk: Buffer) => (bytes += chunk.length));
      res.on("end", () =>
        resolve({
          status: res.statusCode ?? 0,
          firstByteMs,
          totalMs: performance.now() - began,
          bytes,
          headers: res.headers,
        }),
      );
      res.on("error", reject);
    });
    outgoing.on("error", reject);
    outgoing.end(call.body);
  });
}

type Load = { requestsPerSecond: number; p50: number; p95: number };

/** CONNECTIONS keep-alive connections, each sending `call` again as soon as its answer ends, for SECONDS. */
async function load(call: Call, expectStatus: number): Promise<Load> {
  const agent = new http.Agent({ keepAlive: true, maxSockets: CONNECTIONS });
  const latencies: number[] = [];
  const until = performance.now() + SECONDS * 1000;
  const began = performance.now();
  await Promise.all(
    Array.from({ length: CONNECTIONS }, async () => {
      while (performance.now() < until) {
        const answer = await request(call, agent);
        if (answer.status !== expectStatus) throw new Error(`${call.path}: status ${answer.status}`);
        latencies.push(answer.totalMs);
      }
    }),
  );
  const elapsed = (performance.now() - began) / 1000;
  agent.destroy();
  const sorted = latencies.sort((a, b) => a - b);
  const at = (share: number) => sorted[Math.min(sorted.length - 1, Math.floor(sorted.length * share))];
  return { requestsPerSecond: latencies.length / elapsed, p50: at(0.5), p95: at(0.95) };
}

async function startServer(): Promise<ChildProcess> {
  const buildDirectory = path.resolve(process.env.BUILD_DIR ?? "build");
  if (!existsSync(path.join(buildDirectory, "server/index.js"))) {
    throw new Error(`No build in ${buildDirectory}: run \`npm run build\` first.`);
  }
  const server = spawn(process.execPath, ["scripts/serve.js"], {
    env: { ...process.env, PORT: String(PORT), DB_NAME: BENCH_DB, NODE_ENV: "production", BUILD_DIR: buildDirectory },
    stdio: ["ignore", "pipe", "inherit"],
  });
  await new Promise<void>((resolve, reject) => {
    server.stdout!.on("data", (chunk: Buffer) => {
      if (chunk.toString().includes("serving on")) resolve();
    });
    server.on("exit", (code) => reject(new Error(`the server stopped (exit ${code})`)));
  });
  return server;
}

// ---------------------------------------------------------------------------------------------
// Rows

function figureRow(
  name: string,
  unit: string,
  values: number[],
  baseline: string,
  goal: number,
  atMost: boolean,
): BenchRow {
  const round = (value: number) => Math.round(value * 1000) / 1000;
  const mid = median(values);
  return {
    name,
    unit,
    median: round(mid),
    min: round(Math.min(...values)),
    max: round(Math.max(...values)),
    baseline,
    goal,
    met: atMost ? mid <= goal : mid >= goal,
  };
}

/** Runs `a` and `b` alternately, A then B and B then A, ROUNDS times; returns both series. */
async function alternate<T>(a: () => Promise<T>, b: () => Promise<T>): Promise<{ a: T[]; b: T[] }> {
  const series = { a: [] as T[], b: [] as T[] };
  for (let round = 0; round < ROUNDS; round++) {
    if (round % 2 === 0) {
      series.a.push(await a());
      series.b.push(await b());
    } else {
      series.b.push(await b());
      series.a.push(await a());
    }
  }
  return series;
}

const ms = (value: number) => `${value.toFixed(1)} ms`;

async function main() {
  const machineAtStart = machine();
  const filled = performance.now();
  const { chiefCookie, officerCookie, productIds } = await fill();
  console.log(`filled ${BENCH_DB} with ${EVENTS} events in ${((performance.now() - filled) / 1000).toFixed(1)} s`);
  const { db } = await import("../app/lib/db.server");
  const { bumpDataVersion } = await import("../app/models/data-version.server");
  const { usageSummary } = await import("../app/models/usage-map.server");
  const { parseMapFilters } = await import("../app/lib/geo/map-filters");
  const server = await startServer();
  const rows: BenchRow[] = [];
  const floor: Call = { path: "/api/bench-floor", headers: { Cookie: officerCookie } };
  const floorName = "a bare resource route in the same server (unknown /api/* path: 404 JSON, no query)";
  try {
    // Warm up: modules, pools and kept answers as a running server has them.
    for (const path of [
      `/api/events?size=25`,
      `/api/map/events.geojson?${YEAR}`,
      `/api/summary?${YEAR}`,
      "/map",
      "/events",
    ]) {
      await request({ path, headers: { Cookie: chiefCookie, "Accept-Encoding": "gzip" } });
    }

    // POST /api/totals, three discharges.
    const totals: Call = {
      method: "POST",
      path: "/api/totals",
      headers: { Cookie: officerCookie, "Content-Type": "application/json", Origin: ORIGIN },
      body: JSON.stringify({
        discharges: productIds.map((productId, index) => ({
          flow: 150 + index * 25,
          flowUnit: "gpm",
          basis: "water",
          percent: index === 0 ? 0.5 : 3,
          minutes: 8 + index,
          productId,
        })),
      }),
    };
    const totalsRuns = await alternate(
      () => load(totals, 200),
      () => load(floor, 404),
    );
    report("POST /api/totals", totalsRuns);
    rows.push(
      ratioRow(
        `POST /api/totals (3 discharges), ${CONNECTIONS} connections: time per request vs a bare route`,
        totalsRuns.a.map((run, index) => totalsRuns.b[index].requestsPerSecond / run.requestsPerSecond),
        floorName,
        2,
      ),
      figureRow(
        `POST /api/totals (3 discharges), ${CONNECTIONS} connections: p95 latency`,
        "ms",
        totalsRuns.a.map((run) => run.p95),
        "none (an absolute goal)",
        25,
        true,
      ),
    );

    // GET /api/events?size=25.
    const events: Call = { path: "/api/events?size=25", headers: { Cookie: chiefCookie } };
    const eventsRuns = await alternate(
      () => load(events, 200),
      () => load(floor, 404),
    );
    report("GET /api/events?size=25", eventsRuns);
    rows.push(
      figureRow(
        `GET /api/events?size=25, ${EVENTS} events, ${CONNECTIONS} connections: requests per second`,
        "requests/s",
        eventsRuns.a.map((run) => run.requestsPerSecond),
        floorName,
        1000,
        false,
      ),
      figureRow(
        `GET /api/events?size=25, ${EVENTS} events, ${CONNECTIONS} connections: p95 latency`,
        "ms",
        eventsRuns.a.map((run) => run.p95),
        "none (an absolute goal)",
        60,
        true,
      ),
      ratioRow(
        `GET /api/events?size=25, ${EVENTS} events, ${CONNECTIONS} connections: time per request vs a bare route`,
        eventsRuns.a.map((run, index) => eventsRuns.b[index].requestsPerSecond / run.requestsPerSecond),
        floorName,
        2,
      ),
    );

    // The map's events right after a report changed (one event's water, as a correction would;
    // the body for the new version is not kept yet), against SELECT + JSON.stringify.
    const eventIds = (await db("events").pluck("id")) as number[];
    let changes = 0;
    const changeOneReport = () =>
      db.transaction(async (trx) => {
        const id = eventIds[(changes++ * 7919) % eventIds.length];
        await trx("events").where({ id }).increment({ water_gal: 1, solution_gal: 1 });
        await bumpDataVersion(trx, "reports");
      });
    const geojson: Call = {
      path: `/api/map/events.geojson?${YEAR}`,
      headers: { Cookie: chiefCookie, "Accept-Encoding": "gzip" },
    };
    let gzippedBytes = 0;
    const mapRuns = await alternate(
      async () => {
        await changeOneReport();
        const answer = await request(geojson);
        if (answer.status !== 200) throw new Error(`geojson: status ${answer.status}`);
        gzippedBytes = answer.bytes;
        return answer.totalMs;
      },
      async () => {
        const began = performance.now();
        const selected = await db("events as e")
          .leftJoin("stations as s", "s.id", "e.station_id")
          .whereIn("e.status", ["filed", "returned", "accepted"])
          .whereNotNull("e.latitude")
          .where("e.started_at", ">=", new Date("2030-01-01T06:00:00Z"))
          .where("e.started_at", "<", new Date("2031-01-01T06:00:00Z"))
          .select(
            "e.id",
            "e.number",
            "e.kind",
            "e.status",
            "e.started_at",
            "e.address",
            "e.latitude",
            "e.longitude",
            "e.water_gal",
            "e.concentrate_gal",
            "e.solution_gal",
            "e.pfas_containing",
            "e.drainage_basin",
            "e.nearest_waterway",
            "e.nearest_waterway_m",
            "e.within_waterway_buffer",
            "s.code as station_code",
          );
        JSON.stringify(selected);
        return performance.now() - began;
      },
    );
    const kept: number[] = [];
    for (let round = 0; round < ROUNDS; round++) kept.push((await request(geojson)).totalMs);
    const warm = await request(geojson);
    const revalidated = await request({
      ...geojson,
      headers: { ...geojson.headers, "If-None-Match": String(warm.headers.etag) },
    });
    console.log(
      `events.geojson: app after a change ${mapRuns.a.map(ms).join(", ")}; baseline ${mapRuns.b.map(ms).join(", ")}; ` +
        `${(gzippedBytes / 1e6).toFixed(2)} MB gzipped; kept ${ms(warm.totalMs)}; with its ETag ${revalidated.status} in ${ms(revalidated.totalMs)}`,
    );
    rows.push(
      ratioRow(
        `GET /api/map/events.geojson, ${EVENTS} events, gzip, first request after a change`,
        mapRuns.a.map((time, index) => time / mapRuns.b[index]),
        "the same events' SELECT + JSON.stringify in the benchmark's process (no HTTP, no gzip)",
        1.2,
      ),
      ratioRow(
        `GET /api/map/events.geojson, ${EVENTS} events, gzip, repeat request (kept for the data version)`,
        kept.map((time) => time / median(mapRuns.b)),
        "the median of the same SELECT + JSON.stringify runs above",
        1.2,
      ),
      figureRow(
        `GET /api/map/events.geojson, ${EVENTS} events: gzipped body`,
        "MB",
        [gzippedBytes / 1e6],
        "none (an absolute goal)",
        0.5,
        true,
      ),
    );

    // /api/summary for a year, right after a change, against its own SQL statements run in-process.
    const filters = parseMapFilters(new URLSearchParams(YEAR), "America/Chicago");
    if (!filters.ok) throw new Error(filters.message);
    const summaryRuns = await alternate(
      async () => {
        await bumpDataVersion(db, "reports");
        const answer = await request({ path: `/api/summary?${YEAR}`, headers: { Cookie: chiefCookie } });
        if (answer.status !== 200) throw new Error(`summary: status ${answer.status}`);
        return answer.totalMs;
      },
      async () => {
        const began = performance.now();
        await usageSummary(filters.filters, "America/Chicago");
        return performance.now() - began;
      },
    );
    console.log(
      `summary: app ${summaryRuns.a.map(ms).join(", ")}; its SQL in-process ${summaryRuns.b.map(ms).join(", ")}`,
    );
    rows.push(
      ratioRow(
        `GET /api/summary, one year, ${EVENTS} events, first request after a change`,
        summaryRuns.a.map((time, index) => time / summaryRuns.b[index]),
        "the summary's SQL statements run in the benchmark's process (usageSummary: no HTTP, no sign-in)",
        1.1,
      ),
    );

    // /map's time to first byte (its summary kept), against /events.
    const pageRuns = await alternate(
      async () => (await request({ path: "/map", headers: { Cookie: chiefCookie } })).firstByteMs,
      async () => (await request({ path: "/events", headers: { Cookie: chiefCookie } })).firstByteMs,
    );
    console.log(`/map first byte ${pageRuns.a.map(ms).join(", ")}; /events ${pageRuns.b.map(ms).join(", ")}`);
    rows.push(
      figureRow(
        `/map time to first byte, ${EVENTS} events (summary kept)`,
        "ms",
        pageRuns.a,
        "/events time to first byte, measured alternately",
        60,
        true,
      ),
    );
  } finally {
    server.kill("SIGTERM");
    await db.destroy();
  }
  for (const row of rows) {
    console.log(
      `${row.met ? "met " : "not "} ${row.name}: ${row.median} ${row.unit} (${row.min}–${row.max}), goal ${row.goal}`,
    );
  }
  writeResults(rows, machineAtStart);
}

function report(label: string, runs: { a: Load[]; b: Load[] }) {
  for (let index = 0; index < runs.a.length; index++) {
    const a = runs.a[index];
    const b = runs.b[index];
    console.log(
      `${label} round ${index + 1}: ${a.requestsPerSecond.toFixed(0)} req/s, p50 ${ms(a.p50)}, p95 ${ms(a.p95)}; ` +
        `bare route ${b.requestsPerSecond.toFixed(0)} req/s, p95 ${ms(b.p95)}`,
    );
  }
}

await main();
