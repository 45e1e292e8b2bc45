// Benchmark of the quarterly environmental workbook: fills a throwaway database with one quarter of
// BENCH_DISCHARGES discharges (default 8,000; the size is 50,000), then builds the app's
// workbook and its baseline alternately, each in a fresh child process, BENCH_ROUNDS times (default
// 5). The baseline reads the same rows with the same SELECTs and writes the same columns with
// ExcelJS's streaming writer and nothing else (no Summary, no styles). Prints each pair's ratio and
// writes the median with min–max to bench/results.json. Not a test: figures vary with the machine.
//   npm run bench -- environmental          (or: node --import tsx scripts/bench-environmental.ts)
import { spawnSync } from "node:child_process";
import { existsSync, mkdtempSync, rmSync, statSync } from "node:fs";
import os from "node:os";
import path from "node:path";

if (existsSync(".env")) process.loadEnvFile(".env");
const { benchDatabaseName, dropBenchDatabase, freshBenchDatabase } = await import("./throwaway-database");
const BENCH_DB = benchDatabaseName("foamtally_bench_env");
type Tables = typeof import("../app/exports/environmental-tables.server");
type Column<Row> = import("../app/exports/environmental-tables.server").Column<Row>;
type DetailTable<Row> = import("../app/exports/environmental-tables.server").DetailTable<Row>;

const SIZES = [{ discharges: Number(process.env.BENCH_DISCHARGES ?? 8_000), year: 2030, quarter: 1 }];
const ROUNDS = Math.max(5, Number(process.env.BENCH_ROUNDS ?? 5));
const DISCHARGES_PER_EVENT = 4;

async function fill() {
  const { EVENT_KINDS, DISPOSITIONS } = await import("../app/lib/foam/vocabulary");
  const { insertReportsInBatches, statedResults, totalsColumns } = await import("../app/models/report-rows.server");
  const knex = await freshBenchDatabase(BENCH_DB, {
    name: "Benchmark district (synthetic)",
    time_zone: "America/Chicago",
  });
  const [userId] = await knex("users").insert({
    email: "bench@bench.example",
    name: "Bench (synthetic)",
    password_hash: "x",
  });
  const [stationId] = await knex("stations").insert({ code: "B1", name: "Bench station" });
  const apparatus: number[] = [];
  for (const unit of ["BE1", "BE2", "BE3"]) {
    const [id] = await knex("apparatus").insert({ unit_id: unit, station_id: stationId });
    apparatus.push(id);
  }
  const products: { id: number; percent: number; pfas: boolean }[] = [];
  for (const [name, foamClass, percent, pfas] of [
    ["Bench Class A (synthetic)", "A", 0.3, false],
    ["Bench fluorine-free B (synthetic)", "B", 3, false],
    ["Bench legacy AR-AFFF (synthetic)", "B", 3, true],
  ] as const) {
    const [id] = await knex("foam_products").insert({
      name,
      foam_class: foamClass,
      foam_type: pfas ? "ar-afff" : foamClass === "A" ? "class-a" : "f3",
      pfas_containing: pfas,
      pfas_content: pfas ? 10 : null,
      pfas_content_unit: pfas ? "g_per_l" : null,
      pfas_content_source: pfas ? "synthetic benchmark figure" : null,
    });
    products.push({ id, percent, pfas });
  }
  const kinds = ["incident", ...EVENT_KINDS];
  let eventNumber = 0;
  for (const size of SIZES) {
    const start = Date.UTC(size.year, (size.quarter - 1) * 3, 2);
    const span = 85 * 86_400_000;
    const events = size.discharges / DISCHARGES_PER_EVENT;
    for (let batch = 0; batch < events; batch += 500) {
      const reports = [];
      for (let i = batch; i < Math.min(events, batch + 500); i++) {
        eventNumber++;
        const index = i - batch;
        const discharges = [];
        for (let position = 1; position <= DISCHARGES_PER_EVENT; position++) {
          const product = products[(index + position) % products.length];
          const minutes = 5 + ((index * 7 + position) % 20);
          const water = 95 * minutes;
          discharges.push({
            line: {
              apparatusId: apparatus[position % apparatus.length],
              outlet: `Line ${position}`,
              productId: product.id,
              percent: product.percent,
              flow: 95,
              minutes,
            },
            stated: { water, concentrate: (water * product.percent) / 100, effectivePercent: product.percent },
            pfas: product.pfas,
          });
        }
        const computed = statedResults(
          discharges.map((discharge) => discharge.stated),
          discharges.some((discharge) => discharge.pfas),
        );
        reports.push({
          event: {
            number: `BENCH-${String(eventNumber).padStart(7, "0")}`,
            kind: kinds[i % kinds.length],
            status: i % 10 === 9 ? "filed" : "accepted",
            started_at: new Date(start + Math.floor((i / events) * span)),
            address: `${i} Bench Road`,
            latitude: 38.7,
            longitude: -98.2,
            station_id: stationId,
            created_by: userId,
            drainage_basin: `Basin ${i % 7}`,
            nearest_waterway: `Creek ${i % 5}`,
            nearest_waterway_m: 100 + (i % 900),
            ...totalsColumns(computed),
          },
          lines: {
            discharges: discharges.map((discharge) => discharge.line),
            dispositions: [
              { disposition: DISPOSITIONS[index % DISPOSITIONS.length], sharePercent: 70 },
              { disposition: "contained" as const, sharePercent: 30, disposalReference: "synthetic" },
            ],
          },
          computed,
        });
      }
      await insertReportsInBatches(knex, reports);
    }
  }
  await knex.destroy();
}

