// The one writer of a report's rows: its discharges, runoff dispositions and tank readings, and the
// totals columns of its event, from the lines and what the computation made of them. Saving a report,
// the demo and large seeds, the test fixtures and the benchmarks all write through it. Relative
// imports and a connection passed in, so that the knex CLI can run it from a seed.
import type { Knex } from "knex";
import { bumpDataVersion } from "./data-version.server";
import type { DischargeInput, TankReading, UsageWarning } from "../lib/foam/totals";
import type { FlowUnit } from "../lib/foam/units";
import {
  defaultPercentOf,
  type ApplicationMethod,
  type Disposition,
  type FlowBasis,
  type PercentOf,
} from "../lib/foam/vocabulary";

/** One discharge as stored: instants, not wall-clock times; minutes worked out. */
export type ReportDischarge = {
  apparatusId: number | null;
  outlet?: string;
  productId: number | null;
  percent: number | null;
  flow: number;
  flowUnit?: FlowUnit;
  basis?: FlowBasis;
  /** What the percentage is a share of; absent: the apparatus's proportioner or the basis decides. */
  percentOf?: PercentOf | null;
  minutes: number;
  startedAt?: Date | null;
  endedAt?: Date | null;
  method?: ApplicationMethod | null;
  airFlowCfm?: number | null;
  /** Another agency's unit (mutual aid), as typed; such a line names no apparatus of ours. */
  mutualAidAgency?: string | null;
  mutualAidUnit?: string | null;
  /** Why a product held for disposal was used all the same. */
  heldUseReason?: string | null;
};

export type ReportRunoff = {
  disposition: Disposition;
  sharePercent?: number | null;
  volumeGal?: number | null;
  receivingWater?: string;
  disposalReference?: string;
  sewerNotice?: string;
  notes?: string | null;
};

/** A refill amount, or the tank's levels before and after; which one it is follows from the figures. */
export type ReportTankReading = {
  apparatusId: number | null;
  productId: number | null;
  refillGal?: number | null;
  levelBeforeGal?: number | null;
  levelAfterGal?: number | null;
};

export type ReportLines = {
  discharges: ReportDischarge[];
  dispositions?: ReportRunoff[];
  tankReadings?: ReportTankReading[];
};

type Gallons = { gal: number };

/** What the computation gives for one discharge (a `DischargeResult` is one). */
export type ComputedDischarge = {
  water: Gallons;
  concentrate: Gallons;
  solution: Gallons;
  effectivePercent: number | null;
  /** The convention the computation read the percentage in (a `DischargeResult` carries it). */
  percentOf?: PercentOf;
  effectivePercentOfSolution?: number | null;
  /** The foam system the computation placed the line on (a `DischargeResult` carries it). */
  foamSystemId?: number | null;
  warnings: UsageWarning[];
};

/** What the computation gives for a report (a `UsageResult` is one), one entry per discharge in order. */
export type ComputedReport = {
  discharges: ComputedDischarge[];
  totals: { water: Gallons; concentrate: Gallons; solution: Gallons };
  eventWarnings: UsageWarning[];
  pfasContaining: boolean;
};

/** The discharges as the computation takes them. */
export function dischargeInputs(discharges: readonly ReportDischarge[]): DischargeInput[] {
  return discharges.map((line) => ({
    flow: line.flow,
    flowUnit: line.flowUnit ?? "gpm",
    basis: line.basis ?? "water",
    percent: line.productId == null ? null : line.percent,
    percentOf: line.percentOf ?? null,
    minutes: line.minutes,
    productId: line.productId,
    apparatusId: line.apparatusId,
    outlet: line.outlet ?? "",
    startedAt: line.startedAt ?? null,
    endedAt: line.endedAt ?? null,
  }));
}

/** The tank readings as the drawdown check takes them. */
export function tankReadingInputs(readings: readonly ReportTankReading[] = []): TankReading[] {
  return readings.map((reading) => ({
    apparatusId: reading.apparatusId,
    productId: reading.productId,
    refillGal: reading.refillGal ?? null,
    levelBeforeGal: reading.levelBeforeGal ?? null,
    levelAfterGal: reading.levelAfterGal ?? null,
  }));
}

/** The event's stored totals and flags. */
export function totalsColumns(computed: ComputedReport) {
  return {
    water_gal: computed.totals.water.gal,
    concentrate_gal: computed.totals.concentrate.gal,
    solution_gal: computed.totals.solution.gal,
    pfas_containing: computed.pfasContaining,
    has_warnings: computed.eventWarnings.length > 0 || computed.discharges.some((line) => line.warnings.length > 0),
    event_warnings: JSON.stringify(computed.eventWarnings),
  };
}

