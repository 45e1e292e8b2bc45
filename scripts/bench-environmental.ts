// Benchmark of the quarterly environmental workbook (and the zipped CSV): fills a throwaway database
// with one quarter of 50,000 discharges and one of 10,000, then builds each export in a fresh child
// process and reports wall time and the process's peak resident memory. Not a test: figures vary.
//   npm run bench -- environmental          (or: node --import tsx scripts/bench-environmental.ts)
import { spawnSync } from "node:child_process";
import { existsSync, mkdtempSync, rmSync } from "node:fs";
import os from "node:os";
import path from "node:path";

if (existsSync(".env")) process.loadEnvFile(".env");
const { benchDatabaseName, dropBenchDatabase, freshBenchDatabase } = await import("./throwaway-database");
const BENCH_DB = benchDatabaseName("foamtally_bench_env");

const SIZES = [
  { discharges: 50_000, year: 2030, quarter: 1 },
  { discharges: 10_000, year: 2030, quarter: 2 },
];
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

/** Runs in the child: builds one export and prints its figures as JSON. */
async function measure(format: "xlsx" | "zip", year: number, quarter: number) {
  const { parseReportPeriod } = await import("../app/lib/reporting/period");
  const { writeEnvironmentalWorkbook } = await import("../app/exports/environmental-workbook.server");
  const { writeEnvironmentalCsvZip } = await import("../app/exports/environmental-csv.server");
  const { db } = await import("../app/lib/db.server");
  const parsed = parseReportPeriod(new URLSearchParams(`year=${year}&quarter=${quarter}`), "America/Chicago");
  if (!parsed.ok) throw new Error(parsed.message);
  const directory = mkdtempSync(path.join(os.tmpdir(), "foamtally-bench-"));
  let peakHeap = 0;
  const sampler = setInterval(() => (peakHeap = Math.max(peakHeap, process.memoryUsage().heapUsed)), 20);
  const started = performance.now();
  const request = { period: parsed.period, generatedBy: { name: "Bench", email: "bench@bench.example" } };
  const target = path.join(directory, `bench.${format}`);
  const written =
    format === "xlsx"
      ? await writeEnvironmentalWorkbook(request, target)
      : await writeEnvironmentalCsvZip(request, target);
  const seconds = (performance.now() - started) / 1000;
  clearInterval(sampler);
  await db.destroy();
  rmSync(directory, { recursive: true, force: true });
  console.log(
    JSON.stringify({
      seconds,
      peakRssMb: process.resourceUsage().maxRSS / 1024,
      peakHeapMb: peakHeap / 1024 / 1024,
      bytes: written.byteSize,
    }),
  );
}

if (process.argv[2] === "--measure") {
  await measure(process.argv[3] as "xlsx" | "zip", Number(process.argv[4]), Number(process.argv[5]));
} else {
  console.log(`Machine: ${os.cpus().length} cores (${os.cpus()[0]?.model ?? "unknown"}), Node ${process.version}`);
  const filling = performance.now();
  await fill();
  console.log(`Filled ${BENCH_DB} in ${((performance.now() - filling) / 1000).toFixed(1)} s`);
  console.log("| discharges in the quarter | export | time | peak RSS | peak JS heap | file size |");
  console.log("| ---: | --- | ---: | ---: | ---: | ---: |");
  for (const format of ["xlsx", "zip"] as const) {
    for (const size of SIZES) {
      const run = spawnSync(
        process.execPath,
        [
          "--import",
          "tsx",
          "scripts/bench-environmental.ts",
          "--measure",
          format,
          String(size.year),
          String(size.quarter),
        ],
        { env: { ...process.env, DB_NAME: BENCH_DB }, encoding: "utf8" },
      );
      if (run.status !== 0) throw new Error(run.stderr);
      const figures = JSON.parse(run.stdout.trim().split("\n").pop() ?? "{}");
      // Accepted reports only: every tenth synthetic event is filed, not accepted, and is left out.
      console.log(
        `| ${size.discharges.toLocaleString("en-US")} (${((size.discharges * 9) / 10).toLocaleString("en-US")} counted) | ${format === "xlsx" ? "XLSX" : "CSV zip"} | ${figures.seconds.toFixed(1)} s | ${figures.peakRssMb.toFixed(0)} MB | ${figures.peakHeapMb.toFixed(0)} MB | ${(figures.bytes / 1024 / 1024).toFixed(1)} MB |`,
      );
    }
  }
  if (process.env.BENCH_KEEP_DB !== "true") await dropBenchDatabase(BENCH_DB);
}
