// Benchmark of the usage-report form's own work as the number of lines grows: reading and bounding
// the body with conform + zod, then whole requests through the built app's request handler (as the
// production server runs it, without the network): filing a report (computation, rows, geography,
// audit in one transaction), saving a draft and opening its edit page (loader and server render).
// Uses a throwaway database (foamtally_bench_form) and the build in BUILD_DIR (`npm run build`).
// Not a test.
//   npm run bench -- report-form          (or: node --import tsx scripts/bench-report-form.ts)
import { randomUUID } from "node:crypto";
import { existsSync } from "node:fs";
import path from "node:path";
import { performance } from "node:perf_hooks";

if (existsSync(".env")) process.loadEnvFile(".env");
const { benchDatabaseName, dropBenchDatabase, freshBenchDatabase } = await import("./throwaway-database");
const BENCH_DB = benchDatabaseName("foamtally_bench_form");
process.env.DB_NAME = BENCH_DB;
process.env.NODE_ENV = "production";
const SIZES = (process.env.BENCH_FORM_LINES ?? "50,100,200").split(",").map(Number);
const RUNS = 5;

function median(values: number[]) {
  const sorted = [...values].sort((a, b) => a - b);
  return sorted[Math.floor(sorted.length / 2)];
}

async function main() {
  const knex = await freshBenchDatabase(BENCH_DB, { name: "Benchmark district (synthetic)" });
  await knex.destroy();
  const buildDirectory = path.resolve(process.env.BUILD_DIR ?? "build");
  if (!existsSync(path.join(buildDirectory, "server/index.js"))) {
    throw new Error(`No build in ${buildDirectory}: run \`npm run build\` first.`);
  }
  const build = await import(path.join(buildDirectory, "server/index.js"));
  const { createRequestHandler } = await import("react-router");
  const handle = createRequestHandler(build, "production");
  const { parseWithZod } = await import("@conform-to/zod/v4");
  const { db } = await import("../app/lib/db.server");
  const { createUser } = await import("../app/models/user.server");
  const { FiledReportSchema, REPORT_FORM_SCHEMAS } = await import("../app/lib/foam/report-schema");
  const { formShape, readBoundedForm } = await import("../app/lib/form-data.server");

  const [stationId] = await db("stations").insert({ code: "B1", name: "Bench station" });
  const [apparatusId] = await db("apparatus").insert({ unit_id: "BE1", station_id: stationId });
  const [productId] = await db("foam_products").insert({
    name: "Bench Class A (synthetic)",
    foam_class: "A",
    foam_type: "class-a",
    nominal_percents: "0.5",
  });
  const password = "bench-password-0123";
  await createUser({ email: "bench@bench.example", name: "Bench officer", password, roles: ["officer"] }, null);

  const origin = "http://127.0.0.1:3000";
  const signedIn = await handle(
    new Request(`${origin}/sign-in`, {
      method: "POST",
      body: new URLSearchParams({ email: "bench@bench.example", password }),
      headers: { "Content-Type": "application/x-www-form-urlencoded", Origin: origin },
    }),
  );
  if (signedIn.status !== 302) throw new Error(`sign-in answered ${signedIn.status}`);
  const cookie = signedIn.headers.get("Set-Cookie")!.split(";")[0];

  const body = (lines: number, intent: "file" | "save-draft") => {
    const form = new URLSearchParams({
      intent,
      submissionKey: randomUUID(),
      number: `BENCH-${randomUUID().slice(0, 8)}`,
      kind: "training",
      startedAt: "2030-03-01T09:00",
      address: "1 Bench Road (synthetic)",
      latitude: "38.7",
      longitude: "-98.2",
      stationId: String(stationId),
      narrative: "Synthetic benchmark report.",
      "dispositions[0].disposition": "evaporated_unknown",
      "dispositions[0].sharePercent": "100",
    });
    for (let index = 0; index < lines; index++) {
      const line = `discharges[${index}]`;
      form.append(`${line}.apparatusId`, String(apparatusId));
      form.append(`${line}.outlet`, `Line ${index + 1}`);
      form.append(`${line}.productId`, String(productId));
      form.append(`${line}.percent`, "0.5");
      form.append(`${line}.flow`, String(95 + (index % 10)));
      form.append(`${line}.flowUnit`, "gpm");
      form.append(`${line}.basis`, "water");
      form.append(`${line}.minutes`, String(3 + (index % 7)));
      form.append(`${line}.method`, "non_aspirated");
    }
    return form.toString();
  };
  const post = (text: string) =>
    new Request(`${origin}/events/new`, {
      method: "POST",
      body: text,
      headers: { "Content-Type": "application/x-www-form-urlencoded", Origin: origin, Cookie: cookie },
    });

  const shape = formShape(REPORT_FORM_SCHEMAS);
  const rows: string[] = [];
  for (const lines of SIZES) {
    const text = body(lines, "file");
    const parseTimes: number[] = [];
    const fileTimes: number[] = [];
    const draftTimes: number[] = [];
    const editTimes: number[] = [];
    let renderedBytes = 0;
    for (let run = 0; run < RUNS; run++) {
      let started = performance.now();
      const form = await readBoundedForm(post(text), shape);
      const submission = parseWithZod(form, { schema: FiledReportSchema });
      if (submission.status !== "success") throw new Error(`the ${lines}-line report does not validate`);
      parseTimes.push(performance.now() - started);

      const filing = post(body(lines, "file"));
      started = performance.now();
      const filed = await handle(filing);
      await filed.text();
      fileTimes.push(performance.now() - started);
      if (filed.status !== 302) throw new Error(`filing answered ${filed.status}`);

      const drafting = post(body(lines, "save-draft"));
      started = performance.now();
      const drafted = await handle(drafting);
      await drafted.text();
      draftTimes.push(performance.now() - started);
      const editPath = drafted.headers.get("Location");
      if (drafted.status !== 302 || !editPath) throw new Error(`saving a draft answered ${drafted.status}`);

      started = performance.now();
      const edit = await handle(new Request(`${origin}${editPath}`, { headers: { Cookie: cookie } }));
      renderedBytes = (await edit.text()).length;
      editTimes.push(performance.now() - started);
      if (edit.status !== 200) throw new Error(`the edit page answered ${edit.status}`);
    }
    const ms = (values: number[]) => `${median(values).toFixed(0)} ms`;
    rows.push(
      `| ${lines} | ${ms(parseTimes)} | ${ms(fileTimes)} | ${ms(draftTimes)} | ${ms(editTimes)} | ${(renderedBytes / 1024).toFixed(0)} kB |`,
    );
  }
  console.log(`Median of ${RUNS} runs each:\n`);
  console.log("| lines | read + validate | file the report | save a draft | open the draft's edit page | page HTML |");
  console.log("| ---: | ---: | ---: | ---: | ---: | ---: |");
  for (const row of rows) console.log(row);
  await db.destroy();
  await dropBenchDatabase(BENCH_DB);
}

await main();
process.exit(0);
