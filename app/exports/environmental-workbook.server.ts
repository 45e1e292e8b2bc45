import ExcelJS from "exceljs";
import { db, type Db } from "~/lib/db.server";
import { LITRES_PER_US_GALLON } from "~/lib/foam/units";
import { localDateTime, wallClockIn } from "~/lib/time-zone";
import {
  DISPOSITION_LABELS,
  DISPOSITIONS,
  EVENT_KIND_LABELS,
  EVENT_KINDS,
  FOAM_CLASS_LABELS,
  FOAM_CLASSES,
  HELD_BACK_LABEL,
  RELEASED_TO_ENVIRONMENT_LABEL,
  UNACCOUNTED_LABEL,
  WATER_ONLY_LABEL,
} from "~/lib/foam/vocabulary";
import type { AgencySettings } from "~/models/agency-settings.server";
import {
  eventsChangedSince,
  periodFacts,
  type AmendedEvent,
  type PeriodAggregates,
  type PfasRow,
} from "~/models/environmental-report.server";
import {
  dischargeTable,
  eventTable,
  GAL,
  LITRES,
  letterOf,
  nonIncidentTable,
  pfasColumns,
  POUNDS,
  releaseTable,
  type Column,
  type DetailTable,
} from "./environmental-tables.server";
import {
  appVersion,
  heaviestWindowPounds,
  methodLines,
  writeOnOneSnapshot,
  type WorkbookRequest,
  type WrittenFile,
} from "./environmental-common.server";

const BOLD = { bold: true };
const HEADER_FILL: ExcelJS.Fill = { type: "pattern", pattern: "solid", fgColor: { argb: "FFE7EEF0" } };
const CAUTION_FILL: ExcelJS.Fill = { type: "pattern", pattern: "solid", fgColor: { argb: "FFFFF4D6" } };

function sheetOptions(lastColumn: string, withFilter: boolean): Partial<ExcelJS.AddWorksheetOptions> {
  return {
    views: [{ state: "frozen", ySplit: 1, xSplit: 0 }],
    pageSetup: { orientation: "landscape", fitToWidth: 1, fitToHeight: 0, printTitlesRow: "1:1", paperSize: 1 },
    ...(withFilter ? { autoFilter: `A1:${lastColumn}1` } : {}),
  } as unknown as Partial<ExcelJS.AddWorksheetOptions>;
}

function quoteSheet(name: string): string {
  return /^[A-Za-z]+$/.test(name) ? name : `'${name.replace(/'/g, "''")}'`;
}

function writeHeader(sheet: ExcelJS.Worksheet, headers: string[]) {
  const row = sheet.addRow(headers);
  row.font = BOLD;
  row.alignment = { wrapText: true, vertical: "top" };
  row.eachCell((cell) => {
    cell.fill = HEADER_FILL;
  });
  row.height = 45;
  row.commit();
}

async function writeDetailSheet<Row>(
  workbook: ExcelJS.stream.xlsx.WorkbookWriter,
  name: string,
  columns: Column<Row>[],
  rows: AsyncIterable<Row> | Iterable<Row>,
  emptyNote: string,
): Promise<number> {
  const sheet = workbook.addWorksheet(name, sheetOptions(letterOf(columns, columns[columns.length - 1].key), true));
  sheet.columns = columns.map((column) => ({
    key: column.key,
    width: column.width,
    style: column.numFmt ? { numFmt: column.numFmt } : {},
  }));
  writeHeader(
    sheet,
    columns.map((column) => column.header),
  );
  // ExcelJS gives every new cell a fresh style object and matches styles by identity, so the style
  // XML would be rebuilt for every cell. One object per column (and, for a column without a number
  // format, per kind of value: numbers, dates and text are styled apart) is written the same.
  const styles = columns.map((column) => ({
    numFmt: column.numFmt ? { numFmt: column.numFmt } : undefined,
    byType: new Map<ExcelJS.ValueType, Partial<ExcelJS.Style>>(),
  }));
  const sharedStyle = (index: number, type: ExcelJS.ValueType) => {
    const column = styles[index];
    if (column.numFmt) return column.numFmt;
    let style = column.byType.get(type);
    if (!style) column.byType.set(type, (style = {}));
    return style;
  };
  let count = 0;
  for await (const row of rows) {
    const values = columns.map((column) => column.value(row));
    const added = sheet.addRow(values);
    values.forEach((value, index) => {
      if (value === undefined) return;
      const cell = added.getCell(index + 1);
      cell.style = sharedStyle(index, cell.effectiveType);
    });
    added.commit();
    count++;
  }
  if (count === 0) sheet.addRow([emptyNote]).commit();
  // The filter covers every data row; it is written when the sheet is committed.
  sheet.autoFilter = `A1:${letterOf(columns, columns[columns.length - 1].key)}${Math.max(2, count + 1)}`;
  sheet.commit();
  return count;
}

