// A usage line on a foam system out of tolerance carries its warning into the quarter's workbook.
import { mkdtempSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { randomUUID } from "node:crypto";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import * as XLSX from "xlsx";
import { db } from "~/lib/db.server";
import { parseReportPeriod } from "~/lib/reporting/period";
import { writeEnvironmentalWorkbook } from "~/exports/environmental-workbook.server";
import { insertEvent, loadCatalogueFacts } from "~/models/usage-builders.server";
import { makeApparatusRow } from "../support/catalogue-factories";
import { makeUser } from "../support/factories";
import { ensureAgency, makeProduct, makeStation } from "../support/usage-fixtures";

let dir: string;
let number: string;

beforeAll(async () => {
  dir = mkdtempSync(path.join(tmpdir(), "foamtally-systems-workbook-"));
  await ensureAgency();
  const officer = await makeUser(["officer"], "Workbook Systems Officer");
  const station = await makeStation();
  const product = await makeProduct({ foamClass: "B" });
  const apparatus = await makeApparatusRow({ stationId: station.id });
  const [systemId] = await db("foam_systems").insert({
    apparatus_id: apparatus.id,
    name: "Workbook system",
    status: "out_of_tolerance",
  });
  await db("foam_accuracy_tests").insert({
    foam_system_id: systemId,
    tested_at: new Date("2025-01-10T15:00:00Z"),
    tested_by: officer.id,
    method: "flow",
    foam_class: "B",
    rated_percent: 3,
    readings_json: "{}",
    achieved_percent: 4.2,
    band_low: 3,
    band_high: 3.9,
    pass: false,
  });
  number = `WB-${randomUUID().slice(0, 8)}`;
  await insertEvent(
    db,
    {
      number,
      kind: "incident",
      status: "accepted",
      startedAt: new Date("2025-02-03T18:00:00Z"),
      clearedAt: new Date("2025-02-03T19:00:00Z"),
      stationId: station.id,
      createdBy: officer.id,
      discharges: [
        { apparatusId: apparatus.id, productId: product.id, percent: 3, flow: 95, basis: "solution", minutes: 5 },
      ],
      dispositions: [{ disposition: "contained", sharePercent: 100 }],
    },
    await loadCatalogueFacts(db),
  );
});

afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe("the quarterly workbook", () => {
  it("lists a line flowed on a system out of tolerance, with the warning", async () => {
    const parsed = parseReportPeriod(new URLSearchParams("year=2025&quarter=1"), "America/Chicago");
    if (!parsed.ok) throw new Error(parsed.message);
    const file = path.join(dir, "q1.xlsx");
    await writeEnvironmentalWorkbook(
      { period: parsed.period, generatedBy: { name: "Tester", email: "t@test.example" } },
      file,
    );
    const book = XLSX.read(readFileSync(file));
    const rows = XLSX.utils.sheet_to_json<Record<string, unknown>>(book.Sheets.Discharges);
    const mine = rows.filter((row) => Object.values(row).includes(number));
    expect(mine).toHaveLength(1);
    expect(String(mine[0].Warnings)).toMatch(/Workbook system was out of tolerance/);
  });
});