/** The baseline: the same detail SELECTs, the same cell values, ExcelJS's streaming writer alone. */
async function writeBaseline(period: import("../app/lib/reporting/period").ReportPeriod, target: string) {
  const ExcelJS = (await import("exceljs")).default;
  const tables: Tables = await import("../app/exports/environmental-tables.server");
  const { periodFacts } = await import("../app/models/environmental-report.server");
  const { db } = await import("../app/lib/db.server");
  await db.transaction(
    async (trx) => {
      const { wall, agency, pfas } = await periodFacts(period, trx);
      const workbook = new ExcelJS.stream.xlsx.WorkbookWriter({ filename: target, useStyles: false });
      const write = async <Row>(sheetName: string, columns: Column<Row>[], rows: AsyncIterable<Row> | Row[]) => {
        const sheet = workbook.addWorksheet(sheetName);
        sheet.columns = columns.map((column) => ({ key: column.key, width: column.width }));
        sheet.addRow(columns.map((column) => column.header)).commit();
        for await (const row of rows) sheet.addRow(columns.map((column) => column.value(row))).commit();
        sheet.commit();
      };
      for (const table of [
        tables.eventTable(wall),
        tables.dischargeTable,
        tables.releaseTable(wall),
        tables.nonIncidentTable(wall),
      ] as DetailTable<unknown>[]) {
        await write(table.sheet, table.columns, table.rows(period, trx));
      }
      await write("PFAS", tables.pfasColumns(wall, agency.pfasReportableLb), pfas);
      await workbook.commit();
    },
    { readOnly: true },
  );
}

/** Runs in the child: builds one export and prints its figures as JSON. */
async function measure(format: "xlsx" | "baseline" | "zip", year: number, quarter: number) {
  const { parseReportPeriod } = await import("../app/lib/reporting/period");
  const { writeEnvironmentalWorkbook } = await import("../app/exports/environmental-workbook.server");
  const { writeEnvironmentalCsvZip } = await import("../app/exports/environmental-csv.server");
  const { db } = await import("../app/lib/db.server");
  const parsed = parseReportPeriod(new URLSearchParams(`year=${year}&quarter=${quarter}`), "America/Chicago");
  if (!parsed.ok) throw new Error(parsed.message);
  const directory = mkdtempSync(path.join(os.tmpdir(), "foamtally-bench-"));
  // Modules loaded and the pool open before the clock starts, for the app and the baseline alike.
  await db.raw("SELECT 1");
  const idleRssMb = process.memoryUsage().rss / 1024 / 1024;
  let peakHeap = 0;
  const sampler = setInterval(() => (peakHeap = Math.max(peakHeap, process.memoryUsage().heapUsed)), 20);
  const started = performance.now();
  const request = { period: parsed.period, generatedBy: { name: "Bench", email: "bench@bench.example" } };
  const target = path.join(directory, `bench.${format === "zip" ? "zip" : "xlsx"}`);
  if (format === "xlsx") await writeEnvironmentalWorkbook(request, target);
  else if (format === "zip") await writeEnvironmentalCsvZip(request, target);
  else await writeBaseline(parsed.period, target);
  const seconds = (performance.now() - started) / 1000;
  clearInterval(sampler);
  const bytes = statSync(target).size;
  await db.destroy();
  rmSync(directory, { recursive: true, force: true });
  console.log(
    JSON.stringify({
      seconds,
      peakRssMb: process.resourceUsage().maxRSS / 1024,
      idleRssMb,
      peakHeapMb: peakHeap / 1024 / 1024,
      bytes,
    }),
  );
}