export function dischargeRows(eventId: number, discharges: readonly ReportDischarge[], computed: ComputedReport) {
  return discharges.map((line, index) => {
    const result = computed.discharges[index];
    return {
      event_id: eventId,
      position: index + 1,
      apparatus_id: line.apparatusId,
      foam_system_id: result.foamSystemId ?? null,
      outlet: line.outlet ?? "",
      product_id: line.productId,
      percent: line.productId == null ? null : line.percent,
      flow: line.flow,
      flow_unit: line.flowUnit ?? "gpm",
      flow_basis: line.basis ?? "water",
      percent_of: result.percentOf ?? line.percentOf ?? defaultPercentOf(line.basis ?? "water"),
      started_at: line.startedAt ?? null,
      ended_at: line.endedAt ?? null,
      minutes: line.minutes,
      method: line.method ?? null,
      air_flow_cfm: line.airFlowCfm ?? null,
      mutual_aid_agency: line.mutualAidAgency || null,
      mutual_aid_unit: line.mutualAidUnit || null,
      held_use_reason: line.heldUseReason || null,
      water_gal: result.water.gal,
      concentrate_gal: result.concentrate.gal,
      solution_gal: result.solution.gal,
      effective_percent: result.effectivePercent,
      effective_percent_of_solution:
        result.effectivePercentOfSolution !== undefined
          ? result.effectivePercentOfSolution
          : result.effectivePercent != null && result.solution.gal > 0
            ? (result.concentrate.gal / result.solution.gal) * 100
            : null,
      warnings: JSON.stringify(result.warnings),
    };
  });
}

export function dispositionRows(eventId: number, dispositions: readonly ReportRunoff[] = []) {
  return dispositions.map((line) => ({
    event_id: eventId,
    disposition: line.disposition,
    share_percent: line.sharePercent ?? null,
    volume_gal: line.volumeGal ?? null,
    receiving_water: line.receivingWater ?? "",
    disposal_reference: line.disposalReference ?? "",
    sewer_notice: line.sewerNotice ?? "",
    notes: line.notes ?? null,
  }));
}

export function tankReadingRows(eventId: number, readings: readonly ReportTankReading[] = []) {
  return readings.map((reading) => ({
    event_id: eventId,
    apparatus_id: reading.apparatusId,
    product_id: reading.productId,
    kind: reading.refillGal != null ? "refill" : "levels",
    refill_gal: reading.refillGal ?? null,
    level_before_gal: reading.levelBeforeGal ?? null,
    level_after_gal: reading.levelAfterGal ?? null,
  }));
}

/** Inserts the rows of many events at once (the large seed and the benchmarks), in batches. */
export async function insertReportLinesInBatches(
  connection: Knex | Knex.Transaction,
  reports: readonly { eventId: number; lines: ReportLines; computed: ComputedReport }[],
  batchSize = 1000,
): Promise<{ discharges: number; dispositions: number; tankReadings: number }> {
  const discharges = reports.flatMap(({ eventId, lines, computed }) =>
    dischargeRows(eventId, lines.discharges, computed),
  );
  const dispositions = reports.flatMap(({ eventId, lines }) => dispositionRows(eventId, lines.dispositions));
  const tankReadings = reports.flatMap(({ eventId, lines }) => tankReadingRows(eventId, lines.tankReadings));
  const insert = async (table: string, rows: object[]) => {
    for (let start = 0; start < rows.length; start += batchSize) {
      await connection(table).insert(rows.slice(start, start + batchSize));
    }
  };
  await insert("discharges", discharges);
  await insert("runoff_dispositions", dispositions);
  await insert("tank_readings", tankReadings);
  await refreshFoamClassTotals(
    connection,
    reports.map((report) => report.eventId),
  );
  // Every write of a report's rows (saves, seeds, fixtures) makes kept list totals and map answers stale.
  await bumpDataVersion(connection, "reports");
  return { discharges: discharges.length, dispositions: dispositions.length, tankReadings: tankReadings.length };
}

/**
 * Inserts many events (each row carrying a unique `number` and its `totalsColumns`) and then their
 * lines, in batches: the large seed and the benchmarks.
 */
