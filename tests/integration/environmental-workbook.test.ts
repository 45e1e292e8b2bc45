import { mkdtempSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import * as XLSX from "xlsx";
import { db } from "~/lib/db.server";
import { GRAMS_PER_POUND, LITRES_PER_US_GALLON } from "~/lib/foam/units";
import { parseReportPeriod, type ReportPeriod } from "~/lib/reporting/period";
import { writeEnvironmentalWorkbook } from "~/exports/environmental-workbook.server";
import { writeEnvironmentalCsvZip } from "~/exports/environmental-csv.server";
import {
  DISPOSITIONS,
  EVENT_KINDS,
  EVENT_STATUSES,
  FIGURE_BASIS_LABELS,
  FOAM_TYPES,
  HELD_BACK_LABEL,
  PFAS_CONTENT_UNITS,
  RELEASED_TO_ENVIRONMENT_LABEL,
  UNACCOUNTED_LABEL,
} from "~/lib/foam/vocabulary";
import { makeUser } from "../support/factories";
import { ensureAgency, makeApparatus, makeEvent, makeProduct, makeStation } from "../support/usage-fixtures";

const SHEETS = ["Summary", "Events", "Discharges", "Releases", "Non-incident use", "PFAS", "Method and cautions"];

function quarter(year: number, q: number): ReportPeriod {
  const result = parseReportPeriod(new URLSearchParams(`year=${year}&quarter=${q}`), "America/Chicago");
  if (!result.ok) throw new Error(result.message);
  return result.period;
}

type Row = Record<string, unknown>;
const rowsOf = (book: XLSX.WorkBook, sheet: string): Row[] => XLSX.utils.sheet_to_json<Row>(book.Sheets[sheet]);
const sum = (rows: Row[], column: string, where: (row: Row) => boolean = () => true) =>
  rows.filter(where).reduce((total, row) => total + Number(row[column] ?? 0), 0);

/** The Summary row whose first two cells are `label` and `second`, as { values, formulas } by column letter. */
function summaryRow(book: XLSX.WorkBook, label: string, second?: string) {
  const sheet = book.Sheets.Summary;
  const range = XLSX.utils.decode_range(sheet["!ref"] ?? "A1");
  for (let r = range.s.r; r <= range.e.r; r++) {
    const a = sheet[XLSX.utils.encode_cell({ r, c: 0 })]?.v;
    const b = sheet[XLSX.utils.encode_cell({ r, c: 1 })]?.v;
    if (a === label && (second === undefined || b === second)) {
      const cell = (letter: string) => sheet[`${letter}${r + 1}`] as XLSX.CellObject | undefined;
      return {
        value: (letter: string) => cell(letter)?.v,
        formula: (letter: string) => cell(letter)?.f,
      };
    }
  }
  throw new Error(`no Summary row ${label} / ${second}`);
}

const REACHED = "Reportable quantity reached in some 24-hour period (PFOA or PFOS, each on its own)";
let dir: string;
let pfasProductName: string;
let stormEventNumber: string;
let boundaryFiledNumber: string;
let shortRunoffNumber: string;

beforeAll(async () => {
  dir = mkdtempSync(path.join(tmpdir(), "foamtally-workbook-"));
  await ensureAgency(db, { pfas_reportable_lb: 1 });
  const officer = await makeUser(["officer"], "Workbook Officer");
  const station = await makeStation();
  const engine = await makeApparatus(station.id);
  // A name a spreadsheet criterion would read as a comparison and wildcards: it must match only itself.
  const classA = await makeProduct({ foamClass: "A", name: `<Wet*Water? 0.3~ (test ${Date.now()})` });
  const fluorineFree = await makeProduct({ foamClass: "B", foamType: "f3" });
  const legacy = await makeProduct({
    foamClass: "B",
    foamType: "ar-afff",
    pfasContaining: true,
    pfasContent: 10,
    pfasContentUnit: "g_per_l",
    // Test figures: all of it PFOS, none PFOA, so the reportable-quantity check has known amounts.
    pfoaContent: 0,
    pfoaContentUnit: "g_per_l",
    pfosContent: 10,
    pfosContentUnit: "g_per_l",
    pfasContentBasis: "perfluoroalkyl sulfonates",
    // A raw catalogue note of the kind the workbook must not repeat to a regulator.
    pfasContentSource: "middle of 5–15 g/L for legacy PFOS AFFF (an old product safety sheet, from memory)",
  });
  pfasProductName = legacy.name;
  // A PFAS-containing product whose PFOA and PFOS content nobody knows.
  const unknownContent = await makeProduct({ foamClass: "B", foamType: "afff", pfasContaining: true });
  await makeEvent({
    createdBy: officer.id,
    startedAt: new Date("2034-02-01T15:00:00Z"),
    discharges: [{ productId: unknownContent.id, percent: 3, water: 97, concentrate: 3 }],
    dispositions: [{ disposition: "soil", sharePercent: 100 }],
    pfasContaining: true,
  });
  // Across the Q1/Q2 2032 boundary in Chicago: 23:00 on 31 March (04:00Z) and 01:00 on 1 April (06:00Z),
  // 7.19 gal each of the 10 g/L PFOS product = 0.60003 lb each, 1.2 lb together.
  for (const startedAt of ["2032-04-01T04:00:00Z", "2032-04-01T06:00:00Z"]) {
    await makeEvent({
      createdBy: officer.id,
      startedAt: new Date(startedAt),
      discharges: [{ productId: legacy.id, percent: 3, water: 232.48, concentrate: 7.19 }],
      dispositions: [{ disposition: "contained", sharePercent: 100, disposalReference: "Drum T-9" }],
      pfasContaining: true,
    });
  }
  boundaryFiledNumber = (
    await makeEvent({
      createdBy: officer.id,
      status: "filed",
      startedAt: new Date("2032-04-01T12:00:00Z"),
      discharges: [{ productId: legacy.id, percent: 3, water: 10, concentrate: 0.1 }],
      dispositions: [{ disposition: "contained", sharePercent: 100, disposalReference: "Drum T-10" }],
      pfasContaining: true,
    })
  ).number;
  // 2035 Q1: runoff lines short of the solution. 970 + 30 = 1,000 gal of solution; 300 gal contained
  // and 20 % (200 gal) to soil leave 500 gal unaccounted.
  shortRunoffNumber = (
    await makeEvent({
      createdBy: officer.id,
      startedAt: new Date("2035-02-01T15:00:00Z"),
      discharges: [{ productId: fluorineFree.id, percent: 3, water: 970, concentrate: 30 }],
      dispositions: [
        { disposition: "contained", volumeGal: 300, disposalReference: "Drum T-11" },
        { disposition: "soil", sharePercent: 20 },
      ],
    })
  ).number;
  // 2031 Q2 in Chicago: 2031-04-01T05:00Z up to 2031-07-01T05:00Z. Test years keep clear of other tests' rows.
  const storm = await makeEvent({
    createdBy: officer.id,
    startedAt: new Date("2031-04-10T14:00:00Z"),
    stationId: station.id,
    drainageBasin: "Test Basin North",
    discharges: [
      { productId: classA.id, apparatusId: engine.id, percent: 0.3, water: 1000, concentrate: 3 },
      // 200 gpm solution × 15 min = 3,000 gal; × 3 % = 90 gal concentrate; water 2,910 gal.
      {
        productId: legacy.id,
        apparatusId: engine.id,
        percent: 3,
        flow: 200,
        flowBasis: "solution",
        minutes: 15,
        water: 2910,
        concentrate: 90,
      },
    ],
    dispositions: [
      { disposition: "storm_drain", sharePercent: 60, receivingWater: "Test Creek" },
      { disposition: "contained", sharePercent: 40, disposalReference: "Manifest T-1" },
    ],
    pfasContaining: true,
  });
  stormEventNumber = storm.number;
  await db("events")
    .where({ id: storm.id })
    .update({
      event_warnings: JSON.stringify([
        { code: "drawdown_mismatch", message: "Tank drawdown of 120 gal is more than the 93 gal computed." },
      ]),
    });
  await makeEvent({
    createdBy: officer.id,
    kind: "training",
    startedAt: new Date("2031-05-02T15:00:00Z"),
    discharges: [{ productId: fluorineFree.id, percent: 3, water: 500, concentrate: 15 }],
    dispositions: [{ disposition: "contained", volumeGal: 515, disposalReference: "Pad T-2" }],
  });
  await makeEvent({
    createdBy: officer.id,
    kind: "flush",
    startedAt: new Date("2031-06-01T15:00:00Z"),
    drainageBasin: "Test Basin South",
    discharges: [{ productId: legacy.id, percent: null, water: 0, concentrate: 10 }],
    dispositions: [
      { disposition: "sanitary_sewer", sharePercent: 100, sewerNotice: "Notice T-3 to the treatment works" },
    ],
    pfasContaining: true,
  });
  // 23:30 on 30 June in Chicago: inside Q2 although it is 1 July in UTC.
  await makeEvent({
    createdBy: officer.id,
    startedAt: new Date("2031-07-01T04:30:00Z"),
    discharges: [{ productId: classA.id, percent: 0.5, water: 200, concentrate: 1 }],
  });
  // 01:00 on 1 July in Chicago: Q3.
  await makeEvent({
    createdBy: officer.id,
    startedAt: new Date("2031-07-01T06:00:00Z"),
    discharges: [{ productId: classA.id, percent: 0.5, water: 7777, concentrate: 7 }],
  });
  await makeEvent({
    createdBy: officer.id,
    status: "filed",
    startedAt: new Date("2031-05-15T15:00:00Z"),
    discharges: [{ productId: classA.id, percent: 0.5, water: 9999, concentrate: 9 }],
  });
});

afterAll(() => {
  rmSync(dir, { recursive: true, force: true });
});

async function build(period: ReportPeriod, name: string) {
  const file = path.join(dir, name);
  const written = await writeEnvironmentalWorkbook(
    { period, generatedBy: { name: "Workbook Tester", email: "tester@test.example" } },
    file,
  );
  const book = XLSX.read(readFileSync(file), { cellFormula: true, cellDates: false });
  return { book, written };
}

describe("the quarterly environmental workbook", () => {
  it("has every sheet with units in its headers", async () => {
    const { book, written } = await build(quarter(2031, 2), "q2.xlsx");
    expect(book.SheetNames).toEqual(SHEETS);
    expect(written.sha256).toMatch(/^[0-9a-f]{64}$/);
    const header = (sheet: string) => XLSX.utils.sheet_to_json<string[]>(book.Sheets[sheet], { header: 1 })[0];
    expect(header("Discharges")).toEqual(
      expect.arrayContaining(["Water (US gal)", "Concentrate (US gal)", "Foam solution (US gal)", "Foam solution (L)"]),
    );
    expect(header("PFAS")).toEqual(
      expect.arrayContaining([
        "Estimated PFAS released (g)",
        "Estimated PFAS released (lb)",
        "PFOS reaching a surface, gross (lb)",
        "PFOS not recovered, net (lb)",
        "PFOA at or above the RQ",
        "Reportable quantity reached",
      ]),
    );
    // The filter spans the header and the five discharge rows of Q2 (A to V: 22 columns).
    expect(book.Sheets.Discharges["!autofilter"]?.ref).toBe("A1:V6");
  });

  it("sums to the detail rows and to MariaDB's own aggregate, with formulas in place", async () => {
    const period = quarter(2031, 2);
    const { book } = await build(period, "q2-totals.xlsx");
    const discharges = rowsOf(book, "Discharges");
    expect(discharges).toHaveLength(5); // 2 + 1 + 1 + 1 in Q2; the Q3 and the filed events are left out
    const database = await db("events as e")
      .join("discharges as d", "d.event_id", "e.id")
      .where("e.status", "accepted")
      .where("e.started_at", ">=", period.startUtc)
      .where("e.started_at", "<", period.endUtc)
      .sum({ water: "d.water_gal", concentrate: "d.concentrate_gal", solution: "d.solution_gal" })
      .first();

    const all = summaryRow(book, "All discharges");
    expect(all.formula("C")).toMatch(/^SUM\(Discharges!\$P\$2:\$P\$6\)$/);
    for (const [letter, column, key] of [
      ["C", "Water (US gal)", "water"],
      ["D", "Concentrate (US gal)", "concentrate"],
      ["E", "Foam solution (US gal)", "solution"],
    ] as const) {
      expect(all.value(letter)).toBeCloseTo(sum(discharges, column), 6);
      expect(all.value(letter)).toBeCloseTo(Number(database?.[key]), 6);
    }
    // 1,000 + 2,910 + 500 + 0 + 200 gal of water; the litre column is gal × 3.785411784 (NIST Handbook 44).
    expect(all.value("C")).toBeCloseTo(4610, 6);
    expect(all.value("F")).toBeCloseTo(4610 * LITRES_PER_US_GALLON, 6);
    expect(all.formula("F")).toMatch(/\*3\.785411784$/);

    const classBIncidents = summaryRow(book, "Class B", "Incidents");
    expect(classBIncidents.formula("D")).toContain("SUMIFS(");
    expect(classBIncidents.value("D")).toBeCloseTo(
      sum(discharges, "Concentrate (US gal)", (row) => row["Foam class"] === "Class B" && row.Kind === "Incident"),
      6,
    );
    expect(classBIncidents.value("D")).toBeCloseTo(90, 6);
    expect(summaryRow(book, "Class B", "Training, tests, flushes").value("D")).toBeCloseTo(25, 6);
    expect(summaryRow(book, "Class A", "All use").value("D")).toBeCloseTo(4, 6);
    expect(summaryRow(book, pfasProductName).value("D")).toBeCloseTo(100, 6);
    const wet = summaryRow(book, String(discharges[0].Product));
    expect(wet.formula("D")).toContain('"=<Wet~*Water~? 0.3~~ (test ');
    expect(wet.value("D")).toBeCloseTo(3 + 1, 6);

    const releases = rowsOf(book, "Releases");
    const storm = summaryRow(book, "To a storm drain");
    // 60 % of the storm event's 4,003 gal of foam solution.
    expect(storm.value("C")).toBeCloseTo(0.6 * 4003, 6);
    expect(storm.value("C")).toBeCloseTo(
      sum(releases, "Released foam solution (US gal)", (row) => row["Where the runoff went"] === "To a storm drain"),
      6,
    );
    expect(summaryRow(book, "Contained and collected").value("C")).toBeCloseTo(0.4 * 4003 + 515, 6);
    expect(summaryRow(book, "Test Basin North", "Test Creek").value("C")).toBeCloseTo(0.6 * 4003, 6);
    const stormRelease = releases.find((row) => row["Where the runoff went"] === "To a storm drain");
    expect(stormRelease?.["Event number"]).toBe(stormEventNumber);
    // No notification was recorded for this release; the sheet says so rather than leaving it blank.
    expect(stormRelease?.["Notifications recorded (this record is not one)"]).toBe("None recorded");

    expect(summaryRow(book, "Incident").value("C")).toBe(2);
    expect(summaryRow(book, "Incident").formula("C")).toMatch(/^COUNTIFS\(Events!/);
    expect(summaryRow(book, "All events").value("C")).toBe(rowsOf(book, "Events").length);
    expect(summaryRow(book, "Filed, awaiting review (not counted)").value("B")).toBe(1);
    expect(rowsOf(book, "Non-incident use").map((row) => row.Kind)).toEqual(["Training", "Flush or maintenance"]);
  });

  it("estimates PFAS mass as worked out by hand and checks the 24-hour threshold", async () => {
    const { book } = await build(quarter(2031, 2), "q2-pfas.xlsx");
    const pfas = rowsOf(book, "PFAS");
    expect(pfas).toHaveLength(2);
    // Worked by hand. Inputs: 90 gal of concentrate (200 gpm foam solution × 15 min × 3 %, the
    // solution-basis formula of API RP 2021 Appendix K); content 10 g/L, the middle of the 5–15 g/L
    // range for legacy PFOS AFFF (an old product safety sheet; academic measurements from memory);
    // 1 US gal = 3.785411784 L and 1 lb = 453.59237 g (NIST Handbook 44); 40 % contained, so 60 % released.
    // 90 × 3.785411784 = 340.68706056 L × 10 g/L = 3,406.8706056 g; × 0.6 = 2,044.12236336 g = 4.5065184 lb.
    const storm = pfas[0];
    expect(storm["PFAS in concentrate used (g)"]).toBeCloseTo(3406.8706056, 6);
    expect(storm["Estimated PFAS released (g)"]).toBeCloseTo(2044.12236336, 6);
    expect(storm["Estimated PFAS released (lb)"]).toBeCloseTo(2044.12236336 / 453.59237, 9);
    expect(storm["Estimated PFAS released (lb)"]).toBeCloseTo(4.5065184, 6);
    // Reportable threshold 1 lb in 24 h: CERCLA RQ for PFOA/PFOS, 40 CFR 302.4 (89 FR 39124).
    // PFOS gross: all 3,406.87 g reached a surface (40 CFR 302.3) = 7.5108640 lb; net 60 % = 4.5065184 lb.
    expect(storm["PFOS reaching a surface, gross (lb)"]).toBeCloseTo(3406.8706056 / 453.59237, 9);
    expect(storm["PFOS not recovered, net (lb)"]).toBeCloseTo(4.5065184, 6);
    expect(storm["PFOS at or above the RQ"]).toBe("Yes");
    expect(storm["PFOA at or above the RQ"]).toBe("No");
    expect(storm["Reportable quantity reached"]).toBe("Yes");
    // The flush: 10 gal × 3.785411784 × 10 g/L = 378.5411784 g, all to the sewer (not contained) = 0.834540 lb.
    const flush = pfas[1];
    expect(flush["Estimated PFAS released (lb)"]).toBeCloseTo(378.5411784 / GRAMS_PER_POUND, 9);
    expect(flush["Heaviest 24 h holding this use, PFOA or PFOS, gross (lb)"]).toBeCloseTo(0.83454, 5);
    expect(flush["Reportable quantity reached"]).toBe("No");
    const reached = summaryRow(book, REACHED);
    expect(reached.value("C")).toBe("Yes");
    expect(reached.formula("C")).toMatch(/^IF\(OR\(C\d+>=C\d+,COUNTIF\(/);
    expect(summaryRow(book, "Estimated PFAS released (lb)").value("C")).toBeCloseTo(
      (2044.12236336 + 378.5411784) / 453.59237,
      9,
    );
  });

  it("answers Unknown, never No, for a PFAS product without PFOA/PFOS content (mixture rule, 40 CFR 302.6(b)(1)(ii))", async () => {
    const { book } = await build(quarter(2034, 1), "q1-unknown.xlsx");
    const [row] = rowsOf(book, "PFAS");
    expect(row["Reportable quantity reached"]).toBe("Unknown");
    expect(row["PFOS reaching a surface, gross (lb)"]).toBeUndefined();
    expect(String(row.Note)).toMatch(/unknown \(mixture rule, 40 CFR 302\.6\(b\)\(1\)\(ii\)\)/);
    const summary = summaryRow(book, REACHED);
    expect(summary.value("C")).toBe("Unknown");
    expect(summary.value("B")).toMatch(/cannot be No/);
  });

  it("finds a 24-hour pair across a quarter boundary and counts a filed report beside it (40 CFR 302.4: 1 lb in any 24 h)", async () => {
    const { book } = await build(quarter(2032, 2), "q2-boundary.xlsx");
    const rows = rowsOf(book, "PFAS");
    // Only the 1 April use is in Q2; the 31 March one (Q1) is found by looking 24 h back.
    expect(rows).toHaveLength(1);
    expect(rows[0]["PFOS reaching a surface, gross (lb)"]).toBeCloseTo((7.19 * 3.785411784 * 10) / 453.59237, 9);
    expect(rows[0]["Heaviest 24 h holding this use, PFOA or PFOS, gross (lb)"]).toBeGreaterThan(1.2);
    expect(rows[0]["Reportable quantity reached"]).toBe("Yes");
    expect(rows[0]["Reports not yet accepted in the 24 h"]).toBe(`${boundaryFiledNumber} (Filed)`);
    // Contained runoff is never "released": its net mass is 0.
    expect(rows[0]["PFOS not recovered, net (lb)"]).toBe(0);
    const q1 = rowsOf((await build(quarter(2032, 1), "q1-boundary.xlsx")).book, "PFAS");
    expect(q1.map((row) => row["Reportable quantity reached"])).toEqual(["Yes"]);
  });

  it("gives a valid workbook that says so for a period without data", async () => {
    const { book } = await build(quarter(2033, 1), "empty.xlsx");
    expect(book.SheetNames).toEqual(SHEETS);
    expect(summaryRow(book, "No data").value("B")).toMatch(/No accepted reports/);
    expect(summaryRow(book, "All discharges").value("C")).toBe(0);
    expect(summaryRow(book, REACHED).value("C")).toBe("No");
    expect(XLSX.utils.sheet_to_json<string[]>(book.Sheets.Discharges, { header: 1 })[1]).toEqual([
      "No discharges in this period.",
    ]);
  });

  describe("speaks to a regulator in trade words (issue 10 §4, corrections found in review)", () => {
    // Stored codes that are ordinary words in prose ("training", "contained") are refused as whole
    // cells, statuses also in parentheses; codes no sentence uses ("storm_drain", "ar-afff", "f3")
    // anywhere. "gpm" is the trade label itself (FLOW_UNIT_LABELS); "lpm" is not.
    const allCodes = [...EVENT_KINDS, ...EVENT_STATUSES, ...DISPOSITIONS, ...FOAM_TYPES, ...PFAS_CONTENT_UNITS, "lpm"];
    const codeWords = allCodes.filter((code) => /[_\-0-9]/.test(code));
    const proseWords = allCodes.filter((code) => !codeWords.includes(code));
    const cellsOf = (book: XLSX.WorkBook) =>
      book.SheetNames.flatMap((name) =>
        XLSX.utils
          .sheet_to_json<unknown[]>(book.Sheets[name], { header: 1 })
          .flat()
          .filter((cell): cell is string => typeof cell === "string")
          .map((text) => ({ name, text })),
      );
    const offending = (cells: { name: string; text: string }[]) =>
      cells.filter(
        ({ text }) =>
          /from memory/i.test(text) ||
          proseWords.some((word) => text === word) ||
          EVENT_STATUSES.some((status) => text.includes(`(${status})`)) ||
          codeWords.some((code) => new RegExp(`(^|[^A-Za-z0-9_-])${code}($|[^A-Za-z0-9_-])`).test(text)),
      );

    it("has no internal code and no “from memory” note in any sheet, and a short Basis instead", async () => {
      const { book } = await build(quarter(2031, 2), "q2-words.xlsx");
      expect(offending(cellsOf(book))).toEqual([]);
      const pfas = rowsOf(book, "PFAS");
      expect(pfas.length).toBeGreaterThan(0);
      expect(pfas.map((row) => row["Basis of the content figure"])).toContain(FIGURE_BASIS_LABELS.estimate);
      expect(rowsOf(book, "Discharges").map((row) => row["Flow unit (gpm or L/min)"])).toContain("gpm");
    });

    it("sums releases to the environment apart from runoff held back, line by line", async () => {
      const { book } = await build(quarter(2031, 2), "q2-environment.xlsx");
      const releases = rowsOf(book, "Releases");
      const flag = (where: string) =>
        releases
          .filter((row) => row["Where the runoff went"] === where)
          .map((row) => row["Released to the environment"]);
      expect(flag("To a storm drain")).toEqual(["Yes"]);
      expect(flag("Contained and collected")).toEqual(["No", "No"]);
      // Sent to the sewer with a notice to the treatment works: held back.
      expect(flag("To the sanitary sewer")).toEqual(["No"]);
      // 60 % of 4,003 gal to the storm drain; 40 % of 4,003 + 515 contained + 10 to the sewer with notice.
      const released = summaryRow(book, RELEASED_TO_ENVIRONMENT_LABEL);
      expect(released.value("C")).toBeCloseTo(0.6 * 4003, 6);
      expect(released.formula("C")).toContain("SUMIFS(Releases!");
      expect(summaryRow(book, HELD_BACK_LABEL).value("C")).toBeCloseTo(0.4 * 4003 + 515 + 10, 6);
    });

    it("puts the event's own warnings in their own column", async () => {
      const { book } = await build(quarter(2031, 2), "q2-warnings.xlsx");
      const storm = rowsOf(book, "Events").find((row) => row["Event number"] === stormEventNumber);
      expect(storm?.["Event warnings"]).toBe("Tank drawdown of 120 gal is more than the 93 gal computed.");
    });

    it("writes the CSV tables in the same words, litres to the tenth", async () => {
      const file = path.join(dir, "q2.zip");
      await writeEnvironmentalCsvZip(
        { period: quarter(2031, 2), generatedBy: { name: "Workbook Tester", email: "tester@test.example" } },
        file,
      );
      const zip = XLSX.CFB.read(readFileSync(file), { type: "buffer" });
      const cells: { name: string; text: string }[] = [];
      let litreValues = 0;
      for (const name of [
        "summary.csv",
        "events.csv",
        "discharges.csv",
        "releases.csv",
        "non_incident_use.csv",
        "pfas.csv",
      ]) {
        const text = Buffer.from(XLSX.CFB.find(zip, name)?.content as Uint8Array).toString("utf8");
        const rows = XLSX.utils.sheet_to_json<unknown[]>(
          XLSX.read(text.slice(1), { type: "string", raw: true }).Sheets.Sheet1,
          {
            header: 1,
            raw: false,
          },
        );
        const header = (rows[0] ?? []) as string[];
        for (const row of rows.slice(1)) {
          row.forEach((cell, index) => {
            if (typeof cell === "string") cells.push({ name, text: cell });
            if (/\(L\)$/.test(String(header[index])) && cell !== undefined && cell !== "") {
              litreValues++;
              expect(String(cell)).toMatch(/^-?\d+(\.\d)?$/);
            }
          });
        }
      }
      expect(litreValues).toBeGreaterThan(0);
      expect(offending(cells)).toEqual([]);
    });
  });

  it("carries runoff that does not add up as an unaccounted line (issue 10 §4)", async () => {
    const { book } = await build(quarter(2035, 1), "q1-unaccounted.xlsx");
    const event = rowsOf(book, "Events").find((row) => row["Event number"] === shortRunoffNumber);
    expect(event?.["Foam solution unaccounted for by the runoff lines (US gal)"]).toBeCloseTo(500, 6);
    const summary = summaryRow(book, UNACCOUNTED_LABEL);
    expect(summary.value("C")).toBeCloseTo(500, 6);
    expect(summary.formula("C")).toMatch(/^SUM\(Events!/);
    expect(summary.value("D")).toBeCloseTo(500 * LITRES_PER_US_GALLON, 6);
  });

  it("labels the waterway buffer as the aerial-application guideline it is (issue 10 §4; USDA Forest Service)", async () => {
    const { book } = await build(quarter(2035, 1), "q1-method.xlsx");
    const method = XLSX.utils.sheet_to_json<string[]>(book.Sheets["Method and cautions"], { header: 1 });
    const buffer = method.find((row) => row[0] === "Waterway buffer");
    expect(buffer?.[1]).toContain("USDA Forest Service guideline for aerial application");
    expect(buffer?.[1]).toContain("ground use has no fixed distance");
  });
});