type Figures = { seconds: number; peakRssMb: number; idleRssMb: number; peakHeapMb: number; bytes: number };

function runOnce(format: "xlsx" | "baseline" | "zip", size: (typeof SIZES)[number]): Figures {
  const run = spawnSync(
    process.execPath,
    ["--import", "tsx", "scripts/bench-environmental.ts", "--measure", format, String(size.year), String(size.quarter)],
    { env: { ...process.env, DB_NAME: BENCH_DB }, encoding: "utf8" },
  );
  if (run.status !== 0) throw new Error(run.stderr);
  return JSON.parse(run.stdout.trim().split("\n").pop() ?? "{}") as Figures;
}

if (process.argv[2] === "--measure") {
  await measure(process.argv[3] as "xlsx" | "baseline" | "zip", Number(process.argv[4]), Number(process.argv[5]));
} else {
  const { machine, ratioRow, writeResults } = await import("./benchmark-results");
  const machineAtStart = machine();
  console.log(`Machine: ${machineAtStart}`);
  const filling = performance.now();
  await fill();
  console.log(`Filled ${BENCH_DB} in ${((performance.now() - filling) / 1000).toFixed(1)} s`);
  const size = SIZES[0];
  const fmt = (figures: Figures) =>
    `${figures.seconds.toFixed(2)} s, ${(figures.peakRssMb - figures.idleRssMb).toFixed(0)} MB RSS over idle, ${(figures.bytes / 1024 / 1024).toFixed(1)} MB`;
  console.log(`| round | app XLSX | baseline | time ratio | RSS-over-idle ratio |`);
  console.log(`| ---: | --- | --- | ---: | ---: |`);
  const timeRatios: number[] = [];
  const memoryRatios: number[] = [];
  for (let round = 1; round <= ROUNDS; round++) {
    // A then B in odd rounds, B then A in even ones, so that a drift in the machine's load is shared.
    const [app, baseline] =
      round % 2
        ? [runOnce("xlsx", size), runOnce("baseline", size)]
        : [runOnce("baseline", size), runOnce("xlsx", size)].reverse();
    timeRatios.push(app.seconds / baseline.seconds);
    memoryRatios.push((app.peakRssMb - app.idleRssMb) / Math.max(1, baseline.peakRssMb - baseline.idleRssMb));
    console.log(
      `| ${round} | ${fmt(app)} | ${fmt(baseline)} | ${timeRatios.at(-1)!.toFixed(2)}× | ${memoryRatios.at(-1)!.toFixed(2)}× |`,
    );
  }
  // The zipped CSV export once, for context only: it has no baseline and no goal.
  console.log(`CSV zip, once: ${fmt(runOnce("zip", size))}`);
  const counted = ((size.discharges * 9) / 10).toLocaleString("en-US");
  const rows = [
    ratioRow(
      `quarterly XLSX time, ${size.discharges.toLocaleString("en-US")} discharges (${counted} counted)`,
      timeRatios,
      "same SELECTs and cell values → ExcelJS streaming writer, no styles, no Summary",
      1.5,
    ),
    ratioRow(
      `quarterly XLSX peak RSS over idle, ${size.discharges.toLocaleString("en-US")} discharges`,
      memoryRatios,
      "the same baseline script",
      1.3,
    ),
  ];
  for (const row of rows) {
    console.log(
      `${row.name}: median ${row.median}× (${row.min}–${row.max}×), goal ≤ ${row.goal}× — ${row.met ? "met" : "not met"}`,
    );
  }
  writeResults(rows, machineAtStart);
  if (process.env.BENCH_KEEP_DB !== "true") await dropBenchDatabase(BENCH_DB);
}