type Ranges = { events: number; discharges: number; releases: number; pfas: number };

/** `Sheet!$X$2:$X$n`, never shorter than one row so that an empty period still gives valid formulas. */
function range(sheet: string, letter: string, rows: number): string {
  return `${quoteSheet(sheet)}!$${letter}$2:$${letter}$${Math.max(2, rows + 1)}`;
}

const excelString = (value: string) => `"${value.replace(/"/g, '""')}"`;
/**
 * A SUMIFS/COUNTIFS criterion that matches `value` exactly: "=" so that a leading "<", ">" or "="
 * in a name is not read as a comparison, and "~" before the wildcards "*", "?" and "~" itself.
 */
const exactly = (value: string) => excelString(`=${value.replace(/[~*?]/g, "~$&")}`);

function writeSummary(
  workbook: ExcelJS.stream.xlsx.WorkbookWriter,
  facts: {
    agency: AgencySettings;
    request: WorkbookRequest;
    aggregates: PeriodAggregates;
    pfas: PfasRow[];
    changes: AmendedEvent[];
    ranges: Ranges;
    wall: ReturnType<typeof wallClockIn>;
  },
) {
  const { agency, request, aggregates, pfas, changes, ranges } = facts;
  const sheet = workbook.addWorksheet("Summary", sheetOptions("H", false));
  sheet.columns = [
    { width: 38 },
    { width: 22 },
    { width: 16, style: { numFmt: GAL } },
    { width: 16, style: { numFmt: GAL } },
    { width: 16, style: { numFmt: GAL } },
    { width: 16, style: { numFmt: LITRES } },
    { width: 16, style: { numFmt: LITRES } },
    { width: 16, style: { numFmt: LITRES } },
  ];
  let rowNumber = 0;
  const add = (values: unknown[], style?: (row: ExcelJS.Row) => void) => {
    const row = sheet.addRow(values);
    rowNumber++;
    style?.(row);
    row.commit();
    return rowNumber;
  };
  const heading = (text: string) => add([text], (row) => (row.font = { bold: true, size: 12 }));
  const columnHeads = (values: string[]) =>
    add(values, (row) => {
      row.font = BOLD;
      row.alignment = { wrapText: true };
      row.eachCell((cell) => (cell.fill = HEADER_FILL));
    });
  const blank = () => add([]);

  add([`Foam use and runoff summary — ${agency.name}`], (row) => (row.font = { bold: true, size: 14 }));
  const now = request.now ?? new Date();
  const period = request.period;
  add(["Period", `${period.label} (${period.from} to ${period.to}, days in ${agency.timeZone})`]);
  add(["Reports counted", "Accepted reports only, by the time the event started"]);
  add(["Accepted reports in the period", aggregates.eventCount]);
  add(["Filed, awaiting review (not counted)", aggregates.awaitingReview]);
  add(["Returned to the officer (not counted)", aggregates.returned]);
  add(["Generated by", `${request.generatedBy.name} <${request.generatedBy.email}>`]);
  add(["Generated at", `${localDateTime(now, agency.timeZone)} ${agency.timeZone} (${now.toISOString()})`]);
  add(["Foamtally version", appVersion()]);
  if (request.submission) {
    const submission = request.submission;
    add(
      [
        "Submission",
        `This period was marked submitted on ${localDateTime(submission.submittedAt, agency.timeZone)} by ${submission.submittedBy}. ` +
          `The submitted file (${submission.fileName}, SHA-256 ${submission.sha256}) is kept in Foamtally; this download is a fresh copy.`,
      ],
      (row) => (row.getCell(2).fill = CAUTION_FILL),
    );
  } else {
    add(["Submission", "Not marked as submitted."]);
  }
  add(
    [
      "Caution",
      "Figures are estimates computed from what officers entered. Local codes, permits and state and federal reporting law govern what must be reported, when and to whom. See “Method and cautions”.",
    ],
    (row) => (row.getCell(2).fill = CAUTION_FILL),
  );
  if (aggregates.eventCount === 0) {
    add(["No data", "No accepted reports fall in this period. The totals below are zero."], (row) => (row.font = BOLD));
  }
  blank();

  const D = dischargeTable.columns;
  const dRange = (key: string) => range("Discharges", letterOf(D, key), ranges.discharges);
  const litreFormula = (row: number, col: string) => `${col}${row}*${LITRES_PER_US_GALLON}`;
  const volumeRow = (
    label: string,
    second: string,
    criteria: string,
    totals: { water: number; concentrate: number; solution: number },
  ) => {
    const row = rowNumber + 1;
    return add([
      label,
      second,
      { formula: `SUMIFS(${dRange("water")},${criteria})`, result: totals.water },
      { formula: `SUMIFS(${dRange("concentrate")},${criteria})`, result: totals.concentrate },
      { formula: `SUMIFS(${dRange("solution")},${criteria})`, result: totals.solution },
      { formula: litreFormula(row, "C"), result: totals.water * LITRES_PER_US_GALLON },
      { formula: litreFormula(row, "D"), result: totals.concentrate * LITRES_PER_US_GALLON },
      { formula: litreFormula(row, "E"), result: totals.solution * LITRES_PER_US_GALLON },
    ]);
  };
  const volumeHeads = (first: string, second: string) =>
    columnHeads([
      first,
      second,
      "Water (US gal)",
      "Concentrate (US gal)",
      "Foam solution (US gal)",
      "Water (L)",
      "Concentrate (L)",
      "Foam solution (L)",
    ]);
  const sum = <T>(items: T[], pick: (item: T) => number) => items.reduce((total, item) => total + pick(item), 0);
  const totalsOf = <T extends { water: number; concentrate: number; solution: number }>(items: T[]) => ({
    water: sum(items, (item) => item.water),
    concentrate: sum(items, (item) => item.concentrate),
    solution: sum(items, (item) => item.solution),
  });

  heading("Water, concentrate and foam solution by foam class (from the Discharges sheet)");
  volumeHeads("Foam class", "Use");
  const classes = [...FOAM_CLASSES.map((foamClass) => FOAM_CLASS_LABELS[foamClass]), WATER_ONLY_LABEL];
  for (const foamClass of classes) {
    const classCriteria = `${dRange("class")},${exactly(foamClass)}`;
    const inClass = aggregates.byClass.filter((row) => row.foamClass === foamClass);
    volumeRow(
      foamClass,
      "Incidents",
      `${classCriteria},${dRange("kind")},${exactly(EVENT_KIND_LABELS.incident)}`,
      totalsOf(inClass.filter((row) => row.incident)),
    );
    volumeRow(
      foamClass,
      "Training, tests, flushes",
      `${classCriteria},${dRange("kind")},${excelString(`<>${EVENT_KIND_LABELS.incident}`)}`,
      totalsOf(inClass.filter((row) => !row.incident)),
    );
    volumeRow(foamClass, "All use", classCriteria, totalsOf(inClass));
  }
  {
    const row = rowNumber + 1;
    const all = totalsOf(aggregates.byClass);
    add(
      [
        "All discharges",
        "All use",
        { formula: `SUM(${dRange("water")})`, result: all.water },
        { formula: `SUM(${dRange("concentrate")})`, result: all.concentrate },
        { formula: `SUM(${dRange("solution")})`, result: all.solution },
        { formula: litreFormula(row, "C"), result: all.water * LITRES_PER_US_GALLON },
        { formula: litreFormula(row, "D"), result: all.concentrate * LITRES_PER_US_GALLON },
        { formula: litreFormula(row, "E"), result: all.solution * LITRES_PER_US_GALLON },
      ],
      (r) => (r.font = BOLD),
    );
  }
  blank();

  heading("By product (from the Discharges sheet)");
  volumeHeads("Product", "Foam class · PFAS");
  const products = [...new Set(aggregates.byProduct.map((row) => row.product))];
  for (const product of products) {
    const rows = aggregates.byProduct.filter((row) => row.product === product);
    const first = rows[0];
    volumeRow(
      product,
      `${first.foamClass}${first.pfasContaining ? " · PFAS-containing" : ""}`,
      `${dRange("product")},${exactly(product)}`,
      totalsOf(rows),
    );
  }
  if (products.length === 0) add(["(no discharges)"]);
  blank();

  const R = releaseTable(facts.wall).columns;
  const rRange = (key: string) => range("Releases", letterOf(R, key), ranges.releases);
  heading("Foam solution released, by where the runoff went (from the Releases sheet)");
  columnHeads(["Where the runoff went", "", "Foam solution (US gal)", "Foam solution (L)"]);
  for (const disposition of DISPOSITIONS) {
    const row = rowNumber + 1;
    const gallons = aggregates.byDisposition[disposition];
    add([
      DISPOSITION_LABELS[disposition],
      "",
      {
        formula: `SUMIFS(${rRange("released")},${rRange("disposition")},${exactly(DISPOSITION_LABELS[disposition])})`,
        result: gallons,
      },
      { formula: litreFormula(row, "C"), result: gallons * LITRES_PER_US_GALLON },
    ]);
  }
  {
    const row = rowNumber + 1;
    const all = Object.values(aggregates.byDisposition).reduce((a, b) => a + b, 0);
    add(
      [
        "All dispositions",
        "",
        { formula: `SUM(${rRange("released")})`, result: all },
        { formula: litreFormula(row, "C"), result: all * LITRES_PER_US_GALLON },
      ],
      (r) => (r.font = BOLD),
    );
  }
  for (const [label, flag, gallons] of [
    [RELEASED_TO_ENVIRONMENT_LABEL, "Yes", aggregates.environmentGallons],
    [HELD_BACK_LABEL, "No", aggregates.heldBackGallons],
  ] as const) {
    const row = rowNumber + 1;
    add(
      [
        label,
        "",
        { formula: `SUMIFS(${rRange("released")},${rRange("environment")},${exactly(flag)})`, result: gallons },
        { formula: litreFormula(row, "C"), result: gallons * LITRES_PER_US_GALLON },
      ],
      (r) => (r.font = BOLD),
    );
  }
  {
    const row = rowNumber + 1;
    const gallons = aggregates.unaccountedGallons;
    add([
      UNACCOUNTED_LABEL,
      "From the Events sheet; counted as not contained in the PFAS figures",
      {
        formula: `SUM(${range("Events", letterOf(eventTable(facts.wall).columns, "unaccounted"), ranges.events)})`,
        result: gallons,
      },
      { formula: litreFormula(row, "C"), result: gallons * LITRES_PER_US_GALLON },
    ]);
  }
  blank();

  heading("Foam solution released, by drainage basin and receiving water (from the Releases sheet)");
  columnHeads(["Drainage basin", "Receiving water", "Foam solution (US gal)", "Foam solution (L)"]);
  for (const group of aggregates.byBasinAndWater) {
    const row = rowNumber + 1;
    add([
      group.basin,
      group.receivingWater,
      {
        formula: `SUMIFS(${rRange("released")},${rRange("basin")},${exactly(group.basin)},${rRange("water")},${exactly(group.receivingWater)})`,
        result: group.gallons,
      },
      { formula: litreFormula(row, "C"), result: group.gallons * LITRES_PER_US_GALLON },
    ]);
  }
  if (aggregates.byBasinAndWater.length === 0) add(["(no runoff recorded)"]);
  blank();

  const E = eventTable(facts.wall).columns;
  heading("Accepted reports by kind of event (from the Events sheet)");
  columnHeads(["Kind", "", "Events"]);
  const kindStart = rowNumber + 1;
  for (const kind of EVENT_KINDS) {
    add(
      [
        EVENT_KIND_LABELS[kind],
        "",
        {
          formula: `COUNTIFS(${range("Events", letterOf(E, "kind"), ranges.events)},${exactly(EVENT_KIND_LABELS[kind])})`,
          result: aggregates.eventsByKind[kind],
        },
      ],
      (r) => (r.getCell(3).numFmt = "0"),
    );
  }
  add(["All events", "", { formula: `SUM(C${kindStart}:C${rowNumber})`, result: aggregates.eventCount }], (r) => {
    r.font = BOLD;
    r.getCell(3).numFmt = "0";
  });
  blank();

  const P = pfasColumns(facts.wall, agency.pfasReportableLb);
  const pRange = (key: string) => range("PFAS", letterOf(P, key), ranges.pfas);
  heading("PFAS-containing foam (from the PFAS sheet)");
  const releasedLb = pfas.reduce((total, row) => total + (row.poundsReleased ?? 0), 0);
  const windowMax = heaviestWindowPounds(pfas);
  const unknown = pfas.some((row) => row.thresholdReached === "Unknown");
  const answer = pfas.some((row) => row.thresholdReached === "Yes") ? "Yes" : unknown ? "Unknown" : "No";
  add(["Estimated PFAS released (lb)", "", { formula: `SUM(${pRange("releasedLb")})`, result: releasedLb }], (r) => {
    r.getCell(3).numFmt = POUNDS;
  });
  const windowRow = add(
    ["Heaviest 24-hour period (lb)", "", { formula: `MAX(0,${pRange("window")})`, result: windowMax }],
    (r) => (r.getCell(3).numFmt = POUNDS),
  );
  const thresholdRow = add(
    [
      "Reportable threshold (lb in any 24 h)",
      "Default 1 lb: CERCLA reportable quantity for PFOA and PFOS, 40 CFR 302.4 (89 FR 39124, 8 May 2024). Local and state law may be stricter and governs.",
      agency.pfasReportableLb,
    ],
    (r) => {
      r.getCell(3).numFmt = POUNDS;
      r.getCell(2).alignment = { wrapText: true };
    },
  );
  add(
    [
      "Reportable quantity reached in some 24-hour period (PFOA or PFOS, each on its own)",
      unknown
        ? "Unknown: a PFAS-containing product has no PFOA or PFOS content recorded, so by the mixture rule (40 CFR 302.6(b)(1)(ii)) the answer cannot be No."
        : "",
      {
        formula: `IF(OR(C${windowRow}>=C${thresholdRow},COUNTIF(${pRange("reached")},"Yes")>0),"Yes",IF(COUNTIF(${pRange("reached")},"Unknown")>0,"Unknown","No"))`,
        result: answer,
      },
    ],
    (r) => (r.font = BOLD),
  );
  blank();

  heading("Changes since submission");
  if (!request.submission) {
    add(["This period has not been marked as submitted."]);
  } else if (changes.length === 0) {
    add(["No event of this period has changed since it was submitted."]);
  } else {
    columnHeads(["Event number", "Revision", "Changed at (local)", "What changed"]);
    for (const change of changes) {
      add([change.number, change.revision, localDateTime(change.changedAt, agency.timeZone), change.reason]);
    }
  }
  sheet.commit();
}

