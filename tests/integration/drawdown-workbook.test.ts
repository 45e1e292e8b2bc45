// A tank drawdown larger than the computed concentrate: the report shows both figures, and the
// quarterly workbook's PFAS sheet counts the larger, marked as the conservative figure.
import { mkdtempSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import * as XLSX from "xlsx";
import { writeEnvironmentalWorkbook } from "~/exports/environmental-workbook.server";
import { db } from "~/lib/db.server";
import { GRAMS_PER_POUND, LITRES_PER_US_GALLON } from "~/lib/foam/units";
import { CONCENTRATE_FIGURE_LABELS } from "~/lib/foam/vocabulary";
import { parseReportPeriod } from "~/lib/reporting/period";
import { getReport } from "~/models/event-read.server";
import { makeUser } from "../support/factories";
import { ensureAgency, makeApparatus, makeEvent, makeProduct, makeStation } from "../support/usage-fixtures";

let dir: string;
let raisedNumber: string;
let raisedId: number;
let keptNumber: string;

// 2041 Q2 in Chicago; a test year of its own, clear of other tests' rows.
const startedAt = new Date("2041-05-05T15:00:00Z");

beforeAll(async () => {
  dir = mkdtempSync(path.join(tmpdir(), "foamtally-drawdown-"));
  await ensureAgency(db, { pfas_reportable_lb: 1 });
  const officer = await makeUser(["officer"], "Drawdown Officer");
  const station = await makeStation();
  const engine = await makeApparatus(station.id);
  // Test figures: 10 g/L, all of it PFOS, so the mass follows from the concentrate alone.
  const legacy = await makeProduct({
    foamClass: "B",
    foamType: "ar-afff",
    pfasContaining: true,
    pfasContent: 10,
    pfasContentUnit: "g_per_l",
    pfoaContent: 0,
    pfoaContentUnit: "g_per_l",
    pfosContent: 10,
    pfosContentUnit: "g_per_l",
  });
  // 20 gal computed; the engine's tank took a 30 gal refill afterwards.
  const raised = await makeEvent({
    createdBy: officer.id,
    startedAt,
    stationId: station.id,
    discharges: [{ productId: legacy.id, apparatusId: engine.id, percent: 3, water: 647, concentrate: 20 }],
    dispositions: [{ disposition: "soil", sharePercent: 100 }],
    tankReadings: [{ apparatusId: engine.id, productId: legacy.id, refillGal: 30 }],
    pfasContaining: true,
  });
  raisedNumber = raised.number;
  raisedId = raised.id;
  // 20 gal computed; the tank levels say 18 gal left it: the computed figure stays.
  keptNumber = (
    await makeEvent({
      createdBy: officer.id,
      startedAt: new Date(startedAt.getTime() + 3 * 86_400_000),
      discharges: [{ productId: legacy.id, apparatusId: engine.id, percent: 3, water: 647, concentrate: 20 }],
      dispositions: [{ disposition: "soil", sharePercent: 100 }],
      tankReadings: [{ apparatusId: engine.id, productId: legacy.id, levelBeforeGal: 40, levelAfterGal: 22 }],
      pfasContaining: true,
    })
  ).number;
});

afterAll(() => {
  rmSync(dir, { recursive: true, force: true });
});

async function workbook() {
  const parsed = parseReportPeriod(new URLSearchParams("year=2041&quarter=2"), "America/Chicago");
  if (!parsed.ok) throw new Error(parsed.message);
  const file = path.join(dir, "q2.xlsx");
  await writeEnvironmentalWorkbook(
    { period: parsed.period, generatedBy: { name: "Drawdown Tester", email: "tester@test.example" } },
    file,
  );
  return XLSX.read(readFileSync(file));
}

describe("tank drawdown larger than computed concentrate", () => {
  it("shows both figures on the report", async () => {
    const report = await getReport(raisedId);
    expect(report?.drawdowns).toEqual([
      expect.objectContaining({ computedGal: 20, drawdownGal: 30, drawdownExceeds: true, pfasContaining: true }),
    ]);
  });

  it("counts the larger figure for PFAS in the workbook and marks it as the conservative one", async () => {
    const rows = XLSX.utils.sheet_to_json<Record<string, unknown>>((await workbook()).Sheets.PFAS);
    const raised = rows.find((row) => row["Event number"] === raisedNumber)!;
    expect(raised["Computed concentrate (US gal)"]).toBe(20);
    expect(raised["Tank drawdown (US gal)"]).toBe(30);
    expect(raised["Concentrate counted for PFAS (US gal)"]).toBe(30);
    expect(raised["Concentrate counted for PFAS (L)"]).toBeCloseTo(30 * LITRES_PER_US_GALLON, 9);
    expect(raised["Concentrate figure"]).toBe(CONCENTRATE_FIGURE_LABELS["tank-drawdown"]);
    expect(String(raised.Note)).toContain("conservative");
    // 30 gal × 3.785411784 L/gal (NIST Handbook 44) × 10 g/L = 1,135.6235352 g, all to soil.
    expect(raised["PFAS in concentrate used (g)"]).toBeCloseTo(1135.6235352, 6);
    expect(raised["PFOS reaching a surface, gross (lb)"]).toBeCloseTo(1135.6235352 / GRAMS_PER_POUND, 9);

    const kept = rows.find((row) => row["Event number"] === keptNumber)!;
    expect(kept["Computed concentrate (US gal)"]).toBe(20);
    expect(kept["Tank drawdown (US gal)"]).toBe(18);
    expect(kept["Concentrate counted for PFAS (US gal)"]).toBe(20);
    expect(kept["Concentrate figure"]).toBe(CONCENTRATE_FIGURE_LABELS.computed);
    expect(String(kept.Note ?? "")).not.toContain("conservative");
  });
});
