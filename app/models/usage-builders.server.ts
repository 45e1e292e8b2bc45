// Row builders shared by the demo seed, the large synthetic seed and the test factories. They take
// the connection as an argument (never the app's pool) and compute every stored volume with the same
// module the server uses, so seeded numbers equal what a save would store.
import type { Knex } from "knex";
import type { ApplicationMethod } from "../lib/foam/vocabulary";
import type { FoamType, PfasContentUnit } from "../lib/catalogue/product-form";
import {
  computeUsage,
  type ApparatusFacts,
  type DischargeInput,
  type FlowBasis,
  type FoamClass,
  type ProductFacts,
  type UsageResult,
} from "../lib/foam/totals";
import type { FlowUnit } from "../lib/foam/units";

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

export type StationSpec = {
  code: string;
  name: string;
  address?: string;
  latitude?: number | null;
  longitude?: number | null;
  active?: boolean;
};

export function stationRow(spec: StationSpec) {
  return {
    code: spec.code,
    name: spec.name,
    address: spec.address ?? "",
    latitude: spec.latitude ?? null,
    longitude: spec.longitude ?? null,
    active: spec.active ?? true,
  };
}

export type OutletSpec = {
  name: string;
  foamCapable?: boolean;
  defaultFlowGpm?: number | null;
  defaultFlowBasis?: FlowBasis;
  defaultMethod?: ApplicationMethod | null;
};

export type ApparatusSpec = {
  unitId: string;
  description?: string;
  stationId?: number | null;
  concentrateTankGal?: number | null;
  proportionerMaxConcentrateGpm?: number | null;
  waterFlowMinGpm?: number | null;
  waterFlowMaxGpm?: number | null;
  compressedAirCfm?: number | null;
  active?: boolean;
  outlets?: OutletSpec[];
};

export function apparatusRow(spec: ApparatusSpec) {
  return {
    unit_id: spec.unitId,
    description: spec.description ?? "",
    station_id: spec.stationId ?? null,
    concentrate_tank_gal: spec.concentrateTankGal ?? null,
    proportioner_max_concentrate_gpm: spec.proportionerMaxConcentrateGpm ?? null,
    water_flow_min_gpm: spec.waterFlowMinGpm ?? null,
    water_flow_max_gpm: spec.waterFlowMaxGpm ?? null,
    compressed_air_cfm: spec.compressedAirCfm ?? null,
    active: spec.active ?? true,
  };
}

export function outletRow(apparatusId: number, spec: OutletSpec) {
  return {
    apparatus_id: apparatusId,
    name: spec.name,
    foam_capable: spec.foamCapable ?? true,
    default_flow_gpm: spec.defaultFlowGpm ?? null,
    default_flow_basis: spec.defaultFlowBasis ?? "water",
    default_method: spec.defaultMethod ?? null,
  };
}

export type ProductSpec = {
  name: string;
  maker?: string;
  foamClass: FoamClass;
  foamType: FoamType;
  nominalPercents: number[];
  pfasContaining?: boolean;
  pfasContent?: number | null;
  pfasContentUnit?: PfasContentUnit | null;
  pfasContentBasis?: string | null;
  pfasContentSource?: string | null;
  unitCostPerGal?: number | null;
  safetySheetKey?: string | null;
  safetySheetName?: string | null;
  active?: boolean;
  notes?: string | null;
};

export function productRow(spec: ProductSpec) {
  return {
    name: spec.name,
    maker: spec.maker ?? "",
    foam_class: spec.foamClass,
    foam_type: spec.foamType,
    nominal_percents: spec.nominalPercents.join(","),
    pfas_containing: spec.pfasContaining ?? false,
    pfas_content: spec.pfasContent ?? null,
    pfas_content_unit: spec.pfasContentUnit ?? null,
    pfas_content_basis: spec.pfasContentBasis ?? null,
    pfas_content_source: spec.pfasContentSource ?? null,
    unit_cost_per_gal: spec.unitCostPerGal ?? null,
    safety_sheet_key: spec.safetySheetKey ?? null,
    safety_sheet_name: spec.safetySheetName ?? null,
    active: spec.active ?? true,
    notes: spec.notes ?? null,
  };
}

