// Direct inserts of stations, products, events, discharges and runoff dispositions for the export
// and mail tests, with stored volumes given explicitly so each test knows its expected totals. A
// report's rows go through the same writer as a save.
import { randomUUID } from "node:crypto";
import type { Knex } from "knex";
import { db } from "~/lib/db.server";
import type { EventKind, EventStatus, FlowBasis, FoamClass, FoamType, PfasContentUnit } from "~/lib/foam/vocabulary";
import { apparatusRow, productRow, stationRow } from "~/models/catalogue-rows.server";
import {
  statedResults,
  totalsColumns,
  writeReportLines,
  type ReportRunoff,
  type ReportTankReading,
} from "~/models/report-rows.server";
import { bumpDataVersion } from "~/models/data-version.server";

const unique = () => randomUUID().slice(0, 8);

export async function ensureAgency(connection: Knex = db, overrides: Record<string, unknown> = {}) {
  const values = {
    name: "Test Fire District (test)",
    time_zone: "America/Chicago",
    report_recipients: "quarterly-desk@test.example",
    release_alert_recipients: "release-desk@test.example",
    ...overrides,
  };
  await connection("agency_settings")
    .insert({ id: 1, ...values })
    .onConflict("id")
    .merge(Object.keys(values));
  // As every settings save does: servers keep settings per catalogue version.
  await bumpDataVersion(connection, "catalogue");
}

export async function makeStation(connection: Knex = db) {
  const code = `T${unique().slice(0, 5)}`;
  const [id] = await connection("stations").insert(stationRow({ code, name: `Station ${code} (test)` }));
  return { id, code };
}

export async function makeApparatus(stationId: number | null, connection: Knex = db) {
  const unitId = `E-${unique()}`;
  const [id] = await connection("apparatus").insert(apparatusRow({ unitId, stationId }));
  return { id, unitId };
}

export type ProductFixture = {
  name?: string;
  foamClass: FoamClass;
  foamType?: FoamType;
  pfasContaining?: boolean;
  pfasContent?: number | null;
  pfasContentUnit?: PfasContentUnit | null;
  pfasContentBasis?: string | null;
  pfasContentSource?: string | null;
  pfoaContent?: number | null;
  pfoaContentUnit?: PfasContentUnit | null;
  pfosContent?: number | null;
  pfosContentUnit?: PfasContentUnit | null;
};

export async function makeProduct(spec: ProductFixture, connection: Knex = db) {
  const name = spec.name ?? `Test ${spec.foamClass} concentrate ${unique()} (test)`;
  const [id] = await connection("foam_products").insert(
    productRow({
      ...spec,
      name,
      foamType: spec.foamType ?? (spec.foamClass === "A" ? "class-a" : "f3"),
      nominalPercents: spec.foamClass === "A" ? [0.3, 0.5] : [3],
    }),
  );
  return { id, name };
}

export type DischargeFixture = {
  productId?: number | null;
  apparatusId?: number | null;
  percent?: number | null;
  flow?: number;
  flowBasis?: FlowBasis;
  minutes?: number;
  water: number;
  concentrate: number;
  solution?: number;
};

export type DispositionFixture = ReportRunoff;

export type EventFixture = {
  createdBy: number;
  kind?: EventKind;
  status?: EventStatus;
  startedAt: Date;
  stationId?: number | null;
  drainageBasin?: string | null;
  nearestWaterway?: string | null;
  discharges?: DischargeFixture[];
  dispositions?: DispositionFixture[];
  tankReadings?: ReportTankReading[];
  pfasContaining?: boolean;
};

/** One event with its discharges and dispositions; the event's stored totals are the discharges' sums. */
export async function makeEvent(spec: EventFixture, connection: Knex = db) {
  const discharges = spec.discharges ?? [];
  const results = statedResults(
    discharges.map((d) => ({ ...d, effectivePercent: d.percent ?? null })),
    spec.pfasContaining ?? false,
  );
  const number = `T-${unique()}`;
  const [id] = await connection("events").insert({
    number,
    kind: spec.kind ?? "incident",
    status: spec.status ?? "accepted",
    started_at: spec.startedAt,
    cleared_at: new Date(spec.startedAt.getTime() + 3_600_000),
    address: "100 Test Road",
    station_id: spec.stationId ?? null,
    created_by: spec.createdBy,
    filed_at: spec.status === "draft" ? null : spec.startedAt,
    ...totalsColumns(results),
    drainage_basin: spec.drainageBasin ?? null,
    nearest_waterway: spec.nearestWaterway ?? null,
  });
  await writeReportLines(
    connection,
    id,
    {
      discharges: discharges.map((d) => ({
        apparatusId: d.apparatusId ?? null,
        productId: d.productId ?? null,
        percent: d.percent ?? null,
        flow: d.flow ?? 100,
        basis: d.flowBasis,
        minutes: d.minutes ?? 10,
      })),
      dispositions: spec.dispositions,
      tankReadings: spec.tankReadings,
    },
    results,
  );
  return { id, number };
}
