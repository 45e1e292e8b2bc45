// Row builders shared by the demo seed, the large synthetic seed and the test factories. They take
// the connection as an argument (never the app's pool) and compute every stored volume with the same
// module the server uses, so seeded numbers equal what a save would store. A report's own rows are
// written by `report-rows.server.ts`, as a save writes them.
import type { Knex } from "knex";
import {
  computeUsage,
  type ApparatusFacts,
  type FoamSystemFacts,
  type ProductFacts,
  type UsageResult,
} from "../lib/foam/totals";
import { DEFAULT_INCIDENT_TYPE, type EventKind, type EventStatus, type IncidentType } from "../lib/foam/vocabulary";
import { readAgencySettings } from "./agency-settings.server";
import { allCatalogueFacts } from "./catalogue.server";
import { foamSystemFactsMap } from "./foam-system-facts.server";
import {
  dischargeInputs,
  tankReadingInputs,
  totalsColumns,
  writeReportLines,
  type ReportLines,
} from "./report-rows.server";

/** A small, fast, deterministic random source (mulberry32), so seeds are the same on every run. */
export function seededRandom(seed: number) {
  let state = seed >>> 0;
  const next = () => {
    state = (state + 0x6d2b79f5) >>> 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  return {
    next,
    between: (low: number, high: number) => low + (high - low) * next(),
    int: (low: number, high: number) => Math.floor(low + (high - low + 1) * next()),
    pick: <T>(items: readonly T[]): T => items[Math.floor(next() * items.length)],
    chance: (probability: number) => next() < probability,
  };
}
export type SeededRandom = ReturnType<typeof seededRandom>;

export type EventSpec = ReportLines & {
  number: string;
  kind: EventKind;
  /** Absent: the kind's own type for a non-incident event, none (not recorded) for an incident. */
  incidentType?: IncidentType | null;
  dispatchNumber?: string | null;
  status: EventStatus;
  startedAt: Date | null;
  clearedAt: Date | null;
  address?: string;
  latitude?: number | null;
  longitude?: number | null;
  stationId?: number | null;
  narrative?: string | null;
  createdBy: number;
  filedBy?: number | null;
  filedAt?: Date | null;
  reviewedBy?: number | null;
  reviewedAt?: Date | null;
  reviewComment?: string | null;
  version?: number;
};

export type CatalogueFacts = {
  products: ReadonlyMap<number, ProductFacts>;
  apparatus: ReadonlyMap<number, ApparatusFacts>;
  foamSystems?: ReadonlyMap<number, FoamSystemFacts>;
  /** The agency's drawdown tolerance (a share, 0.15 for 15 %). */
  drawdownTolerance?: number;
};

/** The computation of one event, exactly as a save would run it. */
export function usageOf(spec: EventSpec, facts: CatalogueFacts): UsageResult {
  return computeUsage(dischargeInputs(spec.discharges), {
    products: facts.products,
    apparatus: facts.apparatus,
    foamSystems: facts.foamSystems,
    eventWindow: { start: spec.startedAt, end: spec.clearedAt },
    tankReadings: tankReadingInputs(spec.tankReadings),
    drawdownTolerance: facts.drawdownTolerance,
    eventKind: spec.kind,
  });
}

export function eventRow(spec: EventSpec, usage: UsageResult) {
  return {
    number: spec.number,
    kind: spec.kind,
    incident_type: spec.incidentType === undefined ? DEFAULT_INCIDENT_TYPE[spec.kind] : spec.incidentType,
    dispatch_number: spec.dispatchNumber ?? null,
    status: spec.status,
    version: spec.version ?? 1,
    revision: 0,
    started_at: spec.startedAt,
    cleared_at: spec.clearedAt,
    address: spec.address ?? "",
    latitude: spec.latitude ?? null,
    longitude: spec.longitude ?? null,
    station_id: spec.stationId ?? null,
    narrative: spec.narrative ?? null,
    created_by: spec.createdBy,
    filed_by: spec.filedBy ?? null,
    filed_at: spec.filedAt ?? null,
    reviewed_by: spec.reviewedBy ?? null,
    reviewed_at: spec.reviewedAt ?? null,
    review_comment: spec.reviewComment ?? null,
    ...totalsColumns(usage),
  };
}

/** Inserts one event with its discharges, dispositions and tank readings; returns its id and usage. */
export async function insertEvent(
  connection: Knex | Knex.Transaction,
  spec: EventSpec,
  facts: CatalogueFacts,
): Promise<{ id: number; usage: UsageResult }> {
  const usage = usageOf(spec, facts);
  const [id] = await connection("events").insert(eventRow(spec, usage));
  await writeReportLines(connection, id, spec, usage);
  return { id, usage };
}

/** Facts for the computation, read from the catalogue tables through the given connection. */
export async function loadCatalogueFacts(connection: Knex | Knex.Transaction): Promise<CatalogueFacts> {
  const [catalogue, settings, foamSystems] = await Promise.all([
    allCatalogueFacts(connection),
    readAgencySettings(connection),
    foamSystemFactsMap(connection),
  ]);
  return { ...catalogue, foamSystems, drawdownTolerance: settings.drawdownToleranceShare };
}