export function productFactsOf(id: number, spec: ProductSpec): ProductFacts {
  return {
    id,
    name: spec.name,
    foamClass: spec.foamClass,
    nominalPercents: spec.nominalPercents,
    pfasContaining: spec.pfasContaining ?? false,
  };
}

export function apparatusFactsOf(id: number, spec: ApparatusSpec): ApparatusFacts {
  return {
    id,
    unitId: spec.unitId,
    proportionerMaxConcentrateGpm: spec.proportionerMaxConcentrateGpm ?? null,
    waterFlowMinGpm: spec.waterFlowMinGpm ?? null,
    waterFlowMaxGpm: spec.waterFlowMaxGpm ?? null,
  };
}

export type DischargeSpec = {
  apparatusId: number | null;
  outlet?: string;
  productId: number | null;
  percent: number | null;
  flow: number;
  flowUnit?: FlowUnit;
  basis?: FlowBasis;
  minutes: number;
  startedAt?: Date | null;
  endedAt?: Date | null;
  method?: ApplicationMethod | null;
  airFlowCfm?: number | null;
};

export type Disposition =
  "contained" | "soil" | "storm_drain" | "surface_water" | "sanitary_sewer" | "evaporated_unknown";

export type DispositionSpec = {
  disposition: Disposition;
  sharePercent?: number | null;
  volumeGal?: number | null;
  receivingWater?: string;
  disposalReference?: string;
  sewerNotice?: string;
  notes?: string | null;
};

export type TankReadingSpec = {
  apparatusId: number | null;
  productId: number | null;
  kind: "refill" | "levels";
  refillGal?: number | null;
  levelBeforeGal?: number | null;
  levelAfterGal?: number | null;
};

export type EventStatus = "draft" | "filed" | "returned" | "accepted";
export type EventKind = "incident" | "training" | "test" | "flush";

export type EventSpec = {
  number: string;
  kind: EventKind;
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
  discharges: DischargeSpec[];
  dispositions?: DispositionSpec[];
  tankReadings?: TankReadingSpec[];
};

export type CatalogueFacts = {
  products: ReadonlyMap<number, ProductFacts>;
  apparatus: ReadonlyMap<number, ApparatusFacts>;
  /** agency_settings.drawdown_tolerance_share */
  drawdownTolerance?: number;
};

export function dischargeInputOf(spec: DischargeSpec): DischargeInput {
  return {
    flow: spec.flow,
    flowUnit: spec.flowUnit ?? "gpm",
    basis: spec.basis ?? "water",
    percent: spec.productId == null ? null : spec.percent,
    minutes: spec.minutes,
    productId: spec.productId,
    apparatusId: spec.apparatusId,
    startedAt: spec.startedAt ?? null,
    endedAt: spec.endedAt ?? null,
  };
}

/** The computation of one event, exactly as a save would run it. */
export function usageOf(spec: EventSpec, facts: CatalogueFacts): UsageResult {
  return computeUsage(spec.discharges.map(dischargeInputOf), {
    products: facts.products,
    apparatus: facts.apparatus,
    eventWindow: { start: spec.startedAt, end: spec.clearedAt },
    tankReadings: (spec.tankReadings ?? []).map((reading) => ({
      apparatusId: reading.apparatusId,
      productId: reading.productId,
      refillGal: reading.refillGal ?? null,
      levelBeforeGal: reading.levelBeforeGal ?? null,
      levelAfterGal: reading.levelAfterGal ?? null,
    })),
    drawdownTolerance: facts.drawdownTolerance,
  });
}

export function eventRow(spec: EventSpec, usage: UsageResult) {
  const hasWarnings = usage.eventWarnings.length > 0 || usage.discharges.some((result) => result.warnings.length > 0);
  return {
    number: spec.number,
    kind: spec.kind,
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
    water_gal: usage.totals.water.gal,
    concentrate_gal: usage.totals.concentrate.gal,
    solution_gal: usage.totals.solution.gal,
    pfas_containing: usage.pfasContaining,
    has_warnings: hasWarnings,
    event_warnings: JSON.stringify(usage.eventWarnings),
  };
}

