// The columns of a catalogue record (station, apparatus and its outlets, foam product), built once
// for the app's saves, the seeds and the test factories alike.
import type {
  ApplicationMethod,
  FlowBasis,
  FoamClass,
  FoamType,
  PfasContentUnit,
  ProportionerType,
} from "../lib/foam/vocabulary";

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
  proportionerType?: ProportionerType | null;
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
    proportioner_type: spec.proportionerType ?? null,
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
  maker?: string | null;
  foamClass: FoamClass;
  foamType: FoamType;
  nominalPercents: number[];
  pfasContaining?: boolean;
  pfasContent?: number | null;
  pfasContentUnit?: PfasContentUnit | null;
  pfoaContent?: number | null;
  pfoaContentUnit?: PfasContentUnit | null;
  pfosContent?: number | null;
  pfosContentUnit?: PfasContentUnit | null;
  pfasContentBasis?: string | null;
  pfasContentSource?: string | null;
  unitCostPerGal?: number | null;
  safetySheetKey?: string | null;
  safetySheetName?: string | null;
  active?: boolean;
  heldForDisposal?: boolean;
  shelfLifeMonths?: number | null;
  notes?: string | null;
};

/** A product's columns from a seed's spec or the product form alike; a content unit counts only with a content. */
export function productColumns(spec: ProductSpec) {
  return {
    name: spec.name,
    maker: spec.maker ?? "",
    foam_class: spec.foamClass,
    foam_type: spec.foamType,
    nominal_percents: spec.nominalPercents.join(","),
    pfas_containing: spec.pfasContaining ?? false,
    pfas_content: spec.pfasContent ?? null,
    pfas_content_unit: spec.pfasContent == null ? null : (spec.pfasContentUnit ?? null),
    pfoa_content: spec.pfoaContent ?? null,
    pfoa_content_unit: spec.pfoaContent == null ? null : (spec.pfoaContentUnit ?? null),
    pfos_content: spec.pfosContent ?? null,
    pfos_content_unit: spec.pfosContent == null ? null : (spec.pfosContentUnit ?? null),
    pfas_content_basis: spec.pfasContentBasis ?? null,
    pfas_content_source: spec.pfasContentSource ?? null,
    unit_cost_per_gal: spec.unitCostPerGal ?? null,
    active: spec.active ?? true,
    held_for_disposal: spec.heldForDisposal ?? false,
    shelf_life_months: spec.shelfLifeMonths ?? null,
    notes: spec.notes ?? null,
  };
}

/** A new product's whole row, with its safety sheet's key and name when it has one. */
export function productRow(spec: ProductSpec) {
  return {
    ...productColumns(spec),
    safety_sheet_key: spec.safetySheetKey ?? null,
    safety_sheet_name: spec.safetySheetName ?? null,
  };
}
