// Direct inserts of stations, products, events, discharges and runoff dispositions for the export
// and mail tests, with stored volumes given explicitly so each test knows its expected totals.
import { randomUUID } from "node:crypto";
import type { Knex } from "knex";
import { db } from "~/lib/db.server";

const unique = () => randomUUID().slice(0, 8);

export async function ensureAgency(connection: Knex = db, overrides: Record<string, unknown> = {}) {
  const existing = await connection("agency_settings").where({ id: 1 }).first();
  const values = {
    name: "Test Fire District (test)",
    time_zone: "America/Chicago",
    report_recipients: "quarterly-desk@test.example",
    release_alert_recipients: "release-desk@test.example",
    ...overrides,
  };
  if (existing) await connection("agency_settings").where({ id: 1 }).update(values);
  else await connection("agency_settings").insert({ id: 1, ...values });
}

export async function makeStation(connection: Knex = db) {
  const code = `T${unique().slice(0, 5)}`;
  const [id] = await connection("stations").insert({ code, name: `Station ${code} (test)` });
  return { id, code };
}

export async function makeApparatus(stationId: number | null, connection: Knex = db) {
  const unitId = `E-${unique()}`;
  const [id] = await connection("apparatus").insert({ unit_id: unitId, station_id: stationId });
  return { id, unitId };
}

export type ProductFixture = {
  name?: string;
  foamClass: "A" | "B";
  foamType?: string;
  pfasContaining?: boolean;
  pfasContent?: number | null;
  pfasContentUnit?: "g_per_l" | "mg_per_l" | "percent_w_w" | null;
  pfasContentBasis?: string | null;
  pfasContentSource?: string | null;
};

export async function makeProduct(spec: ProductFixture, connection: Knex = db) {
  const name = spec.name ?? `Test ${spec.foamClass} concentrate ${unique()} (test)`;
  const [id] = await connection("foam_products").insert({
    name,
    foam_class: spec.foamClass,
    foam_type: spec.foamType ?? (spec.foamClass === "A" ? "class-a" : "f3"),
    nominal_percents: spec.foamClass === "A" ? "0.3,0.5" : "3",
    pfas_containing: spec.pfasContaining ?? false,
    pfas_content: spec.pfasContent ?? null,
    pfas_content_unit: spec.pfasContentUnit ?? null,
    pfas_content_basis: spec.pfasContentBasis ?? null,
    pfas_content_source: spec.pfasContentSource ?? null,
  });
  return { id, name };
}

export type DischargeFixture = {
  productId?: number | null;
  apparatusId?: number | null;
  percent?: number | null;
  flow?: number;
  flowBasis?: "water" | "solution";
  minutes?: number;
  water: number;
  concentrate: number;
  solution?: number;
};

export type DispositionFixture = {
  disposition: "contained" | "soil" | "storm_drain" | "surface_water" | "sanitary_sewer" | "evaporated_unknown";
  sharePercent?: number | null;
  volumeGal?: number | null;
  receivingWater?: string;
  disposalReference?: string;
  sewerNotice?: string;
};

export type EventFixture = {
  createdBy: number;
  kind?: "incident" | "training" | "test" | "flush";
  status?: "draft" | "filed" | "returned" | "accepted";
  startedAt: Date;
  stationId?: number | null;
  drainageBasin?: string | null;
  nearestWaterway?: string | null;
  discharges?: DischargeFixture[];
  dispositions?: DispositionFixture[];
  pfasContaining?: boolean;
};

/** One event with its discharges and dispositions; the event's stored totals are the discharges' sums. */
export async function makeEvent(spec: EventFixture, connection: Knex = db) {
  const discharges = (spec.discharges ?? []).map((d) => ({ ...d, solution: d.solution ?? d.water + d.concentrate }));
  const sum = (pick: (d: (typeof discharges)[number]) => number) => discharges.reduce((total, d) => total + pick(d), 0);
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
    water_gal: sum((d) => d.water),
    concentrate_gal: sum((d) => d.concentrate),
    solution_gal: sum((d) => d.solution),
    pfas_containing: spec.pfasContaining ?? false,
    drainage_basin: spec.drainageBasin ?? null,
    nearest_waterway: spec.nearestWaterway ?? null,
  });
  for (const [index, d] of discharges.entries()) {
    await connection("discharges").insert({
      event_id: id,
      position: index + 1,
      apparatus_id: d.apparatusId ?? null,
      product_id: d.productId ?? null,
      percent: d.percent ?? null,
      flow: d.flow ?? 100,
      flow_basis: d.flowBasis ?? "water",
      minutes: d.minutes ?? 10,
      water_gal: d.water,
      concentrate_gal: d.concentrate,
      solution_gal: d.solution,
      effective_percent: d.percent ?? null,
      warnings: "[]",
    });
  }
  for (const r of spec.dispositions ?? []) {
    await connection("runoff_dispositions").insert({
      event_id: id,
      disposition: r.disposition,
      share_percent: r.sharePercent ?? null,
      volume_gal: r.volumeGal ?? null,
      receiving_water: r.receivingWater ?? "",
      disposal_reference: r.disposalReference ?? "",
      sewer_notice: r.sewerNotice ?? "",
    });
  }
  return { id, number };
}