export function dischargeRows(eventId: number, spec: EventSpec, usage: UsageResult) {
  return spec.discharges.map((discharge, index) => {
    const result = usage.discharges[index];
    return {
      event_id: eventId,
      position: index + 1,
      apparatus_id: discharge.apparatusId,
      outlet: discharge.outlet ?? "",
      product_id: discharge.productId,
      percent: discharge.productId == null ? null : discharge.percent,
      flow: discharge.flow,
      flow_unit: discharge.flowUnit ?? "gpm",
      flow_basis: discharge.basis ?? "water",
      started_at: discharge.startedAt ?? null,
      ended_at: discharge.endedAt ?? null,
      minutes: discharge.minutes,
      method: discharge.method ?? null,
      air_flow_cfm: discharge.airFlowCfm ?? null,
      water_gal: result.water.gal,
      concentrate_gal: result.concentrate.gal,
      solution_gal: result.solution.gal,
      effective_percent: result.effectivePercent,
      warnings: JSON.stringify(result.warnings),
    };
  });
}

export function dispositionRows(eventId: number, spec: EventSpec) {
  return (spec.dispositions ?? []).map((item) => ({
    event_id: eventId,
    disposition: item.disposition,
    share_percent: item.sharePercent ?? null,
    volume_gal: item.volumeGal ?? null,
    receiving_water: item.receivingWater ?? "",
    disposal_reference: item.disposalReference ?? "",
    sewer_notice: item.sewerNotice ?? "",
    notes: item.notes ?? null,
  }));
}

export function tankReadingRows(eventId: number, spec: EventSpec) {
  return (spec.tankReadings ?? []).map((reading) => ({
    event_id: eventId,
    apparatus_id: reading.apparatusId,
    product_id: reading.productId,
    kind: reading.kind,
    refill_gal: reading.refillGal ?? null,
    level_before_gal: reading.levelBeforeGal ?? null,
    level_after_gal: reading.levelAfterGal ?? null,
  }));
}

/** Inserts one event with its discharges, dispositions and tank readings; returns its id and usage. */
export async function insertEvent(
  connection: Knex | Knex.Transaction,
  spec: EventSpec,
  facts: CatalogueFacts,
): Promise<{ id: number; usage: UsageResult }> {
  const usage = usageOf(spec, facts);
  const [id] = await connection("events").insert(eventRow(spec, usage));
  const discharges = dischargeRows(id, spec, usage);
  if (discharges.length) await connection("discharges").insert(discharges);
  const dispositions = dispositionRows(id, spec);
  if (dispositions.length) await connection("runoff_dispositions").insert(dispositions);
  const readings = tankReadingRows(id, spec);
  if (readings.length) await connection("tank_readings").insert(readings);
  return { id, usage };
}

/** Facts for the computation, read from the catalogue tables through the given connection. */
export async function loadCatalogueFacts(connection: Knex | Knex.Transaction): Promise<CatalogueFacts> {
  const [products, apparatus, settings] = await Promise.all([
    connection("foam_products").select("id", "name", "foam_class", "nominal_percents", "pfas_containing"),
    connection("apparatus").select(
      "id",
      "unit_id",
      "proportioner_max_concentrate_gpm",
      "water_flow_min_gpm",
      "water_flow_max_gpm",
    ),
    connection("agency_settings").where({ id: 1 }).first(),
  ]);
  const number = (value: unknown) => (value == null ? null : Number(value));
  return {
    products: new Map(
      products.map((row) => [
        row.id,
        {
          id: row.id,
          name: row.name,
          foamClass: row.foam_class,
          nominalPercents: String(row.nominal_percents || "")
            .split(",")
            .filter(Boolean)
            .map(Number),
          pfasContaining: Boolean(row.pfas_containing),
        },
      ]),
    ),
    apparatus: new Map(
      apparatus.map((row) => [
        row.id,
        {
          id: row.id,
          unitId: row.unit_id,
          proportionerMaxConcentrateGpm: number(row.proportioner_max_concentrate_gpm),
          waterFlowMinGpm: number(row.water_flow_min_gpm),
          waterFlowMaxGpm: number(row.water_flow_max_gpm),
        },
      ]),
    ),
    drawdownTolerance: settings ? Number(settings.drawdown_tolerance_share) : undefined,
  };
}