function writeMethod(workbook: ExcelJS.stream.xlsx.WorkbookWriter, agency: AgencySettings) {
  const sheet = workbook.addWorksheet("Method and cautions", sheetOptions("B", false));
  sheet.columns = [{ width: 28 }, { width: 110 }];
  methodLines(agency).forEach(([topic, text], index) => {
    const row = sheet.addRow([topic, text]);
    row.alignment = { wrapText: true, vertical: "top" };
    if (index === 0) row.font = { bold: true, size: 14 };
    row.getCell(1).font = BOLD;
    if (topic === "Cautions") row.getCell(2).fill = CAUTION_FILL;
    row.commit();
  });
  sheet.commit();
}

async function* fromArray<T>(items: T[]): AsyncIterable<T> {
  yield* items;
}

/**
 * Writes the environmental workbook to `path` with ExcelJS's streaming writer: detail rows go from
 * MariaDB to the file one at a time; totals are summed by MariaDB. All reads run in one transaction,
 * so the Summary's cached totals and the detail sheets come from the same snapshot.
 */
export async function writeEnvironmentalWorkbook(
  request: WorkbookRequest,
  path: string,
  connection: Db = db,
): Promise<WrittenFile> {
  return writeOnOneSnapshot(path, connection, async (trx) => {
    const { agency, wall, aggregates, pfas } = await periodFacts(request.period, trx);
    const changes = request.submission
      ? await eventsChangedSince(request.period, request.submission.submittedAt, trx)
      : [];
    const workbook = new ExcelJS.stream.xlsx.WorkbookWriter({
      filename: path,
      useStyles: true,
      useSharedStrings: false,
    });
    workbook.creator = "Foamtally";
    workbook.created = request.now ?? new Date();
    const ranges: Ranges = {
      events: aggregates.eventCount,
      discharges: aggregates.dischargeCount,
      releases: aggregates.releaseCount,
      pfas: pfas.length,
    };
    writeSummary(workbook, { agency, request, aggregates, pfas, changes, ranges, wall });
    const writeTable = <Row>(table: DetailTable<Row>, empty: string) =>
      writeDetailSheet(workbook, table.sheet, table.columns, table.rows(request.period, trx), empty);
    await writeTable(eventTable(wall), "No accepted reports in this period.");
    await writeTable(dischargeTable, "No discharges in this period.");
    await writeTable(releaseTable(wall), "No runoff recorded in this period.");
    await writeTable(nonIncidentTable(wall), "No training, test or flush use in this period.");
    await writeDetailSheet(
      workbook,
      "PFAS",
      pfasColumns(wall, agency.pfasReportableLb),
      fromArray(pfas),
      "No PFAS-containing foam was used in this period.",
    );
    writeMethod(workbook, agency);
    await workbook.commit();
  });
}