export async function insertReportsInBatches(
  connection: Knex | Knex.Transaction,
  reports: readonly {
    event: { number: string } & Record<string, unknown>;
    lines: ReportLines;
    computed: ComputedReport;
  }[],
  batchSize = 1000,
): Promise<{ events: number; discharges: number; dispositions: number; tankReadings: number }> {
  const written = { events: 0, discharges: 0, dispositions: 0, tankReadings: 0 };
  for (let start = 0; start < reports.length; start += batchSize) {
    const batch = reports.slice(start, start + batchSize);
    await connection("events").insert(batch.map((report) => report.event));
    const ids = new Map<string, number>(
      (
        await connection("events")
          .whereIn(
            "number",
            batch.map((report) => report.event.number),
          )
          .select("id", "number")
      ).map((row: { id: number; number: string }) => [row.number, row.id]),
    );
    const lines = await insertReportLinesInBatches(
      connection,
      batch.map((report) => ({
        eventId: ids.get(report.event.number)!,
        lines: report.lines,
        computed: report.computed,
      })),
      batchSize,
    );
    written.events += batch.length;
    written.discharges += lines.discharges;
    written.dispositions += lines.dispositions;
    written.tankReadings += lines.tankReadings;
  }
  return written;
}

/**
 * Sets each event's concentrate by foam class and its classes (`foam_classes`: "", "A", "B" or
 * "A,B") from its discharges and their products' classes as they are now. Runs in the transaction
 * that writes the lines, and in the one that changes a product's class (`productId`).
 */
export async function refreshFoamClassTotals(
  connection: Knex | Knex.Transaction,
  which: readonly number[] | { productId: number },
): Promise<void> {
  const eventIds = Array.isArray(which)
    ? which
    : (
        await connection("discharges")
          .where({ product_id: (which as { productId: number }).productId })
          .distinct("event_id")
      ).map((row: { event_id: number }) => row.event_id);
  for (let start = 0; start < eventIds.length; start += 1000) {
    const ids = eventIds.slice(start, start + 1000);
    await connection.raw(
      `UPDATE events e
       LEFT JOIN (
         SELECT d.event_id,
           SUM(CASE WHEN p.foam_class = 'A' THEN d.concentrate_gal ELSE 0 END) AS class_a,
           SUM(CASE WHEN p.foam_class = 'B' THEN d.concentrate_gal ELSE 0 END) AS class_b,
           GROUP_CONCAT(DISTINCT p.foam_class ORDER BY p.foam_class) AS classes
         FROM discharges d STRAIGHT_JOIN foam_products p ON p.id = d.product_id
         WHERE d.event_id IN (${ids.map(() => "?").join(",")})
         GROUP BY d.event_id
       ) c ON c.event_id = e.id
       SET e.class_a_concentrate_gal = COALESCE(c.class_a, 0),
           e.class_b_concentrate_gal = COALESCE(c.class_b, 0),
           e.foam_classes = COALESCE(c.classes, '')
       WHERE e.id IN (${ids.map(() => "?").join(",")})`,
      [...ids, ...ids],
    );
  }
}

/** Writes one event's lines (replacing any it had); its totals go on the event row as `totalsColumns`. */
export async function writeReportLines(
  connection: Knex | Knex.Transaction,
  eventId: number,
  lines: ReportLines,
  computed: ComputedReport,
  options: { replace?: boolean } = {},
): Promise<void> {
  if (options.replace) {
    await connection("discharges").where({ event_id: eventId }).delete();
    await connection("runoff_dispositions").where({ event_id: eventId }).delete();
    await connection("tank_readings").where({ event_id: eventId }).delete();
  }
  await insertReportLinesInBatches(connection, [{ eventId, lines, computed }]);
}

/**
 * Results for discharges whose volumes are stated rather than computed (test fixtures and
 * benchmarks that need known figures): solution defaults to water plus concentrate.
 */
export function statedResults(
  lines: readonly { water: number; concentrate: number; solution?: number; effectivePercent?: number | null }[],
  pfasContaining = false,
): ComputedReport {
  const discharges = lines.map((line) => ({
    water: { gal: line.water },
    concentrate: { gal: line.concentrate },
    solution: { gal: line.solution ?? line.water + line.concentrate },
    effectivePercent: line.effectivePercent ?? null,
    warnings: [],
  }));
  const sum = (pick: (line: ComputedDischarge) => number) => discharges.reduce((total, line) => total + pick(line), 0);
  return {
    discharges,
    totals: {
      water: { gal: sum((line) => line.water.gal) },
      concentrate: { gal: sum((line) => line.concentrate.gal) },
      solution: { gal: sum((line) => line.solution.gal) },
    },
    eventWarnings: [],
    pfasContaining,
  };
}
