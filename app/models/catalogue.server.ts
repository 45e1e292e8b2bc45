import { parseNominalPercents } from "~/lib/catalogue/product-form";
import { decimalOrNull } from "~/lib/decimal";
import { db, type Db } from "~/lib/db.server";
import type { ApparatusFacts, ProductFacts } from "~/lib/foam/totals";
import {
  isProportionerType,
  type ApplicationMethod,
  type FlowBasis,
  type FoamClass,
  type FoamType,
  type ProportionerType,
} from "~/lib/foam/vocabulary";

export function nominalPercentsOf(stored: string | null | undefined): number[] {
  return parseNominalPercents(stored ?? "") ?? [];
}

export type ActiveProduct = {
  id: number;
  name: string;
  foamClass: FoamClass;
  foamType: FoamType;
  nominalPercents: number[];
  pfasContaining: boolean;
  /** Legacy foam waiting for disposal: a report that uses it says why. */
  heldForDisposal: boolean;
};

/** Products an officer may choose on a usage report, by name. */
export async function listActiveProducts(connection: Db = db): Promise<ActiveProduct[]> {
  const rows = await connection("foam_products")
    .where({ active: true })
    .select("id", "name", "foam_class", "foam_type", "nominal_percents", "pfas_containing", "held_for_disposal")
    .orderBy("name");
  return rows.map((row) => ({
    id: row.id,
    name: row.name,
    foamClass: row.foam_class,
    foamType: row.foam_type,
    nominalPercents: nominalPercentsOf(row.nominal_percents),
    pfasContaining: Boolean(row.pfas_containing),
    heldForDisposal: Boolean(row.held_for_disposal),
  }));
}

export type OutletDefaults = {
  name: string;
  foamCapable: boolean;
  defaultFlowGpm: number | null;
  defaultFlowBasis: FlowBasis;
  defaultMethod: ApplicationMethod | null;
};

export type ActiveApparatus = {
  id: number;
  unitId: string;
  description: string;
  stationId: number | null;
  proportionerMaxConcentrateGpm: number | null;
  proportionerType: ProportionerType | null;
  waterFlowMinGpm: number | null;
  waterFlowMaxGpm: number | null;
  compressedAirCfm: number | null;
  concentrateTankGal: number | null;
  outlets: OutletDefaults[];
};

function outletOf(row: Record<string, unknown>): OutletDefaults {
  return {
    name: String(row.name),
    foamCapable: Boolean(row.foam_capable),
    defaultFlowGpm: decimalOrNull(row.default_flow_gpm),
    defaultFlowBasis: row.default_flow_basis === "solution" ? "solution" : "water",
    defaultMethod: (row.default_method as ApplicationMethod | null) ?? null,
  };
}

/** Apparatus an officer may choose on a usage report, with the defaults of their outlets. */
export async function listActiveApparatus(connection: Db = db): Promise<ActiveApparatus[]> {
  const rows = await connection("apparatus").where({ active: true }).orderBy("unit_id");
  const outlets = rows.length
    ? await connection("apparatus_outlets")
        .whereIn(
          "apparatus_id",
          rows.map((row) => row.id),
        )
        .orderBy(["apparatus_id", "id"])
    : [];
  return rows.map((row) => ({
    id: row.id,
    unitId: row.unit_id,
    description: row.description,
    stationId: row.station_id ?? null,
    proportionerMaxConcentrateGpm: decimalOrNull(row.proportioner_max_concentrate_gpm),
    proportionerType: isProportionerType(row.proportioner_type) ? row.proportioner_type : null,
    waterFlowMinGpm: decimalOrNull(row.water_flow_min_gpm),
    waterFlowMaxGpm: decimalOrNull(row.water_flow_max_gpm),
    compressedAirCfm: decimalOrNull(row.compressed_air_cfm),
    concentrateTankGal: decimalOrNull(row.concentrate_tank_gal),
    outlets: outlets.filter((outlet) => outlet.apparatus_id === row.id).map(outletOf),
  }));
}

/**
 * A `whereRaw` pair: the event in `eventTable` had a discharge of a product of `foamClass`, read from
 * the classes kept on the event row (`foam_classes`, written with its lines). The event list and the
 * map filter by class with it.
 */
export function usedFoamClass(eventTable: string, foamClass: FoamClass): [string, string[]] {
  return ["FIND_IN_SET(?, ??) > 0", [foamClass, `${eventTable}.foam_classes`]];
}

const PRODUCT_FACT_COLUMNS = ["id", "name", "foam_class", "nominal_percents", "pfas_containing"];
const APPARATUS_FACT_COLUMNS = [
  "id",
  "unit_id",
  "proportioner_max_concentrate_gpm",
  "proportioner_type",
  "water_flow_min_gpm",
  "water_flow_max_gpm",
];

function productFactsOf(row: Record<string, unknown>): ProductFacts {
  return {
    id: row.id as number,
    name: row.name as string,
    foamClass: row.foam_class as FoamClass,
    nominalPercents: nominalPercentsOf(row.nominal_percents as string | null),
    pfasContaining: Boolean(row.pfas_containing),
  };
}

function apparatusFactsOf(row: Record<string, unknown>): ApparatusFacts {
  return {
    id: row.id as number,
    unitId: row.unit_id as string,
    proportionerMaxConcentrateGpm: decimalOrNull(row.proportioner_max_concentrate_gpm),
    proportionerType: isProportionerType(row.proportioner_type) ? row.proportioner_type : null,
    waterFlowMinGpm: decimalOrNull(row.water_flow_min_gpm),
    waterFlowMaxGpm: decimalOrNull(row.water_flow_max_gpm),
  };
}

/** Facts of every product and every apparatus, active or not (the seeds compute whole years at once). */
export async function allCatalogueFacts(connection: Db = db) {
  const [products, apparatus] = await Promise.all([
    connection("foam_products").select(PRODUCT_FACT_COLUMNS),
    connection("apparatus").select(APPARATUS_FACT_COLUMNS),
  ]);
  return {
    products: new Map<number, ProductFacts>(products.map((row) => [row.id, productFactsOf(row)])),
    apparatus: new Map<number, ApparatusFacts>(apparatus.map((row) => [row.id, apparatusFactsOf(row)])),
  };
}

/** Facts of the given products (active or not: an old report keeps its product) for the usage checks. */
export async function productFactsMap(ids: Iterable<number>, connection: Db = db): Promise<Map<number, ProductFacts>> {
  const wanted = [...new Set(ids)];
  const map = new Map<number, ProductFacts>();
  if (wanted.length === 0) return map;
  const rows = await connection("foam_products").whereIn("id", wanted).select(PRODUCT_FACT_COLUMNS);
  for (const row of rows) map.set(row.id, productFactsOf(row));
  return map;
}

/** Facts of the given apparatus (active or not) for the usage checks. */
export async function apparatusFactsMap(
  ids: Iterable<number>,
  connection: Db = db,
): Promise<Map<number, ApparatusFacts>> {
  const wanted = [...new Set(ids)];
  const map = new Map<number, ApparatusFacts>();
  if (wanted.length === 0) return map;
  const rows = await connection("apparatus").whereIn("id", wanted).select(APPARATUS_FACT_COLUMNS);
  for (const row of rows) map.set(row.id, apparatusFactsOf(row));
  return map;
}

export type StationOption = { id: number; code: string; name: string; active: boolean };

export async function listStationOptions(connection: Db = db): Promise<StationOption[]> {
  const rows = await connection("stations").select("id", "code", "name", "active").orderBy("code");
  return rows.map((row) => ({ id: row.id, code: row.code, name: row.name, active: Boolean(row.active) }));
}
